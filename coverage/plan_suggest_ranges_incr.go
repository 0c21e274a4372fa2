// The power diagram clipped to the site area, updated in place as devices
// are added: what SuggestAdditionsRanges needs after each addition (the
// full-cover growth, its worst point, the uncovered area), without
// rebuilding the regular triangulation and re-clipping every cell.
//
// Adding a device. Let P_x be the power cells (Aurenhammer, SIAM J.
// Comput. 16, 1987) of the devices present, clipped to the area A, and add
// a device q of weight W = R². Every cell only gains one constraint, the
// power line with q:
//
//	P'_x = P_x ∩ L(x, q),  P'_q = ∪_x (P_x ∩ L(q, x)),
//
// L(a, b) = {y : π_a(y) ≤ π_b(y)} (planPowerLine), because the old cells
// partition A and on P_x the smallest power among the old devices is π_x.
// So each affected cell is cut by one half-plane and the part cut away
// joins q's cell; the pieces of q's cell are kept as separate rings (areas,
// disk areas and the farthest vertex add up over pieces that share only
// edges). A device whose whole cell passes to q is hidden from then on.
//
// Which cells are affected. A point y of P_x ∩ A that passes to q has
// π_q(y) ≤ π_x(y) = min_i π_i(y) ≤ F, the full-cover growth, so
// |y − q|² ≤ W + F; and |y − x| ≤ ρ_x, the farthest point of x's cell from
// x. Only devices within √(W + F) + ρ_max of q can be affected (a bucket
// grid of the devices lists them; a relative slack incrSlack covers the
// rounding of W + F and of ρ); each is then tested vertex by vertex
// (HalfPlane.AllOutside), as ChooseCandidatesRanges' gain does.
//
// Figures. Per device the uncovered part area(P_x) − area(P_x ∩ D_x) and
// the largest power over its cell, at its farthest vertex (π_x is convex:
// its maximum over a polygon is at a vertex), are kept and recomputed for
// the cut cells and q only; the full-cover growth and its worst point are
// the largest of those (ties by x, then y, as FullCoverRanges orders its
// worst points), the uncovered area their sum. Half-plane cuts of a
// non-convex cell can leave vertices that are not points of the cell
// (halfplane.go, ProvCandidate); every ring is labelled with the base cell
// it came from, and such a vertex counts for the farthest point only when
// that base cell holds it (planCellHolds), as in the planners' splits.
//
// Agreement with a rebuild. The cells are the same sets as the rebuilt
// layout's; their vertices are computed as crossings of a power line with
// the cell's edges instead of as the power centres of the rebuilt
// triangulation's triangles, so the figures agree to the rounding the
// measures carry (relative 1e-12 in the tests, about 1e-16 measured)
// rather than to the last digit, and so do the positions of the additions,
// which are worst points (TestSuggestRangesIncremental). Where worst
// points tie exactly (a symmetric scene: corners of a square at the same
// power) that rounding may pick another of them than the rebuild does.
// FewestAdditionsRanges, whose steps are checked against rebuilds to the
// last digit, rebuilds.
//
// Cost: O(affected cells' vertices) per addition plus O(devices) for the
// sum and the largest power, against O(n log n) for a rebuild.

package coverage

import (
	"math"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// incrSlack is the relative slack of the affected-device search: W + F and
// ρ carry a few roundings of relative size 2⁻⁵³; 1e-9 covers them with a
// wide margin and only ever lists a device more.
const incrSlack = 1e-9

// rangesIncr is the clipped power diagram of a layout's devices plus the
// devices added, updated per addition (file comment). Device d < nv is
// vertex d of the base layout; added devices follow.
type rangesIncr struct {
	base    *Layout
	nv      int
	x, y, w []float64 // per device: position and weight r²
	r       []float64 // per device: range
	// cells holds each device's clipped power cell, its rings labelled
	// with the base vertex whose cell they came from.
	cells  []planar.ClipRings
	copied []bool // cells[d] holds the cell (else the base layout's)
	// unc, pow, px, py: per device the uncovered part of its cell and its
	// largest power (−Inf: empty cell), at (px, py).
	unc, pow []float64
	px, py   []float64
	rhoMax   float64          // at least every cell's farthest point from its device
	grid     *planar.HashGrid // the devices by position
	convex   []int8           // per base vertex: 0 unknown, 1 convex cell, −1 not
	near     []int32          // scratch: devices near an addition
	piece    planar.ClipRings // scratch: the part passing to the addition
	opp      planar.ClipRings // scratch: the part kept
	valid    func(label int32, x, y float64) bool
	fcPow    float64   // the full-cover growth
	fcWorst  orb.Point // and its worst point
}

// newRangesIncr starts the diagram of layout l (per-device ranges).
func newRangesIncr(l *Layout) *rangesIncr {
	nv := l.numVertices()
	s := &rangesIncr{base: l, nv: nv, copied: make([]bool, nv), cells: make([]planar.ClipRings, nv),
		convex: make([]int8, nv), grid: planar.NewHashGrid(l.AreaM2)}
	s.grid.Reset(nv)
	t := l.Tri
	for v := 0; v < nv; v++ {
		r := l.Ranges[v]
		s.x, s.y, s.r, s.w = append(s.x, t.Coords[2*v]), append(s.y, t.Coords[2*v+1]), append(s.r, r), append(s.w, r*r)
		s.unc, s.pow, s.px, s.py = append(s.unc, 0), append(s.pow, math.Inf(-1)), append(s.px, 0), append(s.py, 0)
		s.grid.Insert(int32(v), s.x[v], s.y[v])
	}
	s.valid = func(label int32, x, y float64) bool {
		if s.convex[label] == 0 {
			s.convex[label] = -1
			if rs := planCellRings(l.Cells, label); planCellConvex(&rs) {
				s.convex[label] = 1
			}
		}
		if s.convex[label] > 0 {
			return true
		}
		rs := planCellRings(l.Cells, label)
		return planCellHolds(&rs, x, y)
	}
	for d := 0; d < nv; d++ {
		s.measure(d)
	}
	s.worst()
	return s
}

// cell returns device d's cell, copying a base cell on first use.
func (s *rangesIncr) cell(d int) *planar.ClipRings {
	if d < s.nv && !s.copied[d] {
		s.copied[d] = true
		rs := planCellRings(s.base.Cells, int32(d))
		for k := 0; k < rs.NumRings(); k++ {
			s.cells[d].AppendRing(rs.Ring(k), int32(d))
		}
	}
	return &s.cells[d]
}

// measure recomputes device d's uncovered part and largest power.
func (s *rangesIncr) measure(d int) {
	c := s.cell(d)
	area, disk, far, fx, fy := planMeasures(c, s.x[d], s.y[d], s.r[d], s.valid)
	s.unc[d], s.pow[d], s.px[d], s.py[d] = area-disk, math.Inf(-1), fx, fy
	if far >= 0 {
		s.pow[d] = far*far - s.w[d]
		s.rhoMax = math.Max(s.rhoMax, far)
	}
}

// worst sets the full-cover growth and its worst point: the largest power
// over the devices, ties by x, then y.
func (s *rangesIncr) worst() {
	s.fcPow = math.Inf(-1)
	for d, p := range s.pow {
		if p > s.fcPow || p == s.fcPow && (s.px[d] < s.fcWorst[0] || s.px[d] == s.fcWorst[0] && s.py[d] < s.fcWorst[1]) {
			s.fcPow, s.fcWorst = p, orb.Point{s.px[d], s.py[d]}
		}
	}
}

// uncovered returns the uncovered area: the sum of the devices' parts.
func (s *rangesIncr) uncovered() float64 {
	u := 0.0
	for _, x := range s.unc {
		u += x
	}
	return math.Max(0, u)
}

// add inserts a device of range r at (qx, qy) (file comment).
func (s *rangesIncr) add(qx, qy, r float64) {
	q := len(s.x)
	W := r * r
	s.x, s.y, s.r, s.w = append(s.x, qx), append(s.y, qy), append(s.r, r), append(s.w, W)
	s.unc, s.pow, s.px, s.py = append(s.unc, 0), append(s.pow, math.Inf(-1)), append(s.px, 0), append(s.py, 0)
	s.cells = append(s.cells, planar.ClipRings{})
	if reach2 := (W + s.fcPow) * (1 + incrSlack); reach2 >= 0 {
		reach := (math.Sqrt(reach2) + s.rhoMax) * (1 + incrSlack)
		s.near = s.grid.Within(qx, qy, reach, s.near)
		for _, d := range s.near {
			s.cut(q, int(d))
		}
	}
	s.measure(q)
	if s.grid.NeedsRebuild() {
		s.grid.Reset(len(s.x))
		for d := range s.x {
			s.grid.Insert(int32(d), s.x[d], s.y[d])
		}
	} else {
		s.grid.Insert(int32(q), qx, qy)
	}
	s.worst()
}

// cut passes the part of device d's cell where q's power is smaller to q.
func (s *rangesIncr) cut(q, d int) {
	c := s.cell(d)
	if len(c.XY) == 0 {
		return
	}
	to := planPowerLine(s.x[q], s.y[q], s.w[q], s.x[d], s.y[d], s.w[d])
	if to.AllOutside(c.XY) {
		return
	}
	to.ClipSet(c, &s.piece)
	qc := &s.cells[q]
	for k := 0; k < s.piece.NumRings(); k++ {
		qc.AppendRing(s.piece.Ring(k), s.piece.Label[k])
		copy(qc.Prov[len(qc.Prov)-len(s.piece.RingProv(k)):], s.piece.RingProv(k))
	}
	keep := planPowerLine(s.x[d], s.y[d], s.w[d], s.x[q], s.y[q], s.w[q])
	keep.ClipSet(c, &s.opp)
	c.CopyFrom(&s.opp)
	s.measure(d)
}
