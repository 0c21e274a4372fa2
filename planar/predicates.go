// Exact orientation and in-circle predicates (Shewchuk, "Adaptive precision
// floating-point arithmetic and fast robust geometric predicates", Discrete
// & Computational Geometry 18, 1997).
//
// Orient2D(a, b, c) is the sign of the determinant
//
//	| ax-cx  ay-cy |
//	| bx-cx  by-cy |  = (ax-cx)(by-cy) - (ay-cy)(bx-cx),
//
// twice the signed area of triangle abc. InCircle(a, b, c, d) is the sign of
//
//	| ax-dx  ay-dy  (ax-dx)²+(ay-dy)² |
//	| bx-dx  by-dy  (bx-dx)²+(by-dy)² |
//	| cx-dx  cy-dy  (cx-dx)²+(cy-dy)² |,
//
// positive when d is inside the circle through a, b, c taken
// counter-clockwise.
//
// Evaluation is adaptive, as in Shewchuk's orient2dadapt and incircleadapt:
//
//   - Stage A: the determinant in float64 with the a-priori error bound
//     ccwerrboundA = (3 + 16ε)ε times the permanent (the same expression
//     with absolute values), resp. iccerrboundA = (10 + 96ε)ε; ε = 2⁻⁵³. If
//     |det| exceeds the bound its sign is certain. Both constants are
//     raised here by 16ε² to absorb underflow (below). This path does not
//     allocate.
//   - Stage B: the products of the rounded coordinate differences are
//     formed exactly as expansions (bounds ccwerrboundB = (2 + 12ε)ε,
//     iccerrboundB = (4 + 48ε)ε). If the differences were computed without
//     rounding (the usual case for grid-like inputs) this value is exact.
//   - Stage C: a first-order correction for the rounding of the differences
//     (bounds ccwerrboundC = (9 + 64ε)ε², iccerrboundC = (44 + 576ε)ε², plus
//     resulterrbound = (3 + 8ε)ε times |det|).
//   - Stage D: the exact value. For Orient2D this is Shewchuk's final
//     expansion of the tail products. For InCircle it is his incircleexact,
//     the exact 4×4 lifted determinant on the untranslated coordinates.
//
// The exact stages use fixed-size arrays on the stack: no heap allocation.
//
// Range of exactness. Expansion arithmetic is exact only when no
// intermediate product underflows or overflows. If every nonzero input
// coordinate has magnitude in [2⁻⁴⁰⁰, 2⁴⁰⁰] (Orient2D, degree-2
// determinant) or [2⁻²⁰⁰, 2²⁰⁰] (InCircle, degree 4), every input is a
// multiple of u = 2⁻⁴⁵² (resp. 2⁻²⁵²), every intermediate of degree k is a
// multiple of uᵏ ≥ 2⁻¹⁰⁰⁸ and bounded far below 2¹⁰²³, so all error-free
// transformations are exact. Stage A is valid without that range provided
// underflow cannot matter: a product that underflows carries an absolute
// error of at most 2⁻¹⁰⁷⁵ instead of a relative one. Orient2D trusts stage
// A only when its permanent is at least 2⁻⁹⁰⁰, so those errors (≤ 2⁻¹⁰⁷⁴)
// are below the extra 16ε²·permanent ≥ 2⁻¹⁰⁰² of slack. InCircle trusts it
// only when the permanent is at least 2⁻⁵⁰⁰ and the lifts sum to at most
// 2⁴⁰⁰: an underflowed degree-2 product is then multiplied by at most 2⁴⁰⁰,
// an error below 2⁻⁶⁶⁸, against a slack of at least 2⁻⁶⁰². (Overflow in
// stage A yields Inf or NaN, which never passes the test.) Finite inputs
// outside the range
// are evaluated exactly with math/big (allocating, but such inputs do not
// arise from coordinates in metres). Hence the SIGN of the result is exact
// for all finite float64 inputs. The magnitude is an approximation of the
// determinant; when the result is nonzero its sign is the determinant's. If
// any input is NaN or ±Inf the result is NaN.
package planar

import (
	"math"
	"math/big"
)

const (
	epsilon        = 0x1p-53 // half an ulp of 1: the unit roundoff
	resultErrBound = (3.0 + 8.0*epsilon) * epsilon
	ccwErrBoundA   = (3.0 + 32.0*epsilon) * epsilon // Shewchuk's (3+16ε)ε plus 16ε² for underflow
	ccwErrBoundB   = (2.0 + 12.0*epsilon) * epsilon
	ccwErrBoundC   = (9.0 + 64.0*epsilon) * epsilon * epsilon
	iccErrBoundA   = (10.0 + 112.0*epsilon) * epsilon // Shewchuk's (10+96ε)ε plus 16ε² for underflow
	iccErrBoundB   = (4.0 + 48.0*epsilon) * epsilon
	iccErrBoundC   = (44.0 + 576.0*epsilon) * epsilon * epsilon

	// Stage A is trusted only when its permanent is at least orientFloor
	// (resp. incircleFloor) and, for InCircle, the sum of the three lifts
	// is at most incircleLiftCeil; see the file comment.
	orientFloor      = 0x1p-900
	incircleFloor    = 0x1p-500
	incircleLiftCeil = 0x1p400

	orientLo, orientHi     = 0x1p-400, 0x1p400
	incircleLo, incircleHi = 0x1p-200, 0x1p200
)

// Orient2D returns a positive value when a, b, c turn counter-clockwise, a
// negative value when they turn clockwise and zero when they are collinear.
// The value approximates twice the signed area of triangle abc; its sign is
// exact for all finite inputs (see the file comment). It returns NaN if
// any input is NaN or infinite.
func Orient2D(ax, ay, bx, by, cx, cy float64) float64 {
	detleft := float64((ax - cx) * (by - cy))
	detright := float64((ay - cy) * (bx - cx))
	det := detleft - detright
	detsum := math.Abs(detleft) + math.Abs(detright)
	if errbound := ccwErrBoundA * detsum; (det > errbound || -det > errbound) && detsum >= orientFloor {
		return det
	}
	return orient2dSlow(ax, ay, bx, by, cx, cy, detsum)
}

// orient2dSlow handles the inputs the stage-A filter could not decide.
func orient2dSlow(ax, ay, bx, by, cx, cy, detsum float64) float64 {
	if !safe6(ax, ay, bx, by, cx, cy, orientLo, orientHi) {
		if !finite6(ax, ay, bx, by, cx, cy) {
			return math.NaN()
		}
		return orient2dBig(ax, ay, bx, by, cx, cy)
	}
	return orient2dAdapt(ax, ay, bx, by, cx, cy, detsum)
}

// orient2dAdapt is Shewchuk's orient2dadapt: stages B, C and D.
func orient2dAdapt(ax, ay, bx, by, cx, cy, detsum float64) float64 {
	acx := ax - cx
	bcx := bx - cx
	acy := ay - cy
	bcy := by - cy

	var b [4]float64
	productDiff(b[:], acx, bcy, acy, bcx)
	det := estimate(b[:])
	errbound := ccwErrBoundB * detsum
	if det >= errbound || -det >= errbound {
		return det
	}

	acxtail := twoDiffTail(ax, cx, acx)
	bcxtail := twoDiffTail(bx, cx, bcx)
	acytail := twoDiffTail(ay, cy, acy)
	bcytail := twoDiffTail(by, cy, bcy)
	if acxtail == 0 && acytail == 0 && bcxtail == 0 && bcytail == 0 {
		return det // b is exact
	}

	errbound = ccwErrBoundC*detsum + resultErrBound*math.Abs(det)
	det += (float64(acx*bcytail) + float64(bcy*acxtail)) - (float64(acy*bcxtail) + float64(bcx*acytail))
	if det >= errbound || -det >= errbound {
		return det
	}

	var u [4]float64
	var c1 [8]float64
	var c2 [12]float64
	var d [16]float64
	productDiff(u[:], acxtail, bcy, acytail, bcx)
	n1 := expansionSum(b[:], u[:], c1[:])
	productDiff(u[:], acx, bcytail, acy, bcxtail)
	n2 := expansionSum(c1[:n1], u[:], c2[:])
	productDiff(u[:], acxtail, bcytail, acytail, bcxtail)
	n := expansionSum(c2[:n2], u[:], d[:])
	return d[n-1]
}

// InCircle returns a positive value when d lies strictly inside the circle
// through a, b, c (taken counter-clockwise), a negative value when d lies
// outside, and zero when the four points are cocircular. If a, b, c are
// clockwise the sign is reversed. The sign is exact for all finite inputs
// (see the file comment). It returns NaN if any input is NaN or infinite.
func InCircle(ax, ay, bx, by, cx, cy, dx, dy float64) float64 {
	adx := ax - dx
	bdx := bx - dx
	cdx := cx - dx
	ady := ay - dy
	bdy := by - dy
	cdy := cy - dy

	bdxcdy := float64(bdx * cdy)
	cdxbdy := float64(cdx * bdy)
	alift := float64(adx*adx) + float64(ady*ady)

	cdxady := float64(cdx * ady)
	adxcdy := float64(adx * cdy)
	blift := float64(bdx*bdx) + float64(bdy*bdy)

	adxbdy := float64(adx * bdy)
	bdxady := float64(bdx * ady)
	clift := float64(cdx*cdx) + float64(cdy*cdy)

	det := float64(alift*(bdxcdy-cdxbdy)) + float64(blift*(cdxady-adxcdy)) + float64(clift*(adxbdy-bdxady))
	permanent := float64((math.Abs(bdxcdy)+math.Abs(cdxbdy))*alift) +
		float64((math.Abs(cdxady)+math.Abs(adxcdy))*blift) +
		float64((math.Abs(adxbdy)+math.Abs(bdxady))*clift)
	if errbound := iccErrBoundA * permanent; (det > errbound || -det > errbound) && permanent >= incircleFloor && alift+blift+clift <= incircleLiftCeil {
		return det
	}
	return inCircleSlow(ax, ay, bx, by, cx, cy, dx, dy, permanent)
}

// inCircleSlow handles the inputs the stage-A filter could not decide.
func inCircleSlow(ax, ay, bx, by, cx, cy, dx, dy, permanent float64) float64 {
	if !safe6(ax, ay, bx, by, cx, cy, incircleLo, incircleHi) || !safe2(dx, dy, incircleLo, incircleHi) {
		if !finite6(ax, ay, bx, by, cx, cy) || !finite6(dx, dy, 0, 0, 0, 0) {
			return math.NaN()
		}
		return inCircleBig(ax, ay, bx, by, cx, cy, dx, dy)
	}
	return inCircleAdapt(ax, ay, bx, by, cx, cy, dx, dy, permanent)
}

// liftedTerm writes into h the exact expansion of
// ((x)² + (y)²) · (p*q - r*s) for float64 x, y, p, q, r, s, and returns its
// length. h needs 32 components.
func liftedTerm(h []float64, x, y, p, q, r, s float64) int {
	var bc [4]float64
	var xbc, ybc [8]float64
	var xxbc, yybc [16]float64
	productDiff(bc[:], p, q, r, s)
	nx := scaleExpansion(bc[:], x, xbc[:])
	nxx := scaleExpansion(xbc[:nx], x, xxbc[:])
	ny := scaleExpansion(bc[:], y, ybc[:])
	nyy := scaleExpansion(ybc[:ny], y, yybc[:])
	return expansionSum(xxbc[:nxx], yybc[:nyy], h)
}

// inCircleAdapt is Shewchuk's incircleadapt, stages B and C, with
// incircleexact as the final stage.
func inCircleAdapt(ax, ay, bx, by, cx, cy, dx, dy, permanent float64) float64 {
	adx := ax - dx
	bdx := bx - dx
	cdx := cx - dx
	ady := ay - dy
	bdy := by - dy
	cdy := cy - dy

	var adet, bdet, cdet [32]float64
	var abdet [64]float64
	var fin [96]float64
	na := liftedTerm(adet[:], adx, ady, bdx, cdy, cdx, bdy)
	nb := liftedTerm(bdet[:], bdx, bdy, cdx, ady, adx, cdy)
	nc := liftedTerm(cdet[:], cdx, cdy, adx, bdy, bdx, ady)
	nab := expansionSum(adet[:na], bdet[:nb], abdet[:])
	n := expansionSum(abdet[:nab], cdet[:nc], fin[:])

	det := estimate(fin[:n])
	errbound := iccErrBoundB * permanent
	if det >= errbound || -det >= errbound {
		return det
	}

	adxtail := twoDiffTail(ax, dx, adx)
	adytail := twoDiffTail(ay, dy, ady)
	bdxtail := twoDiffTail(bx, dx, bdx)
	bdytail := twoDiffTail(by, dy, bdy)
	cdxtail := twoDiffTail(cx, dx, cdx)
	cdytail := twoDiffTail(cy, dy, cdy)
	if adxtail == 0 && bdxtail == 0 && cdxtail == 0 && adytail == 0 && bdytail == 0 && cdytail == 0 {
		return det // fin is exact
	}

	errbound = iccErrBoundC*permanent + resultErrBound*math.Abs(det)
	m := func(a, b float64) float64 { return float64(a * b) }
	det += ((m(adx, adx)+m(ady, ady))*((m(bdx, cdytail)+m(cdy, bdxtail))-(m(bdy, cdxtail)+m(cdx, bdytail))) +
		2.0*(m(adx, adxtail)+m(ady, adytail))*(m(bdx, cdy)-m(bdy, cdx))) +
		((m(bdx, bdx)+m(bdy, bdy))*((m(cdx, adytail)+m(ady, cdxtail))-(m(cdy, adxtail)+m(adx, cdytail))) +
			2.0*(m(bdx, bdxtail)+m(bdy, bdytail))*(m(cdx, ady)-m(cdy, adx))) +
		((m(cdx, cdx)+m(cdy, cdy))*((m(adx, bdytail)+m(bdy, adxtail))-(m(ady, bdxtail)+m(bdx, adytail))) +
			2.0*(m(cdx, cdxtail)+m(cdy, cdytail))*(m(adx, bdy)-m(ady, bdx)))
	if det >= errbound || -det >= errbound {
		return det
	}
	return inCircleExact(ax, ay, bx, by, cx, cy, dx, dy)
}

// inCircleExact is Shewchuk's incircleexact: the exact value of the lifted
// 4×4 determinant
//
//	la·orient(b,c,d) − lb·orient(c,d,a) + lc·orient(d,a,b) − ld·orient(a,b,c),
//
// where lp = px² + py², computed on the untranslated coordinates.
func inCircleExact(ax, ay, bx, by, cx, cy, dx, dy float64) float64 {
	var ab, bc, cd, da, ac, bd [4]float64
	productDiff(ab[:], ax, by, bx, ay)
	productDiff(bc[:], bx, cy, cx, by)
	productDiff(cd[:], cx, dy, dx, cy)
	productDiff(da[:], dx, ay, ax, dy)
	productDiff(ac[:], ax, cy, cx, ay)
	productDiff(bd[:], bx, dy, dx, by)

	var temp [8]float64
	var cda, dab, abc, bcd [12]float64
	n := expansionSum(cd[:], da[:], temp[:])
	ncda := expansionSum(temp[:n], ac[:], cda[:])
	n = expansionSum(da[:], ab[:], temp[:])
	ndab := expansionSum(temp[:n], bd[:], dab[:])
	negateExpansion(bd[:])
	negateExpansion(ac[:])
	n = expansionSum(ab[:], bc[:], temp[:])
	nabc := expansionSum(temp[:n], ac[:], abc[:])
	n = expansionSum(bc[:], cd[:], temp[:])
	nbcd := expansionSum(temp[:n], bd[:], bcd[:])

	var adet, bdet, cdet, ddet [96]float64
	na := liftExact(adet[:], bcd[:nbcd], ax, ay)
	nb := liftExact(bdet[:], cda[:ncda], bx, by)
	negateExpansion(bdet[:nb])
	nc := liftExact(cdet[:], dab[:ndab], cx, cy)
	nd := liftExact(ddet[:], abc[:nabc], dx, dy)
	negateExpansion(ddet[:nd])

	var abdet, cddet [192]float64
	var deter [384]float64
	nab := expansionSum(adet[:na], bdet[:nb], abdet[:])
	ncd := expansionSum(cdet[:nc], ddet[:nd], cddet[:])
	n = expansionSum(abdet[:nab], cddet[:ncd], deter[:])
	return deter[n-1]
}

// liftExact writes (x² + y²)·e into h (96 components for len(e) <= 12) and
// returns its length.
func liftExact(h, e []float64, x, y float64) int {
	var ex, ey [24]float64
	var exx, eyy [48]float64
	nx := scaleExpansion(e, x, ex[:])
	nxx := scaleExpansion(ex[:nx], x, exx[:])
	ny := scaleExpansion(e, y, ey[:])
	nyy := scaleExpansion(ey[:ny], y, eyy[:])
	return expansionSum(exx[:nxx], eyy[:nyy], h)
}

// inRange reports whether v is zero or has magnitude in [lo, hi]. NaN is
// not in range.
func inRange(v, lo, hi float64) bool {
	a := math.Abs(v)
	return a == 0 || (a >= lo && a <= hi)
}

func safe2(a, b, lo, hi float64) bool { return inRange(a, lo, hi) && inRange(b, lo, hi) }

func safe6(a, b, c, d, e, f, lo, hi float64) bool {
	return safe2(a, b, lo, hi) && safe2(c, d, lo, hi) && safe2(e, f, lo, hi)
}

func finite6(a, b, c, d, e, f float64) bool {
	const m = math.MaxFloat64
	return math.Abs(a) <= m && math.Abs(b) <= m && math.Abs(c) <= m &&
		math.Abs(d) <= m && math.Abs(e) <= m && math.Abs(f) <= m
}

// ratFloat returns r as a float64 whose sign is r's sign, even when r's
// magnitude underflows float64.
func ratFloat(r *big.Rat) float64 {
	f, _ := r.Float64()
	if f == 0 && r.Sign() != 0 {
		return float64(r.Sign()) * math.SmallestNonzeroFloat64
	}
	return f
}

// orient2dBig evaluates Orient2D exactly with math/big (finite inputs).
func orient2dBig(ax, ay, bx, by, cx, cy float64) float64 {
	r := func(v float64) *big.Rat { return new(big.Rat).SetFloat64(v) }
	sub := func(p, q float64) *big.Rat { return new(big.Rat).Sub(r(p), r(q)) }
	l := new(big.Rat).Mul(sub(ax, cx), sub(by, cy))
	rr := new(big.Rat).Mul(sub(ay, cy), sub(bx, cx))
	return ratFloat(l.Sub(l, rr))
}

// inCircleBig evaluates InCircle exactly with math/big (finite inputs).
func inCircleBig(ax, ay, bx, by, cx, cy, dx, dy float64) float64 {
	r := func(v float64) *big.Rat { return new(big.Rat).SetFloat64(v) }
	sub := func(p, q float64) *big.Rat { return new(big.Rat).Sub(r(p), r(q)) }
	mul := func(p, q *big.Rat) *big.Rat { return new(big.Rat).Mul(p, q) }
	adx, ady := sub(ax, dx), sub(ay, dy)
	bdx, bdy := sub(bx, dx), sub(by, dy)
	cdx, cdy := sub(cx, dx), sub(cy, dy)
	lift := func(x, y *big.Rat) *big.Rat { return new(big.Rat).Add(mul(x, x), mul(y, y)) }
	cross := func(px, py, qx, qy *big.Rat) *big.Rat { return new(big.Rat).Sub(mul(px, qy), mul(py, qx)) }
	det := mul(lift(adx, ady), cross(bdx, bdy, cdx, cdy))
	det.Add(det, mul(lift(bdx, bdy), cross(cdx, cdy, adx, ady)))
	det.Add(det, mul(lift(cdx, cdy), cross(adx, ady, bdx, bdy)))
	return ratFloat(det)
}
