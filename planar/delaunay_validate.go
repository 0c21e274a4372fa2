// Validation of a Triangulation: structure and the empty-circle property.
//
// The checks, all exact (Orient2D, InCircle) except the area sanity check:
//   - index ranges, the Vertex/Source maps, distinct finite coordinates;
//   - every triangle counter-clockwise; Halfedges an involution pairing
//     each half-edge with its reverse;
//   - the half-edges without a twin form one closed loop, which is Hull,
//     convex (no clockwise turn);
//   - every vertex is used and its star is one fan (walking from Inedge
//     meets all its half-edges), so the complex is a triangulated disk;
//     with Euler's formula the triangle count is 2n − 2 − h for n vertices
//     and h hull vertices, collinear hull points included (common
//     practice);
//   - the triangle areas sum to the hull area (floating point, to 1e-9 of
//     the sum of the magnitudes of the products), which excludes a multiple
//     covering;
//   - every interior edge is locally Delaunay: the opposite vertex is not
//     strictly inside the circumcircle. By Delaunay's lemma the whole
//     triangulation then has the empty-circle property.
// For collinear input (no triangle) Hull must list all vertices in order
// along one line.

package planar

import (
	"fmt"
	"math"
	"slices"
)

// validateAreaRel is the tolerance of the area check, relative to the sum of
// the magnitudes of the products: the sums carry a rounding error of a small
// multiple of ε = 2⁻⁵³ per term, so 1e-9 is loose for any input size; a
// multiple covering adds whole triangles' areas and is caught unless those
// are below 1e-9 of the total (the empty-circle test below still applies).
const validateAreaRel = 1e-9

// Validate checks that t is a well-formed Delaunay triangulation of its
// vertices and returns the first violation found, or nil.
func (t *Triangulation) Validate() error {
	if len(t.Coords)%2 != 0 {
		return fmt.Errorf("planar: Validate: odd number of coordinates %d", len(t.Coords))
	}
	m := len(t.Coords) / 2
	if len(t.Source) != m || len(t.Inedge) != m {
		return fmt.Errorf("planar: Validate: %d vertices but %d Source and %d Inedge entries", m, len(t.Source), len(t.Inedge))
	}
	if len(t.Vertex) < m {
		return fmt.Errorf("planar: Validate: %d inputs for %d vertices", len(t.Vertex), m)
	}
	for i, v := range t.Vertex {
		if v < 0 || int(v) >= m {
			return fmt.Errorf("planar: Validate: input %d: vertex %d out of range", i, v)
		}
		if s := t.Source[v]; s < 0 || int(s) >= len(t.Vertex) || int(s) > i || t.Vertex[s] != v {
			return fmt.Errorf("planar: Validate: input %d: vertex %d has source %d", i, v, s)
		}
	}
	for v := 0; v < m; v++ {
		if !finite(t.Coords[2*v], t.Coords[2*v+1]) {
			return fmt.Errorf("planar: Validate: vertex %d: coordinates not finite", v)
		}
	}
	order := make([]int32, m)
	for i := range order {
		order[i] = int32(i)
	}
	xy := t.Coords
	slices.SortFunc(order, func(a, b int32) int { return cmpLex(xy, a, b) })
	for k := 1; k < m; k++ {
		if cmpLex(xy, order[k-1], order[k]) == 0 {
			return fmt.Errorf("planar: Validate: vertices %d and %d coincide", order[k-1], order[k])
		}
	}
	if len(t.Triangles) == 0 {
		return t.validateCollinear(order)
	}
	return t.validateTriangles()
}

// cmpLex orders vertices by (x, y).
func cmpLex(xy []float64, a, b int32) int {
	ax, ay, bx, by := xy[2*a], xy[2*a+1], xy[2*b], xy[2*b+1]
	switch {
	case ax < bx:
		return -1
	case ax > bx:
		return 1
	case ay < by:
		return -1
	case ay > by:
		return 1
	}
	return 0
}

func (t *Triangulation) validateCollinear(order []int32) error {
	m := len(order)
	if len(t.Halfedges) != 0 {
		return fmt.Errorf("planar: Validate: %d half-edges without triangles", len(t.Halfedges))
	}
	if len(t.Hull) != m {
		return fmt.Errorf("planar: Validate: no triangles but Hull has %d of %d vertices", len(t.Hull), m)
	}
	for v, e := range t.Inedge {
		if e != -1 {
			return fmt.Errorf("planar: Validate: vertex %d: Inedge %d without triangles", v, e)
		}
	}
	// Hull must be the lexicographic order or its reverse.
	forward := m < 2 || t.Hull[0] == order[0]
	for k := 0; k < m; k++ {
		want := order[k]
		if !forward {
			want = order[m-1-k]
		}
		if t.Hull[k] != want {
			return fmt.Errorf("planar: Validate: Hull[%d] = %d, not in order along the line", k, t.Hull[k])
		}
	}
	if m >= 3 {
		a, b := order[0], order[m-1]
		for _, c := range order[1 : m-1] {
			if Orient2D(t.Coords[2*a], t.Coords[2*a+1], t.Coords[2*b], t.Coords[2*b+1], t.Coords[2*c], t.Coords[2*c+1]) != 0 {
				return fmt.Errorf("planar: Validate: no triangles but vertex %d is off the line through %d and %d", c, a, b)
			}
		}
	}
	return nil
}

func (t *Triangulation) validateTriangles() error {
	tri, half, xy := t.Triangles, t.Halfedges, t.Coords
	m := len(xy) / 2
	ne := len(tri)
	if ne%3 != 0 || len(half) != ne {
		return fmt.Errorf("planar: Validate: %d triangle entries and %d half-edges", ne, len(half))
	}
	pt := func(v int32) (float64, float64) { return xy[2*v], xy[2*v+1] }
	for e, v := range tri {
		if v < 0 || int(v) >= m {
			return fmt.Errorf("planar: Validate: half-edge %d: vertex %d out of range", e, v)
		}
	}
	for b := 0; b < ne; b += 3 {
		ax, ay := pt(tri[b])
		bx, by := pt(tri[b+1])
		cx, cy := pt(tri[b+2])
		if Orient2D(ax, ay, bx, by, cx, cy) <= 0 {
			return fmt.Errorf("planar: Validate: triangle %d (%d, %d, %d) is not counter-clockwise", b/3, tri[b], tri[b+1], tri[b+2])
		}
	}
	bnext, nb, err := t.validateTwins()
	if err != nil {
		return err
	}
	onHull, err := t.validateHull(bnext, nb)
	if err != nil {
		return err
	}
	if err := t.validateStars(onHull); err != nil {
		return err
	}
	if nt, want := ne/3, 2*m-2-nb; nt != want {
		return fmt.Errorf("planar: Validate: %d triangles, Euler's formula wants 2n-2-h = %d", nt, want)
	}
	if err := t.validateArea(); err != nil {
		return err
	}
	return t.validateEmptyCircles()
}

// validateTwins checks that twin half-edges pair back and run reversed,
// and returns the boundary loop: bnext[v] is the end of the boundary
// half-edge starting at v (−1 if none), nb the number of boundary edges.
func (t *Triangulation) validateTwins() (bnext []int32, nb int, err error) {
	tri, half := t.Triangles, t.Halfedges
	m, ne := len(t.Coords)/2, len(tri)
	// Twins, and the boundary loop.
	bnext = make([]int32, m) // end of the boundary half-edge starting at v
	bedge := make([]int32, m)
	for i := range bnext {
		bnext[i], bedge[i] = -1, -1
	}
	for e := int32(0); e < int32(ne); e++ {
		h := half[e]
		if h < 0 {
			if h != -1 {
				return nil, 0, fmt.Errorf("planar: Validate: half-edge %d: twin %d", e, h)
			}
			s := tri[e]
			if bnext[s] >= 0 {
				return nil, 0, fmt.Errorf("planar: Validate: vertex %d starts two boundary edges", s)
			}
			bnext[s], bedge[s] = tri[NextHalfedge(e)], e
			nb++
			continue
		}
		if int(h) >= ne || h == e || half[h] != e {
			return nil, 0, fmt.Errorf("planar: Validate: half-edge %d: twin %d is not paired back", e, h)
		}
		if tri[h] != tri[NextHalfedge(e)] || tri[NextHalfedge(h)] != tri[e] {
			return nil, 0, fmt.Errorf("planar: Validate: half-edges %d and %d are twins but not reversed", e, h)
		}
	}
	return bnext, nb, nil
}

// validateHull checks that Hull lists the boundary loop, distinct vertices,
// turning counter-clockwise; it returns which vertices are on the hull.
func (t *Triangulation) validateHull(bnext []int32, nb int) ([]bool, error) {
	xy := t.Coords
	m := len(xy) / 2
	pt := func(v int32) (float64, float64) { return xy[2*v], xy[2*v+1] }
	hull := t.Hull
	if len(hull) != nb || nb < 3 {
		return nil, fmt.Errorf("planar: Validate: %d boundary edges but Hull has %d vertices", nb, len(hull))
	}
	onHull := make([]bool, m)
	for k, v := range hull {
		if v < 0 || int(v) >= m || onHull[v] {
			return nil, fmt.Errorf("planar: Validate: Hull[%d] = %d repeated or out of range", k, v)
		}
		onHull[v] = true
	}
	for k, v := range hull {
		w := hull[(k+1)%nb]
		if bnext[v] != w {
			return nil, fmt.Errorf("planar: Validate: Hull %d→%d is not a boundary edge", v, w)
		}
		u := hull[(k+nb-1)%nb]
		ux, uy := pt(u)
		vx, vy := pt(v)
		wx, wy := pt(w)
		if Orient2D(ux, uy, vx, vy, wx, wy) < 0 {
			return nil, fmt.Errorf("planar: Validate: Hull turns clockwise at vertex %d", v)
		}
	}
	return onHull, nil
}

// validateStars checks that every vertex is used and that its triangles
// form one fan reachable from Inedge, open exactly at hull vertices.
func (t *Triangulation) validateStars(onHull []bool) error {
	tri, half := t.Triangles, t.Halfedges
	m, ne := len(t.Coords)/2, len(tri)
	// Stars: every vertex used, one fan from Inedge.
	deg := make([]int32, m)
	for e := 0; e < ne; e++ {
		deg[tri[NextHalfedge(int32(e))]]++
	}
	for v := int32(0); v < int32(m); v++ {
		e0 := t.Inedge[v]
		if deg[v] == 0 {
			return fmt.Errorf("planar: Validate: vertex %d is in no triangle", v)
		}
		if e0 < 0 || int(e0) >= ne || tri[NextHalfedge(e0)] != v {
			return fmt.Errorf("planar: Validate: vertex %d: Inedge %d does not end there", v, e0)
		}
		if onHull[v] != (half[e0] < 0) {
			return fmt.Errorf("planar: Validate: vertex %d: Inedge %d hull status wrong", v, e0)
		}
		steps := int32(0)
		e := e0
		for {
			steps++
			if steps > deg[v] {
				break
			}
			h := half[NextHalfedge(e)]
			if h < 0 || h == e0 {
				break
			}
			e = h
		}
		if steps != deg[v] {
			return fmt.Errorf("planar: Validate: vertex %d: star walk meets %d of its %d triangles", v, steps, deg[v])
		}
	}
	return nil
}

// validateArea checks that the triangle areas sum to the hull's area.
func (t *Triangulation) validateArea() error {
	tri, xy, hull := t.Triangles, t.Coords, t.Hull
	m, ne, nb := len(xy)/2, len(tri), len(hull)
	// Area check relative to the first hull vertex, in coordinates scaled
	// by powers of two (exact) so that neither huge nor tiny inputs
	// overflow or underflow.
	maxAbs := 0.0
	for _, c := range xy {
		maxAbs = math.Max(maxAbs, math.Abs(c))
	}
	s1 := 1.0
	if maxAbs > 0 {
		_, e := math.Frexp(maxAbs)
		s1 = math.Ldexp(1, -e)
	}
	o := hull[0]
	ox, oy := xy[2*o]*s1, xy[2*o+1]*s1
	ext := 0.0
	for v := 0; v < m; v++ {
		ext = math.Max(ext, math.Max(math.Abs(xy[2*v]*s1-ox), math.Abs(xy[2*v+1]*s1-oy)))
	}
	s2 := 1.0
	if ext > 0 {
		_, e := math.Frexp(ext)
		s2 = math.Ldexp(1, -e)
	}
	spt := func(v int32) (float64, float64) { return (xy[2*v]*s1 - ox) * s2, (xy[2*v+1]*s1 - oy) * s2 }
	var area, perm float64
	for b := 0; b < ne; b += 3 {
		ax, ay := spt(tri[b])
		bx, by := spt(tri[b+1])
		cx, cy := spt(tri[b+2])
		l, r := (bx-ax)*(cy-ay), (by-ay)*(cx-ax)
		area += l - r
		perm += math.Abs(l) + math.Abs(r)
	}
	var hullArea float64
	for k := 1; k+1 < nb; k++ {
		bx, by := spt(hull[k])
		cx, cy := spt(hull[k+1])
		l, r := bx*cy, by*cx
		hullArea += l - r
		perm += math.Abs(l) + math.Abs(r)
	}
	// Rounding error is a small multiple of ε times the sum of the
	// products' magnitudes; the absolute term absorbs underflow.
	if math.Abs(area-hullArea) > validateAreaRel*perm+orientFloor {
		return fmt.Errorf("planar: Validate: triangle areas sum to %g, hull area %g (scaled)", area/2, hullArea/2)
	}
	return nil
}

// validateEmptyCircles checks that every interior edge is locally Delaunay.
func (t *Triangulation) validateEmptyCircles() error {
	tri, half, xy := t.Triangles, t.Halfedges, t.Coords
	ne := len(tri)
	pt := func(v int32) (float64, float64) { return xy[2*v], xy[2*v+1] }
	// Empty circles.
	for e := int32(0); e < int32(ne); e++ {
		h := half[e]
		if h < e {
			continue
		}
		ax, ay := pt(tri[e])
		bx, by := pt(tri[NextHalfedge(e)])
		cx, cy := pt(tri[PrevHalfedge(e)])
		d := tri[PrevHalfedge(h)]
		dx, dy := pt(d)
		if InCircle(ax, ay, bx, by, cx, cy, dx, dy) > 0 {
			return fmt.Errorf("planar: Validate: vertex %d is inside the circumcircle of triangle %d", d, e/3)
		}
	}
	return nil
}
