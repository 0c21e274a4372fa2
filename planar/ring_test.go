package planar

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// The boundary convention, on the square 0..10: a point on an edge or a
// vertex is on the ring (0), whichever edge it is and whichever way the ring
// runs. Values are elementary geometry.
func TestPointInRing(t *testing.T) {
	ccw := []float64{0, 0, 10, 0, 10, 10, 0, 10}
	cw := []float64{0, 0, 0, 10, 10, 10, 10, 0}
	closed := []float64{0, 0, 10, 0, 10, 10, 0, 10, 0, 0}
	cases := []struct {
		name string
		x, y float64
		want int
	}{
		{"centre", 5, 5, 1},
		{"right edge", 10, 5, 0},
		{"top edge", 5, 10, 0},
		{"left edge", 0, 5, 0},
		{"bottom edge", 5, 0, 0},
		{"corner", 10, 10, 0},
		{"origin corner", 0, 0, 0},
		{"just outside right", math.Nextafter(10, 11), 5, -1},
		{"just inside right", math.Nextafter(10, 9), 5, 1},
		{"outside left on edge line", -1, 0, -1},
		{"outside beyond corner", 11, 10, -1},
		{"far away", 100, 100, -1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			for name, ring := range map[string][]float64{"ccw": ccw, "cw": cw, "closed": closed} {
				if got := PointInRing(ring, c.x, c.y); got != c.want {
					t.Errorf("%s: PointInRing(%g, %g) = %d, want %d", name, c.x, c.y, got, c.want)
				}
			}
		})
	}
}

// Region.Contains follows the same closed convention as PointInRing.
func TestRegionContainsBoundary(t *testing.T) {
	reg, err := NewRegion(orb.MultiPolygon{{{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}}})
	if err != nil {
		t.Fatal(err)
	}
	ix := reg.Index()
	for _, p := range [][2]float64{{10, 5}, {5, 10}, {0, 0}, {5, 5}} {
		if !reg.Contains(p[0], p[1]) || !ix.Contains(p[0], p[1]) {
			t.Errorf("(%g, %g) should be contained (closed area)", p[0], p[1])
		}
	}
}

func TestRingArea(t *testing.T) {
	cases := []struct {
		name string
		xy   []float64
		want float64
	}{
		{"unit square ccw", []float64{0, 0, 1, 0, 1, 1, 0, 1}, 1},
		{"unit square cw", []float64{0, 0, 0, 1, 1, 1, 1, 0}, -1},
		{"closed repeat adds nothing", []float64{0, 0, 1, 0, 1, 1, 0, 1, 0, 0}, 1},
		{"triangle far from origin", []float64{1e6, 1e6, 1e6 + 3, 1e6, 1e6, 1e6 + 4}, 6},
		{"degenerate", []float64{0, 0, 1, 1}, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := RingArea(c.xy); got != c.want {
				t.Errorf("RingArea = %v, want %v", got, c.want)
			}
		})
	}
	r := orb.Ring{{0, 0}, {2, 0}, {2, 2}, {0, 2}, {0, 0}}
	if got := RingArea(FlatRing(r)); got != 4 {
		t.Errorf("RingArea(FlatRing) = %v, want 4", got)
	}
}

func TestSegments(t *testing.T) {
	cases := []struct {
		name         string
		s            [8]float64
		cross, meets bool
	}{
		{"proper crossing", [8]float64{0, 0, 2, 2, 0, 2, 2, 0}, true, true},
		{"touching at an endpoint", [8]float64{0, 0, 2, 2, 2, 2, 3, 0}, false, true},
		{"T junction", [8]float64{0, 0, 2, 0, 1, 0, 1, 5}, false, true},
		{"collinear overlap", [8]float64{0, 0, 2, 0, 1, 0, 3, 0}, false, true},
		{"collinear apart", [8]float64{0, 0, 1, 0, 2, 0, 3, 0}, false, false},
		{"parallel", [8]float64{0, 0, 1, 0, 0, 1, 1, 1}, false, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s := c.s
			if got := SegmentsCross(s[0], s[1], s[2], s[3], s[4], s[5], s[6], s[7]); got != c.cross {
				t.Errorf("SegmentsCross = %v, want %v", got, c.cross)
			}
			if got := SegmentsMeet(s[0], s[1], s[2], s[3], s[4], s[5], s[6], s[7]); got != c.meets {
				t.Errorf("SegmentsMeet = %v, want %v", got, c.meets)
			}
		})
	}
}

// Area and centroid by RingMoments; values are elementary geometry.
func TestRingMoments(t *testing.T) {
	cases := []struct {
		name         string
		ring         []float64
		ox, oy       float64
		area, cx, cy float64
	}{
		{"unit square", []float64{0, 0, 1, 0, 1, 1, 0, 1}, 0, 0, 1, 0.5, 0.5},
		{"rectangle far away", []float64{1e6, 1e6, 1e6 + 4, 1e6, 1e6 + 4, 1e6 + 2, 1e6, 1e6 + 2}, 1e6, 1e6, 8, 1e6 + 2, 1e6 + 1},
		{"clockwise triangle", []float64{0, 0, 0, 3, 3, 0}, 0, 0, -4.5, 1, 1},
		{"closed repeat", []float64{0, 0, 2, 0, 2, 2, 0, 2, 0, 0}, 1, 1, 4, 1, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			a, sx, sy := RingMoments(c.ring, c.ox, c.oy)
			if a != c.area || c.ox+sx/a != c.cx || c.oy+sy/a != c.cy {
				t.Errorf("area %g, centroid (%g, %g); want %g, (%g, %g)", a, c.ox+sx/a, c.oy+sy/a, c.area, c.cx, c.cy)
			}
		})
	}
}

func TestDropRepeats(t *testing.T) {
	cases := []struct {
		name string
		in   orb.Ring
		want int
	}{
		{"closed square", orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0, 0}}, 4},
		{"repeats inside", orb.Ring{{0, 0}, {1, 0}, {1, 0}, {1, 1}, {0, 1}}, 4},
		{"several closing copies", orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0, 0}, {0, 0}}, 3},
		{"all one point", orb.Ring{{2, 2}, {2, 2}, {2, 2}}, 1},
		{"empty", orb.Ring{}, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := DropRepeats(append(orb.Ring(nil), c.in...)); len(got) != c.want {
				t.Errorf("DropRepeats = %v, want %d points", got, c.want)
			}
		})
	}
}
