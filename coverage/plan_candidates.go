// Choosing among candidate mounting spots: greedy maximum coverage with
// exact marginal areas and lazy re-evaluation.
//
// Objective. With the existing devices fixed, f(S) is the area of the site
// area A within range r of a device in the existing layout or the chosen
// set S. f is monotone and submodular (the area of a union of sets), so the
// greedy rule — repeatedly pick the candidate that adds the most covered
// area — achieves at least (1 − 1/e) of the best possible added area for
// any number k of picks (Nemhauser, Wolsey & Fisher, "An analysis of
// approximations for maximizing submodular set functions", Math.
// Programming 14, 1978). For the fewest spots covering everything (k ≤ 0)
// the same rule is the greedy set cover (Chvátal, "A greedy heuristic for
// the set-covering problem", Math. Oper. Res. 4, 1979).
//
// Exact marginal area. Inside the current Voronoi cell X of a device x only
// x's disk covers: x is the nearest device to every point q of X, so if any
// disk D(s, r) holds q then |q − x| ≤ |q − s| ≤ r. Adding a device c
// changes coverage only in the part of each X nearer to c than to x,
// X ∩ H(c, x), which after the addition is covered by D(c, r) alone; so
//
//	gain(c) = Σ_X [ area(X ∩ H(c,x) ∩ D(c,r)) − area(X ∩ H(c,x) ∩ D(x,r)) ],
//
// each term a polygon ∩ disk area in closed form (planar.RingDiskArea) of
// the cell clipped by one half-plane (plan_overlay.go). No sampling and no
// polygon approximation of the disks: gains are exact to rounding (relative
// error of order 1e-14 of the disk area).
//
// Lazy evaluation (Minoux, "Accelerated greedy algorithms for maximizing
// submodular set functions", 1978; the CELF scheme of Leskovec et al.,
// KDD 2007): gains only shrink as devices are added (submodularity), so a
// gain computed earlier is an upper bound. Candidates sit in a max-heap by
// their last computed gain; the top is re-evaluated if stale and picked
// when its fresh gain still tops the heap. Gains below planGainNoise·πr²
// are taken as zero (rounding noise of the difference of two disk areas).

package coverage

import (
	"container/heap"
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// Choice is a selection among candidate spots.
type Choice struct {
	// Range is the planned range (m).
	Range float64
	// Picked lists the chosen candidates' indices, in the order picked.
	Picked []int
	// Gains[j] is the covered area (m²) that Picked[j] added when picked.
	Gains []float64
	// CoveredBefore and CoveredAfter are covered areas (m²) of the site
	// area without and with the picks; UncoveredBefore and UncoveredAfter
	// the uncovered areas.
	CoveredBefore, CoveredAfter     float64
	UncoveredBefore, UncoveredAfter float64
	// FractionBefore and FractionAfter are the covered fractions (0..1).
	FractionBefore, FractionAfter float64
	// FullCoverBefore and FullCoverAfter are the full-cover ranges (m).
	FullCoverBefore, FullCoverAfter float64
	// Complete is true when no gap remains at Range.
	Complete bool
	// Exhausted is true when the selection stopped because no remaining
	// candidate adds any covered area (before k picks, or before full cover
	// in the fewest-spots mode).
	Exhausted bool
	// Remaining lists the gaps left at Range with the picks added (nil
	// when Complete), largest closing range first; outlines are drawn with
	// chord error at most 0.2% of Range.
	Remaining []Gap
	// Evaluations counts marginal-area evaluations (lazy greedy statistic).
	Evaluations int
	// NewRange is, with per-device ranges (ChooseCandidatesRanges), the
	// range of a device at a picked spot; Range is then 0, the covered
	// figures refer to each device's own range, and FullCoverBefore and
	// FullCoverAfter are the range a picked device would need when every
	// r² grows alike until no gap is left (NewRange when none is left).
	// With a range per candidate (ChooseCandidatesEach) it is the largest
	// candidate range, the one those figures are stated for.
	NewRange float64
	// Ranges[j] is the range of the device at Picked[j] with a range per
	// candidate (ChooseCandidatesEach; nil otherwise).
	Ranges []float64
}

// ChooseCandidates picks k of the candidate spots to add to the layout,
// maximising the covered area at range r; with k ≤ 0 it picks the fewest
// it can that leave no gap (greedy set cover). Candidates may lie outside
// the site area (a pole beyond the fence). When full cover cannot be
// reached from the candidates, Complete is false and Remaining says what
// is left uncovered. See the file comment for the method and its
// guarantee.
//
// Choices are planning aids, exact for the disk model only.
func ChooseCandidates(l *Layout, candidates []orb.Point, r float64, k int) (*Choice, error) {
	const where = "coverage: ChooseCandidates"
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
		return nil, fmt.Errorf("%s: range %v must be a finite number > 0", where, r)
	}
	if len(candidates) == 0 {
		return nil, fmt.Errorf("%s: no candidate spot", where)
	}
	for i, p := range candidates {
		if err := planCheckPoint(p); err != nil {
			return nil, fmt.Errorf("%s: candidate %d: %w", where, i, err)
		}
	}
	o := newPlanOverlay(l, r)
	ch := &Choice{Range: r}
	area := l.AreaM2
	ch.UncoveredBefore = o.uncovered()
	ch.CoveredBefore = math.Max(0, area-ch.UncoveredBefore)
	ch.FractionBefore = planFrac(ch.CoveredBefore, area)
	ch.FullCoverBefore = o.fullCover()
	target := r * (1 + planRangeTol)
	eps := planGainEps(r)

	// Initial gains, in parallel (the overlay is only read).
	xy := make([]float64, 2*len(candidates))
	for i, p := range candidates {
		xy[2*i], xy[2*i+1] = p[0], p[1]
	}
	h := make(planHeap, len(candidates))
	for i, g := range planGains(o, xy) {
		h[i] = planItem{gain: g, idx: int32(i)}
	}
	var sc planScratch
	planLazyGreedy(ch, h, k, eps, func() bool { return o.fullCover() <= target },
		func(i int32) float64 { return o.gain(candidates[i][0], candidates[i][1], &sc) },
		func(i int32) error { o.add(candidates[i][0], candidates[i][1]); return nil })
	ch.UncoveredAfter = o.uncovered()
	ch.CoveredAfter = math.Max(0, area-ch.UncoveredAfter)
	ch.FractionAfter = planFrac(ch.CoveredAfter, area)
	ch.FullCoverAfter = o.fullCover()
	ch.Complete = ch.FullCoverAfter <= target
	if !ch.Complete {
		sites := append(append([]orb.Point(nil), l.Sites...), o.positions()...)
		l2, err := NewLayout(sites, l.Area)
		if err != nil {
			return nil, fmt.Errorf("%s: layout with the picks: %w", where, err)
		}
		ch.Remaining = l2.Gaps(r, DefaultChordTolerance)
	}
	return ch, nil
}

// planLazyGreedy runs the lazy greedy choice of the file comment on the
// candidates of heap h (their first gains computed): picks until k are
// made (k > 0) or covered reports no gap left (k ≤ 0), gain re-evaluating
// a stale top and pick adding a candidate to the layout. It fills
// ch.Picked, Gains, Evaluations and Exhausted.
func planLazyGreedy(ch *Choice, h planHeap, k int, eps float64, covered func() bool,
	gain func(idx int32) float64, pick func(idx int32) error) error {
	ch.Evaluations = len(h)
	heap.Init(&h)
	for h.Len() > 0 {
		if k > 0 && len(ch.Picked) >= k || k <= 0 && covered() {
			break
		}
		top := &h[0]
		if top.gain <= eps {
			ch.Exhausted = true
			break
		}
		if int(top.stamp) != len(ch.Picked) {
			top.gain = gain(top.idx)
			top.stamp = int32(len(ch.Picked))
			ch.Evaluations++
			heap.Fix(&h, 0)
			continue
		}
		it := heap.Pop(&h).(planItem)
		ch.Picked = append(ch.Picked, int(it.idx))
		ch.Gains = append(ch.Gains, it.gain)
		if err := pick(it.idx); err != nil {
			return err
		}
	}
	if h.Len() == 0 && (k > 0 && len(ch.Picked) < k || k <= 0 && !covered()) {
		ch.Exhausted = true
	}
	return nil
}

// planGainNoise is the gain, relative to the disk area πr², below which an
// added area is rounding noise: a gain is a difference of sums of polygon ∩
// disk areas, each with relative error of order 1e-14 of πr²
// (planar.RingDiskArea), over the dozen or so cells a disk meets; 1e-11
// leaves a margin of about a hundred above that.
const planGainNoise = 1e-11

// planGainEps is the gain below which an added area is rounding noise.
func planGainEps(r float64) float64 { return planGainNoise * math.Pi * r * r }

// planGains evaluates the gain of a device at each point of xy
// (interleaved), in parallel; the overlay is only read.
func planGains(o *planOverlay, xy []float64) []float64 {
	n := len(xy) / 2
	out := make([]float64, n)
	planar.ParallelFor(n, 64, func(lo, hi int) {
		var sc planScratch
		for i := lo; i < hi; i++ {
			out[i] = o.gain(xy[2*i], xy[2*i+1], &sc)
		}
	})
	return out
}

func planFrac(covered, area float64) float64 {
	if !(area > 0) {
		return 0
	}
	return math.Max(0, math.Min(1, covered/area))
}

// planItem is a candidate in the lazy-greedy heap.
type planItem struct {
	gain  float64
	idx   int32
	stamp int32 // number of picks when gain was computed
}

// planHeap is a max-heap by gain, ties by smaller index.
type planHeap []planItem

func (h planHeap) Len() int { return len(h) }
func (h planHeap) Less(i, j int) bool {
	if h[i].gain != h[j].gain {
		return h[i].gain > h[j].gain
	}
	return h[i].idx < h[j].idx
}
func (h planHeap) Swap(i, j int) { h[i], h[j] = h[j], h[i] }
func (h *planHeap) Push(x any)   { *h = append(*h, x.(planItem)) }
func (h *planHeap) Pop() any {
	old := *h
	it := old[len(old)-1]
	*h = old[:len(old)-1]
	return it
}
