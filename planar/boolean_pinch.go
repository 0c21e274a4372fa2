// Polygon overlay, step 4: opening pinch points so that NewRegion accepts
// the result.
//
// A Region's rings must not touch at all (region.go), while an exact
// union or difference can have rings meeting at isolated vertices: two
// parcels touching at a corner, an exclusion touching the boundary at a
// point, a hole touching its exterior. Such a pinch point is opened by a
// chamfer: in every sector of the result that meets at the vertex v, the
// ring's passage p → v → q is replaced by p → v′ → v″ → q with
//
//	v′ = v + δ (p − v)/|p − v|,   v″ = v + δ (q − v)/|q − v|,
//	δ  = min(L / 2^booleanPinchShift, c / 4),
//
// L the shorter of the two ring edges at v and c the distance from v to the
// nearest result edge not incident to v. The result loses a triangle of
// area at most ½δ² ≤ 2⁻⁴¹ L² per sector and the sectors no longer meet:
// each chamfer lies in its own sector, at distance at least c/4 from every
// other edge. Rounding v′ and v″ to float64 moves them by at most an ulp,
// negligible against δ unless L is within about 2³⁰ ulps of v's magnitude;
// the caller's final NewRegion call checks the outcome exactly.
package planar

import (
	"math"
	"slices"
)

// booleanPinchShift sets the chamfer size relative to the edges at a pinch
// point: δ ≤ L·2⁻²⁰, so the area removed is at most 2⁻⁴¹·L² per sector.
const booleanPinchShift = 20

// openPinches replaces every passage of a ring through a pinch vertex by a
// chamfer and returns the new rings and the number of pinch vertices.
func (r *booleanRings) openPinches() (*booleanRings, int) {
	var pinched []int32
	for k := 0; k+1 < len(r.ringStart); k++ {
		for i := r.ringStart[k]; i < r.ringStart[k+1]; i++ {
			if r.pinch[r.vid[i]] {
				pinched = append(pinched, i)
			}
		}
	}
	if len(pinched) == 0 {
		return r, 0
	}
	var g regionGrid
	g.build(r.xy, r.ringStart)
	next := g.next
	prev := make([]int32, len(next))
	for i, n := range next {
		prev[n] = int32(i)
	}
	type chamfer struct{ x1, y1, x2, y2 float64 }
	cut := make(map[int32]chamfer, len(pinched))
	var verts []int32
	for _, i := range pinched {
		vx, vy := r.xy[2*i], r.xy[2*i+1]
		p, q := prev[i], next[i]
		px, py, qx, qy := r.xy[2*p], r.xy[2*p+1], r.xy[2*q], r.xy[2*q+1]
		lp, lq := math.Hypot(px-vx, py-vy), math.Hypot(qx-vx, qy-vy)
		l := math.Min(lp, lq)
		c := l / 2
		g.cellEdges(vx-c, vy-c, vx+c, vy+c, func(e int32) {
			n := next[e]
			if r.vid[e] == r.vid[i] || r.vid[n] == r.vid[i] {
				return
			}
			c = math.Min(c, booleanPointSegDist(vx, vy, r.xy[2*e], r.xy[2*e+1], r.xy[2*n], r.xy[2*n+1]))
		})
		d := math.Min(math.Ldexp(l, -booleanPinchShift), c/4)
		cut[i] = chamfer{vx + d/lp*(px-vx), vy + d/lp*(py-vy), vx + d/lq*(qx-vx), vy + d/lq*(qy-vy)}
		verts = append(verts, r.vid[i])
	}
	out := &booleanRings{ringStart: []int32{0}, polyStart: slices.Clone(r.polyStart), pinch: r.pinch}
	for k := 0; k+1 < len(r.ringStart); k++ {
		for i := r.ringStart[k]; i < r.ringStart[k+1]; i++ {
			if ch, ok := cut[i]; ok {
				out.xy = append(out.xy, ch.x1, ch.y1, ch.x2, ch.y2)
				out.vid = append(out.vid, -1, -1)
				continue
			}
			out.xy = append(out.xy, r.xy[2*i], r.xy[2*i+1])
			out.vid = append(out.vid, r.vid[i])
		}
		out.ringStart = append(out.ringStart, int32(len(out.vid)))
	}
	slices.Sort(verts)
	return out, len(slices.Compact(verts))
}

// booleanPointSegDist returns the distance from p to segment ab (float64,
// used only to size a chamfer).
func booleanPointSegDist(px, py, ax, ay, bx, by float64) float64 {
	dx, dy := bx-ax, by-ay
	t := 0.0
	if l2 := dx*dx + dy*dy; l2 > 0 {
		t = math.Max(0, math.Min(1, ((px-ax)*dx+(py-ay)*dy)/l2))
	}
	return math.Hypot(px-ax-t*dx, py-ay-t*dy)
}
