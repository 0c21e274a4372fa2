// Smallest enclosing circle of a planar point set (the 1-centre problem).
//
// Method: Welzl's randomized incremental algorithm ("Smallest enclosing
// disks (balls and ellipsoids)", LNCS 555, 1991) in its iterative form: the
// points are taken in a pseudo-random order (PCG seeded with a constant, so
// every run gives the same answer) and the circle is rebuilt, with the
// offending point on its boundary, whenever a point falls outside it; two
// nested loops do the same with two and three fixed boundary points.
// Expected O(n) time. The optimal circle is unique; its centre minimises the
// largest distance to the points.
//
// Numerics: coordinates are taken relative to the first point, so large
// site-plan offsets (10⁶–10⁷ m) cost no precision. A point counts as inside
// when its distance exceeds the radius by at most 1e-12 relative (plus
// 1e-300 absolute); the result's radius is recomputed as the exact largest
// distance from the returned centre, so the returned circle always encloses
// every point (to rounding of one distance). A circumcircle through three
// nearly collinear points is replaced by the circle on the farthest pair
// (which then encloses the third). The centre is within about 1e-12 of the
// set's diameter of the true 1-centre for well-spread points; for points
// nearly on a line the true centre is itself ill-conditioned along the
// line's normal, while the radius stays accurate.

package coverage

import (
	"math"
	"math/rand/v2"
)

// planSECTol is the relative slack of the inside test of the enclosing circle.
const planSECTol = 1e-12

// planSEC returns the centre and radius of the smallest
// circle enclosing the points xy (interleaved x, y). perm is scratch space
// (reused when large enough). It returns NaNs for an empty set.
func planSEC(xy []float64, perm []int32) (cx, cy, radius float64, scratch []int32) {
	n := len(xy) / 2
	if n == 0 {
		return math.NaN(), math.NaN(), math.NaN(), perm
	}
	ox, oy := xy[0], xy[1]
	if cap(perm) < n {
		perm = make([]int32, n)
	}
	perm = perm[:n]
	for i := range perm {
		perm[i] = int32(i)
	}
	rng := rand.New(rand.NewPCG(0x5ec0c1, uint64(n)))
	for i := n - 1; i > 0; i-- {
		j := rng.IntN(i + 1)
		perm[i], perm[j] = perm[j], perm[i]
	}
	px := func(k int) (float64, float64) {
		p := perm[k]
		return xy[2*p] - ox, xy[2*p+1] - oy
	}
	var c planCircle
	ax, ay := px(0)
	c = planCircle{ax, ay, 0}
	for i := 1; i < n; i++ {
		ix, iy := px(i)
		if c.contains(ix, iy) {
			continue
		}
		c = planCircle{ix, iy, 0}
		for j := 0; j < i; j++ {
			jx, jy := px(j)
			if c.contains(jx, jy) {
				continue
			}
			c = planDiameter(ix, iy, jx, jy)
			for k := 0; k < j; k++ {
				kx, ky := px(k)
				if c.contains(kx, ky) {
					continue
				}
				c = planThree(ix, iy, jx, jy, kx, ky)
			}
		}
	}
	r := 0.0
	for i := 0; i < n; i++ {
		r = math.Max(r, math.Hypot(xy[2*i]-ox-c.x, xy[2*i+1]-oy-c.y))
	}
	return c.x + ox, c.y + oy, r, perm
}

// planCircle is a circle in coordinates relative to the first point.
type planCircle struct{ x, y, r float64 }

func (c planCircle) contains(x, y float64) bool {
	return math.Hypot(x-c.x, y-c.y) <= c.r*(1+planSECTol)+1e-300
}

// planDiameter is the circle with diameter ab.
func planDiameter(ax, ay, bx, by float64) planCircle {
	x, y := (ax+bx)/2, (ay+by)/2
	return planCircle{x, y, math.Max(math.Hypot(ax-x, ay-y), math.Hypot(bx-x, by-y))}
}

// planThree is the circle through a, b and c, or the circle on their
// farthest pair when they are (nearly) collinear.
func planThree(ax, ay, bx, by, cx, cy float64) planCircle {
	bx0, by0 := bx-ax, by-ay
	cx0, cy0 := cx-ax, cy-ay
	d := 2 * (bx0*cy0 - by0*cx0)
	b2 := bx0*bx0 + by0*by0
	c2 := cx0*cx0 + cy0*cy0
	scale := math.Max(b2, c2)
	if math.Abs(d)*math.Sqrt(scale) <= 1e-12*scale || scale == 0 {
		best := planDiameter(ax, ay, bx, by)
		if s := planDiameter(ax, ay, cx, cy); s.r > best.r {
			best = s
		}
		if s := planDiameter(bx, by, cx, cy); s.r > best.r {
			best = s
		}
		return best
	}
	ux := (cy0*b2 - by0*c2) / d
	uy := (bx0*c2 - cx0*b2) / d
	x, y := ax+ux, ay+uy
	r := math.Max(math.Hypot(ax-x, ay-y), math.Max(math.Hypot(bx-x, by-y), math.Hypot(cx-x, cy-y)))
	return planCircle{x, y, r}
}
