// Alpha filtration of the Delaunay triangulation of the sites.
//
// Every simplex of the Delaunay triangulation enters the filtration at the
// smallest radius r at which the disks of radius r around its vertices, each
// restricted to its Voronoi cell, share a point (Edelsbrunner, "The union of
// balls and its dual shape", Discrete & Computational Geometry 13, 1995;
// Edelsbrunner & Harer, Computational Topology, AMS 2010, section III.4):
//
//   - a vertex at 0;
//   - a triangle at its circumradius R = |ab|·|bc|·|ca| / (2·|cross(b−a, c−a)|);
//   - an edge pq at |pq|/2 when it is Gabriel (its open diametral disk holds
//     no site), otherwise at the smallest value of the triangles it bounds,
//     which is the value of the one triangle whose opposite vertex sees pq
//     at an angle above 90° (the edge is "attached" to it). In a Delaunay
//     triangulation only the opposite vertices of the one or two adjacent
//     triangles can lie in the diametral disk, so the test is local: pq is
//     Gabriel iff (p−r)·(q−r) > 0 for each opposite vertex r. The sign of
//     that dot product is decided exactly by planar.DotSign (floating-point
//     filter, then error-free expansion arithmetic after Shewchuk, Discrete &
//     Computational Geometry 18, 1997). A right angle (dot product exactly
//     0) makes the edge's diametral circle the triangle's circumcircle, so
//     both rules give the same value.
//
// By the nerve theorem the complex at r has the homotopy type of the union of
// the closed disks of radius r, and the inclusions commute, so persistence of
// this filtration is persistence of the growing disks.
//
// Computation: one pass over the triangles loads each triangle's three
// vertices once and yields its circumradius, circumcentre, three half edge
// lengths and three acute-angle tests; a second pass over the edges combines
// the two sides of each edge. Both passes run in parallel chunks.
//
// Error bounds: half-lengths come from coordinate differences and a
// correctly rounded square root (about 3 units of roundoff u = 2^-53); the
// circumradius R = |ab|·|bc|·|ca| / (2·|cross|) uses a cross product
// (planar.Cross) that is evaluated exactly and then rounded whenever the
// floating-point value could be off by more than 2^-48 relative, so R is
// within about 45u (relative error below 1e-14) of the exact circumradius of
// the input coordinates,
// and so is every edge value. Edge values are then clamped to be no larger
// than the values of their triangles, so rounding can never put a triangle
// before one of its edges. The circumcentre (planar.Circumcentre, from the
// vertex of the largest angle θ) is accurate to a few u times (R/sin θ +
// the coordinates' magnitude); sin θ ≥ √3/2 for the acute triangles that
// fill holes. Expansion arithmetic is exact unless an
// intermediate product underflows, which needs coordinates that differ by
// less than about 1e-150 m.
//
// Collinear input (no triangles): the complex is the path through the
// vertices in line order (Triangulation.Hull), each edge entering at half
// its length.

package coverage

import (
	"math"

	"github.com/sitecover/sitecover/planar"
)

// Filtration holds the alpha value of every simplex of a Delaunay
// triangulation, in metres (radii, not squared radii). Vertices all enter
// at 0.
type Filtration struct {
	// Edge holds, per half-edge of the triangulation, the alpha value of
	// its edge; both halves of an interior edge hold the same value.
	Edge []float64
	// Triangle holds, per triangle, its circumradius.
	Triangle []float64
	// Line is set only for collinear input (two or more vertices, no
	// triangles): Line[i] is the value of the edge from Hull[i] to
	// Hull[i+1], half its length. Nil otherwise.
	Line []float64

	// centre holds the circumcentre of each triangle interleaved (x, y),
	// computed alongside the radius; ComputePersistence recomputes the
	// ones it needs when it is absent.
	centre []float64
}

// NewFiltration computes the alpha filtration of the Delaunay triangulation
// t (see the file comment for the rules and their error bounds). A nil
// triangulation gives an empty filtration.
func NewFiltration(t *planar.Triangulation) *Filtration {
	f := &Filtration{}
	if t == nil {
		return f
	}
	nt := t.NumTriangles()
	if nt == 0 {
		if len(t.Hull) >= 2 {
			f.Line = make([]float64, len(t.Hull)-1)
			for i := range f.Line {
				f.Line[i] = alphaDist(t.Coords, t.Hull[i], t.Hull[i+1]) / 2
			}
		}
		f.Edge = make([]float64, len(t.Halfedges))
		return f
	}
	f.Triangle = make([]float64, nt)
	f.Edge = make([]float64, len(t.Triangles))
	f.centre = make([]float64, 2*nt)
	// Pass 1, per triangle (its three vertices loaded once): circumradius
	// and circumcentre, and for each half-edge its half-length, negated
	// when the opposite vertex of this triangle does not see the edge at
	// an acute angle.
	planar.ParallelFor(nt, alphaGrain, func(lo, hi int) {
		xy, tr := t.Coords, t.Triangles
		// The vertices' coordinates are gathered a block of triangles at
		// a time: vertices are numbered in input order, so the loads miss
		// the cache, and a loop of loads alone keeps many in flight.
		var g [alphaGather * 6]float64
		for i := lo; i < hi; i++ {
			j := (i - lo) % alphaGather
			if j == 0 {
				for k, q := range tr[3*i : 3*min(hi, i+alphaGather)] {
					g[2*k], g[2*k+1] = xy[2*q], xy[2*q+1]
				}
			}
			ax, ay := g[6*j], g[6*j+1]
			bx, by := g[6*j+2], g[6*j+3]
			cx, cy := g[6*j+4], g[6*j+5]
			r, ox, oy, hab, hbc, hca := alphaTriangle(ax, ay, bx, by, cx, cy)
			f.Triangle[i] = r
			f.centre[2*i], f.centre[2*i+1] = ox, oy
			if planar.DotSign(ax, ay, bx, by, cx, cy) <= 0 {
				hab = -hab
			}
			if planar.DotSign(bx, by, cx, cy, ax, ay) <= 0 {
				hbc = -hbc
			}
			if planar.DotSign(cx, cy, ax, ay, bx, by) <= 0 {
				hca = -hca
			}
			f.Edge[3*i], f.Edge[3*i+1], f.Edge[3*i+2] = hab, hbc, hca
		}
	})
	// Pass 2, per edge (by the half-edge that owns it): Gabriel when both
	// sides see it at an acute angle; value the half-length, clamped to the
	// adjacent circumradii, or the smaller circumradius.
	planar.ParallelFor(len(t.Triangles), alphaGrain, func(lo, hi int) {
		he := t.Halfedges
		for i := lo; i < hi; i++ {
			e := int32(i)
			opp := he[e]
			if opp >= 0 && opp < e {
				continue // the partner half-edge fills both
			}
			h := f.Edge[e]
			gabriel := h > 0
			v := f.Triangle[e/3]
			if opp >= 0 {
				gabriel = gabriel && f.Edge[opp] > 0
				v = math.Min(v, f.Triangle[opp/3])
			}
			if gabriel {
				v = math.Min(v, h)
			}
			f.Edge[e] = v
			if opp >= 0 {
				f.Edge[opp] = v
			}
		}
	})
	return f
}

// alphaGather is the number of triangles whose vertex coordinates
// NewFiltration loads at once.
const alphaGather = 256

// alphaGrain is the least number of simplices per goroutine in the passes
// of NewFiltration and ComputePersistence: below 2·alphaGrain = 2¹⁵ items
// a pass runs on the calling goroutine.
const alphaGrain = 1 << 14

// alphaDist returns the Euclidean distance between vertices a and b.
func alphaDist(xy []float64, a, b int32) float64 {
	dx := xy[2*a] - xy[2*b]
	dy := xy[2*a+1] - xy[2*b+1]
	return math.Sqrt(float64(dx*dx) + float64(dy*dy))
}

// alphaCircumcentre returns the circumcentre of the triangle a, b, c.
func alphaCircumcentre(xy []float64, a, b, c int32) (x, y float64) {
	_, x, y, _, _, _ = alphaTriangle(xy[2*a], xy[2*a+1], xy[2*b], xy[2*b+1], xy[2*c], xy[2*c+1])
	return x, y
}

// alphaTriangle returns the circumradius r = |ab|·|bc|·|ca| / (2·|cross|)
// and circumcentre (x, y) of triangle a, b, c, and its half edge lengths
// |ab|/2, |bc|/2, |ca|/2. The cross product is taken at the vertex opposite
// the longest edge (the largest angle), whose two arms are the shortest,
// which keeps its floating-point error bound smallest relative to the
// result. r is +Inf when the points are exactly collinear.
func alphaTriangle(ax, ay, bx, by, cx, cy float64) (r, x, y, hab, hbc, hca float64) {
	ab := math.Sqrt(float64((ax-bx)*(ax-bx)) + float64((ay-by)*(ay-by)))
	bc := math.Sqrt(float64((bx-cx)*(bx-cx)) + float64((by-cy)*(by-cy)))
	ca := math.Sqrt(float64((cx-ax)*(cx-ax)) + float64((cy-ay)*(cy-ay)))
	ox, oy, ux, uy, wx, wy := ax, ay, bx, by, cx, cy
	if ab >= bc && ab >= ca {
		ox, oy, ux, uy, wx, wy = cx, cy, ax, ay, bx, by
	} else if ca >= ab && ca >= bc {
		ox, oy, ux, uy, wx, wy = bx, by, cx, cy, ax, ay
	}
	d := planar.Cross(ox, oy, ux, uy, wx, wy)
	if d == 0 {
		return math.Inf(1), math.NaN(), math.NaN(), ab / 2, bc / 2, ca / 2
	}
	r = ab * bc * ca / (2 * math.Abs(d))
	x, y = planar.Circumcentre(ox, oy, ux, uy, wx, wy)
	return r, x, y, ab / 2, bc / 2, ca / 2
}
