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
//  1. Each ring vertex is classified once per cell, inside C when every g_j
//     is negative (a zero counts by the perturbation below). A maximal run of
//     ring edges with inside vertices is a chain; a chain starts at an entry
//     point (where its first edge crosses into C, at the largest Cyrus–Beck
//     parameter over the half-planes the edge enters) and ends at an exit
//     point (smallest parameter over the half-planes it leaves). An edge with
//     both ends outside may still cut through C and forms a one-edge chain. A
//     ring with every vertex inside is kept whole.
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
//
// Files: clip.go (entry point, input checks, output assembly),
// clip_prepare.go (circumcentres, neighbour lists, miters), clip_walk.go
// (boundary walk and cell classification), clip_cell.go (the per-cell
// engine: classification, events, chains) and clip_trace.go (ring tracing,
// hole ownership); the edge grid is region_grid.go.
package planar

import (
	"errors"
	"fmt"
	"runtime"
	"slices"
	"sync/atomic"

	"github.com/paulmach/orb"
)

// ClipCells returns each site's Voronoi cell clipped to the site area r:
// for every vertex v of t, the polygons of (cell of v) ∩ r, with every ring
// edge labelled by its source (see Cells). Sites may lie outside r; their
// clipped cell is then often empty.
func ClipCells(t *Triangulation, r *Region) (*Cells, error) {
	cells, _, err := clipCells(t, nil, r, 0)
	return cells, err
}

// ClipPowerCells returns each vertex's power (Laguerre–Voronoi) cell
// clipped to the site area r: the points where |x − p_v|² − weights[v] is
// smallest, with t the regular triangulation of the weighted vertices
// (TriangulateRegular; weights indexed by vertex, as
// RegularTriangulation.Weights). The cell boundaries are power lines
// (radical axes) labelled by neighbour as in ClipCells, and its corners
// are the power centres of the regular triangles. A cell may not contain
// its own site. With weights nil or all equal the result is ClipCells's,
// bit for bit (the same code path with the weight terms left out).
func ClipPowerCells(t *Triangulation, weights []float64, r *Region) (*Cells, error) {
	if t != nil && weights != nil && len(weights) != t.NumVertices() {
		return nil, fmt.Errorf("planar: ClipPowerCells: %d weights for %d vertices", len(weights), t.NumVertices())
	}
	cells, _, err := clipCells(t, weights, r, 0)
	return cells, err
}

// PowerCells returns the power cells of the regular triangulation clipped
// to r (ClipPowerCells with rt.Weights); hidden inputs are not vertices
// and have no cell.
func (rt *RegularTriangulation) PowerCells(r *Region) (*Cells, error) {
	return ClipPowerCells(&rt.Triangulation, rt.Weights, r)
}

// uniformWeights returns nil when the weights are nil or all equal (the
// power diagram is then the Voronoi diagram), else w.
func uniformWeights(w []float64) []float64 {
	for _, x := range w {
		if x != w[0] {
			return w
		}
	}
	return nil
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
	wt        []float64 // vertex weights of a power diagram; nil for Voronoi
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

// clipCells is ClipPowerCells with statistics; workers ≤ 0 means
// GOMAXPROCS.
func clipCells(t *Triangulation, weights []float64, r *Region, workers int) (*Cells, clipStats, error) {
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
	c := &clipper{t: t, r: r, nv: t.NumVertices(), xy: t.Coords, wt: uniformWeights(weights), workers: workers}
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
	ParallelChunks(c.nv, chunk, c.workers, func(ci, lo, hi int) {
		w := <-works
		defer func() { works <- w }()
		out := &outs[ci]
		n := hi - lo
		out.sitePolys = make([]int32, 0, n)
		out.area = make([]float64, 0, n)
		out.polyRings = make([]int32, 0, n+16)
		out.ringPts = make([]int32, 0, n+16)
		out.xy = make([]float64, 0, 14*n)
		out.src = make([]int32, 0, 7*n)
		if !c.collinear {
			c.aroundBatch(int32(lo), int32(hi), &w.ab)
		}
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
