// Gaps when devices have their own ranges, and what closes each.
//
// Math. Inside the power cell P_i the union of disks is D_i (ranges.go), so
// the gap tracing of gaps_trace.go applies to each clipped power cell with
// its own radius, and components join across power lines exactly as across
// bisectors: a point x of the power line of i and j has π_i(x) = π_j(x), so
// it is outside D_i exactly when it is outside D_j (the canonical
// coordinate along the line, perpendicular to p_j − p_i, is the same
// formula). The deepest point of a gap is the point of largest power
// min_i π_i(x) = |x − p_k|² − r_k² (k the device of its cell): π is convex
// on each cell, so the maximum is at a vertex of a traced piece.
//
// Closing a gap, in metres:
//   - under uniform power growth every device's power grows by the gap's
//     power t_g, so each bordering device i would need √(r_i² + t_g);
//   - a single device i closes the gap alone when the gap lies in its grown
//     disk: its range must reach the farthest point of the gap, the maximum
//     of |x − p_i| over the gap's boundary (|x − p_i| is convex), attained
//     at a vertex (the convex hull of the boundary's vertices) or, on a
//     circle arc of centre c and radius ρ, at c + ρ·(c − p_i)/|c − p_i| when
//     that point lies on the arc. The device with the smallest increase
//     among those whose cells the gap meets is reported, with its range
//     (the increase counted from its range at the growth analysed; ties
//     within rounding go to the smaller input index).
//
// Error bounds: as gaps.go; the farthest distances are those of the traced
// vertices (a few ulps) and the closed-form arc point.

package coverage

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// GapClosing says, in metres, what closes one gap when devices have their
// own ranges.
type GapClosing struct {
	// Power is the uniform power growth t (m²) at which the gap vanishes:
	// the largest power min_i π_i(x) of a point of the gap at the planned
	// ranges.
	Power float64
	// Needed holds, for each device of Gap.Sites in that order, the range
	// it would need under that growth: √(r_i² + Power).
	Needed []float64
	// Device is the input index of the bordering device (one of Gap.Sites)
	// whose range alone, increased least, closes the gap; −1 when the gap
	// is too large to search (more than gapClosingWork pairs of devices
	// and boundary points).
	Device int
	// DeviceRange is the range that device needs: the distance from it to
	// the farthest point of the gap.
	DeviceRange float64
}

// gapClosingWork bounds devices × boundary points examined for one gap's
// single-device closing: beyond it (a gap spread over thousands of cells,
// where growing one device is no answer) Device is −1.
const gapClosingWork = 1 << 23

// GapsRanges returns the gaps of a layout with per-device ranges when every
// range is √(r_i² + t) (t = 0: the planned ranges), each with its Closing.
// The order, IDs and outlines are as Gaps; ClosingRange is the distance
// from Deepest to the device of its cell, and gaps are ordered by
// decreasing Closing.Power. With all ranges equal the gaps are Gaps at
// √(r² + t). Nil for a common-range layout or NaN t.
func (l *Layout) GapsRanges(t, chordTol float64) []Gap {
	if !l.weighted() || math.IsNaN(t) {
		return nil
	}
	gp := gapParams{t: t, closing: true}
	if l.equalRanges() {
		gp.r = l.grownRadius(0, t)
	} else {
		gp.radii = make([]float64, l.numVertices())
		for v := range gp.radii {
			gp.radii[v] = l.grownRadius(int32(v), t)
			gp.r = math.Max(gp.r, gp.radii[v])
		}
	}
	gs, _ := l.gapsAt(gp, chordTol, false)
	return gs
}

// equalRanges reports whether a layout with ranges has them all equal (its
// cells are then Voronoi cells).
func (l *Layout) equalRanges() bool {
	for _, r := range l.Ranges {
		if r != l.Ranges[0] {
			return false
		}
	}
	return true
}

// gapClosings fills Closing for every gap: pow holds each gap's largest
// power at the radii of gp (with gp.radii), else it follows from the
// closing range.
func (l *Layout) gapClosings(m *gapMerged, gapOf []int32, gs []Gap, pow []float64, gp *gapParams) {
	// The nodes of each gap in node order, in rows (CSR).
	start := make([]int32, len(gs)+1)
	for _, g := range gapOf {
		start[g+1]++
	}
	for g := range gs {
		start[g+1] += start[g]
	}
	nodes := make([]int32, len(gapOf))
	fill := slices.Clone(start[:len(gs)])
	for i, g := range gapOf {
		nodes[fill[g]] = int32(i)
		fill[g]++
	}
	planar.ParallelChunks(len(gs), 1, 0, func(_, lo, hi int) {
		var pts []orb.Point
		var arcs []gapArcRef
		for g := lo; g < hi; g++ {
			G := &gs[g]
			var p float64
			if gp.radii != nil {
				p = pow[g] + gp.t
			} else {
				r0 := l.Ranges[0]
				p = G.ClosingRange*G.ClosingRange - r0*r0
			}
			cl := &GapClosing{Power: p, Needed: make([]float64, len(G.Sites)), Device: -1}
			for k, s := range G.Sites {
				r := l.Ranges[l.Tri.Vertex[s]]
				cl.Needed[k] = math.Sqrt(math.Max(0, r*r+p))
			}
			pts, arcs = m.gapBoundary(l, nodes[start[g]:start[g+1]], gp, pts[:0], arcs[:0])
			hull := planar.ConvexHull(pts)
			if len(G.Sites)*(len(hull)+len(arcs)) <= gapClosingWork {
				cl.Device, cl.DeviceRange = l.singleClosing(G.Sites, hull, arcs, gp)
			}
			G.Closing = cl
		}
	})
}

// gapArcRef is a circle arc of a gap's boundary: centre, radius, start
// point and clockwise sweep. The start angle, atan2(sy − cy, sx − cx), is
// computed only where needed, once (startAngle).
type gapArcRef struct {
	cx, cy, r, sx, sy, phi float64
	th                     float64 // the start angle, once hasTh
	hasTh                  bool
}

// startAngle returns the arc's start angle, computed on the first call.
func (a *gapArcRef) startAngle() float64 {
	if !a.hasTh {
		a.th, a.hasTh = math.Atan2(a.sy-a.cy, a.sx-a.cx), true
	}
	return a.th
}

// gapBoundary appends the boundary vertices and arcs of the given nodes'
// loops.
func (m *gapMerged) gapBoundary(l *Layout, nodes []int32, gp *gapParams, pts []orb.Point, arcs []gapArcRef) ([]orb.Point, []gapArcRef) {
	for _, i := range nodes {
		nd := &m.nodes[i]
		cx, cy := l.site(nd.v)
		r := gp.radius(nd.v)
		for lp := nd.loop0; lp < nd.loop1; lp++ {
			for e := m.loopElem[lp]; e < m.loopElem[lp+1]; e++ {
				el := &m.elems[e]
				pts = append(pts, orb.Point{el.x, el.y})
				if el.kind == gapArc {
					arcs = append(arcs, gapArcRef{cx: cx, cy: cy, r: r, sx: el.x, sy: el.y, phi: float64(el.phi)})
				}
			}
		}
	}
	return pts, arcs
}

// singleClosing returns the device among sites (input indices) whose range
// (its radius in gp) must grow least to reach every point of the gap with
// the given hull of boundary vertices and arcs, and the range it needs.
func (l *Layout) singleClosing(sites []int, hull orb.Ring, arcs []gapArcRef, gp *gapParams) (int, float64) {
	best, bestInc, bestR := -1, math.Inf(1), 0.0
	for _, s := range sites {
		px, py := l.Sites[s][0], l.Sites[s][1]
		far := 0.0
		for _, q := range hull {
			far = math.Max(far, math.Hypot(q[0]-px, q[1]-py))
		}
		// Arcs come grouped by centre (a cell's arcs are consecutive): the
		// distance and direction to a centre are computed once per group.
		cx, cy := math.NaN(), math.NaN()
		var dc, ang float64
		hasAng := false
		for k := range arcs {
			a := &arcs[k]
			if a.cx != cx || a.cy != cy {
				cx, cy = a.cx, a.cy
				dc, hasAng = math.Hypot(a.cx-px, a.cy-py), false
			}
			if dc+a.r <= far || dc == 0 {
				continue
			}
			// The farthest point of the circle from p, if on the arc.
			if !hasAng {
				ang, hasAng = math.Atan2(a.cy-py, a.cx-px), true
			}
			if d := math.Mod(a.startAngle()-ang, 2*math.Pi); d < 0 && d+2*math.Pi <= a.phi || d >= 0 && d <= a.phi {
				far = dc + a.r
			}
		}
		inc := far - gp.radius(l.Tri.Vertex[s])
		tie := closingTieUlps * (math.Abs(px) + math.Abs(py) + far)
		if inc < bestInc-tie || inc <= bestInc+tie && s < best {
			best, bestInc, bestR = s, inc, far
		}
	}
	return best, bestR
}

// closingTieUlps is the difference, relative to the coordinates and the
// distance, below which two devices' increases tie and the smaller input
// index is reported: each distance is a hypotenuse of coordinate
// differences carrying a few ulps of the coordinates' magnitude, so two
// increases equal in exact arithmetic (symmetric layouts) agree within a
// few ulps; 64 ulps (64·2⁻⁵²) is far above that and far below any
// difference a planner could act on.
const closingTieUlps = 64 * 0x1p-52
