// Regular (weighted Delaunay) triangulation of weighted points.
//
// Each input point p_i carries a weight w_i (for a device, the square of
// its range). The power of x with respect to i is |x − p_i|² − w_i; the
// power diagram (Aurenhammer, SIAM J. Comput. 16, 1987) gives each point
// the region where its power is smallest, and its dual is the regular
// triangulation: the projection of the lower convex hull of the lifted
// points (x, y, x² + y² − w). A point whose power cell is empty (its lift
// lies above that hull) is hidden: it is not a vertex. With equal weights
// the regular triangulation is the Delaunay triangulation.
//
// Construction (Edelsbrunner & Shah, "Incremental topological flipping
// works for regular triangulations", Algorithmica 15, 1996): points are
// inserted in the biased randomized Hilbert order of Triangulate
// (delaunay_insert.go). The hull is closed by one symbolic infinite vertex,
// so every edge has two triangles. A point is located by a stochastic
// visibility walk (Devillers, Pion & Teillaud, "Walking in a
// triangulation", IJFCS 13, 2002; the plain walk can cycle in a
// non-Delaunay triangulation). A point whose lift is above the plane of the
// triangle holding it is hidden and rejected. Otherwise it splits that
// triangle (1→3; 2→4 on an edge) and each edge of its link is tested: when
// not locally regular it is flipped 2→2 if the quadrilateral is convex,
// or the reflex vertex is removed (3→1) when it has three neighbours, or,
// collinear with the new point, four (4→2: the degenerate case, as in
// CGAL's Regular_triangulation_2); otherwise the edge is left, which
// Edelsbrunner & Shah prove is safe. Edges of the infinite vertex flip 2→2
// when the new point sees the hull edge behind them (the sweep-hull step)
// and 4→2 when a hull vertex lies between the new point and its hull
// neighbour and is hidden.
//
// From parallelMin points on, the last four rounds are inserted by two
// workers on the two sides of the median abscissa, each by Bowyer–Watson
// in the triangles it owns (regular_parallel.go); the points they leave
// are inserted as above. The result does not depend on the number of
// CPUs.
//
// Every decision is an exact predicate (Orient2D; PowerTest with the
// symbolic perturbation of power_predicates.go), so the result is the
// unique regular triangulation of the perturbed weights for every finite
// input, whatever the insertion order.
//
// Equal weights. The regular triangulation is then the Delaunay
// triangulation, and TriangulateRegular returns Triangulate's (the same
// arrays, the same choice among cocircular configurations, the same
// speed); the construction here is used for unequal weights, and on equal
// weights gives a Delaunay triangulation with the same Voronoi diagram
// that may choose other triangles among cocircular points (tested).
//
// Degenerate input. Points at the same position: the one with the larger
// weight is kept, on equal weights the first; the others are hidden (a
// point equal to a vertex with a smaller weight restarts the construction
// with those duplicates removed first). When all points lie on one line
// there is no triangle; the kept points are the lower hull of the lifts
// along the line and Hull lists them in order.

package planar

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"unsafe"

	"github.com/paulmach/orb"
)

// RegularTriangulation is the regular (weighted Delaunay) triangulation of
// weighted points in the flat layout of Triangulation. Vertices are the
// inputs that are not hidden, numbered in increasing input order; Vertex
// maps a hidden input to -1.
type RegularTriangulation struct {
	Triangulation
	// Weights holds the weight of each vertex.
	Weights []float64
	// Hidden lists, in increasing order, the inputs whose power cell is
	// empty: every point of the plane has a smaller power with respect to
	// some other input (or, for a duplicate position, the input kept
	// there). They are not vertices.
	Hidden []int32
}

// TriangulateRegular returns the regular triangulation of pts with the
// given weights (one per point, any finite value; the square of a range
// for disks). With all weights equal it is Triangulate's result, array for
// array (the same choice among cocircular configurations), with the
// duplicates after the first of each position hidden. Otherwise the
// choice among degenerate configurations is fixed by a symbolic
// perturbation (see power_predicates.go), independent of the input order.
func TriangulateRegular(pts []orb.Point, weights []float64) (*RegularTriangulation, error) {
	n := len(pts)
	if len(weights) != n {
		return nil, fmt.Errorf("planar: TriangulateRegular: %d points but %d weights", n, len(weights))
	}
	if int64(n) > math.MaxInt32/3 {
		return nil, fmt.Errorf("planar: TriangulateRegular: %d points is more than the supported %d", n, math.MaxInt32/3)
	}
	for i, p := range pts {
		if math.IsNaN(p[0]) || math.IsInf(p[0], 0) || math.IsNaN(p[1]) || math.IsInf(p[1], 0) {
			return nil, fmt.Errorf("planar: TriangulateRegular: point %d: coordinates (%g, %g) not finite", i, p[0], p[1])
		}
		if w := weights[i]; math.IsNaN(w) || math.IsInf(w, 0) {
			return nil, fmt.Errorf("planar: TriangulateRegular: point %d: weight %g not finite", i, w)
		}
	}
	equal := true
	for _, w := range weights {
		equal = equal && w == weights[0]
	}
	if equal {
		d, err := Triangulate(pts)
		if err != nil {
			return nil, err
		}
		return fromDelaunay(d, weights), nil
	}
	return triangulateRegular(pts, weights)
}

// fromDelaunay wraps Triangulate's result for equal weights: each input
// that is not the first of its position is hidden.
func fromDelaunay(d *Triangulation, weights []float64) *RegularTriangulation {
	r := &RegularTriangulation{Triangulation: *d, Weights: make([]float64, len(d.Source)), Hidden: []int32{}}
	for v, i := range d.Source {
		r.Weights[v] = weights[i]
	}
	for i, v := range r.Vertex {
		if d.Source[v] != int32(i) {
			r.Vertex[i] = -1
			r.Hidden = append(r.Hidden, int32(i))
		}
	}
	return r
}

// triangulateRegular is TriangulateRegular on validated input, always by
// the weighted construction.
func triangulateRegular(pts []orb.Point, weights []float64) (*RegularTriangulation, error) {
	return triangulateRegularSplit(pts, weights, len(pts) >= parallelMin)
}

// triangulateRegularSplit is triangulateRegular with the two-worker
// insertion of the last rounds (regular_parallel.go) on or off; both give
// the same vertices, hidden points and triangles (tested), numbered
// differently.
func triangulateRegularSplit(pts []orb.Point, weights []float64, split bool) (*RegularTriangulation, error) {
	n := len(pts)
	if n == 0 {
		return &RegularTriangulation{Triangulation: Triangulation{
			Coords: []float64{}, Vertex: []int32{}, Source: []int32{},
			Triangles: []int32{}, Halfedges: []int32{}, Hull: []int32{}, Inedge: []int32{},
		}, Weights: []float64{}, Hidden: []int32{}}, nil
	}
	box := boundingBox(pts)
	i0, i1, i2 := seedTriangle(pts, box)
	if i2 < 0 {
		return regularCollinear(pts, weights), nil
	}
	if r := regularIncremental(pts, weights, box, i0, i1, i2, split); r != nil {
		return r, nil
	}
	// A duplicate position with a larger weight met a vertex: drop the
	// losing duplicates and build again.
	keep := dedupeWeighted(pts, weights)
	sub := make([]orb.Point, len(keep))
	subW := make([]float64, len(keep))
	for k, i := range keep {
		sub[k], subW[k] = pts[i], weights[i]
	}
	i0, i1, i2 = seedTriangle(sub, box)
	r := regularIncremental(sub, subW, box, i0, i1, i2, split)
	if r == nil {
		return nil, fmt.Errorf("planar: TriangulateRegular: internal error: duplicate after deduplication")
	}
	return r.expand(keep, n), nil
}

// dedupeWeighted returns, in increasing order, the inputs kept at each
// position: the largest weight, on ties the smallest index.
func dedupeWeighted(pts []orb.Point, w []float64) []int32 {
	idx := make([]int32, len(pts))
	for i := range idx {
		idx[i] = int32(i)
	}
	xy := flatPoints(pts)
	slices.SortFunc(idx, func(a, b int32) int {
		if c := cmpLex(xy, a, b); c != 0 {
			return c
		}
		if c := cmp.Compare(w[b], w[a]); c != 0 {
			return c // larger weight first
		}
		return int(a) - int(b)
	})
	keep := idx[:0:0]
	for k, i := range idx {
		if k == 0 || pts[idx[k-1]] != pts[i] {
			keep = append(keep, i)
		}
	}
	slices.Sort(keep)
	return keep
}

// flatPoints views points as interleaved coordinates (orb.Point is
// [2]float64, so the memory is the same).
func flatPoints(pts []orb.Point) []float64 {
	if len(pts) == 0 {
		return nil
	}
	return unsafe.Slice(&pts[0][0], 2*len(pts))
}

// expand maps a triangulation of the kept inputs pts[keep[k]] back to the
// n inputs: the others are hidden. Vertex numbering is unchanged (keep is
// increasing).
func (r *RegularTriangulation) expand(keep []int32, n int) *RegularTriangulation {
	vertex := make([]int32, n)
	for i := range vertex {
		vertex[i] = -1
	}
	for k, v := range r.Vertex {
		vertex[keep[k]] = v
	}
	for v, k := range r.Source {
		r.Source[v] = keep[k]
	}
	hidden := make([]int32, 0, n-len(r.Source))
	for i, v := range vertex {
		if v < 0 {
			hidden = append(hidden, int32(i))
		}
	}
	r.Vertex, r.Hidden = vertex, hidden
	return r
}

// regularCollinear handles inputs whose distinct points lie on one line
// (or are fewer than three): the kept points are the lower hull of the
// lifts along the line, in lexicographic order, which is the order along
// the line.
func regularCollinear(pts []orb.Point, w []float64) *RegularTriangulation {
	keep := dedupeWeighted(pts, w)
	order := slices.Clone(keep)
	xy := flatPoints(pts)
	slices.SortFunc(order, func(a, b int32) int { return cmpLex(xy, a, b) })
	at := func(i int32) wPt { return wPt{pts[i][0], pts[i][1], w[i]} }
	stack := make([]int32, 0, len(order))
	for _, q := range order {
		// The top is hidden when its lift is not below the line through
		// its neighbours' lifts (ties: the middle point stays, as in
		// below1D).
		for len(stack) >= 2 && !below1D(at(stack[len(stack)-2]), at(q), at(stack[len(stack)-1])) {
			stack = stack[:len(stack)-1]
		}
		stack = append(stack, q)
	}
	n := len(pts)
	kept := make([]bool, n)
	for _, i := range stack {
		kept[i] = true
	}
	r := &RegularTriangulation{
		Triangulation: Triangulation{
			Vertex: make([]int32, n), Triangles: []int32{}, Halfedges: []int32{},
			Hull: make([]int32, 0, len(stack)),
		},
		Hidden: []int32{},
	}
	for i := range pts {
		r.Vertex[i] = -1
		if !kept[i] {
			r.Hidden = append(r.Hidden, int32(i))
			continue
		}
		r.Vertex[i] = int32(len(r.Source))
		r.Source = append(r.Source, int32(i))
		r.Coords = append(r.Coords, pts[i][0], pts[i][1])
		r.Weights = append(r.Weights, w[i])
		r.Inedge = append(r.Inedge, -1)
	}
	for _, i := range stack {
		r.Hull = append(r.Hull, r.Vertex[i])
	}
	return r
}

// rbuilder is the working state of one regular triangulation. Vertex
// numbers inside it are internal ids (positions in the insertion order);
// inf is the infinite vertex. Triangles freed by removals are reused.
type rbuilder struct {
	ps      []wPt
	tri     []int32 // three ids per triangle; -1 for a free slot
	half    []int32
	nt      int32   // half-edge slots in use
	free    []int32 // first half-edges of free slots
	hidden  []bool  // per internal id
	order   []int32 // input index of each internal id
	inf     int32
	last    int32 // a half-edge of a live finite triangle (walk start)
	stack   []int32
	rng     uint64
	restart bool // a duplicate position with a larger weight met a vertex
	// Half-edges [gapLo, gapHi) are unused slots never written (left by
	// the workers of regular_parallel.go); finish skips them.
	gapLo, gapHi int32
}

// regularIncremental builds the regular triangulation from the
// counter-clockwise seed triangle i0, i1, i2 (distinct, not collinear),
// with the last rounds split between two workers when split is set. It
// returns nil when a duplicate position must replace a vertex.
func regularIncremental(pts []orb.Point, w []float64, box bbox, i0, i1, i2 int32, split bool) *RegularTriangulation {
	n := len(pts)
	x0 := 0.0
	if split {
		x0 = medianX(pts, box)
	}
	work := make([]uint64, 2*n)
	keys, buf := work[:n:n], work[n:]
	brioKeys(pts, box, keys, split, x0)
	sorted := radixSortHigh(keys, buf)
	refineCells(pts, box, sorted)
	// Phase boundaries: sequential rounds, then each side's last rounds.
	n1, nl := n, 0
	if split {
		n1 = sortIndex(sorted, 1<<63)
		nl = sortIndex(sorted, 1<<63|1<<62) - n1
	}
	// The sort buffers are reused: the insertion order in the first
	// quarter (keys are spent once sorted), the triangle renumbering of
	// finish after it.
	w32 := asInt32(work)
	order := w32[0:n:n]
	b := &rbuilder{
		ps:     make([]wPt, n+1),
		hidden: make([]bool, n+1),
		inf:    int32(n),
		order:  order,
		stack:  make([]int32, 0, 64),
		rng:    0x9e3779b97f4a7c15,
	}
	// Internal ids of the seed points (each written once).
	var seedID [3]int32
	ParallelFor(n, 1<<15, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			i := int32(uint32(sorted[k]))
			order[k] = i
			b.ps[k] = wPt{pts[i][0], pts[i][1], w[i]}
			if i == i0 || i == i1 || i == i2 {
				for j, s := range [3]int32{i0, i1, i2} {
					if i == s {
						seedID[j] = int32(k)
					}
				}
			}
		}
	})
	s0, s1, s2 := seedID[0], seedID[1], seedID[2]
	isSeed := func(k int32) bool { return k == s0 || k == s1 || k == s2 }
	maxT := 2*n + 2
	b.tri = make([]int32, 0, 3*maxT)
	b.half = make([]int32, 0, 3*maxT)
	b.seed(s0, s1, s2)
	for k := int32(0); k < int32(n1); k++ {
		if isSeed(k) {
			continue
		}
		b.insert(k)
		if b.restart {
			return nil
		}
	}
	if split {
		for _, k := range b.insertSplit(int32(n1), int32(n1+nl), int32(n), box, x0, isSeed) {
			b.insert(k)
			if b.restart {
				return nil
			}
		}
	}
	return b.finish(pts, order, w32[n:])
}

// seed makes the first triangle and its three infinite neighbours.
func (b *rbuilder) seed(v0, v1, v2 int32) {
	inf := b.inf
	t := b.alloc()
	u0 := b.alloc()
	u1 := b.alloc()
	u2 := b.alloc()
	b.set(t, v0, v1, v2)
	b.set(u0, v1, v0, inf) // hull edge v0→v1
	b.set(u1, v2, v1, inf)
	b.set(u2, v0, v2, inf)
	b.link(t, u0)
	b.link(t+1, u1)
	b.link(t+2, u2)
	b.link(u0+1, u2+2) // v0→inf with inf→v0
	b.link(u1+1, u0+2)
	b.link(u2+1, u1+2)
	b.last = t
}

// alloc returns the first half-edge of a free triangle slot.
func (b *rbuilder) alloc() int32 {
	if k := len(b.free); k > 0 {
		t := b.free[k-1]
		b.free = b.free[:k-1]
		return t
	}
	t := b.nt
	b.tri = append(b.tri, -1, -1, -1)
	b.half = append(b.half, -1, -1, -1)
	b.nt += 3
	return t
}

func (b *rbuilder) release(t int32) {
	b.tri[t], b.tri[t+1], b.tri[t+2] = -1, -1, -1
	b.free = append(b.free, t)
}

func (b *rbuilder) set(t, v0, v1, v2 int32) {
	b.tri[t], b.tri[t+1], b.tri[t+2] = v0, v1, v2
}

// link makes half-edges e and h twins.
func (b *rbuilder) link(e, h int32) {
	b.half[e] = h
	b.half[h] = e
}

func (b *rbuilder) isInfinite(t int32) bool {
	return b.tri[t] == b.inf || b.tri[t+1] == b.inf || b.tri[t+2] == b.inf
}

// Location kinds of locate.
const (
	locFace = iota
	locEdge
	locVertex
	locOutside
)

// locate finds (x, y) by a stochastic visibility walk from b.last. It
// returns a half-edge and the kind: locFace (its triangle holds the point
// inside), locEdge (the point is inside that edge), locVertex (the point is
// the edge's start vertex) or locOutside (a hull edge with the point
// strictly on its outer side).
func (b *rbuilder) locate(x, y float64) (int32, int) {
	tri, half, ps := b.tri, b.half, b.ps
	t := triStart(b.last)
	came := int32(-1)
	for {
		b.rng ^= b.rng << 13
		b.rng ^= b.rng >> 7
		b.rng ^= b.rng << 17
		r := int32(b.rng % 3)
		moved := false
		for k := int32(0); k < 3; k++ {
			e := t + (r+k)%3
			if e == came {
				continue
			}
			a, c := ps[tri[e]], ps[tri[nextHE(e)]]
			if orientSign(xyPt{a.x, a.y}, xyPt{c.x, c.y}, x, y) < 0 {
				h := half[e]
				if b.isInfinite(triStart(h)) {
					return e, locOutside
				}
				came, t, moved = h, triStart(h), true
				break
			}
		}
		if !moved {
			break
		}
	}
	var zero [3]bool
	nz := 0
	for k := int32(0); k < 3; k++ {
		a, c := ps[tri[t+k]], ps[tri[t+(k+1)%3]]
		if orientSign(xyPt{a.x, a.y}, xyPt{c.x, c.y}, x, y) == 0 {
			zero[k] = true
			nz++
		}
	}
	switch nz {
	case 0:
		return t, locFace
	case 1:
		for k := int32(0); k < 3; k++ {
			if zero[k] {
				return t + k, locEdge
			}
		}
	}
	// On two edge lines: the vertex they share.
	for k := int32(0); k < 3; k++ {
		if zero[k] && zero[(k+2)%3] {
			return t + k, locVertex
		}
	}
	return t, locVertex
}

// insert adds internal point i, or marks it hidden.
func (b *rbuilder) insert(i int32) {
	p := b.ps[i]
	e, kind := b.locate(p.x, p.y)
	tri := b.tri
	switch kind {
	case locVertex:
		v := tri[e]
		q := b.ps[v]
		if p.w > q.w || (p.w == q.w && b.order[i] < b.order[v]) {
			b.restart = true // never for inputs without such duplicates
			return
		}
		b.hidden[i] = true
		return
	case locFace, locEdge:
		t := triStart(e)
		if !powerConflict(b.ps[tri[t]], b.ps[tri[t+1]], b.ps[tri[t+2]], p) {
			b.hidden[i] = true
			b.last = t
			return
		}
		if kind == locFace {
			b.split3(i, t)
		} else {
			b.splitEdge(i, e)
		}
	case locOutside:
		b.split3(i, triStart(b.half[e]))
	}
	b.flips(i)
}

// split3 splits triangle t (first half-edge) at i and stacks the three
// edges opposite i.
func (b *rbuilder) split3(i, t int32) {
	v0, v1, v2 := b.tri[t], b.tri[t+1], b.tri[t+2]
	h1, h2 := b.half[t+1], b.half[t+2]
	t1 := b.alloc()
	t2 := b.alloc()
	b.tri[t+2] = i // [v0, v1, i]
	b.set(t1, v1, v2, i)
	b.set(t2, v2, v0, i)
	b.link(t1, h1)
	b.link(t2, h2)
	b.link(t+1, t1+2)
	b.link(t1+1, t2+2)
	b.link(t2+1, t+2)
	b.stack = append(b.stack, t, t1, t2)
	b.last = t
}

// splitEdge splits half-edge e (a→b, in [a, b, c]) and its twin (in
// [b, a, d]) at i into four triangles and stacks the edges opposite i.
func (b *rbuilder) splitEdge(i, e int32) {
	tri, half := b.tri, b.half
	en, ep := nextHE(e), prevHE(e)
	h := half[e]
	hn, hp := nextHE(h), prevHE(h)
	va, vb, vc, vd := tri[e], tri[en], tri[ep], tri[hp]
	hca, hdb := half[ep], half[hp]
	// [a, b, c] becomes [i, b, c], [b, a, d] becomes [i, a, d]; new
	// [a, i, c] and [b, i, d].
	tri[e], tri[h] = i, i
	t1 := b.alloc()
	t2 := b.alloc()
	b.set(t1, va, i, vc)
	b.set(t2, vb, i, vd)
	b.link(t1, h)
	b.link(t1+1, ep)
	b.link(t1+2, hca)
	b.link(t2, e)
	b.link(t2+1, hp)
	b.link(t2+2, hdb)
	b.stack = append(b.stack, en, hn, t1+2, t2+2)
	b.last = triStart(e)
}

// degree returns the number of edges at the start vertex of half-edge e,
// counting at most to limit.
func (b *rbuilder) degree(e int32, limit int) int {
	d := 0
	h := e
	for {
		d++
		h = b.half[prevHE(h)]
		if h == e || d >= limit {
			return d
		}
	}
}

// flips restores regularity around the new vertex i by processing the
// stacked link edges (Edelsbrunner & Shah's flip algorithm; see the file
// comment for the cases).
func (b *rbuilder) flips(i int32) {
	tri, half, inf := b.tri, b.half, b.inf
	pi := b.ps[i]
	for len(b.stack) > 0 {
		e := b.stack[len(b.stack)-1]
		b.stack = b.stack[:len(b.stack)-1]
		pe := prevHE(e)
		if tri[pe] != i {
			continue // stale: the triangle changed
		}
		x, y := tri[e], tri[nextHE(e)]
		h := half[e]
		c := tri[prevHE(h)]
		if x == inf || y == inf {
			// The triangle across is infinite, with hull edge u→v.
			// je: the finite vertex's half-edge towards i.
			u, v, je := c, y, nextHE(e)
			if y == inf {
				u, v, je = x, c, half[pe]
			}
			if !conflictInfinite(b.ps[u], b.ps[v], pi) {
				continue
			}
			if orientSgn(b.ps[u], b.ps[v], pi) > 0 {
				b.flip22(e)
			} else if b.degree(je, 5) == 4 {
				b.remove(je)
			}
			continue
		}
		if c == inf || !powerConflict(pi, b.ps[x], b.ps[y], b.ps[c]) {
			continue
		}
		occw := orientSgn(pi, b.ps[x], b.ps[c])
		ocw := orientSgn(pi, b.ps[y], b.ps[c])
		xo, yo := half[pe], nextHE(e) // x→i and y→i
		switch {
		case occw > 0 && ocw < 0:
			b.flip22(e)
		case occw < 0 && b.degree(xo, 4) == 3:
			b.remove(xo)
		case ocw > 0 && b.degree(yo, 4) == 3:
			b.remove(yo)
		case occw == 0 && b.degree(xo, 5) == 4:
			b.remove(xo)
		case ocw == 0 && b.degree(yo, 5) == 4:
			b.remove(yo)
		}
	}
	// A finite triangle of i for the next walk (every step above left
	// b.last in i's star).
	e := b.last
	for tri[e] != i {
		e = nextHE(e)
	}
	for b.isInfinite(triStart(e)) {
		e = half[prevHE(e)]
	}
	b.last = e
}

// flip22 flips half-edge e (x→y in [p, x, y]) with its twin (in
// [y, x, c]) into [p, c, y] and [p, x, c], and stacks the two new edges
// opposite p.
func (b *rbuilder) flip22(a int32) {
	tri, half := b.tri, b.half
	bb := half[a]
	ar := prevHE(a)
	br, bl := nextHE(bb), prevHE(bb)
	p0, p1 := tri[ar], tri[bl]
	tri[a] = p1
	tri[bb] = p0
	hbl, har := half[bl], half[ar]
	b.link(a, hbl)
	b.link(bb, har)
	b.link(ar, bl)
	b.stack = append(b.stack, a, br)
	b.last = a
}

// remove deletes the start vertex x of half-edge o (x→p), which has
// degree 3, or 4 and lies between p and its opposite neighbour. The star
// of x becomes a fan from p; the new edges opposite p are stacked.
func (b *rbuilder) remove(o int32) {
	tri, half := b.tri, b.half
	x := tri[o]
	// Outgoing half-edges of x counter-clockwise, starting with x→p.
	var out [4]int32
	d := 0
	for h := o; ; {
		out[d] = h
		d++
		h = half[prevHE(h)]
		if h == o {
			break
		}
	}
	// Link vertices l_k = end of out[k]; outer half-edges l_k→l_{k+1}.
	var l, outer [4]int32
	for k := 0; k < d; k++ {
		l[k] = tri[nextHE(out[k])]
		outer[k] = half[nextHE(out[k])]
	}
	t0 := triStart(out[0])
	b.set(t0, l[0], l[1], l[2])
	b.link(t0, outer[0])
	b.link(t0+1, outer[1])
	if d == 3 {
		b.link(t0+2, outer[2])
		b.release(triStart(out[1]))
		b.release(triStart(out[2]))
		b.stack = append(b.stack, t0+1)
	} else {
		t1 := triStart(out[1])
		b.set(t1, l[0], l[2], l[3])
		b.link(t0+2, t1)
		b.link(t1+1, outer[2])
		b.link(t1+2, outer[3])
		b.release(triStart(out[2]))
		b.release(triStart(out[3]))
		b.stack = append(b.stack, t0+1, t1+1)
	}
	b.hidden[x] = true
	b.last = t0
}

// numberVertices numbers the vertices (the inputs not hidden) in input
// order into vertex (-1 for hidden inputs), fills Vertex, Source, Coords,
// Weights and Hidden of r, replaces order (input index of each internal
// id) by the vertex number of each internal id, and returns the number of
// vertices. The passes run in contiguous chunks under ParallelFor; the
// hidden input i is entry i − (vertices before i) of Hidden.
func (b *rbuilder) numberVertices(r *RegularTriangulation, pts []orb.Point, order, vertex []int32) int32 {
	n := len(order)
	const grain = 1 << 15
	ParallelFor(n, grain, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			vertex[order[k]] = -1
			if !b.hidden[k] {
				vertex[order[k]] = 0
			}
		}
	})
	parts := max(1, min(16, n/grain))
	base := make([]int32, parts+1)
	ParallelFor(parts, 1, func(lo, hi int) {
		for c := lo; c < hi; c++ {
			cnt := int32(0)
			for _, v := range vertex[n*c/parts : n*(c+1)/parts] {
				if v >= 0 {
					cnt++
				}
			}
			base[c+1] = cnt
		}
	})
	for c := 0; c < parts; c++ {
		base[c+1] += base[c]
	}
	m := base[parts]
	r.Vertex = vertex
	r.Hidden = make([]int32, n-int(m))
	r.Source = make([]int32, m)
	r.Coords = make([]float64, 2*m)
	r.Weights = make([]float64, m)
	ParallelFor(parts, 1, func(lo, hi int) {
		for c := lo; c < hi; c++ {
			v := base[c]
			for i := n * c / parts; i < n*(c+1)/parts; i++ {
				if vertex[i] < 0 {
					r.Hidden[int32(i)-v] = int32(i)
					continue
				}
				vertex[i] = v
				r.Source[v] = int32(i)
				r.Coords[2*v], r.Coords[2*v+1] = pts[i][0], pts[i][1]
				v++
			}
		}
	})
	ParallelFor(n, grain, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			v := vertex[order[k]]
			order[k] = v
			if v >= 0 {
				r.Weights[v] = b.ps[k].w
			}
		}
	})
	return m
}

// finish converts the internal state to a RegularTriangulation: finite
// live triangles compacted, vertices numbered in input order.
func (b *rbuilder) finish(pts []orb.Point, order, scratch []int32) *RegularTriangulation {
	n := len(order)
	inf := b.inf
	r := &RegularTriangulation{}
	vertex := make([]int32, n)
	perm := order
	var m int32
	// The vertex arrays and the triangle renumbering are independent: two
	// goroutines when two CPUs are available.
	tri, half := b.tri[:b.nt], b.half[:b.nt]
	newIdx := scratch[:b.nt/3]
	nf := int32(0)
	start := int32(-1)
	runPair(func() {
		m = b.numberVertices(r, pts, order, vertex)
	}, func() {
		// Output index of each live finite triangle (at most 2n + 2
		// slots, in the 3n free entries of scratch).
		for t := int32(0); t < b.nt; t += 3 {
			newIdx[t/3] = -1
			if t == b.gapLo && b.gapHi > t {
				for g := t; g < b.gapHi; g += 3 {
					newIdx[g/3] = -1
				}
				t = b.gapHi - 3
				continue
			}
			switch {
			case tri[t] < 0:
			case b.isInfinite(t):
				start = t
			default:
				newIdx[t/3] = nf
				nf++
			}
		}
	})
	// Hull: the infinite triangle [v, u, inf] holds the twin of hull edge
	// u→v; from it, the infinite triangle across u→inf holds the hull edge
	// before. That walk lists the hull clockwise.
	var hull []int32
	e := start
	for tri[prevHE(e)] != inf {
		e = nextHE(e)
	}
	for first := e; ; {
		hull = append(hull, perm[tri[e]])
		e = nextHE(half[nextHE(e)])
		if e == first {
			break
		}
	}
	slices.Reverse(hull)
	// Renumber each live finite triangle in its slot (vertex numbers,
	// output half-edges; each slot is read and written only by its own
	// chunk), then close the dead slots up: the output index of a triangle
	// is at most its slot index, so each run of consecutive output indices
	// moves down onto entries already moved.
	ParallelFor(len(newIdx), 1<<14, func(lo, hi int) {
		for t := 3 * int32(lo); t < 3*int32(hi); t += 3 {
			if newIdx[t/3] < 0 {
				continue
			}
			for k := t; k < t+3; k++ {
				h := half[k]
				tri[k] = perm[tri[k]]
				half[k] = -1
				if ht := newIdx[h/3]; ht >= 0 {
					half[k] = 3*ht + h%3
				}
			}
		}
	})
	for s := int32(0); s < int32(len(newIdx)); {
		d := newIdx[s]
		if d < 0 {
			s++
			continue
		}
		e := s + 1
		for e < int32(len(newIdx)) && newIdx[e] == d+(e-s) {
			e++
		}
		if d != s {
			copy(tri[3*d:3*(d+e-s)], tri[3*s:3*e])
			copy(half[3*d:3*(d+e-s)], half[3*s:3*e])
		}
		s = e
	}
	out, outH := tri[:3*nf:3*nf], half[:3*nf:3*nf]
	// Inedge: a half-edge ending at each vertex, the hull one for hull
	// vertices.
	inedge := make([]int32, m)
	for e := int32(0); e < 3*nf; e++ {
		inedge[out[nextHE(e)]] = e
	}
	for e := int32(0); e < 3*nf; e++ {
		if outH[e] < 0 {
			inedge[out[nextHE(e)]] = e
		}
	}
	r.Triangles, r.Halfedges, r.Hull, r.Inedge = out, outH, hull, inedge
	return r
}
