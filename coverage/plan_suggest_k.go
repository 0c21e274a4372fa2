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
//
// Own ranges (ReachAdditionsRanges). With devices of their own ranges and
// new ones of a given range, the same greedy runs on the K-th smallest
// power π_(K)(x) = K-th smallest |x − p_i|² − r_i² (kcover_power.go): π_q
// is convex on the piece (S, q), so the spot needing the most is the
// piece vertex of largest π_q; a device placed there (of range r) has
// power −r² there, so π_(K) drops to at most the old (K−1)-th smallest
// power or −r². Layouts are rebuilt with NewLayoutRanges and measured with
// KCoverRanges (hidden devices count); every spot is reached by K devices
// when the K-cover power is at most 0, up to the relative tolerance
// planRangeTol of the range (power ((1 + planRangeTol)² − 1)·r_max²).

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
	// (m); +Inf while fewer than K distinct devices stand. NaN with own
	// ranges (ReachAdditionsRanges): see CoverPower.
	CoverRange float64
	// CoverPower is set with own ranges: the K-cover power (m², the
	// largest K-th smallest power over the area; ≤ 0 when every spot is
	// reached by K devices; +Inf while fewer than K distinct devices
	// stand).
	CoverPower float64
	// Share and CoveredArea are the share and area (m²) reached by at
	// least K devices at the planned range.
	Share, CoveredArea float64
}

// ReachSuggestion is the result of ReachAdditions.
type ReachSuggestion struct {
	// K is the number of devices every spot must be reached by.
	K int
	// Range is the planned range (m); with own ranges the new devices'
	// range.
	Range float64
	// OwnRanges is set by ReachAdditionsRanges: the K-cover figures are
	// the powers CoverPowerBefore and CoverPowerAfter (and each step's
	// CoverPower), the CoverRange fields NaN.
	OwnRanges bool
	// Existing is the number of existing devices.
	Existing int
	// Added are the new devices' positions, in the order they were
	// inserted (after pruning); each lies in the site area.
	Added []orb.Point
	// Steps[j] are the figures with Added[:j+1].
	Steps []ReachStep
	// CoverRangeBefore and CoverRangeAfter are the K-cover ranges of the
	// layout alone and with every addition (+Inf with fewer than K
	// distinct devices; NaN with own ranges).
	CoverRangeBefore, CoverRangeAfter float64
	// CoverPowerBefore and CoverPowerAfter are set with own ranges: the
	// K-cover powers (m²) before and after.
	CoverPowerBefore, CoverPowerAfter float64
	// ShareBefore and ShareAfter are the shares reached by at least K
	// devices at Range; CoveredBefore and CoveredAfter the areas (m²).
	ShareBefore, ShareAfter     float64
	CoveredBefore, CoveredAfter float64
	// Reached tells whether every spot is reached by K devices at Range.
	Reached bool
	// Pruned is the number of additions dropped as redundant at the end.
	Pruned int
}

// reachState is the K-coverage of one layout: the K-cover figure rng (the
// range, or with own ranges the power; +Inf with fewer than K distinct
// devices), the share and area reached by K, and where the next device
// goes (reachNext).
type reachState struct {
	rng, share, area float64
	next             orb.Point
	ok               bool // next is set
}

// reachModel is what ReachAdditions measures: devices of one common range
// r, or (ranges set) devices of their own ranges plus new ones of range r.
type reachModel struct {
	r      float64
	ranges []float64 // the existing devices' own ranges (nil: one common range)
	target float64   // the largest K-cover figure that counts as reached
}

// reachMeasure computes the reachState of the sites at the common range r.
func reachMeasure(sites []orb.Point, l0 *Layout, K int, r float64) (reachState, error) {
	return (&reachModel{r: r}).measure(sites, l0, K)
}

// measure computes the reachState of the sites (the existing devices
// first, then the additions).
func (m *reachModel) measure(sites []orb.Point, l0 *Layout, K int) (reachState, error) {
	l, kc, k, err := m.cover(sites, l0, K)
	if err != nil {
		return reachState{}, err
	}
	lv := &kc.Levels[0]
	st := reachState{rng: lv.CoverRange, share: lv.Share, area: lv.CoveredArea}
	if m.ranges != nil {
		st.rng = lv.CoverPower
	}
	if k < K {
		st = reachState{rng: math.Inf(1)}
	}
	st.next, st.ok = reachNext(l, kc, lv)
	return st, nil
}

// cover builds the layout of the sites (NewLayout; with own ranges
// NewLayoutRanges, the existing devices' ranges then r for every
// addition) and its level k = min(K, distinct devices) with the pieces
// kept (KCover, KCoverRanges).
func (m *reachModel) cover(sites []orb.Point, l0 *Layout, K int) (*Layout, *KCoverage, int, error) {
	if m.ranges == nil {
		l, err := NewLayout(sites, l0.Area)
		if err != nil {
			return nil, nil, 0, err
		}
		k := min(K, l.Tri.NumVertices())
		kc, err := KCover(l, m.r, KOptions{Levels: []int{k}, keepPieces: true})
		return l, kc, k, err
	}
	rs := append([]float64(nil), m.ranges...)
	for len(rs) < len(sites) {
		rs = append(rs, m.r)
	}
	l, err := NewLayoutRanges(sites, rs, l0.Area)
	if err != nil {
		return nil, nil, 0, err
	}
	distinct := map[orb.Point]bool{}
	for _, p := range sites {
		distinct[p] = true
	}
	k := min(K, len(distinct))
	kc, err := KCoverRanges(l, KOptions{Levels: []int{k}, keepPieces: true})
	return l, kc, k, err
}

// step returns the figures of one addition at p with state st.
func (m *reachModel) step(p orb.Point, st reachState) ReachStep {
	if m.ranges != nil {
		return ReachStep{Added: p, CoverRange: math.NaN(), CoverPower: st.rng, Share: st.share, CoveredArea: st.area}
	}
	return ReachStep{Added: p, CoverRange: st.rng, Share: st.share, CoveredArea: st.area}
}

// reachNext returns the spot for the next device: the vertex of a clipped
// order-k piece where the k-th device is needed most (each piece's
// farthest vertex from its k-th device; with own ranges the largest power
// with respect to it), skipping vertices where a device stands already (a
// device there counts once: it would change nothing); for k = 1 the
// full-cover worst point (never a device). False when every such vertex
// holds a device.
func reachNext(l *Layout, kc *KCoverage, lv *KLevel) (orb.Point, bool) {
	if lv.K == 1 {
		return lv.CoverPoint, true
	}
	taken := make(map[orb.Point]bool, len(l.Sites))
	for _, p := range l.Sites {
		taken[p] = true
	}
	best, far, ok := orb.Point{}, math.Inf(-1), false
	for _, st := range lv.store {
		for i := range st.far {
			p := orb.Point{st.fx[i], st.fy[i]}
			f := st.far[i]
			if kc.dev != nil {
				f = f*f - kc.dev.w[st.set[i*st.k+st.k-1]]
			}
			if f > far && !taken[p] {
				best, far, ok = p, f, true
			}
		}
	}
	return best, ok
}

// reachPull is the distance, relative to r, from the spot needing the
// most range at which the other candidate positions of a new device lie
// (reachModel.place): within r, so the spot is reached by the new device, and
// far enough to reach into the area around it rather than past its edge.
const reachPull = 0.9

// reachDirections is the number of candidate directions around the spot.
const reachDirections = 8

// place chooses the position of the next device for the spot p: p
// itself or one of reachDirections points at reachPull·r from p (inside
// the area, not on a device), whichever gives the largest area reached by
// K devices (exact; p on a tie or while fewer than K devices stand), and
// returns it with the layout's state after it.
func (m *reachModel) place(sites []orb.Point, l *Layout, K int, p orb.Point) (orb.Point, reachState, error) {
	r := m.r
	try := append(append([]orb.Point(nil), sites...), p)
	best, err := m.measure(try, l, K)
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
		st, err := m.measure(try, l, K)
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
	if err := reachCheck(l, K, r); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	return reachAdd(l, K, opt, &reachModel{r: r, target: r * (1 + planRangeTol)}, where)
}

// ReachAdditionsRanges is ReachAdditions for a layout with per-device
// ranges (NewLayoutRanges): new devices of range newRange are added until
// every spot is reached by at least K devices at the planned ranges (the
// K-th smallest power is at most 0 everywhere; hidden devices count), with
// the exact figures (powers; see the file comment) after each addition.
// The suggestion has OwnRanges set.
func ReachAdditionsRanges(l *Layout, K int, newRange float64, opt SuggestOptions) (*ReachSuggestion, error) {
	const where = "coverage: ReachAdditionsRanges"
	if err := reachCheck(l, K, newRange); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if !l.weighted() {
		return nil, fmt.Errorf("%s: the layout has one common range (use ReachAdditions)", where)
	}
	wmax := newRange * newRange
	for _, r := range l.InputRanges {
		wmax = math.Max(wmax, r*r)
	}
	m := &reachModel{r: newRange, ranges: l.InputRanges, target: ((1+planRangeTol)*(1+planRangeTol) - 1) * wmax}
	return reachAdd(l, K, opt, m, where)
}

// reachCheck checks the layout, K and the range of ReachAdditions.
func reachCheck(l *Layout, K int, r float64) error {
	if err := planCheckLayout(l); err != nil {
		return err
	}
	if K < 1 {
		return fmt.Errorf("k = %d must be at least 1", K)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
		return fmt.Errorf("range %v must be a finite number > 0", r)
	}
	return nil
}

// reachAdd is the greedy of the file comment for the model m.
func reachAdd(l *Layout, K int, opt SuggestOptions, m *reachModel, where string) (*ReachSuggestion, error) {
	r := m.r
	limit := opt.MaxAdditions
	if limit <= 0 {
		limit = K * (8*int(math.Ceil(l.AreaM2/(1.5*math.Sqrt(3)*r*r))) + 64)
	}
	sites := append([]orb.Point(nil), l.Sites...)
	st, err := m.measure(sites, l, K)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	s := &ReachSuggestion{K: K, Range: r, Existing: len(l.Sites), OwnRanges: m.ranges != nil}
	m.setBefore(s, st)
	for st.rng > m.target {
		if len(s.Added) >= limit {
			m.finish(s, st)
			return s, fmt.Errorf("%s: %d additions: %w", where, limit, ErrReachCap)
		}
		if !st.ok {
			return nil, fmt.Errorf("%s: every spot needing more range holds a device already", where)
		}
		var p orb.Point
		if p, st, err = m.place(sites, l, K, st.next); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
		sites = append(sites, p)
		s.Added = append(s.Added, p)
		s.Steps = append(s.Steps, m.step(p, st))
	}
	if err := m.prune(s, l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	last := reachState{rng: s.CoverRangeBefore, share: s.ShareBefore, area: s.CoveredBefore}
	if m.ranges != nil {
		last.rng = s.CoverPowerBefore
	}
	if n := len(s.Steps); n > 0 {
		t := s.Steps[n-1]
		last = reachState{rng: t.CoverRange, share: t.Share, area: t.CoveredArea}
		if m.ranges != nil {
			last.rng = t.CoverPower
		}
	}
	m.finish(s, last)
	return s, nil
}

// setBefore sets the before figures from the layout's state.
func (m *reachModel) setBefore(s *ReachSuggestion, st reachState) {
	s.CoverRangeBefore, s.ShareBefore, s.CoveredBefore = st.rng, st.share, st.area
	if m.ranges != nil {
		s.CoverRangeBefore, s.CoverPowerBefore = math.NaN(), st.rng
	}
}

// finish sets the after figures from the last state.
func (m *reachModel) finish(s *ReachSuggestion, st reachState) {
	s.CoverRangeAfter, s.ShareAfter, s.CoveredAfter = st.rng, st.share, st.area
	if m.ranges != nil {
		s.CoverRangeAfter, s.CoverPowerAfter = math.NaN(), st.rng
	}
	s.Reached = st.rng <= m.target
}

// prune drops, latest first, every addition whose removal keeps the
// K-cover figure within the target, then recomputes the steps of what
// remains when something was dropped.
func (m *reachModel) prune(s *ReachSuggestion, l *Layout) error {
	keep := append([]orb.Point(nil), s.Added...)
	for i := len(keep) - 1; i >= 0; i-- {
		try := append(append(append([]orb.Point(nil), l.Sites...), keep[:i]...), keep[i+1:]...)
		st, err := m.measure(try, l, s.K)
		if err != nil {
			return err
		}
		if st.rng <= m.target {
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
		st, err := m.measure(sites, l, s.K)
		if err != nil {
			return err
		}
		s.Steps = append(s.Steps, m.step(p, st))
	}
	return nil
}
