// Where to add devices so that every spot of the site area is reached by at
// least K devices at the planned range r (the k target of suggest).
//
// Method. Farthest-point insertion (Gonzalez, "Clustering to minimize the
// maximum intercluster distance", Theor. Comp. Sci. 38, 1985) applied to
// the K-th nearest distance d_K(x), in the spirit of the greedy for
// fault-tolerant k-centre (Khuller, Pless and Sussmann, "Fault tolerant
// K-center problems", Theor. Comp. Sci. 242, 2000): each new device goes
// to the spot needing the most range, the point of the area where d_K is
// largest — the vertex of a clipped order-K piece attaining the K-cover
// range (kcover.go: d_K is |x − q| on the piece (S, q), convex, so its
// maximum is at a vertex). A device placed there becomes one of that
// spot's K nearest, so d_K there drops to at most the old (K−1)-th
// nearest distance; if that is still the largest, the spot holds a device
// already and the next device goes to the farthest vertex of the other
// pieces (reachNext) — one more device at the same spot would count once
// and change nothing. Our refinement of the placement (not from the
// papers above): the new device goes to that spot or to one of eight
// points at 0.9·r from it (still reaching it), whichever leaves the
// largest area reached by K devices (reachPlace) — a spot at the corner
// of the area would otherwise get a device that reaches little else.
// Additions repeat until the K-cover range is at most r (1e-12 relative,
// as the full-cover test of plan_suggest.go). While the layout has fewer
// than K distinct devices, the spot needing the most range for the largest
// k it can serve is taken instead. Finally every addition whose removal
// keeps the K-cover range within r is dropped, latest first, so no single
// addition of the result is redundant.
//
// Every figure is exact: after each addition the layout is rebuilt
// (NewLayout) and KCover gives the K-cover range and the area reached by K
// devices (closed forms). The cost is nine layouts and level-K analyses
// per addition and one per pruning test: O(n·K²) each, meant for planning
// layouts, not millions of devices.

package coverage

import (
	"errors"
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// ErrReachCap is returned (wrapped) by ReachAdditions when the cap on
// additions is reached before every spot is reached by K devices; the
// suggestion returned with it holds the devices placed so far.
var ErrReachCap = errors.New("addition cap reached before every spot is reached by k devices")

// ReachStep gives the figures after one addition of ReachAdditions.
type ReachStep struct {
	// Added is the new device's position.
	Added orb.Point
	// CoverRange is the K-cover range with this and the earlier additions
	// (m); +Inf while fewer than K distinct devices stand.
	CoverRange float64
	// Share and CoveredArea are the share and area (m²) reached by at
	// least K devices at the planned range.
	Share, CoveredArea float64
}

// ReachSuggestion is the result of ReachAdditions.
type ReachSuggestion struct {
	// K is the number of devices every spot must be reached by.
	K int
	// Range is the planned range (m).
	Range float64
	// Existing is the number of existing devices.
	Existing int
	// Added are the new devices' positions, in the order they were
	// inserted (after pruning); each lies in the site area.
	Added []orb.Point
	// Steps[j] are the figures with Added[:j+1].
	Steps []ReachStep
	// CoverRangeBefore and CoverRangeAfter are the K-cover ranges of the
	// layout alone and with every addition (+Inf with fewer than K
	// distinct devices).
	CoverRangeBefore, CoverRangeAfter float64
	// ShareBefore and ShareAfter are the shares reached by at least K
	// devices at Range; CoveredBefore and CoveredAfter the areas (m²).
	ShareBefore, ShareAfter     float64
	CoveredBefore, CoveredAfter float64
	// Reached tells whether every spot is reached by K devices at Range.
	Reached bool
	// Pruned is the number of additions dropped as redundant at the end.
	Pruned int
}

// reachState is the K-coverage of one layout: the K-cover range (+Inf
// with fewer than K distinct devices), the share and area reached by K,
// and where the next device goes (reachNext).
type reachState struct {
	rng, share, area float64
	next             orb.Point
	ok               bool // next is set
}

// reachMeasure computes the reachState of the sites.
func reachMeasure(sites []orb.Point, l0 *Layout, K int, r float64) (reachState, error) {
	l, err := NewLayout(sites, l0.Area)
	if err != nil {
		return reachState{}, err
	}
	k := min(K, l.Tri.NumVertices())
	kc, err := KCover(l, r, KOptions{Levels: []int{k}, keepPieces: true})
	if err != nil {
		return reachState{}, err
	}
	lv := &kc.Levels[0]
	st := reachState{rng: lv.CoverRange, share: lv.Share, area: lv.CoveredArea}
	if k < K {
		st = reachState{rng: math.Inf(1)}
	}
	st.next, st.ok = reachNext(l, lv)
	return st, nil
}

// reachNext returns the spot for the next device: the vertex of a clipped
// order-k piece farthest from its k-th nearest device (each piece's
// farthest vertex), skipping vertices where a device stands already (a
// device there counts once: it would change nothing); for k = 1 the
// full-cover worst point (never a device). False when every such vertex
// holds a device.
func reachNext(l *Layout, lv *KLevel) (orb.Point, bool) {
	if lv.K == 1 {
		return lv.CoverPoint, true
	}
	taken := make(map[orb.Point]bool, len(l.Sites))
	for _, p := range l.Sites {
		taken[p] = true
	}
	best, far, ok := orb.Point{}, -1.0, false
	for _, st := range lv.store {
		for i := range st.far {
			p := orb.Point{st.fx[i], st.fy[i]}
			if st.far[i] > far && !taken[p] {
				best, far, ok = p, st.far[i], true
			}
		}
	}
	return best, ok
}

// reachPull is the distance, relative to r, from the spot needing the
// most range at which the other candidate positions of a new device lie
// (reachPlace): within r, so the spot is reached by the new device, and
// far enough to reach into the area around it rather than past its edge.
const reachPull = 0.9

// reachDirections is the number of candidate directions around the spot.
const reachDirections = 8

// reachPlace chooses the position of the next device for the spot p: p
// itself or one of reachDirections points at reachPull·r from p (inside
// the area, not on a device), whichever gives the largest area reached by
// K devices (exact; p on a tie or while fewer than K devices stand), and
// returns it with the layout's state after it.
func reachPlace(sites []orb.Point, l *Layout, K int, r float64, p orb.Point) (orb.Point, reachState, error) {
	try := append(append([]orb.Point(nil), sites...), p)
	best, err := reachMeasure(try, l, K, r)
	if err != nil || math.IsInf(best.rng, 1) {
		return p, best, err
	}
	at := p
	taken := make(map[orb.Point]bool, len(sites))
	for _, q := range sites {
		taken[q] = true
	}
	for i := 0; i < reachDirections; i++ {
		a := 2 * math.Pi * float64(i) / reachDirections
		c := orb.Point{p[0] + reachPull*r*math.Cos(a), p[1] + reachPull*r*math.Sin(a)}
		if taken[c] || !l.Area.Contains(c[0], c[1]) {
			continue
		}
		try[len(try)-1] = c
		st, err := reachMeasure(try, l, K, r)
		if err != nil {
			return p, best, err
		}
		if st.area > best.area {
			best, at = st, c
		}
	}
	return at, best, nil
}

// ReachAdditions adds devices to the layout until every spot of the site
// area is reached by at least K devices at the planned range r (see the
// file comment for the method), with the exact figures after each
// addition. opt.MaxAdditions caps the additions (0: K·(8·⌈n_hex⌉ + 64),
// n_hex the hexagonal covering estimate area / ((3√3/2) r²)); when the cap
// is reached first the devices placed so far are returned with an error
// wrapping ErrReachCap. opt.Range and opt.Refine are not used.
//
// Suggestions are planning aids, exact for the disk model only.
func ReachAdditions(l *Layout, K int, r float64, opt SuggestOptions) (*ReachSuggestion, error) {
	const where = "coverage: ReachAdditions"
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if K < 1 {
		return nil, fmt.Errorf("%s: k = %d must be at least 1", where, K)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
		return nil, fmt.Errorf("%s: range %v must be a finite number > 0", where, r)
	}
	limit := opt.MaxAdditions
	if limit <= 0 {
		limit = K * (8*int(math.Ceil(l.AreaM2/(1.5*math.Sqrt(3)*r*r))) + 64)
	}
	target := r * (1 + planRangeTol)
	sites := append([]orb.Point(nil), l.Sites...)
	st, err := reachMeasure(sites, l, K, r)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	s := &ReachSuggestion{K: K, Range: r, Existing: len(l.Sites),
		CoverRangeBefore: st.rng, ShareBefore: st.share, CoveredBefore: st.area}
	for st.rng > target {
		if len(s.Added) >= limit {
			reachFinish(s, st, target)
			return s, fmt.Errorf("%s: %d additions: %w", where, limit, ErrReachCap)
		}
		if !st.ok {
			return nil, fmt.Errorf("%s: every spot needing more range holds a device already", where)
		}
		var p orb.Point
		if p, st, err = reachPlace(sites, l, K, r, st.next); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
		sites = append(sites, p)
		s.Added = append(s.Added, p)
		s.Steps = append(s.Steps, ReachStep{Added: p, CoverRange: st.rng, Share: st.share, CoveredArea: st.area})
	}
	if err := reachPrune(s, l, target); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	last := reachState{rng: s.CoverRangeBefore, share: s.ShareBefore, area: s.CoveredBefore}
	if n := len(s.Steps); n > 0 {
		t := s.Steps[n-1]
		last = reachState{rng: t.CoverRange, share: t.Share, area: t.CoveredArea}
	}
	reachFinish(s, last, target)
	return s, nil
}

// reachFinish sets the after figures from the last state.
func reachFinish(s *ReachSuggestion, st reachState, target float64) {
	s.CoverRangeAfter, s.ShareAfter, s.CoveredAfter = st.rng, st.share, st.area
	s.Reached = st.rng <= target
}

// reachPrune drops, latest first, every addition whose removal keeps the
// K-cover range within target, then recomputes the steps of what remains
// when something was dropped.
func reachPrune(s *ReachSuggestion, l *Layout, target float64) error {
	keep := append([]orb.Point(nil), s.Added...)
	for i := len(keep) - 1; i >= 0; i-- {
		try := append(append(append([]orb.Point(nil), l.Sites...), keep[:i]...), keep[i+1:]...)
		st, err := reachMeasure(try, l, s.K, s.Range)
		if err != nil {
			return err
		}
		if st.rng <= target {
			keep = append(keep[:i], keep[i+1:]...)
			s.Pruned++
		}
	}
	if s.Pruned == 0 {
		return nil
	}
	s.Added, s.Steps = keep, s.Steps[:0]
	sites := append([]orb.Point(nil), l.Sites...)
	for _, p := range keep {
		sites = append(sites, p)
		st, err := reachMeasure(sites, l, s.K, s.Range)
		if err != nil {
			return err
		}
		s.Steps = append(s.Steps, ReachStep{Added: p, CoverRange: st.rng, Share: st.share, CoveredArea: st.area})
	}
	return nil
}
