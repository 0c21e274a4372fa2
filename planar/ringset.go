// Ring sets: several rings in two flat arrays, the layout Region and Cells
// use (interleaved coordinates plus int32 ring starts), for callers that
// build and rebuild rings in a loop (clipping, planning moves) without an
// allocation per ring.
//
// Ring k is XY[2*RingStart[k] : 2*RingStart[k+1]], without a closing repeat
// of its first vertex. Exteriors run counter-clockwise and holes clockwise,
// so that signed areas (RingArea) add up to the measure of the set; the
// boundary convention is that of ring.go (a ring set contains its boundary).
// Nothing here rounds: rings are copied, never recomputed.

package planar

// RingSet is a list of rings in flat arrays: ring k is
// XY[2*RingStart[k] : 2*RingStart[k+1]]. The zero value is an empty set;
// len(RingStart) is the number of rings plus one once anything was
// appended.
type RingSet struct {
	// XY holds the vertices of all rings, interleaved (x0, y0, x1, y1, …).
	XY []float64
	// RingStart holds the first vertex index (into XY/2) of each ring, and
	// the vertex count after the last one.
	RingStart []int32
}

// Reset empties s, keeping its storage.
func (s *RingSet) Reset() {
	s.XY = s.XY[:0]
	s.RingStart = append(s.RingStart[:0], 0)
}

// NumRings returns the number of rings.
func (s *RingSet) NumRings() int {
	if len(s.RingStart) == 0 {
		return 0
	}
	return len(s.RingStart) - 1
}

// Ring returns the interleaved coordinates of ring k (a sub-slice of XY).
func (s *RingSet) Ring(k int) []float64 { return s.XY[2*s.RingStart[k] : 2*s.RingStart[k+1]] }

// EndRing ends the ring whose vertices were appended to XY since the last
// ring ended; a ring of fewer than 3 vertices is dropped (its vertices
// removed). It reports whether the ring was kept.
func (s *RingSet) EndRing() bool {
	if len(s.RingStart) == 0 {
		s.RingStart = append(s.RingStart, 0)
	}
	last := s.RingStart[len(s.RingStart)-1]
	if int32(len(s.XY)/2)-last < 3 {
		s.XY = s.XY[:2*last]
		return false
	}
	s.RingStart = append(s.RingStart, int32(len(s.XY)/2))
	return true
}

// AppendRing copies ring (interleaved, without closing repeat) as a new
// ring; a ring of fewer than 3 vertices is dropped. It reports whether the
// ring was kept.
func (s *RingSet) AppendRing(ring []float64) bool {
	if len(s.RingStart) == 0 {
		s.RingStart = append(s.RingStart, 0)
	}
	s.XY = append(s.XY, ring...)
	return s.EndRing()
}

// CopyFrom makes s a copy of t, reusing s's storage.
func (s *RingSet) CopyFrom(t *RingSet) {
	s.XY = append(s.XY[:0], t.XY...)
	s.RingStart = append(s.RingStart[:0], t.RingStart...)
	if len(s.RingStart) == 0 {
		s.RingStart = append(s.RingStart, 0)
	}
}

// Area returns the signed area of the set: the sum of RingArea over its
// rings (holes, running clockwise, count negative). Error bound as RingArea,
// per ring.
func (s *RingSet) Area() float64 {
	a := 0.0
	for k := 0; k < s.NumRings(); k++ {
		a += RingArea(s.Ring(k))
	}
	return a
}

// Locate classifies (x, y) against the set by the even–odd rule over its
// rings (Shimrat, "Algorithm 112: position of point relative to polygon",
// CACM 5, 1962), with the module's closed convention: +1 inside, 0 on some
// ring, −1 outside. Exact (PointInRing per ring). O(total vertices).
//
// A RingSet can view rings stored elsewhere without copying: the rings
// k0..k1−1 of a Cells or Region are RingSet{XY: XY, RingStart:
// RingStart[k0 : k1+1]}.
func (s *RingSet) Locate(x, y float64) int {
	inside := false
	for k := 0; k < s.NumRings(); k++ {
		switch PointInRing(s.Ring(k), x, y) {
		case 0:
			return 0
		case 1:
			inside = !inside
		}
	}
	if inside {
		return 1
	}
	return -1
}
