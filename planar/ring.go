// Rings: the primitives every polygon computation in sitecover shares.
//
// A ring is a closed polygonal chain given as interleaved coordinates
// (x0, y0, x1, y1, …) without the closing repeat; a closing repeat, where a
// caller has one, adds nothing to any result below. orb.Ring converts to
// this layout without copying (FlatRing).
//
// Boundary convention (one for the whole module): a ring is closed. A point
// on a ring edge or vertex is ON the ring (PointInRing returns 0), and a
// Region, a clipped cell or a gap contains its boundary. Every sign that
// decides inside/outside/on is exact (Orient2D); no tolerance is involved.
//
// Signed area by the shoelace formula, taken relative to the first vertex
// (or a given origin) to keep the cross products small:
//
//	A = ½ Σ_i (x_i − o_x)(y_{i+1} − o_y) − (x_{i+1} − o_x)(y_i − o_y),
//
// positive for a counter-clockwise ring. Each term is a cross product of two
// translated vectors; with coordinates of magnitude L about the origin the
// rounding error of the sum of n terms is at most about n·4ε·L² (ε = 2⁻⁵³),
// which for the site scales used here (L ≤ 1e6 m, n ≤ 1e7) stays far below a
// square millimetre per square kilometre of area.

package planar

import (
	"math"
	"unsafe"

	"github.com/paulmach/orb"
)

// FlatRing returns the coordinates of r as an interleaved slice
// (x0, y0, x1, y1, …) sharing r's memory: orb.Point is [2]float64, so the
// layouts agree. Writing to the result writes to r. O(1).
func FlatRing(r orb.Ring) []float64 {
	if len(r) == 0 {
		return nil
	}
	return unsafe.Slice(&r[0][0], 2*len(r))
}

// RingArea returns the signed area of the ring xy (interleaved, open or
// closed), positive when it runs counter-clockwise. Coordinates are taken
// relative to the first vertex. O(n).
func RingArea(xy []float64) float64 {
	if len(xy) < 6 {
		return 0
	}
	return RingAreaAbout(xy, xy[0], xy[1])
}

// RingAreaAbout returns the signed area of the ring xy with coordinates taken
// relative to (ox, oy); choose an origin near the ring (a cell's site, a
// disk's centre) to keep the products small. O(n).
func RingAreaAbout(xy []float64, ox, oy float64) float64 {
	n := len(xy) / 2
	if n < 3 {
		return 0
	}
	s := 0.0
	ax, ay := xy[2*n-2]-ox, xy[2*n-1]-oy
	for i := 0; i < n; i++ {
		bx, by := xy[2*i]-ox, xy[2*i+1]-oy
		s += ax*by - ay*bx
		ax, ay = bx, by
	}
	return 0.5 * s
}

// PointInRing classifies (x, y) against the ring xy (interleaved, open or
// closed, either orientation): +1 strictly inside, 0 on the ring (an edge or
// a vertex), −1 strictly outside. Exact: the crossing rule with a ray
// towards +x, every sign from Orient2D. O(n).
func PointInRing(xy []float64, x, y float64) int {
	n := len(xy) / 2
	if n == 0 {
		return -1
	}
	inside := false
	ax, ay := xy[2*n-2], xy[2*n-1]
	for i := 0; i < n; i++ {
		bx, by := xy[2*i], xy[2*i+1]
		on, cross := EdgeRay(ax, ay, bx, by, x, y)
		if on {
			return 0
		}
		if cross {
			inside = !inside
		}
		ax, ay = bx, by
	}
	if inside {
		return 1
	}
	return -1
}

// EdgeRay classifies point p against the edge ab for the crossing rule with
// a ray from p towards +x: on reports that p lies on the closed segment ab;
// cross reports that the ray crosses ab under the half-open rule (the edge
// counts when exactly one endpoint lies strictly above p). Exact.
func EdgeRay(ax, ay, bx, by, px, py float64) (on, cross bool) {
	if (ay > py) == (by > py) {
		// Both above or both at/below: only an on-edge test is needed.
		if ay == py || by == py {
			if OnSegment(ax, ay, bx, by, px, py) {
				return true, false
			}
		}
		return false, false
	}
	o := Orient2D(ax, ay, bx, by, px, py)
	if o == 0 {
		return OnSegment(ax, ay, bx, by, px, py), false
	}
	if by > ay {
		return false, o > 0
	}
	return false, o < 0
}

// OnSegment reports whether p lies on the closed segment ab. Exact.
func OnSegment(ax, ay, bx, by, px, py float64) bool {
	if px < math.Min(ax, bx) || px > math.Max(ax, bx) || py < math.Min(ay, by) || py > math.Max(ay, by) {
		return false
	}
	return Orient2D(ax, ay, bx, by, px, py) == 0
}

// SegmentsCross reports whether the segments ab and cd cross properly: each
// strictly separates the endpoints of the other, so they share exactly one
// point, interior to both. Touching at an endpoint or overlapping along a
// line is not a proper crossing. Exact.
func SegmentsCross(ax, ay, bx, by, cx, cy, dx, dy float64) bool {
	o1 := Orient2D(ax, ay, bx, by, cx, cy)
	o2 := Orient2D(ax, ay, bx, by, dx, dy)
	if o1 == 0 || o2 == 0 || (o1 > 0) == (o2 > 0) {
		return false
	}
	o3 := Orient2D(cx, cy, dx, dy, ax, ay)
	o4 := Orient2D(cx, cy, dx, dy, bx, by)
	return o3 != 0 && o4 != 0 && (o3 > 0) != (o4 > 0)
}

// SegmentsMeet reports whether the closed segments ab and cd share at least
// one point (crossing, touching or overlapping). Exact.
func SegmentsMeet(ax, ay, bx, by, cx, cy, dx, dy float64) bool {
	if math.Max(ax, bx) < math.Min(cx, dx) || math.Max(cx, dx) < math.Min(ax, bx) ||
		math.Max(ay, by) < math.Min(cy, dy) || math.Max(cy, dy) < math.Min(ay, by) {
		return false
	}
	o1 := Orient2D(ax, ay, bx, by, cx, cy)
	o2 := Orient2D(ax, ay, bx, by, dx, dy)
	o3 := Orient2D(cx, cy, dx, dy, ax, ay)
	o4 := Orient2D(cx, cy, dx, dy, bx, by)
	if ((o1 > 0 && o2 < 0) || (o1 < 0 && o2 > 0)) && ((o3 > 0 && o4 < 0) || (o3 < 0 && o4 > 0)) {
		return true
	}
	return (o1 == 0 && OnSegment(ax, ay, bx, by, cx, cy)) ||
		(o2 == 0 && OnSegment(ax, ay, bx, by, dx, dy)) ||
		(o3 == 0 && OnSegment(cx, cy, dx, dy, ax, ay)) ||
		(o4 == 0 && OnSegment(cx, cy, dx, dy, bx, by))
}

// RingMoments returns the signed area a of the ring xy (interleaved, open
// or closed) and its first moments sx = ∫(x − ox) dA, sy = ∫(y − oy) dA,
// by the shoelace-weighted triangle centroids:
//
//	a = ½ Σ c_i,  sx = ⅙ Σ (x_i + x_{i+1}) c_i,  sy = ⅙ Σ (y_i + y_{i+1}) c_i,
//
// coordinates relative to (ox, oy) and c_i their cross product. The
// centroid is (ox + sx/a, oy + sy/a); sums over rings (holes counting
// negative) give those of a polygon. Rounding as RingAreaAbout, with one
// more product per term. O(n).
func RingMoments(xy []float64, ox, oy float64) (a, sx, sy float64) {
	n := len(xy) / 2
	if n < 3 {
		return 0, 0, 0
	}
	ax, ay := xy[2*n-2]-ox, xy[2*n-1]-oy
	for i := 0; i < n; i++ {
		bx, by := xy[2*i]-ox, xy[2*i+1]-oy
		c := ax*by - ay*bx
		a += c
		sx += (ax + bx) * c
		sy += (ay + by) * c
		ax, ay = bx, by
	}
	return a / 2, sx / 6, sy / 6
}

// DropRepeats removes, in place, the consecutive repeated points of r and
// the copies of its first point at its end (a closing repeat), and returns
// the open ring that remains; it may have fewer than three points. O(n).
func DropRepeats(r orb.Ring) orb.Ring {
	out := r[:0]
	for _, p := range r {
		if len(out) > 0 && out[len(out)-1] == p {
			continue
		}
		out = append(out, p)
	}
	for len(out) > 1 && out[len(out)-1] == out[0] {
		out = out[:len(out)-1]
	}
	return out
}
