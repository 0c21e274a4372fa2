// Measures the planners take of clipped Voronoi cell pieces.
//
// A piece is a base cell (planar.Cells, clipped to the area) cut by the
// half-planes of planned or remaining devices; it is kept as a
// planar.ClipRings (exterior counter-clockwise, holes clockwise), each ring
// labelled with the base cell it lies in, and clipped with
// planar.HalfPlane (Sutherland–Hodgman, with the provenance of each vertex
// and the error bound stated in planar/halfplane.go).
//
// Areas. Bridges (edges back and forth along a clipping line) enclose no
// area, so the signed area (planar.RingArea) and the polygon ∩ disk area
// (planar.RingDiskArea) of the clipped rings add up, holes counting
// negative, to the exact measure of the piece.
//
// Farthest point. The largest distance from a fixed point to the piece (a
// convex function's maximum) is attained at a vertex of the true piece, and
// every such vertex is an output vertex of the clip. A vertex marked
// planar.ProvCandidate is a point of the piece only when the piece's base
// cell holds it, which planCellHolds tests exactly under the closed
// convention (convex cells need no test). A candidate exactly on the base
// cell's boundary is a point of the closed piece and coincides with a
// crossing of that boundary, kept anyway, so the maximum does not depend on
// the tie.
//
// Error bounds: crossings carry one rounding of the line's position (about
// 1 ulp of the coordinates relative to the segment); areas then carry
// planar.RingDiskArea's bound (relative error of order 1e-14 per ring).

package coverage

import (
	"math"

	"github.com/sitecover/sitecover/planar"
)

// planCellRings returns the rings of base cell u of c as a view (no copy).
func planCellRings(c *planar.Cells, u int32) planar.RingSet {
	k0, k1 := c.PolyStart[c.SiteStart[u]], c.PolyStart[c.SiteStart[u+1]]
	return planar.RingSet{XY: c.XY, RingStart: c.RingStart[k0 : k1+1]}
}

// planCellConvex reports whether the rings form one convex
// counter-clockwise ring (no exclusion zone inside, no notch), so that every
// vertex of a clipped piece of it is a point of the piece.
func planCellConvex(rs *planar.RingSet) bool {
	return rs.NumRings() == 1 && planar.RingConvex(rs.Ring(0))
}

// planCellHolds reports whether the closed cell with rings rs holds (x, y):
// the validity test of a candidate vertex (see the file comment).
func planCellHolds(rs *planar.RingSet, x, y float64) bool { return rs.Locate(x, y) >= 0 }

// planMeasures returns the signed area of the rings, the area within r of
// (cx, cy) (zero when r ≤ 0), and the farthest point of the piece from
// (cx, cy) with its distance (−1 when there is no vertex). Candidate
// vertices count only when valid (nil: always) accepts them. When the
// farthest point is within r the piece lies in the disk (it lies in the
// convex hull of its points), so the disk area is the area itself.
func planMeasures(s *planar.ClipRings, cx, cy, r float64, valid func(label int32, x, y float64) bool) (area, disk, far, fx, fy float64) {
	far2 := -1.0
	for k := 0; k < s.NumRings(); k++ {
		ring := s.Ring(k)
		fl := s.RingProv(k)
		area += planar.RingArea(ring)
		for i := 0; i+1 < len(ring); i += 2 {
			dx, dy := ring[i]-cx, ring[i+1]-cy
			d2 := dx*dx + dy*dy
			if d2 <= far2 {
				continue
			}
			if fl[i/2]&planar.ProvCandidate != 0 && valid != nil && !valid(s.Label[k], ring[i], ring[i+1]) {
				continue
			}
			far2, fx, fy = d2, ring[i], ring[i+1]
		}
	}
	far = -1
	if far2 >= 0 {
		far = math.Sqrt(far2)
	}
	switch {
	case !(r > 0):
	case far <= r:
		disk = area
	default:
		for k := 0; k < s.NumRings(); k++ {
			disk += planar.RingDiskArea(s.Ring(k), cx, cy, r)
		}
	}
	return area, disk, far, fx, fy
}

// planPieceVertices appends to dst the vertices of s that are points of the
// piece (candidates only when valid accepts them).
func planPieceVertices(s *planar.ClipRings, valid func(label int32, x, y float64) bool, dst []float64) []float64 {
	for k := 0; k < s.NumRings(); k++ {
		ring := s.Ring(k)
		fl := s.RingProv(k)
		for i := 0; i+1 < len(ring); i += 2 {
			if fl[i/2]&planar.ProvCandidate != 0 && valid != nil && !valid(s.Label[k], ring[i], ring[i+1]) {
				continue
			}
			dst = append(dst, ring[i], ring[i+1])
		}
	}
	return dst
}
