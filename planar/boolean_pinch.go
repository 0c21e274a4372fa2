// Polygon overlay, step 4: opening pinch points so that NewRegion accepts
// the result.
//
// A Region's rings must not touch at all (region.go), while an exact
// union or difference can have rings meeting at isolated vertices: two
// parcels touching at a corner, an exclusion touching the boundary at a
// point, a hole touching its exterior. Such a pinch point v is opened by
// pulling each passage p → v → q of a ring through v back into its own
// sector of the result (the angle β from direction v→q counter-clockwise
// to v→p): v is replaced, in that passage only, by
//
//	v′ = v + δ·b,   δ = min(booleanPinchSep·ulp / sin(min(β/2, π/2)), L/4, c/4),
//
// b the unit bisector of the sector, L the shorter of the passage's two
// edges, ulp = 2⁻⁵² times the largest of |vx|, |vy| and L and c the distance from v to the
// nearest result edge not incident to v. The pulled-back vertex lies
// inside its sector, at distance δ·sin(β/2) = booleanPinchSep ulps from
// the lines of its own edges (for β ≤ π; behind v for β > π), and its new
// edges stay inside the sector, which meets the other passages' sectors
// only at v. So the rings no longer touch, and rounding v′ (half an ulp)
// cannot undo that. The passage loses the triangles p v v′ and v q v′, of
// area at most ½(|vp| + |vq|)·booleanPinchSep·ulp: far below any area
// tolerance (about 1e-14 relative for a 1 km site in metres). When the
// cap L/4 or c/4 binds (features within ~booleanPinchSep ulps of v) the
// separation is smaller; the caller's final NewRegion call checks the
// outcome exactly and reports a failure.
//
// The new edges p v′ and v′ q sweep the triangles above; where another
// edge of the ring runs within ulps of v p or v q (a sliver spike of the
// result along that side, thinner than the pull-back), they would cross
// it. Each pull-back is therefore checked exactly (pullBackClear); a
// passage that fails stays at v, which is enough when it is the only one
// (the others leave v). Two such passages at one point are an error.

package planar

import (
	"math"
	"slices"
)

// booleanPinchSep is the least separation, in ulps of the pinch vertex's
// coordinates, between a pulled-back vertex and the other passages' edges.
const booleanPinchSep = 64

// openPinches pulls every passage of a ring through a pinch vertex back
// into its sector and returns the new rings and the number of pinch
// vertices. A passage whose pull-back would cross another edge
// (pullBackClear) stays at the vertex, which the other passages leave;
// if two passages at one vertex cannot be pulled back it returns an error.
func (r *booleanRings) openPinches() (*booleanRings, int, error) {
	var pinched []int32
	for k := 0; k+1 < len(r.ringStart); k++ {
		for i := r.ringStart[k]; i < r.ringStart[k+1]; i++ {
			if r.pinch[r.vid[i]] {
				pinched = append(pinched, i)
			}
		}
	}
	if len(pinched) == 0 {
		return r, 0, nil
	}
	var g regionGrid
	g.build(r.xy, r.ringStart)
	next := g.next
	prev := make([]int32, len(next))
	for i, n := range next {
		prev[n] = int32(i)
	}
	out := &booleanRings{xy: slices.Clone(r.xy), vid: slices.Clone(r.vid), ringStart: r.ringStart, polyStart: r.polyStart, pinch: r.pinch}
	slices.SortFunc(pinched, func(a, b int32) int { return int(r.vid[a]) - int(r.vid[b]) })
	nPinch := 0
	for s := 0; s < len(pinched); {
		e := s
		for e < len(pinched) && r.vid[pinched[e]] == r.vid[pinched[s]] {
			e++
		}
		group := pinched[s:e]
		s = e
		nPinch++
		c := r.pinchClearance(&g, prev, group)
		v := group[0]
		vx, vy := r.xy[2*v], r.xy[2*v+1]
		kept := false
		for _, i := range group {
			p, q := prev[i], next[i]
			lq, lp := math.Hypot(r.xy[2*q]-vx, r.xy[2*q+1]-vy), math.Hypot(r.xy[2*p]-vx, r.xy[2*p+1]-vy)
			ulp := math.Max(math.Max(math.Abs(vx), math.Abs(vy)), math.Min(lp, lq)) * 0x1p-52
			ux, uy := (r.xy[2*q]-vx)/lq, (r.xy[2*q+1]-vy)/lq
			wx, wy := (r.xy[2*p]-vx)/lp, (r.xy[2*p+1]-vy)/lp
			beta := math.Atan2(ux*wy-uy*wx, ux*wx+uy*wy) // from v→q to v→p
			if beta <= 0 {
				beta += 2 * math.Pi
			}
			sn, cs := math.Sincos(beta / 2)
			d := math.Min(booleanPinchSep*ulp/math.Sin(math.Min(beta/2, math.Pi/2)), math.Min(math.Min(lp, lq), c)/4)
			x, y := vx+d*(ux*cs-uy*sn), vy+d*(ux*sn+uy*cs)
			if !r.pullBackClear(&g, prev, i, x, y) {
				if kept {
					return nil, nPinch, &NearDegenerateError{X: vx, Y: vy, Detail: "the result's rings touch there in sectors too thin to pull apart"}
				}
				kept = true // the other passages leave v: this one may stay
				continue
			}
			out.xy[2*i], out.xy[2*i+1] = x, y
			out.vid[i] = -1
		}
	}
	return out, nPinch, nil
}

// pullBackClear reports whether passage i (ring position of a pinch
// vertex v, between p = prev[i] and q = next[i]) may be pulled back to
// (x, y): the new edges p → (x, y) → q meet no ring edge except the
// passage's own two (which they replace) and, at p and q only, the edges
// ending there. Exact (Orient2D). The pull-back of openPinches keeps the
// new edges inside the passage's sector, so this fails only where another
// edge of the ring runs within ulps of the sector's side: a part of the
// ring a few ulps wide along p → v or v → q (a sliver spike), which the
// pulled edge would sweep across.
func (r *booleanRings) pullBackClear(g *regionGrid, prev []int32, i int32, x, y float64) bool {
	next := g.next
	p, q := prev[i], next[i]
	ends := [2]int32{p, q}
	x0, y0 := min(x, r.xy[2*i], r.xy[2*p], r.xy[2*q]), min(y, r.xy[2*i+1], r.xy[2*p+1], r.xy[2*q+1])
	x1, y1 := max(x, r.xy[2*i], r.xy[2*p], r.xy[2*q]), max(y, r.xy[2*i+1], r.xy[2*p+1], r.xy[2*q+1])
	clear := true
	g.cellEdges(x0, y0, x1, y1, func(e int32) {
		if !clear || e == p || e == i {
			return
		}
		n := next[e]
		ax, ay, bx, by := r.xy[2*e], r.xy[2*e+1], r.xy[2*n], r.xy[2*n+1]
		for _, s := range ends {
			sx, sy := r.xy[2*s], r.xy[2*s+1]
			switch {
			case ax == sx && ay == sy:
				// Shares the end s: may not run along the new edge.
				clear = !(Orient2D(sx, sy, x, y, bx, by) == 0 && regionSameSide(sx, sy, x, y, bx, by))
			case bx == sx && by == sy:
				clear = !(Orient2D(sx, sy, x, y, ax, ay) == 0 && regionSameSide(sx, sy, x, y, ax, ay))
			default:
				clear = !SegmentsMeet(x, y, sx, sy, ax, ay, bx, by)
			}
			if !clear {
				return
			}
		}
	})
	return clear
}

// pinchClearance returns the distance from the pinch vertex of group (its
// passages' ring positions) to the nearest ring edge not incident to it,
// searched within the largest of the passages' shorter edges (a farther
// edge cannot limit δ). The distances are measured from each edge's
// nearer endpoint (PointSegmentDistance): from the farther one, a long
// edge passing close to the pinch (a polygon reaching a million times
// farther than the pinch's features) can round the distance to 0, which
// would cancel every pull-back at the pinch.
func (r *booleanRings) pinchClearance(g *regionGrid, prev, group []int32) float64 {
	next := g.next
	v := group[0]
	vx, vy := r.xy[2*v], r.xy[2*v+1]
	c := 0.0
	for _, i := range group {
		p, q := prev[i], next[i]
		c = math.Max(c, math.Min(math.Hypot(r.xy[2*p]-vx, r.xy[2*p+1]-vy), math.Hypot(r.xy[2*q]-vx, r.xy[2*q+1]-vy)))
	}
	g.cellEdges(vx-c, vy-c, vx+c, vy+c, func(e int32) {
		n := next[e]
		if r.vid[e] == r.vid[v] || r.vid[n] == r.vid[v] {
			return
		}
		c = math.Min(c, PointSegmentDistance(vx, vy, r.xy[2*e], r.xy[2*e+1], r.xy[2*n], r.xy[2*n+1]))
	})
	return c
}
