// Tests of ReachAdditions (plan_suggest_k.go): the target is met (checked
// by an independent KCover of the final layout and by brute-force K-th
// nearest distances), every step's figures are exact, no addition is
// redundant, and the bad inputs and the cap.

package coverage

import (
	"errors"
	"math"
	"testing"

	"github.com/paulmach/orb"
)

func TestReachAdditions(t *testing.T) {
	sq := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80)})
	for _, c := range []struct {
		name  string
		sites []orb.Point
		K     int
		r     float64
	}{
		{"k2-four-devices", []orb.Point{{20, 20}, {80, 20}, {50, 60}, {10, 70}}, 2, 40},
		{"k3-four-devices", []orb.Point{{20, 20}, {80, 20}, {50, 60}, {10, 70}}, 3, 45},
		{"fewer-devices-than-k", []orb.Point{{50, 40}}, 3, 60},
		{"already-reached", []orb.Point{{20, 20}, {80, 20}, {50, 60}, {10, 70}}, 1, 80},
	} {
		t.Run(c.name, func(t *testing.T) {
			l := cvLayout(t, c.sites, sq)
			s, err := ReachAdditions(l, c.K, c.r, SuggestOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !s.Reached || s.CoverRangeAfter > c.r*(1+planRangeTol) {
				t.Fatalf("not reached: K-cover range %v > %v", s.CoverRangeAfter, c.r)
			}
			t.Logf("%d added (%d pruned), K-cover range %.3f → %.3f", len(s.Added), s.Pruned, s.CoverRangeBefore, s.CoverRangeAfter)
			if c.name == "already-reached" && len(s.Added) != 0 {
				t.Errorf("%d additions to a layout that meets the target", len(s.Added))
			}
			all := append(append([]orb.Point(nil), c.sites...), s.Added...)
			for j := range s.Steps {
				// Reference: an independent KCover of the layout after
				// step j (exact figures).
				sites := append(append([]orb.Point(nil), c.sites...), s.Added[:j+1]...)
				lj := cvLayout(t, sites, sq)
				if lj.Tri.NumVertices() < c.K {
					if !math.IsInf(s.Steps[j].CoverRange, 1) {
						t.Errorf("step %d: range %v with fewer than K devices", j, s.Steps[j].CoverRange)
					}
					continue
				}
				kc, err := KCover(lj, c.r, KOptions{Levels: []int{c.K}})
				if err != nil {
					t.Fatal(err)
				}
				if lv := kc.Levels[0]; lv.CoverRange != s.Steps[j].CoverRange || lv.CoveredArea != s.Steps[j].CoveredArea {
					t.Errorf("step %d: %v %v, KCover %v %v", j, s.Steps[j].CoverRange, s.Steps[j].CoveredArea, lv.CoverRange, lv.CoveredArea)
				}
			}
			// Reference: brute-force K-th nearest distances over a grid: none
			// exceeds r (the final layout reaches every spot K times).
			for x := 0.0; x <= 100; x += 2.5 {
				for y := 0.0; y <= 80; y += 2.5 {
					if d := kBrute(all, x, y, c.K); d > c.r*(1+1e-9) {
						t.Fatalf("(%v, %v): K-th nearest %v > r %v", x, y, d, c.r)
					}
				}
			}
			// No addition is redundant.
			for i := range s.Added {
				rest := append(append(append([]orb.Point(nil), c.sites...), s.Added[:i]...), s.Added[i+1:]...)
				if st, err := reachMeasure(rest, l, c.K, c.r); err != nil || st.rng <= c.r*(1+planRangeTol) {
					t.Errorf("addition %d is redundant (%v, %v)", i, st.rng, err)
				}
			}
		})
	}
}

func TestReachAdditionsBad(t *testing.T) {
	l := cvLayout(t, []orb.Point{{20, 20}, {80, 20}}, cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80)}))
	for _, c := range []struct {
		name string
		K    int
		r    float64
	}{
		{"k-zero", 0, 10}, {"range-zero", 2, 0}, {"range-nan", 2, math.NaN()},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ReachAdditions(l, c.K, c.r, SuggestOptions{}); err == nil {
				t.Error("no error")
			}
		})
	}
	t.Run("cap", func(t *testing.T) {
		s, err := ReachAdditions(l, 3, 20, SuggestOptions{MaxAdditions: 2})
		if !errors.Is(err, ErrReachCap) || s == nil || len(s.Added) != 2 || s.Reached {
			t.Errorf("err %v, suggestion %+v", err, s)
		}
	})
}
