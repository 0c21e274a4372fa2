// Half-plane clipping of ring sets, in floating point, with the provenance
// of every output vertex.
//
// This is not the diagram clipper of clip.go, which builds every Voronoi
// cell of a triangulation against the site area with exact predicates. The
// planning moves start from those cells and cut one of them by a handful
// of half-planes at a time (a device added, moved or failed), thousands of
// times per run, and need to know which output vertices are points of the
// result; that is what this file does.
//
// A half-plane is the closed set {q : (q − w)·n ≤ h}; Bisector(w, u) is the
// half-plane of points at least as close to w as to u, n = u − w and
// h = |n|²/2, so that differences are taken from w and coordinates of
// 10⁶–10⁷ m lose nothing to offsets. A point on the line counts as inside
// (the half-planes of w against u and of u against w share their line, a
// set of zero area).
//
// Clipping. Every ring is clipped on its own (Sutherland & Hodgman,
// "Reentrant polygon clipping", CACM 17, 1974): the vertices inside are
// kept, and each edge whose end points lie on opposite sides contributes
// its crossing a + t(b − a), t = s_a/(s_a − s_b), s the side value below.
// For a non-convex ring the output may contain edges running back and forth
// along the clipping line ("bridges" across a notch); they enclose no area,
// so signed areas (RingArea) and polygon ∩ disk areas (RingDiskArea, a sum
// of per-edge terms in which a back-and-forth pair cancels) of the clipped
// rings add up, holes counting negative, to the measure of the exact
// intersection.
//
// Provenance. Not every output vertex is a point of the clipped set: after
// two or more clips, the crossing of a later line with an edge that lies
// along an earlier line can fall inside a hole (a hole ring clipped on its
// own) or in a notch of a non-convex set (on a bridge). ClipRings therefore
// marks per vertex ProvOnLine when the edge ending at it lies along a
// clipping line, and ProvCandidate when it is a crossing of such an edge.
// Vertices of the input and crossings of the input's own edges are points
// of the clipped set; a candidate is one only when the unclipped set holds
// it, which a caller that needs it (a farthest point) tests with
// PointInRing. A candidate exactly on the unclipped set's boundary
// coincides with a crossing of that boundary, which is always kept, so a
// maximum over the kept vertices does not depend on how that tie is
// decided.
//
// Error bound. The side value s = (q − w)·n − h is evaluated in floating
// point: two differences, two products, two sums (h itself has relative
// error at most 2ε, ε = 2⁻⁵³). By the standard bound for a dot product
// (Higham, "Accuracy and Stability of Numerical Algorithms", SIAM 2002,
// §3.1) the computed value differs from the exact value for the given n and
// h by at most HalfPlaneSideRelErr·(|q − w|·|n| + h), so only a vertex
// within about HalfPlaneSideRelErr·(|q − w| + |n|/2) of the line can be
// put on the wrong side: 10⁻¹² m for cells of a kilometre. That is
// acceptable where it is used (the planning moves' Voronoi cells): every
// measure taken of the clipped rings (area, area within a disk, farthest
// vertex) is continuous in the rings, and a vertex that close to the line
// changes them by less than that distance times the cell's perimeter,
// below the rounding those measures carry anyway (relative 1e-14). The
// decisions are deterministic and consistent: the same function of the same
// inputs decides whether a set is cut (SomeOutside) and what the clip keeps.
// Crossing points carry one rounding of the line's position, about 1 ulp of
// the coordinates relative to the segment. Where a sign must be exact (a
// point on a cell boundary), use Orient2D and PointInRing instead.

package planar

// HalfPlaneSideRelErr bounds the rounding of HalfPlane's side value
// relative to |q − w|·|n| + h (|(q − w)·n| ≤ |q − w|·|n| by
// Cauchy–Schwarz): every term passes through at most four roundings (a
// difference, a product and two sums; h two roundings and the final sum),
// each of relative size at most ε = 2⁻⁵³, so the error is at most
// γ₄ = 4ε/(1 − 4ε) of that sum (Higham §3.1), here rounded up to 5ε.
const HalfPlaneSideRelErr = 5 * epsilon

// Vertex provenance bits written by HalfPlane.ClipRing (see the file
// comment).
const (
	// ProvOnLine marks a vertex whose incoming edge lies along a clipping
	// line.
	ProvOnLine uint8 = 1
	// ProvCandidate marks a vertex that is the crossing of an edge lying
	// along an earlier clipping line: a point of the clipped set only if
	// the unclipped set holds it.
	ProvCandidate uint8 = 2
)

// HalfPlane is the closed half-plane {q : (q − W)·N ≤ H}.
type HalfPlane struct {
	// WX, WY is the reference point differences are taken from.
	WX, WY float64
	// NX, NY is the outward normal.
	NX, NY float64
	// H is the offset of the line from W along N, times |N|.
	H float64
}

// Bisector returns the half-plane of points at least as close to w as to u:
// (q − w)·(u − w) ≤ |u − w|²/2.
func Bisector(wx, wy, ux, uy float64) HalfPlane {
	nx, ny := ux-wx, uy-wy
	return HalfPlane{WX: wx, WY: wy, NX: nx, NY: ny, H: 0.5 * (nx*nx + ny*ny)}
}

// side returns (q − W)·N − H: ≤ 0 inside, > 0 outside (error bound in the
// file comment).
func (p *HalfPlane) side(x, y float64) float64 {
	return (x-p.WX)*p.NX + (y-p.WY)*p.NY - p.H
}

// Contains reports whether (x, y) lies in the half-plane (floating point;
// see the file comment for the error bound).
func (p HalfPlane) Contains(x, y float64) bool { return p.side(x, y) <= 0 }

// SomeOutside reports whether some vertex of xy (interleaved) lies strictly
// outside the half-plane, i.e. whether clipping would cut something.
func (p HalfPlane) SomeOutside(xy []float64) bool {
	for i := 0; i+1 < len(xy); i += 2 {
		if p.side(xy[i], xy[i+1]) > 0 {
			return true
		}
	}
	return false
}

// AllOutside reports whether every vertex of xy (interleaved) lies strictly
// outside the half-plane (true for no vertex).
func (p HalfPlane) AllOutside(xy []float64) bool {
	for i := 0; i+1 < len(xy); i += 2 {
		if p.side(xy[i], xy[i+1]) <= 0 {
			return false
		}
	}
	return true
}

// ClipRings is a RingSet produced by half-plane clipping: each ring
// carries a caller's label (where the ring came from, e.g. a source cell)
// and each vertex its provenance bits (ProvOnLine, ProvCandidate).
type ClipRings struct {
	RingSet
	// Label holds one caller-chosen label per ring.
	Label []int32
	// Prov holds the provenance bits of every vertex, indexed like XY/2.
	Prov []uint8
}

// Reset empties s, keeping its storage.
func (s *ClipRings) Reset() {
	s.RingSet.Reset()
	s.Label = s.Label[:0]
	s.Prov = s.Prov[:0]
}

// RingProv returns the provenance bits of the vertices of ring k.
func (s *ClipRings) RingProv(k int) []uint8 { return s.Prov[s.RingStart[k]:s.RingStart[k+1]] }

// endRing ends the ring being appended, labelled label, dropping it (and its
// provenance) when it has fewer than 3 vertices.
func (s *ClipRings) endRing(label int32) bool {
	if !s.RingSet.EndRing() {
		s.Prov = s.Prov[:len(s.XY)/2]
		return false
	}
	s.Label = append(s.Label, label)
	return true
}

// AppendRing copies ring (interleaved; every vertex a point of the set, so
// no provenance bit) as a new ring labelled label; a ring of fewer than 3
// vertices is dropped. It reports whether the ring was kept.
func (s *ClipRings) AppendRing(ring []float64, label int32) bool {
	if len(s.RingStart) == 0 {
		s.RingStart = append(s.RingStart, 0)
	}
	s.XY = append(s.XY, ring...)
	for i := 0; i < len(ring)/2; i++ {
		s.Prov = append(s.Prov, 0)
	}
	return s.endRing(label)
}

// CopyFrom makes s a copy of t, reusing s's storage.
func (s *ClipRings) CopyFrom(t *ClipRings) {
	s.RingSet.CopyFrom(&t.RingSet)
	s.Label = append(s.Label[:0], t.Label...)
	s.Prov = append(s.Prov[:0], t.Prov...)
}

// ClipRing appends to out the part of ring (interleaved, without closing
// repeat) inside the half-plane, as a new ring labelled label (dropped when
// fewer than 3 vertices remain). prov holds the ring's provenance bits (nil:
// all zero, the ring is an input ring). It reports whether anything of the
// ring was cut away, and whether a ring was kept. O(n).
func (p HalfPlane) ClipRing(ring []float64, prov []uint8, label int32, out *ClipRings) (cut, kept bool) {
	if len(out.RingStart) == 0 {
		out.RingStart = append(out.RingStart, 0)
	}
	n := len(ring) / 2
	if n == 0 {
		return false, false
	}
	px, py := ring[2*n-2], ring[2*n-1]
	sp := p.side(px, py)
	for i := 0; i < n; i++ {
		qx, qy := ring[2*i], ring[2*i+1]
		sq := p.side(qx, qy)
		var fq uint8
		if prov != nil {
			fq = prov[i]
		}
		if sq > 0 {
			cut = true
		}
		if (sp <= 0) != (sq <= 0) {
			// Crossing of the input edge p→q: a candidate when that edge
			// lies along an earlier clipping line.
			t := sp / (sp - sq)
			var f uint8
			if fq&ProvOnLine != 0 {
				f = ProvCandidate
			}
			if sq <= 0 {
				// Entering: the edge before it runs along this line.
				f |= ProvOnLine
			} else {
				f |= fq & ProvOnLine
			}
			out.XY = append(out.XY, px+t*(qx-px), py+t*(qy-py))
			out.Prov = append(out.Prov, f)
		}
		if sq <= 0 {
			out.XY = append(out.XY, qx, qy)
			out.Prov = append(out.Prov, fq)
		}
		px, py, sp = qx, qy, sq
	}
	return cut, out.endRing(label)
}

// ClipSet clips every ring of in by the half-plane into out (reset first),
// labels and provenance carried along. It reports whether anything was cut
// away. O(total vertices).
func (p HalfPlane) ClipSet(in, out *ClipRings) bool {
	out.Reset()
	cut := false
	for k := 0; k < in.NumRings(); k++ {
		c, _ := p.ClipRing(in.Ring(k), in.RingProv(k), in.Label[k], out)
		cut = cut || c
	}
	return cut
}

// RingConvex reports whether the ring xy (interleaved, without closing
// repeat) is convex and counter-clockwise: no vertex turns right
// (Orient2D < 0 for three consecutive vertices). Straight and repeated
// vertices are allowed. Exact. O(n).
func RingConvex(xy []float64) bool {
	n := len(xy) / 2
	for i := 0; i < n; i++ {
		j, k := (i+1)%n, (i+2)%n
		if Orient2D(xy[2*i], xy[2*i+1], xy[2*j], xy[2*j+1], xy[2*k], xy[2*k+1]) < 0 {
			return false
		}
	}
	return true
}
