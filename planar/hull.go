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
// Before the sort, the points strictly inside the polygon through the
// extreme points in eight directions (least and greatest x, y, x + y and
// x − y, in that angular order) are dropped (Akl and Toussaint, "A fast
// convex hull algorithm", Information Processing Letters 7(5), 1978). The
// test is exact and holds for any polygon through input points, however
// the float sums chose them: a point strictly left of every directed edge
// of a closed polygon has positive winding number, so it lies in the
// interior of the hull of those points and is no hull vertex. The hull is
// therefore the same as without the filter; for spread-out sites only the
// few points near the hull are left to sort.
//
// Cost: O(n) for the filter (eight exact orientations per point, most
// decided by the float filter), then O(m log m) for the sort of the m
// points kept (m = n at worst, about √n for uniform points in a square);
// one copy of the points kept.

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
	return hullChain(hullCandidates(pts))
}

// hullChain is Andrew's monotone chain on p, which it sorts in place.
func hullChain(p []orb.Point) orb.Ring {
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

// hullFilterMin is the point count from which ConvexHull filters the
// points by the octagon of extremes first; below it the sort is cheap.
const hullFilterMin = 64

// hullCandidates returns a copy of the points of pts that are not strictly
// inside the polygon of their extreme points in eight directions (see the
// file comment): every hull vertex is among them. O(n).
func hullCandidates(pts []orb.Point) []orb.Point {
	if len(pts) < hullFilterMin {
		return slices.Clone(pts)
	}
	oct := hullOctagon(pts)
	if len(oct) < 3 {
		return slices.Clone(pts)
	}
	var kept []orb.Point
next:
	for _, q := range pts {
		for i, a := range oct {
			b := oct[(i+1)%len(oct)]
			if Orient2D(a[0], a[1], b[0], b[1], q[0], q[1]) <= 0 {
				kept = append(kept, q)
				continue next
			}
		}
	}
	return kept
}

// hullOctagon returns the extreme points of pts in the directions −y,
// x − y, x, x + y, y, y − x, −x, −x − y (counter-clockwise), consecutive
// repeats dropped. The sums are rounded: a point chosen may fall short of
// the true extreme, which the exact filter tolerates.
func hullOctagon(pts []orb.Point) []orb.Point {
	score := [8]func(p orb.Point) float64{
		func(p orb.Point) float64 { return -p[1] },
		func(p orb.Point) float64 { return p[0] - p[1] },
		func(p orb.Point) float64 { return p[0] },
		func(p orb.Point) float64 { return p[0] + p[1] },
		func(p orb.Point) float64 { return p[1] },
		func(p orb.Point) float64 { return p[1] - p[0] },
		func(p orb.Point) float64 { return -p[0] },
		func(p orb.Point) float64 { return -p[0] - p[1] },
	}
	var best [8]orb.Point
	var val [8]float64
	for k := range best {
		best[k], val[k] = pts[0], score[k](pts[0])
	}
	for _, p := range pts[1:] {
		for k := range best {
			if v := score[k](p); v > val[k] {
				best[k], val[k] = p, v
			}
		}
	}
	oct := make([]orb.Point, 0, 8)
	for _, p := range best {
		if len(oct) == 0 || p != oct[len(oct)-1] {
			oct = append(oct, p)
		}
	}
	for len(oct) > 1 && oct[len(oct)-1] == oct[0] {
		oct = oct[:len(oct)-1]
	}
	return oct
}
