// Circumcentres of triangles.
//
// The circumcentre of triangle abc, taken relative to a with b' = b − a,
// c' = c − a and d = 2·cross(b', c'), is
//
//	x = a_x + (c'_y·|b'|² − b'_y·|c'|²) / d,
//	y = a_y + (b'_x·|c'|² − c'_x·|b'|²) / d
//
// (the determinant formula: the point equidistant from a, b and c). It is
// accurate when a is the vertex of the largest angle: its two edges are the
// shortest and meet at 60° or more, so d suffers no cancellation even for a
// needle triangle; callers that need accuracy pass that vertex first.
//
// Error bound (CircumcentreErr). A forward error analysis with unit roundoff
// u = 2⁻⁵³: each numerator (two squared lengths of two roundings each, two
// products, a difference, all after the rounded differences b', c') is
// within ccNumErr = 8u of its permanent m_x = |c'_y·|b'|²| + |b'_y·|c'|²|
// (resp. m_y); d is within ccDetErr = 4u of its permanent
// 2(|b'_x c'_y| + |b'_y c'_x|), which moves the quotient q by 4u·|q|·perm/|d|;
// the division and the final addition add u·|q| and u·|x|. The sum of these
// terms is doubled (ccSafety) to cover second-order terms:
//
//	err = ccSafety · max over x, y of (8u·m + 4u·|q|·perm)/|d| + u·|q| + u·|x|.
//
// A degenerate triangle (d = 0) gets a as its centre and err = −1.
//
// Power centres (powerCentreErr): for weighted vertices the point of equal
// power |x − p|² − w is the same formula with |b'|² + (wa − wb) and
// |c'|² + (wa − wc) in place of the squared lengths (Aurenhammer, SIAM J.
// Comput. 16, 1987); with equal weights it is the circumcentre.

package planar

import "math"

const (
	ccNumErr = 8 * epsilon // relative error of a numerator against its permanent
	ccDetErr = 4 * epsilon // relative error of d against its permanent
	ccSafety = 2           // factor covering the second-order terms
	// pcNumErr is ccNumErr for a power centre: the lifted length
	// |b'|² + (wa − wb) adds the rounding of the weight difference and of
	// the sum (2u) against the permanent |b'|² + |wa − wb|.
	pcNumErr = ccNumErr + 2*epsilon
)

// Circumcentre returns the circumcentre of triangle abc, computed relative
// to a (see the file comment; pass the vertex of the largest angle as a for
// accuracy). A degenerate (collinear) triangle gives ±Inf or NaN.
func Circumcentre(ax, ay, bx, by, cx, cy float64) (x, y float64) {
	qx, qy, _, _, _, _ := circumcentreOffset(bx-ax, by-ay, cx-ax, cy-ay)
	return ax + qx, ay + qy
}

// CircumcentreErr is Circumcentre with a bound err on the rounding error of
// each coordinate (the file comment derives it). For a degenerate triangle
// it returns (ax, ay, −1).
func CircumcentreErr(ax, ay, bx, by, cx, cy float64) (x, y, err float64) {
	bdx, bdy := bx-ax, by-ay
	cdx, cdy := cx-ax, cy-ay
	qx, qy, d, perm, mx, my := circumcentreOffset(bdx, bdy, cdx, cdy)
	if d == 0 {
		return ax, ay, -1
	}
	x, y = ax+qx, ay+qy
	ad := math.Abs(d)
	ex := (ccNumErr*mx+ccDetErr*math.Abs(qx)*perm)/ad + epsilon*math.Abs(qx) + epsilon*math.Abs(x)
	ey := (ccNumErr*my+ccDetErr*math.Abs(qy)*perm)/ad + epsilon*math.Abs(qy) + epsilon*math.Abs(y)
	return x, y, ccSafety * math.Max(ex, ey)
}

// circumcentreOffset returns the circumcentre (qx, qy) of the triangle 0,
// b', c' given b' = (bdx, bdy) and c' = (cdx, cdy), the denominator d, and
// the permanents of d and of the two numerators (for the error bound; the
// compiler drops them where unused).
func circumcentreOffset(bdx, bdy, cdx, cdy float64) (qx, qy, d, perm, mx, my float64) {
	b2 := float64(bdx*bdx) + float64(bdy*bdy)
	c2 := float64(cdx*cdx) + float64(cdy*cdy)
	d = 2 * (float64(bdx*cdy) - float64(bdy*cdx))
	qx = (float64(cdy*b2) - float64(bdy*c2)) / d
	qy = (float64(bdx*c2) - float64(cdx*b2)) / d
	perm = 2 * (math.Abs(bdx*cdy) + math.Abs(bdy*cdx))
	mx = math.Abs(cdy*b2) + math.Abs(bdy*c2)
	my = math.Abs(bdx*c2) + math.Abs(cdx*b2)
	return
}

// powerCentreErr returns the power centre (orthocentre) of the weighted
// triangle abc: the point with equal power |x − p|² − w with respect to
// its three vertices, where the three power lines meet. Relative to a it
// is the circumcentre formula with |b'|² replaced by |b'|² + (wa − wb) and
// |c'|² by |c'|² + (wa − wc) (from 2x·b' = |b'|² + wa − wb). The error
// bound is CircumcentreErr's with those lifted lengths in the numerator
// permanents and two more roundings (the weight difference and its sum),
// pcNumErr. A degenerate triangle gives (ax, ay, −1).
func powerCentreErr(ax, ay, aw, bx, by, bw, cx, cy, cw float64) (x, y, err float64) {
	bdx, bdy := bx-ax, by-ay
	cdx, cdy := cx-ax, cy-ay
	dwb, dwc := aw-bw, aw-cw
	b2 := float64(bdx*bdx) + float64(bdy*bdy) + dwb
	c2 := float64(cdx*cdx) + float64(cdy*cdy) + dwc
	d := 2 * (float64(bdx*cdy) - float64(bdy*cdx))
	if d == 0 {
		return ax, ay, -1
	}
	qx := (float64(cdy*b2) - float64(bdy*c2)) / d
	qy := (float64(bdx*c2) - float64(cdx*b2)) / d
	perm := 2 * (math.Abs(bdx*cdy) + math.Abs(bdy*cdx))
	lb := bdx*bdx + bdy*bdy + math.Abs(dwb)
	lc := cdx*cdx + cdy*cdy + math.Abs(dwc)
	mx := math.Abs(cdy)*lb + math.Abs(bdy)*lc
	my := math.Abs(bdx)*lc + math.Abs(cdx)*lb
	x, y = ax+qx, ay+qy
	ad := math.Abs(d)
	ex := (pcNumErr*mx+ccDetErr*math.Abs(qx)*perm)/ad + epsilon*math.Abs(qx) + epsilon*math.Abs(x)
	ey := (pcNumErr*my+ccDetErr*math.Abs(qy)*perm)/ad + epsilon*math.Abs(qy) + epsilon*math.Abs(y)
	return x, y, ccSafety * math.Max(ex, ey)
}
