// The incremental coverage curve: after edits it agrees with the curve
// evaluated from scratch, agrees with coverage.Curve (an independent exact
// evaluation), and re-evaluates only the cells around the edit.

package review

import (
	"fmt"
	"math"
	"slices"
	"testing"
)

// curveAgreement is the largest difference accepted between the summed
// cell terms and coverage.Curve: both are exact to rounding (relative
// error of order 1e-14 per cell), summed over some 10⁴ cells.
const curveAgreement = 1e-9

func TestCurveIncremental(t *testing.T) {
	sv := newBenchServer(t, 2000)
	h := sv.Handler()
	edits := []struct{ name, body string }{
		{"move", `{"op":"move","device":17,"x":2500,"y":2500}`},
		{"add", `{"op":"add","points":[{"x":1000,"y":4000}]}`},
		{"off", `{"op":"off","device":3}`},
		{"remove", `{"op":"remove","device":1500}`},
		{"undo", `{"op":"undo"}`},
	}
	for _, e := range edits {
		t.Run(e.name, func(t *testing.T) {
			editOK(t, h, e.body)
			sv.mu.Lock()
			defer sv.mu.Unlock()
			g := sv.s.geo
			if g.fresh > 60 {
				t.Errorf("%d cells evaluated afresh after one edit; want only those around it", g.fresh)
			}
			// A reused cell's terms were evaluated on its rings as clipped
			// then, which may start at another point: equal up to rounding.
			_, scratch, _ := curveFor(g.layout, sv.cfg.grid, nil)
			for k := range scratch {
				if d := math.Abs(scratch[k] - g.share[k]); d > curveAgreement {
					t.Errorf("at %v m: incremental %v, from scratch %v", sv.cfg.grid[k], g.share[k], scratch[k])
				}
			}
			cv := g.layout.Curve()
			for k, r := range sv.cfg.grid {
				if d := math.Abs(cv.CoveredFraction(r) - g.share[k]); d > curveAgreement {
					t.Errorf("at %v m: covered %v; coverage.Curve: %v", r, g.share[k], cv.CoveredFraction(r))
				}
			}
		})
	}
	t.Run("curve ends at the full-cover range", func(t *testing.T) {
		s := getState(t, h)
		c := s.Figures.Curve
		i := slices.IndexFunc(c, func(p [2]float64) bool { return p[0] == s.Figures.FullCoverRangeM })
		if i < 0 || c[i][1] != 1 {
			t.Errorf("no point (%v m, 1) on the curve: %v", s.Figures.FullCoverRangeM, fmt.Sprint(c))
		}
	})
}
