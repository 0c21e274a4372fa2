// Tests of ReachAdditionsRanges (plan_suggest_k.go): with own ranges the
// target is met (brute-force K-th smallest power over a grid, every device
// counted, the new ones at their range), every step's figures are an
// independent KCoverRanges', no addition is redundant, and with equal
// ranges the additions are ReachAdditions' own.

package coverage

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

func TestReachAdditionsRanges(t *testing.T) {
	sq := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80)})
	for _, c := range []struct {
		name   string
		sites  []orb.Point
		ranges []float64
		K      int
		r      float64
	}{
		// (48, 42) with 8 m lies inside (50, 40)'s 40 m disk: hidden.
		{"k2-mixed-hidden", []orb.Point{{20, 20}, {80, 20}, {50, 40}, {48, 42}, {10, 70}}, []float64{25, 30, 40, 8, 20}, 2, 30},
		{"k3-mixed", []orb.Point{{20, 20}, {80, 20}, {50, 60}, {10, 70}}, []float64{30, 45, 25, 35}, 3, 40},
		{"fewer-devices-than-k", []orb.Point{{50, 40}, {52, 41}}, []float64{50, 20}, 3, 60},
	} {
		t.Run(c.name, func(t *testing.T) {
			l, err := NewLayoutRanges(c.sites, c.ranges, sq)
			if err != nil {
				t.Fatal(err)
			}
			if c.name == "k2-mixed-hidden" && len(l.Hidden) != 1 {
				t.Fatalf("hidden %v, want one", l.Hidden)
			}
			s, err := ReachAdditionsRanges(l, c.K, c.r, SuggestOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !s.OwnRanges || !s.Reached || !math.IsNaN(s.CoverRangeAfter) {
				t.Fatalf("own %v, reached %v, K-cover power %v → %v, range %v", s.OwnRanges, s.Reached, s.CoverPowerBefore, s.CoverPowerAfter, s.CoverRangeAfter)
			}
			t.Logf("%d added (%d pruned), K-cover power %.3f → %.3f", len(s.Added), s.Pruned, s.CoverPowerBefore, s.CoverPowerAfter)
			all := append(append([]orb.Point(nil), c.sites...), s.Added...)
			rs := append([]float64(nil), c.ranges...)
			for range s.Added {
				rs = append(rs, c.r)
			}
			// Reference: brute-force K-th smallest power over a grid (every
			// device, the hidden one included): none above 0.
			for x := 0.0; x <= 100; x += 2.5 {
				for y := 0.0; y <= 80; y += 2.5 {
					if p := kthPower(all, rs, x, y, c.K); p > 1e-9*c.r*c.r {
						t.Fatalf("(%v, %v): K-th smallest power %v > 0", x, y, p)
					}
				}
			}
			for j := range s.Steps {
				// Reference: an independent KCoverRanges after step j.
				n := len(c.sites) + j + 1
				lj, err := NewLayoutRanges(all[:n], rs[:n], sq)
				if err != nil {
					t.Fatal(err)
				}
				kc, err := KCoverRanges(lj, KOptions{Levels: []int{c.K}})
				if err != nil {
					if math.IsInf(s.Steps[j].CoverPower, 1) {
						continue // fewer than K devices
					}
					t.Fatal(err)
				}
				if lv := kc.Levels[0]; lv.CoverPower != s.Steps[j].CoverPower || lv.CoveredArea != s.Steps[j].CoveredArea {
					t.Errorf("step %d: %v, %v; KCoverRanges %v, %v", j, s.Steps[j].CoverPower, s.Steps[j].CoveredArea, lv.CoverPower, lv.CoveredArea)
				}
			}
			// No addition is redundant.
			m := &reachModel{r: c.r, ranges: c.ranges}
			for i := range s.Added {
				rest := append(append(append([]orb.Point(nil), c.sites...), s.Added[:i]...), s.Added[i+1:]...)
				if st, err := m.measure(rest, l, c.K); err != nil || st.rng <= 1e-9*c.r*c.r {
					t.Errorf("addition %d is redundant (%v, %v)", i, st.rng, err)
				}
			}
		})
	}
}

// TestReachAdditionsRangesEqual: equal ranges, new devices of that range:
// the same additions as ReachAdditions at the common range.
func TestReachAdditionsRangesEqual(t *testing.T) {
	sq := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80)})
	sites := []orb.Point{{20, 20}, {80, 20}, {50, 60}, {10, 70}}
	l, err := NewLayoutRanges(sites, []float64{40, 40, 40, 40}, sq)
	if err != nil {
		t.Fatal(err)
	}
	own, err := ReachAdditionsRanges(l, 2, 40, SuggestOptions{})
	if err != nil {
		t.Fatal(err)
	}
	common, err := ReachAdditions(cvLayout(t, sites, sq), 2, 40, SuggestOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(own.Added) != len(common.Added) {
		t.Fatalf("%d additions with own ranges, %d at the common range", len(own.Added), len(common.Added))
	}
	for i := range own.Added {
		if own.Added[i] != common.Added[i] || own.Steps[i].CoveredArea != common.Steps[i].CoveredArea {
			t.Errorf("addition %d: %v (%v m²), common range %v (%v m²)", i, own.Added[i], own.Steps[i].CoveredArea, common.Added[i], common.Steps[i].CoveredArea)
		}
	}
}

func TestReachAdditionsRangesBad(t *testing.T) {
	sq := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80)})
	if _, err := ReachAdditionsRanges(cvLayout(t, []orb.Point{{20, 20}, {80, 20}}, sq), 2, 30, SuggestOptions{}); err == nil {
		t.Error("a common-range layout was accepted")
	}
	l, err := NewLayoutRanges([]orb.Point{{20, 20}, {80, 20}}, []float64{10, 20}, sq)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		K    int
		r    float64
	}{{"k0", 0, 30}, {"range0", 2, 0}, {"range-nan", 2, math.NaN()}} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ReachAdditionsRanges(l, c.K, c.r, SuggestOptions{}); err == nil {
				t.Error("accepted")
			}
		})
	}
}
