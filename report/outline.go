// Written outlines stay valid polygons after rounding.
//
// Output coordinates are rounded (scene.point: 7 decimals of a degree,
// 1 mm in the plane). Rounding moves each vertex by up to half a rounding
// cell, so edges closer than that may come to touch or cross: a hole
// 0.4 mm from its polygon's boundary (an exclusion zone drawn almost on
// the site's edge), a 1 µm neck of the area, two parts of a service area
// or gap almost meeting. GEOS (and GIS with it) then calls the polygon
// invalid ("Self-intersection").
//
// The rule: every polygon feature is checked after rounding (outlineValid,
// exact predicates on the rounded coordinates). A ring that passes through
// one point twice (a pinch: two vertices the plane keeps apart, as opened
// pinches are, rounded or converted to one position) is split there into
// its loops, each then a ring of its own (splitPinches), which GEOS
// accepts: rings of a polygon may touch at a point. If the feature is
// still invalid, it is written with 2 more decimals, then 4 more, then
// unrounded (shortest round-trip doubles), whichever first passes. The
// outline computed in the plane is valid, and its unrounded conversion
// keeps that to within float64 spacing (1e-13° or 1e-9 m at the site's
// coordinates), so only features with contacts closer than that could
// still fail; such a feature is written unrounded as computed. Only the
// features that need it get the extra digits.
//
// outlineValid accepts a multipolygon (rings closed, as written) when
//   - within a ring, consecutive edges meet only at their common vertex
//     (no spike folding back along an edge) and other edges do not meet;
//   - edges of different rings meet only at a vertex both have, without
//     overlapping along a line.
//
// These are the contacts GEOS's IsValid refuses (Ring Self-intersection,
// Self-intersection) that rounding can create; rounding by less than the
// distance between two rings cannot move a hole out of its polygon or a
// part into another without such a contact on the way. A vertex of one
// ring on an edge of another (valid in GEOS) is refused too: that feature
// then keeps more digits, which is never wrong.
//
// Gap outlines and covered parts go through conservativeInto, which moves
// them by the rounding reach first (outline_grow.go) and moves them by a
// finer reach at each finer level.

package report

import (
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// finerDigits is how many decimals each refinement step adds to a feature
// that rounding made invalid; maxExtraDigits is the last step before
// unrounded output.
const (
	finerDigits    = 2
	maxExtraDigits = 4
)

// checkRounding returns out, the rounded conversion of in, when it is a
// valid outline, else the conversion of in with more decimals (see the
// file comment).
func (s *scene) checkRounding(in, out orb.MultiPolygon) orb.MultiPolygon {
	if mp, ok := s.validRounded(in, out); ok {
		return mp
	}
	return s.finer().multiPolygon(in)
}

// validRounded returns out (the conversion of in), or out split at its
// pinches, when that is a valid outline; false otherwise. An unrounded
// scene has nothing finer to try: it returns the conversion of in
// without its thin folds (dropFolds) when that is valid, else the union
// of the converted polygons (planar.Union) when that is valid, else out.
func (s *scene) validRounded(in, out orb.MultiPolygon) (orb.MultiPolygon, bool) {
	if mp, ok := validOrSplit(out); ok {
		return mp, true
	}
	if !s.unrounded {
		return out, false
	}
	if folded, ok := dropFolds(in, foldWidth); ok {
		var b polyBuf
		out = s.roundInto(&b, folded)
		if mp, ok := validOrSplit(out); ok {
			return mp, true
		}
	}
	if folded, ok := dropFolds(out, foldWidth*s.outUnitsPerMetre()); ok {
		if mp, ok := validOrSplit(folded); ok {
			return mp, true
		}
		out = folded
	}
	// The last resort: the union of the converted polygons, taken as
	// plane figures in the output coordinates (planar.Union, exact:
	// edges that conversion made coincide are merged, a hole that came to
	// share an edge with its exterior becomes a notch of it, pinch points
	// are opened by a few ulps), first as converted, then snapped to a
	// grid of snapWidth (a pinch point the plane opened by a few ulps can
	// come out of the conversion as two vertices an ulp apart whose edges
	// cross; snapped, they are one point again).
	for _, g := range []float64{0, snapWidth * s.outUnitsPerMetre()} {
		src := out
		if g > 0 {
			src = snapOutline(out, g)
			if mp, ok := validOrSplit(src); ok {
				return mp, true
			}
		}
		if u, err := planar.Union(src); err == nil {
			if mp, ok := validOrSplit(u); ok {
				return mp, true
			}
		}
	}
	return out, true
}

// validOrSplit returns mp, or mp split at its pinches, when that is a
// valid outline.
func validOrSplit(mp orb.MultiPolygon) (orb.MultiPolygon, bool) {
	if outlineValid(mp) {
		return mp, true
	}
	if split, ok := splitPinches(mp); ok && outlineValid(split) {
		return split, true
	}
	return mp, false
}

// conservativeInto converts the outline in (local plane) as
// multiPolygonInto does, moved first by the rounding reach so that the
// written polygon keeps its promise (outline_grow.go): grow > 0 for a
// gap outline (it contains its gap), grow < 0 for a covered part (it lies
// in the disks). A feature whose moved outline cannot be formed, or is
// not valid once rounded (after splitting pinches), is tried with
// finerDigits more decimals and a reach as much smaller, and at last
// unrounded and unmoved.
func (s *scene) conservativeInto(b *polyBuf, in orb.MultiPolygon, grow float64) orb.MultiPolygon {
	for sc := s; ; sc = sc.finer() {
		d := sc.roundingReach()
		if d == 0 { // unrounded: unmoved
			if mp, ok := sc.validRounded(in, sc.roundInto(b, in)); ok {
				return mp
			}
			continue
		}
		out, ok := sc.offsetRoundInto(b, in, math.Copysign(d, grow))
		if !ok {
			continue
		}
		// validRounded of a rounded scene: the moved outline itself is
		// not needed (offsetRoundInto never holds it whole).
		if mp, ok := validOrSplit(out); ok {
			return mp
		}
	}
}

// finer returns a scene converting points as s does with finerDigits more
// decimals, or unrounded after maxExtraDigits.
func (s *scene) finer() *scene {
	f := &scene{l: s.l, a: s.a, m: s.m, grid: s.grid, extraDigits: s.extraDigits + finerDigits, area: s.area}
	if s.extraDigits >= maxExtraDigits {
		f.extraDigits, f.unrounded = s.extraDigits, true
	}
	return f
}

// roundOut rounds an output coordinate to d decimals plus the scene's
// extra ones, or not at all for an unrounded scene.
func (s *scene) roundOut(v float64, d int) float64 {
	if s.unrounded {
		if v == 0 {
			return 0 // no negative zero in the outputs
		}
		return v
	}
	return round(v, d+s.extraDigits)
}

// outlineEdge is one edge of a written outline, for outlineValid.
type outlineEdge struct {
	ax, ay, bx, by float64
	ring, idx, n   int32 // ring number, edge index in it, edges in it
}

// bruteForceEdges is the edge count up to which outlineValid compares all
// pairs; beyond it only pairs of edges whose bounding boxes share a cell
// of a uniform grid are compared.
const bruteForceEdges = 24

// edgesPerCell is the mean number of edges per grid cell outlineValid
// aims at.
const edgesPerCell = 4

// outlineValid reports whether the closed rings of mp make the contacts
// the file comment allows, and only those. Exact: orientation and dot
// signs of the written coordinates. A feature of one convex ring (most
// service areas), or one ring star-shaped about its vertex mean or
// monotone in x or y (most gap outlines), passes at once (convexRing,
// starRing, monotoneRing); others go to pairsValid.
func outlineValid(mp orb.MultiPolygon) bool {
	if len(mp) == 1 && len(mp[0]) == 1 && (convexRing(mp[0][0]) || starRing(mp[0][0]) || monotoneRing(mp[0][0])) {
		return true // most service areas and gaps: one convex, star-shaped or monotone ring
	}
	return pairsValid(mp)
}

// pairsValid is outlineValid without the convex pre-filter, comparing
// pairs of edges. Two edges can meet only where their bounding boxes
// overlap, so beyond bruteForceEdges each edge is listed in the grid cells
// its box covers and a pair is compared in one cell only, the one holding
// the lower-left corner of the overlap of their boxes. The edges are kept
// compact (outlineEdges: the positions once, 20 bytes an edge), and the
// cells of an outline of more than parallelEdges edges are compared in
// bands of rows on all processors; the answer does not depend on the grid
// (every pair whose boxes meet is compared once).
func pairsValid(mp orb.MultiPolygon) bool {
	total := 0
	for _, p := range mp {
		for _, r := range p {
			total += len(r) - 1
		}
	}
	if total <= bruteForceEdges {
		return smallValid(mp)
	}
	sc := outlineScratchPool.Get().(*outlineScratch)
	defer outlineScratchPool.Put(sc)
	o := &sc.edges
	b := o.fill(mp, total)
	g := max(1, int(math.Sqrt(float64(total/edgesPerCell))))
	gr := outlineGrid{g: g, b: b}
	if w := b.Max[0] - b.Min[0]; w > 0 {
		gr.sx = float64(g) / w
	}
	if h := b.Max[1] - b.Min[1]; h > 0 {
		gr.sy = float64(g) / h
	}

	// Cell lists in compressed rows: start[c] .. start[c+1] in list.
	start := grownZero(&sc.start, g*g+1)
	o.edges(func(p int32) {
		x0, y0, x1, y1 := gr.box(o, p)
		for y := y0; y <= y1; y++ {
			for x := x0; x <= x1; x++ {
				start[y*g+x+1]++
			}
		}
	})
	for c := 1; c <= g*g; c++ {
		start[c] += start[c-1]
	}
	list := grownZero(&sc.list, int(start[g*g]))
	fill := append(grownZero(&sc.fill, 0), start[:g*g]...)
	sc.fill = fill
	o.edges(func(p int32) {
		x0, y0, x1, y1 := gr.box(o, p)
		for y := y0; y <= y1; y++ {
			for x := x0; x <= x1; x++ {
				list[fill[y*g+x]] = p
				fill[y*g+x]++
			}
		}
	})
	rows := func(y0, y1 int, stop *atomic.Bool) bool {
		for y := y0; y < y1; y++ {
			if stop != nil && stop.Load() {
				return false
			}
			for c := y * g; c < (y+1)*g; c++ {
				if !gr.cellValid(o, c, list[start[c]:start[c+1]]) {
					return false
				}
			}
		}
		return true
	}
	if total <= parallelEdges {
		return rows(0, g, nil)
	}
	var failed atomic.Bool
	planar.ParallelChunks(g, max(1, g/(8*runtime.GOMAXPROCS(0))), 0, func(_, y0, y1 int) {
		if !rows(y0, y1, &failed) {
			failed.Store(true)
		}
	})
	return !failed.Load()
}

// parallelEdges is the edge count beyond which pairsValid compares the
// grid's cells on all processors (the covered area of a large site).
const parallelEdges = 1 << 16

// cellValid compares the pairs of edges listed in cell c (in) whose box
// overlap has its lower-left corner in c.
func (gr *outlineGrid) cellValid(o *outlineEdges, c int, in []int32) bool {
	xy := o.xy
	for k, i := range in {
		ex0, ex1 := min(xy[2*i], xy[2*i+2]), max(xy[2*i], xy[2*i+2])
		ey0, ey1 := min(xy[2*i+1], xy[2*i+3]), max(xy[2*i+1], xy[2*i+3])
		var e outlineEdge
		built := false
		for _, j := range in[k+1:] {
			fx0, fx1 := min(xy[2*j], xy[2*j+2]), max(xy[2*j], xy[2*j+2])
			fy0, fy1 := min(xy[2*j+1], xy[2*j+3]), max(xy[2*j+1], xy[2*j+3])
			if ex1 < fx0 || fx1 < ex0 || ey1 < fy0 || fy1 < ey0 {
				continue // the boxes are apart: nothing to compare
			}
			lx, ly := max(ex0, fx0), max(ey0, fy0)
			if gr.cell(ly, gr.b.Min[1], gr.sy)*gr.g+gr.cell(lx, gr.b.Min[0], gr.sx) != c {
				continue // compared in another cell
			}
			if !built {
				e, built = o.edge(i), true
			}
			f := o.edge(j)
			if !edgePairValid(&e, &f) {
				return false
			}
		}
	}
	return true
}

// smallValid is pairsValid for an outline of at most bruteForceEdges
// edges: all pairs, without allocation.
func smallValid(mp orb.MultiPolygon) bool {
	var small [bruteForceEdges]outlineEdge
	edges := small[:0]
	ring := int32(0)
	for _, p := range mp {
		for _, r := range p {
			n := int32(len(r) - 1)
			for i := int32(0); i < n; i++ {
				edges = append(edges, outlineEdge{r[i][0], r[i][1], r[i+1][0], r[i+1][1], ring, i, n})
			}
			ring++
		}
	}
	for i := range edges {
		for j := i + 1; j < len(edges); j++ {
			if !edgePairValid(&edges[i], &edges[j]) {
				return false
			}
		}
	}
	return true
}

// outlineEdges holds the edges of an outline for pairsValid compactly:
// the positions of its rings, ring after ring, each ring's positions as
// given (closed); edge p runs from position p to position p+1, for every
// position p but the last of its ring.
type outlineEdges struct {
	xy        []float64 // x, y of each position
	ring      []int32   // the ring of each position
	ringStart []int32   // the first position of each ring, then the end
}

// fill loads the rings of mp (total edges in all) into o and returns the
// bounding box of the edges' first ends.
func (o *outlineEdges) fill(mp orb.MultiPolygon, total int) orb.Bound {
	rings := 0
	for _, p := range mp {
		rings += len(p)
	}
	o.xy = slices.Grow(o.xy[:0], 2*(total+rings))
	o.ring = slices.Grow(o.ring[:0], total+rings)
	o.ringStart = slices.Grow(o.ringStart[:0], rings+1)
	x0, y0, x1, y1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	k := int32(0)
	for _, p := range mp {
		for _, r := range p {
			o.ringStart = append(o.ringStart, int32(len(o.ring)))
			for i, q := range r {
				o.xy = append(o.xy, q[0], q[1])
				o.ring = append(o.ring, k)
				if i < len(r)-1 {
					x0, y0, x1, y1 = min(x0, q[0]), min(y0, q[1]), max(x1, q[0]), max(y1, q[1])
				}
			}
			k++
		}
	}
	o.ringStart = append(o.ringStart, int32(len(o.ring)))
	return orb.Bound{Min: orb.Point{x0, y0}, Max: orb.Point{x1, y1}}
}

// edges calls f with each edge (its first position) in order.
func (o *outlineEdges) edges(f func(p int32)) {
	for k := 0; k+1 < len(o.ringStart); k++ {
		for p := o.ringStart[k]; p < o.ringStart[k+1]-1; p++ {
			f(p)
		}
	}
}

// edge returns edge p as an outlineEdge.
func (o *outlineEdges) edge(p int32) outlineEdge {
	k := o.ring[p]
	s := o.ringStart[k]
	return outlineEdge{o.xy[2*p], o.xy[2*p+1], o.xy[2*p+2], o.xy[2*p+3], k, p - s, o.ringStart[k+1] - s - 1}
}

// convexRing reports whether the closed ring r turns left at every
// vertex and its edges' x direction changes sign exactly twice: then its
// direction turns once round (the turn at each vertex is below π, so each
// turn round changes the sign twice), and a ring turning left everywhere
// and once round is a convex polygon, simple: outlineValid's pre-filter,
// n exact orientation signs instead of the pairs of edges. Exact: the
// sign of a difference of doubles is that of the exact difference.
func convexRing(r orb.Ring) bool {
	n := len(r) - 1
	if n < 3 || r[0] != r[n] {
		return false
	}
	changes, last := 0, 0.0
	for i := range n {
		a, b, c := r[(i+n-1)%n], r[i], r[i+1]
		if planar.Orient2D(a[0], a[1], b[0], b[1], c[0], c[1]) <= 0 {
			return false
		}
		if dx := c[0] - b[0]; dx != 0 {
			if last != 0 && (dx > 0) != (last > 0) {
				changes++
			}
			last = dx
		}
	}
	// The wrap from the last edge with dx ≠ 0 to the first.
	for i := range n {
		if dx := r[i+1][0] - r[i][0]; dx != 0 {
			if (dx > 0) != (last > 0) {
				changes++
			}
			break
		}
	}
	return changes == 2
}

// starRing reports whether the closed ring r winds once counter-clockwise
// round the mean p of its vertices with every edge turning strictly left
// as seen from p: Orient2D(p, a, b) > 0 for each edge ab, and the
// direction from p passes angle 0 exactly once (a vertex below the ray
// from p along +x followed by one on or above it). Then each ray from p
// meets the ring once, the edges fill disjoint angular sectors about p
// in order (adjacent ones sharing only the ray through their common
// vertex, which each meets only there), so the ring is simple and makes
// no contact outlineValid refuses: outlineValid's pre-filter for a
// non-convex ring, n exact orientation signs and comparisons instead of
// the pairs of edges. p is any point (its rounding does not matter); when
// it is not in the ring's kernel the test fails and the pairs decide.
func starRing(r orb.Ring) bool {
	n := len(r) - 1
	if n < 3 || r[0] != r[n] {
		return false
	}
	var px, py float64
	for _, q := range r[:n] {
		px += q[0]
		py += q[1]
	}
	px, py = px/float64(n), py/float64(n)
	// lower: the direction from p to q has angle in [π, 2π).
	lower := func(q orb.Point) bool { return q[1] < py || (q[1] == py && q[0] <= px) }
	wraps := 0
	low := lower(r[0])
	for i := range n {
		a, b := r[i], r[i+1]
		if !(planar.Orient2D(px, py, a[0], a[1], b[0], b[1]) > 0) { // also NaN
			return false
		}
		bl := lower(b)
		if low && !bl {
			wraps++
		}
		low = bl
	}
	return wraps == 1
}

// monotoneRing reports whether the closed ring r is strictly monotone
// along x or along y with its two chains strictly apart (monotoneAlong):
// outlineValid's pre-filter for a thin crescent (a gap between two disks
// almost touching), which no point sees whole, in one pass over the ring.
func monotoneRing(r orb.Ring) bool {
	n := len(r) - 1
	if n < 3 || r[0] != r[n] {
		return false
	}
	return monotoneAlong(r[:n], 0) || monotoneAlong(r[:n], 1)
}

// monotoneAlong reports, for the positions pts of a ring (not repeated at
// the end) and the coordinate u = q[k] (v the other one), whether
//   - from the vertex of least u the ring rises strictly in u to the vertex
//     of greatest u both ways round (two chains a and b), except that one
//     of the two chains may have a level edge at either end, and
//   - at every vertex of either chain other than those two ends, the other
//     chain (its edge spanning that u) lies strictly on one side, below for
//     the vertices of one chain and above for those of the other (exact
//     orientation signs in the u, v plane; for a vertex at the u of an
//     end, the sign of its v against that end).
//
// Then the v-distance of the chains is linear between consecutive vertex
// positions in u and nonzero at each: the chains meet only at their
// common ends (a level end edge lies on the line u = const, which the
// other chain meets only at the end vertex), each chain is simple
// (monotone), and the ring is a simple polygon making none of the
// contacts outlineValid refuses.
func monotoneAlong(pts []orb.Point, k int) bool {
	n := len(pts)
	lo, hi := 0, 0
	for i, q := range pts {
		if q[k] < pts[lo][k] {
			lo = i
		}
		if q[k] > pts[hi][k] {
			hi = i
		}
	}
	// a: lo, lo+1, …, hi; b: lo, lo−1, …, hi (indices mod n), both rising.
	na := (hi - lo + n) % n
	nb := n - na
	a := func(i int) orb.Point { return pts[(lo+i)%n] }
	b := func(i int) orb.Point { return pts[(lo-i+n)%n] }
	// rising checks that chain c of m edges rises strictly, except that
	// its first and last edges may be level (a rounded cusp: an edge of
	// 1 mm across u at an end); it reports which ends are level.
	rising := func(c func(int) orb.Point, m int) (ok, first, last bool) {
		for i := range m {
			if u0, u1 := c(i)[k], c(i + 1)[k]; !(u0 < u1) {
				if u0 != u1 || (i != 0 && i != m-1) {
					return false, false, false
				}
				first, last = first || i == 0, last || i == m-1
			}
		}
		return true, first, last
	}
	okA, firstA, lastA := rising(a, na)
	okB, firstB, lastB := rising(b, nb)
	if !okA || !okB || (firstA && firstB) || (lastA && lastB) {
		return false // level ends on both chains could fold back
	}
	// side: the sign the vertices of a must have against b (those of b
	// have the opposite one against a); 0 until the first is found.
	side := 0
	check := func(p func(int) orb.Point, np int, c func(int) orb.Point, nc int, want int) bool {
		j := 0 // the edge c(j)–c(j+1) spans the u of the vertex
		for i := 1; i < np; i++ {
			q := p(i)
			for c(j + 1)[k] < q[k] {
				j++
			}
			e0, e1 := c(j), c(j+1)
			o := planar.Orient2D(e0[k], e0[1-k], e1[k], e1[1-k], q[k], q[1-k])
			s := 0
			if o > 0 {
				s = 1
			} else if o < 0 {
				s = -1
			}
			if s == 0 {
				return false // on the other chain, or NaN
			}
			if want == 0 {
				want = s
				side = s
			}
			if s != want {
				return false
			}
		}
		return true
	}
	if !check(a, na, b, nb, 0) {
		return false
	}
	return check(b, nb, a, na, -side)
}

// outlineGrid is the uniform grid of outlineValid: g × g cells over the
// box b, sx and sy cells per unit (0 for a box of no width or height).
type outlineGrid struct {
	g      int
	b      orb.Bound
	sx, sy float64
}

// cell is the column (or row) of coordinate v, for the box's low side lo
// and s cells per unit.
func (gr *outlineGrid) cell(v, lo, s float64) int {
	return min(gr.g-1, max(0, int((v-lo)*s)))
}

// box returns the columns and rows of the cells the box of edge p of o
// covers.
func (gr *outlineGrid) box(o *outlineEdges, p int32) (x0, y0, x1, y1 int) {
	ax, ay, bx, by := o.xy[2*p], o.xy[2*p+1], o.xy[2*p+2], o.xy[2*p+3]
	return gr.cell(min(ax, bx), gr.b.Min[0], gr.sx), gr.cell(min(ay, by), gr.b.Min[1], gr.sy),
		gr.cell(max(ax, bx), gr.b.Min[0], gr.sx), gr.cell(max(ay, by), gr.b.Min[1], gr.sy)
}

// outlineScratch holds outlineValid's buffers for large outlines, reused
// through outlineScratchPool (a layer checks one outline after another).
type outlineScratch struct {
	edges             outlineEdges
	start, list, fill []int32
}

var outlineScratchPool = sync.Pool{New: func() any { return new(outlineScratch) }}

// grownZero returns (*buf)[:n] zeroed, growing *buf when needed.
func grownZero(buf *[]int32, n int) []int32 {
	if cap(*buf) < n {
		*buf = make([]int32, n)
	}
	*buf = (*buf)[:n]
	clear(*buf)
	return *buf
}

// edgePairValid reports whether two edges of a written outline meet only
// as the file comment allows.
func edgePairValid(e, f *outlineEdge) bool {
	if e.ring == f.ring {
		switch {
		case f.idx == e.idx+1 || (e.idx == f.n-1 && f.idx == 0):
			return !foldsBack(e.ax, e.ay, e.bx, e.by, f.bx, f.by)
		case e.idx == f.idx+1 || (f.idx == e.n-1 && e.idx == 0):
			return !foldsBack(f.ax, f.ay, f.bx, f.by, e.bx, e.by)
		}
	}
	if boxesApart(e, f) || !planar.SegmentsMeet(e.ax, e.ay, e.bx, e.by, f.ax, f.ay, f.bx, f.by) {
		return true
	}
	if e.ring == f.ring {
		return false
	}
	// They meet: only at a vertex both have, without overlapping.
	for _, v := range [2][2]float64{{e.ax, e.ay}, {e.bx, e.by}} {
		for _, w := range [2][2]float64{{f.ax, f.ay}, {f.bx, f.by}} {
			if v != w {
				continue
			}
			ox, oy := e.ax, e.ay // e's other end
			if v == [2]float64{e.ax, e.ay} {
				ox, oy = e.bx, e.by
			}
			px, py := f.ax, f.ay // f's other end
			if w == [2]float64{f.ax, f.ay} {
				px, py = f.bx, f.by
			}
			return planar.Orient2D(v[0], v[1], ox, oy, px, py) != 0 || planar.DotSign(ox, oy, px, py, v[0], v[1]) <= 0
		}
	}
	return false
}

// boxesApart reports whether the bounding boxes of two edges are disjoint
// (plain comparisons: the common case, kept out of SegmentsMeet's call).
func boxesApart(e, f *outlineEdge) bool {
	return max(e.ax, e.bx) < min(f.ax, f.bx) || max(f.ax, f.bx) < min(e.ax, e.bx) ||
		max(e.ay, e.by) < min(f.ay, f.by) || max(f.ay, f.by) < min(e.ay, e.by)
}

// foldsBack reports whether the edge from (bx, by) to (cx, cy) following
// the edge from (ax, ay) runs back along it (a spike): c on the line ab on
// the side of a as seen from b.
func foldsBack(ax, ay, bx, by, cx, cy float64) bool {
	return planar.Orient2D(ax, ay, bx, by, cx, cy) == 0 && planar.DotSign(ax, ay, cx, cy, bx, by) > 0
}

// splitPinches splits every ring of mp that passes through a position
// more than once into its loops (each visit closes the loop since the
// last), then rebuilds the polygons: a loop turning as its ring did keeps
// the ring's role, one turning the other way takes the other role (a loop
// of an exterior ring turning clockwise is a hole of that polygon, a loop
// of a hole turning counter-clockwise an island, a polygon of its own);
// each hole goes to the smallest exterior ring of its polygon's loops that
// contains it. Loops of zero area (spikes) are dropped. ok is false when
// no ring repeats a position.
func splitPinches(mp orb.MultiPolygon) (out orb.MultiPolygon, ok bool) {
	for _, p := range mp {
		var shells, holes []orb.Ring
		for _, r := range p {
			loops := ringLoops(r)
			if len(loops) > 1 {
				ok = true
			}
			for _, l := range loops {
				// The rings are written oriented (exterior rings
				// counter-clockwise, holes clockwise), so a loop's
				// turn is its role.
				switch a := planar.RingArea(planar.FlatRing(l)); {
				case a > 0:
					shells = append(shells, l)
				case a < 0:
					holes = append(holes, l)
				}
			}
		}
		out = append(out, assignHoles(shells, holes)...)
	}
	return out, ok
}

// ringLoops splits a closed ring at its repeated positions into closed
// loops: walking the ring, a position already on the path closes the loop
// from its earlier visit.
func ringLoops(r orb.Ring) []orb.Ring {
	var loops []orb.Ring
	path := make([]orb.Point, 0, len(r))
	at := make(map[orb.Point]int, len(r))
	for _, q := range r[:len(r)-1] {
		if i, seen := at[q]; seen {
			loop := append(slices.Clone(path[i:]), q)
			loops = append(loops, loop)
			for _, x := range path[i+1:] {
				delete(at, x)
			}
			path = path[:i+1]
			continue
		}
		at[q] = len(path)
		path = append(path, q)
	}
	return append(loops, append(path, path[0]))
}

// assignHoles makes polygons of shells (counter-clockwise) and gives each
// hole to the smallest shell containing it (decided at the first of its
// vertices not on that shell's boundary), with one shell without a test;
// a hole in no shell is dropped.
func assignHoles(shells, holes []orb.Ring) orb.MultiPolygon {
	out := make(orb.MultiPolygon, len(shells))
	flat := make([][]float64, len(shells))
	area := make([]float64, len(shells))
	for i, sh := range shells {
		out[i] = orb.Polygon{sh}
		flat[i] = planar.FlatRing(sh)
		area[i] = planar.RingArea(flat[i])
	}
	for _, h := range holes {
		if len(shells) == 1 {
			out[0] = append(out[0], h)
			continue
		}
		best := -1
		for i := range shells {
			if (best < 0 || area[i] < area[best]) && ringInside(h, flat[i]) {
				best = i
			}
		}
		if best >= 0 {
			out[best] = append(out[best], h)
		}
	}
	return out
}

// ringInside reports whether ring h lies inside the ring xy: its first
// vertex not on xy's boundary is inside (PointInRing, exact).
func ringInside(h orb.Ring, xy []float64) bool {
	for _, q := range h {
		if w := planar.PointInRing(xy, q[0], q[1]); w != 0 {
			return w > 0
		}
	}
	return false
}
