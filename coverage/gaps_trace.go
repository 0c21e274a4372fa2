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
	"slices"
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

// reset empties c, keeping its buffers.
func (c *gapChunk) reset() {
	c.nodes, c.loopElem, c.elems, c.portions, c.anomalies = c.nodes[:0], c.loopElem[:0], c.elems[:0], c.portions[:0], 0
}

// clone returns a copy of c in exact-size slices (nil when empty).
func (c *gapChunk) clone() gapChunk {
	return gapChunk{nodes: slices.Clone(c.nodes), loopElem: slices.Clone(c.loopElem),
		elems: slices.Clone(c.elems), portions: slices.Clone(c.portions), anomalies: c.anomalies}
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

	chunk gapChunk // the current chunk's components (buffers reused)
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
