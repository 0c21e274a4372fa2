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
//     (on a Delaunay graph a vertex with no nearer neighbour is nearest; on
//     a regular triangulation, by power, the same holds).
//   - halfOffset, power, cellPoint, cocircular: where a power diagram
//     differs from the Voronoi diagram (weights nil: the Voronoi case).

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
			var x, y, eb, r2 float64
			if c.wt == nil {
				x, y, eb = CircumcentreErr(c.xy[2*a], c.xy[2*a+1], c.xy[2*b], c.xy[2*b+1], c.xy[2*d], c.xy[2*d+1])
				r2 = dist2(x, y, c.xy[2*a], c.xy[2*a+1])
			} else {
				x, y, eb = powerCentreErr(c.xy[2*a], c.xy[2*a+1], c.wt[a], c.xy[2*b], c.xy[2*b+1], c.wt[b], c.xy[2*d], c.xy[2*d+1], c.wt[d])
				// The largest distance to a vertex bounds the distance to
				// the vertex shared with any neighbouring triangle.
				r2 = max(dist2(x, y, c.xy[2*a], c.xy[2*a+1]), dist2(x, y, c.xy[2*b], c.xy[2*b+1]), dist2(x, y, c.xy[2*d], c.xy[2*d+1]))
			}
			c.cc[2*i], c.cc[2*i+1], errb[i] = x, y, eb
			// A Voronoi edge is at most R1 + R2 long (R the circumradii;
			// for a power edge between the centres c1, c2 of two
			// triangles sharing vertex a, |c1 − c2| ≤ |c1 − a| + |a − c2|
			// with R the largest distance from a centre to its
			// triangle's vertices): one between two small circles near
			// no ring edge cannot meet one (see markCrossedEdges).
			fq, fr := math.Floor((x-g.x0)/g.cw), math.Floor((y-g.y0)/g.ch)
			near := false
			if fq >= -1 && fq <= float64(g.nx) && fr >= -1 && fr <= float64(g.ny) {
				q, r := min(max(int(fq), 0), g.nx-1), min(max(int(fr), 0), g.ny-1)
				near = occupied[r*g.nx+q]
			}
			if r2 >= 0.25*small*small*clipNearMargin {
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
			if c.cocircular(a, b, cc, d) {
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

// cocircular reports whether the lifts of a, b, c, d are exactly coplanar
// (InCircle, or PowerTest for a power diagram, without perturbation): the
// two triangles then share one circumcentre or power centre.
func (c *clipper) cocircular(a, b, cc, d int32) bool {
	xy := c.xy
	if c.wt == nil {
		return InCircle(xy[2*a], xy[2*a+1], xy[2*b], xy[2*b+1], xy[2*cc], xy[2*cc+1], xy[2*d], xy[2*d+1]) == 0
	}
	w := c.wt
	return PowerTest(xy[2*a], xy[2*a+1], w[a], xy[2*b], xy[2*b+1], w[b], xy[2*cc], xy[2*cc+1], w[cc], xy[2*d], xy[2*d+1], w[d]) == 0
}

// halfOffset is h in the half-plane (x − p_v)·n − h ≤ 0 of the cell of v
// against neighbour j, n = p_j − p_v = (nx, ny): |n|²/2 for a Voronoi cell
// (the bisector), (|n|² + w_v − w_j)/2 for a power cell (the power line,
// from |x − p_v|² − w_v ≤ |x − p_j|² − w_j).
func (c *clipper) halfOffset(v, j int32, nx, ny float64) float64 {
	if c.wt == nil {
		return 0.5 * (nx*nx + ny*ny)
	}
	return 0.5 * (nx*nx + ny*ny + (c.wt[v] - c.wt[j]))
}

// power returns the power of (x, y) with respect to vertex v: the squared
// distance, less the weight for a power diagram.
func (c *clipper) power(v int32, x, y float64) float64 {
	d := dist2(c.xy[2*v], c.xy[2*v+1], x, y)
	if c.wt != nil {
		d -= c.wt[v]
	}
	return d
}

// cellPoint returns a point of the closed cell of v for the point-in-area
// test that decides a cell meeting no ring edge: the site for a Voronoi
// cell (strictly inside it). A power cell may not hold its site; then the
// mean of its corners (power centres), or in the collinear case a point
// between its two power lines on the line of the sites.
func (c *clipper) cellPoint(v int32, nb, tri []int32) (x, y float64) {
	if c.wt == nil {
		return c.xy[2*v], c.xy[2*v+1]
	}
	var bounded bool
	nb, tri, bounded = c.around(v, nb, tri)
	return c.cellPointOf(v, nb, tri, bounded)
}

// cellPointOf is cellPoint given v's neighbours and triangles (around). An
// unbounded cell's corner mean is moved along the sum of its two rays'
// directions (the outward normals of its hull edges, in the cell's
// recession cone) by the spread of its corners, off its boundary.
func (c *clipper) cellPointOf(v int32, nb, tri []int32, bounded bool) (x, y float64) {
	px, py := c.xy[2*v], c.xy[2*v+1]
	if c.wt == nil {
		return px, py
	}
	if len(tri) > 0 {
		for _, k := range tri {
			x += c.cc[2*k]
			y += c.cc[2*k+1]
		}
		x, y = x/float64(len(tri)), y/float64(len(tri))
		if bounded {
			return x, y
		}
		spread := 1.0
		for _, k := range tri {
			spread += math.Abs(c.cc[2*k]-x) + math.Abs(c.cc[2*k+1]-y)
		}
		// Hull edges v → nb[0] and nb[last] → v, interior on the left:
		// outward normals (dy, −dx).
		a, b := nb[0], nb[len(nb)-1]
		d1x, d1y := c.xy[2*a]-px, c.xy[2*a+1]-py
		d2x, d2y := px-c.xy[2*b], py-c.xy[2*b+1]
		l1, l2 := math.Hypot(d1x, d1y), math.Hypot(d2x, d2y)
		ux, uy := d1y/l1+d2y/l2, -d1x/l1-d2x/l2
		return x + spread*ux, y + spread*uy
	}
	// Collinear: along n = p_j − p_v the power line with j is at the
	// fraction s = (|n|² + w_v − w_j)/(2|n|²) of n.
	var s [2]float64
	var n [2][2]float64
	for i, j := range nb {
		nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
		n[i] = [2]float64{nx, ny}
		s[i] = c.halfOffset(v, j, nx, ny) / (nx*nx + ny*ny)
	}
	switch len(nb) {
	case 1:
		s[0]--
		return px + s[0]*n[0][0], py + s[0]*n[0][1]
	case 2:
		return px + 0.5*(s[0]*n[0][0]+s[1]*n[1][0]), py + 0.5*(s[0]*n[0][1]+s[1]*n[1][1])
	}
	return px, py
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

// nearest returns the site nearest (x, y) (of smallest power, for a power
// diagram) by greedy descent over the triangulation's neighbours from hint:
// a cell is the intersection of the half-planes of its neighbours, so a
// vertex with no neighbour of smaller power holds (x, y) in its cell.
func (c *clipper) nearest(x, y float64, hint int32, nb, tri []int32) int32 {
	v := hint
	d := c.power(v, x, y)
	for steps := 0; steps <= c.nv; steps++ {
		nb, tri, _ = c.around(v, nb, tri)
		best, bd := v, d
		for _, j := range nb {
			if dj := c.power(j, x, y); dj < bd {
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
