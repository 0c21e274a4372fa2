// Tests of ChooseCandidatesEach (candidate spots with a range of their
// own) against GEOS (Debian python3-shapely), from
// testdata/plan_candranges_ref.json written by
// testdata/ref_plan_candranges.py: for every subset of the candidate
// spots, the covered area with the devices and those spots, each disk at
// its own range, drawn with inscribed and circumscribed polygons, which
// bracket the exact area. TestPlanCandRangesReference checks the committed
// data; TestPlanCandRangesLive re-runs the script on a fresh seed under
// SITECOVER_LIVE=1, where a missing tool is a failure.
//
// Checked: sitecover's exact covered area of every subset inside the
// bracket; the covered area after each greedy pick (the gains summed)
// inside the bracket of the picks so far; and the greedy guarantee of
// Nemhauser, Wolsey & Fisher (Math. Programming 14, 1978) against the
// best subset of each size by GEOS's upper bound. Tolerance:
// planRangesRefAreaTol of the site area, as the other GEOS area checks.

package coverage

import (
	"math"
	"math/bits"
	"path/filepath"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

type planCandRangesRefDoc struct {
	Scenes []struct {
		refScene
		Ranges     []float64    `json:"ranges"`
		Candidates [][2]float64 `json:"candidates"`
		CandRanges []float64    `json:"candidate_ranges"`
		Subsets    []refSubset  `json:"subsets"`
	} `json:"scenes"`
}

func TestPlanCandRangesReference(t *testing.T) {
	var d planCandRangesRefDoc
	kLoadJSON(t, filepath.Join("testdata", "plan_candranges_ref.json"), &d)
	planCandRangesCheck(t, &d)
}

func TestPlanCandRangesLive(t *testing.T) {
	var d planCandRangesRefDoc
	kLoadJSON(t, liveRefRun(t, "ref_plan_candranges.py", "GEOS via python3-shapely"), &d)
	planCandRangesCheck(t, &d)
}

func planCandRangesCheck(t *testing.T, d *planCandRangesRefDoc) {
	if len(d.Scenes) == 0 {
		t.Fatal("no scenes")
	}
	for _, sc := range d.Scenes {
		t.Run(sc.Name, func(t *testing.T) {
			reg := planPolyRegion(t, sc.Exterior, sc.Holes)
			sites := planPoints(sc.Sites)
			l, err := NewLayoutRanges(sites, sc.Ranges, reg)
			if err != nil {
				t.Fatal(err)
			}
			cands := planPoints(sc.Candidates)
			n := len(cands)
			if len(sc.Subsets) != 1<<n {
				t.Fatalf("%d subsets for %d candidates", len(sc.Subsets), n)
			}
			A := l.AreaM2
			tol := planRangesRefAreaTol * A
			inBracket := func(what string, mask int, v float64) {
				t.Helper()
				// Reference: GEOS, inscribed ≤ exact ≤ circumscribed.
				s := sc.Subsets[mask]
				if v < s.Insc-tol || v > s.Circum+tol {
					t.Errorf("%s (mask %b): covered %.9f outside GEOS bracket [%.9f, %.9f]", what, mask, v, s.Insc, s.Circum)
				}
			}
			for mask := range 1 << n {
				pts, rs := slices.Clone(sites), slices.Clone(sc.Ranges)
				for i := range n {
					if mask>>i&1 == 1 {
						pts, rs = append(pts, cands[i]), append(rs, sc.CandRanges[i])
					}
				}
				l2, err := NewLayoutRanges(pts, rs, reg)
				if err != nil {
					t.Fatal(err)
				}
				inBracket("subset", mask, A-l2.UncoveredAreaGrown(0))
			}
			ch, err := ChooseCandidatesEach(l, cands, sc.CandRanges, 0)
			if err != nil {
				t.Fatal(err)
			}
			if len(ch.Ranges) != len(ch.Picked) || ch.NewRange != slices.Max(sc.CandRanges) {
				t.Fatalf("%d ranges for %d picks, new range %v", len(ch.Ranges), len(ch.Picked), ch.NewRange)
			}
			mask, cov := 0, ch.CoveredBefore
			inBracket("before", 0, cov)
			for j, c := range ch.Picked {
				if ch.Ranges[j] != sc.CandRanges[c] {
					t.Errorf("pick %d: range %v, candidate %d has %v", j+1, ch.Ranges[j], c, sc.CandRanges[c])
				}
				mask |= 1 << c
				cov += ch.Gains[j]
				inBracket("after pick", mask, cov)
				// Reference: the (1 − 1/e) guarantee against the best
				// subset of the same size by GEOS's upper bound.
				k := j + 1
				best := 0.0
				for m, s := range sc.Subsets {
					if bits.OnesCount(uint(m)) == k {
						best = math.Max(best, s.Circum)
					}
				}
				if cov-ch.CoveredBefore < (1-1/math.E)*(best-sc.Subsets[0].Insc)-tol {
					t.Errorf("%d picks add %.6f m², below (1 − 1/e) of the best %.6f m²", k, cov-ch.CoveredBefore, best-sc.Subsets[0].Insc)
				}
			}
			inBracket("after", mask, ch.CoveredAfter)
			t.Logf("%d picks of %d, covered %.3f -> %.3f of %.3f m², complete %v, exhausted %v", len(ch.Picked), n, ch.CoveredBefore, ch.CoveredAfter, A, ch.Complete, ch.Exhausted)
		})
	}
}

// TestChooseCandidatesEachEqual checks that equal candidate ranges give
// ChooseCandidatesRanges' choice, and that bad ranges are refused.
func TestChooseCandidatesEachEqual(t *testing.T) {
	reg := planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 80}, {0, 80}}, nil)
	l, err := NewLayoutRanges([]orb.Point{{20, 20}, {80, 60}}, []float64{25, 35}, reg)
	if err != nil {
		t.Fatal(err)
	}
	cands := []orb.Point{{20, 60}, {80, 20}, {50, 40}, {5, 75}}
	a, err := ChooseCandidatesEach(l, cands, []float64{30, 30, 30, 30}, 2)
	if err != nil {
		t.Fatal(err)
	}
	b, err := ChooseCandidatesRanges(l, cands, 30, 2)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(a.Picked, b.Picked) || !slices.Equal(a.Gains, b.Gains) || a.Ranges != nil || a.NewRange != 30 {
		t.Errorf("equal ranges: %v %v %v, ChooseCandidatesRanges %v %v", a.Picked, a.Gains, a.Ranges, b.Picked, b.Gains)
	}
	for _, c := range []struct {
		name   string
		ranges []float64
	}{
		{"short", []float64{30}},
		{"zero", []float64{30, 0, 30, 30}},
		{"nan", []float64{30, math.NaN(), 30, 30}},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ChooseCandidatesEach(l, cands, c.ranges, 0); err == nil {
				t.Error("no error")
			}
		})
	}
}
