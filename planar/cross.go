// Accurate cross and dot products of coordinate differences.
//
// Orient2D (predicates.go) decides the SIGN of a cross product exactly but
// returns only an approximation of its value. Where the value itself is
// used (the circumradius R = |ab|·|bc|·|ca| / (2·|cross|) of the alpha
// filtration) Cross returns it with a relative error below 2⁻⁴⁸:
//
//   - Filter: t1 = fl((ux−ox)(wy−oy)), t2 = fl((uy−oy)(wx−ox)) and
//     det = fl(t1 − t2) carry three roundings (the differences, the products,
//     the final difference), so |det − exact| ≤ crossErrBound·(|t1| + |t2|)
//     with crossErrBound = 4.01u (4u to first order, raised to cover the
//     second-order terms; u = 2⁻⁵³). When that bound is at most 2⁻⁴⁸·|det|
//     the floating-point value is returned.
//   - Otherwise the value is formed exactly as an expansion (each difference
//     split into its rounded value and rounding error, each of the 16
//     products of parts into its rounded value and FMA error, summed with
//     Shewchuk's Grow-Expansion, "Adaptive precision floating-point
//     arithmetic and fast robust geometric predicates", Discrete &
//     Computational Geometry 18, 1997) and rounded by summing its
//     components from the smallest (within a few u).
//
// DotSign returns the exact sign of (p−r)·(q−r), positive when r sees the
// segment pq at an acute angle (r outside pq's closed diametral disk): the
// same filter, then an exact case for coordinates whose differences and
// products are exact (grids), then the exact expansion. Exact unless an
// intermediate product underflows, which needs coordinates that differ by
// less than about 1e-150.

package planar

import "math"

const (
	// crossErrBound bounds the rounding error of the three-rounding
	// evaluation of a 2×2 product difference relative to |t1| + |t2|.
	crossErrBound = 4.01 * epsilon
	// crossRelTol is the relative accuracy Cross guarantees.
	crossRelTol = 0x1p-48
)

// Cross returns cross(u−o, w−o) = (ux−ox)(wy−oy) − (uy−oy)(wx−ox), twice
// the signed area of the triangle o, u, w, with relative error below 2⁻⁴⁸
// (exactly 0 when the points are collinear).
func Cross(ox, oy, ux, uy, wx, wy float64) float64 {
	t1 := float64((ux - ox) * (wy - oy))
	t2 := float64((uy - oy) * (wx - ox))
	det := t1 - t2
	if math.Abs(det)*crossRelTol >= crossErrBound*(math.Abs(t1)+math.Abs(t2)) {
		return det
	}
	var buf [32]float64
	n := exactDiffProducts(buf[:], ux, ox, wy, oy, uy, oy, wx, ox)
	var s float64
	for _, c := range buf[:n] {
		s += c
	}
	return s
}

// DotSign returns the exact sign (−1, 0, +1) of (p−r)·(q−r): positive when
// r sees the segment pq at an acute angle (r outside the closed diametral
// disk of pq), zero on the diametral circle, negative inside.
func DotSign(px, py, qx, qy, rx, ry float64) int {
	ax, ay := px-rx, py-ry
	bx, by := qx-rx, qy-ry
	t1 := float64(ax * bx)
	t2 := float64(ay * by)
	dot := t1 + t2
	bound := crossErrBound * (math.Abs(t1) + math.Abs(t2))
	if dot > bound {
		return 1
	}
	if -dot > bound {
		return -1
	}
	// Fast exact case: exact differences and exact products (integer-like
	// grid coordinates); then t1 + t2 has the sign of t1 − (−t2), which a
	// floating-point comparison decides exactly.
	if twoDiffTail(px, rx, ax) == 0 && twoDiffTail(py, ry, ay) == 0 &&
		twoDiffTail(qx, rx, bx) == 0 && twoDiffTail(qy, ry, by) == 0 &&
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
	n := exactDiffProducts(buf[:], px, rx, qx, rx, py, ry, ry, qy)
	switch top := buf[n-1]; {
	case top > 0:
		return 1
	case top < 0:
		return -1
	}
	return 0
}

// exactDiffProducts writes into h the exact, zero-eliminated, nonoverlapping
// expansion (increasing magnitude) of (a1−a0)(b1−b0) − (c1−c0)(d1−d0) and
// returns its length (≥ 1). Every difference is split into its rounded
// value and rounding error (twoDiff), every product of parts into its
// rounded value and error (TwoProduct; 16 terms), and the terms are summed
// exactly by Grow-Expansion with zero elimination. len(h) ≥ 17.
func exactDiffProducts(h []float64, a1, a0, b1, b0, c1, c0, d1, d0 float64) int {
	var terms [16]float64
	k := 0
	ah, al := twoDiff(a1, a0)
	bh, bl := twoDiff(b1, b0)
	ch, cl := twoDiff(c1, c0)
	dh, dl := twoDiff(d1, d0)
	add := func(x, y float64, neg bool) {
		p, e := TwoProduct(x, y)
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
			q, e = TwoSum(q, h[i])
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
