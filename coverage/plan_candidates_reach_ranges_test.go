// Tests of ChooseCandidatesReachRanges: against an exhaustive search over
// every subset of the candidate spots on small scenes with mixed ranges
// (each subset's K-cover power and K-covered area from KCoverRanges), the
// figures after each pick against a fresh KCoverRanges, and equal ranges
// against ChooseCandidatesReach.

package coverage

import (
	"math"
	"reflect"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// reachRangesBrute is the K-cover power and K-covered area of the existing
// devices with the candidates of idx, in that order (power +Inf, area 0
// with fewer than K distinct devices).
func reachRangesBrute(t *testing.T, l *Layout, cands []orb.Point, candR []float64, K int, idx []int) (power, area float64) {
	t.Helper()
	sites, rs := slices.Clone(l.Sites), slices.Clone(l.InputRanges)
	for _, i := range idx {
		sites, rs = append(sites, cands[i]), append(rs, candR[i])
	}
	distinct := map[orb.Point]bool{}
	for _, p := range sites {
		distinct[p] = true
	}
	if len(distinct) < K {
		return math.Inf(1), 0
	}
	l2, err := NewLayoutRanges(sites, rs, l.Area)
	if err != nil {
		t.Fatal(err)
	}
	kc, err := KCoverRanges(l2, KOptions{Levels: []int{K}})
	if err != nil {
		t.Fatal(err)
	}
	return kc.Levels[0].CoverPower, kc.Levels[0].CoveredArea
}

// TestPlanReachRangesBrute checks the fewest form against the exhaustive
// search: the greedy reaches the target exactly when some subset does,
// with at least the fewest picks and a lower bound at most the fewest
// (equal to it when Optimal), and each pick's figures are KCoverRanges' of
// the layout with the picks so far.
func TestPlanReachRangesBrute(t *testing.T) {
	reg := planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 80}, {0, 80}}, nil)
	cands := []orb.Point{{20, 60}, {80, 20}, {50, 40}, {10, 40}, {90, 40}, {50, 10}, {50, 75}, {20, 20}}
	for _, c := range []struct {
		name   string
		sites  []orb.Point
		ranges []float64
		candR  []float64
		K      int
	}{
		{"k2-reachable", []orb.Point{{20, 20}, {80, 60}}, []float64{50, 65}, []float64{55, 60, 70, 40, 50, 45, 55, 35}, 2},
		{"k2-short", []orb.Point{{20, 20}, {80, 60}}, []float64{30, 45}, []float64{30, 25, 40, 20, 30, 25, 30, 20}, 2},
		{"k3-reachable", []orb.Point{{30, 40}, {70, 40}}, []float64{60, 70}, []float64{70, 55, 80, 50, 60, 55, 65, 45}, 3},
		{"k1-hidden", []orb.Point{{50, 40}, {52, 41}}, []float64{30, 5}, []float64{45, 50, 10, 40, 45, 35, 35, 30}, 1},
	} {
		t.Run(c.name, func(t *testing.T) {
			l, err := NewLayoutRanges(c.sites, c.ranges, reg)
			if err != nil {
				t.Fatal(err)
			}
			hi := slices.Max(append(slices.Clone(c.ranges), c.candR...))
			target := ((1+planRangeTol)*(1+planRangeTol) - 1) * hi * hi
			best := planReachMin(len(cands), func(mask int) bool {
				var idx []int
				for i := range cands {
					if mask&(1<<i) != 0 {
						idx = append(idx, i)
					}
				}
				p, _ := reachRangesBrute(t, l, cands, c.candR, c.K, idx)
				return p <= target
			})
			rc, err := ChooseCandidatesReachRanges(l, cands, c.candR, c.K, 0)
			if err != nil {
				t.Fatal(err)
			}
			if !rc.OwnRanges || !math.IsNaN(rc.CoverRangeAfter) {
				t.Fatalf("OwnRanges %v, CoverRangeAfter %v", rc.OwnRanges, rc.CoverRangeAfter)
			}
			t.Logf("fewest %d; greedy %d (bound %d, optimal %v, pruned %d, exhausted %v)", best, len(rc.Picks), rc.LowerBound, rc.Optimal, rc.Pruned, rc.Exhausted)
			if (best >= 0) != rc.Reached || (best < 0) != rc.Exhausted {
				t.Fatalf("fewest %d, yet Reached %v Exhausted %v", best, rc.Reached, rc.Exhausted)
			}
			if best >= 0 && (len(rc.Picks) < best || rc.LowerBound > best || rc.Optimal && len(rc.Picks) != best) {
				t.Errorf("fewest %d: picks %d, bound %d, optimal %v", best, len(rc.Picks), rc.LowerBound, rc.Optimal)
			}
			if best < 0 && len(rc.Remaining) == 0 {
				t.Error("short, yet no part remaining")
			}
			// The same sites in the same order: the figures are equal to
			// the last bit.
			var idx []int
			for j, pk := range rc.Picks {
				idx = append(idx, pk.Candidate)
				p, a := reachRangesBrute(t, l, cands, c.candR, c.K, idx)
				if pk.CoverPower != p || pk.CoveredArea != a || pk.Range != c.candR[pk.Candidate] || !(pk.Gain > 0) {
					t.Errorf("pick %d: power %v area %v range %v gain %v; KCoverRanges %v %v", j, pk.CoverPower, pk.CoveredArea, pk.Range, pk.Gain, p, a)
				}
			}
			if p, a := reachRangesBrute(t, l, cands, c.candR, c.K, idx); rc.CoverPowerAfter != p || rc.CoveredAfter != a {
				t.Errorf("after: %v %v, KCoverRanges %v %v", rc.CoverPowerAfter, rc.CoveredAfter, p, a)
			}
			if p, a := reachRangesBrute(t, l, cands, c.candR, c.K, nil); rc.CoverPowerBefore != p || rc.CoveredBefore != a {
				t.Errorf("before: %v %v, KCoverRanges %v %v", rc.CoverPowerBefore, rc.CoveredBefore, p, a)
			}
			// The fixed-number form: two picks unless no spot adds depth.
			rc2, err := ChooseCandidatesReachRanges(l, cands, c.candR, c.K, 2)
			if err != nil {
				t.Fatal(err)
			}
			if len(rc2.Picks) != 2 && !rc2.Exhausted {
				t.Errorf("%d picks for 2", len(rc2.Picks))
			}
		})
	}
}

// TestPlanReachRangesEqual checks that equal ranges, existing and
// candidate, give exactly ChooseCandidatesReach's answer.
func TestPlanReachRangesEqual(t *testing.T) {
	reg := planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 80}, {0, 80}}, nil)
	sites := []orb.Point{{20, 20}, {80, 60}}
	cands := []orb.Point{{20, 60}, {80, 20}, {50, 40}, {50, 40}, {20, 20}, {5, 75}}
	lr, err := NewLayoutRanges(sites, []float64{45, 45}, reg)
	if err != nil {
		t.Fatal(err)
	}
	l := cvLayout(t, sites, reg)
	for _, c := range []struct {
		name     string
		K, picks int
	}{{"fewest", 2, 0}, {"two", 2, 2}, {"k-above-devices", 3, 0}} {
		t.Run(c.name, func(t *testing.T) {
			got, err := ChooseCandidatesReachRanges(lr, cands, []float64{45, 45, 45, 45, 45, 45}, c.K, c.picks)
			if err != nil {
				t.Fatal(err)
			}
			want, err := ChooseCandidatesReach(l, cands, c.K, 45, c.picks)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("own ranges %+v\ncommon range %+v", got, want)
			}
		})
	}
}

func TestPlanReachRangesBadInput(t *testing.T) {
	reg := planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 80}, {0, 80}}, nil)
	lr, err := NewLayoutRanges([]orb.Point{{20, 20}, {80, 60}}, []float64{30, 40}, reg)
	if err != nil {
		t.Fatal(err)
	}
	l := cvLayout(t, []orb.Point{{20, 20}, {80, 60}}, reg)
	for _, c := range []struct {
		name   string
		l      *Layout
		ranges []float64
		K      int
	}{
		{"common-layout", l, []float64{30}, 2},
		{"count", lr, []float64{30, 30}, 2},
		{"range-zero", lr, []float64{0}, 2},
		{"range-nan", lr, []float64{math.NaN()}, 2},
		{"k-zero", lr, []float64{30}, 0},
		{"no-layout", nil, []float64{30}, 2},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ChooseCandidatesReachRanges(c.l, []orb.Point{{1, 1}}, c.ranges, c.K, 0); err == nil {
				t.Error("no error")
			}
		})
	}
}
