// Weighted alpha filtration of the regular triangulation, and its
// persistence: the holes and pieces of the union of disks of different
// radii as every device's power grows by the same t.
//
// Math (Edelsbrunner, "The union of balls and its dual shape", Discrete &
// Computational Geometry 13, 1995): with weights w_i = r_i², the disk of
// device i at growth t has radius √(w_i + t). A simplex of the regular
// triangulation enters at the smallest t at which those disks, each
// restricted to its power cell, share a point:
//
//   - a vertex at −w_i (its disk appears);
//   - a triangle at the power of its power centre c (the point of equal
//     power, planar's power-centre formula): t = |c − a|² − w_a;
//   - an edge pq at the power of the point x of its line where π_p = π_q,
//     x = p + s(q − p), s = (|q − p|² + w_p − w_q)/(2|q − p|²),
//     t = s²|q − p|² − w_p, when it is not attached: no opposite vertex r
//     of an adjacent triangle has π_r(x) < t (the weighted Gabriel test);
//     otherwise at the smallest value of its adjacent triangles, as
//     alpha.go (Edelsbrunner & Harer, Computational Topology, AMS 2010,
//     section III.4).
//
// By the nerve theorem the complex at t has the homotopy type of the union
// of the disks of radius √(w_i + t), so its persistence is that of the
// growing union; t = 0 is the plan as given. Values are clamped so every
// simplex follows its faces (an edge at least its vertices' −w, a triangle
// at least its edges).
//
// Persistence (persistence.go's method): H0 by Kruskal over the edges in
// filtration order with the elder rule, since vertices are born at
// different times: of two joining pieces the one born later (larger −w,
// ties by smaller input index surviving) dies, the pair being (its birth,
// the edge's value); pairs of zero length (a piece that joins at the
// moment it appears) are kept in Merges for counting, and PowerPersistence
// .Diagram0 leaves them out as GUDHI does. H1 by Alexander duality over
// the triangles (persistDual's method). Edges are ordered by value (ties
// by half-edge), triangles by (value, index); values may be negative, so
// orders are taken on an order-preserving transform of the float bits
// (orderedBits).
//
// Cost: one pass per triangle (its vertices gathered a block at a time)
// and one per edge for the filtration; the edges sorted by a radix sort of
// the upper 32 bits of their keys packed above the half-edge, runs of
// equal upper bits then ordered by the full key; the dual union-find
// compares triangles by (value, index) directly, so they need no sort;
// Kruskal and the dual pass run side by side. Every other pass, the sort
// included, runs on GOMAXPROCS goroutines at once.
//
// Error bounds: a triangle's value is computed from its power centre
// relative to a vertex, |q|² − w_a, with an absolute error of a few u
// (u = 2⁻⁵³) times |q|² + w_a; an edge's likewise times d² + w_p. The
// attachment test compares two such values in floating point: when they
// tie within rounding the edge's value and the triangle's agree to that
// rounding, so either choice gives the same value to that accuracy.

package coverage

import (
	"math"
	"slices"
	"sort"
	"sync"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// PowerFiltration holds the weighted alpha value (a power t, m²) of every
// simplex of a regular triangulation.
type PowerFiltration struct {
	// Vertex holds −r_v² per triangulation vertex.
	Vertex []float64
	// Edge holds, per half-edge, the value of its edge (both halves of an
	// interior edge hold the same value).
	Edge []float64
	// Triangle holds, per triangle, the power of its power centre.
	Triangle []float64
	// Line is set only for collinear input: Line[i] is the value of the
	// edge from Hull[i] to Hull[i+1].
	Line []float64

	centre []float64 // power centre of each triangle, interleaved
}

// NewPowerFiltration computes the weighted alpha filtration of the regular
// triangulation t of sites with ranges (per vertex, as Layout.Ranges). A
// nil triangulation gives an empty filtration.
func NewPowerFiltration(t *planar.Triangulation, ranges []float64) *PowerFiltration {
	f := &PowerFiltration{}
	if t == nil {
		return f
	}
	nv := t.NumVertices()
	f.Vertex = make([]float64, nv)
	planar.ParallelFor(nv, alphaGrain, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			f.Vertex[v] = -(ranges[v] * ranges[v])
		}
	})
	xy := t.Coords
	nt := t.NumTriangles()
	if nt == 0 {
		if len(t.Hull) >= 2 {
			f.Line = make([]float64, len(t.Hull)-1)
			for i := range f.Line {
				a, b := t.Hull[i], t.Hull[i+1]
				f.Line[i] = powerEdge(xy, ranges, a, b)
			}
		}
		f.Edge = make([]float64, len(t.Halfedges))
		return f
	}
	f.Triangle = make([]float64, nt)
	f.Edge = make([]float64, len(t.Triangles))
	f.centre = make([]float64, 2*nt)
	// Pass 1, per triangle (its vertices' coordinates and weights r² gathered
	// a block of triangles at a time, as NewFiltration does): power centre
	// and value, and per half-edge what pass 2 needs, packed in f.Edge:
	//   - the half-edge that owns its edge (the smaller index of an
	//     interior pair, or a hull half-edge) holds the edge's own value,
	//     or +Inf when this triangle's opposite vertex attaches the edge;
	//   - the other half of an interior pair holds the larger of its
	//     vertices' −w (≤ 0, sign bit set), with the sign bit cleared when
	//     its opposite vertex attaches the edge.
	// Vertices lying outside their own power cell are listed on the way.
	var mu sync.Mutex
	var outside []int32
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		tr, he := t.Triangles, t.Halfedges
		var g [alphaGather * 9]float64
		var out []int32
		for i := lo; i < hi; i++ {
			j := (i - lo) % alphaGather
			if j == 0 {
				for k, q := range tr[3*i : 3*min(hi, i+alphaGather)] {
					g[3*k], g[3*k+1], g[3*k+2] = xy[2*q], xy[2*q+1], ranges[q]*ranges[q]
				}
			}
			v := (*[9]float64)(g[9*j : 9*j+9])
			ax, ay, wa := v[0], v[1], v[2]
			bx, by, wb := v[3], v[4], v[5]
			cx, cy, wc := v[6], v[7], v[8]
			f.Triangle[i], f.centre[2*i], f.centre[2*i+1] = powerTriangleAt(ax, ay, wa, bx, by, wb, cx, cy, wc)
			e := int32(3 * i)
			o0, o1, o2 := he[e], he[e+1], he[e+2]
			var out0, out1, out2 uint8
			f.Edge[e], out0 = powerHalfEdge(e, o0, ax, ay, wa, bx, by, wb, cx, cy, wc)
			f.Edge[e+1], out1 = powerHalfEdge(e+1, o1, bx, by, wb, cx, cy, wc, ax, ay, wa)
			f.Edge[e+2], out2 = powerHalfEdge(e+2, o2, cx, cy, wc, ax, ay, wa, bx, by, wb)
			if out0|out1|out2 != 0 {
				for k, o := range [3]uint8{out0, out1, out2} {
					if o&1 != 0 {
						out = append(out, tr[int(e)+k])
					}
					if o&2 != 0 {
						out = append(out, tr[planar.NextHalfedge(e+int32(k))])
					}
				}
			}
		}
		if len(out) > 0 {
			mu.Lock()
			outside = append(outside, out...)
			mu.Unlock()
		}
	})
	// Pass 2, per edge: the own value when neither side attaches it,
	// clamped to the adjacent triangles; else the smaller triangle value;
	// never below its vertices.
	planar.ParallelFor(len(t.Triangles), alphaGrain, func(lo, hi int) {
		he, tr := t.Halfedges, t.Triangles
		for i := lo; i < hi; i++ {
			e := int32(i)
			opp := he[e]
			if opp >= 0 && opp < e {
				continue
			}
			own := f.Edge[e]
			gabriel := own != math.Inf(1)
			v := f.Triangle[e/3]
			var floor float64
			if opp >= 0 {
				o := f.Edge[opp]
				gabriel = gabriel && math.Signbit(o)
				floor = -math.Abs(o)
				v = min(v, f.Triangle[opp/3])
			} else {
				floor = max(f.Vertex[tr[e]], f.Vertex[tr[planar.NextHalfedge(e)]])
			}
			if gabriel {
				v = min(v, own)
			}
			v = max(v, floor)
			f.Edge[e] = v
			if opp >= 0 {
				f.Edge[opp] = v
			}
		}
	})
	// Triangles follow their edges (only rounding can reverse that).
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			f.Triangle[i] = max(f.Triangle[i], f.Edge[3*i], f.Edge[3*i+1], f.Edge[3*i+2])
		}
	})
	powerAttachVertices(t, f, outside)
	return f
}

// powerHalfEdge returns what pass 1 of NewPowerFiltration stores for
// half-edge e from p to q, in a triangle whose third vertex is o (points
// and weights), opp being its opposite half-edge: for the edge's owner
// (opp < 0 or opp > e) its own value (the power at the point of its line
// where π_p = π_q) or +Inf when o attaches it (π_o there is below that
// value); for the other half max(−w_q, −w_p), its sign bit cleared when o
// attaches it. out has bit 0 set when the site of p lies outside its
// power cell (π_q(p) < −w_p), and on the hull bit 1 likewise for q.
func powerHalfEdge(e, opp int32, px, py, wp, qx, qy, wq, ox, oy, wo float64) (v float64, out uint8) {
	dx, dy := qx-px, qy-py
	d2 := dx*dx + dy*dy
	s := (d2 + wp - wq) / (2 * d2)
	te := s*s*d2 - wp
	rx, ry := ox-(px+s*dx), oy-(py+s*dy)
	attached := rx*rx+ry*ry-wo < te
	switch {
	case opp < 0 || opp > e:
		v = te
		if attached {
			v = math.Inf(1)
		}
	case attached:
		v = math.Abs(max(-wq, -wp))
	default:
		v = max(-wq, -wp)
	}
	if d2-wq < -wp {
		out = 1
	}
	if opp < 0 && d2-wp < -wq {
		out |= 2
	}
	return v, out
}

// powerAttachVertices raises each vertex listed in outside (its site lies
// outside its own power cell: some neighbour u has π_u(p_v) < −w_v; the
// list may repeat vertices) to the smallest value of its edges, the edge
// values being final: its restricted disk first appears on the cell's
// boundary. The edges of each are found by walking around it from Inedge.
func powerAttachVertices(t *planar.Triangulation, f *PowerFiltration, outside []int32) {
	if len(outside) == 0 {
		return
	}
	nv := len(f.Vertex)
	tr, he := t.Triangles, t.Halfedges
	if len(t.Inedge) != nv {
		// No stars to walk: one pass over the edges.
		att := make([]bool, nv)
		for _, v := range outside {
			att[v] = true
			f.Vertex[v] = math.Inf(1)
		}
		for e := range tr {
			if o := he[e]; o >= 0 && o < int32(e) {
				continue
			}
			for _, v := range [2]int32{tr[e], tr[planar.NextHalfedge(int32(e))]} {
				if att[v] {
					f.Vertex[v] = math.Min(f.Vertex[v], f.Edge[e])
				}
			}
		}
		return
	}
	// Each vertex once, then the walks in parallel.
	mark := make([]uint64, (nv+63)/64)
	verts := outside[:0:0]
	for _, v := range outside {
		if mark[v/64]&(1<<(v%64)) == 0 {
			mark[v/64] |= 1 << (v % 64)
			verts = append(verts, v)
		}
	}
	planar.ParallelFor(len(verts), alphaGrain/8, func(lo, hi int) {
		for _, v := range verts[lo:hi] {
			start := t.Inedge[v]
			m := math.Inf(1)
			for in := start; in >= 0; {
				m = min(m, f.Edge[in])
				out := planar.NextHalfedge(in)
				in = he[out]
				if in < 0 {
					m = min(m, f.Edge[out]) // the hull edge leaving v
					break
				}
				if in == start {
					break
				}
			}
			f.Vertex[v] = m
		}
	})
}

// powerEdge returns the value of edge pq for ranges r (the power at the
// point of its line with π_p = π_q; weights w = r²).
func powerEdge(xy, r []float64, p, q int32) float64 {
	wp, wq := r[p]*r[p], r[q]*r[q]
	dx, dy := xy[2*q]-xy[2*p], xy[2*q+1]-xy[2*p+1]
	d2 := dx*dx + dy*dy
	s := (d2 + wp - wq) / (2 * d2)
	return s*s*d2 - wp
}

// powerTriangleAt returns the value of the triangle of the points (ax,
// ay), (bx, by), (cx, cy) of weights wa, wb, wc (the power of its power
// centre) and the centre, computed relative to the vertex of the largest
// angle (opposite the longest edge) as planar's circumcentre.
func powerTriangleAt(ax, ay, wa, bx, by, wb, cx, cy, wc float64) (t, x, y float64) {
	lab := (ax-bx)*(ax-bx) + (ay-by)*(ay-by)
	lbc := (bx-cx)*(bx-cx) + (by-cy)*(by-cy)
	lca := (cx-ax)*(cx-ax) + (cy-ay)*(cy-ay)
	switch {
	case lca >= lab && lca >= lbc:
		ax, ay, wa, bx, by, wb, cx, cy, wc = bx, by, wb, cx, cy, wc, ax, ay, wa
	case lab >= lbc && lab >= lca:
		ax, ay, wa, bx, by, wb, cx, cy, wc = cx, cy, wc, ax, ay, wa, bx, by, wb
	}
	bx, by = bx-ax, by-ay
	cx, cy = cx-ax, cy-ay
	b2 := bx*bx + by*by + (wa - wb)
	c2 := cx*cx + cy*cy + (wa - wc)
	d := 2 * (bx*cy - by*cx)
	if d == 0 {
		return math.Inf(1), math.NaN(), math.NaN()
	}
	qx := (cy*b2 - by*c2) / d
	qy := (bx*c2 - cx*b2) / d
	return qx*qx + qy*qy - wa, ax + qx, ay + qy
}

// PowerMerge is an H0 pair of the weighted alpha filtration: a piece of
// the union born at Birth (when its oldest disk appears) joins an older one
// at Death, by the edge between Sites.
type PowerMerge struct {
	// Birth and Death are powers t (m²).
	Birth, Death float64
	// Sites are the input indices of the edge's endpoints, ascending.
	Sites [2]int
}

// PowerHole is a finite H1 pair of the weighted alpha filtration: a hole of
// the union of disks, opened at Birth and filled at Death (powers t, m²),
// at DeathPoint (the power centre of the triangle that fills it).
type PowerHole struct {
	Birth, Death float64
	DeathPoint   orb.Point
	// BirthSites are the input indices of the devices whose disks close
	// the loop at Birth.
	BirthSites [2]int

	deathTri int32 // the triangle that fills it
}

// PowerPersistence holds the persistence of the weighted alpha filtration:
// the pieces and holes of the union of the disks of radius √(r_i² + t).
type PowerPersistence struct {
	// Births holds the birth −r_v² of every vertex, ascending.
	Births []float64
	// Merges are all negative edges in filtration order (zero-length pairs
	// included: Birth == Death).
	Merges []PowerMerge
	// Holes are the H1 pairs with Death > Birth, by decreasing Death − Birth.
	Holes []PowerHole
	// Vertices is the number of vertices (devices not hidden, duplicates
	// once).
	Vertices int
}

// PersistenceRanges returns the persistence of the weighted alpha
// filtration of a layout with per-device ranges (for a common-range layout
// the ranges are taken as 0: the unweighted filtration in squared radii).
func (l *Layout) PersistenceRanges() *PowerPersistence {
	p, _ := l.persistenceRanges()
	return p
}

// persistenceRanges is PersistenceRanges also returning the filtration.
func (l *Layout) persistenceRanges() (*PowerPersistence, *PowerFiltration) {
	ranges := l.Ranges
	if ranges == nil {
		ranges = make([]float64, l.Tri.NumVertices())
	}
	f := NewPowerFiltration(l.Tri, ranges)
	return ComputePowerPersistence(l.Tri, f), f
}

// ComputePowerPersistence returns the H0 and H1 pairs of the weighted alpha
// filtration f of the regular triangulation t (file comment). A nil t or f
// gives an empty result.
func ComputePowerPersistence(t *planar.Triangulation, f *PowerFiltration) *PowerPersistence {
	p := &PowerPersistence{}
	if t == nil || f == nil {
		return p
	}
	nv := t.NumVertices()
	p.Vertices = nv
	nt := t.NumTriangles()
	if nt == 0 {
		p.Births = powerSortedBirths(f.Vertex, nil)
		// The path's edges as the first two corners of stand-in
		// triangles, for powerKruskal.
		n := len(f.Line)
		corners := make([]int32, 3*n)
		sides := make([]uint64, 0, n)
		vals := make([]uint64, 0, n)
		order := make([]int32, n)
		for i := range order {
			order[i] = int32(i)
		}
		slices.SortStableFunc(order, func(a, b int32) int { return cmpFloat(f.Line[a], f.Line[b]) })
		for k, i := range order {
			corners[3*k], corners[3*k+1] = t.Hull[i], t.Hull[i+1]
			sides = append(sides, uint64(3*k))
			vals = append(vals, math.Float64bits(f.Line[i]))
		}
		p.Merges = powerKruskal(t, corners, f, sides, vals)
		return p
	}
	// Vertex births on a second goroutine, the edge order here (a radix
	// sort of words packed as the upper 32 bits of the value's orderedBits
	// above the half-edge, so ties stay in half-edge order, then the runs
	// of equal upper bits ordered by the full value).
	tr, he, src := t.Triangles, t.Halfedges, t.Source
	keys, sides := powerEdgeOrder(he, f.Edge, func(scratch []uint64) {
		p.Births = powerSortedBirths(f.Vertex, scratch)
	})
	ne := len(keys)
	// Gather, in filtration order, each edge's value and its half-edge
	// with the opposite one (-1 on the hull), so that both passes below
	// read memory sequentially: Kruskal takes the endpoints from the
	// half-edge, the dual pass the two sides (triangles; nt stands for
	// the outside).
	planar.ParallelFor(ne, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			e := int32(uint32(keys[i]))
			sides[i] = uint64(uint32(e)) | uint64(uint32(he[e]))<<32
			keys[i] = math.Float64bits(f.Edge[e])
		}
	})
	// The two union-find passes are independent: side by side.
	merged := make(chan struct{})
	go func() {
		p.Merges = powerKruskal(t, tr, f, sides, keys)
		close(merged)
	}()
	recs := powerDual(f.Triangle, keys, sides)
	<-merged
	order := powerHoleOrder(recs, f.Triangle, keys) // keys is free now
	p.Holes = make([]PowerHole, len(recs))
	centre := f.centre
	planar.ParallelFor(len(recs), alphaGrain, func(lo, hi int) {
		for j := lo; j < hi; j++ {
			r := &recs[uint32(order[j])]
			y, e := r.tri, r.edge
			var dp orb.Point
			if len(centre) == 2*nt {
				dp = orb.Point{centre[2*y], centre[2*y+1]}
			} else { // a filtration not made by NewPowerFiltration
				dp[0], dp[1] = alphaCircumcentre(t.Coords, tr[3*y], tr[3*y+1], tr[3*y+2])
			}
			p.Holes[j] = PowerHole{Birth: r.birth, Death: f.Triangle[y], DeathPoint: dp,
				BirthSites: persistSitePair(src[tr[e]], src[tr[planar.NextHalfedge(e)]]),
				deathTri:   y}
		}
	})
	return p
}

// powerSortedBirths returns the values v ascending (radix sort on their
// orderedBits), using buf as scratch when it holds 2·len(v) words.
func powerSortedBirths(v []float64, buf []uint64) []float64 {
	n := len(v)
	if len(buf) < 2*n {
		buf = make([]uint64, 2*n)
	}
	k := buf[:n]
	for i, x := range v {
		k[i] = orderedBits(x)
	}
	k, _ = persistRadixSortFrom(k, buf[n:2*n], 0)
	out := make([]float64, n)
	for i, x := range k {
		out[i] = fromOrderedBits(x)
	}
	return out
}

// powerHoleRec is an H1 pair found by powerDual: the birth value, the
// birth edge's half-edge and the triangle that fills the hole (whose value
// is the death).
type powerHoleRec struct {
	birth     float64
	edge, tri int32
}

// powerHoleOrder is persistHoleOrder for powerDual's records, the deaths
// being the values tv of their triangles.
func powerHoleOrder(recs []powerHoleRec, tv []float64, buf []uint64) []uint64 {
	nh := len(recs)
	slices.Reverse(recs)
	if len(buf) < 2*nh {
		buf = make([]uint64, 2*nh)
	}
	hk := buf[:nh]
	key := func(k uint32) uint64 { return ^math.Float64bits(tv[recs[k].tri] - recs[k].birth) }
	planar.ParallelFor(nh, alphaGrain, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			hk[k] = key(uint32(k))>>32<<32 | uint64(k)
		}
	})
	hk, _ = persistSortPacked(hk, buf[nh:2*nh])
	persistFixTies(hk, key)
	return hk
}

// powerDual is persistDual with the triangles numbered by index, an order
// between two of them being that of (value, index) (orderedBits of the
// values tv), the outside (node len(tv)) after all: the root of each dual
// component is its latest triangle in the filtration. sides packs each
// edge's half-edge and the opposite one (-1 on the hull).
func powerDual(tv []float64, keys, sides []uint64) []powerHoleRec {
	nt := len(tv)
	uf := planar.NewUnionFind(nt + 1)
	par := uf.Parent
	out := make([]powerHoleRec, 0, nt/2+16)
	// later reports whether node a comes after node b.
	later := func(a, b int32) bool {
		if a == int32(nt) || b == int32(nt) {
			return a == int32(nt)
		}
		ka, kb := orderedBits(tv[a]), orderedBits(tv[b])
		return ka > kb || ka == kb && a > b
	}
	for i := len(sides) - 1; i >= 0; i-- {
		e, o := int32(uint32(sides[i])), int32(sides[i]>>32)
		b := int32(nt)
		if o >= 0 {
			b = o / 3
		}
		ra, rb := uf.Find(e/3), uf.Find(b)
		if ra == rb {
			continue // negative edge: a merge, found by Kruskal
		}
		young, old := ra, rb
		if later(ra, rb) {
			young, old = rb, ra
		}
		par[young] = old
		birth, death := math.Float64frombits(keys[i]), tv[young]
		if death-birth > HoleResolution*max(math.Abs(death), math.Abs(birth)) {
			out = append(out, powerHoleRec{birth, e, young})
		}
	}
	return out
}

// powerEdgeOrder orders the edges (one half-edge each: the larger index of
// an interior pair, or the hull half-edge) by (value, half-edge): it
// returns the words value<<32 | half-edge in that order (the upper 32 bits
// of the value's orderedBits) and a free slice of the same length. Chunks
// of half-edges are counted and filled in parallel; meanwhile, on another
// goroutine, side gets the sort's scratch slice to use first.
func powerEdgeOrder(he []int32, edge []float64, side func(scratch []uint64)) (sorted, free []uint64) {
	const chunk = 1 << 16
	nc := (len(he) + chunk - 1) / chunk
	start := make([]int, nc+1)
	planar.ParallelChunks(len(he), chunk, 0, func(ci, lo, hi int) {
		c := 0
		for e := lo; e < hi; e++ {
			if he[e] < int32(e) {
				c++
			}
		}
		start[ci+1] = c
	})
	for ci := range nc {
		start[ci+1] += start[ci]
	}
	a := make([]uint64, start[nc])
	tmp := make([]uint64, len(a))
	done := make(chan struct{})
	go func() {
		side(tmp)
		close(done)
	}()
	planar.ParallelChunks(len(he), chunk, 0, func(ci, lo, hi int) {
		k := start[ci]
		for e := lo; e < hi; e++ {
			if he[e] < int32(e) {
				a[k] = orderedBits(edge[e])>>32<<32 | uint64(e)
				k++
			}
		}
	})
	<-done
	sorted, free = persistSortPacked(a, tmp)
	persistFixTies(sorted, func(e uint32) uint64 { return orderedBits(edge[e]) })
	return sorted, free
}

// powerKruskal runs the elder-rule union-find over the vertices along the
// edges (their half-edges of tr, the triangles' corners, in the low 32 bits
// of sides, the bits of their values in vals, in filtration order).
func powerKruskal(t *planar.Triangulation, tr []int32, f *PowerFiltration, sides, vals []uint64) []PowerMerge {
	nv := t.NumVertices()
	uf := planar.NewUnionFind(nv)
	birth := f.Vertex
	out := make([]PowerMerge, 0, max(nv-1, 0))
	// The endpoints are loaded a block of edges at a time: the loads are
	// independent of the union-find, so many are in flight at once.
	var ends [alphaGather]uint64
	for i := range sides {
		j := i % alphaGather
		if j == 0 {
			for k, s := range sides[i:min(len(sides), i+alphaGather)] {
				e := int32(uint32(s))
				ends[k] = uint64(uint32(tr[e])) | uint64(uint32(tr[planar.NextHalfedge(e)]))<<32
			}
		}
		va, vb := int32(uint32(ends[j])), int32(ends[j]>>32)
		a, b := uf.Find(va), uf.Find(vb)
		if a == b {
			continue
		}
		// The younger root (later birth; ties: the larger index) dies.
		young, old := a, b
		if birth[a] < birth[b] || birth[a] == birth[b] && a < b {
			young, old = b, a
		}
		out = append(out, PowerMerge{Birth: birth[young], Death: math.Float64frombits(vals[i]),
			Sites: persistSitePair(t.Source[va], t.Source[vb])})
		uf.Parent[young] = old
	}
	return out
}

// cmpFloat orders float64 values ascending.
func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// orderedBits maps a float64 to a uint64 whose unsigned order is the
// numeric order (negative values have their bits complemented, others
// their sign bit set); fromOrderedBits inverts it.
func orderedBits(v float64) uint64 {
	b := math.Float64bits(v)
	if b>>63 == 1 {
		return ^b
	}
	return b | 1<<63
}

func fromOrderedBits(k uint64) float64 {
	if k>>63 == 1 {
		return math.Float64frombits(k &^ (1 << 63))
	}
	return math.Float64frombits(^k)
}

// Diagram0 returns the finite H0 pairs of positive length as (birth,
// death) powers, sorted.
func (p *PowerPersistence) Diagram0() [][2]float64 {
	var out [][2]float64
	for _, m := range p.Merges {
		if m.Death > m.Birth {
			out = append(out, [2]float64{m.Birth, m.Death})
		}
	}
	slices.SortFunc(out, func(a, b [2]float64) int {
		if c := cmpFloat(a[0], b[0]); c != 0 {
			return c
		}
		return cmpFloat(a[1], b[1])
	})
	return out
}

// Betti returns the number of pieces and of enclosed holes of the union of
// the closed disks of radius √(r_i² + t) (a disk with r_i² + t < 0 is
// absent).
func (p *PowerPersistence) Betti(t float64) (pieces, holes int) {
	if p == nil || math.IsNaN(t) {
		return 0, 0
	}
	born := sort.Search(len(p.Births), func(i int) bool { return p.Births[i] > t })
	merged := 0
	for _, m := range p.Merges {
		if m.Death <= t {
			merged++
		}
	}
	for _, h := range p.Holes {
		if h.Birth <= t && t < h.Death {
			holes++
		}
	}
	return born - merged, holes
}
