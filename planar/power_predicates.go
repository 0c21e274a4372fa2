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
	if det, ok := powerStageA(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw); ok {
		return det
	}
	return powerSlow(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw)
}

// powerStageA evaluates the translated determinant in float64 and reports
// whether its sign is certain (stage A, bound powErrBoundA).
func powerStageA(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) (float64, bool) {
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
	errbound := powErrBoundA * permanent
	return det, (det > errbound || -det > errbound) && permanent >= incircleFloor && al+bl+cl <= incircleLiftCeil
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
// z = x² + y² − w, on the untranslated coordinates (Shewchuk's
// incircleexact with the weight terms; each cofactor is expanded on its
// own).
func powerExact(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) float64 {
	p := [4][3]float64{{ax, ay, aw}, {bx, by, bw}, {cx, cy, cw}, {dx, dy, dw}}
	var terms [4][120]float64
	var nt [4]int
	for k := 0; k < 4; k++ {
		// Cofactor of point k: ±O of the other three in cyclic order,
		// the sign alternating as in the expansion above.
		q, r, s := p[(k+1)%4], p[(k+2)%4], p[(k+3)%4]
		var o [12]float64
		no := orientExact(o[:], q[0], q[1], r[0], r[1], s[0], s[1])
		if k%2 == 1 {
			negateExpansion(o[:no])
		}
		nt[k] = liftExactW(terms[k][:], o[:no], p[k][0], p[k][1], p[k][2])
	}
	var ab, cd [240]float64
	var deter [480]float64
	nab := expansionSum(terms[0][:nt[0]], terms[1][:nt[1]], ab[:])
	ncd := expansionSum(terms[2][:nt[2]], terms[3][:nt[3]], cd[:])
	n := expansionSum(ab[:nab], cd[:ncd], deter[:])
	return deter[n-1]
}

// orientExact writes the exact expansion of O(q, r, s) =
// (qx·ry − rx·qy) + (rx·sy − sx·ry) + (sx·qy − qx·sy) into h (12
// components) and returns its length.
func orientExact(h []float64, qx, qy, rx, ry, sx, sy float64) int {
	var qr, rs, sq [4]float64
	var t [8]float64
	productDiff(qr[:], qx, ry, rx, qy)
	productDiff(rs[:], rx, sy, sx, ry)
	productDiff(sq[:], sx, qy, qx, sy)
	n := expansionSum(qr[:], rs[:], t[:])
	return expansionSum(t[:n], sq[:], h)
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

// powerBig evaluates the power test exactly with math/big (finite inputs),
// by the same cofactor expansion as powerExact.
func powerBig(ax, ay, aw, bx, by, bw, cx, cy, cw, dx, dy, dw float64) float64 {
	p := [4]wPt{{ax, ay, aw}, {bx, by, bw}, {cx, cy, cw}, {dx, dy, dw}}
	det := new(big.Rat)
	for k := 0; k < 4; k++ {
		q, r, s := p[(k+1)%4], p[(k+2)%4], p[(k+3)%4]
		term := new(big.Rat).Add(crossRat(q, r), crossRat(r, s))
		term.Add(term, crossRat(s, q))
		term.Mul(term, liftRat(p[k]))
		if k%2 == 1 {
			det.Sub(det, term)
		} else {
			det.Add(det, term)
		}
	}
	return ratFloat(det)
}

// crossRat returns qx·ry − rx·qy exactly.
func crossRat(q, r wPt) *big.Rat {
	a := new(big.Rat).Mul(new(big.Rat).SetFloat64(q.x), new(big.Rat).SetFloat64(r.y))
	return a.Sub(a, new(big.Rat).Mul(new(big.Rat).SetFloat64(r.x), new(big.Rat).SetFloat64(q.y)))
}

// liftRat returns x² + y² − w exactly.
func liftRat(p wPt) *big.Rat {
	x, y := new(big.Rat).SetFloat64(p.x), new(big.Rat).SetFloat64(p.y)
	z := new(big.Rat).Mul(x, x)
	z.Add(z, new(big.Rat).Mul(y, y))
	return z.Sub(z, new(big.Rat).SetFloat64(p.w))
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
	if s := PowerTest(a.x, a.y, a.w, b.x, b.y, b.w, c.x, c.y, c.w, d.x, d.y, d.w); s != 0 {
		return s > 0
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
	zu, zv, zq := liftRat(u), liftRat(v), liftRat(q)
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
	if s := lift1D(u, v, q); s != 0 {
		return s < 0
	}
	return lexLess(u, q) != lexLess(v, q)
}

// conflictInfinite reports whether q is in conflict with the infinite
// triangle of the hull edge u→v (the half-plane strictly left of u→v, and
// on the line the points below the lifted line through u and v).
func conflictInfinite(u, v, q wPt) bool {
	if o := orientSgn(u, v, q); o != 0 {
		return o > 0
	}
	return below1D(u, v, q)
}
