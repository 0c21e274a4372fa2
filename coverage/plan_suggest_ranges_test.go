// Tests of the planners with per-device ranges (plan_suggest_ranges.go)
// against full rebuilds: each candidate's gain is the fall of the
// uncovered area when a device of its range is added (NewLayoutRanges,
// UncoveredAreaGrown: the definitions, evaluated independently); the
// fewest additions leave no gap and none of them can be dropped; the
// figures of each step are those of the rebuilt layout; with equal ranges
// the common-range planners' positions and picks.

package coverage

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// withAdded returns l's layout with devices of range r added at pts.
func withAdded(t *testing.T, l *Layout, pts []orb.Point, r float64) *Layout {
	t.Helper()
	sites := append(slices.Clone(l.Sites), pts...)
	ranges := slices.Clone(l.InputRanges)
	for range pts {
		ranges = append(ranges, r)
	}
	l2, err := NewLayoutRanges(sites, ranges, l.Area)
	if err != nil {
		t.Fatal(err)
	}
	return l2
}

func TestCandidateGainRanges(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) {
			g := newGainIndex(l)
			var sc rangesGainScratch
			before := l.UncoveredAreaGrown(0)
			for k := 0; k < 25; k++ {
				c := orb.Point{rng.Float64()*120 - 10, rng.Float64()*120 - 10}
				r := []float64{5, 14, 30}[k%3]
				got := g.gain(c[0], c[1], r, &sc)
				want := before - withAdded(t, l, []orb.Point{c}, r).UncoveredAreaGrown(0)
				if math.Abs(got-want) > 1e-9*l.AreaM2 {
					t.Errorf("gain at %v (r %v): %v, rebuild %v", c, r, got, want)
				}
			}
		})
	}
}

func TestFewestAdditionsRanges(t *testing.T) {
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) {
			const r = 12.0
			s, err := FewestAdditionsRanges(l, r, SuggestOptions{})
			if err != nil {
				t.Fatal(err)
			}
			l2 := withAdded(t, l, s.Added, r)
			if !s.Reached || s.UncoveredAfter > 1e-9*l.AreaM2 || l2.UncoveredAreaGrown(0) > 1e-9*l.AreaM2 {
				t.Fatalf("reached %v, uncovered after %v (rebuild %v)", s.Reached, s.UncoveredAfter, l2.UncoveredAreaGrown(0))
			}
			for i := range s.Added {
				rest := slices.Delete(slices.Clone(s.Added), i, i+1)
				if withAdded(t, l, rest, r).FullCoverRanges().Power <= planRangeTol*r*r {
					t.Errorf("addition %d can be dropped", i)
				}
			}
			for j, st := range s.Steps {
				lj := withAdded(t, l, s.Added[:j+1], r)
				if u := lj.UncoveredAreaGrown(0); math.Abs(u-st.UncoveredAfter) > 1e-9*l.AreaM2 {
					t.Errorf("step %d: uncovered %v, rebuild %v", j, st.UncoveredAfter, u)
				}
				if p := lj.FullCoverRanges().Power; p != st.FullCoverPowerAfter {
					t.Errorf("step %d: full-cover growth %v, rebuild %v", j, st.FullCoverPowerAfter, p)
				}
				if !l.Area.Contains(st.Added[0], st.Added[1]) {
					t.Errorf("step %d: %v outside the area", j, st.Added)
				}
			}
		})
	}
}

func TestChooseCandidatesRanges(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) {
			cands := make([]orb.Point, 40)
			for i := range cands {
				cands[i] = orb.Point{rng.Float64() * 100, rng.Float64() * 100}
			}
			const r = 15.0
			ch, err := ChooseCandidatesRanges(l, cands, r, 5)
			if err != nil {
				t.Fatal(err)
			}
			var picked []orb.Point
			prev := l.UncoveredAreaGrown(0)
			for j, i := range ch.Picked {
				picked = append(picked, cands[i])
				u := withAdded(t, l, picked, r).UncoveredAreaGrown(0)
				if math.Abs((prev-u)-ch.Gains[j]) > 1e-9*l.AreaM2 {
					t.Errorf("pick %d: gain %v, rebuild %v", j, ch.Gains[j], prev-u)
				}
				// Greedy: no other candidate would have added more.
				for k, c := range cands {
					if slices.Contains(ch.Picked[:j+1], k) {
						continue
					}
					g := prev - withAdded(t, l, append(slices.Clone(picked[:j]), c), r).UncoveredAreaGrown(0)
					if g > ch.Gains[j]+1e-9*l.AreaM2 {
						t.Errorf("pick %d: candidate %d adds %v > %v", j, k, g, ch.Gains[j])
					}
				}
				prev = u
			}
			if math.Abs(prev-ch.UncoveredAfter) > 1e-9*l.AreaM2 {
				t.Errorf("uncovered after %v, rebuild %v", ch.UncoveredAfter, prev)
			}
		})
	}
}

// TestPlanRangesEqualIsCommon: with every range equal, the added devices'
// included, the positions and picks are the common-range planners'.
func TestPlanRangesEqualIsCommon(t *testing.T) {
	for name, l0 := range planFailureScenes(t) {
		t.Run(name, func(t *testing.T) {
			const r = 9.0
			ranges := make([]float64, len(l0.Sites))
			for i := range ranges {
				ranges[i] = r
			}
			l, err := NewLayoutRanges(l0.Sites, ranges, l0.Area)
			if err != nil {
				t.Fatal(err)
			}
			a, err := SuggestAdditions(l0, 3, SuggestOptions{Range: r})
			if err != nil {
				t.Fatal(err)
			}
			b, err := SuggestAdditionsRanges(l, 3, r)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(a.Added, b.Added) || a.UncoveredAfter != b.UncoveredAfter || b.FullCoverAfter != math.Max(r, a.FullCoverAfter) {
				t.Errorf("suggestions differ: %v vs %v", a.Added, b.Added)
			}
			cands := []orb.Point{{10, 10}, {50, 50}, {90, 20}, {30, 80}}
			ca, err := ChooseCandidates(l0, cands, r, 2)
			if err != nil {
				t.Fatal(err)
			}
			cb, err := ChooseCandidatesRanges(l, cands, r, 2)
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(ca.Picked, cb.Picked) || !slices.Equal(ca.Gains, cb.Gains) {
				t.Errorf("picks differ: %v vs %v", ca.Picked, cb.Picked)
			}
		})
	}
}

// TestSuggestRangesHistory: the figures recorded as the additions are
// inserted are, to the last digit, those of the additions replayed from
// the bare layout (the replay is what the planners did before), for free
// placement and for the fewest additions (whose pruning replays).
func TestSuggestRangesHistory(t *testing.T) {
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) {
			const r = 12.0
			p := newRangesPlan(l, r)
			for range 6 {
				if err := p.insert(); err != nil {
					t.Fatal(err)
				}
			}
			got, err := p.history()
			if err != nil {
				t.Fatal(err)
			}
			p.figs = nil
			want, err := p.history()
			if err != nil {
				t.Fatal(err)
			}
			if len(got) != 7 || !reflect.DeepEqual(got, want) {
				t.Errorf("recorded figures %v, replayed %v", got, want)
			}
		})
	}
}

// TestSuggestRangesIncremental: SuggestAdditionsRanges, which updates the
// clipped power diagram in place (plan_suggest_ranges_incr.go), places the
// devices where rebuilding the layout after every addition does, with the
// same figures at every step, to the rounding of the measures
// (incrTolerance), on random scenes: mixed 40/60/120/150 m layouts, scenes
// with many hidden devices (some hidden by the additions), and a
// non-convex area with a zone. (Scenes with exactly tied worst points,
// such as the corners of a square, may pick another of the tied points.)
func TestSuggestRangesIncremental(t *testing.T) {
	// incrTolerance: cell vertices are crossings of power lines with cell
	// edges rather than power centres, which moves them by ulps (about
	// 1e-16 relative measured); 1e-9 leaves a wide margin.
	const incrTolerance = 1e-9
	scenes := map[string]*Layout{"L-notch": planMixedScenes(t)["L-notch"], "uniform": planMixedScenes(t)["uniform"]}
	for _, seed := range []uint64{3, 4} {
		scenes[fmt.Sprintf("mixed-300-seed-%d", seed)], _, _ = mixedLayout(t, 300, seed)
		scenes[fmt.Sprintf("hidden-seed-%d", seed)] = hiddenScene(t, 300, 600, seed)
	}
	for name, l := range scenes {
		t.Run(name, func(t *testing.T) {
			r := 0.25 * math.Sqrt(l.AreaM2/float64(len(l.Sites)))
			const k = 25
			s, err := SuggestAdditionsRanges(l, k, r)
			if err != nil {
				t.Fatal(err)
			}
			p := newRangesPlan(l, r) // rebuilt after every addition
			var tied [][]orb.Point   // the worst points tied within FullCoverRanges' tolerance
			for range k {
				tied = append(tied, p.fc.Worst)
				if err := p.insert(); err != nil {
					t.Fatal(err)
				}
			}
			want, err := p.report()
			if err != nil {
				t.Fatal(err)
			}
			side := math.Sqrt(l.AreaM2)
			near := func(a, b orb.Point) bool { return math.Hypot(a[0]-b[0], a[1]-b[1]) <= incrTolerance*side }
			for j, st := range s.Steps {
				w := want.Steps[j]
				if !near(st.Added, w.Added) {
					// Another of the tied worst points: both are right, and
					// the two runs part here.
					if !slices.ContainsFunc(tied[j], func(q orb.Point) bool { return near(st.Added, q) }) {
						t.Fatalf("addition %d at %v, rebuilding places it at %v (tied worst points %v)", j, st.Added, w.Added, tied[j])
					}
					t.Logf("addition %d: %v, rebuilding takes %v, tied at the same power", j, st.Added, w.Added)
					break
				}
				if math.Abs(st.UncoveredAfter-w.UncoveredAfter) > incrTolerance*l.AreaM2 ||
					math.Abs(st.FullCoverPowerAfter-w.FullCoverPowerAfter) > incrTolerance*(r*r+math.Abs(w.FullCoverPowerAfter)) {
					t.Errorf("step %d: uncovered %v, full-cover growth %v; rebuilding: %v, %v", j,
						st.UncoveredAfter, st.FullCoverPowerAfter, w.UncoveredAfter, w.FullCoverPowerAfter)
				}
			}
		})
	}
}

// BenchmarkSuggestAdditionsRanges: 200 devices of 100 m added to the mixed
// 40/60/120/150 m layout of 10 000 devices (mixedLayout).
func BenchmarkSuggestAdditionsRanges(b *testing.B) {
	l, _, _ := mixedLayout(b, 10_000, 3)
	b.Run("mixed-10000-add-200", func(b *testing.B) {
		for b.Loop() {
			if _, err := SuggestAdditionsRanges(l, 200, 100); err != nil {
				b.Fatal(err)
			}
		}
	})
}
