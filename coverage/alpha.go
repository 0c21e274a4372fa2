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
//     that dot product is decided exactly (floating-point filter, then
//     error-free expansion arithmetic after Shewchuk, Discrete & Computational
//     Geometry 18, 1997). A right angle (dot product exactly 0) makes the
//     edge's diametral circle the triangle's circumcircle, so both rules give
//     the same value.
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
// circumradius R = |ab|·|bc|·|ca| / (2·|cross|) uses a cross product that is
// evaluated exactly and then rounded whenever the floating-point value could
// be off by more than 2^-48 relative, so R is within about 45u (relative
// error below 1e-14) of the exact circumradius of the input coordinates,
// and so is every edge value. Edge values are then clamped to be no larger
// than the values of their triangles, so rounding can never put a triangle
// before one of its edges. The circumcentre is accurate to a few u times
// (R + the coordinates' magnitude). Expansion arithmetic is exact unless an
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
		for i := lo; i < hi; i++ {
			a, b, c := tr[3*i], tr[3*i+1], tr[3*i+2]
			ax, ay := xy[2*a], xy[2*a+1]
			bx, by := xy[2*b], xy[2*b+1]
			cx, cy := xy[2*c], xy[2*c+1]
			r, ox, oy, hab, hbc, hca := alphaTriangle(ax, ay, bx, by, cx, cy)
			f.Triangle[i] = r
			f.centre[2*i], f.centre[2*i+1] = ox, oy
			if alphaDotSign(ax, ay, bx, by, cx, cy) <= 0 {
				hab = -hab
			}
			if alphaDotSign(bx, by, cx, cy, ax, ay) <= 0 {
				hbc = -hbc
			}
			if alphaDotSign(cx, cy, ax, ay, bx, by) <= 0 {
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

// alphaCircumradius returns the circumradius of the triangle with vertices
// a, b, c, +Inf when they are exactly collinear.
func alphaCircumradius(xy []float64, a, b, c int32) float64 {
	r, _, _, _, _, _ := alphaTriangle(xy[2*a], xy[2*a+1], xy[2*b], xy[2*b+1], xy[2*c], xy[2*c+1])
	return r
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
	d := alphaCross(ox, oy, ux, uy, wx, wy)
	if d == 0 {
		return math.Inf(1), math.NaN(), math.NaN(), ab / 2, bc / 2, ca / 2
	}
	r = ab * bc * ca / (2 * math.Abs(d))
	px, py := ux-ox, uy-oy
	qx, qy := wx-ox, wy-oy
	p2 := px*px + py*py
	q2 := qx*qx + qy*qy
	x = ox + (qy*p2-py*q2)/(2*d)
	y = oy + (px*q2-qx*p2)/(2*d)
	return r, x, y, ab / 2, bc / 2, ca / 2
}

// alphaEps is the unit roundoff of float64, 2^-53.
const alphaEps = 1.0 / (1 << 53)

// alphaCross returns cross(u−o, w−o), the doubled signed area of triangle
// o, u, w, with relative error below 2^-48: the floating-point value when
// its error bound allows, else the exact value rounded (to within a few u).
func alphaCross(ox, oy, ux, uy, wx, wy float64) float64 {
	t1 := float64((ux - ox) * (wy - oy))
	t2 := float64((uy - oy) * (wx - ox))
	det := t1 - t2
	// Error bound of the three-rounding evaluation (differences, products,
	// difference): |det − exact| <= 4u·(|t1| + |t2|) to first order.
	bound := 4.01 * alphaEps * (math.Abs(t1) + math.Abs(t2))
	if math.Abs(det)*0x1p-48 >= bound {
		return det
	}
	var buf [32]float64
	n := alphaExactProductDiff(buf[:], ux, ox, wy, oy, uy, oy, wx, ox)
	var s float64
	for _, c := range buf[:n] {
		s += c
	}
	return s
}

// alphaDotSign returns the exact sign of (p−r)·(q−r): positive when r sees
// the segment pq at an acute angle (r outside the closed diametral disk of
// pq), zero on the diametral circle, negative inside.
func alphaDotSign(px, py, qx, qy, rx, ry float64) int {
	ax, ay := px-rx, py-ry
	bx, by := qx-rx, qy-ry
	t1 := float64(ax * bx)
	t2 := float64(ay * by)
	dot := t1 + t2
	bound := 4.01 * alphaEps * (math.Abs(t1) + math.Abs(t2))
	if dot > bound {
		return 1
	}
	if -dot > bound {
		return -1
	}
	// Fast exact case: exact differences and exact products (integer-like
	// grid coordinates); then t1 + t2 has the sign of t1 − (−t2), which a
	// floating-point comparison decides exactly.
	if alphaDiffExact(px, rx, ax) && alphaDiffExact(py, ry, ay) &&
		alphaDiffExact(qx, rx, bx) && alphaDiffExact(qy, ry, by) &&
		math.FMA(ax, bx, -t1) == 0 && math.FMA(ay, by, -t2) == 0 {
		switch {
		case t1 > -t2:
			return 1
		case t1 < -t2:
			return -1
		}
		return 0
	}
	// General exact case: (p−r)·(q−r) = (px−rx)(qx−rx) − (py−ry)(ry−qy).
	var buf [32]float64
	n := alphaExactProductDiff(buf[:], px, rx, qx, rx, py, ry, ry, qy)
	top := buf[n-1]
	switch {
	case top > 0:
		return 1
	case top < 0:
		return -1
	}
	return 0
}

// alphaDiffExact reports whether x = fl(a − b) equals a − b exactly.
func alphaDiffExact(a, b, x float64) bool {
	bv := a - x
	av := x + bv
	return (a-av)+(bv-b) == 0
}

// alphaTwoSum returns x = fl(a+b) and y with a + b = x + y exactly (Knuth).
func alphaTwoSum(a, b float64) (x, y float64) {
	x = a + b
	bv := x - a
	av := x - bv
	y = (a - av) + (b - bv)
	return
}

// alphaExactProductDiff writes into h the exact, zero-eliminated,
// nonoverlapping expansion (increasing magnitude) of
// (a1−a0)(b1−b0) − (c1−c0)(d1−d0) and returns its length (>= 1). Every
// difference is split into its rounded value and rounding error, every
// product of parts into its rounded value and FMA error (16 terms), and
// the terms are summed exactly by Shewchuk's Grow-Expansion with zero
// elimination. len(h) must be at least 17.
func alphaExactProductDiff(h []float64, a1, a0, b1, b0, c1, c0, d1, d0 float64) int {
	var terms [16]float64
	k := 0
	split := func(x, y float64) (hi, lo float64) {
		hi = x - y
		bv := x - hi
		av := hi + bv
		return hi, (x - av) + (bv - y)
	}
	ah, al := split(a1, a0)
	bh, bl := split(b1, b0)
	ch, cl := split(c1, c0)
	dh, dl := split(d1, d0)
	add := func(x, y float64, neg bool) {
		p := float64(x * y)
		e := math.FMA(x, y, -p)
		if neg {
			p, e = -p, -e
		}
		terms[k], terms[k+1] = p, e
		k += 2
	}
	add(ah, bh, false)
	add(ah, bl, false)
	add(al, bh, false)
	add(al, bl, false)
	add(ch, dh, true)
	add(ch, dl, true)
	add(cl, dh, true)
	add(cl, dl, true)
	n := 0
	for _, b := range terms[:k] {
		if b == 0 {
			continue
		}
		// Grow-Expansion: add b to h[0:n] exactly.
		q := b
		m := 0
		for i := 0; i < n; i++ {
			var e float64
			q, e = alphaTwoSum(q, h[i])
			if e != 0 {
				h[m] = e
				m++
			}
		}
		if q != 0 || m == 0 {
			h[m] = q
			m++
		}
		n = m
	}
	if n == 0 {
		h[0] = 0
		n = 1
	}
	return n
}
