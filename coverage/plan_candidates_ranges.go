// Choosing among candidate spots when the devices have their own ranges:
// every picked spot with one range (ChooseCandidatesRanges) or each spot
// with a range of its own (ChooseCandidatesEach: candidates of different
// device models, e.g. a gateway on a mast, a sensor on a wall).
//
// The method is the one of plan_suggest_ranges.go: greedy maximum coverage
// with lazy evaluation (Nemhauser, Wolsey & Fisher 1978; Minoux 1978), the
// covered area being submodular whatever the radii, and the exact gain of
// a spot c of range R_c
//
//	gain(c) = Σ_X [ area(X ∩ L(c,x) ∩ D(c,R_c)) − area(X ∩ L(c,x) ∩ D(x,r_x)) ]
//
// over the current power cells X (L(c, x) the half-plane where π_c ≤ π_x),
// each term a polygon ∩ disk area in closed form; the formula holds for any
// R_c, so a spot's own range only changes the disk and the power line of
// its own gain. After each pick the regular triangulation and power cells
// are rebuilt with the picked device at its range.
//
// Full-cover figure with ranges of their own: the growth t* = max over A
// of min_i π_i(x) (FullCoverRanges) is the same number whatever device it
// is stated for; FullCoverBefore and FullCoverAfter state it for a device
// of NewRange, the largest candidate range: √(NewRange² + t*).
//
// Error bounds: those of plan_suggest_ranges.go; gains below
// planGainEps(R_min) of the smallest candidate range are rounding noise.

package coverage

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// ChooseCandidatesRanges is ChooseCandidates for a layout with per-device
// ranges, each picked spot getting a device of range r: k spots maximising
// the covered area, or with k ≤ 0 the fewest that leave no gap (see the
// file comment for the exact gain). The result's Range is 0 and NewRange
// r; FullCoverBefore and FullCoverAfter are the range an added device
// would need with every r² grown alike until no gap is left (r when none
// is left), and Remaining are the gaps at the planned ranges.
func ChooseCandidatesRanges(l *Layout, candidates []orb.Point, r float64, k int) (*Choice, error) {
	return chooseCandidatesPower("coverage: ChooseCandidatesRanges", l, candidates, nil, r, k)
}

// ChooseCandidatesEach is ChooseCandidatesRanges with a range for each
// candidate spot: a device at candidates[i] has range ranges[i] (finite,
// > 0). The result's Ranges give each pick's range and NewRange is the
// largest candidate range, the one FullCoverBefore and FullCoverAfter are
// stated for (see the file comment). When every candidate has the same
// range it is ChooseCandidatesRanges with that range.
func ChooseCandidatesEach(l *Layout, candidates []orb.Point, ranges []float64, k int) (*Choice, error) {
	const where = "coverage: ChooseCandidatesEach"
	if len(ranges) != len(candidates) {
		return nil, fmt.Errorf("%s: %d ranges for %d candidate spots", where, len(ranges), len(candidates))
	}
	if len(candidates) == 0 {
		return nil, fmt.Errorf("%s: no candidate spot", where)
	}
	for i, r := range ranges {
		if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
			return nil, fmt.Errorf("%s: candidate %d: range %v must be a finite number > 0", where, i, r)
		}
	}
	if slices.Min(ranges) == slices.Max(ranges) {
		return chooseCandidatesPower(where, l, candidates, nil, ranges[0], k)
	}
	return chooseCandidatesPower(where, l, candidates, ranges, slices.Max(ranges), k)
}

// chooseCandidatesPower runs the greedy choice of the file comment: each
// candidate of range ranges[i] (or r when ranges is nil), the full-cover
// figures stated for a device of range r.
func chooseCandidatesPower(where string, l *Layout, candidates []orb.Point, ranges []float64, r float64, k int) (*Choice, error) {
	if err := checkRangesMove(where, l, r); err != nil {
		return nil, err
	}
	if len(candidates) == 0 {
		return nil, fmt.Errorf("%s: no candidate spot", where)
	}
	for i, q := range candidates {
		if err := planCheckPoint(q); err != nil {
			return nil, fmt.Errorf("%s: candidate %d: %w", where, i, err)
		}
	}
	if ranges == nil && l.inputRangesEqual() && r == l.InputRanges[0] {
		ch, err := ChooseCandidates(l, candidates, r, k)
		if ch != nil {
			ch.Range, ch.NewRange = 0, r
			ch.FullCoverBefore, ch.FullCoverAfter = math.Max(r, ch.FullCoverBefore), math.Max(r, ch.FullCoverAfter)
		}
		return ch, err
	}
	rangeOf := func(i int32) float64 {
		if ranges != nil {
			return ranges[i]
		}
		return r
	}
	p := newRangesPlan(l, r)
	if ranges != nil {
		p.addedR = []float64{}
	}
	ch := &Choice{NewRange: r}
	area := l.AreaM2
	f := p.figures()
	ch.FullCoverBefore, ch.UncoveredBefore, ch.FractionBefore = f.need, f.unc, f.frac
	ch.CoveredBefore = math.Max(0, area-ch.UncoveredBefore)
	eps := planGainEps(r)
	if ranges != nil {
		eps = planGainEps(slices.Min(ranges))
	}
	g := newGainIndex(p.cur)
	h := make(planHeap, len(candidates))
	gains := make([]float64, len(candidates))
	planar.ParallelFor(len(candidates), 64, func(lo, hi int) {
		var sc rangesGainScratch
		for i := lo; i < hi; i++ {
			gains[i] = g.gain(candidates[i][0], candidates[i][1], rangeOf(int32(i)), &sc)
		}
	})
	for i, v := range gains {
		h[i] = planItem{gain: v, idx: int32(i)}
	}
	var sc rangesGainScratch
	err := planLazyGreedy(ch, h, k, eps, p.covered,
		func(i int32) float64 { return g.gain(candidates[i][0], candidates[i][1], rangeOf(i), &sc) },
		func(i int32) error {
			p.added = append(p.added, candidates[i])
			if ranges != nil {
				p.addedR = append(p.addedR, ranges[i])
				ch.Ranges = append(ch.Ranges, ranges[i])
			}
			if err := p.rebuild(); err != nil {
				return err
			}
			g = newGainIndex(p.cur)
			return nil
		})
	if err != nil {
		return nil, fmt.Errorf("%s: layout with the picks: %w", where, err)
	}
	f = p.figures()
	ch.FullCoverAfter, ch.UncoveredAfter, ch.FractionAfter = f.need, f.unc, f.frac
	ch.CoveredAfter = math.Max(0, area-ch.UncoveredAfter)
	ch.Complete = p.covered()
	if !ch.Complete {
		ch.Remaining = p.cur.GapsRanges(0, DefaultChordTolerance)
	}
	return ch, nil
}
