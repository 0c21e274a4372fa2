// ClipCells, diagram preparation: what every cell's clipping shares.
//
//   - circumcentres: the Voronoi vertices, one per Delaunay triangle,
//     computed from the vertex of the largest angle (CircumcentreErr, with
//     its error bound). Triangles whose circumcircles are exactly the same
//     (adjacent triangles of four cocircular sites, decided by the exact
//     InCircle where the two computed centres agree within their bounds)
//     form one class and share the centre of its smallest triangle
//     (UnionFind.UnionMin), so zero-length Voronoi edges are exactly zero.
//     Each triangle is also marked "near" when its centre lies in or next to
//     a grid cell holding a ring edge, or its circumradius is at least half
//     a cell: only the Voronoi edges of near triangles can meet a ring edge.
//   - around: a site's Delaunay neighbours counter-clockwise, which are its
//     Voronoi cell's edges in order.
//   - prepareRegion: ring adjacency, the erosion miter of every ring vertex
//     (the direction it moves when every edge moves inward by δ, used by the
//     symbolic perturbation described in clip.go), and the edge grids.
//   - nearest: greedy descent over Delaunay neighbours to the nearest site
//     (on a Delaunay graph a vertex with no nearer neighbour is nearest).

package planar

import (
	"math"
	"slices"
	"sync"
)

const (
	// clipMiterMinDen bounds the miter denominator 1 + L1·L2 away from
	// zero: it vanishes only where a ring doubles back on itself (a
	// spike, which NewRegion rejects), and then the miter is merely
	// long, never infinite.
	clipMiterMinDen = 1e-300
	// clipNearMargin makes the test "circumradius at least half a grid
	// cell" err on the side of near: comparing squared lengths 1% early
	// covers their rounding (a few ulps) many times over.
	clipNearMargin = 0.99
)

// circumcentres computes the circumcentre of every triangle. Triangles that
// share a circumcircle (adjacent across an edge whose four points are
// exactly cocircular, by InCircle) share one representative and one
// computed centre, so zero-length Voronoi edges are exactly zero. InCircle
// is only evaluated where the two computed centres agree within their
// rounding-error bounds; elsewhere the circles certainly differ.
func (c *clipper) circumcentres() {
	t := c.t
	nt := len(t.Triangles) / 3
	c.class = make([]int32, nt)
	c.cc = make([]float64, 2*nt)
	errb := make([]float64, nt)
	// Grid cells with a ring edge in them or in a neighbouring cell.
	g := &c.fine
	occupied := make([]bool, g.nx*g.ny)
	for r := 0; r < g.ny; r++ {
		for q := 0; q < g.nx; q++ {
			cell := r*g.nx + q
			if g.cellStart[cell] == g.cellStart[cell+1] {
				continue
			}
			for dr := -1; dr <= 1; dr++ {
				for dq := -1; dq <= 1; dq++ {
					if rr, qq := r+dr, q+dq; rr >= 0 && rr < g.ny && qq >= 0 && qq < g.nx {
						occupied[rr*g.nx+qq] = true
					}
				}
			}
		}
	}
	small := math.Min(g.cw, g.ch)
	c.near = make([]bool, nt)
	ParallelChunks(nt, 1<<15, c.workers, func(_, lo, hi int) {
		for i := lo; i < hi; i++ {
			c.class[i] = int32(i)
			a, b, d := t.Triangles[3*i], t.Triangles[3*i+1], t.Triangles[3*i+2]
			// Work from the vertex opposite the longest edge (the largest
			// angle): its two edges meet at ≥ 60°, so their cross product
			// has no cancellation even for a needle triangle.
			lab := dist2(c.xy[2*a], c.xy[2*a+1], c.xy[2*b], c.xy[2*b+1])
			lbd := dist2(c.xy[2*b], c.xy[2*b+1], c.xy[2*d], c.xy[2*d+1])
			lda := dist2(c.xy[2*d], c.xy[2*d+1], c.xy[2*a], c.xy[2*a+1])
			switch {
			case lda >= lab && lda >= lbd:
				a, b, d = b, d, a
			case lab >= lbd && lab >= lda:
				a, b, d = d, a, b
			}
			x, y, eb := CircumcentreErr(c.xy[2*a], c.xy[2*a+1], c.xy[2*b], c.xy[2*b+1], c.xy[2*d], c.xy[2*d+1])
			c.cc[2*i], c.cc[2*i+1], errb[i] = x, y, eb
			// A Voronoi edge is at most R1 + R2 long (R the circumradii):
			// one between two small circles near no ring edge cannot
			// meet one (see markCrossedEdges).
			// A Voronoi edge is at most R1 + R2 long (R the circumradii);
			// see markCrossedEdges.
			fq, fr := math.Floor((x-g.x0)/g.cw), math.Floor((y-g.y0)/g.ch)
			near := false
			if fq >= -1 && fq <= float64(g.nx) && fr >= -1 && fr <= float64(g.ny) {
				q, r := min(max(int(fq), 0), g.nx-1), min(max(int(fr), 0), g.ny-1)
				near = occupied[r*g.nx+q]
			}
			if dist2(x, y, c.xy[2*a], c.xy[2*a+1]) >= 0.25*small*small*clipNearMargin {
				near = true
			}
			c.near[i] = near
		}
	})
	// Cocircular interior edges, found in parallel, merged in order.
	var mu sync.Mutex
	var pairs [][2]int32
	ParallelChunks(len(t.Halfedges), 1<<16, c.workers, func(_, lo, hi int) {
		var local [][2]int32
		for e := lo; e < hi; e++ {
			o := t.Halfedges[e]
			if o < int32(e) {
				continue
			}
			tr, to := e/3, o/3
			tol := errb[tr] + errb[to]
			if math.Abs(c.cc[2*tr]-c.cc[2*to]) > tol || math.Abs(c.cc[2*tr+1]-c.cc[2*to+1]) > tol {
				continue
			}
			a, b, cc := t.Triangles[3*tr], t.Triangles[3*tr+1], t.Triangles[3*tr+2]
			d := t.Triangles[PrevHalfedge(o)]
			if InCircle(c.xy[2*a], c.xy[2*a+1], c.xy[2*b], c.xy[2*b+1], c.xy[2*cc], c.xy[2*cc+1], c.xy[2*d], c.xy[2*d+1]) == 0 {
				local = append(local, [2]int32{int32(tr), to})
			}
		}
		if len(local) > 0 {
			mu.Lock()
			pairs = append(pairs, local...)
			mu.Unlock()
		}
	})
	if len(pairs) == 0 {
		return
	}
	// The smallest triangle of each class is its representative.
	uf := UnionFind{Parent: c.class}
	for _, p := range pairs {
		uf.UnionMin(p[0], p[1])
	}
	for i, k := range uf.Flatten() {
		c.cc[2*i], c.cc[2*i+1] = c.cc[2*k], c.cc[2*k+1]
	}
}

// around lists the Delaunay neighbours of v counter-clockwise in nb and, in
// tri, the triangle between nb[k] and nb[k+1] (cyclically when bounded).
// For a hull vertex nb starts at its hull successor and ends at its hull
// predecessor and len(tri) = len(nb)-1. In the collinear case nb holds the
// line neighbours and tri is empty; bounded is then false.
func (c *clipper) around(v int32, nb, tri []int32) ([]int32, []int32, bool) {
	nb, tri = nb[:0], tri[:0]
	if c.collinear {
		p := c.hullPos[v]
		if p > 0 {
			nb = append(nb, c.t.Hull[p-1])
		}
		if int(p)+1 < len(c.t.Hull) {
			nb = append(nb, c.t.Hull[p+1])
		}
		return nb, tri, false
	}
	t := c.t
	e0 := t.Inedge[v]
	e := e0
	bounded := false
	for steps := 0; ; steps++ {
		nb = append(nb, t.Triangles[e])
		tri = append(tri, e/3)
		o := NextHalfedge(e)
		e = t.Halfedges[o]
		if e == -1 {
			nb = append(nb, t.Triangles[NextHalfedge(o)])
			break
		}
		if e == e0 || steps > len(t.Halfedges) {
			bounded = true
			break
		}
	}
	slices.Reverse(nb)
	slices.Reverse(tri)
	if bounded && len(tri) > 1 {
		// tri[k] must lie between nb[k] and nb[k+1]: rotate left by one.
		first := tri[0]
		copy(tri, tri[1:])
		tri[len(tri)-1] = first
	}
	return nb, tri, bounded
}

// prepareRegion builds ring adjacency and the point-location grid.
func (c *clipper) prepareRegion() {
	r := c.r
	m := len(r.XY) / 2
	c.rnext = make([]int32, m)
	c.rprev = make([]int32, m)
	c.rring = make([]int32, m)
	for k := 0; k < r.NumRings(); k++ {
		s, e := r.RingStart[k], r.RingStart[k+1]
		for i := s; i < e; i++ {
			c.rnext[i], c.rprev[i], c.rring[i] = i+1, i-1, int32(k)
		}
		c.rnext[e-1], c.rprev[s] = s, e-1
	}
	// Miter vectors: moving every edge to its left (into the area) by δ
	// moves vertex i by δ·w_i with w = (L1 + L2)/(1 + L1·L2), L1 and L2
	// the unit left normals of its two edges.
	c.miter = make([]float64, 2*m)
	for i := int32(0); int(i) < m; i++ {
		p, q := c.rprev[i], c.rnext[i]
		x, y := r.XY[2*i], r.XY[2*i+1]
		d1x, d1y := x-r.XY[2*p], y-r.XY[2*p+1]
		d2x, d2y := r.XY[2*q]-x, r.XY[2*q+1]-y
		l1, l2 := math.Hypot(d1x, d1y), math.Hypot(d2x, d2y)
		ax, ay := -d1y/l1, d1x/l1
		bx, by := -d2y/l2, d2x/l2
		den := 1 + ax*bx + ay*by
		if !(den > clipMiterMinDen) {
			den = clipMiterMinDen
		}
		c.miter[2*i], c.miter[2*i+1] = (ax+bx)/den, (ay+by)/den
	}
	c.grid.build(r.XY, r.RingStart)
	if !c.collinear {
		c.fine.buildDensity(r.XY, r.RingStart, 16)
	}
}

// nearest returns the site nearest (x, y) by greedy descent over Delaunay
// neighbours from hint (which finds the nearest site on a Delaunay graph).
func (c *clipper) nearest(x, y float64, hint int32, nb, tri []int32) int32 {
	v := hint
	d := dist2(c.xy[2*v], c.xy[2*v+1], x, y)
	for steps := 0; steps <= c.nv; steps++ {
		nb, tri, _ = c.around(v, nb, tri)
		best, bd := v, d
		for _, j := range nb {
			if dj := dist2(c.xy[2*j], c.xy[2*j+1], x, y); dj < bd {
				best, bd = j, dj
			}
		}
		if best == v {
			break
		}
		v, d = best, bd
	}
	return v
}
