// Where to add devices, and which candidate spots to pick, when the
// devices have their own ranges and the added ones a range R of their own.
//
// Powers. Device i at p_i with range r_i has the power π_i(x) = |x − p_i|²
// − r_i², a point is covered when min_i π_i(x) ≤ 0, and inside the power
// cell P_i (where π_i is smallest) only D_i covers (Aurenhammer, SIAM J.
// Comput. 16, 1987). The full-cover figure is the growth t* = max over A
// of min_i π_i(x): every range grown to √(r_i² + t*) covers the area, and
// its worst point is a vertex of a clipped power cell (FullCoverRanges).
//
// Free placement (SuggestAdditionsRanges, FewestAdditionsRanges).
// Farthest-point insertion in power terms, the analogue of Gonzalez's rule
// (Theor. Comp. Sci. 38, 1985) that plan_suggest.go follows for one
// common range: each new device, of range R, goes to the current worst
// point, the point of the area that needs the largest growth, moved into
// the area (planInside) when rounding put it just outside. For the fewest
// additions the layout is rebuilt with the regular triangulation after
// each addition (NewLayoutRanges), so every figure is the rebuilt
// layout's to the last digit; SuggestAdditionsRanges updates the clipped
// power diagram in place instead (plan_suggest_ranges_incr.go: the same
// cells, figures to the rounding of the measures, O(neighbourhood) per
// addition); there
// is no smallest-enclosing-circle refinement (the centre of a power cell's
// enclosing circle is not where a device of range R serves it best). The
// fewest additions insert until no gap is left, then drop, latest first,
// every addition whose removal leaves no gap, as plan_suggest.go does; the
// hexagonal estimate area / ((3√3/2) R²) (Kershner 1939) is the comparison.
//
// Candidate spots (ChooseCandidatesRanges, ChooseCandidatesEach in
// plan_candidates_ranges.go). Greedy maximum coverage with
// lazy evaluation, as plan_candidates.go (Nemhauser, Wolsey & Fisher 1978;
// Minoux 1978), the covered area being submodular whatever the radii. The
// gain of a spot c with range R is exact: in the current power cell X of
// device x, the points where π_c ≤ π_x (the half-plane L(c, x),
// planPowerLine) pass to c and are covered by D(c, R) alone; the others
// keep x and D(x, r_x). A point of X ∩ L(c, x) in D(x, r_x) has π_c ≤ π_x ≤
// 0, so it lies in D(c, R), and
//
//	gain(c) = Σ_X [ area(X ∩ L(c,x) ∩ D(c,R)) − area(X ∩ L(c,x) ∩ D(x,r_x)) ],
//
// each a polygon ∩ disk area in closed form (planar.RingDiskArea). Only
// cells within R + ρ_max of c can meet D(c, R) (ρ_max the largest distance
// from a device to a point of its cell), and X ∩ L(c, x) lies in D(c, R)
// wherever the terms differ, so the sum runs over those cells. After each
// pick the layout is rebuilt.
//
// With all ranges equal, R included, the common-range planners run
// (SuggestAdditions, FewestAdditions, ChooseCandidates: same positions and
// picks), their figures restated in these terms.
//
// Cost: for the fewest additions and the candidate picks, one regular
// triangulation and clipping per addition or pick (O(n log n) each);
// suited to the hundreds of additions a site plan makes, not to the
// million-device runs of the common-range planners. The
// figures of each step are kept as the additions are made (a layout is a
// function of its devices, so they are the rebuilt layout's); only the
// fewest additions, once pruning has dropped one, replay the rest.
//
// Error bounds: those of NewLayoutRanges and plan_clip.go (relative 1e-14
// of the cell areas); gains below planGainEps(R) are rounding noise.

package coverage

import (
	"fmt"
	"math"
	"sort"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// rangesPlan is a layout with per-device ranges plus added devices of
// range r (or of addedR[j] each, when set), rebuilt after every change.
type rangesPlan struct {
	base   *Layout
	r      float64
	added  []orb.Point
	addedR []float64
	ix     *planar.RegionIndex
	cur    *Layout
	fc     RangesFullCover
	// figs holds the figures of the layout with added[:j] for j = 0 …
	// len(added) while the additions were only ever appended (insert);
	// nil once an addition was dropped.
	figs []planFigures
	// inc, when set, is the clipped power diagram that insert updates in
	// place instead of rebuilding the layout (plan_suggest_ranges_incr.go);
	// cur is then stale.
	inc *rangesIncr
}

// planFigures are the figures of one layout (rangesPlan.figures).
type planFigures struct{ pow, need, unc, frac float64 }

// newRangesPlan starts a plan on layout l (per-device ranges) for added
// devices of range r.
func newRangesPlan(l *Layout, r float64) *rangesPlan {
	p := &rangesPlan{base: l, r: r, ix: l.Area.Index(), cur: l, fc: l.FullCoverRanges()}
	p.figs = []planFigures{p.figures()}
	return p
}

// rebuild recomputes the layout with the current additions.
func (p *rangesPlan) rebuild() error {
	if len(p.added) == 0 {
		p.cur, p.fc = p.base, p.base.FullCoverRanges()
		return nil
	}
	sites := append(append([]orb.Point(nil), p.base.Sites...), p.added...)
	ranges := append([]float64(nil), p.base.InputRanges...)
	for j := range p.added {
		if p.addedR != nil {
			ranges = append(ranges, p.addedR[j])
		} else {
			ranges = append(ranges, p.r)
		}
	}
	l, err := NewLayoutRanges(sites, ranges, p.base.Area)
	if err != nil {
		return err
	}
	p.cur, p.fc = l, l.FullCoverRanges()
	return nil
}

// covered reports whether no gap is left (the full-cover growth is at
// most 0, allowing planRangeTol of R² for rounding).
func (p *rangesPlan) covered() bool { return p.fc.Power <= planRangeTol*p.r*p.r }

// insert adds a device at the current worst point.
func (p *rangesPlan) insert() error {
	if len(p.fc.Worst) == 0 {
		return fmt.Errorf("no worst point: the area has no service area")
	}
	w := p.fc.Worst[0]
	x, y, ok := planInside(p.ix, p.base.Area, w[0], w[1])
	if !ok {
		return fmt.Errorf("no point of the site area found near the worst point (%.6g, %.6g)", w[0], w[1])
	}
	p.added = append(p.added, orb.Point{x, y})
	if p.inc != nil {
		p.inc.add(x, y, p.r)
		p.fc = RangesFullCover{Power: p.inc.fcPow, Covered: p.inc.fcPow <= 0}
		if !math.IsInf(p.inc.fcPow, -1) {
			p.fc.Worst = []orb.Point{p.inc.fcWorst}
		}
		p.cur = nil
		if p.figs != nil {
			unc, area := p.inc.uncovered(), p.base.AreaM2
			p.figs = append(p.figs, planFigures{p.fc.Power, p.grownNew(p.fc.Power), unc, planFrac(area-unc, area)})
		}
		return nil
	}
	if err := p.rebuild(); err != nil {
		return err
	}
	if p.figs != nil {
		p.figs = append(p.figs, p.figures())
	}
	return nil
}

// grownNew is the range an added device needs under the uniform growth t:
// √(R² + t), R itself when t ≤ 0 (no growth needed).
func (p *rangesPlan) grownNew(t float64) float64 {
	if t <= 0 {
		return p.r
	}
	return math.Sqrt(p.r*p.r + t)
}

// figures returns the full-cover growth, the range an added device needs
// under it, the uncovered area and the covered fraction of the current
// layout.
func (p *rangesPlan) figures() planFigures {
	unc := p.cur.UncoveredAreaGrown(0)
	return planFigures{p.fc.Power, p.grownNew(p.fc.Power), unc, planFrac(p.cur.AreaM2-unc, p.cur.AreaM2)}
}

// drop removes addition i (FewestAdditionsRanges' pruning): the figures
// recorded by insert no longer describe the additions.
func (p *rangesPlan) drop(i int) {
	p.added = append(append([]orb.Point(nil), p.added[:i]...), p.added[i+1:]...)
	p.figs = nil
}

// history returns the figures of the layout with added[:j], j = 0 …
// len(added): those recorded as the additions were inserted, or, once one
// was dropped, those of the additions replayed from the bare layout. A
// layout is a function of its devices, so the recorded figures are the
// replay's, to the last digit (TestSuggestRangesHistory).
func (p *rangesPlan) history() ([]planFigures, error) {
	if len(p.figs) == len(p.added)+1 {
		return p.figs, nil
	}
	q := newRangesPlan(p.base, p.r)
	for _, a := range p.added {
		q.added = append(q.added, a)
		if err := q.rebuild(); err != nil {
			return nil, err
		}
		q.figs = append(q.figs, q.figures())
	}
	return q.figs, nil
}

// report collects the figures of every step.
func (p *rangesPlan) report() (*Suggestion, error) {
	pts := p.added
	figs, err := p.history()
	if err != nil {
		return nil, err
	}
	s := &Suggestion{NewRange: p.r, Existing: len(p.base.Sites), Added: pts, Steps: make([]Step, len(pts))}
	f := figs[0]
	s.FullCoverPowerBefore, s.FullCoverBefore, s.UncoveredBefore, s.CoveredBefore = f.pow, f.need, f.unc, f.frac
	for j, a := range pts {
		b, f := figs[j], figs[j+1]
		s.Steps[j] = Step{Added: a, FullCoverPowerBefore: b.pow, FullCoverBefore: b.need, UncoveredBefore: b.unc, CoveredBefore: b.frac,
			FullCoverPowerAfter: f.pow, FullCoverAfter: f.need, UncoveredAfter: f.unc, CoveredAfter: f.frac}
	}
	f = figs[len(pts)]
	s.FullCoverPowerAfter, s.FullCoverAfter, s.UncoveredAfter, s.CoveredAfter = f.pow, f.need, f.unc, f.frac
	s.TotalDevices = s.Existing + len(pts)
	return s, nil
}

// checkRangesMove checks the layout and the added devices' range r of a
// planning move with per-device ranges.
func checkRangesMove(where string, l *Layout, r float64) error {
	if err := planCheckLayout(l); err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	if !l.weighted() {
		return fmt.Errorf("%s: the layout has one common range (use the common-range planner)", where)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
		return fmt.Errorf("%s: range %v of the added devices must be a finite number > 0", where, r)
	}
	return nil
}

// SuggestAdditionsRanges proposes positions for k new devices of range r
// in the site area of a layout with per-device ranges (NewLayoutRanges),
// by farthest-point insertion in power terms (see the file comment). The
// result's NewRange is r and Range 0: covered figures refer to each
// device's own range; FullCoverBefore and FullCoverAfter are the range an
// added device would need with every r² grown alike until no gap is left,
// FullCoverPowerBefore and FullCoverPowerAfter that growth.
//
// Suggestions are planning aids, exact for the disk model only.
func SuggestAdditionsRanges(l *Layout, k int, r float64) (*Suggestion, error) {
	const where = "coverage: SuggestAdditionsRanges"
	if err := checkRangesMove(where, l, r); err != nil {
		return nil, err
	}
	if k < 0 {
		return nil, fmt.Errorf("%s: %d additions requested; need k ≥ 0", where, k)
	}
	if l.inputRangesEqual() && r == l.InputRanges[0] {
		s, err := SuggestAdditions(l, k, SuggestOptions{Range: r})
		return suggestionAsRanges(s, r), err
	}
	p := newRangesPlan(l, r)
	p.inc = newRangesIncr(l)
	for j := 0; j < k; j++ {
		if err := p.insert(); err != nil {
			return nil, fmt.Errorf("%s: addition %d: %w", where, j+1, err)
		}
	}
	s, err := p.report()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	s.Method = MethodFarthestPoint
	return s, nil
}

// FewestAdditionsRanges adds devices of range r to a layout with
// per-device ranges until no gap is left (farthest-point insertion in
// power terms, then pruning; see the file comment), and compares the
// total with the hexagonal covering estimate for r. When the cap
// opt.MaxAdditions (0: 8·⌈estimate⌉ + 64) is reached first it returns the
// devices placed so far together with an error wrapping ErrAdditionCap.
func FewestAdditionsRanges(l *Layout, r float64, opt SuggestOptions) (*Suggestion, error) {
	const where = "coverage: FewestAdditionsRanges"
	if err := checkRangesMove(where, l, r); err != nil {
		return nil, err
	}
	hex := l.AreaM2 / (1.5 * math.Sqrt(3) * r * r)
	limit := opt.MaxAdditions
	if limit <= 0 {
		limit = 8*int(math.Min(math.Ceil(hex), 1<<26)) + 64
	}
	if l.inputRangesEqual() && r == l.InputRanges[0] {
		s, err := FewestAdditions(l, r, opt)
		return suggestionAsRanges(s, r), err
	}
	p := newRangesPlan(l, r)
	capped := false
	for !p.covered() {
		if len(p.added) >= limit {
			capped = true
			break
		}
		if err := p.insert(); err != nil {
			return nil, fmt.Errorf("%s: addition %d: %w", where, len(p.added)+1, err)
		}
	}
	if !capped {
		// Drop additions whose removal leaves no gap, latest first.
		for i := len(p.added) - 1; i >= 0; i-- {
			keep, figs := p.added, p.figs
			p.drop(i)
			if err := p.rebuild(); err != nil {
				return nil, fmt.Errorf("%s: %w", where, err)
			}
			if !p.covered() {
				p.added, p.figs = keep, figs // kept: the history still holds
			}
		}
		if err := p.rebuild(); err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
	}
	s, err := p.report()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	s.Method = MethodFarthestPoint
	s.Reached = p.covered()
	s.HexEstimate = hex
	s.HexDevices = int(math.Ceil(hex))
	if hex > 0 {
		s.HexRatio = float64(s.TotalDevices) / hex
	}
	if capped {
		return s, fmt.Errorf("%s: %w: %d additions leave gaps (raise SuggestOptions.MaxAdditions)", where, ErrAdditionCap, len(s.Added))
	}
	return s, nil
}

// suggestionAsRanges restates a common-range suggestion (all ranges r) in
// the terms of SuggestAdditionsRanges: NewRange r, Range 0, full-cover
// growths ρ² − r² and the range an added device needs, max(r, ρ).
func suggestionAsRanges(s *Suggestion, r float64) *Suggestion {
	if s == nil {
		return nil
	}
	pow := func(rho float64) float64 { return rho*rho - r*r }
	s.Range, s.NewRange = 0, r
	s.FullCoverPowerBefore, s.FullCoverPowerAfter = pow(s.FullCoverBefore), pow(s.FullCoverAfter)
	s.FullCoverBefore, s.FullCoverAfter = math.Max(r, s.FullCoverBefore), math.Max(r, s.FullCoverAfter)
	for j := range s.Steps {
		st := &s.Steps[j]
		st.FullCoverPowerBefore, st.FullCoverPowerAfter = pow(st.FullCoverBefore), pow(st.FullCoverAfter)
		st.FullCoverBefore, st.FullCoverAfter = math.Max(r, st.FullCoverBefore), math.Max(r, st.FullCoverAfter)
	}
	return s
}

// gainIndex finds the power cells near a point: the vertices of a layout
// sorted by x, and the largest cell radius.
type gainIndex struct {
	l      *Layout
	x      []float64
	v      []int32
	rhoMax float64
}

func newGainIndex(l *Layout) *gainIndex {
	nv := l.numVertices()
	g := &gainIndex{l: l, x: make([]float64, nv), v: make([]int32, nv)}
	for v := range g.v {
		g.v[v] = int32(v)
	}
	t := l.Tri
	sort.Slice(g.v, func(a, b int) bool { return t.Coords[2*g.v[a]] < t.Coords[2*g.v[b]] })
	for k, v := range g.v {
		g.x[k] = t.Coords[2*v]
		d, _, _ := l.vertexFarthest(v)
		g.rhoMax = math.Max(g.rhoMax, d)
	}
	return g
}

// rangesGainScratch is per-goroutine scratch space of gainIndex.gain.
type rangesGainScratch struct {
	cell planar.ClipRings
	a, b *planar.ClipRings
}

// gain returns the covered area a device of range r at (cx, cy) would add
// (the file comment's formula).
func (g *gainIndex) gain(cx, cy, r float64, sc *rangesGainScratch) float64 {
	l, t, c := g.l, g.l.Tri, g.l.Cells
	reach := r + g.rhoMax
	sum := 0.0
	for k := sort.SearchFloat64s(g.x, cx-reach); k < len(g.x) && g.x[k] <= cx+reach; k++ {
		v := g.v[k]
		vx, vy := t.Coords[2*v], t.Coords[2*v+1]
		if math.Abs(vy-cy) > reach || c.SiteStart[v] == c.SiteStart[v+1] {
			continue
		}
		rv := l.Ranges[v]
		hp := planPowerLine(cx, cy, r*r, vx, vy, rv*rv)
		sc.cell.Reset()
		rs := planCellRings(c, v)
		for j := 0; j < rs.NumRings(); j++ {
			sc.cell.AppendRing(rs.Ring(j), v)
		}
		if hp.AllOutside(sc.cell.XY) {
			continue
		}
		piece := kCut(hp, &sc.cell, &sc.a, &sc.b)
		for j := 0; j < piece.NumRings(); j++ {
			ring := piece.Ring(j)
			sum += planar.RingDiskArea(ring, cx, cy, r) - planar.RingDiskArea(ring, vx, vy, rv)
		}
	}
	return math.Max(0, sum)
}
