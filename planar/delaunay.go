// Delaunay triangulation of a planar point set.
//
// A triangulation of the points is Delaunay when the circumcircle of every
// triangle holds no point strictly inside. By Delaunay's lemma it suffices
// that every interior edge is locally Delaunay: the vertex opposite the
// edge in one triangle is not strictly inside the circumcircle of the other
// (Lawson, "Software for C1 surface interpolation", 1977; de Berg et al.,
// Computational Geometry, 3rd ed., ch. 9).
//
// Construction is incremental insertion (Guibas, Knuth & Sharir 1992) in a
// biased randomized insertion order along a Hilbert curve (Amenta, Choi &
// Rote 2003), with point location by a visibility walk, Lawson flips for
// points inside the current hull and the sweep-hull step of Sinclair (2010)
// for points outside it, all in the flat half-edge layout popularised by
// Agafonkin's Delaunator (see delaunay_insert.go). Large inputs use both
// CPUs: the last rounds are inserted by two workers on the two sides of a
// vertical line, each by Bowyer–Watson cavity retriangulation (Bowyer 1981;
// Watson 1981) in triangles it owns (delaunay_parallel.go), with the same
// result for any number of CPUs. Every geometric decision
// is an exact predicate (Orient2D, InCircle), so the output is a true
// Delaunay triangulation for every finite input, with no tolerance.
//
// Degenerate input. Exact duplicates are merged into one vertex (Vertex and
// Source record the mapping). Four or more cocircular points admit several
// Delaunay triangulations; an edge is flipped only when InCircle is strictly
// positive, so the flip sequence, and the result, depend only on the input
// order and are the same on every run. When all points are collinear there
// is no triangle and Hull lists the vertices along the line.
//
// Error bounds: none; all decisions are exact. Coordinates are never
// translated or scaled before a predicate is evaluated.

package planar

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// Triangulate returns the Delaunay triangulation of pts.
//
// Exact duplicate points are merged: vertices are numbered in order of first
// appearance, so without duplicates vertex i is pts[i]. Any number of points
// is accepted; with fewer than three distinct points, or when all are
// collinear, the result has no triangle and Hull lists the vertices in order
// along their line. A NaN or infinite coordinate is an error naming the
// point.
func Triangulate(pts []orb.Point) (*Triangulation, error) {
	n := len(pts)
	if int64(n) > math.MaxInt32/3 {
		return nil, fmt.Errorf("planar: Triangulate: %d points is more than the supported %d", n, math.MaxInt32/3)
	}
	for i, p := range pts {
		for k := 0; k < 2; k++ {
			c := p[k]
			axis := "x"
			if k == 1 {
				axis = "y"
			}
			if math.IsNaN(c) {
				return nil, fmt.Errorf("planar: Triangulate: point %d: %s coordinate is NaN", i, axis)
			}
			if math.IsInf(c, 0) {
				return nil, fmt.Errorf("planar: Triangulate: point %d: %s coordinate is infinite", i, axis)
			}
		}
	}
	if n == 0 {
		return &Triangulation{
			Coords: []float64{}, Vertex: []int32{}, Source: []int32{},
			Triangles: []int32{}, Halfedges: []int32{}, Hull: []int32{}, Inedge: []int32{},
		}, nil
	}
	box := boundingBox(pts)
	i0, i1, i2 := seedTriangle(pts, box)
	if i2 < 0 {
		return triangulateCollinear(pts), nil
	}
	return triangulateIncremental(pts, box, i0, i1, i2)
}

// seedTriangle picks the first triangle: i0 is the point
// nearest the centre of the bounding box, i1 the point nearest i0 with other
// coordinates, and i2 the point forming with them the smallest circumcircle
// among the points not exactly collinear with i0 and i1 (as in Sinclair's
// sweep-hull).
// Each is the smallest index among equal candidates. It returns i2 = -1 when
// every point lies on one line (or there are fewer than three distinct
// points). The returned triangle is counter-clockwise.
func seedTriangle(pts []orb.Point, box bbox) (i0, i1, i2 int32) {
	cx, cy := box.minX/2+box.maxX/2, box.minY/2+box.maxY/2
	i0 = argmin(len(pts), func(lo, hi int) (float64, int32) {
		best, bi := math.Inf(1), int32(-1)
		for i := lo; i < hi; i++ {
			p := pts[i]
			if d := dist2(p[0], p[1], cx, cy); d < best || bi < 0 {
				best, bi = d, int32(i)
			}
		}
		return best, bi
	})
	p0 := pts[i0]
	i1 = argmin(len(pts), func(lo, hi int) (float64, int32) {
		best, bi := math.Inf(1), int32(-1)
		for i := lo; i < hi; i++ {
			p := pts[i]
			if p == p0 {
				continue
			}
			if d := dist2(p[0], p[1], p0[0], p0[1]); d < best || bi < 0 {
				best, bi = d, int32(i)
			}
		}
		return best, bi
	})
	if i1 < 0 {
		return i0, -1, -1
	}
	p1 := pts[i1]
	i2 = argmin(len(pts), func(lo, hi int) (float64, int32) {
		best, bi := math.Inf(1), int32(-1)
		for i := lo; i < hi; i++ {
			p := pts[i]
			r := circumradius2(p0[0], p0[1], p1[0], p1[1], p[0], p[1])
			if bi >= 0 && !(r < best) {
				continue
			}
			// The float radius only ranks candidates; collinearity is
			// decided exactly.
			if Orient2D(p0[0], p0[1], p1[0], p1[1], p[0], p[1]) == 0 {
				continue
			}
			best, bi = r, int32(i)
		}
		return best, bi
	})
	if i2 < 0 {
		return i0, i1, -1
	}
	if Orient2D(p0[0], p0[1], p1[0], p1[1], pts[i2][0], pts[i2][1]) < 0 {
		i1, i2 = i2, i1
	}
	return i0, i1, i2
}

// argmin runs chunk over [0, n) split into contiguous ranges (in parallel
// for large n); each returns its smallest value and the first index
// reaching it (-1 for none). The result is the first index of the overall
// minimum, the same as one sequential pass.
func argmin(n int, chunk func(lo, hi int) (float64, int32)) int32 {
	if n < 1<<16 {
		_, i := chunk(0, n)
		return i
	}
	const parts = 8
	var vals [parts]float64
	var idx [parts]int32
	ParallelFor(parts, 1, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			vals[k], idx[k] = chunk(n*k/parts, n*(k+1)/parts)
		}
	})
	best, bi := math.Inf(1), int32(-1)
	for k := 0; k < parts; k++ {
		if idx[k] >= 0 && (bi < 0 || vals[k] < best) {
			best, bi = vals[k], idx[k]
		}
	}
	return bi
}

func dist2(ax, ay, bx, by float64) float64 {
	dx, dy := ax-bx, ay-by
	return dx*dx + dy*dy
}

// circumradius2 returns the squared circumradius of triangle abc in floating
// point (+Inf or NaN when degenerate); used only to rank seed candidates.
func circumradius2(ax, ay, bx, by, cx, cy float64) float64 {
	dx, dy := bx-ax, by-ay
	ex, ey := cx-ax, cy-ay
	bl := dx*dx + dy*dy
	cl := ex*ex + ey*ey
	d := 0.5 / (dx*ey - dy*ex)
	x := (ey*bl - dy*cl) * d
	y := (dx*cl - ex*bl) * d
	r := x*x + y*y
	if math.IsNaN(r) {
		return math.Inf(1)
	}
	return r
}

// numberVertices fills vertex (input -> vertex) and returns source
// (vertex -> smallest input index) given rep, where rep[i] is the smallest
// input index with the same coordinates as input i (rep[i] <= i). vertex
// may alias rep.
func numberVertices(rep, vertex []int32) (source []int32) {
	m := 0
	for i, r := range rep {
		if r == int32(i) {
			m++
		}
	}
	source = make([]int32, m)
	next := int32(0)
	for i := range rep {
		r := rep[i]
		if r == int32(i) {
			vertex[i] = next
			source[next] = int32(i)
			next++
		} else {
			vertex[i] = vertex[r]
		}
	}
	return source
}

// triangulateCollinear handles inputs with fewer than three distinct points
// or all points on one line: vertices are sorted lexicographically by
// (x, y), which is their order along the line.
func triangulateCollinear(pts []orb.Point) *Triangulation {
	n := len(pts)
	idx := make([]int32, n)
	for i := range idx {
		idx[i] = int32(i)
	}
	slices.SortFunc(idx, func(a, b int32) int {
		pa, pb := pts[a], pts[b]
		switch {
		case pa[0] < pb[0]:
			return -1
		case pa[0] > pb[0]:
			return 1
		case pa[1] < pb[1]:
			return -1
		case pa[1] > pb[1]:
			return 1
		}
		return int(a) - int(b)
	})
	vertex := make([]int32, n)
	for k, i := range idx {
		if k > 0 && pts[idx[k-1]] == pts[i] {
			vertex[i] = vertex[idx[k-1]] // smallest index of the run
		} else {
			vertex[i] = i
		}
	}
	source := numberVertices(vertex, vertex)
	m := len(source)
	t := &Triangulation{
		Coords:    make([]float64, 2*m),
		Vertex:    vertex,
		Source:    source,
		Triangles: []int32{},
		Halfedges: []int32{},
		Hull:      make([]int32, 0, m),
		Inedge:    make([]int32, m),
	}
	for v, i := range source {
		t.Coords[2*v], t.Coords[2*v+1] = pts[i][0], pts[i][1]
		t.Inedge[v] = -1
	}
	for k, i := range idx {
		if k == 0 || vertex[i] != vertex[idx[k-1]] {
			t.Hull = append(t.Hull, vertex[i])
		}
	}
	return t
}

// Duplicates returns the groups of input indices that were merged into one
// vertex because their points are equal, each group in increasing order and
// the groups in order of their vertex. Inputs without a duplicate are not
// listed; the result is empty when all points are distinct. Inputs that
// are hidden in a regular triangulation (Vertex −1) are not listed either
// (RegularTriangulation.Hidden lists them).
func (t *Triangulation) Duplicates() [][]int32 {
	m := len(t.Source)
	if len(t.Vertex) == m {
		return nil
	}
	count := make([]int32, m)
	for _, v := range t.Vertex {
		if v >= 0 { // -1: hidden in a regular triangulation
			count[v]++
		}
	}
	var groups [][]int32
	slot := make([]int32, m)
	for v := range count {
		slot[v] = -1
		if count[v] > 1 {
			slot[v] = int32(len(groups))
			groups = append(groups, make([]int32, 0, count[v]))
		}
	}
	for i, v := range t.Vertex {
		if v < 0 {
			continue
		}
		if s := slot[v]; s >= 0 {
			groups[s] = append(groups[s], int32(i))
		}
	}
	return groups
}
