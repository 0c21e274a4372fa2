// What closes each hole of the union of disks when devices have their own
// ranges, in metres: the range each bordering device would need under
// uniform power growth, and the single device whose range, raised least,
// closes the hole alone.
//
// Math. At growth t the complement of the weighted alpha complex is the
// dual of the uncovered part of the plane (ranges_alpha.go): the triangles
// of value > t joined across edges of value > t form one component per
// uncovered region, and a component that never reaches an edge of the
// convex hull is a hole. Its persistence pair is the one whose death
// triangle is the component's last (largest) triangle: the elder rule of
// the dual union-find keeps the component of the larger triangle.
//
// The hole's boundary is made of circle arcs. A boundary edge ab (value
// ≤ t) next to a hole triangle T contributes one vertex: its power line
// x_ab + σ·n (x_ab the point of the line ab with π_a = π_b, n the unit
// normal) meets the circles of a and b at σ = ±h, h² = r_a² + t − |x_ab −
// p_a|² (= t minus the edge's own value), and the hole lies on the side of
// T's power centre c_T, which is uncovered (its power exceeds t) while the
// power edge of ab holds a covered point; so the vertex is x_ab +
// sign((c_T − x_ab)·n)·h·n. From that vertex the boundary follows the
// circle of b, into b's power cell (the tangent τ with τ·(p_b − p_a) > 0),
// across the fan of hole triangles around b, to the vertex of the next
// boundary edge at b: edges of value > t are crossed by no covered point.
//
// A hole closes under uniform growth at its Death: each bordering device
// (one whose circle bounds it) would then need √(r_i² + Death). One device
// s alone closes it when its disk holds the whole hole; |x − p_s| is convex,
// so the range needed is the largest distance from p_s to a boundary
// vertex, or to the point of an arc farthest from p_s when that point is on
// the arc (as ranges_gaps.go's singleClosing). Only holes open at the
// planned ranges (Birth ≤ 0 < Death) have a closing.
//
// Error bounds: the vertices carry the rounding of the power-line point
// and of h (a few ulps of the coordinates and of √(r² + t)); an edge whose
// h² rounds below 0 is a tangency and h is taken as 0.

package coverage

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// HoleClosing says, in metres, what closes one hole of the union of disks
// that is open at the planned ranges.
type HoleClosing struct {
	// Sites are the input indices of the bordering devices (whose circles
	// bound the hole), ascending; Needed holds the range each would need
	// for the hole to close as all ranges grow together: √(r_i² + Death).
	Sites  []int
	Needed []float64
	// Device is the input index of the bordering device whose range alone,
	// increased least, closes the hole; DeviceRange the range it needs (the
	// distance to the hole's farthest point). Device is −1 when the hole is
	// too large to search (more than gapClosingWork pairs).
	Device      int
	DeviceRange float64
}

// holeBoundary is one hole's boundary at a growth: vertices and arcs.
type holeBoundary struct {
	sites []int32 // bordering vertices
	pts   []orb.Point
	arcs  []gapArcRef
}

// holeClosings returns, per hole of p (in p.Holes order), its closing
// when it is open at growth 0, else nil. f is the filtration p was
// computed from, on l's triangulation.
func (l *Layout) holeClosings(p *PowerPersistence, f *PowerFiltration) []*HoleClosing {
	out := make([]*HoleClosing, len(p.Holes))
	t := l.Tri
	if t == nil || len(p.Holes) == 0 || len(f.Triangle) == 0 {
		return out
	}
	const growth = 0.0
	comp := holeComponents(t, f, growth)
	// hole[root] = the open hole of that component, −1 for none.
	hole := make([]int32, len(comp))
	for i := range hole {
		hole[i] = -1
	}
	open := 0
	for k, h := range p.Holes {
		if h.Birth <= growth && growth < h.Death && h.deathTri >= 0 {
			if r := comp[h.deathTri]; r >= 0 {
				hole[r] = int32(k)
				open++
			}
		}
	}
	if open == 0 {
		return out
	}
	// The boundary half-edges of each open hole, in rows (CSR).
	start := make([]int32, len(p.Holes)+1)
	for e := range t.Triangles {
		if r := comp[e/3]; r >= 0 && hole[r] >= 0 && f.Edge[e] <= growth {
			start[hole[r]+1]++
		}
	}
	for k := range p.Holes {
		start[k+1] += start[k]
	}
	edges := make([]int32, start[len(p.Holes)])
	fill := slices.Clone(start[:len(p.Holes)])
	for e := range t.Triangles {
		if r := comp[e/3]; r >= 0 && hole[r] >= 0 && f.Edge[e] <= growth {
			k := hole[r]
			edges[fill[k]] = int32(e)
			fill[k]++
		}
	}
	gp := gapParams{t: growth, radii: make([]float64, t.NumVertices())}
	for v := range gp.radii {
		gp.radii[v] = l.grownRadius(int32(v), growth)
	}
	planar.ParallelChunks(len(p.Holes), holeClosingChunk, 0, func(_, lo, hi int) {
		var hb holeBoundary
		for k := lo; k < hi; k++ {
			if start[k] < start[k+1] {
				l.holeBoundary(f, comp, edges[start[k]:start[k+1]], &gp, &hb)
				out[k] = l.closeHole(&hb, p.Holes[k].Death, &gp)
			}
		}
	})
	return out
}

// holeClosingChunk is the number of holes per parallel chunk (most have
// a handful of boundary edges).
const holeClosingChunk = 256

// holeComponents labels every triangle of value > growth with the root of
// its component (joined across edges of value > growth); −1 for triangles
// in the complex and for components that reach the convex hull.
func holeComponents(t *planar.Triangulation, f *PowerFiltration, growth float64) []int32 {
	nt := t.NumTriangles()
	uf := planar.NewUnionFind(nt + 1)
	outside := int32(nt)
	for e, o := range t.Halfedges {
		if f.Edge[e] <= growth || f.Triangle[e/3] <= growth {
			continue
		}
		if o < 0 {
			uf.Union(int32(e/3), outside)
		} else if int32(e) < o && f.Triangle[o/3] > growth {
			uf.Union(int32(e/3), o/3)
		}
	}
	comp := make([]int32, nt)
	out := uf.Find(outside)
	for i := range comp {
		r := uf.Find(int32(i))
		if f.Triangle[i] <= growth || r == out {
			r = -1
		}
		comp[i] = r
	}
	return comp
}

// holeVertex returns the boundary vertex of half-edge e (a → b, its
// triangle in the hole, its edge in the complex) at the radii of gp.
func (l *Layout) holeVertex(f *PowerFiltration, e int32, gp *gapParams) (float64, float64) {
	t := l.Tri
	xy := t.Coords
	a, b := t.Triangles[e], t.Triangles[planar.NextHalfedge(e)]
	ra, rb := gp.radius(a), gp.radius(b)
	dx, dy := xy[2*b]-xy[2*a], xy[2*b+1]-xy[2*a+1]
	d2 := dx*dx + dy*dy
	s := (d2 + ra*ra - rb*rb) / (2 * d2)
	d := math.Sqrt(d2)
	h := math.Sqrt(math.Max(0, ra*ra-s*s*d2))
	nx, ny := -dy/d, dx/d
	mx, my := xy[2*a]+s*dx, xy[2*a+1]+s*dy
	T := e / 3
	if (f.centre[2*T]-mx)*nx+(f.centre[2*T+1]-my)*ny < 0 {
		h = -h
	}
	return mx + h*nx, my + h*ny
}

// holeBoundary collects into hb (its slices reused) the vertices, arcs and
// bordering vertices of the hole with the given boundary half-edges.
func (l *Layout) holeBoundary(f *PowerFiltration, comp []int32, edges []int32, gp *gapParams, hb *holeBoundary) {
	t := l.Tri
	tr, he, xy := t.Triangles, t.Halfedges, t.Coords
	hb.sites, hb.pts, hb.arcs = hb.sites[:0], hb.pts[:0], hb.arcs[:0]
	r := comp[edges[0]/3]
	for _, e := range edges {
		a, b := tr[e], tr[planar.NextHalfedge(e)]
		x1, y1 := l.holeVertex(f, e, gp)
		hb.pts = append(hb.pts, orb.Point{x1, y1})
		hb.sites = append(hb.sites, b)
		// Walk the fan of hole triangles around b to the next boundary
		// edge at b (at most its degree: bounded by the triangle count).
		n := planar.NextHalfedge(e)
		for steps := 0; f.Edge[n] > gp.t && steps < len(tr); steps++ {
			o := he[n]
			if o < 0 || comp[o/3] != r {
				break // cannot happen for a hole; stop safely
			}
			n = planar.NextHalfedge(o)
		}
		x2, y2 := l.holeVertex(f, n, gp)
		bx, by := xy[2*b], xy[2*b+1]
		// The counter-clockwise angle from (x1, y1) to (x2, y2) around b.
		ux, uy, vx, vy := x1-bx, y1-by, x2-bx, y2-by
		turn := math.Atan2(ux*vy-uy*vx, ux*vx+uy*vy)
		// Counter-clockwise from (x1, y1) when that tangent points into
		// b's side of the power line of a and b.
		ccw := -uy*(bx-xy[2*a])+ux*(by-xy[2*a+1]) > 0
		sx, sy, sweep := x1, y1, -turn // clockwise from (x1, y1) to (x2, y2)
		if ccw {
			sx, sy, sweep = x2, y2, turn // clockwise from (x2, y2) back
		}
		if sweep < 0 {
			sweep += 2 * math.Pi
		}
		if sweep == 0 && n == he[e] {
			sweep = 2 * math.Pi // the whole circle between two tangencies
		}
		hb.arcs = append(hb.arcs, gapArcRef{cx: bx, cy: by, r: gp.radius(b), sx: sx, sy: sy, phi: sweep})
	}
}

// closeHole returns the closing of a hole with boundary hb that dies at
// the given growth.
func (l *Layout) closeHole(hb *holeBoundary, death float64, gp *gapParams) *HoleClosing {
	src := l.Tri.Source
	sites := make([]int, 0, len(hb.sites))
	for _, v := range hb.sites {
		sites = append(sites, int(src[v]))
	}
	slices.Sort(sites)
	sites = slices.Compact(sites)
	hc := &HoleClosing{Sites: sites, Needed: make([]float64, len(sites)), Device: -1}
	for k, s := range sites {
		r := l.InputRanges[s]
		hc.Needed[k] = math.Sqrt(math.Max(0, r*r+death))
	}
	// A hole has a handful of vertices: all of them stand in for their
	// convex hull (the farthest vertex from a device is a hull vertex).
	if len(sites)*(len(hb.pts)+len(hb.arcs)) <= gapClosingWork {
		hc.Device, hc.DeviceRange = l.singleClosing(sites, hb.pts, hb.arcs, gp)
	}
	return hc
}
