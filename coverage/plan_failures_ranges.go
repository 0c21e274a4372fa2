// Single-device failures when devices have their own ranges.
//
// Power cells. Device i at p_i with range r_i has the power π_i(x) =
// |x − p_i|² − r_i²; its power cell P_i holds the points where π_i is
// smallest, and the union of disks meets P_i only in D_i (Aurenhammer,
// SIAM J. Comput. 16, 1987). When device v fails only the points of P_v
// change their smallest-power device: outside P_v the smallest power over
// all devices is some π_w, w ≠ v, and it stays the smallest. Inside P_v the
// new owner is the smallest-power device among the rest, which is either a
// neighbour of v in the regular triangulation (the argument of
// plan_failures.go with power circles for circles: the deletion step of a
// regular triangulation only retriangulates the star of v) or a device that
// was hidden, whose disk v helped to cover and which now owns a part of
// P_v. So the new diagram inside P_v ∩ A is the power diagram of
// N(v) ∪ H_v restricted to P_v ∩ A, H_v the hidden devices that win
// somewhere in P_v. For a candidate set C the piece of w ∈ C is
//
//	P_v ∩ A ∩ ⋂_{u ∈ C, u ≠ w} L(w, u),  L(w, u) = {x : π_w(x) ≤ π_u(x)},
//
// L the half-plane (x − p_w)·n ≤ (|n|² + r_w² − r_u²)/2, n = p_u − p_w
// (planPowerLine). Inside the piece only w's disk matters, so, at the
// planned ranges,
//
//	added uncovered = area(P_v ∩ A ∩ D_v) − Σ_w area(piece_w ∩ D_w),
//
// and the closing power — the uniform growth t (every range √(r_i² + t))
// at which the remaining devices cover all of P_v ∩ A — is the largest
// power of a point of P_v ∩ A with respect to its new owner: per piece the
// farthest vertex from w (π_w is convex, its maximum over a polygon is at
// a vertex) minus r_w². The range each device needs for the plan to
// survive any single failure is √(r_i² + T), T the largest closing power
// (≤ 0: the planned ranges already survive every single failure).
//
// Which hidden devices win. H_v is found in two steps. First the pieces of
// N(v) alone are built, with M their largest power. A hidden device u can
// win at x ∈ P_v only if π_u(x) < π_w(x) ≤ M for the owner w of x, so
// |x − p_u|² < r_u² + M: only hidden devices within √(r_u² + M) of the
// bounding box of P_v ∩ A are examined (a bucket grid of the hidden
// devices lists those near the box, in O(1) buckets for cells of the usual
// size; they are taken by increasing x, then input index). On each piece π_u − π_w is affine, so u wins somewhere on
// it exactly when it wins at one of the piece's vertices: those that win
// at a vertex are added to the candidates and the split is done again.
// Adding candidates that end up with an empty piece changes nothing, and a
// hidden device that does not beat the N(v) diagram anywhere cannot win
// against a larger candidate set, so the second split is the exact
// diagram. A hidden device's own failure costs nothing: it serves no part
// of the area.
//
// One device at a time (RangesFailures.Device). Everything above reads
// only v's clipped cell, its neighbours and the hidden devices near the
// cell, so one device's failure costs O(neighbourhood) on the whole
// layout; FailuresRanges runs the same routine for every device and adds
// the whole-layout figures (uncovered area, full-cover growth without v).
// Growing every range to √(r_i² + t) adds t to every weight: the power
// lines, the diagram and the hidden devices that win stay the same, the
// disks grow and every power drops by t, so the figures at growth t are
// those of the same split measured at the grown ranges.
//
// Error bounds: those of plan_failures.go. The power line's offset carries
// one more rounding than a bisector's (the weights r_w², r_u² and their
// difference, relative ε each of |n|² + r_w² + r_u²), moving the line by
// about 1e-16 of that over |n|: still far below the rounding the measures
// carry. The hidden-device filter keeps a relative slack hiddenSlack on
// r_u² + M, so that a device rounding would put just outside is examined.

package coverage

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// hiddenSlack is the relative slack of the hidden-device filter: r_u² + M
// is computed with two roundings and the squared distance to the bounding
// box with three, each of relative size 2⁻⁵³, so 1e-12 covers them with a
// wide margin (a device that close to the limit wins at most a sliver of
// that relative width, and examining it is only extra work).
const hiddenSlack = 1e-12

// FailuresRanges is Failures for a layout with per-device ranges
// (NewLayoutRanges): each device's failure at its own planned range, with
// the power diagram of the remaining devices recomputed inside its power
// cell (the file comment gives the method), and the ranges at which the
// plan survives any single failure under uniform power growth. Hidden
// devices are listed with Hidden set and cost nothing. With all ranges
// equal it is Failures at that range, with the power fields filled in
// (ClosingPower = ClosingRange² − r², SurviveRanges all SurviveRange).
// Each device's entry is the one RangesFailures.Device gives at growth 0,
// with the whole-layout figures (Uncovered, FullCoverPower) added.
func FailuresRanges(l *Layout) (*FailureReport, error) {
	if err := checkFailuresRanges("coverage: FailuresRanges", l); err != nil {
		return nil, err
	}
	if l.inputRangesEqual() {
		return failuresEqualRanges(l)
	}
	t := l.Tri
	nv := t.NumVertices()
	rf := newRangesFailures(l)
	res := make([]planFailRangesVertex, nv)
	planParallel(nv, func(lo, hi int) {
		var sc planPowerScratch
		for v := lo; v < hi; v++ {
			rf.vertex(int32(v), 0, &sc, &res[v])
		}
	})
	rep := &FailureReport{Ranges: append([]float64(nil), l.InputRanges...), SurviveSite: -1,
		SurvivePoint: orb.Point{math.NaN(), math.NaN()}, SurvivePower: math.Inf(-1), SurviveRange: math.NaN()}
	unc := 0.0
	for v := range res {
		unc += res[v].baseUnc
	}
	top := planTopTwo(len(res), func(v int) float64 { return res[v].own })
	rep.Uncovered = math.Max(0, unc)
	rep.FullCover = math.NaN()
	rep.FullCoverPower = math.Inf(-1)
	if top.top1 >= 0 {
		rep.FullCoverPower = res[top.top1].own
	}
	devs := make([]DeviceFailure, len(l.Sites))
	for i := range devs {
		v := t.Vertex[i]
		var f *planFailRangesVertex
		if v >= 0 {
			f = &res[v]
		}
		d := rf.entry(i, f)
		d.Uncovered, d.FullCoverPower = rep.Uncovered+d.AddedUncovered, rep.FullCoverPower
		if v >= 0 {
			others := math.Inf(-1)
			if o := top.other(v); o >= 0 {
				others = res[o].own
			}
			d.FullCoverPower = math.Max(f.closingPow, others)
			if rep.SurviveSite < 0 || d.ClosingPower > rep.SurvivePower {
				rep.SurvivePower, rep.SurvivePoint, rep.SurviveSite, rep.SurviveRange = d.ClosingPower, d.Deepest, i, d.ClosingRange
			}
		}
		devs[i] = d
	}
	rep.SurviveRanges = survivingRanges(l.InputRanges, rep.SurvivePower)
	slices.SortFunc(devs, func(a, b DeviceFailure) int {
		return cmp.Or(cmp.Compare(b.AddedUncovered, a.AddedUncovered), cmp.Compare(b.ClosingPower, a.ClosingPower), cmp.Compare(a.Site, b.Site))
	})
	rep.Devices = devs
	return rep, nil
}

// checkFailuresRanges reports a layout the failures with own ranges
// cannot use (where names the caller).
func checkFailuresRanges(where string, l *Layout) error {
	if err := planCheckLayout(l); err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	if !l.weighted() {
		return fmt.Errorf("%s: the layout has one common range (use Failures)", where)
	}
	return nil
}

// survivingRanges returns √(r_i² + t) for each range (the planned range
// when t ≤ 0; +Inf when t is).
func survivingRanges(ranges []float64, t float64) []float64 {
	out := make([]float64, len(ranges))
	for i, r := range ranges {
		out[i] = r
		if t > 0 {
			out[i] = math.Sqrt(r*r + t)
		}
	}
	return out
}

// failuresEqualRanges is FailuresRanges for equal ranges: Failures at the
// common range r, its figures restated as powers.
func failuresEqualRanges(l *Layout) (*FailureReport, error) {
	r := l.InputRanges[0]
	rep, err := Failures(l, r)
	if err != nil {
		return nil, err
	}
	pow := func(d float64) float64 { return d*d - r*r }
	rep.SurvivePower = pow(rep.SurviveRange)
	rep.FullCoverPower = pow(rep.FullCover)
	rep.SurviveRanges = make([]float64, len(l.Sites))
	for i := range rep.SurviveRanges {
		rep.SurviveRanges[i] = math.Max(r, rep.SurviveRange)
	}
	for k := range rep.Devices {
		d := &rep.Devices[k]
		d.ClosingPower, d.FullCoverPower = pow(d.ClosingRange), pow(d.FullCover)
	}
	return rep, nil
}

// planFailRangesVertex holds the failure of one vertex.
type planFailRangesVertex struct {
	baseUnc, added float64
	own            float64 // largest power over the vertex's own cell (−Inf: empty)
	closing        float64 // distance from the deepest point to its backup
	closingPow     float64
	dx, dy         float64
	backup         int   // input index of the backup (−1: none)
	takeOver       []int // hidden devices with a piece (input indices, ascending)
}

// planPowerCand is one candidate device of a power split.
type planPowerCand struct {
	x, y, r, w float64 // position, range and weight r²
	site       int     // input index
}

// planPowerScratch is per-goroutine scratch space of FailuresRanges.
type planPowerScratch struct {
	nbrs      []int32
	cand      []planPowerCand
	cell      planar.ClipRings
	cur, next *planar.ClipRings
	order     []kByDist
	res       []powerPiece
	kept      planar.ClipRings
	verts     []float64
	found     []int32 // hidden devices near the cell (ranks in Layout.Hidden)
}

// powerPiece holds the measures of one non-empty piece of powerSplit.
type powerPiece struct {
	cand       int32   // index into the candidate list
	disk       float64 // area within the candidate's range
	far        float64 // farthest vertex distance from the candidate
	fx, fy     float64 // the farthest vertex
	pow        float64 // far² − r²: the largest power over the piece
	ring0, nr  int     // the piece's rings in kept
	ownerW, ox float64 // owner weight and x (for the hidden test)
	oy         float64
}

// planPowerLine returns the half-plane {x : π_w(x) ≤ π_u(x)} of the powers
// with respect to (wx, wy) of weight ww and (ux, uy) of weight wu (the
// file comment's L(w, u); with equal weights planar.Bisector).
func planPowerLine(wx, wy, ww, ux, uy, wu float64) planar.HalfPlane {
	nx, ny := ux-wx, uy-wy
	return planar.HalfPlane{WX: wx, WY: wy, NX: nx, NY: ny, H: 0.5 * (nx*nx + ny*ny + (ww - wu))}
}

// powerSplit splits sc.cell among the candidates sc.cand by their power
// diagram, measuring each non-empty piece about its candidate at the
// candidate's range; results in sc.res, rings in sc.kept.
func powerSplit(valid func(int32, float64, float64) bool, sc *planPowerScratch) {
	sc.res = sc.res[:0]
	sc.kept.Reset()
	for wi, w := range sc.cand {
		cur := &sc.cell
		sc.order = sc.order[:0]
		for ui, u := range sc.cand {
			if ui != wi {
				dx, dy := u.x-w.x, u.y-w.y
				sc.order = append(sc.order, kByDist{dx*dx + dy*dy, int32(ui)})
			}
		}
		kSortByDist(sc.order)
		for _, o := range sc.order {
			u := sc.cand[o.v]
			cur = kCut(planPowerLine(w.x, w.y, w.w, u.x, u.y, u.w), cur, &sc.cur, &sc.next)
			if len(cur.XY) == 0 {
				break
			}
		}
		if len(cur.XY) == 0 {
			continue
		}
		_, d, far, fx, fy := planMeasures(cur, w.x, w.y, w.r, valid)
		if far < 0 {
			continue
		}
		p := powerPiece{cand: int32(wi), disk: d, far: far, fx: fx, fy: fy, pow: far*far - w.w,
			ring0: sc.kept.NumRings(), nr: cur.NumRings(), ownerW: w.w, ox: w.x, oy: w.y}
		for k := 0; k < cur.NumRings(); k++ {
			sc.kept.AppendRing(cur.Ring(k), cur.Label[k])
			copy(sc.kept.Prov[len(sc.kept.Prov)-len(cur.RingProv(k)):], cur.RingProv(k))
		}
		sc.res = append(sc.res, p)
	}
}

// RangesFailures answers single-device failures of one layout with
// per-device ranges a device at a time: each answer is computed directly on
// the whole layout from the failing device's power cell, its neighbours in
// the regular triangulation and the hidden devices near the cell (the file
// comment's method), so a call costs O(neighbourhood), not O(devices).
// Preparing it buckets the hidden devices (O(h) for h hidden devices).
// FailuresRanges runs the same per-device routine for every device. A
// RangesFailures only reads the layout and is safe for concurrent use.
type RangesFailures struct {
	l      *Layout
	equal  bool // all ranges equal: Failures' method (plan_failures.go)
	dups   bool // with equal ranges, some devices share a spot
	hidden *hiddenIndex
}

// NewRangesFailures prepares the per-device failures of a layout with
// per-device ranges (NewLayoutRanges).
func NewRangesFailures(l *Layout) (*RangesFailures, error) {
	if err := checkFailuresRanges("coverage: NewRangesFailures", l); err != nil {
		return nil, err
	}
	if l.inputRangesEqual() {
		return &RangesFailures{l: l, equal: true, dups: l.Tri.NumVertices() < len(l.Sites)}, nil
	}
	return newRangesFailures(l), nil
}

// newRangesFailures is NewRangesFailures for a checked layout of unequal
// ranges.
func newRangesFailures(l *Layout) *RangesFailures {
	return &RangesFailures{l: l, hidden: newHiddenIndex(l)}
}

// Device returns the failure of the device of input index i when every
// range is grown to √(r_i² + t) (t = 0: the planned ranges; the power
// diagram does not change with t): FailuresRanges' entry for it at t = 0,
// except the two whole-layout figures, Uncovered and FullCoverPower, which
// are NaN here (Uncovered is UncoveredAreaGrown(t) + AddedUncovered).
// ClosingPower is the further growth, beyond t, at which the remaining
// devices cover what this one served. With all ranges equal it is Failures'
// entry at the range √(r² + t), with ClosingPower = ClosingRange² − r² at
// that range; only then, and only when devices share a spot, does a call
// scan the device list (for the twin of a shared device).
func (rf *RangesFailures) Device(i int, t float64) (DeviceFailure, error) {
	l := rf.l
	if i < 0 || i >= len(l.Sites) {
		return DeviceFailure{}, fmt.Errorf("coverage: RangesFailures.Device: no device %d (the layout has %d)", i, len(l.Sites))
	}
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return DeviceFailure{}, fmt.Errorf("coverage: RangesFailures.Device: growth %v m² is not finite", t)
	}
	var d DeviceFailure
	switch v := l.Tri.Vertex[i]; {
	case rf.equal:
		d = rf.deviceEqual(i, t)
	case v < 0:
		d = rf.entry(i, nil)
	default:
		var sc planPowerScratch
		var f planFailRangesVertex
		rf.vertex(v, t, &sc, &f)
		d = rf.entry(i, &f)
	}
	d.Uncovered, d.FullCoverPower = math.NaN(), math.NaN()
	return d, nil
}

// entry is the failure of input i (vertex failure f; nil: hidden) without
// the whole-layout figures.
func (rf *RangesFailures) entry(i int, f *planFailRangesVertex) DeviceFailure {
	l := rf.l
	d := DeviceFailure{Site: i, Backup: -1, FullCover: math.NaN(), ClosingPower: math.Inf(-1), Deepest: l.Sites[i]}
	if f == nil {
		d.Hidden = true
		return d
	}
	d.ServiceArea = l.Cells.Area[l.Tri.Vertex[i]]
	d.AddedUncovered = f.added
	d.Deepest = orb.Point{f.dx, f.dy}
	d.ClosingRange, d.ClosingPower, d.Backup = f.closing, f.closingPow, f.backup
	d.TakeOver = f.takeOver
	return d
}

// deviceEqual is Device for equal ranges: Failures' entry for input i at
// the range √(r² + t), planFailOne's computation.
func (rf *RangesFailures) deviceEqual(i int, t float64) DeviceFailure {
	l := rf.l
	r, _ := grownWeight(l.InputRanges[0], t)
	v := l.Tri.Vertex[i]
	other := -1 // smallest other input index at v
	if rf.dups {
		for j, u := range l.Tri.Vertex {
			if u == v && j != i {
				other = j
				break
			}
		}
	}
	var sc planFailScratch
	var f planFailVertex
	planFailOne(l, v, r, other >= 0, &sc, &f)
	d := DeviceFailure{Site: i, ServiceArea: l.Cells.Area[v], FullCover: math.NaN(), Backup: -1}
	if other >= 0 {
		d.Shared, d.Deepest, d.ClosingRange, d.Backup = true, orb.Point{f.fx, f.fy}, f.rho, other
	} else {
		d.AddedUncovered, d.Deepest, d.ClosingRange = f.added, orb.Point{f.dx, f.dy}, f.closing
		if f.backup >= 0 {
			d.Backup = int(l.Tri.Source[f.backup])
		}
	}
	d.ClosingPower = d.ClosingRange*d.ClosingRange - r*r
	return d
}

// grownWeight returns the range √(b² + t) and the weight b² + t of a
// device of planned range b after the uniform growth t (the range 0 when
// the weight is not positive; b and b² themselves when t = 0).
func grownWeight(b, t float64) (r, w float64) {
	if t == 0 {
		return b, b * b
	}
	w = b*b + t
	return math.Sqrt(math.Max(0, w)), w
}

// vertex computes the failure of vertex v at the growth t.
func (rf *RangesFailures) vertex(v int32, g float64, sc *planPowerScratch, out *planFailRangesVertex) {
	l := rf.l
	t, c := l.Tri, l.Cells
	vx, vy := t.Coords[2*v], t.Coords[2*v+1]
	rv, wv := grownWeight(l.Ranges[v], g)
	sc.cell.Reset()
	rs := planCellRings(c, v)
	for k := 0; k < rs.NumRings(); k++ {
		sc.cell.AppendRing(rs.Ring(k), v)
	}
	area, disk, far, _, _ := planMeasures(&sc.cell, vx, vy, rv, nil)
	*out = planFailRangesVertex{baseUnc: area - disk, own: math.Inf(-1), closingPow: math.Inf(-1), dx: vx, dy: vy, backup: -1}
	if far < 0 || len(sc.cell.XY) == 0 {
		return // serves no part of the area
	}
	out.own = far*far - wv
	var valid func(int32, float64, float64) bool
	if !planCellConvex(&sc.cell.RingSet) {
		valid = func(_ int32, x, y float64) bool { return planCellHolds(&sc.cell.RingSet, x, y) }
	}
	sc.cand = sc.cand[:0]
	sc.nbrs = t.Neighbors(v, sc.nbrs[:0])
	for _, u := range sc.nbrs {
		r, w := grownWeight(l.Ranges[u], g)
		sc.cand = append(sc.cand, planPowerCand{x: t.Coords[2*u], y: t.Coords[2*u+1], r: r, w: w, site: int(t.Source[u])})
	}
	nn := len(sc.cand)
	powerSplit(valid, sc)
	if rf.hidden.appearing(l, g, sc) {
		powerSplit(valid, sc)
	}
	sum := 0.0
	for _, p := range sc.res {
		sum += p.disk
		if p.pow > out.closingPow {
			out.closingPow, out.closing, out.dx, out.dy, out.backup = p.pow, p.far, p.fx, p.fy, sc.cand[p.cand].site
		}
		if int(p.cand) >= nn {
			out.takeOver = append(out.takeOver, sc.cand[p.cand].site)
		}
	}
	slices.Sort(out.takeOver)
	out.added = math.Max(0, disk-sum)
	if len(sc.cand) == 0 {
		// No device remains: everything it covered is lost.
		out.added, out.closingPow, out.closing = disk, math.Inf(1), math.Inf(1)
	}
}

// hiddenIndex buckets the hidden devices for the filter of the file
// comment.
type hiddenIndex struct {
	xy   []float64 // positions by rank in Layout.Hidden
	grid *planar.BucketGrid
	wmax float64 // largest weight r² of a hidden device
}

func newHiddenIndex(l *Layout) *hiddenIndex {
	hs := &hiddenIndex{xy: make([]float64, 0, 2*len(l.Hidden))}
	ids := make([]int32, len(l.Hidden))
	for k, i := range l.Hidden {
		ids[k] = int32(k)
		hs.xy = append(hs.xy, l.Sites[i][0], l.Sites[i][1])
		hs.wmax = math.Max(hs.wmax, l.InputRanges[i]*l.InputRanges[i])
	}
	hs.grid = planBaseGrid(hs.xy, ids, 0)
	return hs
}

// appearing appends to sc.cand the hidden devices that beat the current
// split (sc.res, sc.kept) at growth g at some vertex of a piece, or, when
// there is no candidate, every hidden device (nothing else remains); it
// reports whether it added any. They are taken by increasing x, then
// input index.
func (hs *hiddenIndex) appearing(l *Layout, g float64, sc *planPowerScratch) bool {
	if hs.grid == nil {
		return false
	}
	m := math.Inf(1)
	none := len(sc.cand) == 0
	if !none {
		m = math.Inf(-1)
		for _, p := range sc.res {
			m = math.Max(m, p.pow)
		}
	}
	reach2 := (hs.wmax + g + m) * (1 + hiddenSlack)
	if !(reach2 >= 0) {
		return false
	}
	minX, minY, maxX, maxY := planar.BoundsXY(sc.cell.XY, nil)
	sc.found = sc.found[:0]
	if none {
		for k := range l.Hidden {
			sc.found = append(sc.found, int32(k))
		}
	} else {
		reach := math.Sqrt(reach2)
		gr := hs.grid
		c0, c1 := gr.Col(minX-reach), gr.Col(maxX+reach)
		for j, j1 := gr.Row(minY-reach), gr.Row(maxY+reach); j <= j1; j++ {
			// the buckets c0..c1 of row j are one run of Items
			sc.found = append(sc.found, gr.Items[gr.Start[j*gr.NX+c0]:gr.Start[j*gr.NX+c1+1]]...)
		}
	}
	slices.SortFunc(sc.found, func(a, b int32) int { return cmp.Or(cmp.Compare(hs.xy[2*a], hs.xy[2*b]), cmp.Compare(a, b)) })
	added := false
	for _, k := range sc.found {
		i := l.Hidden[k]
		p := l.Sites[i]
		r, w := grownWeight(l.InputRanges[i], g)
		dx := math.Max(0, math.Max(minX-p[0], p[0]-maxX))
		dy := math.Max(0, math.Max(minY-p[1], p[1]-maxY))
		if !none && (dx*dx+dy*dy > (w+m)*(1+hiddenSlack) || !sc.beaten(p, w)) {
			continue
		}
		sc.cand = append(sc.cand, planPowerCand{x: p[0], y: p[1], r: r, w: w, site: i})
		added = true
	}
	return added
}

// beaten reports whether the device at p of weight w has a smaller power
// than a piece's owner at some vertex of that piece (of the last
// powerSplit).
func (sc *planPowerScratch) beaten(p orb.Point, w float64) bool {
	for _, pc := range sc.res {
		for k := pc.ring0; k < pc.ring0+pc.nr; k++ {
			ring := sc.kept.Ring(k)
			for j := 0; j+1 < len(ring); j += 2 {
				x, y := ring[j], ring[j+1]
				pu := (x-p[0])*(x-p[0]) + (y-p[1])*(y-p[1]) - w
				pw := (x-pc.ox)*(x-pc.ox) + (y-pc.oy)*(y-pc.oy) - pc.ownerW
				if pu < pw {
					return true
				}
			}
		}
	}
	return false
}
