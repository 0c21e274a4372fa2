// Choosing among candidate mounting spots for a k target: the fewest
// candidates (or a given number) so that every spot of the site area is
// reached by at least K devices at the planned range r.
//
// Objective. The area reached by K devices alone is not submodular: where
// K − 2 devices reach, one more device adds nothing and two add the spot,
// so a greedy on it stalls. The depth
//
//	D(S) = Σ_{j=1..K} area(A reached by ≥ j devices)
//	     = ∫_A min(n_S(x), K) dx,
//
// n_S(x) the number of distinct device positions within r of x, is: n_S is
// modular in the set of positions, min(·, K) is concave, so each integrand
// is submodular and monotone, and so is the integral. Every spot is
// reached by K devices exactly when D = K·area(A) (up to sets of zero area:
// the part reached by fewer than K, where the K-th nearest distance exceeds
// r, is open, so it has positive area when it is not empty). Each D is
// exact: the covered areas of KCover for k = 1 … K (closed forms, order-k
// pieces; Lee 1982), with the layout rebuilt with the candidate added.
//
// Method. Greedy submodular set cover (Wolsey, "An analysis of the greedy
// algorithm for the submodular set covering problem", Combinatorica 2,
// 1982), the set-multicover form of the greedy set cover (Johnson, J.
// Comput. System Sci. 9, 1974; Chvátal, Math. Oper. Res. 4, 1979; for
// covering each element K times, Dobson, Math. Oper. Res. 7, 1982): pick
// the candidate that adds the most depth, until every spot is reached by K
// devices (the K-cover range at most r, 1e-12 relative as plan_suggest.go)
// or no candidate adds any; with lazy re-evaluation (Minoux 1978), gains
// only shrinking as picks are added. Then every pick whose removal keeps
// the target is dropped, latest first. The result is greedy, not proven
// optimal; Wolsey's guarantee (recalled from the paper) is at most
// 1 + ln(Δ₀ / Δ_{T−1}) times the fewest, Δ_t the depth still missing
// before pick t + 1.
//
// Lower bound (derived here). Before pick t + 1 the depth missing is Δ_t
// and the largest gain of any candidate is g_t. Any set S* of candidates
// that reaches the target added to the current picks fills Δ_t, and by
// submodularity each member adds at most g_t, so |S*| ≥ Δ_t / g_t — and an
// optimal set reaches the target with the current picks too. Hence
// LowerBound = max_t ⌈Δ_t / g_t⌉ (rounding noise taken in the bound's
// favour) is at most the fewest candidates any choice needs; when the
// picks number LowerBound the choice is optimal (Optimal).
//
// Cost: one layout and k-coverage of levels 1 … K per gain evaluation
// (O(n·K²) each, n the devices), in parallel for the first gains; meant
// for the tens to hundreds of candidates of a site plan.

package coverage

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// reachDepthNoise is the depth change, relative to K·area(A), below which
// a gain is rounding noise: each covered area is a sum of closed forms
// with relative error of order 1e-14 of the area (KCover), and a gain is
// the difference of two sums of K of them; 1e-11 leaves a margin of about
// a hundred.
const reachDepthNoise = 1e-11

// ReachPick is one pick of ChooseCandidatesReach with the figures after it.
type ReachPick struct {
	// Candidate is the index of the picked spot; Position its position.
	Candidate int
	Position  orb.Point
	// Gain is the depth the pick added when picked (m²): the sum over
	// k = 1 … K of the area it brought to k devices in reach.
	Gain float64
	// CoverRange is the K-cover range with this and the earlier picks (m;
	// +Inf while fewer than K distinct devices stand).
	CoverRange float64
	// Share and CoveredArea are the share and area (m²) reached by at
	// least K devices at the planned range.
	Share, CoveredArea float64
}

// ReachChoice is the result of ChooseCandidatesReach.
type ReachChoice struct {
	// K is the number of devices every spot must be reached by; Range the
	// planned range (m); Requested the number of picks asked for (0: the
	// fewest that reach the target).
	K         int
	Range     float64
	Requested int
	// Existing is the number of existing devices; Candidates the number
	// of candidate spots.
	Existing, Candidates int
	// Picks are the chosen spots, in the order picked (after dropping the
	// redundant ones), with the figures after each.
	Picks []ReachPick
	// CoverRangeBefore and CoverRangeAfter are the K-cover ranges without
	// and with the picks (+Inf with fewer than K distinct devices).
	CoverRangeBefore, CoverRangeAfter float64
	// ShareBefore, ShareAfter, CoveredBefore and CoveredAfter are the
	// share and area (m²) reached by at least K devices.
	ShareBefore, ShareAfter     float64
	CoveredBefore, CoveredAfter float64
	// Reached tells whether every spot is reached by K devices at Range
	// with the picks.
	Reached bool
	// Exhausted is set when the choice stopped because no remaining
	// candidate adds any depth: the candidates cannot reach the target.
	Exhausted bool
	// Pruned is the number of picks dropped as redundant at the end.
	Pruned int
	// LowerBound is a lower bound on the number of candidates any choice
	// needs to reach the target (file comment), from the greedy's own
	// gains; 0 when nothing is needed or when Exhausted (the target cannot
	// be reached from the candidates).
	LowerBound int
	// Optimal is set when the picks reach the target and number
	// LowerBound: no smaller choice exists.
	Optimal bool
	// Remaining are the parts reached by fewer than K devices with the
	// picks (KCover's K-gaps; nil when Reached), by decreasing closing
	// range; their areas sum to area(A) − CoveredAfter up to rounding.
	Remaining []KGap
	// Evaluations counts depth evaluations (lazy greedy statistic).
	Evaluations int
}

// reachDepth is the k-coverage of one layout for ChooseCandidatesReach.
type reachDepth struct {
	depth, rng, share, area float64
}

// measureReachDepth computes the depth (levels 1 … K; levels beyond the
// number of distinct devices add nothing), the K-cover range and the
// K-covered share and area of the sites over l's area.
func measureReachDepth(sites []orb.Point, l *Layout, K int, r float64) (reachDepth, error) {
	l2, err := NewLayout(sites, l.Area)
	if err != nil {
		return reachDepth{}, err
	}
	k := min(K, l2.Tri.NumVertices())
	kc, err := KCover(l2, r, KOptions{MaxK: k})
	if err != nil {
		return reachDepth{}, err
	}
	var d reachDepth
	for _, lv := range kc.Levels {
		d.depth += lv.CoveredArea
	}
	d.rng = math.Inf(1)
	if k == K {
		top := kc.Levels[k-1]
		d.rng, d.share, d.area = top.CoverRange, top.Share, top.CoveredArea
	}
	return d, nil
}

// checkReachChoice checks the arguments of ChooseCandidatesReach.
func checkReachChoice(l *Layout, candidates []orb.Point, K int, r float64) error {
	if err := planCheckLayout(l); err != nil {
		return err
	}
	if K < 1 {
		return fmt.Errorf("k = %d must be at least 1", K)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
		return fmt.Errorf("range %v must be a finite number > 0", r)
	}
	if len(candidates) == 0 {
		return fmt.Errorf("no candidate spot")
	}
	for i, p := range candidates {
		if err := planCheckPoint(p); err != nil {
			return fmt.Errorf("candidate %d: %w", i, err)
		}
	}
	return nil
}

// ChooseCandidatesReach picks among the candidate spots, with the existing
// devices fixed, the fewest (picks ≤ 0) so that every spot of the site
// area is reached by at least K devices at range r, or picks spots
// maximising the depth (the file comment's objective). The method is a
// greedy with a lower bound from its own gains (see the file comment):
// Optimal says when the bound proves the picks the fewest. When the
// candidates cannot reach the target, Exhausted is set and Remaining says
// exactly what stays reached by fewer than K devices.
//
// Choices are planning aids, exact for the disk model only.
func ChooseCandidatesReach(l *Layout, candidates []orb.Point, K int, r float64, picks int) (*ReachChoice, error) {
	const where = "coverage: ChooseCandidatesReach"
	if err := checkReachChoice(l, candidates, K, r); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	full := float64(K) * l.AreaM2
	eps := reachDepthNoise * full
	target := r * (1 + planRangeTol)
	sites := append([]orb.Point(nil), l.Sites...)
	cur, err := measureReachDepth(sites, l, K, r)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc := &ReachChoice{K: K, Range: r, Requested: max(picks, 0), Existing: len(l.Sites), Candidates: len(candidates),
		CoverRangeBefore: cur.rng, ShareBefore: cur.share, CoveredBefore: cur.area}
	// gainAt is the depth candidate i adds to sites; errors are kept for
	// the caller (the greedy's callbacks return values only).
	var evalErr error
	gainAt := func(sites []orb.Point, i int32, base float64) float64 {
		try := append(sites[:len(sites):len(sites)], candidates[i])
		d, err := measureReachDepth(try, l, K, r)
		if err != nil {
			evalErr = err
			return 0
		}
		return d.depth - base
	}
	h := make(planHeap, len(candidates))
	gains := make([]float64, len(candidates))
	errs := make([]error, len(candidates))
	planar.ParallelFor(len(candidates), 1, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			d, err := measureReachDepth(append(sites[:len(sites):len(sites)], candidates[i]), l, K, r)
			gains[i], errs[i] = d.depth-cur.depth, err
		}
	})
	for i, g := range gains {
		if errs[i] != nil {
			return nil, fmt.Errorf("%s: candidate %d: %w", where, i, errs[i])
		}
		h[i] = planItem{gain: g, idx: int32(i)}
	}
	bound := func(g float64) {
		if missing := full - cur.depth; missing > eps && g > eps {
			rc.LowerBound = max(rc.LowerBound, int(math.Ceil((missing-eps)/(g+eps))))
		}
	}
	ch := &Choice{}
	err = planLazyGreedy(ch, h, picks, eps, func() bool { return cur.rng <= target },
		func(i int32) float64 { return gainAt(sites, i, cur.depth) },
		func(i int32) error {
			bound(h0gain(ch))
			sites = append(sites, candidates[i])
			cur, err = measureReachDepth(sites, l, K, r)
			return err
		})
	if err == nil {
		err = evalErr
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc.Evaluations, rc.Exhausted = ch.Evaluations, ch.Exhausted
	order := ch.Picked
	if picks <= 0 && cur.rng <= target {
		if order, err = pruneReachPicks(l, candidates, order, K, r, target); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
		rc.Pruned = len(ch.Picked) - len(order)
	}
	if err := rc.replay(l, candidates, order); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc.Reached = rc.CoverRangeAfter <= target
	rc.Exhausted = rc.Exhausted && !rc.Reached
	if rc.Exhausted {
		rc.LowerBound = 0 // the target cannot be reached: no bound to state
	}
	if rc.Reached && picks <= 0 && len(rc.Picks) == rc.LowerBound {
		rc.Optimal = true
	}
	if !rc.Reached {
		if rc.Remaining, err = remainingReach(l, candidates, order, K, r); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
	}
	return rc, nil
}

// h0gain is the gain of the pick planLazyGreedy is making: the last entry
// of ch.Gains (appended before the pick callback runs).
func h0gain(ch *Choice) float64 { return ch.Gains[len(ch.Gains)-1] }

// pruneReachPicks drops, latest first, every pick whose removal keeps the
// K-cover range within target.
func pruneReachPicks(l *Layout, candidates []orb.Point, order []int, K int, r, target float64) ([]int, error) {
	keep := append([]int(nil), order...)
	for i := len(keep) - 1; i >= 0; i-- {
		try := append([]orb.Point(nil), l.Sites...)
		for j, c := range keep {
			if j != i {
				try = append(try, candidates[c])
			}
		}
		d, err := measureReachDepth(try, l, K, r)
		if err != nil {
			return nil, err
		}
		if d.rng <= target {
			keep = append(keep[:i], keep[i+1:]...)
		}
	}
	return keep, nil
}

// replay adds the picks in order to the existing layout and records the
// exact figures after each, and the after figures.
func (rc *ReachChoice) replay(l *Layout, candidates []orb.Point, order []int) error {
	sites := append([]orb.Point(nil), l.Sites...)
	d0, err := measureReachDepth(sites, l, rc.K, rc.Range)
	if err != nil {
		return err
	}
	prev := d0.depth
	rc.CoverRangeAfter, rc.ShareAfter, rc.CoveredAfter = rc.CoverRangeBefore, rc.ShareBefore, rc.CoveredBefore
	rc.Picks = rc.Picks[:0]
	for _, c := range order {
		sites = append(sites, candidates[c])
		d, err := measureReachDepth(sites, l, rc.K, rc.Range)
		if err != nil {
			return err
		}
		rc.Picks = append(rc.Picks, ReachPick{Candidate: c, Position: candidates[c], Gain: d.depth - prev,
			CoverRange: d.rng, Share: d.share, CoveredArea: d.area})
		rc.CoverRangeAfter, rc.ShareAfter, rc.CoveredAfter = d.rng, d.share, d.area
		prev = d.depth
	}
	return nil
}

// remainingReach returns the K-gaps of the layout with the picks (the
// largest k the distinct devices allow when fewer than K stand).
func remainingReach(l *Layout, candidates []orb.Point, order []int, K int, r float64) ([]KGap, error) {
	sites := append([]orb.Point(nil), l.Sites...)
	for _, c := range order {
		sites = append(sites, candidates[c])
	}
	l2, err := NewLayout(sites, l.Area)
	if err != nil {
		return nil, err
	}
	k := min(K, l2.Tri.NumVertices())
	kc, err := KCover(l2, r, KOptions{Levels: []int{k}, Gaps: true})
	if err != nil {
		return nil, err
	}
	return kc.Levels[0].Gaps, nil
}
