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
// Own ranges (ChooseCandidatesReachRanges). With devices of their own
// ranges r_i and a range for each candidate, n_S(x) counts the devices
// whose own disk holds x: still modular in the set of picks, so D is
// submodular and monotone as above, and the same greedy, pruning and bound
// apply. Each D is exact from KCoverRanges (order-k power diagram,
// kcover_power.go), the layout rebuilt with NewLayoutRanges; the K-cover
// figure is the K-cover power (plan_suggest_k.go), reached when at most
// ((1 + planRangeTol)² − 1)·r_max², r_max the largest range present.
//
// Cost: one layout and k-coverage of levels 1 … K per gain evaluation
// (O(n·K²) each, n the devices), in parallel for the first gains; meant
// for the tens to hundreds of candidates of a site plan.

package coverage

import (
	"fmt"
	"math"
	"slices"

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
	// +Inf while fewer than K distinct devices stand; NaN with own ranges).
	CoverRange float64
	// CoverPower is set with own ranges: the K-cover power (m²; ≤ 0 when
	// every spot is reached by K devices; +Inf while fewer than K distinct
	// devices stand). Range is then the pick's own range (m).
	CoverPower, Range float64
	// Share and CoveredArea are the share and area (m²) reached by at
	// least K devices at the planned range.
	Share, CoveredArea float64
}

// ReachChoice is the result of ChooseCandidatesReach.
type ReachChoice struct {
	// K is the number of devices every spot must be reached by; Range the
	// planned range (m; with own ranges the largest candidate range);
	// Requested the number of picks asked for (0: the
	// fewest that reach the target).
	K         int
	Range     float64
	Requested int
	// OwnRanges is set by ChooseCandidatesReachRanges when the ranges
	// differ: the K-cover figures are the powers CoverPowerBefore and
	// CoverPowerAfter (and each pick's CoverPower), the CoverRange fields
	// NaN.
	OwnRanges bool
	// CoverPowerBefore and CoverPowerAfter are set with own ranges: the
	// K-cover powers (m²) without and with the picks.
	CoverPowerBefore, CoverPowerAfter float64
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

// reachDepth is the k-coverage of one layout for ChooseCandidatesReach:
// the depth, the K-cover figure rng (range, or with own ranges power;
// +Inf while fewer than K distinct devices stand) and the K-covered share
// and area.
type reachDepth struct {
	depth, rng, share, area float64
}

// reachCands is what ChooseCandidatesReach measures: the existing layout,
// the candidate spots, K and the common range r, or (ranges set) each
// existing device's own range and each candidate's (candR).
type reachCands struct {
	l             *Layout
	cands         []orb.Point
	ranges, candR []float64 // nil: one common range r
	K             int
	r             float64
}

// with returns the existing sites followed by the candidates of order
// (and extra, when ≥ 0), and with own ranges their ranges.
func (rc *reachCands) with(order []int, extra int) ([]orb.Point, []float64) {
	sites := append([]orb.Point(nil), rc.l.Sites...)
	var rs []float64
	if rc.ranges != nil {
		rs = append([]float64(nil), rc.ranges...)
	}
	add := func(c int) {
		sites = append(sites, rc.cands[c])
		if rs != nil {
			rs = append(rs, rc.candR[c])
		}
	}
	for _, c := range order {
		add(c)
	}
	if extra >= 0 {
		add(extra)
	}
	return sites, rs
}

// cover builds the layout of the sites (NewLayout, or with own ranges
// NewLayoutRanges) and its k-coverage with opt (KCover at r, or
// KCoverRanges) for k ≤ min(K, distinct devices), returned as kmax.
func (rc *reachCands) cover(sites []orb.Point, rs []float64, opt func(kmax int) KOptions) (*KCoverage, int, error) {
	if rs == nil {
		l2, err := NewLayout(sites, rc.l.Area)
		if err != nil {
			return nil, 0, err
		}
		k := min(rc.K, l2.Tri.NumVertices())
		kc, err := KCover(l2, rc.r, opt(k))
		return kc, k, err
	}
	l2, err := NewLayoutRanges(sites, rs, rc.l.Area)
	if err != nil {
		return nil, 0, err
	}
	distinct := map[orb.Point]bool{}
	for _, p := range sites {
		distinct[p] = true
	}
	k := min(rc.K, len(distinct))
	kc, err := KCoverRanges(l2, opt(k))
	return kc, k, err
}

// measure computes the depth (levels 1 … K; levels beyond the number of
// distinct devices add nothing), the K-cover figure and the K-covered
// share and area of the sites over l's area.
func (rc *reachCands) measure(sites []orb.Point, rs []float64) (reachDepth, error) {
	kc, k, err := rc.cover(sites, rs, func(k int) KOptions { return KOptions{MaxK: k} })
	if err != nil {
		return reachDepth{}, err
	}
	var d reachDepth
	for _, lv := range kc.Levels {
		d.depth += lv.CoveredArea
	}
	d.rng = math.Inf(1)
	if k == rc.K {
		top := kc.Levels[k-1]
		d.rng, d.share, d.area = top.CoverRange, top.Share, top.CoveredArea
		if rs != nil {
			d.rng = top.CoverPower
		}
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
	return chooseReach(&reachCands{l: l, cands: candidates, K: K, r: r}, r*(1+planRangeTol), picks, where)
}

// ChooseCandidatesReachRanges is ChooseCandidatesReach for a layout with
// per-device ranges (NewLayoutRanges) and a range for each candidate spot
// (ranges[i], finite, > 0): every spot must be reached by at least K
// devices at their own ranges (the K-cover power at most 0; see the file
// comment). The result has OwnRanges set, Range the largest candidate
// range and each pick's Range its own. When every range, existing and
// candidate, is the same it is ChooseCandidatesReach at that range.
func ChooseCandidatesReachRanges(l *Layout, candidates []orb.Point, ranges []float64, K int, picks int) (*ReachChoice, error) {
	const where = "coverage: ChooseCandidatesReachRanges"
	if len(ranges) != len(candidates) {
		return nil, fmt.Errorf("%s: %d ranges for %d candidate spots", where, len(ranges), len(candidates))
	}
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if !l.weighted() {
		return nil, fmt.Errorf("%s: the layout has one common range (use ChooseCandidatesReach)", where)
	}
	for i, r := range ranges {
		if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
			return nil, fmt.Errorf("%s: candidate %d: range %v must be a finite number > 0", where, i, r)
		}
	}
	all := append(append([]float64(nil), ranges...), l.InputRanges...)
	lo, hi := slices.Min(all), slices.Max(all)
	if lo == hi {
		return ChooseCandidatesReach(l, candidates, K, lo, picks)
	}
	if err := checkReachChoice(l, candidates, K, slices.Max(ranges)); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc := &reachCands{l: l, cands: candidates, ranges: l.InputRanges, candR: ranges, K: K, r: slices.Max(ranges)}
	return chooseReach(rc, ((1+planRangeTol)*(1+planRangeTol)-1)*hi*hi, picks, where)
}

// chooseReach is the greedy of the file comment for rc: target is the
// largest K-cover figure that counts as reached.
func chooseReach(m *reachCands, target float64, picks int, where string) (*ReachChoice, error) {
	l, candidates, K := m.l, m.cands, m.K
	full := float64(K) * l.AreaM2
	eps := reachDepthNoise * full
	var order []int
	cur, err := m.measure(m.with(nil, -1))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc := &ReachChoice{K: K, Range: m.r, Requested: max(picks, 0), Existing: len(l.Sites), Candidates: len(candidates),
		OwnRanges: m.ranges != nil, CoverRangeBefore: cur.rng, ShareBefore: cur.share, CoveredBefore: cur.area}
	if rc.OwnRanges {
		rc.CoverRangeBefore, rc.CoverPowerBefore = math.NaN(), cur.rng
	}
	// gainAt is the depth candidate i adds to the picks; errors are kept
	// for the caller (the greedy's callbacks return values only).
	var evalErr error
	gainAt := func(i int32, base float64) float64 {
		d, err := m.measure(m.with(order, int(i)))
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
			d, err := m.measure(m.with(nil, i))
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
		func(i int32) float64 { return gainAt(i, cur.depth) },
		func(i int32) error {
			bound(h0gain(ch))
			order = append(order, int(i))
			cur, err = m.measure(m.with(order, -1))
			return err
		})
	if err == nil {
		err = evalErr
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc.Evaluations, rc.Exhausted = ch.Evaluations, ch.Exhausted
	order = ch.Picked
	if picks <= 0 && cur.rng <= target {
		if order, err = m.prune(order, target); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
		rc.Pruned = len(ch.Picked) - len(order)
	}
	after, err := rc.replay(m, order)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	rc.Reached = after <= target
	rc.Exhausted = rc.Exhausted && !rc.Reached
	if rc.Exhausted {
		rc.LowerBound = 0 // the target cannot be reached: no bound to state
	}
	if rc.Reached && picks <= 0 && len(rc.Picks) == rc.LowerBound {
		rc.Optimal = true
	}
	if !rc.Reached {
		if rc.Remaining, err = m.remaining(order); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
	}
	return rc, nil
}

// h0gain is the gain of the pick planLazyGreedy is making: the last entry
// of ch.Gains (appended before the pick callback runs).
func h0gain(ch *Choice) float64 { return ch.Gains[len(ch.Gains)-1] }

// prune drops, latest first, every pick whose removal keeps the K-cover
// figure within target.
func (m *reachCands) prune(order []int, target float64) ([]int, error) {
	keep := append([]int(nil), order...)
	for i := len(keep) - 1; i >= 0; i-- {
		try := append(append([]int(nil), keep[:i]...), keep[i+1:]...)
		d, err := m.measure(m.with(try, -1))
		if err != nil {
			return nil, err
		}
		if d.rng <= target {
			keep = try
		}
	}
	return keep, nil
}

// replay adds the picks in order to the existing layout and records the
// exact figures after each, and the after figures; it returns the K-cover
// figure after (range, or with own ranges power).
func (rc *ReachChoice) replay(m *reachCands, order []int) (float64, error) {
	d0, err := m.measure(m.with(nil, -1))
	if err != nil {
		return 0, err
	}
	prev, after := d0.depth, d0.rng
	rc.CoverRangeAfter, rc.CoverPowerAfter = rc.CoverRangeBefore, rc.CoverPowerBefore
	rc.ShareAfter, rc.CoveredAfter = rc.ShareBefore, rc.CoveredBefore
	rc.Picks = rc.Picks[:0]
	for j, c := range order {
		d, err := m.measure(m.with(order[:j+1], -1))
		if err != nil {
			return 0, err
		}
		pk := ReachPick{Candidate: c, Position: m.cands[c], Gain: d.depth - prev, CoverRange: d.rng, Range: m.r,
			Share: d.share, CoveredArea: d.area}
		rc.CoverRangeAfter = d.rng
		if rc.OwnRanges {
			pk.CoverRange, pk.CoverPower, pk.Range = math.NaN(), d.rng, m.candR[c]
			rc.CoverRangeAfter, rc.CoverPowerAfter = math.NaN(), d.rng
		}
		rc.Picks = append(rc.Picks, pk)
		rc.ShareAfter, rc.CoveredAfter = d.share, d.area
		prev, after = d.depth, d.rng
	}
	return after, nil
}

// remaining returns the K-gaps of the layout with the picks (the largest
// k the distinct devices allow when fewer than K stand).
func (m *reachCands) remaining(order []int) ([]KGap, error) {
	sites, rs := m.with(order, -1)
	kc, _, err := m.cover(sites, rs, func(k int) KOptions { return KOptions{Levels: []int{k}, Gaps: true} })
	if err != nil {
		return nil, err
	}
	return kc.Levels[0].Gaps, nil
}
