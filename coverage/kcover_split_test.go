package coverage

import (
	"testing"

	"github.com/paulmach/orb"
)

// kgSplitPolygon keeps a part's area (elementary geometry: a 10 m square
// less or plus a triangle of base 2 m and height 4 m, 4 m²): a loop
// pinched off inside the exterior is a hole, one outside is a twisted
// lobe and goes, and a hole lying outside every loop refuses the repair.
func TestSplitPolygonKeepsArea(t *testing.T) {
	square := func(pinch ...orb.Point) orb.Ring {
		r := orb.Ring{{0, 0}, {10, 0}, {10, 10}, {5, 10}}
		r = append(r, pinch...)
		return append(r, orb.Point{0, 10}, orb.Point{0, 0})
	}
	for _, c := range []struct {
		name string
		pg   orb.Polygon
		want float64 // area; −1: refused (nil)
	}{
		{"pinched hole", orb.Polygon{square(orb.Point{6, 6}, orb.Point{4, 6}, orb.Point{5, 10})}, 96},
		{"twisted lobe", orb.Polygon{square(orb.Point{4, 14}, orb.Point{6, 14}, orb.Point{5, 10})}, 100},
		{"hole kept", orb.Polygon{square(orb.Point{6, 6}, orb.Point{4, 6}, orb.Point{5, 10}), {{2, 2}, {2, 3}, {3, 3}, {3, 2}, {2, 2}}}, 95},
		{"hole outside", orb.Polygon{square(orb.Point{6, 6}, orb.Point{4, 6}, orb.Point{5, 10}), {{12, 2}, {12, 3}, {13, 3}, {13, 2}, {12, 2}}}, -1},
	} {
		t.Run(c.name, func(t *testing.T) {
			got := kgSplitPolygon(c.pg)
			if c.want < 0 {
				if got != nil {
					t.Fatalf("repaired into %v, want refused", got)
				}
				return
			}
			if a := coveredPolyArea(got); a != c.want {
				t.Errorf("area %v, want %v (%v)", a, c.want, got)
			}
		})
	}
}
