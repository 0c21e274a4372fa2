// Tests of ChooseCandidatesReach against GEOS (Debian python3-shapely),
// from testdata/plan_reach_ref.json written by testdata/ref_plan_reach.py:
// for every subset of the candidate spots, the area reached by at least k
// devices drawn with inscribed and circumscribed polygons, which bracket
// the exact area. From that table an exhaustive search gives the fewest
// candidates that surely (inscribed) or possibly (circumscribed) reach
// every spot k times; sitecover's own exhaustive search over the same
// subsets (exact KCover) must lie between them, the greedy's lower bound
// below it, and a choice called Optimal must match it.
// TestPlanReachReference checks the committed data; TestPlanReachLive
// re-runs the script on a fresh seed under SITECOVER_LIVE=1, where a
// missing tool is a failure.
//
// Tolerances: planRangesRefAreaTol (relative to the site area) for the
// bracket, as the other GEOS area checks; "reaches every spot" in the
// GEOS table is an area within planReachRefFullRel of the site area.

package coverage

import (
	"math"
	"math/bits"
	"path/filepath"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// planReachRefFullRel is the relative shortfall below which a GEOS area
// counts as the whole site: GEOS's overlay rounds areas of polygons with a
// few thousand vertices of coordinates up to 10² m to about 1e-13
// relative; 1e-11 leaves a margin and is far below any true shortfall of
// the scenes (the smallest part short is larger than 1e-6 of the site).
const planReachRefFullRel = 1e-11

type planReachRefDoc struct {
	Generator string              `json:"generator"`
	Seed      int64               `json:"seed"`
	Scenes    []planReachRefScene `json:"scenes"`
}

type planReachRefScene struct {
	refScene
	Candidates [][2]float64 `json:"candidates"`
	K          int          `json:"k"`
	Area       float64      `json:"area"`
	Subsets    []refSubset  `json:"subsets"`
}

// refSubset is one subset of the candidate spots in the GEOS tables of
// the candidate tests: its bit mask and the area GEOS finds with the
// disks inscribed and circumscribed.
type refSubset struct {
	Mask   int     `json:"mask"`
	Insc   float64 `json:"inscribed"`
	Circum float64 `json:"circumscribed"`
}

func TestPlanReachReference(t *testing.T) {
	var d planReachRefDoc
	kLoadJSON(t, filepath.Join("testdata", "plan_reach_ref.json"), &d)
	planReachRefCheck(t, &d)
}

func TestPlanReachLive(t *testing.T) {
	var d planReachRefDoc
	kLoadJSON(t, liveRefRun(t, "ref_plan_reach.py", "GEOS via python3-shapely"), &d)
	planReachRefCheck(t, &d)
}

// planReachMin is the smallest popcount of the masks for which ok holds
// (−1 when none).
func planReachMin(n int, ok func(mask int) bool) int {
	best := -1
	for mask := 0; mask < 1<<n; mask++ {
		if c := bits.OnesCount(uint(mask)); ok(mask) && (best < 0 || c < best) {
			best = c
		}
	}
	return best
}

func planReachRefCheck(t *testing.T, d *planReachRefDoc) {
	if len(d.Scenes) == 0 {
		t.Fatal("no scenes")
	}
	for _, sc := range d.Scenes {
		t.Run(sc.Name, func(t *testing.T) {
			l := cvLayout(t, planPoints(sc.Sites), planPolyRegion(t, sc.Exterior, sc.Holes))
			cands := planPoints(sc.Candidates)
			n := len(cands)
			if len(sc.Subsets) != 1<<n {
				t.Fatalf("%d subsets for %d candidates", len(sc.Subsets), n)
			}
			A := l.AreaM2
			tol := planRangesRefAreaTol * A
			target := sc.Range * (1 + planRangeTol)
			// Every subset: sitecover's exact K-covered area inside the
			// GEOS bracket, and whether it reaches every spot K times.
			reached := make([]bool, 1<<n)
			for _, s := range sc.Subsets {
				sites := slices.Clone(l.Sites)
				for i := range n {
					if s.Mask>>i&1 == 1 {
						sites = append(sites, cands[i])
					}
				}
				got, err := (&reachCands{l: l, K: sc.K, r: sc.Range}).measure(sites, nil)
				if err != nil {
					t.Fatal(err)
				}
				// Reference: GEOS union over K-subsets of disk
				// intersections, inscribed ≤ exact ≤ circumscribed.
				if got.area < s.Insc-tol || got.area > s.Circum+tol {
					t.Errorf("mask %b: K-covered area %.9f outside GEOS bracket [%.9f, %.9f]", s.Mask, got.area, s.Insc, s.Circum)
				}
				reached[s.Mask] = got.rng <= target
			}
			full := func(v float64) bool { return v >= A*(1-planReachRefFullRel) }
			geosSure := planReachMin(n, func(m int) bool { return full(sc.Subsets[m].Insc) })
			geosMaybe := planReachMin(n, func(m int) bool { return full(sc.Subsets[m].Circum) })
			exact := planReachMin(n, func(m int) bool { return reached[m] })
			// Reference: GEOS's exhaustive search brackets sitecover's.
			if (geosSure >= 0 && (exact < 0 || exact > geosSure)) || (exact >= 0 && (geosMaybe < 0 || exact < geosMaybe)) {
				t.Errorf("fewest candidates: sitecover exhaustive %d, GEOS surely %d, possibly %d", exact, geosSure, geosMaybe)
			}
			rc, err := ChooseCandidatesReach(l, cands, sc.K, sc.Range, 0)
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("%d picks (%d pruned), lower bound %d, optimal %v; exhaustive fewest %d (GEOS %d..%d)",
				len(rc.Picks), rc.Pruned, rc.LowerBound, rc.Optimal, exact, geosMaybe, geosSure)
			mask := 0
			for _, p := range rc.Picks {
				mask |= 1 << p.Candidate
				if cands[p.Candidate] == orb.Point(sc.Sites[2]) {
					t.Errorf("picked candidate %d on an existing device (it adds nothing)", p.Candidate)
				}
			}
			if rc.Reached != reached[mask] {
				t.Errorf("Reached %v, the exhaustive check of the picks says %v", rc.Reached, reached[mask])
			}
			switch {
			case exact < 0:
				if rc.Reached || !rc.Exhausted || rc.Optimal {
					t.Errorf("no subset reaches the target, yet reached %v, exhausted %v, optimal %v", rc.Reached, rc.Exhausted, rc.Optimal)
				}
				short := 0.0
				for _, g := range rc.Remaining {
					short += g.Area
				}
				if len(rc.Remaining) == 0 || math.Abs(short-(A-rc.CoveredAfter)) > tol {
					t.Errorf("remaining: %d parts of %.9f m², want %.9f m²", len(rc.Remaining), short, A-rc.CoveredAfter)
				}
			default:
				if !rc.Reached || len(rc.Picks) < exact || rc.LowerBound > exact {
					t.Errorf("reached %v with %d picks, lower bound %d; the fewest are %d", rc.Reached, len(rc.Picks), rc.LowerBound, exact)
				}
				if rc.Optimal && len(rc.Picks) != exact {
					t.Errorf("claims optimal with %d picks; the fewest are %d", len(rc.Picks), exact)
				}
				if rc.Remaining != nil || rc.ShareAfter != 1 && math.Abs(rc.CoveredAfter-A) > tol {
					t.Errorf("reached, yet %d parts remain, %.9f of %.9f m² reached", len(rc.Remaining), rc.CoveredAfter, A)
				}
			}
		})
	}
}

// TestPlanReachPicks checks the fixed-number form, a k above the number
// of devices, and the figures after each pick against a fresh KCover of
// the same layout.
func TestPlanReachPicks(t *testing.T) {
	l := cvLayout(t, []orb.Point{{20, 20}, {80, 60}}, planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 80}, {0, 80}}, nil))
	cands := []orb.Point{{20, 60}, {80, 20}, {50, 40}, {50, 40}, {20, 20}, {5, 75}}
	for _, c := range []struct {
		name     string
		K, picks int
	}{{"two", 2, 2}, {"fewest", 2, 0}, {"k-above-devices", 3, 0}} {
		t.Run(c.name, func(t *testing.T) {
			rc, err := ChooseCandidatesReach(l, cands, c.K, 45, c.picks)
			if err != nil {
				t.Fatal(err)
			}
			if c.picks > 0 && len(rc.Picks) != c.picks {
				t.Fatalf("%d picks, want %d", len(rc.Picks), c.picks)
			}
			sites := slices.Clone(l.Sites)
			for j, p := range rc.Picks {
				// Candidate 4 stands on a device and 3 on candidate 2:
				// each adds nothing once its twin stands.
				if p.Gain <= 0 || p.Candidate == 4 || p.Candidate == 3 && slices.ContainsFunc(rc.Picks, func(q ReachPick) bool { return q.Candidate == 2 }) {
					t.Errorf("pick %d: candidate %d, gain %v", j, p.Candidate, p.Gain)
				}
				sites = append(sites, p.Position)
				l2 := cvLayout(t, sites, l.Area)
				if l2.Tri.NumVertices() < c.K {
					if !math.IsInf(p.CoverRange, 1) || p.CoveredArea != 0 {
						t.Errorf("pick %d: %d devices for k = %d, yet range %v, area %v", j, l2.Tri.NumVertices(), c.K, p.CoverRange, p.CoveredArea)
					}
					continue
				}
				kc, err := KCover(l2, 45, KOptions{MaxK: c.K})
				if err != nil {
					t.Fatal(err)
				}
				if lv := kc.Levels[c.K-1]; lv.CoverRange != p.CoverRange || lv.CoveredArea != p.CoveredArea || lv.Share != p.Share {
					t.Errorf("pick %d: %v %v %v, KCover %v %v %v", j, p.CoverRange, p.CoveredArea, p.Share, lv.CoverRange, lv.CoveredArea, lv.Share)
				}
			}
		})
	}
}

func TestPlanReachBadInput(t *testing.T) {
	l := cvLayout(t, []orb.Point{{20, 20}, {80, 60}}, planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 80}, {0, 80}}, nil))
	for _, c := range []struct {
		name  string
		cands []orb.Point
		K     int
		r     float64
	}{
		{"k-zero", []orb.Point{{1, 1}}, 0, 10},
		{"range-nan", []orb.Point{{1, 1}}, 2, math.NaN()},
		{"no-candidates", nil, 2, 10},
		{"candidate-inf", []orb.Point{{math.Inf(1), 1}}, 2, 10},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ChooseCandidatesReach(l, c.cands, c.K, c.r, 0); err == nil {
				t.Error("no error")
			}
		})
	}
}
