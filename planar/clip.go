// Voronoi cells clipped to the site area.
//
// The Voronoi cell of site v is the convex set of points at least as close
// to v as to any other site. Only the Delaunay neighbours j of v matter, so
// the cell is the intersection of the half-planes
//
//	g_j(x) = (x − p_v)·(p_j − p_v) − |p_j − p_v|²/2 ≤ 0,
//
// and, listing the neighbours counter-clockwise, its boundary runs along
// the bisectors in that order; its corners are the circumcentres of v's
// Delaunay triangles (Voronoi 1908; Okabe, Boots, Sugihara & Chiu, Spatial
// Tessellations, 2nd ed., 2000, ch. 2). A hull site's cell is unbounded: its
// first and last edges are rays along the bisectors with its hull
// neighbours. When all sites are collinear there is no triangle and each
// cell is the slab between the bisectors with its neighbours along the line.
//
// Clipping a convex cell C to the site area A (non-convex, with holes and
// several parts) follows the boundary-tracing scheme of Weiler & Atherton
// ("Hidden surface removal using polygon area sorting", SIGGRAPH 1977)
// specialised to a convex clip window, with Cyrus–Beck parameters for the
// crossings (Cyrus & Beck, "Generalized two- and three-dimensional
// clipping", Computers & Graphics 3, 1978):
//
//  1. Each ring vertex is classified once per cell, inside C when every
//     g_j is negative (a zero counts by the perturbation below). A maximal run of ring edges with inside vertices is a
//     chain; a chain starts at an entry point (where its first edge crosses
//     into C, at the largest Cyrus–Beck parameter over the half-planes the
//     edge enters) and ends at an exit point (smallest parameter over the
//     half-planes it leaves). An edge with both ends outside may still cut
//     through C and forms a one-edge chain. A ring with every vertex inside
//     is kept whole.
//  2. Entry and exit points lie on C's boundary. Sorted counter-clockwise
//     along it (by cell edge, then by position along the bisector), each
//     exit is followed by an entry: the area lies to the left of its rings,
//     so it occupies the boundary stretch from an exit to the next entry.
//     Rings of C ∩ A are traced chain, boundary stretch, chain, ... with the
//     cell's corners inserted along each stretch. These rings touch C's
//     boundary and are exteriors; no piece is joined to another by a
//     zero-width bridge.
//  3. Whole rings inside C are islands (counter-clockwise) or holes
//     (clockwise); a hole goes to the smallest exterior holding it. If no
//     chain touches C's boundary, C's boundary is inside A exactly when the
//     largest whole ring is a hole (or, with no ring, when the site is in A),
//     and then C itself is an exterior.
//
// Degeneracies. Each decision uses one sign per (vertex, half-plane), so the
// chain structure is always consistent. Exact contacts (a ring vertex on a
// bisector or at a Voronoi vertex, a ring edge along a bisector or through
// a Voronoi vertex) are resolved as if the area were eroded by an
// infinitesimal δ (every ring edge moved to its left, vertices along their
// miter vectors): a zero g_j takes the sign of its δ-derivative, ties
// between Cyrus–Beck parameters are broken by their derivatives, and
// events at one point are ordered by their velocity — symbolic
// perturbation in the spirit of Edelsbrunner & Mücke (ACM TOG 9, 1990).
// Consequences: a ring edge lying on a bisector belongs to the cell on its
// area side and is labelled as boundary there; a hole touching a cell edge
// is cut open rather than left touching the exterior; a ring traced
// through one point twice (the area's boundary touching a cell edge at a
// vertex) is split there into an exterior and a hole touching it at that
// point, as OGC allows. Near (not exact) ties are settled geometrically:
// crossing points are interpolated from the endpoint nearer the bisector
// and ordered exactly by their offsets when they share it; each event is
// placed on the cell edge whose extent holds it (two almost coincident
// bisectors, from near-duplicate sites, make the winning one arbitrary); a
// chain that leaves by the edge it came in by is ordered by its own
// orientation (exact Orient2D for a one-vertex dip); a piece shorter than
// 2⁻⁴⁰ of an edge through a cell corner is dropped (no area beyond
// rounding); rings of area within rounding of zero, zero-length edges and
// vertices between two edges on one bisector are removed. Cocircular
// Delaunay triangles (grids) are detected with the exact InCircle
// predicate and share one circumcentre, so zero-length cell edges vanish
// exactly. Circumcentres are computed from the vertex opposite the longest
// edge, which keeps needle triangles (near-duplicate sites) accurate.
//
// Speed. Most cells meet no ring. Each ring edge is walked through the
// diagram (start in the cell of the nearest site, leave each cell by the
// bisector the edge crosses first, recording near ties), then every
// Voronoi edge that could reach a ring edge (by a coarse grid and the
// circumradii bound on its length) is tested exactly against the ring
// edges, so every cell that a ring edge enters is marked; cells with a
// whole ring inside are the walk's start cells. Unmarked cells are
// whole-inside or whole-outside, decided once per group of unmarked cells
// joined by Voronoi edges of positive length with one point-in-area test.
// A marked cell is clipped against every ring edge registered in the grid
// cells overlapping its part of the area's bounding box (found by
// Sutherland–Hodgman clipping of that box), so no edge of it is missed.
// Sites are processed in parallel chunks whose outputs are concatenated in
// site order, so the result does not depend on the number of goroutines.
//
// Error bounds. Crossing points are within a few ulps of the exact
// intersection of the rounded bisector with the ring edge, and
// circumcentres within the bound CircumcentreErr computes (a few ulps of
// the triangle's size over its largest angle's sine); areas are shoelace
// sums relative to the site (relative error about k·u for a ring of k
// points, u = 2⁻⁵³). Clipped areas agree with GEOS to about 1e-13
// relative near the origin (7e-10 at UTM-sized coordinates, where GEOS's
// absolute-coordinate rounding dominates) and sum to the area of A to
// about 1e-15 relative.
package planar

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/paulmach/orb"
)

// ClipCells returns each site's Voronoi cell clipped to the site area r:
// for every vertex v of t, the polygons of (cell of v) ∩ r, with every ring
// edge labelled by its source (see Cells). Sites may lie outside r; their
// clipped cell is then often empty.
func ClipCells(t *Triangulation, r *Region) (*Cells, error) {
	cells, _, err := clipCells(t, r, 0)
	return cells, err
}

// NumSites returns the number of sites (triangulation vertices).
func (c *Cells) NumSites() int { return len(c.SiteStart) - 1 }

// NumPolygons returns the total number of polygons over all sites.
func (c *Cells) NumPolygons() int { return len(c.PolyStart) - 1 }

// NumRings returns the total number of rings over all polygons.
func (c *Cells) NumRings() int { return len(c.RingStart) - 1 }

// Ring returns the interleaved coordinates of ring k and the EdgeSource
// labels of its edges (sub-slices of XY and EdgeSource).
func (c *Cells) Ring(k int) (xy []float64, src []int32) {
	i, j := c.RingStart[k], c.RingStart[k+1]
	return c.XY[2*i : 2*j], c.EdgeSource[i:j]
}

// Polygons returns the clipped cell of vertex v as an orb.MultiPolygon with
// closed rings (first point repeated), exteriors counter-clockwise and
// holes clockwise; nil when the clipped cell is empty.
func (c *Cells) Polygons(v int32) orb.MultiPolygon {
	p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
	if p0 == p1 {
		return nil
	}
	mp := make(orb.MultiPolygon, 0, p1-p0)
	for p := p0; p < p1; p++ {
		poly := make(orb.Polygon, 0, c.PolyStart[p+1]-c.PolyStart[p])
		for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
			xy, _ := c.Ring(int(k))
			n := len(xy) / 2
			ring := make(orb.Ring, n+1)
			for i := 0; i < n; i++ {
				ring[i] = orb.Point{xy[2*i], xy[2*i+1]}
			}
			ring[n] = ring[0]
			poly = append(poly, ring)
		}
		mp = append(mp, poly)
	}
	return mp
}

// clipStats counts internal events of a clipping run, for tests.
type clipStats struct {
	crossed   int   // cells clipped by the general method
	inside    int   // cells emitted whole
	anomalies int64 // inconsistent boundary orders met (should be 0)
}

const (
	clipUnknown uint8 = iota
	clipCrossed
	clipInside
	clipOutside
)

// clipper holds the data shared by all cells of one ClipCells call.
type clipper struct {
	t         *Triangulation
	r         *Region
	nv        int
	xy        []float64
	collinear bool
	hullPos   []int32   // collinear case: position of each vertex in t.Hull
	cc        []float64 // circumcentre of each triangle (shared per circle)
	class     []int32   // representative triangle of each triangle's circle
	near      []bool    // circumcentre within a cell of a ring edge, or large circle

	rnext, rprev, rring []int32
	miter               []float64 // per ring vertex: offset direction under erosion
	grid                regionGrid
	fine                regionGrid // 16 cells per vertex, for Voronoi-edge tests

	state     []uint8
	pairSite  []int32 // crossed (site, ring edge) pairs, sorted
	pairEdge  []int32
	workers   int
	anomalies atomic.Int64
}

// clipCells is ClipCells with statistics; workers ≤ 0 means GOMAXPROCS.
func clipCells(t *Triangulation, r *Region, workers int) (*Cells, clipStats, error) {
	var st clipStats
	if t == nil || r == nil {
		return nil, st, errors.New("planar: ClipCells: nil triangulation or region")
	}
	if err := clipCheckInput(t, r); err != nil {
		return nil, st, err
	}
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	c := &clipper{t: t, r: r, nv: t.NumVertices(), xy: t.Coords, workers: workers}
	c.collinear = len(t.Triangles) == 0
	if c.nv == 0 {
		return &Cells{SiteStart: []int32{0}, PolyStart: []int32{0}, RingStart: []int32{0},
			XY: []float64{}, EdgeSource: []int32{}, Area: []float64{}}, st, nil
	}
	c.prepareRegion()
	if c.collinear {
		c.hullPos = make([]int32, c.nv)
		for i, v := range t.Hull {
			c.hullPos[v] = int32(i)
		}
	} else {
		c.circumcentres()
	}
	c.walkBoundary()
	c.markCrossedEdges()
	c.classify()
	cells := c.assemble(&st)
	st.anomalies = c.anomalies.Load()
	return cells, st, nil
}

// clipCheckInput checks the array shapes that ClipCells relies on.
func clipCheckInput(t *Triangulation, r *Region) error {
	nv := len(t.Coords) / 2
	if len(t.Coords)%2 != 0 || len(t.Inedge) != nv || len(t.Halfedges) != len(t.Triangles) || len(t.Triangles)%3 != 0 {
		return errors.New("planar: ClipCells: triangulation arrays have inconsistent lengths")
	}
	if len(t.Triangles) == 0 && len(t.Hull) != nv {
		return fmt.Errorf("planar: ClipCells: triangulation has no triangle but its hull lists %d of %d vertices", len(t.Hull), nv)
	}
	if len(t.Triangles) > 0 {
		for v, e := range t.Inedge {
			if e < 0 || int(e) >= len(t.Triangles) {
				return fmt.Errorf("planar: ClipCells: triangulation vertex %d has no triangle", v)
			}
		}
	}
	if len(r.RingStart) < 2 || len(r.PolyStart) < 2 || r.RingStart[0] != 0 ||
		int(r.RingStart[len(r.RingStart)-1]) != len(r.XY)/2 || int(r.PolyStart[len(r.PolyStart)-1]) != len(r.RingStart)-1 {
		return errors.New("planar: ClipCells: region is empty or its arrays are inconsistent (build it with NewRegion)")
	}
	for k := 0; k+1 < len(r.RingStart); k++ {
		if r.RingStart[k+1]-r.RingStart[k] < 3 {
			return fmt.Errorf("planar: ClipCells: region ring %d has fewer than 3 points", k)
		}
	}
	return nil
}

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
			if dist2(x, y, c.xy[2*a], c.xy[2*a+1]) >= 0.25*small*small*0.99 {
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
		if !(den > 1e-300) {
			den = 1e-300
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

// walkBoundary walks every ring edge through the Voronoi diagram and
// records each (site, edge) pair whose cell the edge passes through.
func (c *clipper) walkBoundary() {
	r := c.r
	c.state = make([]uint8, c.nv)
	visited := make([]int32, c.nv)
	for i := range visited {
		visited[i] = -1
	}
	var nb, tri []int32
	var pairs []uint64
	site := int32(0)
	for k := 0; k < r.NumRings(); k++ {
		s0 := r.RingStart[k]
		site = c.nearest(r.XY[2*s0], r.XY[2*s0+1], site, nb, tri)
		for e := s0; e < r.RingStart[k+1]; e++ {
			b := c.rnext[e]
			ax, ay := r.XY[2*e], r.XY[2*e+1]
			bx, by := r.XY[2*b], r.XY[2*b+1]
			visited[site] = e
			pairs = append(pairs, uint64(site)<<32|uint64(e))
			// Walk along a→b. tcur is the parameter reached so far. Near
			// ties between exits (bisectors crossing the edge at almost
			// the same point: a Voronoi vertex, or near-duplicate sites)
			// are all recorded, since rounding may pick the wrong one;
			// and if the point at tcur turns out to lie beyond a bisector
			// of the cell entered, the walk moves on across it.
			const tolT = 1e-9
			tcur := 0.0
			for steps := 0; steps < c.nv; steps++ {
				nb, tri, _ = c.around(site, nb, tri)
				px, py := c.xy[2*site], c.xy[2*site+1]
				best, bt := int32(-1), 0.0
				back, tb := int32(-1), 0.0
				for _, j := range nb {
					if visited[j] == e {
						continue
					}
					nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
					h := 0.5 * (nx*nx + ny*ny)
					ga := (ax-px)*nx + (ay-py)*ny - h
					gb := (bx-px)*nx + (by-py)*ny - h
					if ga == 0 && gb == 0 {
						// The edge lies on this bisector: it borders
						// both cells.
						visited[j] = e
						pairs = append(pairs, uint64(j)<<32|uint64(e))
						continue
					}
					if ga > gb && ga > 0 {
						// Entering this cell across bisector j at tj:
						// before tj the edge is on j's side.
						if tj := ga / (ga - gb); tj > tcur+tolT && (back < 0 || tj > tb) {
							back, tb = j, tj
						}
						continue
					}
					if !(gb > 0 && gb > ga) {
						continue
					}
					tj := ga / (ga - gb)
					if best < 0 || tj < bt {
						best, bt = j, tj
					}
				}
				if back >= 0 {
					site = back
					visited[site] = e
					pairs = append(pairs, uint64(site)<<32|uint64(e))
					continue
				}
				if best < 0 {
					break
				}
				// Record near-tied exits too.
				for _, j := range nb {
					if visited[j] == e || j == best {
						continue
					}
					nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
					h := 0.5 * (nx*nx + ny*ny)
					ga := (ax-px)*nx + (ay-py)*ny - h
					gb := (bx-px)*nx + (by-py)*ny - h
					if gb > 0 && gb > ga && ga/(ga-gb) <= bt+tolT {
						pairs = append(pairs, uint64(j)<<32|uint64(e))
					}
				}
				site = best
				tcur = math.Max(tcur, bt)
				visited[site] = e
				pairs = append(pairs, uint64(site)<<32|uint64(e))
			}
		}
	}
	slices.Sort(pairs)
	pairs = slices.Compact(pairs)
	c.pairSite = make([]int32, len(pairs))
	c.pairEdge = make([]int32, len(pairs))
	for i, p := range pairs {
		c.pairSite[i], c.pairEdge[i] = int32(p>>32), int32(p&0xffffffff)
		c.state[c.pairSite[i]] = clipCrossed
	}
}

// markCrossedEdges completes the marks of the boundary walk: every
// Voronoi edge (a segment between two circumcentres, or a ray from one
// for a hull edge) that meets a ring edge, by an exact test, marks both
// its cells as crossed. The walk alone can step past a cell where
// bisectors almost coincide (near-duplicate sites); with this pass every
// cell that a ring edge enters through its boundary is marked, so the
// groups of unmarked cells that classify decides with one test each are
// truly on one side of the area's boundary. Rings lying inside one cell
// cross no Voronoi edge; the walk marks their cell.
func (c *clipper) markCrossedEdges() {
	if c.collinear {
		return
	}
	t := c.t
	g := &c.fine
	// Far enough along a hull ray to leave the grid's box.
	bx0, by0 := g.x0, g.y0
	bx1, by1 := g.x0+float64(g.nx)*g.cw, g.y0+float64(g.ny)*g.ch
	// An edge between two triangles that are both not "near" (circumradius
	// below half a grid cell, centre in a cell with no ring edge in or next
	// to it) is shorter than a cell and stays in that empty neighbourhood:
	// it meets no ring edge. So only the edges of near triangles are
	// tested, each once (from its smaller half-edge when both are near).
	var mu sync.Mutex
	var hits []int32
	ParallelChunks(len(t.Triangles)/3, 1<<15, c.workers, func(_, lo, hi int) {
		var local []int32
		for tr := lo; tr < hi; tr++ {
			if !c.near[tr] {
				continue
			}
			for e := int32(3 * tr); e < int32(3*tr+3); e++ {
				o := t.Halfedges[e]
				if o >= 0 && o < e && c.near[o/3] {
					continue
				}
				a, b := t.Triangles[e], t.Triangles[NextHalfedge(e)]
				if c.state[a] != clipUnknown && c.state[b] != clipUnknown {
					continue
				}
				x0, y0 := c.cc[2*tr], c.cc[2*tr+1]
				var x1, y1 float64
				if o >= 0 {
					x1, y1 = c.cc[2*(o/3)], c.cc[2*(o/3)+1]
				} else {
					// Hull edge a→b (interior on the left): the ray runs
					// along the outward normal.
					nx, ny := c.xy[2*b+1]-c.xy[2*a+1], -(c.xy[2*b] - c.xy[2*a])
					l := math.Hypot(nx, ny)
					reach := math.Hypot(bx1-bx0, by1-by0) + math.Abs(x0-bx0) + math.Abs(y0-by0) + math.Abs(x0-bx1) + math.Abs(y0-by1)
					x1, y1 = x0+nx/l*reach, y0+ny/l*reach
				}
				if g.segmentHits(x0, y0, x1, y1) {
					local = append(local, a, b)
				}
			}
		}
		if len(local) > 0 {
			mu.Lock()
			hits = append(hits, local...)
			mu.Unlock()
		}
	})
	for _, v := range hits {
		c.state[v] = clipCrossed
	}
}

// classify decides every uncrossed cell: uncrossed cells joined by a
// Voronoi edge of positive length lie on the same side of the area's
// boundary, so one point-in-area test (at a site, which lies strictly
// inside its own cell) decides a whole group. Groups are found by
// union-find over the Delaunay edges in one linear pass.
func (c *clipper) classify() {
	uf := NewUnionFind(c.nv)
	find := uf.Find
	union := func(a, b int32) {
		if c.state[a] != clipUnknown || c.state[b] != clipUnknown {
			return
		}
		uf.UnionMin(a, b)
	}
	t := c.t
	if c.collinear {
		for i := 1; i < len(t.Hull); i++ {
			union(t.Hull[i-1], t.Hull[i])
		}
	} else {
		for e := range t.Halfedges {
			o := t.Halfedges[e]
			if o >= 0 && o < int32(e) {
				continue
			}
			if o >= 0 && c.class[e/3] == c.class[o/3] {
				continue // zero-length Voronoi edge: the cells only touch
			}
			union(t.Triangles[e], t.Triangles[NextHalfedge(int32(e))])
		}
	}
	// Verdict per group: 0 undecided, 1 inside, 2 outside, 3 only sites on
	// the boundary seen so far.
	verdict := make([]uint8, c.nv)
	for v := int32(0); int(v) < c.nv; v++ {
		if c.state[v] != clipUnknown {
			continue
		}
		r := find(v)
		if verdict[r] == 1 || verdict[r] == 2 {
			continue
		}
		in, on := c.grid.locate(c.xy[2*v], c.xy[2*v+1], nil, nil)
		switch {
		case on:
			verdict[r] = 3
		case in:
			verdict[r] = 1
		default:
			verdict[r] = 2
		}
	}
	for v := int32(0); int(v) < c.nv; v++ {
		if c.state[v] != clipUnknown {
			continue
		}
		switch verdict[find(v)] {
		case 1:
			c.state[v] = clipInside
		case 2:
			c.state[v] = clipOutside
		default:
			c.state[v] = clipCrossed
		}
	}
	// Unbounded cells (hull sites; every site when collinear) cannot lie
	// whole inside a bounded area; if a group said so (only on
	// inconsistency), clip them in full.
	for _, v := range t.Hull {
		if c.state[v] == clipInside {
			c.state[v] = clipCrossed
		}
	}
}

// clipOut accumulates the output of a chunk of sites.
type clipOut struct {
	sitePolys []int32 // polygons per site
	polyRings []int32 // rings per polygon
	ringPts   []int32 // points per ring
	xy        []float64
	src       []int32
	area      []float64
}

// assemble produces the output for all sites in parallel chunks.
func (c *clipper) assemble(st *clipStats) *Cells {
	const chunk = 1 << 13
	nchunks := (c.nv + chunk - 1) / chunk
	outs := make([]clipOut, nchunks)
	works := make(chan *clipWork, c.workers)
	for i := 0; i < c.workers; i++ {
		works <- newClipWork(c)
	}
	var crossed, inside atomic.Int64
	ParallelChunks(c.nv, chunk, c.workers, func(_, lo, hi int) {
		w := <-works
		defer func() { works <- w }()
		out := &outs[lo/chunk]
		n := hi - lo
		out.sitePolys = make([]int32, 0, n)
		out.area = make([]float64, 0, n)
		out.polyRings = make([]int32, 0, n+16)
		out.ringPts = make([]int32, 0, n+16)
		out.xy = make([]float64, 0, 14*n)
		out.src = make([]int32, 0, 7*n)
		// Pairs for this chunk.
		pi := sortSearchInt32(c.pairSite, int32(lo))
		for v := int32(lo); v < int32(hi); v++ {
			pj := pi
			for pj < len(c.pairSite) && c.pairSite[pj] == v {
				pj++
			}
			switch c.state[v] {
			case clipInside:
				inside.Add(1)
				w.wholeCell(v, out)
			case clipCrossed:
				crossed.Add(1)
				w.clipCell(v, c.pairEdge[pi:pj], out)
			default:
				out.sitePolys = append(out.sitePolys, 0)
				out.area = append(out.area, 0)
			}
			pi = pj
		}
	})
	st.crossed, st.inside = int(crossed.Load()), int(inside.Load())

	// Concatenate chunk outputs in site order.
	type offs struct{ poly, ring, pt int }
	starts := make([]offs, nchunks+1)
	for i := range outs {
		o := &outs[i]
		starts[i+1] = offs{starts[i].poly + len(o.polyRings), starts[i].ring + len(o.ringPts), starts[i].pt + len(o.src)}
	}
	tot := starts[nchunks]
	cells := &Cells{
		SiteStart:  make([]int32, c.nv+1),
		PolyStart:  make([]int32, tot.poly+1),
		RingStart:  make([]int32, tot.ring+1),
		XY:         make([]float64, 2*tot.pt),
		EdgeSource: make([]int32, tot.pt),
		Area:       make([]float64, c.nv),
	}
	ParallelChunks(nchunks, 1, c.workers, func(_, lo, hi int) {
		for i := lo; i < hi; i++ {
			o, s := &outs[i], starts[i]
			v0 := i * chunk
			p := int32(s.poly)
			for k, n := range o.sitePolys {
				cells.SiteStart[v0+k] = p
				p += n
			}
			rg := int32(s.ring)
			for k, n := range o.polyRings {
				cells.PolyStart[s.poly+k] = rg
				rg += n
			}
			pt := int32(s.pt)
			for k, n := range o.ringPts {
				cells.RingStart[s.ring+k] = pt
				pt += n
			}
			copy(cells.XY[2*s.pt:], o.xy)
			copy(cells.EdgeSource[s.pt:], o.src)
			copy(cells.Area[v0:], o.area)
		}
	})
	cells.SiteStart[c.nv] = int32(tot.poly)
	cells.PolyStart[tot.poly] = int32(tot.ring)
	cells.RingStart[tot.ring] = int32(tot.pt)
	return cells
}

// sortSearchInt32 returns the first index i with a[i] >= x (a sorted).
func sortSearchInt32(a []int32, x int32) int {
	i, _ := slices.BinarySearch(a, x)
	return i
}

// clipEvent is a point where a chain enters or leaves the cell.
type clipEvent struct {
	k        int32   // cell edge (constraint) it lies on
	s, kappa float64 // position along edge k, and d(position)/dδ
	vx, vy   float64 // velocity of the point under the perturbation
	pre      int8    // sorts before (-1) others at the same place
	// The point is base + lam·(dx, dy) relative to the site, base being
	// the ring vertex nearer the bisector (at (bx, by)); off is the
	// offset part of s, compared exactly between events of one base.
	base                int32
	lam, bx, by, dx, dy float64
	off                 float64
	x, y                float64 // absolute coordinates
	entry               bool
	chain               int32
}

// clipChain is a run of ring points inside the cell.
type clipChain struct {
	p0, p1      int32 // points [p0, p1) in clipWork.cx/cy
	label       int32 // BoundaryEdge of its ring
	entry, exit int32 // event indices, -1 for a whole ring
	area        float64
}

// clipRing is a traced output ring.
type clipRing struct {
	p0, p1 int32 // points [p0, p1) in clipWork.ox/oy/ol
	area   float64
	hole   bool
	owner  int32 // for holes: exterior index
}

// clipWork is one goroutine's scratch space.
type clipWork struct {
	c        *clipper
	nb, tri  []int32
	cnx, cny []float64 // constraint normals p_j − p_v
	ch       []float64 // |n|²/2
	// Ring-vertex cache for the current cell.
	stamp        int32
	vstamp       []int32
	vslot        []int32
	estamp       []int32
	sx, sy       []float64 // translated coordinates per slot
	sin          []bool
	sg           []float64 // g values per slot, m per slot
	sgp          []float64 // their derivatives under the erosion
	svert        []int32   // region vertex of each slot
	cx, cy       []float64 // chain points (absolute)
	chains       []clipChain
	chainVertex  []int32 // first ring vertex of each chain (-1 if none)
	tmp, tmp2    []float64
	seedBuf      []int32
	events       []clipEvent
	order        []int32
	pairOf       []int32
	used         []bool
	ox, oy       []float64 // traced ring points
	ol           []int32
	rings        []clipRing
	exteriorsBuf []int32
}

func newClipWork(c *clipper) *clipWork {
	m := len(c.r.XY) / 2
	w := &clipWork{c: c, vstamp: make([]int32, m), vslot: make([]int32, m), estamp: make([]int32, m)}
	for i := range w.vstamp {
		w.vstamp[i], w.estamp[i] = -1, -1
	}
	return w
}

// wholeCell emits the complete (bounded) cell of v.
func (w *clipWork) wholeCell(v int32, out *clipOut) {
	c := w.c
	w.nb, w.tri, _ = c.around(v, w.nb, w.tri)
	nb, tri := w.nb, w.tri
	m := len(tri)
	px, py := c.xy[2*v], c.xy[2*v+1]
	start := len(out.src)
	for k := 0; k < m; k++ {
		t0, t1 := tri[k], tri[(k+1)%m]
		x, y := c.cc[2*t0], c.cc[2*t0+1]
		if x == c.cc[2*t1] && y == c.cc[2*t1+1] {
			continue // zero-length edge
		}
		out.xy = append(out.xy, x, y)
		out.src = append(out.src, nb[(k+1)%m])
	}
	n := len(out.src) - start
	if n < 3 {
		out.xy = out.xy[:2*start]
		out.src = out.src[:start]
		out.sitePolys = append(out.sitePolys, 0)
		out.area = append(out.area, 0)
		w.c.anomalies.Add(1)
		return
	}
	out.ringPts = append(out.ringPts, int32(n))
	out.polyRings = append(out.polyRings, 1)
	out.sitePolys = append(out.sitePolys, 1)
	out.area = append(out.area, RingAreaAbout(out.xy[2*start:], px, py))
}

// interleave writes x and y interleaved into *buf and returns it.
func clipInterleave(x, y []float64, buf *[]float64) []float64 {
	b := (*buf)[:0]
	for i := range x {
		b = append(b, x[i], y[i])
	}
	*buf = b
	return b
}

// slot returns the cache slot of region vertex i for the current cell,
// classifying it on first use: for each half-plane k it stores g_k and its
// derivative g'_k = w·n_k under erosion of the area (w is the vertex's
// miter vector), and the vertex is inside when every perturbed sign is
// negative.
func (w *clipWork) slot(i int32, px, py float64) int32 {
	if w.vstamp[i] == w.stamp {
		return w.vslot[i]
	}
	s := int32(len(w.sx))
	w.vstamp[i], w.vslot[i] = w.stamp, s
	c := w.c
	x, y := c.r.XY[2*i]-px, c.r.XY[2*i+1]-py
	mx, my := c.miter[2*i], c.miter[2*i+1]
	w.sx = append(w.sx, x)
	w.sy = append(w.sy, y)
	w.svert = append(w.svert, i)
	in := true
	for k := range w.cnx {
		g := x*w.cnx[k] + y*w.cny[k] - w.ch[k]
		gp := mx*w.cnx[k] + my*w.cny[k]
		w.sg = append(w.sg, g)
		w.sgp = append(w.sgp, gp)
		if clipSign(g, gp) > 0 {
			in = false
		}
	}
	w.sin = append(w.sin, in)
	return s
}

// clipSign is the sign of g + δ·gp for an infinitesimal δ > 0, with an
// exact double zero counted as outside (+1).
func clipSign(g, gp float64) int {
	switch {
	case g < 0:
		return -1
	case g > 0:
		return 1
	case gp < 0:
		return -1
	}
	return 1
}

// gridSeeds returns the ring edges to examine for the current cell: the
// walk's seeds and every edge registered in a grid cell that overlaps the
// bounding box of (cell ∩ the area's bounding box), the latter found by
// clipping the box to the cell's half-planes (Sutherland & Hodgman,
// "Reentrant polygon clipping", CACM 17, 1974). Every ring edge that meets
// the cell is among them, whatever the walk found. Sorted, no repeats.
func (w *clipWork) gridSeeds(walk []int32, px, py float64) []int32 {
	g := &w.c.grid
	poly := append(w.tmp[:0],
		g.x0-px, g.y0-py, g.x0+float64(g.nx)*g.cw-px, g.y0-py,
		g.x0+float64(g.nx)*g.cw-px, g.y0+float64(g.ny)*g.ch-py, g.x0-px, g.y0+float64(g.ny)*g.ch-py)
	next := w.tmp2[:0]
	for k := range w.cnx {
		nx, ny, h := w.cnx[k], w.cny[k], w.ch[k]
		next = next[:0]
		n := len(poly) / 2
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			ax, ay, bx, by := poly[2*i], poly[2*i+1], poly[2*j], poly[2*j+1]
			ga, gb := ax*nx+ay*ny-h, bx*nx+by*ny-h
			if ga <= 0 {
				next = append(next, ax, ay)
			}
			if ga < 0 && gb > 0 || ga > 0 && gb < 0 {
				t := ga / (ga - gb)
				next = append(next, ax+t*(bx-ax), ay+t*(by-ay))
			}
		}
		poly, next = next, poly
		if len(poly) == 0 {
			break
		}
	}
	w.tmp, w.tmp2 = poly, next
	out := append(w.seedBuf[:0], walk...)
	if len(poly) > 0 {
		x0, y0, x1, y1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
		for i := 0; i < len(poly); i += 2 {
			x0, x1 = math.Min(x0, poly[i]), math.Max(x1, poly[i])
			y0, y1 = math.Min(y0, poly[i+1]), math.Max(y1, poly[i+1])
		}
		// Margin for the rounding of the clipped box.
		mx := 1e-9*(x1-x0) + 0x1p-40*(math.Abs(px)+math.Abs(x0)+math.Abs(x1))
		my := 1e-9*(y1-y0) + 0x1p-40*(math.Abs(py)+math.Abs(y0)+math.Abs(y1))
		g.cellEdges(px+x0-mx, py+y0-my, px+x1+mx, py+y1+my, func(e int32) { out = append(out, e) })
	}
	slices.Sort(out)
	out = slices.Compact(out)
	w.seedBuf = out
	return out
}

// crossing fills ev with the point where edge (slot i → slot j) meets the
// bisector of constraint k, interpolated from the endpoint nearer to it,
// with its position along the cell edge and that position's derivative
// under the erosion.
func (w *clipWork) crossing(i, j int32, k int, px, py float64, ev *clipEvent) {
	m := len(w.cnx)
	gi, gj := w.sg[int(i)*m+k], w.sg[int(j)*m+k]
	gpi, gpj := w.sgp[int(i)*m+k], w.sgp[int(j)*m+k]
	base, other, gb, gotr := i, j, gi, gj
	if math.Abs(gj) < math.Abs(gi) {
		base, other, gb, gotr = j, i, gj, gi
	}
	lam := 0.0
	if gb != 0 {
		lam = gb / (gb - gotr)
	}
	ux, uy := -w.cny[k], w.cnx[k]
	bx, by := w.sx[base], w.sy[base]
	dx, dy := w.sx[other]-bx, w.sy[other]-by
	ev.k = int32(k)
	ev.base, ev.lam = w.svert[base], lam
	ev.bx, ev.by, ev.dx, ev.dy = bx, by, dx, dy
	ev.off = lam * (dx*ux + dy*uy)
	ev.s = bx*ux + by*uy + ev.off
	// Derivative of the position: the crossing of the moved edge
	// A' = A + δ w_A, B' = B + δ w_B with line k, at t(δ) from A.
	c := w.c
	va, vb := w.svert[i], w.svert[j]
	t, tp := clipParam(gi, gj, gpi, gpj)
	wax, way := c.miter[2*va], c.miter[2*va+1]
	wbx, wby := c.miter[2*vb], c.miter[2*vb+1]
	abu := (w.sx[j]-w.sx[i])*ux + (w.sy[j]-w.sy[i])*uy
	ev.kappa = (wax+t*(wbx-wax))*ux + (way+t*(wby-way))*uy + tp*abu
	uu := ux*ux + uy*uy
	ev.vx, ev.vy = ev.kappa*ux/uu, ev.kappa*uy/uu
	if lam == 0 {
		v := w.svert[base]
		ev.x, ev.y = c.r.XY[2*v], c.r.XY[2*v+1]
	} else {
		ev.x, ev.y = px+(bx+lam*dx), py+(by+lam*dy)
	}
}

// clipParam returns the parameter t = gA/(gA−gB) where an edge meets a
// bisector and its derivative under the perturbation, dt/dδ.
func clipParam(ga, gb, gpa, gpb float64) (t, tp float64) {
	d := ga - gb
	if d == 0 {
		return 0, 0
	}
	return ga / d, (ga*gpb - gb*gpa) / (d * d)
}

// edgeEvents computes the entry and/or exit constraint of edge (slot i →
// slot j) under the perturbed signs. It returns the constraint indices (-1
// when absent) and whether the edge meets the cell at all (meaningful when
// both ends are outside). Ties in the parameter are broken by its
// derivative, as in the perturbed configuration.
func (w *clipWork) edgeEvents(i, j int32) (kin, kout int, meets bool) {
	m := len(w.cnx)
	gi, gj := w.sg[int(i)*m:int(i)*m+m], w.sg[int(j)*m:int(j)*m+m]
	pi, pj := w.sgp[int(i)*m:int(i)*m+m], w.sgp[int(j)*m:int(j)*m+m]
	kin, kout = -1, -1
	var tin, pin, tout, pout float64
	for k := 0; k < m; k++ {
		sa, sb := clipSign(gi[k], pi[k]), clipSign(gj[k], pj[k])
		if gi[k] == gj[k] {
			sb = sa // parallel to the bisector: one side only
		}
		switch {
		case sa > 0 && sb > 0:
			return -1, -1, false
		case sa > 0: // enters this half-plane
			t, tp := clipParam(gi[k], gj[k], pi[k], pj[k])
			if kin < 0 || t > tin || t == tin && tp > pin {
				kin, tin, pin = k, t, tp
			}
		case sb > 0: // leaves it
			t, tp := clipParam(gi[k], gj[k], pi[k], pj[k])
			if kout < 0 || t < tout || t == tout && tp < pout {
				kout, tout, pout = k, t, tp
			}
		}
	}
	// An edge through (or within rounding of) a cell corner, with both
	// ends outside, would cut at most a sliver of length ~u off it; the
	// sliver's ends cannot be ordered reliably, and leaving it out changes
	// no area beyond rounding, so a piece shorter than 2⁻⁴⁰ of the edge
	// counts as none (an exact touch included: zero area either way).
	meets = kin < 0 || kout < 0 || tout-tin > 0x1p-40
	return kin, kout, meets
}

// clipCell clips the cell of v to the region given the ring edges that
// the boundary walk found in it, and appends the result to out.
func (w *clipWork) clipCell(v int32, seeds []int32, out *clipOut) {
	c := w.c
	var bounded bool
	w.nb, w.tri, bounded = c.around(v, w.nb, w.tri)
	nb := w.nb
	m := len(nb)
	px, py := c.xy[2*v], c.xy[2*v+1]
	w.cnx, w.cny, w.ch = w.cnx[:0], w.cny[:0], w.ch[:0]
	for _, j := range nb {
		nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
		w.cnx = append(w.cnx, nx)
		w.cny = append(w.cny, ny)
		w.ch = append(w.ch, 0.5*(nx*nx+ny*ny))
	}
	w.stamp++
	w.sx, w.sy, w.sin, w.sg, w.sgp, w.svert = w.sx[:0], w.sy[:0], w.sin[:0], w.sg[:0], w.sgp[:0], w.svert[:0]
	w.cx, w.cy = w.cx[:0], w.cy[:0]
	w.chains = w.chains[:0]
	w.chainVertex = w.chainVertex[:0]
	w.events = w.events[:0]
	rnext, rprev := c.rnext, c.rprev

	newEvent := func(i, j int32, k int, entry bool, chain int32) int32 {
		var ev clipEvent
		w.crossing(i, j, k, px, py, &ev)
		ev.entry, ev.chain = entry, chain
		w.events = append(w.events, ev)
		w.cx = append(w.cx, ev.x)
		w.cy = append(w.cy, ev.y)
		return int32(len(w.events) - 1)
	}
	addVertex := func(i int32) {
		w.cx = append(w.cx, c.r.XY[2*i])
		w.cy = append(w.cy, c.r.XY[2*i+1])
	}

	seeds = w.gridSeeds(seeds, px, py)
	for _, e := range seeds {
		if w.estamp[e] == w.stamp {
			continue
		}
		a, b := e, rnext[e]
		sa, sb := w.slot(a, px, py), w.slot(b, px, py)
		label := BoundaryEdge(int(c.rring[e]))
		ch := int32(len(w.chains))
		if !w.sin[sa] && !w.sin[sb] {
			w.estamp[e] = w.stamp
			kin, kout, meets := w.edgeEvents(sa, sb)
			if !meets || kin < 0 || kout < 0 {
				continue
			}
			p0 := int32(len(w.cx))
			ein := newEvent(sa, sb, kin, true, ch)
			eout := newEvent(sa, sb, kout, false, ch)
			w.chains = append(w.chains, clipChain{p0: p0, p1: int32(len(w.cx)), label: label, entry: ein, exit: eout})
			w.chainVertex = append(w.chainVertex, -1)
			continue
		}
		// Find the chain's entry edge (or a whole ring) going backwards.
		f := e
		closed := false
		if w.sin[sa] {
			for {
				p := rprev[f]
				if !w.sin[w.slot(p, px, py)] {
					f = p
					break
				}
				f = p
				if f == e {
					closed = true
					break
				}
			}
		}
		p0 := int32(len(w.cx))
		if closed {
			g := e
			for {
				w.estamp[g] = w.stamp
				addVertex(g)
				g = rnext[g]
				if g == e {
					break
				}
			}
			w.chains = append(w.chains, clipChain{p0: p0, p1: int32(len(w.cx)), label: label, entry: -1, exit: -1})
			w.chainVertex = append(w.chainVertex, e)
			continue
		}
		// f runs from an outside vertex to an inside one.
		w.estamp[f] = w.stamp
		sf, sg := w.slot(f, px, py), w.slot(rnext[f], px, py)
		kin, _, _ := w.edgeEvents(sf, sg)
		if kin < 0 {
			// Outside vertex with no violated half-plane cannot be; guard.
			c.anomalies.Add(1)
			kin = 0
		}
		ein := newEvent(sf, sg, kin, true, ch)
		g := rnext[f]
		for {
			addVertex(g)
			h := rnext[g]
			w.estamp[g] = w.stamp
			sh := w.slot(h, px, py)
			if w.sin[sh] {
				g = h
				continue
			}
			_, kout, _ := w.edgeEvents(w.slot(g, px, py), sh)
			if kout < 0 {
				c.anomalies.Add(1)
				kout = 0
			}
			eout := newEvent(w.slot(g, px, py), sh, kout, false, ch)
			w.chains = append(w.chains, clipChain{p0: p0, p1: int32(len(w.cx)), label: label, entry: ein, exit: eout})
			w.chainVertex = append(w.chainVertex, rnext[f])
			break
		}
	}

	w.ox, w.oy, w.ol, w.rings = w.ox[:0], w.oy[:0], w.ol[:0], w.rings[:0]
	if len(w.events) > 0 {
		if m == 0 {
			c.anomalies.Add(1)
		} else {
			w.traceRings(v, bounded)
		}
	}
	// Whole rings inside the cell.
	largest, largestArea := -1, 0.0
	for ci := range w.chains {
		chn := &w.chains[ci]
		if chn.entry >= 0 {
			continue
		}
		p0 := int32(len(w.ox))
		for p := chn.p0; p < chn.p1; p++ {
			w.ox = append(w.ox, w.cx[p])
			w.oy = append(w.oy, w.cy[p])
			w.ol = append(w.ol, chn.label)
		}
		w.finishRing(p0, px, py)
		if n := len(w.rings); n > 0 && w.rings[n-1].p0 == p0 {
			if a := math.Abs(w.rings[n-1].area); a > largestArea {
				largest, largestArea = n-1, a
			}
		}
	}
	// With no boundary stretch, decide whether the cell's own boundary
	// lies in the area.
	if len(w.events) == 0 {
		boundaryIn := false
		if largest >= 0 {
			boundaryIn = w.rings[largest].hole
		} else {
			in, on := c.grid.locate(px, py, nil, nil)
			boundaryIn = in && !on
			if on {
				c.anomalies.Add(1)
			}
		}
		if boundaryIn {
			if !bounded || len(w.tri) < 3 {
				c.anomalies.Add(1)
			} else {
				p0 := int32(len(w.ox))
				m := len(w.tri)
				for k := 0; k < m; k++ {
					t0 := w.tri[k]
					w.ox = append(w.ox, c.cc[2*t0])
					w.oy = append(w.oy, c.cc[2*t0+1])
					w.ol = append(w.ol, nb[(k+1)%m])
				}
				w.finishRing(p0, px, py)
			}
		}
	}
	w.emit(out, px, py)
}

// traceRings pairs exits with entries along the cell boundary and traces
// the rings of cell ∩ area that touch the boundary.
//
// Events are ordered counter-clockwise along the boundary by cell edge,
// then by position along that edge's bisector. An event is computed on the
// bisector whose Cyrus–Beck parameter won; when two neighbours are almost
// the same point their bisectors almost coincide and that choice is
// arbitrary, so each event is moved to the edge whose extent (between its
// corners, measured along the bisector) holds it. Events at one point are
// ordered by their velocity under the perturbation. In the collinear case
// each bisector is a line of its own.
func (w *clipWork) traceRings(v int32, bounded bool) {
	c := w.c
	m := len(w.nb)
	nev := len(w.events)
	evs := w.events
	px, py := c.xy[2*v], c.xy[2*v+1]
	cyclic := bounded && !c.collinear
	ncorner := len(w.tri)
	cornerX := func(k int) float64 { return c.cc[2*w.tri[k]] }
	cornerY := func(k int) float64 { return c.cc[2*w.tri[k]+1] }
	along := func(k int, x, y float64) float64 {
		return (x-px)*(-w.cny[k]) + (y-py)*w.cnx[k]
	}
	if !c.collinear && ncorner > 0 {
		for i := range evs {
			e := &evs[i]
			k, dir := int(e.k), 0
			for step := 0; step < m; step++ {
				s := along(k, e.x, e.y)
				start, end := -1, -1
				if cyclic {
					start, end = (k+m-1)%m, k
				} else {
					if k >= 1 {
						start = k - 1
					}
					if k <= m-2 {
						end = k
					}
				}
				if dir <= 0 && start >= 0 && s < along(k, cornerX(start), cornerY(start)) {
					k, dir = (k+m-1)%m, -1
					continue
				}
				if dir >= 0 && end >= 0 && s > along(k, cornerX(end), cornerY(end)) {
					k, dir = (k+1)%m, 1
					continue
				}
				break
			}
			if k != int(e.k) {
				ux, uy := -w.cny[k], w.cnx[k]
				e.k = int32(k)
				e.off = e.lam * (e.dx*ux + e.dy*uy)
				e.s = e.bx*ux + e.by*uy + e.off
				e.kappa = e.vx*ux + e.vy*uy
			}
		}
	}
	// A chain that leaves by the edge it came in by closes, with the
	// stretch of that edge between its ends, a simple polygon: counter-
	// clockwise exactly when the exit comes first along the edge. When
	// the chain barely dips into the cell (a ring vertex within rounding
	// of a bisector) the two crossing points are too close for their
	// computed positions to tell; the orientation, exact for a one-vertex
	// chain (Orient2D of the vertex and its ring neighbours), decides.
	for ci := range w.chains {
		ch := &w.chains[ci]
		if ch.entry < 0 {
			continue
		}
		en, ex := &evs[ch.entry], &evs[ch.exit]
		if en.k != ex.k || c.collinear {
			continue
		}
		var o float64
		if ch.p1-ch.p0 == 3 {
			vtx := w.chainVertex[ci]
			a, b := c.rprev[vtx], c.rnext[vtx]
			xy := c.r.XY
			o = Orient2D(xy[2*a], xy[2*a+1], xy[2*vtx], xy[2*vtx+1], xy[2*b], xy[2*b+1])
		} else {
			o = RingAreaAbout(clipInterleave(w.cx[ch.p0:ch.p1], w.cy[ch.p0:ch.p1], &w.tmp), px, py)
		}
		// Enforce the order (a tie in the computed positions is a
		// rounding artefact here, not a shared point to perturb).
		switch {
		case o > 0 && !(ex.s < en.s || ex.s == en.s && ex.kappa < en.kappa):
			ex.s, ex.kappa, ex.pre, en.pre = en.s, en.kappa, -1, 0
		case o < 0 && !(en.s < ex.s || en.s == ex.s && en.kappa < ex.kappa):
			en.s, en.kappa, en.pre, ex.pre = ex.s, ex.kappa, -1, 0
		}
	}
	w.order = w.order[:0]
	for i := 0; i < nev; i++ {
		w.order = append(w.order, int32(i))
	}
	slices.SortFunc(w.order, func(a, b int32) int {
		ea, eb := &evs[a], &evs[b]
		if r := cmp.Compare(ea.k, eb.k); r != 0 {
			return r
		}
		if r := cmp.Compare(ea.s, eb.s); r != 0 {
			return r
		}
		if ea.base == eb.base && ea.pre == 0 && eb.pre == 0 {
			// Same base vertex: the offsets order the points exactly
			// where their sum with the base position rounded equal.
			if r := cmp.Compare(ea.off, eb.off); r != 0 {
				return r
			}
		}
		if r := cmp.Compare(ea.kappa, eb.kappa); r != 0 {
			return r
		}
		if r := cmp.Compare(ea.pre, eb.pre); r != 0 {
			return r
		}
		if ea.entry != eb.entry {
			if !ea.entry {
				return -1 // exit first: a touching chain closes at once
			}
			return 1
		}
		return cmp.Compare(a, b)
	})
	w.pairOf = slices.Grow(w.pairOf[:0], nev)[:nev]
	rank := w.pairOf
	for r, e := range w.order {
		rank[e] = int32(r)
	}
	next := make([]int32, nev) // exit event -> entry event
	w.used = slices.Grow(w.used[:0], nev)[:nev]
	for i := range w.used {
		w.used[i] = false
	}
	for ei := 0; ei < nev; ei++ {
		if evs[ei].entry {
			continue
		}
		r0 := int(rank[ei])
		found := int32(-1)
		for step := 1; step <= nev; step++ {
			r := r0 + step
			if r >= nev {
				if !cyclic {
					break
				}
				r -= nev
			}
			cand := w.order[r]
			ce := &evs[cand]
			if c.collinear && ce.k != evs[ei].k {
				break
			}
			if !ce.entry {
				c.anomalies.Add(1) // two exits in a row
				continue
			}
			if w.used[cand] {
				continue
			}
			found = cand
			break
		}
		if found < 0 {
			c.anomalies.Add(1)
			found = w.chains[evs[ei].chain].entry // close on itself
		}
		w.used[found] = true
		next[ei] = found
	}
	// Trace.
	done := make([]bool, len(w.chains))
	for c0 := range w.chains {
		ch0 := &w.chains[c0]
		if ch0.entry < 0 || done[c0] {
			continue
		}
		p0 := int32(len(w.ox))
		ci := int32(c0)
		for guard := 0; guard <= len(w.chains); guard++ {
			done[ci] = true
			chn := &w.chains[ci]
			for p := chn.p0; p < chn.p1; p++ {
				w.ox = append(w.ox, w.cx[p])
				w.oy = append(w.oy, w.cy[p])
				w.ol = append(w.ol, chn.label)
			}
			x := &evs[chn.exit]
			en := next[chn.exit]
			e := &evs[en]
			w.ol[len(w.ol)-1] = w.nb[x.k]
			// Corners between x and e, counter-clockwise.
			var cnt int
			if c.collinear {
				cnt = 0
			} else if rank[en] > rank[chn.exit] {
				cnt = int(e.k - x.k)
			} else if cyclic {
				cnt = int(e.k-x.k) + m
			} else {
				c.anomalies.Add(1)
				cnt = 0
			}
			for i := 0; i < cnt; i++ {
				k := (int(x.k) + i) % m
				if k >= ncorner {
					break
				}
				w.ox = append(w.ox, cornerX(k))
				w.oy = append(w.oy, cornerY(k))
				w.ol = append(w.ol, w.nb[(k+1)%m])
			}
			ci = e.chain
			if ci == int32(c0) {
				break
			}
			if done[ci] {
				c.anomalies.Add(1)
				break
			}
		}
		w.finishRing(p0, px, py)
	}
}

// finishRing drops zero-length edges of the ring starting at point p0 (the
// last ring in ox/oy/ol), computes its area and records it, or discards it
// when degenerate.
func (w *clipWork) finishRing(p0 int32, px, py float64) {
	n := int32(len(w.ox))
	ox, oy, ol := w.ox, w.oy, w.ol
	// Compact in place, dropping zero-length edges (a point equal to the
	// previous kept one replaces it: its label carries on) and points
	// between two edges on the same bisector (a chain that only touched
	// the cell boundary there; also removes zero-width spikes along it).
	// Points a few ulps apart (a crossing point computed on a bisector and
	// the circumcentre ending that bisector's edge) count as equal.
	same := func(ax, ay, bx, by float64) bool {
		const eps = 0x1p-50
		return math.Abs(ax-bx) <= eps*(math.Abs(ax)+math.Abs(bx)) && math.Abs(ay-by) <= eps*(math.Abs(ay)+math.Abs(by))
	}
	k := p0
	for i := p0; i < n; i++ {
		x, y, l := ox[i], oy[i], ol[i]
		for k > p0 && same(ox[k-1], oy[k-1], x, y) {
			k--
		}
		if k > p0 && l >= 0 && ol[k-1] == l {
			continue
		}
		ox[k], oy[k], ol[k] = x, y, l
		k++
	}
	// The same across the wrap from the last point to the first.
	for changed := true; changed && k-p0 >= 2; {
		changed = false
		if same(ox[k-1], oy[k-1], ox[p0], oy[p0]) {
			k--
			changed = true
		} else if l := ol[p0]; l >= 0 && ol[k-1] == l {
			copy(ox[p0:k-1], ox[p0+1:k])
			copy(oy[p0:k-1], oy[p0+1:k])
			copy(ol[p0:k-1], ol[p0+1:k])
			k--
			changed = true
		}
	}
	w.ox, w.oy, w.ol = w.ox[:k], w.oy[:k], w.ol[:k]
	if k-p0 < 3 {
		w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
		return
	}
	if !w.splitPinched(p0, px, py) {
		w.addRing(p0, px, py)
	}
}

// splitPinched splits the ring at p0 (the last ring in ox/oy/ol) where it
// passes twice through the same point — where the area's boundary touches
// a cell edge at a vertex, the traced ring is pinched there — into simple
// loops, each recorded as its own ring: counter-clockwise loops become
// exteriors and clockwise ones holes touching them at that point, the
// representation the OGC simple-features rules allow. It reports false,
// leaving the ring alone, when no point repeats.
func (w *clipWork) splitPinched(p0 int32, px, py float64) bool {
	k := int32(len(w.ox))
	n := k - p0
	dup := false
	if n <= 64 {
		for i := p0; i < k && !dup; i++ {
			for j := i + 1; j < k; j++ {
				if w.ox[i] == w.ox[j] && w.oy[i] == w.oy[j] {
					dup = true
					break
				}
			}
		}
	} else {
		seen := make(map[[2]float64]struct{}, n)
		for i := p0; i < k; i++ {
			key := [2]float64{w.ox[i], w.oy[i]}
			if _, ok := seen[key]; ok {
				dup = true
				break
			}
			seen[key] = struct{}{}
		}
	}
	if !dup {
		return false
	}
	xs := slices.Clone(w.ox[p0:k])
	ys := slices.Clone(w.oy[p0:k])
	ls := slices.Clone(w.ol[p0:k])
	w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
	// Stack of point indices; pos maps a point to its stack position.
	var stack []int32
	pos := make(map[[2]float64]int, n)
	lab := slices.Clone(ls) // labels as they evolve on the stack
	for i := int32(0); i < n; i++ {
		key := [2]float64{xs[i], ys[i]}
		if s, ok := pos[key]; ok {
			// Loop stack[s..]: closes back at point stack[s].
			q0 := int32(len(w.ox))
			for _, j := range stack[s:] {
				w.ox = append(w.ox, xs[j])
				w.oy = append(w.oy, ys[j])
				w.ol = append(w.ol, lab[j])
				delete(pos, [2]float64{xs[j], ys[j]})
			}
			w.addRing(q0, px, py)
			stack = stack[:s+1]
			pos[key] = s
			lab[stack[s]] = ls[i] // continues along point i's edge
			continue
		}
		pos[key] = len(stack)
		stack = append(stack, i)
	}
	q0 := int32(len(w.ox))
	for _, j := range stack {
		w.ox = append(w.ox, xs[j])
		w.oy = append(w.oy, ys[j])
		w.ol = append(w.ol, lab[j])
	}
	w.addRing(q0, px, py)
	return true
}

// addRing records the ring of points [p0, len) with its area, or discards
// it when it has fewer than 3 points or an area within rounding of zero (a
// degenerate there-and-back path, such as a region edge along a cell edge
// seen from the side it does not bound).
func (w *clipWork) addRing(p0 int32, px, py float64) {
	k := int32(len(w.ox))
	if k-p0 < 3 {
		w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
		return
	}
	a, abs := 0.0, 0.0
	ax, ay := w.ox[k-1]-px, w.oy[k-1]-py
	for i := p0; i < k; i++ {
		bx, by := w.ox[i]-px, w.oy[i]-py
		a += ax*by - ay*bx
		abs += math.Abs(ax*by) + math.Abs(ay*bx)
		ax, ay = bx, by
	}
	a *= 0.5
	// abs bounds the terms before cancellation: an area below 2⁻⁴⁶·abs
	// is rounding noise.
	if math.Abs(a) <= 0x1p-46*abs {
		w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
		return
	}
	w.rings = append(w.rings, clipRing{p0: p0, p1: k, area: a, hole: a < 0, owner: -1})
}

// emit assigns holes to exteriors and appends the polygons to out.
func (w *clipWork) emit(out *clipOut, px, py float64) {
	ext := w.exteriorsBuf[:0]
	for i := range w.rings {
		if !w.rings[i].hole {
			ext = append(ext, int32(i))
		}
	}
	w.exteriorsBuf = ext
	for i := range w.rings {
		h := &w.rings[i]
		if !h.hole {
			continue
		}
		best, ba := int32(-1), 0.0
		for _, e := range ext {
			er := &w.rings[e]
			if best >= 0 && er.area >= ba {
				continue
			}
			if w.ringHolds(er, h) {
				best, ba = e, er.area
			}
		}
		if best < 0 {
			w.c.anomalies.Add(1)
		}
		h.owner = best
	}
	total := 0.0
	for _, e := range ext {
		nr := int32(1)
		w.copyRing(&w.rings[e], out)
		total += w.rings[e].area
		for i := range w.rings {
			if h := &w.rings[i]; h.hole && h.owner == e {
				w.copyRing(h, out)
				total += h.area
				nr++
			}
		}
		out.polyRings = append(out.polyRings, nr)
	}
	out.sitePolys = append(out.sitePolys, int32(len(ext)))
	out.area = append(out.area, total)
}

func (w *clipWork) copyRing(r *clipRing, out *clipOut) {
	for i := r.p0; i < r.p1; i++ {
		out.xy = append(out.xy, w.ox[i], w.oy[i])
		out.src = append(out.src, w.ol[i])
	}
	out.ringPts = append(out.ringPts, r.p1-r.p0)
}

// ringHolds reports whether ring h lies inside ring r, judged at the first
// vertex of h that is not on r (h may touch r at isolated points), by the
// exact PointInRing.
func (w *clipWork) ringHolds(r, h *clipRing) bool {
	rxy := clipInterleave(w.ox[r.p0:r.p1], w.oy[r.p0:r.p1], &w.tmp)
	for i := h.p0; i < h.p1; i++ {
		if s := PointInRing(rxy, w.ox[i], w.oy[i]); s != 0 {
			return s > 0
		}
	}
	return false
}
