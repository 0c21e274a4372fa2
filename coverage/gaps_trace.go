// Tracing the uncovered part of one clipped cell piece: P \ D(c, r).
//
// Math. P is a polygon with holes (a site's Voronoi cell clipped to the site
// area), c its site, D the closed disk of radius r. The boundary of P \ D is
// made of the portions of P's ring edges outside D and of arcs of the
// circle inside P. Walking a ring (P on the left), an edge enters the disk
// at an entry E and leaves it at an exit X; entries and exits alternate
// along each ring. Going clockwise around the circle keeps the outside of
// the disk on the left, so from each entry the boundary follows the circle
// clockwise to the next crossing point in clockwise order, which is an exit;
// in counter-clockwise angular order the crossings therefore alternate
// exit, entry, exit, ..., and each arc runs from an entry back to the exit
// just before it. The closed loops (run outside the disk, arc, run, arc...)
// together with rings lying wholly outside the disk and, when no ring meets
// the circle and the disk lies inside P, the whole circle, bound P \ D.
// Loops of positive signed area are outer boundaries of components; loops of
// negative area are holes and belong to the outer loop that contains them.
//
// When P is star-shaped from c (one ring, every edge turning
// counter-clockwise about c) ring order is angular order, and each run from
// an exit to the next entry closes with the arc from that entry back to its
// exit: one component per run, no sorting. Otherwise crossings are sorted by
// angle: atan2 of each crossing point, except along chains of crossings that
// follow each other closely on a ring (total angle variation of the ring
// portion between them below 1e-3), where each angle is the previous one
// plus the portion's angle, summed in double-double arithmetic from
// sub-segment angles atan2((t_q − t_p)(a × b), p · q), whose signs are exact
// functions of the edge's turning sense; so crossings close along a ring
// keep their exact relative order. Exact ties (crossings at one point: a
// ring vertex on the circle, where two rings touch, an edge tangent to the
// circle) are broken by the symbolic perturbation that grows the disk: a
// crossing at a vertex b on the circle, on an edge of direction d, moves
// in angle by K·δ/r for a growth δ, K = (b × d)/(b · d) (±∞ on an edge
// tangent at b, where the motion is of order √δ: backwards on the incoming
// edge, forwards on the outgoing one); on an edge tangent at an interior
// point the exit follows the entry in the edge's turning sense. Vertices
// within 1e-12 relative of the circle are snapped onto it, and their
// crossing parameters are the exact roots t = 0 (or 1) and
// t = −2 (a·d)/(d·d); likewise an edge whose line passes within 1e-12
// relative of the circle touches it (a tangent dip: entry and exit at the
// foot of the perpendicular), so a closed disk that just touches a
// boundary edge separates the uncovered parts on either side. A portion through the site itself (a site on its
// piece's boundary) has no defined angle and never links crossings.
//
// Areas and first moments come from the fan about c: a segment p→q adds
// ½ p×q and (p+q)(p×q)/6, an arc from E clockwise through φ to X adds
// −½ r² φ and (r²/3)(X.y − E.y, E.x − X.x). All exact up to rounding.

package coverage

import (
	"math"
	"sort"

	"github.com/sitecover/sitecover/planar"
)

// gapArc is the element kind of a circle arc.
const gapArc = -1

// gapSnapRel is the relative distance from the circle within which a ring
// vertex is treated as lying on it: |p|² − r² is computed with an error of a
// few u (u = 2⁻⁵³) of |p|² + r² from coordinates that are themselves a few
// ulps off (clipped-cell vertices), so 1e-12 ≈ 10⁴u catches every vertex
// that is on the circle up to rounding, while a snapped vertex is moved by
// at most about 1e-12·r (a micrometre at a range of a kilometre).
const gapSnapRel = 1e-12

// gapSelfCheckRel is the tolerance of the self-check (tests only) between
// the traced area and the exact uncovered area of a piece, relative to the
// piece's area plus r²: both are sums of exact-formula terms with errors of
// a few u each, so 1e-9 flags only a tracing error.
const gapSelfCheckRel = 1e-9

// gapTangentKey is the perturbation key of the entry and exit of an edge
// tangent to the circle at an interior point: larger in magnitude than any
// finite key K = (b × d)/(b · d) of a crossing at a vertex (a ratio of
// products of coordinates, far below 1e300 for coordinates in metres), yet
// finite, so it stays distinct from the ±Inf keys of an edge tangent at a
// vertex.
const gapTangentKey = 1e300

// gapElem is one boundary element of a traced loop: a straight segment or a
// circle arc, from (x, y) to the start of the next element of its loop.
type gapElem struct {
	x, y float64 // start point (absolute coordinates in the output)
	kind int32   // >= 0: bisector with that vertex; <= -2: region boundary; gapArc
	phi  float32 // arcs: clockwise angle (radians; the end is exact, being the next element's start)
}

// gapNode is one component of P \ D for one cell piece.
type gapNode struct {
	v                      int32
	loop0, loop1           int32   // loops [loop0, loop1) (chunk-local, then global)
	area, mx, my           float64 // area and first moments about the site
	minX, minY, maxX, maxY float64 // bounding box (absolute)
	deepD, deepX, deepY    float64 // farthest vertex from the site (absolute)
	touches                bool    // some positive-length portion lies on the region boundary
}

// gapPortion is a positive-length bisector element: its interval of the
// canonical coordinate along the bisector of the pair key.
type gapPortion struct {
	key    uint64
	lo, hi float64
	elem   int32
	node   int32
}

// gapChunk collects the traced components of a range of cells.
type gapChunk struct {
	nodes     []gapNode
	loopElem  []int32 // first element of each loop
	elems     []gapElem
	portions  []gapPortion
	anomalies int
}

// gapCross is a crossing of a ring edge with the circle.
type gapCross struct {
	ring   int32   // local ring index
	edge   int32   // local index of the edge's start point
	t      float64 // parameter along the edge
	x, y   float64 // position relative to the site
	exit   bool
	hi, lo float64 // angle, double-double
	key2   float64 // symbolic perturbation offset, ordering equal angles
	pos    int32   // position in angular order
	next   int32   // next crossing along the ring
	pred   int32   // entries: the exit where the arc from this entry ends
	seen   bool
}

// gapLoop is a loop under construction (relative coordinates).
type gapLoop struct {
	e0, e1                 int32
	area, mx, my           float64
	minX, minY, maxX, maxY float64
	deepD, deepX, deepY    float64
	touches                bool
	owner                  int32 // outer loop index for holes
}

// gapTracer traces pieces; one per goroutine, buffers reused.
type gapTracer struct {
	l         *Layout
	r, r2     float64
	selfCheck bool
	keep      bool // keep the loops' elements (for outlines)

	v      int32
	cx, cy float64
	// Local copies of the piece's ring points (relative to the site).
	ringLo, ringHi []int32 // local point ranges of the rings
	gidx           []int32 // global point index of each local point
	px, py         []float64
	dist           []float64
	out, snap      []bool
	cr             []float64 // a × b of the edge starting at the point
	nextPt         []int32   // local index of the next point along the ring

	xs     []gapCross
	sorted []int32
	deltas []gapDelta
	elems  []gapElem
	loops  []gapLoop
}

// label returns the EdgeSource label of the edge starting at local point i.
func (t *gapTracer) label(i int32) int32 { return t.l.Cells.EdgeSource[t.gidx[i]] }

// pt returns the point at parameter s on the edge starting at local point e.
func (t *gapTracer) pt(e int32, s float64) (float64, float64) {
	if s == 0 {
		return t.px[e], t.py[e]
	}
	n := t.nextPt[e]
	if s == 1 {
		return t.px[n], t.py[n]
	}
	return t.px[e] + s*(t.px[n]-t.px[e]), t.py[e] + s*(t.py[n]-t.py[e])
}

// piece traces piece p (a polygon index of the cells) and appends its
// components to ch.
func (t *gapTracer) piece(p int32, v int32, ch *gapChunk) {
	c := t.l.Cells
	t.v = v
	t.cx, t.cy = t.l.site(v)
	t.ringLo, t.ringHi = t.ringLo[:0], t.ringHi[:0]
	t.gidx, t.px, t.py = t.gidx[:0], t.px[:0], t.py[:0]
	t.dist, t.out, t.snap, t.cr, t.nextPt = t.dist[:0], t.out[:0], t.snap[:0], t.cr[:0], t.nextPt[:0]
	t.xs, t.elems, t.loops = t.xs[:0], t.elems[:0], t.loops[:0]
	r, r2 := t.r, t.r2
	for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
		i0, i1 := c.RingStart[k], c.RingStart[k+1]
		if i1-i0 < 3 {
			continue
		}
		lo := int32(len(t.px))
		t.ringLo = append(t.ringLo, lo)
		for i := i0; i < i1; i++ {
			x, y := c.XY[2*i]-t.cx, c.XY[2*i+1]-t.cy
			d := math.Sqrt(x*x + y*y)
			sn := r > 0 && math.Abs(d-r) <= gapSnapRel*r
			t.gidx = append(t.gidx, i)
			t.px, t.py = append(t.px, x), append(t.py, y)
			t.dist = append(t.dist, d)
			t.snap = append(t.snap, sn)
			t.out = append(t.out, d > r && !sn)
			t.nextPt = append(t.nextPt, int32(len(t.px)))
		}
		hi := int32(len(t.px))
		t.nextPt[hi-1] = lo
		t.ringHi = append(t.ringHi, hi)
	}
	n := int32(len(t.px))
	if n == 0 {
		return
	}
	star := len(t.ringLo) == 1
	for i := int32(0); i < n; i++ {
		j := t.nextPt[i]
		w := t.px[i]*t.py[j] - t.py[i]*t.px[j]
		t.cr = append(t.cr, w)
		if !(w > 0) {
			star = false
		}
	}
	nStart := len(ch.nodes)
	if r > 0 {
		t.findCrossings()
	}
	switch {
	case len(t.xs) == 0:
		t.traceNoCrossings()
	case star:
		t.traceStar()
	default:
		if !t.traceGeneral() {
			ch.anomalies++
			t.fallback(ch)
			return
		}
	}
	if !t.group() {
		ch.anomalies++
		t.fallback(ch)
		return
	}
	t.emit(ch)
	if t.selfCheck {
		got := 0.0
		for _, nd := range ch.nodes[nStart:] {
			got += nd.area
		}
		want := t.exactUncovered()
		if math.Abs(got-want) > gapSelfCheckRel*(t.pieceArea()+r2) {
			ch.anomalies++
		}
	}
}

// findCrossings computes the crossings of every ring with the circle, in
// ring order, and links each to the next along its ring.
func (t *gapTracer) findCrossings() {
	r2 := t.r2
	for ri := range t.ringLo {
		first := int32(len(t.xs))
		for i := t.ringLo[ri]; i < t.ringHi[ri]; i++ {
			j := t.nextPt[i]
			oa, ob := t.out[i], t.out[j]
			if !oa && !ob {
				continue
			}
			ax, ay := t.px[i], t.py[i]
			dx, dy := t.px[j]-ax, t.py[j]-ay
			dd := dx*dx + dy*dy
			if dd == 0 {
				continue
			}
			ad := ax*dx + ay*dy
			cr := t.cr[i]
			disc := dd*r2 - cr*cr
			if disc < 0 {
				disc = 0
			}
			tm := -ad / dd
			h := math.Sqrt(disc) / dd
			switch {
			case oa && !ob: // entry
				var s float64
				if t.snap[j] {
					bd := t.px[j]*dx + t.py[j]*dy
					s = 1
					if bd > 0 {
						s = 1 - 2*bd/dd
					}
				} else {
					s = tm - h
				}
				t.addCross(int32(ri), i, clamp01(s), false)
			case !oa && ob: // exit
				var s float64
				if t.snap[i] {
					s = 0
					if ad < 0 {
						s = -2 * ad / dd
					}
				} else {
					s = tm + h
				}
				t.addCross(int32(ri), i, clamp01(s), true)
			default: // both outside: the edge may dip into the disk
				// An edge whose line passes within gapSnapRel (relative) of
				// the circle is tangent, like a vertex that close: disc is
				// clamped to 0 above and the dip's entry and exit coincide.
				if dd*r2-cr*cr >= -2*gapSnapRel*dd*r2 && tm > 0 && tm < 1 {
					s1, s2 := clamp01(tm-h), clamp01(tm+h)
					if s2 < s1 {
						s1, s2 = s2, s1
					}
					t.addCross(int32(ri), i, s1, false)
					t.addCross(int32(ri), i, s2, true)
				}
			}
		}
		last := int32(len(t.xs))
		for k := first; k < last; k++ {
			nx := k + 1
			if nx == last {
				nx = first
			}
			t.xs[k].next = nx
		}
	}
}

func clamp01(s float64) float64 {
	if s < 0 {
		return 0
	}
	if s > 1 {
		return 1
	}
	return s
}

func (t *gapTracer) addCross(ring, edge int32, s float64, exit bool) {
	x, y := t.pt(edge, s)
	t.xs = append(t.xs, gapCross{ring: ring, edge: edge, t: s, x: x, y: y, exit: exit, pred: -1, key2: t.perturbation(edge, s, exit)})
}

// perturbation returns the first-order angular motion of a crossing when
// the disk grows (times r), the tie-break between crossings at the same
// point: K = (b × d)/(b · d) for a crossing at a snapped vertex b on an edge
// of direction d (the incoming edge's crossing moves back along it, the
// outgoing edge's forward); ∓∞·sign(b × d) on an edge tangent at b, where
// the motion is of the order of the square root of the perturbation; and
// ∓huge·sign(a × b) for the entry and exit of an edge tangent at an interior
// point (the exit follows the entry in the edge's turning sense). Other
// crossings are not at a shared point: 0.
func (t *gapTracer) perturbation(edge int32, s float64, exit bool) float64 {
	n := t.nextPt[edge]
	var b int32
	switch {
	case s == 1 && t.snap[n]:
		b = n
	case s == 0 && t.snap[edge]:
		b = edge
	default:
		// A tangent dip has its entry and exit at the same parameter.
		if k := len(t.xs); exit && k > 0 && t.xs[k-1].edge == edge && t.xs[k-1].t == s && !t.xs[k-1].exit {
			t.xs[k-1].key2 = -sgn(t.cr[edge]) * gapTangentKey
			return sgn(t.cr[edge]) * gapTangentKey
		}
		return 0
	}
	bx, by := t.px[b], t.py[b]
	dx, dy := t.px[n]-t.px[edge], t.py[n]-t.py[edge]
	cr, dot := bx*dy-by*dx, bx*dx+by*dy
	incoming := b == n
	if dot == 0 {
		if incoming {
			return -sgn(cr) * math.Inf(1)
		}
		return sgn(cr) * math.Inf(1)
	}
	return cr / dot
}

// newLoop starts a loop.
func (t *gapTracer) newLoop() *gapLoop {
	t.loops = append(t.loops, gapLoop{
		e0: int32(len(t.elems)), minX: math.Inf(1), minY: math.Inf(1),
		maxX: math.Inf(-1), maxY: math.Inf(-1), deepD: -1, owner: -1,
	})
	return &t.loops[len(t.loops)-1]
}

func (lp *gapLoop) extend(x, y float64) {
	lp.minX, lp.maxX = math.Min(lp.minX, x), math.Max(lp.maxX, x)
	lp.minY, lp.maxY = math.Min(lp.minY, y), math.Max(lp.maxY, y)
}

// segment adds the sub-segment [s0, s1] of the edge starting at local point
// e to loop lp.
func (t *gapTracer) segment(lp *gapLoop, e int32, s0, s1 float64) {
	if !(s1 > s0) {
		return
	}
	x0, y0 := t.pt(e, s0)
	x1, y1 := t.pt(e, s1)
	w := (s1 - s0) * t.cr[e]
	lab := t.label(e)
	t.elems = append(t.elems, gapElem{x: x0, y: y0, kind: lab})
	lp.area += w / 2
	lp.mx += (x0 + x1) * w / 6
	lp.my += (y0 + y1) * w / 6
	lp.extend(x0, y0)
	lp.extend(x1, y1)
	if lab <= -2 {
		lp.touches = true
	}
}

// vertex records local point i (outside the disk) as a deepest candidate.
func (t *gapTracer) vertex(lp *gapLoop, i int32) {
	if t.dist[i] > lp.deepD {
		lp.deepD, lp.deepX, lp.deepY = t.dist[i], t.px[i], t.py[i]
	}
}

// run adds the ring portion from crossing a forward to crossing b (the next
// crossing along the ring).
func (t *gapTracer) run(lp *gapLoop, a, b int32) {
	A, B := &t.xs[a], &t.xs[b]
	e, s := A.edge, A.t
	around := A.edge == B.edge && (b <= a || B.t < A.t)
	for {
		if e == B.edge && !around {
			t.segment(lp, e, s, B.t)
			return
		}
		t.segment(lp, e, s, 1)
		e = t.nextPt[e]
		t.vertex(lp, e)
		s = 0
		around = false
	}
}

// arc adds the arc from entry E clockwise through phi to the point (xx, xy).
func (t *gapTracer) arc(lp *gapLoop, ex, ey, phi, xx, xy float64) {
	r := t.r
	t.elems = append(t.elems, gapElem{x: ex, y: ey, kind: gapArc, phi: float32(phi)})
	lp.area -= t.r2 * phi / 2
	lp.mx += t.r2 / 3 * (xy - ey)
	lp.my += t.r2 / 3 * (ex - xx)
	lp.extend(ex, ey)
	lp.extend(xx, xy)
	if phi >= 2*math.Pi {
		lp.extend(-r, -r)
		lp.extend(r, r)
		return
	}
	// Cardinal points swept: the clockwise angle from E to direction q·π/2.
	th := math.Atan2(ey, ex)
	for q, c := range [4][2]float64{{r, 0}, {0, r}, {-r, 0}, {0, -r}} {
		d := th - float64(q)*math.Pi/2
		for d < 0 {
			d += 2 * math.Pi
		}
		if d <= phi {
			lp.extend(c[0], c[1])
		}
	}
}

// closeLoop ends the loop under construction.
func (t *gapTracer) closeLoop(lp *gapLoop) { lp.e1 = int32(len(t.elems)) }

// traceNoCrossings handles pieces whose rings miss the circle: rings wholly
// outside the disk are loops; the whole circle is a hole loop when the disk
// lies inside the piece.
func (t *gapTracer) traceNoCrossings() {
	wind := 0.0
	for ri := range t.ringLo {
		lo, hi := t.ringLo[ri], t.ringHi[ri]
		if !t.out[lo] && t.r > 0 {
			continue // ring wholly inside the disk
		}
		lp := t.newLoop()
		for i := lo; i < hi; i++ {
			j := t.nextPt[i]
			wind += math.Atan2(t.cr[i], t.px[i]*t.px[j]+t.py[i]*t.py[j])
			t.segment(lp, i, 0, 1)
			t.vertex(lp, i)
		}
		t.closeLoop(lp)
	}
	if t.r > 0 && math.Round(wind/(2*math.Pi)) == 1 {
		lp := t.newLoop()
		t.arc(lp, t.r, 0, 2*math.Pi, t.r, 0)
		t.closeLoop(lp)
	}
}

// traceStar handles a piece star-shaped from its site: each run from an
// exit to the next entry closes with the arc back to its exit.
func (t *gapTracer) traceStar() {
	for k := range t.xs {
		X := &t.xs[k]
		if !X.exit {
			continue
		}
		lp := t.newLoop()
		t.run(lp, int32(k), X.next)
		E := &t.xs[X.next]
		// The run subtends the angle from X counter-clockwise to E, in
		// (0, 2π); atan2 decides it except near 0 and 2π, where the exact
		// sum over the run's sub-segments does.
		phi := math.Atan2(X.x*E.y-X.y*E.x, X.x*E.x+X.y*E.y)
		switch {
		case phi > 0.5:
		case phi < -0.5:
			phi += 2 * math.Pi
		default:
			d := t.delta(int32(k), X.next)
			phi = d.hi + d.lo
		}
		if phi < 0 {
			phi = 0
		}
		t.arc(lp, E.x, E.y, phi, X.x, X.y)
		t.closeLoop(lp)
		if !(lp.area > 0) {
			lp.area = 0 // degenerate: a run of zero length
		}
	}
}

// gapDelta is the angle subtended by the ring portion between consecutive
// crossings.
type gapDelta struct {
	hi, lo  float64
	tv      float64 // total variation: sum of the absolute sub-segment angles
	through bool    // the portion passes through the site: no defined angle
}

// delta measures the ring portion from crossing a to crossing b = next(a).
func (t *gapTracer) delta(a, b int32) gapDelta {
	A, B := &t.xs[a], &t.xs[b]
	e, s := A.edge, A.t
	around := A.edge == B.edge && (b <= a || B.t < A.t)
	var hi, lo, tv float64
	through := false
	for {
		s1 := 1.0
		last := e == B.edge && !around
		if last {
			s1 = B.t
		}
		if s1 > s {
			x0, y0 := t.pt(e, s)
			x1, y1 := t.pt(e, s1)
			w, dot := (s1-s)*t.cr[e], x0*x1+y0*y1
			if w == 0 && dot <= 0 {
				through = true
			}
			a := math.Atan2(w, dot)
			hi, lo = planar.DDAdd(hi, lo, a)
			tv += math.Abs(a)
		}
		if last {
			break
		}
		e = t.nextPt[e]
		s = 0
		around = false
	}
	return gapDelta{hi: hi, lo: lo, tv: tv, through: through}
}

// gapChainAngle is the largest portion angle (radians, total variation)
// across which the angle of a crossing is carried from the previous one.
const gapChainAngle = 1e-3

// linked reports whether the next crossing's angle is carried from this
// one's.
func (d gapDelta) linked() bool { return !d.through && d.tv < gapChainAngle }

func sgn(x float64) float64 {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

// traceGeneral sorts the crossings by angle and traces the loops; it
// reports false when the crossings do not alternate (numerical trouble).
func (t *gapTracer) traceGeneral() bool {
	t.crossingAngles()
	if !t.sortCrossings() || !t.traceLoops() {
		return false
	}
	t.missedRings()
	return true
}

// crossingAngles sets the double-double angle (hi, lo) in [0, 2π) of every
// crossing.
func (t *gapTracer) crossingAngles() {
	// Angles: atan2 of each crossing, except along chains of crossings
	// that follow each other closely on a ring (portion angle below
	// gapChainAngle), where each angle is the previous one plus the exact
	// portion angle, so that their order is that of the ring.
	for k0 := 0; k0 < len(t.xs); {
		ring := t.xs[k0].ring
		k1 := k0
		for k1 < len(t.xs) && t.xs[k1].ring == ring {
			k1++
		}
		m := k1 - k0
		deltas := t.deltas[:0]
		best, bestAbs := -1, -1.0
		nLinks := 0
		for j := 0; j < m; j++ {
			d := t.delta(int32(k0+j), t.xs[k0+j].next)
			deltas = append(deltas, d)
			X := &t.xs[k0+j]
			X.hi, X.lo = math.Atan2(X.y, X.x), 0
			if d.linked() {
				nLinks++
				if d.tv > bestAbs {
					best, bestAbs = j, d.tv
				}
			}
		}
		if nLinks == m {
			deltas[best].through = true // break the cycle at its largest step
		}
		for j := 0; j < m; j++ {
			if deltas[(j+m-1)%m].linked() {
				continue // not the start of a chain
			}
			for cur := j; deltas[cur].linked(); cur = (cur + 1) % m {
				nx := (cur + 1) % m
				P, C, d := &t.xs[k0+cur], &t.xs[k0+nx], deltas[cur]
				C.hi, C.lo = planar.DDAddDD(P.hi, P.lo, d.hi, d.lo)
			}
		}
		for j := k0; j < k1; j++ {
			t.xs[j].hi, t.xs[j].lo = planar.DDReduceTwoPi(t.xs[j].hi, t.xs[j].lo)
		}
		t.deltas = deltas
		k0 = k1
	}
}

// sortCrossings sorts the crossings by angle (then by their perturbation
// key), records each one's position and each entry's predecessor, and
// reports false when entries and exits do not alternate.
func (t *gapTracer) sortCrossings() bool {
	m := len(t.xs)
	t.sorted = t.sorted[:0]
	for k := 0; k < m; k++ {
		t.sorted = append(t.sorted, int32(k))
	}
	xs := t.xs
	sort.Slice(t.sorted, func(i, j int) bool {
		a, b := &xs[t.sorted[i]], &xs[t.sorted[j]]
		if a.hi != b.hi {
			return a.hi < b.hi
		}
		if a.lo != b.lo {
			return a.lo < b.lo
		}
		if a.key2 != b.key2 {
			return a.key2 < b.key2
		}
		return t.sorted[i] < t.sorted[j]
	})
	for q := 0; q < m; q++ {
		xs[t.sorted[q]].pos = int32(q)
	}
	for q := 0; q < m; q++ {
		a := &xs[t.sorted[q]]
		b := &xs[t.sorted[(q+1)%m]]
		if a.exit == b.exit {
			return false
		}
		if !b.exit {
			b.pred = t.sorted[q]
		}
	}
	return true
}

// traceLoops traces the loops (run along the ring from an exit to the next
// entry, then the arc from that entry clockwise back to the exit before
// it), reporting false on an inconsistent structure.
func (t *gapTracer) traceLoops() bool {
	xs, m := t.xs, len(t.xs)
	// Trace loops.
	for k := range xs {
		if !xs[k].exit || xs[k].seen {
			continue
		}
		t.newLoop()
		cur := int32(k)
		for steps := 0; ; steps++ {
			if steps > m {
				return false
			}
			X := &t.xs[cur]
			X.seen = true
			ei := X.next
			t.run(&t.loops[len(t.loops)-1], cur, ei)
			E := &t.xs[ei]
			P := &t.xs[E.pred]
			phiHi, phiLo := planar.DDAddDD(E.hi, E.lo, -P.hi, -P.lo)
			phi := phiHi + phiLo
			if E.pos == 0 {
				phi += 2 * math.Pi
			}
			if phi < 0 {
				phi = 0
			}
			if phi > 2*math.Pi {
				phi = 2 * math.Pi
			}
			t.arc(&t.loops[len(t.loops)-1], E.x, E.y, phi, P.x, P.y)
			cur = E.pred
			if cur == int32(k) {
				break
			}
			if t.xs[cur].seen {
				return false
			}
		}
		t.closeLoop(&t.loops[len(t.loops)-1])
	}
	return true
}

// missedRings adds the rings that do not meet the circle and lie outside
// the disk as loops of their own.
func (t *gapTracer) missedRings() {
	// Rings that miss the circle.
	for ri := range t.ringLo {
		has := false
		for k := range t.xs {
			if t.xs[k].ring == int32(ri) {
				has = true
				break
			}
		}
		if has {
			continue
		}
		lo, hi := t.ringLo[ri], t.ringHi[ri]
		if !t.out[lo] {
			continue
		}
		lp := t.newLoop()
		for i := lo; i < hi; i++ {
			t.segment(lp, i, 0, 1)
			t.vertex(lp, i)
		}
		t.closeLoop(lp)
	}
}

// group assigns hole loops to the outer loops containing them; it reports
// false when a hole has no outer loop.
func (t *gapTracer) group() bool {
	nOuter := 0
	lastOuter := int32(-1)
	for i := range t.loops {
		if t.loops[i].area > 0 {
			nOuter++
			lastOuter = int32(i)
		}
	}
	for i := range t.loops {
		lp := &t.loops[i]
		if lp.area >= 0 {
			continue
		}
		switch nOuter {
		case 0:
			return false
		case 1:
			lp.owner = lastOuter
		default:
			qx, qy := t.loopPoint(lp)
			best, bestA := int32(-1), math.Inf(1)
			for j := range t.loops {
				o := &t.loops[j]
				if o.area <= 0 || o.area >= bestA {
					continue
				}
				if t.loopContains(o, qx, qy) {
					best, bestA = int32(j), o.area
				}
			}
			if best < 0 {
				return false
			}
			lp.owner = best
		}
	}
	return true
}

// loopPoint returns a point on loop lp away from its element ends.
func (t *gapTracer) loopPoint(lp *gapLoop) (float64, float64) {
	for e := lp.e0; e < lp.e1; e++ {
		el := &t.elems[e]
		nx, ny := t.elemEnd(lp, e)
		if el.kind != gapArc {
			return (el.x + nx) / 2, (el.y + ny) / 2
		}
		th := math.Atan2(el.y, el.x) - float64(el.phi)/2
		return t.r * math.Cos(th), t.r * math.Sin(th)
	}
	return 0, 0
}

// elemEnd returns the end point of element e of loop lp.
func (t *gapTracer) elemEnd(lp *gapLoop, e int32) (float64, float64) {
	n := e + 1
	if n == lp.e1 {
		n = lp.e0
	}
	return t.elems[n].x, t.elems[n].y
}

// loopContains reports whether (qx, qy) lies inside loop lp (crossing
// number of the rightward ray, arcs handled exactly).
func (t *gapTracer) loopContains(lp *gapLoop, qx, qy float64) bool {
	in := false
	r := t.r
	for e := lp.e0; e < lp.e1; e++ {
		el := &t.elems[e]
		nx, ny := t.elemEnd(lp, e)
		if el.kind != gapArc {
			if (el.y > qy) != (ny > qy) {
				x := el.x + (qy-el.y)*(nx-el.x)/(ny-el.y)
				if x > qx {
					in = !in
				}
			}
			continue
		}
		if math.Abs(qy) >= r {
			continue
		}
		h := math.Sqrt(r*r - qy*qy)
		th0 := math.Atan2(el.y, el.x)
		for _, x := range [2]float64{h, -h} {
			if x <= qx {
				continue
			}
			d := math.Mod(th0-math.Atan2(qy, x), 2*math.Pi)
			if d < 0 {
				d += 2 * math.Pi
			}
			if d > 0 && d < float64(el.phi) {
				in = !in
			}
		}
	}
	return in
}

// emit appends the grouped components to ch: one node per outer loop with
// its holes, elements in absolute coordinates, bisector portions.
func (t *gapTracer) emit(ch *gapChunk) {
	for i := range t.loops {
		o := &t.loops[i]
		if !(o.area > 0) {
			continue
		}
		nElem, nPort := len(ch.elems), len(ch.portions)
		nd := gapNode{
			v: t.v, loop0: int32(len(ch.loopElem)),
			minX: math.Inf(1), minY: math.Inf(1), maxX: math.Inf(-1), maxY: math.Inf(-1), deepD: -1,
		}
		nodeIdx := int32(len(ch.nodes))
		for j := range t.loops {
			lp := &t.loops[j]
			if j != i && lp.owner != int32(i) {
				continue
			}
			nd.area += lp.area
			nd.mx += lp.mx
			nd.my += lp.my
			nd.minX, nd.minY = math.Min(nd.minX, lp.minX+t.cx), math.Min(nd.minY, lp.minY+t.cy)
			nd.maxX, nd.maxY = math.Max(nd.maxX, lp.maxX+t.cx), math.Max(nd.maxY, lp.maxY+t.cy)
			if lp.deepD > nd.deepD {
				nd.deepD, nd.deepX, nd.deepY = lp.deepD, lp.deepX+t.cx, lp.deepY+t.cy
			}
			nd.touches = nd.touches || lp.touches
			t.emitLoop(ch, lp, nodeIdx)
		}
		if !(nd.area > 0) {
			// Degenerate (holes as large as the outer loop): drop it.
			ch.loopElem = ch.loopElem[:nd.loop0]
			ch.elems, ch.portions = ch.elems[:nElem], ch.portions[:nPort]
			continue
		}
		if nd.deepD < 0 {
			// No ring vertex outside the disk (cannot happen for a component
			// of positive area; keep the range meaningful anyway).
			nd.deepD, nd.deepX, nd.deepY = t.r, nd.minX, nd.minY
		}
		nd.loop1 = int32(len(ch.loopElem))
		ch.nodes = append(ch.nodes, nd)
	}
}

// emitLoop records the bisector portions of loop lp (node nodeIdx) and,
// when outlines are wanted, copies its elements to ch in absolute
// coordinates.
func (t *gapTracer) emitLoop(ch *gapChunk, lp *gapLoop, nodeIdx int32) {
	base := int32(-1)
	if t.keep {
		ch.loopElem = append(ch.loopElem, int32(len(ch.elems)))
		base = int32(len(ch.elems))
		for e := lp.e0; e < lp.e1; e++ {
			el := t.elems[e]
			el.x += t.cx
			el.y += t.cy
			ch.elems = append(ch.elems, el)
		}
	}
	n := lp.e1 - lp.e0
	for k := int32(0); k < n; k++ {
		el := &t.elems[lp.e0+k]
		if el.kind < 0 {
			continue
		}
		nx := &t.elems[lp.e0+(k+1)%n]
		key, ax, ay, ux, uy := gapBisector(t.l, t.v, el.kind)
		x0, y0 := el.x+t.cx, el.y+t.cy
		x1, y1 := nx.x+t.cx, nx.y+t.cy
		t0 := ux*(y0-ay) - uy*(x0-ax)
		t1 := ux*(y1-ay) - uy*(x1-ax)
		if t0 > t1 {
			t0, t1 = t1, t0
		}
		elem := int32(-1)
		if t.keep {
			elem = base + k
		}
		ch.portions = append(ch.portions, gapPortion{key: key, lo: t0, hi: t1, elem: elem, node: nodeIdx})
	}
}

// pieceArea returns the signed area of the current piece.
func (t *gapTracer) pieceArea() float64 {
	s := 0.0
	for _, w := range t.cr {
		s += w
	}
	return s / 2
}

// exactUncovered returns the closed-form uncovered area of the current
// piece (the coverage-curve edge sum), for the self-check.
func (t *gapTracer) exactUncovered() float64 {
	xy := make([]float64, 0, 2*len(t.px))
	th := make([]float64, len(t.px))
	rs := make([]int32, 0, len(t.ringLo)+1)
	for i := range t.px {
		xy = append(xy, t.px[i], t.py[i])
		j := t.nextPt[i]
		th[i] = math.Atan2(t.cr[i], t.px[i]*t.px[j]+t.py[i]*t.py[j])
	}
	for _, lo := range t.ringLo {
		rs = append(rs, lo)
	}
	if len(t.ringHi) > 0 {
		rs = append(rs, t.ringHi[len(t.ringHi)-1])
	}
	cov, _ := crvPieceDisk(xy, rs, th, 0, 0, t.r)
	u := t.pieceArea() - cov
	if u < 0 {
		u = 0
	}
	return u
}

// fallback replaces a piece whose tracing failed by one component with the
// closed-form area, the piece's outside vertices and its rings as outline.
func (t *gapTracer) fallback(ch *gapChunk) {
	u := t.exactUncovered()
	if !(u > 0) {
		return
	}
	t.elems, t.loops = t.elems[:0], t.loops[:0]
	var mx, my, ar float64
	lp0 := -1
	for ri := range t.ringLo {
		lp := t.newLoop()
		if lp0 < 0 {
			lp0 = len(t.loops) - 1
		}
		for i := t.ringLo[ri]; i < t.ringHi[ri]; i++ {
			t.segment(lp, i, 0, 1)
			if t.out[i] {
				t.vertex(lp, i)
			}
		}
		t.closeLoop(lp)
		mx, my, ar = mx+lp.mx, my+lp.my, ar+lp.area
		if ri > 0 {
			lp.owner = int32(lp0)
		}
	}
	for i := range t.loops {
		t.loops[i].area = 0
	}
	t.loops[lp0].area = u
	if ar > 0 {
		t.loops[lp0].mx, t.loops[lp0].my = mx*u/ar, my*u/ar
	}
	for i := 1; i < len(t.loops); i++ {
		t.loops[i].mx, t.loops[i].my = 0, 0
	}
	t.emit(ch)
}
