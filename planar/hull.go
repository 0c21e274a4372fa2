// Convex hull of a point set: Andrew's monotone chain (A. M. Andrew,
// "Another efficient algorithm for convex hulls in two dimensions",
// Information Processing Letters 9(5), 1979).
//
// The points are sorted by x, then y; the lower and the upper chain are
// built in one pass each, popping the last chain vertex while it does not
// make a strict left turn. Every turn is decided by the exact predicate
// Orient2D (Shewchuk 1997), so the hull is exact for the float64 inputs: no
// tolerance, no vertex dropped or kept by rounding. Vertices on a hull edge
// (collinear, Orient2D = 0) are dropped, and so are repeated points.
//
// Cost: O(n log n) for the sort, O(n) predicate calls; one copy of the
// input.

package planar

import (
	"cmp"
	"slices"

	"github.com/paulmach/orb"
)

// ConvexHull returns the convex hull of pts as an open ring (no closing
// repeat) running counter-clockwise from the point with the least x (least
// y among ties), with no collinear or repeated vertices. It returns nil when
// the points enclose no area: fewer than 3 distinct points, or all on one
// line. The coordinates must be finite; pts is not modified. O(n log n).
func ConvexHull(pts []orb.Point) orb.Ring {
	p := slices.Clone(pts)
	slices.SortFunc(p, func(a, b orb.Point) int {
		if c := cmp.Compare(a[0], b[0]); c != 0 {
			return c
		}
		return cmp.Compare(a[1], b[1])
	})
	p = slices.Compact(p)
	if len(p) < 3 {
		return nil
	}
	h := make(orb.Ring, 0, 2*len(p))
	// Lower chain, left to right.
	for _, q := range p {
		for len(h) >= 2 && hullTurn(h[len(h)-2], h[len(h)-1], q) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	// Upper chain, right to left; it must keep the lower chain intact.
	lower := len(h) + 1
	for i := len(p) - 2; i >= 0; i-- {
		q := p[i]
		for len(h) >= lower && hullTurn(h[len(h)-2], h[len(h)-1], q) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	h = h[:len(h)-1] // the first point again
	if len(h) < 3 {
		return nil
	}
	return h
}

// hullTurn is Orient2D(o, a, b): > 0 for a strict left turn o → a → b.
func hullTurn(o, a, b orb.Point) float64 {
	return Orient2D(o[0], o[1], a[0], a[1], b[0], b[1])
}
