// Exact power test for weighted points (the predicate of the regular, or
// weighted Delaunay, triangulation), in the adaptive style of Shewchuk,
// "Adaptive precision floating-point arithmetic and fast robust geometric
// predicates", Discrete & Computational Geometry 18, 1997.
//
// A weighted point (p, w) lifts to (x, y, z) with z = x² + y² − w. The power
// test of d against the counter-clockwise triangle abc is the sign of the
// lifted determinant
//
//	| ax ay za 1 |
//	| bx by zb 1 |      = za·O(b,c,d) − zb·O(c,d,a) + zc·O(d,a,b) − zd·O(a,b,c),
//	| cx cy zc 1 |
//	| dx dy zd 1 |
//
// O = Orient2D's determinant; the sign convention is InCircle's: positive
// when d is in conflict with abc (its lifted point lies below the plane
// through the lifted a, b, c: d has, somewhere near the triangle, a smaller
// power than a, b and c). With all weights equal the weight column is a
// multiple of the ones column and the test is InCircle exactly.
//
// Evaluation. Translating every point by −d adds a linear function to z,
// which leaves the determinant unchanged, so it equals the 3×3 determinant
// Σ L_a·C_a with L_a = adx² + ady² − (wa − wd) and C_a = bdx·cdy − cdx·bdy
// (cyclically), adx = ax − dx and so on.
//
//   - Stage A evaluates that in float64. Error bound (ε = 2⁻⁵³, each
//     operation rounds with relative error at most ε): each difference
//     rounds once, so each computed square carries at most 3ε + O(ε²)
//     relative error and their sum 4ε + O(ε²); wa − wd carries ε; the lift
//     L therefore differs from its exact value by at most
//     (5ε + O(ε²))·λ, λ = adx² + ady² + |wa − wd|. C carries at most
//     (4ε + O(ε²))·κ, κ = |bdx·cdy| + |cdx·bdy|. The product rounds once:
//     (4 + 5 + 1)ε·λκ. The two additions add 2ε·Σλκ. So |det − exact| ≤
//     (12ε + O(ε²))·Σλκ, and the computed permanent Σλκ is within a factor
//     1 ± 12ε of the exact one. powErrBoundA = (12 + 256ε)ε takes the
//     second-order terms generously (they are below 200ε²) and includes the
//     16ε² of underflow slack of InCircle's bound; the filter is trusted
//     only in the same magnitude window as InCircle's (permanent at least
//     2⁻⁵⁰⁰, lifts summing to at most 2⁴⁰⁰), see predicates.go.
//   - When all four weights are equal the undecided case is InCircle
//     (stages B–D there).
//   - Otherwise the exact value: the 4×4 expansion above on the
//     untranslated coordinates (Shewchuk's incircleexact with the weight
//     terms −w·O added). With every nonzero coordinate of magnitude in
//     [2⁻²⁰⁰, 2²⁰⁰] and every nonzero weight in [2⁻⁴⁰⁰, 2⁴⁰⁰] each
//     intermediate is a multiple of 2⁻¹⁰⁰⁸ and far below 2¹⁰²³, so every
//     error-free transformation is exact; other finite inputs are
//     evaluated with math/big.
//
// Hence the sign is exact for all finite float64 inputs; NaN or ±Inf give
// NaN.
//
// Symbolic perturbation (Edelsbrunner & Mücke, "Simulation of simplicity",
// ACM Trans. Graphics 9, 1990; in the form of Devillers & Teillaud,
// "Perturbations for Delaunay and weighted Delaunay 3D triangulations",
// Computational Geometry 44, 2011, as also used by CGAL's 2D regular
// triangulation): every lift z_i is raised by δ_i, a positive
// infinitesimal that is larger, by an infinite factor, the larger the point
// is in (x, y) lexicographic order. The perturbed determinant is
// det + Σ δ_i·cof_i, with cofactors cof_a = O(b,c,d), cof_b = O(a,d,c),
// cof_c = O(a,b,d), cof_d = −O(a,b,c); when det = 0 its sign is the sign of
// the cofactor of the lexicographically largest point whose cofactor is
// not zero. For distinct points with abc not collinear one exists among
// the two largest. The perturbed test is never zero, so every degenerate
// configuration (cocircular points with equal weights, a point exactly on
// the boundary of a power cell) is decided the same way on every run,
// independent of the input order: the perturbed regular triangulation is
// unique.
//
// For three collinear points the lifted test is one dimension lower:
// z_q against the line through the lifted u and v, evaluated exactly with
// math/big (it only arises for points on the line of a hull edge). Under the
// same perturbation, a tie is decided by the lexicographic order: q lies
// below the perturbed line exactly when q is the middle one of the three.

package planar

import (
	"math"
	"math/big"
)

const (
	// powErrBoundA bounds the stage-A error of PowerTest relative to its
	// permanent; derived in the file comment.
	powErrBoundA = (12.0 + 256.0*epsilon) * epsilon
	// Nonzero weights of magnitude in [powWeightLo, powWeightHi] keep the
	// expansion arithmetic exact (file comment).
	powWeightLo, powWeightHi = 0x1p-400, 0x1p400
)

// PowerTest returns a positive value when the weighted point (dx, dy, dw)
// is in conflict with the counter-clockwise triangle of weighted points a,
// b, c (its lifted point x² + y² − w lies below the plane through theirs),
// a negative value when it is not, and zero when the four lifted points are
// coplanar. If a, b, c are clockwise the sign is reversed. With equal
// weights it has the sign of InCircle. The sign is exact for all finite
// inputs (see the file comment); NaN or infinite inputs give NaN.
func PowerTest(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) float64 {
	adx, ady := ax-dx, ay-dy
	bdx, bdy := bx-dx, by-dy
	cdx, cdy := cx-dx, cy-dy
	aww, bww, cww := aw-dw, bw-dw, cw-dw

	bdxcdy, cdxbdy := float64(bdx*cdy), float64(cdx*bdy)
	cdxady, adxcdy := float64(cdx*ady), float64(adx*cdy)
	adxbdy, bdxady := float64(adx*bdy), float64(bdx*ady)
	asq := float64(adx*adx) + float64(ady*ady)
	bsq := float64(bdx*bdx) + float64(bdy*bdy)
	csq := float64(cdx*cdx) + float64(cdy*cdy)
	alift, blift, clift := asq-aww, bsq-bww, csq-cww
	det := float64(alift*(bdxcdy-cdxbdy)) + float64(blift*(cdxady-adxcdy)) + float64(clift*(adxbdy-bdxady))
	al, bl, cl := asq+math.Abs(aww), bsq+math.Abs(bww), csq+math.Abs(cww)
	permanent := float64((math.Abs(bdxcdy)+math.Abs(cdxbdy))*al) +
		float64((math.Abs(cdxady)+math.Abs(adxcdy))*bl) +
		float64((math.Abs(adxbdy)+math.Abs(bdxady))*cl)
	if errbound := powErrBoundA * permanent; (det > errbound || -det > errbound) && permanent >= incircleFloor && al+bl+cl <= incircleLiftCeil {
		return det
	}
	return powerSlow(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw)
}

// powerSlow decides the cases the stage-A filter left open.
func powerSlow(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) float64 {
	if aw == dw && bw == dw && cw == dw {
		return InCircle(ax, ay, bx, by, cx, cy, dx, dy)
	}
	if !safe6(ax, ay, bx, by, cx, cy, incircleLo, incircleHi) || !safe2(dx, dy, incircleLo, incircleHi) ||
		!safe2(aw, bw, powWeightLo, powWeightHi) || !safe2(cw, dw, powWeightLo, powWeightHi) {
		if !finite6(ax, ay, bx, by, cx, cy) || !finite6(dx, dy, aw, bw, cw, dw) {
			return math.NaN()
		}
		return powerBig(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw)
	}
	return powerExact(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw)
}

// powerExact is the exact lifted 4×4 determinant
//
//	za·O(b,c,d) − zb·O(c,d,a) + zc·O(d,a,b) − zd·O(a,b,c),
//
// z = x² + y² − w, on the untranslated coordinates (inCircleExact with the
// weight terms).
func powerExact(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) float64 {
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

	var adet, bdet, cdet, ddet [120]float64
	na := liftExactW(adet[:], bcd[:nbcd], ax, ay, aw)
	nb := liftExactW(bdet[:], cda[:ncda], bx, by, bw)
	negateExpansion(bdet[:nb])
	nc := liftExactW(cdet[:], dab[:ndab], cx, cy, cw)
	nd := liftExactW(ddet[:], abc[:nabc], dx, dy, dw)
	negateExpansion(ddet[:nd])

	var abdet, cddet [240]float64
	var deter [480]float64
	nab := expansionSum(adet[:na], bdet[:nb], abdet[:])
	ncd := expansionSum(cdet[:nc], ddet[:nd], cddet[:])
	n = expansionSum(abdet[:nab], cddet[:ncd], deter[:])
	return deter[n-1]
}

// liftExactW writes (x² + y² − w)·e into h (120 components for
// len(e) <= 12) and returns its length.
func liftExactW(h, e []float64, x, y, w float64) int {
	var l [96]float64
	nl := liftExact(l[:], e, x, y)
	if w == 0 {
		copy(h, l[:nl])
		return nl
	}
	var we [24]float64
	nw := scaleExpansion(e, -w, we[:])
	return expansionSum(l[:nl], we[:nw], h)
}

// powerBig evaluates the power test exactly with math/big (finite inputs).
func powerBig(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) float64 {
	r := func(v float64) *big.Rat { return new(big.Rat).SetFloat64(v) }
	sub := func(p, q float64) *big.Rat { return new(big.Rat).Sub(r(p), r(q)) }
	mul := func(p, q *big.Rat) *big.Rat { return new(big.Rat).Mul(p, q) }
	adx, ady := sub(ax, dx), sub(ay, dy)
	bdx, bdy := sub(bx, dx), sub(by, dy)
	cdx, cdy := sub(cx, dx), sub(cy, dy)
	lift := func(x, y, w *big.Rat) *big.Rat {
		l := new(big.Rat).Add(mul(x, x), mul(y, y))
		return l.Sub(l, w)
	}
	cross := func(px, py, qx, qy *big.Rat) *big.Rat { return new(big.Rat).Sub(mul(px, qy), mul(py, qx)) }
	det := mul(lift(adx, ady, sub(aw, dw)), cross(bdx, bdy, cdx, cdy))
	det.Add(det, mul(lift(bdx, bdy, sub(bw, dw)), cross(cdx, cdy, adx, ady)))
	det.Add(det, mul(lift(cdx, cdy, sub(cw, dw)), cross(adx, ady, bdx, bdy)))
	return ratFloat(det)
}

// wPt is a weighted point of the regular triangulation's working arrays.
type wPt struct{ x, y, w float64 }

// lexLess reports whether a precedes b in (x, y) lexicographic order, the
// order of the symbolic perturbation.
func lexLess(a, b wPt) bool {
	return a.x < b.x || (a.x == b.x && a.y < b.y)
}

// orientSgn returns the sign of Orient2D(a, b, c).
func orientSgn(a, b, c wPt) int {
	return orientSign(xyPt{a.x, a.y}, xyPt{b.x, b.y}, c.x, c.y)
}

// powerConflict reports whether d is in conflict with the counter-clockwise,
// non-degenerate triangle abc under the symbolic perturbation (file
// comment). The points must be distinct.
func powerConflict(a, b, c, d wPt) bool {
	switch s := powerFiltered(a, b, c, d); {
	case s > 0:
		return true
	case s < 0:
		return false
	}
	pts := [4]wPt{a, b, c, d}
	var idx = [4]int{0, 1, 2, 3}
	// Sort by decreasing lexicographic order (insertion sort of four).
	for i := 1; i < 4; i++ {
		for j := i; j > 0 && lexLess(pts[idx[j-1]], pts[idx[j]]); j-- {
			idx[j-1], idx[j] = idx[j], idx[j-1]
		}
	}
	for _, k := range idx {
		var s int
		switch k {
		case 0:
			s = orientSgn(b, c, d)
		case 1:
			s = orientSgn(a, d, c)
		case 2:
			s = orientSgn(a, b, d)
		default:
			s = -orientSgn(a, b, c)
		}
		if s != 0 {
			return s > 0
		}
	}
	return false // unreachable for distinct points with abc not collinear
}

// powerFiltered returns the sign of PowerTest(a, b, c, d) with stage A in
// line.
func powerFiltered(a, b, c, d wPt) int {
	adx, ady := a.x-d.x, a.y-d.y
	bdx, bdy := b.x-d.x, b.y-d.y
	cdx, cdy := c.x-d.x, c.y-d.y
	aww, bww, cww := a.w-d.w, b.w-d.w, c.w-d.w
	bdxcdy, cdxbdy := float64(bdx*cdy), float64(cdx*bdy)
	cdxady, adxcdy := float64(cdx*ady), float64(adx*cdy)
	adxbdy, bdxady := float64(adx*bdy), float64(bdx*ady)
	asq := float64(adx*adx) + float64(ady*ady)
	bsq := float64(bdx*bdx) + float64(bdy*bdy)
	csq := float64(cdx*cdx) + float64(cdy*cdy)
	det := float64((asq-aww)*(bdxcdy-cdxbdy)) + float64((bsq-bww)*(cdxady-adxcdy)) + float64((csq-cww)*(adxbdy-bdxady))
	al, bl, cl := asq+math.Abs(aww), bsq+math.Abs(bww), csq+math.Abs(cww)
	permanent := float64((math.Abs(bdxcdy)+math.Abs(cdxbdy))*al) +
		float64((math.Abs(cdxady)+math.Abs(adxcdy))*bl) +
		float64((math.Abs(adxbdy)+math.Abs(bdxady))*cl)
	if bound := powErrBoundA * permanent; permanent >= incircleFloor && al+bl+cl <= incircleLiftCeil {
		if det > bound {
			return 1
		}
		if -det > bound {
			return -1
		}
	}
	switch s := powerSlow(a.x, a.y, a.w, b.x, b.y, b.w, c.x, c.y, c.w, d.x, d.y, d.w); {
	case s > 0:
		return 1
	case s < 0:
		return -1
	}
	return 0
}

// lift1D returns the sign of z_q − ℓ(q), where ℓ is the affine function
// along the line through the distinct points u, v that matches their lifts
// z = x² + y² − w, for q on that line (exact, math/big). Negative means q
// lies below the lifted line.
func lift1D(u, v, q wPt) int {
	r := func(f float64) *big.Rat { return new(big.Rat).SetFloat64(f) }
	// Parameter along the line: the coordinate in which u and v differ.
	tu, tv, tq := r(u.x), r(v.x), r(q.x)
	if u.x == v.x {
		tu, tv, tq = r(u.y), r(v.y), r(q.y)
	}
	z := func(p wPt) *big.Rat {
		x, y := r(p.x), r(p.y)
		s := new(big.Rat).Mul(x, x)
		s.Add(s, new(big.Rat).Mul(y, y))
		return s.Sub(s, r(p.w))
	}
	zu, zv, zq := z(u), z(v), z(q)
	// (tv − tu)·(zq − ℓ(q)) = zq(tv − tu) − zu(tv − tq) − zv(tq − tu).
	d := new(big.Rat).Sub(tv, tu)
	acc := new(big.Rat).Mul(zq, d)
	acc.Sub(acc, new(big.Rat).Mul(zu, new(big.Rat).Sub(tv, tq)))
	acc.Sub(acc, new(big.Rat).Mul(zv, new(big.Rat).Sub(tq, tu)))
	return acc.Sign() * d.Sign()
}

// below1D reports whether q, collinear with the distinct points u and v,
// lies below their lifted line under the symbolic perturbation: exactly,
// or on the line and the middle one of the three in lexicographic order.
func below1D(u, v, q wPt) bool {
	switch s := lift1D(u, v, q); {
	case s < 0:
		return true
	case s > 0:
		return false
	}
	return lexLess(u, q) != lexLess(v, q)
}

// conflictInfinite reports whether q is in conflict with the infinite
// triangle of the hull edge u→v (the half-plane strictly left of u→v, and
// on the line the points below the lifted line through u and v).
func conflictInfinite(u, v, q wPt) bool {
	switch o := orientSgn(u, v, q); {
	case o > 0:
		return true
	case o < 0:
		return false
	}
	return below1D(u, v, q)
}
