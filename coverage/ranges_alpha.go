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
// the triangles (persistDual). Edges are ordered by value (ties by
// half-edge), triangles by (value, index); radix sorts on an
// order-preserving transform of the float bits, since values may be
// negative.
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
	w := make([]float64, nv)
	f.Vertex = make([]float64, nv)
	for v := range w {
		w[v] = ranges[v] * ranges[v]
		f.Vertex[v] = -w[v]
	}
	xy := t.Coords
	nt := t.NumTriangles()
	if nt == 0 {
		if len(t.Hull) >= 2 {
			f.Line = make([]float64, len(t.Hull)-1)
			for i := range f.Line {
				a, b := t.Hull[i], t.Hull[i+1]
				f.Line[i], _, _ = powerEdge(xy, w, a, b)
			}
		}
		f.Edge = make([]float64, len(t.Halfedges))
		return f
	}
	f.Triangle = make([]float64, nt)
	f.Edge = make([]float64, len(t.Triangles))
	f.centre = make([]float64, 2*nt)
	attached := make([]bool, len(t.Triangles))
	// Pass 1, per triangle: power centre and value; per half-edge the
	// edge's own value and whether the opposite vertex attaches it.
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		tr := t.Triangles
		for i := lo; i < hi; i++ {
			a, b, c := tr[3*i], tr[3*i+1], tr[3*i+2]
			f.Triangle[i], f.centre[2*i], f.centre[2*i+1] = powerTriangle(xy, w, a, b, c)
			for k, opp := range [3]int32{c, a, b} {
				e := 3*i + k
				p, q := tr[e], tr[planar.NextHalfedge(int32(e))]
				te, x, y := powerEdge(xy, w, p, q)
				f.Edge[e] = te
				attached[e] = dist2(xy, opp, x, y)-w[opp] < te
			}
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
			gabriel := !attached[e]
			v := f.Triangle[e/3]
			if opp >= 0 {
				gabriel = gabriel && !attached[opp]
				v = math.Min(v, f.Triangle[opp/3])
			}
			if gabriel {
				v = math.Min(v, own)
			}
			v = math.Max(v, math.Max(f.Vertex[tr[e]], f.Vertex[tr[planar.NextHalfedge(e)]]))
			f.Edge[e] = v
			if opp >= 0 {
				f.Edge[opp] = v
			}
		}
	})
	// A vertex whose site lies outside its own power cell (some neighbour
	// u has π_u(p_v) < −w_v) is attached: its restricted disk first
	// appears on the cell's boundary, at the smallest value of its edges.
	powerAttachVertices(t, w, f)
	// Triangles follow their edges (only rounding can reverse that).
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			f.Triangle[i] = max(f.Triangle[i], f.Edge[3*i], f.Edge[3*i+1], f.Edge[3*i+2])
		}
	})
	return f
}

// powerAttachVertices raises each attached vertex to the smallest value of
// its edges (the edge values being final, and never below −w).
func powerAttachVertices(t *planar.Triangulation, w []float64, f *PowerFiltration) {
	xy, tr, he := t.Coords, t.Triangles, t.Halfedges
	att := make([]float64, len(f.Vertex))
	for v := range att {
		att[v] = math.Inf(1)
	}
	attached := false
	for e := range tr {
		if o := he[e]; o >= 0 && o < int32(e) {
			continue
		}
		// Edge a–b, once: does it attach a, or b? And the smallest edge
		// value at each vertex.
		a, b := tr[e], tr[planar.NextHalfedge(int32(e))]
		d := dist2(xy, a, xy[2*b], xy[2*b+1])
		if d-w[b] < -w[a] {
			f.Vertex[a] = math.NaN()
			attached = true
		}
		if d-w[a] < -w[b] {
			f.Vertex[b] = math.NaN()
			attached = true
		}
		att[a] = math.Min(att[a], f.Edge[e])
		att[b] = math.Min(att[b], f.Edge[e])
	}
	if !attached {
		return
	}
	for v, x := range f.Vertex {
		if math.IsNaN(x) {
			f.Vertex[v] = att[v]
		}
	}
}

// dist2 returns the squared distance from vertex v to (x, y).
func dist2(xy []float64, v int32, x, y float64) float64 {
	dx, dy := xy[2*v]-x, xy[2*v+1]-y
	return dx*dx + dy*dy
}

// powerEdge returns the value of edge pq (the power at the point of its
// line with π_p = π_q) and that point.
func powerEdge(xy, w []float64, p, q int32) (t, x, y float64) {
	dx, dy := xy[2*q]-xy[2*p], xy[2*q+1]-xy[2*p+1]
	d2 := dx*dx + dy*dy
	s := (d2 + w[p] - w[q]) / (2 * d2)
	return s*s*d2 - w[p], xy[2*p] + s*dx, xy[2*p+1] + s*dy
}

// powerTriangle returns the value of triangle abc (the power of its power
// centre) and the centre, computed relative to the vertex of the largest
// angle (opposite the longest edge) as planar's circumcentre.
func powerTriangle(xy, w []float64, a, b, c int32) (t, x, y float64) {
	lab := dist2(xy, a, xy[2*b], xy[2*b+1])
	lbc := dist2(xy, b, xy[2*c], xy[2*c+1])
	lca := dist2(xy, c, xy[2*a], xy[2*a+1])
	switch {
	case lca >= lab && lca >= lbc:
		a, b, c = b, c, a
	case lab >= lbc && lab >= lca:
		a, b, c = c, a, b
	}
	ax, ay := xy[2*a], xy[2*a+1]
	bx, by := xy[2*b]-ax, xy[2*b+1]-ay
	cx, cy := xy[2*c]-ax, xy[2*c+1]-ay
	b2 := bx*bx + by*by + (w[a] - w[b])
	c2 := cx*cx + cy*cy + (w[a] - w[c])
	d := 2 * (bx*cy - by*cx)
	if d == 0 {
		return math.Inf(1), math.NaN(), math.NaN()
	}
	qx := (cy*b2 - by*c2) / d
	qy := (bx*c2 - cx*b2) / d
	return qx*qx + qy*qy - w[a], ax + qx, ay + qy
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
	p.Births = slices.Clone(f.Vertex)
	slices.Sort(p.Births)
	nt := t.NumTriangles()
	if nt == 0 {
		ends := make([]uint64, 0, len(f.Line))
		vals := make([]uint64, 0, len(f.Line))
		order := make([]int32, len(f.Line))
		for i := range order {
			order[i] = int32(i)
		}
		slices.SortStableFunc(order, func(a, b int32) int { return cmpFloat(f.Line[a], f.Line[b]) })
		for _, i := range order {
			a, b := t.Hull[i], t.Hull[i+1]
			ends = append(ends, uint64(uint32(a))|uint64(uint32(b))<<32)
			vals = append(vals, math.Float64bits(f.Line[i]))
		}
		p.Merges = powerKruskal(t, f, ends, vals)
		return p
	}
	he := t.Halfedges
	ids, keys := powerEdgeKeys(he, f.Edge)
	ne := len(ids)
	tkeys := make([]uint64, nt)
	tids := make([]int32, nt)
	rank := make([]int32, nt)
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			tkeys[i] = orderedBits(f.Triangle[i])
			tids[i] = int32(i)
		}
	})
	sorted := make(chan struct{})
	go func() {
		persistRadixSort(tkeys, tids)
		close(sorted)
	}()
	persistRadixSort(keys, ids)
	<-sorted
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		for r := lo; r < hi; r++ {
			rank[tids[r]] = int32(r)
			tkeys[r] = math.Float64bits(fromOrderedBits(tkeys[r]))
		}
	})
	tr := t.Triangles
	outside := int32(nt)
	vends := make([]uint64, ne) // vertex a | vertex b << 32
	ends := make([]uint64, ne)  // input a | input b << 32, a < b
	sides := make([]uint64, ne)
	planar.ParallelFor(ne, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			e := ids[i]
			a, b := tr[e], tr[planar.NextHalfedge(e)]
			vends[i] = uint64(uint32(a)) | uint64(uint32(b))<<32
			sa, sb := t.Source[a], t.Source[b]
			ends[i] = uint64(uint32(min(sa, sb))) | uint64(uint32(max(sa, sb)))<<32
			s2 := outside
			if o := he[e]; o >= 0 {
				s2 = rank[o/3]
			}
			sides[i] = uint64(uint32(rank[e/3])) | uint64(uint32(s2))<<32
			keys[i] = math.Float64bits(fromOrderedBits(keys[i]))
		}
	})
	// The two union-find passes are independent: side by side.
	merged := make(chan struct{})
	go func() {
		p.Merges = powerKruskal(t, f, vends, keys)
		close(merged)
	}()
	recs := persistDual(nt, tkeys, keys, ends, sides)
	order := persistHoleOrder(recs)
	<-merged
	holes := persistHoleList(t, &Filtration{centre: f.centre}, recs, order, tids)
	p.Holes = make([]PowerHole, len(holes))
	for i, h := range holes {
		p.Holes[i] = PowerHole{Birth: h.Birth, Death: h.Death, DeathPoint: h.DeathPoint, BirthSites: h.BirthSites,
			deathTri: tids[recs[order[i]].rank]}
	}
	return p
}

// powerEdgeKeys returns the first half-edge of every edge (the one with
// the larger index, or the only one on the hull), in half-edge order, and
// the edge's value as orderedBits; chunks of half-edges are counted and
// filled in parallel.
func powerEdgeKeys(he []int32, edge []float64) ([]int32, []uint64) {
	const chunk = 1 << 16
	nc := (len(he) + chunk - 1) / chunk
	start := make([]int, nc+1)
	planar.ParallelChunks(len(he), chunk, 0, func(ci, lo, hi int) {
		for e := lo; e < hi; e++ {
			if he[e] < int32(e) {
				start[ci+1]++
			}
		}
	})
	for ci := range nc {
		start[ci+1] += start[ci]
	}
	ids := make([]int32, start[nc])
	keys := make([]uint64, start[nc])
	planar.ParallelChunks(len(he), chunk, 0, func(ci, lo, hi int) {
		k := start[ci]
		for e := lo; e < hi; e++ {
			if he[e] < int32(e) {
				ids[k], keys[k] = int32(e), orderedBits(edge[e])
				k++
			}
		}
	})
	return ids, keys
}

// powerKruskal runs the elder-rule union-find over the vertices along the
// edges (vertex pairs packed in vends, the bits of their values in vals,
// in filtration order).
func powerKruskal(t *planar.Triangulation, f *PowerFiltration, vends, vals []uint64) []PowerMerge {
	nv := t.NumVertices()
	uf := planar.NewUnionFind(nv)
	birth := slices.Clone(f.Vertex)
	out := make([]PowerMerge, 0, max(nv-1, 0))
	for i, ab := range vends {
		a, b := uf.Find(int32(uint32(ab))), uf.Find(int32(ab>>32))
		if a == b {
			continue
		}
		// The younger root (later birth; ties: the larger index) dies.
		young, old := a, b
		if birth[a] < birth[b] || birth[a] == birth[b] && a < b {
			young, old = b, a
		}
		out = append(out, PowerMerge{Birth: birth[young], Death: math.Float64frombits(vals[i]),
			Sites: persistSitePair(t.Source[int32(uint32(ab))], t.Source[int32(ab>>32)])})
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
