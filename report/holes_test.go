// Hole marks (issue 16): a hole whose closing point lies in an exclusion
// zone is marked "outside site"; one living less than 1 % of the planned
// range "brief"; the marks appear in report.txt, summary.json and the
// hole-closings layer alike.

package report

import (
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func TestHoleMarks(t *testing.T) {
	// Four sites on a 50 m square: one hole, born at 25 m (neighbouring
	// disks touch) and closing at 25√2 m at the centre (50, 50), which lies
	// in the exclusion zone [45, 55]² (elementary geometry).
	sites := []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}
	hole := []float64{45, 45, 45, 55, 55, 55, 55, 45}
	for _, c := range []struct {
		name  string
		rings [][]float64
		r     float64
		want  string
	}{
		{"in-zone", [][]float64{square(100), hole}, 30, "outside site"},
		{"no-zone", [][]float64{square(100)}, 30, ""},
		{"brief-at-long-range", [][]float64{square(100)}, 1100, "brief"}, // lifetime 10.36 m < 11 m
	} {
		t.Run(c.name, func(t *testing.T) {
			an := analyze(t, sites, region(t, c.rings...), c.r)
			if p := an.Persistence; p == nil || len(p.Holes) != 1 {
				t.Fatalf("want one hole, got %+v", an.Persistence)
			}
			s := newScene(an.Layout, an, Meta{Planar: true})
			if got := s.holeNote(0); got != c.want {
				t.Errorf("note %q, want %q", got, c.want)
			}
			if got := Summary(an, Meta{Planar: true}).Holes[0].Note; got != c.want {
				t.Errorf("summary.json note %q, want %q", got, c.want)
			}
			layer := layerText(t, s, s.holesLayer())
			if !strings.Contains(string(layer), `"note":"`+c.want+`"`) {
				t.Errorf("hole-closings layer lacks note %q: %s", c.want, layer)
			}
		})
	}
}

// layerText encodes a layer as GeoJSON text (no GeoPackage).
func layerText(t *testing.T, s *scene, d *layerDef) string {
	t.Helper()
	var b strings.Builder
	if err := s.writeLayer(&b, d, nil); err != nil {
		t.Fatal(err)
	}
	return b.String()
}
