// Smallest-power lookup in a regular triangulation.
//
// The power cell of vertex v is the intersection of the half-planes of its
// neighbours in the regular triangulation, so a vertex with no neighbour of
// smaller power at x holds x in its cell: greedy descent over neighbours,
// each step lowering the power strictly, ends at the vertex of smallest
// power (the same argument as nearest-site descent on a Delaunay graph).
// Powers are compared as π_u − π_v = (p_v − p_u)·(2x − p_u − p_v) −
// (w_u − w_v), in floating point: at an exact tie (x on a power line)
// either vertex may be returned, and within a few ulps of the powers of a
// tie the answer is one of the tied vertices.

package planar

// NearestPower returns the vertex of smallest power |x − p_v|² − w_v at
// (x, y), the smaller index at a tie met during the descent; −1 when there
// is no vertex or the query is not finite. The search starts at vertex
// hint (−1: a sample of vertices). Hidden inputs are never returned (they
// are not vertices): a point of a hidden device's disk always has a
// smaller power with respect to some vertex.
func (rt *RegularTriangulation) NearestPower(x, y float64, hint int32) int32 {
	m := int32(rt.NumVertices())
	if m == 0 || !finite(x, y) {
		return -1
	}
	if m == 1 {
		return 0
	}
	if hint < 0 || hint >= m {
		hint = rt.sampleVertex(x, y)
	}
	var buf []int32
	v := hint
	for steps := int32(0); steps <= m; steps++ {
		buf = rt.Neighbors(v, buf)
		best := v
		for _, u := range buf {
			if d := rt.powerDiff(u, best, x, y); d < 0 || d == 0 && u < best {
				best = u
			}
		}
		if best == v {
			break
		}
		v = best
	}
	return v
}

// powerDiff returns π_u(x) − π_v(x).
func (rt *RegularTriangulation) powerDiff(u, v int32, x, y float64) float64 {
	xy := rt.Coords
	ux, uy, vx, vy := xy[2*u], xy[2*u+1], xy[2*v], xy[2*v+1]
	return (vx-ux)*(2*x-ux-vx) + (vy-uy)*(2*y-uy-vy) - (rt.Weights[u] - rt.Weights[v])
}
