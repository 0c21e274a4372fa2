// Half-plane clipping of clipped Voronoi cells, and the measures the
// planners take of the pieces.
//
// A cell piece is kept as a set of rings (exterior counter-clockwise, holes
// clockwise, as in planar.Cells). Intersecting it with a half-plane clips
// every ring on its own (Sutherland & Hodgman, "Reentrant polygon
// clipping", CACM 17, 1974).
//
// Areas. For a non-convex ring the output may contain edges running back
// and forth along the clipping line ("bridges" across a notch); they
// enclose no area, so the signed (shoelace) area and the polygon ∩ disk
// area (planar.RingDiskArea, a sum of per-edge terms in which a
// back-and-forth pair cancels) of the clipped rings add up, holes counting
// negative, to the exact measure of the intersection.
//
// Farthest point. The largest distance from a fixed point to the piece (a
// convex function's maximum) is attained at a vertex of the true
// intersection, and every such vertex is an output vertex. But not every
// output vertex is a point of the piece: after two or more clips, the
// crossing of a later line with an edge that lies along an earlier line
// can fall inside an exclusion zone (a hole ring clipped on its own) or in
// a notch of a non-convex piece (on a bridge). Each output vertex therefore
// carries its provenance: a vertex of the input ring, or a crossing of an
// edge of the input's own boundary, is a point of the piece; a crossing of
// an edge that lies along a clipping line is a candidate, kept for the
// farthest point only when the piece's source cell (convex cells need no
// test) holds it by the even–odd rule (Shimrat, CACM 5, 1962). A candidate
// exactly on the source cell's boundary coincides with a crossing of that
// boundary, which is always kept, so the maximum does not depend on how a
// boundary tie is decided.
//
// The half-plane of points at least as close to site w as to site u is
// tested as (q − w)·(u − w) ≤ |u − w|²/2, evaluated with differences taken
// from w, so coordinates of 10⁶–10⁷ m lose nothing to offsets. A point on
// the bisector counts as inside both half-planes (a set of zero area).
// Crossing points are a + t(b − a), t = s_a/(s_a − s_b): one rounding of
// the line's position, about 1 ulp of the coordinates relative to the
// segment. Areas then carry planar.RingDiskArea's bound (relative error of
// order 1e-14 per ring).

package coverage

import (
	"math"

	"github.com/sitecover/sitecover/planar"
)

// planRings is a list of rings in flat arrays: ring k is
// xy[2*start[k] : 2*start[k+1]], without closing repeat, and carries the
// label tag[k] (the base cell a piece came from, where that matters).
// flag holds per vertex planOnLine when the edge ending at the vertex lies
// along a clipping line, and planCandidate when the vertex is a crossing of
// such an edge (see the file comment).
type planRings struct {
	xy    []float64
	start []int32
	tag   []int32
	flag  []uint8
}

const (
	planOnLine    = 1
	planCandidate = 2
)

func (s *planRings) reset() {
	s.xy = s.xy[:0]
	s.start = append(s.start[:0], 0)
	s.tag = s.tag[:0]
	s.flag = s.flag[:0]
}

func (s *planRings) numRings() int {
	if len(s.start) == 0 {
		return 0
	}
	return len(s.start) - 1
}

func (s *planRings) ring(k int) []float64 { return s.xy[2*s.start[k] : 2*s.start[k+1]] }

func (s *planRings) ringFlags(k int) []uint8 { return s.flag[s.start[k]:s.start[k+1]] }

// close ends the ring being appended, labelled tag; a ring of fewer than 3
// points is dropped. It reports whether the ring was kept.
func (s *planRings) close(tag int32) bool {
	if len(s.start) == 0 {
		s.start = append(s.start, 0)
	}
	last := s.start[len(s.start)-1]
	n := int32(len(s.xy)/2) - last
	if n < 3 {
		s.xy = s.xy[:2*last]
		s.flag = s.flag[:last]
		return false
	}
	s.start = append(s.start, int32(len(s.xy)/2))
	s.tag = append(s.tag, tag)
	return true
}

// appendRing copies ring (interleaved; every vertex a point of the piece)
// as a new ring labelled tag.
func (s *planRings) appendRing(ring []float64, tag int32) bool {
	if len(s.start) == 0 {
		s.start = append(s.start, 0)
	}
	s.xy = append(s.xy, ring...)
	for i := 0; i < len(ring)/2; i++ {
		s.flag = append(s.flag, 0)
	}
	return s.close(tag)
}

// copyFrom makes s a copy of t, reusing s's storage.
func (s *planRings) copyFrom(t *planRings) {
	s.xy = append(s.xy[:0], t.xy...)
	s.start = append(s.start[:0], t.start...)
	s.tag = append(s.tag[:0], t.tag...)
	s.flag = append(s.flag[:0], t.flag...)
	if len(s.start) == 0 {
		s.start = append(s.start, 0)
	}
}

// planClipHalf appends to out the part of ring inside the half-plane
// (q − w)·n ≤ h, as a new ring labelled tag (dropped when degenerate).
// flags are the ring's vertex flags (nil: all zero). It reports whether
// anything of the ring was cut away, and whether a ring was kept.
func planClipHalf(ring []float64, flags []uint8, tag int32, wx, wy, nx, ny, h float64, out *planRings) (cut, kept bool) {
	if len(out.start) == 0 {
		out.start = append(out.start, 0)
	}
	n := len(ring) / 2
	if n == 0 {
		return false, false
	}
	fl := func(i int) uint8 {
		if flags == nil {
			return 0
		}
		return flags[i]
	}
	px, py := ring[2*n-2], ring[2*n-1]
	sp := (px-wx)*nx + (py-wy)*ny - h
	for i := 0; i < n; i++ {
		qx, qy := ring[2*i], ring[2*i+1]
		sq := (qx-wx)*nx + (qy-wy)*ny - h
		fq := fl(i)
		if sq > 0 {
			cut = true
		}
		if (sp <= 0) != (sq <= 0) {
			// Crossing of the input edge p→q: a candidate when that edge
			// lies along an earlier clipping line.
			t := sp / (sp - sq)
			var f uint8
			if fq&planOnLine != 0 {
				f = planCandidate
			}
			if sq <= 0 {
				// Entering: the edge before it runs along this line.
				f |= planOnLine
			} else {
				f |= fq & planOnLine
			}
			out.xy = append(out.xy, px+t*(qx-px), py+t*(qy-py))
			out.flag = append(out.flag, f)
		}
		if sq <= 0 {
			out.xy = append(out.xy, qx, qy)
			out.flag = append(out.flag, fq)
		}
		px, py, sp = qx, qy, sq
	}
	return cut, out.close(tag)
}

// planRingOutside reports whether some vertex of ring is strictly outside the
// half-plane (q − w)·n ≤ h (so that clipping would cut something).
func planRingOutside(ring []float64, wx, wy, nx, ny, h float64) bool {
	for i := 0; i+1 < len(ring); i += 2 {
		if (ring[i]-wx)*nx+(ring[i+1]-wy)*ny > h {
			return true
		}
	}
	return false
}

// planSetOutside reports whether some vertex of s is strictly outside the
// half-plane.
func planSetOutside(s *planRings, wx, wy, nx, ny, h float64) bool {
	return planRingOutside(s.xy, wx, wy, nx, ny, h)
}

// bisector returns the half-plane of points at least as close to w as to u,
// in the form (q − w)·n ≤ h.
func planBisector(wx, wy, ux, uy float64) (nx, ny, h float64) {
	nx, ny = ux-wx, uy-wy
	return nx, ny, 0.5 * (nx*nx + ny*ny)
}

// planCloserTo reports whether some vertex of ring is strictly closer to p than
// to u, i.e. whether a device at p would take part of the region from u.
func planCloserTo(ring []float64, px, py, ux, uy float64) bool {
	nx, ny, h := planBisector(ux, uy, px, py)
	return planRingOutside(ring, ux, uy, nx, ny, h)
}

// planClipSet clips every ring of in by the half-plane, writing to out
// (reset first), labels kept. It reports whether anything was cut away.
func planClipSet(in *planRings, wx, wy, nx, ny, h float64, out *planRings) bool {
	out.reset()
	cut := false
	for k := 0; k < in.numRings(); k++ {
		c, _ := planClipHalf(in.ring(k), in.ringFlags(k), in.tag[k], wx, wy, nx, ny, h, out)
		cut = cut || c
	}
	return cut
}

// planRingArea is the signed shoelace area of ring, relative to its first
// vertex.
func planRingArea(ring []float64) float64 {
	n := len(ring) / 2
	if n < 3 {
		return 0
	}
	ox, oy := ring[0], ring[1]
	s := 0.0
	ax, ay := ring[2*n-2]-ox, ring[2*n-1]-oy
	for i := 0; i < n; i++ {
		bx, by := ring[2*i]-ox, ring[2*i+1]-oy
		s += ax*by - ay*bx
		ax, ay = bx, by
	}
	return 0.5 * s
}

// planMeasures returns the signed area of the rings, the area within r of
// (cx, cy) (zero when r ≤ 0), and the farthest point of the piece from
// (cx, cy) with its distance (−1 when there is no vertex). Candidate
// vertices count only when valid (nil: always) accepts them. When the
// farthest point is within r the piece lies in the disk (it lies in the
// convex hull of its points), so the disk area is the area itself.
func planMeasures(s *planRings, cx, cy, r float64, valid func(tag int32, x, y float64) bool) (area, disk, far, fx, fy float64) {
	far2 := -1.0
	for k := 0; k < s.numRings(); k++ {
		ring := s.ring(k)
		fl := s.ringFlags(k)
		area += planRingArea(ring)
		for i := 0; i+1 < len(ring); i += 2 {
			dx, dy := ring[i]-cx, ring[i+1]-cy
			d2 := dx*dx + dy*dy
			if d2 <= far2 {
				continue
			}
			if fl[i/2]&planCandidate != 0 && valid != nil && !valid(s.tag[k], ring[i], ring[i+1]) {
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
		for k := 0; k < s.numRings(); k++ {
			disk += planar.RingDiskArea(s.ring(k), cx, cy, r)
		}
	}
	return area, disk, far, fx, fy
}

// planPieceVertices appends to dst the vertices of s that are points of the piece
// (candidates only when valid accepts them).
func planPieceVertices(s *planRings, valid func(tag int32, x, y float64) bool, dst []float64) []float64 {
	for k := 0; k < s.numRings(); k++ {
		ring := s.ring(k)
		fl := s.ringFlags(k)
		for i := 0; i+1 < len(ring); i += 2 {
			if fl[i/2]&planCandidate != 0 && valid != nil && !valid(s.tag[k], ring[i], ring[i+1]) {
				continue
			}
			dst = append(dst, ring[i], ring[i+1])
		}
	}
	return dst
}

// planRingsConvex reports whether the rings form one convex
// counter-clockwise ring (no exclusion zone inside, no notch).
func planRingsConvex(rings [][]float64) bool {
	if len(rings) != 1 {
		return false
	}
	ring := rings[0]
	n := len(ring) / 2
	for i := 0; i < n; i++ {
		j, k := (i+1)%n, (i+2)%n
		ax, ay := ring[2*j]-ring[2*i], ring[2*j+1]-ring[2*i+1]
		bx, by := ring[2*k]-ring[2*j], ring[2*k+1]-ring[2*j+1]
		if ax*by-ay*bx < 0 {
			return false
		}
	}
	return true
}

// planInRings is the even–odd point-in-polygon test over rings (Shimrat,
// CACM 5, 1962).
func planInRings(rings [][]float64, x, y float64) bool {
	in := false
	for _, ring := range rings {
		n := len(ring) / 2
		ax, ay := ring[2*n-2], ring[2*n-1]
		for i := 0; i < n; i++ {
			bx, by := ring[2*i], ring[2*i+1]
			if (ay > y) != (by > y) && x < ax+(y-ay)*(bx-ax)/(by-ay) {
				in = !in
			}
			ax, ay = bx, by
		}
	}
	return in
}
