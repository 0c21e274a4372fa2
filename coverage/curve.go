// Coverage curve: the covered fraction as an exact function of the range,
// and its inverse.
//
// Math. For a clipped cell piece P with site c, write the disk part as a sum
// over the directed ring edges (a, b) of P of the signed area of the
// triangle (c, a, b) intersected with D(c, r). With a, b relative to c,
// d = b − a and the chord parameters t1 ≤ t2 where the line a + t·d meets
// the circle (clipped to [0, 1]), that area is
//
//	½ (t2 − t1) (a × b)  +  ½ r² (θ_ab − φ_in),
//
// θ_ab = atan2(a × b, a · b) the angle the edge subtends at c and φ_in the
// angle of the part inside the disk (the first term is the triangle over
// the inside part, the second the sector over the outside parts). Summed
// over the edges this is the exact area of P ∩ D(c, r); the derivative in r
// is r times Σ (θ_ab − φ_in), the angle of the circle lying inside P (the
// chord terms cancel). Per piece the data that do not depend on r are kept:
// θ_ab per edge, the piece area, the distance from c to the piece boundary
// (below it the disk lies wholly inside or wholly outside P, decided by the
// winding number of P around c, Σθ/2π), and the farthest vertex distance
// (beyond it P is covered). Evaluating the curve at r costs exact work only
// for pieces with nearest-boundary distance < r < farthest vertex.
//
// Error bounds: each piece term has absolute rounding error of order 1e-16
// times (piece area + r²); the inverse RangeFor is accurate to 1e-9 of the
// full-cover range (the iteration stops at 1e-10).

package coverage

import (
	"math"
	"sort"

	"github.com/sitecover/sitecover/planar"
)

// Curve is the covered fraction of a layout as an exact function of the
// range, precomputed for repeated evaluation.
type Curve struct {
	l       *Layout
	area    float64 // site area (m²)
	full    float64 // full-cover range
	contact float64 // largest range with covered fraction 0

	pieceV    []int32   // vertex of each piece (cell polygon)
	pieceArea []float64 // area of each piece
	pieceMin  []float64 // distance from the site to the piece boundary
	pieceMax  []float64 // distance from the site to the farthest piece vertex
	pieceIn   []bool    // site inside the piece (winding number 1)
	theta     []float64 // per ring point: angle subtended at the site by the edge starting there

	// w holds r_v² per vertex for the curve under uniform power growth
	// (CurveRanges): the argument is then the growth t, each piece's disk
	// has radius √(w + t), and contact, full and lo are powers. Nil for
	// the common-range curve.
	w   []float64
	lo  float64 // start of Samples (0; for powers the smallest −w)
	tol float64 // stopping tolerance of the inverse (crvTol times the scale)
}

// RangeAt pairs a covered fraction with a range.
type RangeAt struct {
	// Fraction is the covered fraction of the site area, in [0, 1].
	Fraction float64
	// Range is the range (metres).
	Range float64
}

// crvTol is the relative stopping tolerance of the inverse (times the
// full-cover range).
const crvTol = 1e-10

// Curve precomputes the coverage curve of the layout.
func (l *Layout) Curve() *Curve {
	c := l.Cells
	np := len(c.PolyStart) - 1
	cv := &Curve{
		l:         l,
		area:      l.AreaM2,
		pieceV:    make([]int32, np),
		pieceArea: make([]float64, np),
		pieceMin:  make([]float64, np),
		pieceMax:  make([]float64, np),
		pieceIn:   make([]bool, np),
		theta:     make([]float64, len(c.XY)/2),
	}
	nv := l.numVertices()
	for v := 0; v < nv; v++ {
		for p := c.SiteStart[v]; p < c.SiteStart[v+1]; p++ {
			cv.pieceV[p] = int32(v)
		}
	}
	const chunk = 4096
	nc := (np + chunk - 1) / chunk
	fulls := make([]float64, nc)
	contacts := make([]float64, nc)
	planar.ParallelChunks(np, chunk, 0, func(ci, lo, hi int) {
		full, contact := 0.0, math.Inf(1)
		for p := lo; p < hi; p++ {
			cv.preparePiece(p)
			if cv.pieceMax[p] > full {
				full = cv.pieceMax[p]
			}
			ct := cv.pieceMin[p]
			if cv.pieceIn[p] {
				ct = 0
			}
			if ct < contact {
				contact = ct
			}
		}
		fulls[ci], contacts[ci] = full, contact
	})
	cv.contact = math.Inf(1)
	for i := range fulls {
		cv.full = math.Max(cv.full, fulls[i])
		cv.contact = math.Min(cv.contact, contacts[i])
	}
	if math.IsInf(cv.contact, 1) {
		cv.contact = 0
	}
	cv.tol = crvTol * cv.full
	return cv
}

// preparePiece fills the r-independent data of piece p.
func (cv *Curve) preparePiece(p int) {
	c := cv.l.Cells
	cx, cy := cv.l.site(cv.pieceV[p])
	xy := c.XY
	area2, wind := 0.0, 0.0
	minD2, maxD := math.Inf(1), 0.0
	for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
		i0, i1 := int(c.RingStart[k]), int(c.RingStart[k+1])
		if i1 <= i0 {
			continue
		}
		ax, ay := xy[2*(i1-1)]-cx, xy[2*(i1-1)+1]-cy
		for i := i0; i < i1; i++ {
			prev := i - 1
			if i == i0 {
				prev = i1 - 1
			}
			bx, by := xy[2*i]-cx, xy[2*i+1]-cy
			cr := ax*by - ay*bx
			th := math.Atan2(cr, ax*bx+ay*by)
			cv.theta[prev] = th
			area2 += cr
			wind += th
			// Distance from the site to segment a-b.
			dx, dy := bx-ax, by-ay
			dd := dx*dx + dy*dy
			t := 0.0
			if dd > 0 {
				t = -(ax*dx + ay*dy) / dd
				if t < 0 {
					t = 0
				} else if t > 1 {
					t = 1
				}
			}
			qx, qy := ax+t*dx, ay+t*dy
			if d2 := qx*qx + qy*qy; d2 < minD2 {
				minD2 = d2
			}
			if d := math.Sqrt(bx*bx + by*by); d > maxD {
				maxD = d
			}
			ax, ay = bx, by
		}
	}
	if math.IsInf(minD2, 1) {
		minD2 = 0
	}
	cv.pieceArea[p] = area2 / 2
	cv.pieceMin[p] = math.Sqrt(minD2)
	cv.pieceMax[p] = maxD
	cv.pieceIn[p] = math.Round(wind/(2*math.Pi)) == 1
}

// pieceDisk returns the area of piece p inside D(site, r) and the angle
// (radians) of the circle of radius r that lies inside the piece.
func (cv *Curve) pieceDisk(p int, r float64) (area, angle float64) {
	c := cv.l.Cells
	cx, cy := cv.l.site(cv.pieceV[p])
	return crvPieceDisk(c.XY, c.RingStart[c.PolyStart[p]:c.PolyStart[p+1]+1], cv.theta, cx, cy, r)
}

// crvEdge holds the r-independent data of one ring edge a→b, relative to
// the site.
type crvEdge struct {
	ax, ay, dx, dy float64 // a and b − a
	aa, bb         float64 // |a|², |b|²
	cr, th         float64 // a × b and the angle the edge subtends
	dd, tm, inv    float64 // |d|², foot parameter −(a·d)/|d|², 1/|d|²
}

// crvEdges appends the edges of the rings whose point ranges are
// ringStart[k]..ringStart[k+1] in xy (theta holding the edge angles, indexed
// like the points), relative to (cx, cy).
func crvEdges(buf []crvEdge, xy []float64, ringStart []int32, theta []float64, cx, cy float64) []crvEdge {
	for k := 0; k+1 < len(ringStart); k++ {
		i0, i1 := int(ringStart[k]), int(ringStart[k+1])
		if i1 <= i0 {
			continue
		}
		ax, ay := xy[2*(i1-1)]-cx, xy[2*(i1-1)+1]-cy
		prev := i1 - 1
		for i := i0; i < i1; i++ {
			bx, by := xy[2*i]-cx, xy[2*i+1]-cy
			e := crvEdge{ax: ax, ay: ay, dx: bx - ax, dy: by - ay, aa: ax*ax + ay*ay, bb: bx*bx + by*by,
				cr: ax*by - ay*bx, th: theta[prev]}
			e.dd = e.dx*e.dx + e.dy*e.dy
			if e.dd > 0 {
				e.inv = 1 / e.dd
				e.tm = -(ax*e.dx + ay*e.dy) * e.inv
			}
			buf = append(buf, e)
			ax, ay = bx, by
			prev = i
		}
	}
	return buf
}

// crvPieceDisk is the edge sum of the package comment for the rings whose
// point ranges are ringStart[k]..ringStart[k+1] in xy, theta holding the
// edge angles (indexed like the points), around the centre (cx, cy).
func crvPieceDisk(xy []float64, ringStart []int32, theta []float64, cx, cy, r float64) (area, angle float64) {
	return crvEdgesDisk(crvEdges(nil, xy, ringStart, theta, cx, cy), r)
}

// crvEdgesDisk returns the area of the polygon with the given edges inside
// the disk of radius r about the origin, and the angle of the circle inside
// the polygon.
//
// This is the triangle-fan sum of planar.RingDiskArea in a different
// algorithm, kept apart on purpose: the curve evaluates the same piece at
// many ranges, so everything that does not depend on r (crvEdge: a, d,
// |a|², |b|², a × b, the subtended angle θ, the foot parameter) is computed
// once, the chord parameters come from the foot of the perpendicular
// (tm ± √(|d|²r² − (a × b)²)/|d|²) rather than the stable quadratic, the
// sector angles are θ minus the inside angle instead of one atan2 per
// outside piece, and the derivative in r (the inside angle) comes out of
// the same pass. RingDiskArea remains the single-range reference.
//
// The inside angles φ_in of the edges crossing the circle are not taken one
// by one: their sum is the argument of the product of the complex numbers
// (p·q, p×q) of the inside chords, one atan2 per piece, its multiple of 2π
// fixed by a coarse sum of the angles (a rational approximation of atan to
// within 0.005 rad per edge, far below π). The rounding is that of the
// product, a few ulps per factor.
func crvEdgesDisk(edges []crvEdge, r float64) (area, angle float64) {
	r2 := r * r
	inv := 1 / r2
	a2 := 0.0     // twice the triangle parts
	fixed := 0.0  // Σ θ over the edges not wholly inside
	coarse := 0.0 // coarse Σ φ_in over the product's factors
	exact := 0.0  // Σ φ_in over chords in line with the centre
	pr, pi := 1.0, 0.0
	crossed := false
	for i := range edges {
		e := &edges[i]
		if e.aa <= r2 && e.bb <= r2 {
			a2 += e.cr
			continue
		}
		fixed += e.th
		disc := e.dd*r2 - e.cr*e.cr
		if !(disc > 0) || e.dd == 0 {
			continue
		}
		h := math.Sqrt(disc) * e.inv
		t1, t2 := e.tm-h, e.tm+h
		if t1 < 0 {
			t1 = 0
		}
		if t2 > 1 {
			t2 = 1
		}
		if !(t1 < t2) {
			continue
		}
		px, py := e.ax+t1*e.dx, e.ay+t1*e.dy
		qx, qy := e.ax+t2*e.dx, e.ay+t2*e.dy
		w := (t2 - t1) * e.cr
		dt := px*qx + py*qy
		a2 += w
		if w == 0 {
			// A chord in line with the centre: its angle is 0 or ±π by the
			// signs (of zero) that θ has too, and it must not zero the
			// product.
			exact += math.Atan2(w, dt)
			continue
		}
		w, dt = w*inv, dt*inv // |(dt, w)| <= 1
		pr, pi = pr*dt-pi*w, pr*w+pi*dt
		if m := math.Abs(pr) + math.Abs(pi); m < 0x1p-500 {
			pr, pi = pr*0x1p500, pi*0x1p500
		}
		coarse += crvCoarseAtan2(w, dt)
		crossed = true
	}
	out := fixed - exact
	if crossed {
		a := math.Atan2(pi, pr)
		out -= a + 2*math.Pi*math.Round((coarse-a)/(2*math.Pi))
	}
	return a2/2 + r2*out/2, out
}

// crvCoarseAtan2 approximates atan2(y, x) to within 0.005 rad
// (atan t ≈ t/(1 + 0.28 t²) on [0, 1], a classical rational approximation;
// common practice), with atan2's treatment of signed zeros.
//
// Written to be inlined (it is called once per chord of every evaluation):
// t is the smaller of |x|, |y| over the larger.
func crvCoarseAtan2(y, x float64) float64 {
	ax, ay := math.Abs(x), math.Abs(y)
	n, d := ay, ax
	if ay > ax {
		n, d = ax, ay
	}
	a := 0.0
	if d != 0 { // both zero otherwise
		t := n / d
		a = t / (1 + 0.28*t*t)
	}
	if ay > ax {
		a = math.Pi/2 - a
	}
	if math.Signbit(x) {
		a = math.Pi - a
	}
	if math.Signbit(y) {
		a = -a
	}
	return a
}

// crvEval holds the uncovered area and its derivative at a sorted list of
// ranges.
type crvEval struct {
	u, du []float64
}

// eval returns the uncovered area U(r_k) and dU/dr at the ascending ranges
// rs, using the pieces p = first, first+stride, ... (stride 1: all pieces).
func (cv *Curve) eval(rs []float64, stride int) crvEval {
	K := len(rs)
	np := len(cv.pieceArea)
	nsel := (np + stride - 1) / stride
	chunk := 4096
	if nsel/64 > chunk {
		chunk = nsel / 64
	}
	nc := (nsel + chunk - 1) / chunk
	parts := make([]crvPart, nc)
	planar.ParallelChunks(nsel, chunk, 0, func(ci, lo, hi int) {
		pt := crvPart{make([]float64, K), make([]float64, K), make([]float64, K+1), make([]float64, K+1), make([]float64, K+1), nil}
		if cv.w != nil {
			pt.inWD = make([]float64, K+1)
		}
		var edges []crvEdge
		for s := lo; s < hi; s++ {
			edges = cv.evalPiece(&pt, s*stride, rs, edges)
		}
		parts[ci] = pt
	})
	return cv.combine(parts, rs, stride)
}

// crvPart holds one chunk's share of an evaluation: exact u and du at each
// range, and difference arrays for the pieces below their nearest-boundary
// distance (area − [in]·πr²).
type crvPart struct{ u, du, constD, cntD, inD, inWD []float64 }

// evalPiece adds piece p's uncovered area and derivative at the ranges rs
// to pt; edges is scratch space, returned for reuse.
func (cv *Curve) evalPiece(pt *crvPart, p int, rs []float64, edges []crvEdge) []crvEdge {
	a := cv.pieceArea[p]
	if a <= 0 {
		return edges
	}
	mn, mx := cv.pieceMin[p], cv.pieceMax[p]
	w, kZero := 0.0, 0
	if cv.w != nil {
		// Powers: the radius √(w + t) passes mn at t = mn² − w
		// and mx at mx² − w; below −w there is no disk.
		w = cv.w[cv.pieceV[p]]
		mn, mx = mn*mn-w, mx*mx-w
		kZero = sort.SearchFloat64s(rs, math.Nextafter(-w, math.Inf(1)))
	}
	// Ranges r <= mn: closed form. Ranges r >= mx: zero.
	kMin := sort.SearchFloat64s(rs, math.Nextafter(mn, math.Inf(1))) // first r > mn
	kMax := sort.SearchFloat64s(rs, mx)                              // first r >= mx
	if kMin > kMax {
		kMin = kMax
	}
	if kMin > 0 {
		pt.constD[0] += a
		pt.constD[kMin] -= a
		pt.cntD[0]++
		pt.cntD[kMin]--
		if cv.pieceIn[p] && kZero < kMin {
			pt.inD[kZero]++
			pt.inD[kMin]--
			if w != 0 {
				pt.inWD[kZero] += w
				pt.inWD[kMin] -= w
			}
		}
	}
	if kMin < kMax {
		c := cv.l.Cells
		cx, cy := cv.l.site(cv.pieceV[p])
		edges = crvEdges(edges[:0], c.XY, c.RingStart[c.PolyStart[p]:c.PolyStart[p+1]+1], cv.theta, cx, cy)
	}
	for k := kMin; k < kMax; k++ {
		r := rs[k]
		if cv.w != nil {
			r = math.Sqrt(math.Max(0, w+rs[k]))
		}
		cov, ang := crvEdgesDisk(edges, r)
		u := a - cov
		if u < 0 {
			u = 0
		} else if u > a {
			u = a
		}
		pt.u[k] += u
		if cv.w != nil {
			pt.du[k] -= ang / 2 // dU/dt = (dU/dr)/(2r)
		} else {
			pt.du[k] -= r * ang
		}
	}
	return edges
}

// combine sums the chunks' shares in chunk order. The difference arrays
// are summed in double-double arithmetic, and a range with no piece in its
// closed-form state gets exactly 0, so that the uncovered area is exactly 0
// at and beyond the full-cover range.
func (cv *Curve) combine(parts []crvPart, rs []float64, stride int) crvEval {
	K := len(rs)
	ev := crvEval{make([]float64, K), make([]float64, K)}
	cst := make([]float64, K)
	in := make([]float64, K)
	inW := make([]float64, K) // powers: Σ w over the pieces counted in in
	for _, pt := range parts {
		ch, cl, cnt, n, nw := 0.0, 0.0, 0.0, 0.0, 0.0
		for k := 0; k < K; k++ {
			ch, cl = planar.DDAdd(ch, cl, pt.constD[k])
			cnt += pt.cntD[k]
			n += pt.inD[k]
			if cnt > 0 {
				cst[k] += ch + cl
			}
			in[k] += n
			if pt.inWD != nil {
				nw += pt.inWD[k]
				inW[k] += nw
			}
			ev.u[k] += pt.u[k]
			ev.du[k] += pt.du[k]
		}
	}
	for k, r := range rs {
		if cv.w != nil {
			// Each counted piece holds its whole disk, π(w + t).
			ev.u[k] += cst[k] - math.Pi*(in[k]*r+inW[k])
			ev.du[k] -= in[k] * math.Pi
			if ev.u[k] < 0 {
				ev.u[k] = 0
			}
			if r <= cv.contact && stride == 1 {
				ev.u[k] = cv.area
			}
			continue
		}
		ev.u[k] += cst[k] - in[k]*math.Pi*r*r
		ev.du[k] -= in[k] * 2 * math.Pi * r
		if ev.u[k] < 0 {
			ev.u[k] = 0
		}
		if r <= cv.contact && stride == 1 {
			ev.u[k] = cv.area // no disk reaches the interior of any piece
		}
	}
	return ev
}

// FullCoverRange returns the full-cover range: the smallest range with
// covered fraction 1.
func (c *Curve) FullCoverRange() float64 { return c.full }

// UncoveredArea returns the exact uncovered area (m²) at range r.
func (c *Curve) UncoveredArea(r float64) float64 {
	if math.IsNaN(r) {
		return math.NaN()
	}
	if r < 0 && c.w == nil {
		r = 0
	}
	return c.eval([]float64{r}, 1).u[0]
}

// CoveredFraction returns the exact covered fraction at range r.
func (c *Curve) CoveredFraction(r float64) float64 {
	return coveredFromUncovered(c.UncoveredArea(r), c.area)
}

// RangeFor returns the smallest range whose covered fraction is at least
// fraction, to within 1e-9 of the full-cover range (where the curve is flat
// the rounding of the areas, about 1e-16 of the area, limits this further):
// 0 for fraction <= 0, the full-cover range for fraction >= 1, NaN for NaN.
func (c *Curve) RangeFor(fraction float64) float64 {
	return c.RangesFor([]float64{fraction})[0]
}

// RangesFor is RangeFor for several fractions at once, sharing the passes
// over the cells.
func (c *Curve) RangesFor(fractions []float64) []float64 {
	out := make([]float64, len(fractions))
	type state struct {
		i         int
		target    float64 // uncovered area to reach
		lo, hi, x float64
		prev      float64 // length of the previous Newton step (NaN: none)
		done      bool
	}
	var st []*state
	for i, f := range fractions {
		switch {
		case math.IsNaN(f):
			out[i] = math.NaN()
		case f <= 0:
			out[i] = c.lo
		case f >= 1 || c.full == c.lo:
			out[i] = c.full
		default:
			st = append(st, &state{i: i, target: (1 - f) * c.area, lo: c.contact, hi: c.full, prev: math.NaN()})
		}
	}
	if len(st) == 0 {
		return out
	}
	targets := make([]float64, len(st))
	for k, s := range st {
		targets[k] = s.target
	}
	c.initialGuesses(targets, func(k int, x float64) {
		s := st[k]
		if x <= s.lo || x >= s.hi {
			x = (s.lo + s.hi) / 2
		}
		s.x = x
	})
	tol := c.tol
	for iter := 0; iter < 200; iter++ {
		var act []*state
		for _, s := range st {
			if !s.done {
				act = append(act, s)
			}
		}
		if len(act) == 0 {
			break
		}
		sort.Slice(act, func(a, b int) bool { return act[a].x < act[b].x })
		rs := make([]float64, len(act))
		for k, s := range act {
			rs[k] = s.x
		}
		ev := c.eval(rs, 1)
		for k, s := range act {
			g := ev.u[k] - s.target
			if g > 0 {
				s.lo = s.x
			} else {
				s.hi = s.x
			}
			if s.hi-s.lo <= tol {
				out[s.i] = s.hi
				s.done = true
				continue
			}
			if ev.du[k] >= 0 || math.IsNaN(ev.du[k]) {
				s.x, s.prev = (s.lo+s.hi)/2, math.NaN()
				continue
			}
			d := -g / ev.du[k]
			nx := s.x + d
			if !(nx > s.lo && nx < s.hi) {
				s.x, s.prev = (s.lo+s.hi)/2, math.NaN()
				continue
			}
			// Converging quadratically (each step much shorter than the
			// last): stop when the step, or the error it predicts for the
			// next point (C·d² with C = |d|/prev²), is below the tolerance.
			if q := math.Abs(d); !math.IsNaN(s.prev) && q <= 0.5*s.prev {
				if q <= tol/4 || q*q*q/(s.prev*s.prev) <= tol/8 {
					out[s.i] = nx
					s.done = true
					continue
				}
			}
			s.prev = math.Abs(d)
			// A step below the tolerance is lengthened to it, so that the
			// next evaluation brackets the root from the other side (Newton
			// alone may creep towards a root of zero slope).
			if math.Abs(d) < tol/2 {
				nx = s.x + math.Copysign(tol/2, d)
				if !(nx > s.lo && nx < s.hi) {
					nx = (s.lo + s.hi) / 2
				}
			}
			s.x = nx
		}
	}
	for _, s := range st {
		if !s.done {
			out[s.i] = s.hi
		}
	}
	return out
}

// initialGuesses estimates, from a subsample of at most about 4096 pieces
// evaluated on a grid of 65 ranges, the range at which the uncovered area
// reaches each target, and reports it through set.
func (c *Curve) initialGuesses(targets []float64, set func(k int, x float64)) {
	np := len(c.pieceArea)
	stride := 1 + np/4096
	const G = 65
	rs := make([]float64, G)
	for k := range rs {
		rs[k] = c.contact + (c.full-c.contact)*float64(k)/float64(G-1)
	}
	ev := c.eval(rs, stride)
	// Scale the subsample to the whole area.
	sub := 0.0
	for p := 0; p < np; p += stride {
		sub += c.pieceArea[p]
	}
	if sub <= 0 {
		for k := range targets {
			set(k, (c.contact+c.full)/2)
		}
		return
	}
	scale := c.area / sub
	for k, t := range targets {
		x := (c.contact + c.full) / 2
		for g := 1; g < G; g++ {
			u0, u1 := ev.u[g-1]*scale, ev.u[g]*scale
			if u1 <= t {
				w := 0.5
				if u0 > u1 {
					w = (u0 - t) / (u0 - u1)
					w = math.Max(0, math.Min(1, w))
				}
				x = rs[g-1] + w*(rs[g]-rs[g-1])
				break
			}
		}
		set(k, x)
	}
}

// Samples returns the curve at n evenly spaced ranges from 0 to the
// full-cover range, together with its breakpoints at the ends of the
// rising part (the range at which coverage starts, when positive, and the
// full-cover range), ascending by range. Every value is exact. All ranges
// share one pass over the cells, but each cell is evaluated exactly at every
// sample range between its nearest boundary and its farthest vertex: about
// n/4 evaluations per cell for uniform layouts (some 100 ns each), so for a
// million sites Samples(64) costs about 2 s of CPU time.
func (c *Curve) Samples(n int) []RangeAt {
	if n < 2 {
		n = 2
	}
	rs := make([]float64, 0, n+1)
	for k := 0; k < n; k++ {
		rs = append(rs, c.lo+(c.full-c.lo)*float64(k)/float64(n-1))
	}
	rs[n-1] = c.full
	if c.contact > c.lo && c.contact < c.full {
		rs = append(rs, c.contact)
	}
	sort.Float64s(rs)
	w := 0
	for _, r := range rs {
		if w == 0 || r != rs[w-1] {
			rs[w] = r
			w++
		}
	}
	rs = rs[:w]
	ev := c.eval(rs, 1)
	out := make([]RangeAt, len(rs))
	for k, r := range rs {
		out[k] = RangeAt{Fraction: coveredFromUncovered(ev.u[k], c.area), Range: r}
	}
	return out
}
