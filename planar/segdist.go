// Distance from a point to a line segment, measured from the segment's
// endpoint nearer the point so that its rounding error scales with that
// distance rather than with the segment's length.

package planar

import "math"

// PointSegmentDistance returns the Euclidean distance from p = (px, py) to
// the closed segment from a = (ax, ay) to b = (bx, by); a degenerate
// segment (a = b) is the point a. The result does not depend on which end
// is given first.
//
// Math. With a the endpoint nearer p (the two are swapped when b is), w =
// p − a and v = b − a, the nearest point of the segment is a + t·v with
// t = clamp((w·v)/|v|², 0, 1) (t = 0 when |v| = 0), and the distance is
// |w − t·v|. As p is no farther from a than from b, it lies on a's side of
// the bisector of ab, so the unclamped t is at most ½ and |t·v| (the length
// of w's projection on ab) is at most |w|.
//
// Error. Every term of w − t·v is then at most |w| in size, and to first
// order in u = 2⁻⁵³ the result is within 12u·|p − a| of the exact distance
// for the given float64 coordinates, |p − a| being the distance to the
// nearer endpoint (rounding of w and v: 2u; of the dot product, |v|² and
// the quotient t, which moves the foot along ab by at most 6u|w|; of t·v
// and the difference: 2u; of the final hypotenuse: 2u), as long as |v|²
// neither overflows nor underflows.
//
// Why the nearer endpoint. Measured from the farther endpoint the same
// formula rounds p − b and t·v at the ulps of |p − b| ≈ |b − a|, so for a
// long segment passing close to p its error can exceed the distance
// itself: for p at 5·10⁻⁶ from a 5·10¹² segment whose nearer end is 5 away,
// the far-end form returns 6.9·10⁻⁴, the near-end form 5·10⁻⁶ to the last
// digit. A polygon edge reaching far out and passing close to a vertex is
// exactly that case.
func PointSegmentDistance(px, py, ax, ay, bx, by float64) float64 {
	if math.Hypot(bx-px, by-py) < math.Hypot(ax-px, ay-py) {
		ax, ay, bx, by = bx, by, ax, ay
	}
	dx, dy := bx-ax, by-ay
	t := 0.0
	if l2 := dx*dx + dy*dy; l2 > 0 {
		t = math.Max(0, math.Min(1, ((px-ax)*dx+(py-ay)*dy)/l2))
	}
	return math.Hypot(px-ax-t*dx, py-ay-t*dy)
}
