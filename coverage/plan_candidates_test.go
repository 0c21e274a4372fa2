// Tests of ChooseCandidates (plan_candidates.go).
//
// References: exhaustive search over all k-subsets with the covered area
// of each evaluated from scratch (NewLayout + UncoveredArea, the closed
// form Σ_X area(X) − area(X ∩ D(x, r)) over the clipped cells), and the
// greedy guarantee
// covered(greedy) − covered(∅) ≥ (1 − 1/e)·(covered(OPT) − covered(∅))
// for monotone submodular coverage
// (Nemhauser, Wolsey & Fisher, Math. Programming 14, 1978); the gains the
// greedy reports are the drops in uncovered area of the rebuilt layouts;
// GEOS values are checked in plan_ref_test.go.

package coverage

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// planSubsets calls fn with every k-subset of {0..n-1}.
func planSubsets(n, k int, fn func([]int)) {
	idx := make([]int, k)
	var rec func(start, depth int)
	rec = func(start, depth int) {
		if depth == k {
			fn(idx)
			return
		}
		for i := start; i <= n-(k-depth); i++ {
			idx[depth] = i
			rec(i+1, depth+1)
		}
	}
	rec(0, 0)
}

func TestPlanChooseVsExhaustive(t *testing.T) {
	reg := planTestRegion(t, 100)
	rng := rand.New(rand.NewPCG(51, 52))
	worst := math.Inf(1)
	for trial := 0; trial < 12; trial++ {
		existing := sitegen.Uniform(3+rng.IntN(4), uint64(100+trial))
		l, err := NewLayout(existing, reg)
		if err != nil {
			t.Fatal(err)
		}
		nc := 9
		cands := make([]orb.Point, nc)
		for i := range cands {
			cands[i] = orb.Point{rng.Float64()*120 - 10, rng.Float64()*120 - 10}
		}
		r := 12 + rng.Float64()*15
		k := 2 + trial%3
		ch, err := ChooseCandidates(l, cands, r, k)
		if err != nil {
			t.Fatal(err)
		}
		base := l.AreaM2 - l.UncoveredArea(r)
		best := 0.0
		planSubsets(nc, k, func(s []int) {
			lr := planRebuild(t, existing, planSelect(cands, s), reg)
			best = math.Max(best, l.AreaM2-lr.UncoveredArea(r))
		})
		got := planRebuild(t, existing, planSelect(cands, ch.Picked), reg)
		cov := l.AreaM2 - got.UncoveredArea(r)
		if math.Abs(cov-ch.CoveredAfter) > 1e-9*l.AreaM2 || math.Abs(base-ch.CoveredBefore) > 1e-9*l.AreaM2 {
			t.Errorf("trial %d: covered %.9f→%.9f, rebuilt %.9f→%.9f", trial, ch.CoveredBefore, ch.CoveredAfter, base, cov)
		}
		// Reference: Nemhauser, Wolsey & Fisher (1978).
		if cov-base < (1-1/math.E)*(best-base)-1e-9*l.AreaM2 {
			t.Errorf("trial %d: greedy adds %.6f m², optimum %.6f m²: below (1 − 1/e)", trial, cov-base, best-base)
		}
		if cov > best+1e-9*l.AreaM2 {
			t.Errorf("trial %d: greedy %.9f beats the exhaustive optimum %.9f", trial, cov, best)
		}
		if best > base {
			worst = math.Min(worst, (cov-base)/(best-base))
		}
		// Gains: each the drop in uncovered area when that pick was added.
		var so []orb.Point
		prev := l.UncoveredArea(r)
		for j, p := range ch.Picked {
			so = append(so, cands[p])
			u := planRebuild(t, existing, so, reg).UncoveredArea(r)
			if math.Abs(ch.Gains[j]-(prev-u)) > 1e-9*l.AreaM2 {
				t.Errorf("trial %d pick %d: gain %.9f, rebuilt %.9f", trial, j, ch.Gains[j], prev-u)
			}
			if j > 0 && ch.Gains[j] > ch.Gains[j-1]*(1+1e-12) {
				t.Errorf("trial %d: gains rose %v", trial, ch.Gains)
			}
			prev = u
		}
	}
	t.Logf("smallest greedy/optimum ratio of added area: %.4f", worst)
}

func TestPlanChooseFewest(t *testing.T) {
	reg := planTestRegion(t, 100)
	l, err := NewLayout([]orb.Point{{10, 10}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	const r = 15
	// Candidates on a 7.5 m grid: enough to cover everything.
	var cands []orb.Point
	for x := 0.0; x <= 100; x += 7.5 {
		for y := 0.0; y <= 100; y += 7.5 {
			cands = append(cands, orb.Point{x, y})
		}
	}
	ch, err := ChooseCandidates(l, cands, r, 0)
	if err != nil {
		t.Fatal(err)
	}
	lr := planRebuild(t, l.Sites, planSelect(cands, ch.Picked), reg)
	if fc := lr.FullCover().Range; !ch.Complete || fc > r*(1+1e-12) || ch.Remaining != nil || ch.UncoveredAfter > 1e-9*l.AreaM2 {
		t.Errorf("fewest: complete %v, rebuilt full cover %.12g, uncovered %.3g", ch.Complete, fc, ch.UncoveredAfter)
	}
	// Reference: n disks cover at most n·πr².
	if lb := int(math.Ceil((l.AreaM2 - math.Pi*r*r/4) / (math.Pi * r * r))); len(ch.Picked) < lb {
		t.Errorf("%d picks beat the area bound %d", len(ch.Picked), lb)
	}
	t.Logf("%d picks from %d candidates, %d evaluations", len(ch.Picked), len(cands), ch.Evaluations)

	// Candidates only in the left half: full cover is out of reach; the
	// gaps left are reported and add up to the uncovered area.
	var left []orb.Point
	for _, p := range cands {
		if p[0] <= 40 {
			left = append(left, p)
		}
	}
	ch, err = ChooseCandidates(l, left, r, 0)
	if err != nil {
		t.Fatal(err)
	}
	if ch.Complete || !ch.Exhausted || len(ch.Remaining) == 0 {
		t.Fatalf("left half: complete %v exhausted %v gaps %d", ch.Complete, ch.Exhausted, len(ch.Remaining))
	}
	sum := 0.0
	for _, g := range ch.Remaining {
		sum += g.Area
	}
	if math.Abs(sum-ch.UncoveredAfter) > 1e-6*l.AreaM2 {
		t.Errorf("gap areas sum to %.9f, uncovered %.9f", sum, ch.UncoveredAfter)
	}
	// With k larger than useful, selection stops when gains vanish.
	ch, err = ChooseCandidates(l, left[:4], r, 10)
	if err != nil || len(ch.Picked) > 4 || !ch.Exhausted {
		t.Errorf("k=10 of 4: %v picks, exhausted %v, %v", ch.Picked, ch.Exhausted, err)
	}
}

func TestPlanChooseDegenerate(t *testing.T) {
	reg := planTestRegion(t, 100)
	l, err := NewLayout([]orb.Point{{10, 10}, {90, 90}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	// Duplicate candidates, a candidate on an existing device, one far
	// outside: none of these is picked twice or for nothing.
	cands := []orb.Point{{50, 50}, {50, 50}, {10, 10}, {1e4, 1e4}, {30, 70}}
	ch, err := ChooseCandidates(l, cands, 20, 5)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range ch.Picked {
		if p == 1 || p == 2 || p == 3 {
			t.Errorf("picked %d (%v) with gains %v", p, cands[p], ch.Gains)
		}
	}
	for _, c := range []struct {
		name  string
		cands []orb.Point
		r     float64
		want  string
	}{
		{"none", nil, 10, "no candidate"},
		{"NaN", []orb.Point{{1, 1}, {math.NaN(), 1}}, 10, "candidate 1: x coordinate is NaN"},
		{"zero range", cands, 0, "range 0"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ChooseCandidates(l, c.cands, c.r, 2); err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: error %v, want %q", c.name, err, c.want)
			}
		})
	}
}
