// The kept sub-pieces of a k-coverage level (kStore: rings, devices and
// measures of each sub-piece (S, q) in flat arrays, for the curve, the
// gaps and the bands) and the exact share reached by at least k devices at
// any range they give (SharesAt: the sum over the sub-pieces of their
// area within range of q, by planar.RingDiskArea).

package coverage

import (
	"math"

	"github.com/sitecover/sitecover/planar"
)

// SharesAt returns the share of the area reached by at least k devices at
// each of the ranges, each exact (the sum over the pieces of the piece ∩
// disk areas). It needs the pieces kept by KCover (CurveSamples > 0 or
// Gaps); k = 1 uses the layout's coverage curve. With own ranges (not all
// equal) there is no common range: NaN.
func (kc *KCoverage) SharesAt(l *Layout, k int, ranges []float64) []float64 {
	out := make([]float64, len(ranges))
	if kc.dev != nil {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	if k == 1 {
		cv := l.Curve()
		for i, r := range ranges {
			out[i] = cv.CoveredFraction(r)
		}
		return out
	}
	lv := kc.Level(k)
	if lv == nil {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	part := make([][]float64, len(lv.store))
	planar.ParallelChunks(len(lv.store), 1, 0, func(ci, _, _ int) {
		part[ci] = lv.store[ci].diskAreas(l, ranges)
	})
	for i := range out {
		s := 0.0
		for _, p := range part {
			s += p[i]
		}
		out[i] = min(1, max(0, s/kc.AreaM2))
	}
	return out
}

// kStore keeps the sub-pieces of one chunk of sets: the rings of each
// (label = sub-piece index) and per sub-piece its base vertex v, its
// devices S ∪ {q} (q last) and its measures.
type kStore struct {
	k     int
	rings planar.ClipRings
	v     []int32
	set   []int32 // stride k: S ascending, then q
	area  []float64
	near  []float64 // distance from q to the sub-piece boundary
	far   []float64 // distance from q to its farthest vertex
	fx    []float64
	fy    []float64
	start []int32 // rings start[i] … start[i+1]−1 are sub-piece i's
}

// pieceRings returns the ring index range of sub-piece i.
func (s *kStore) pieceRings(i int) (int, int) { return int(s.start[i]), int(s.start[i+1]) }

// diskAreas returns, per range, the sum over the sub-pieces of the area
// within that range of their k-th device. A sub-piece lies outside the open
// disk of radius near (q is never inside its own piece for k ≥ 2: at q, q
// itself is the nearest device) and inside the disk of radius far.
func (s *kStore) diskAreas(l *Layout, ranges []float64) []float64 {
	out := make([]float64, len(ranges))
	xy := l.Tri.Coords
	for i := range s.v {
		q := s.set[i*s.k+s.k-1]
		qx, qy := xy[2*q], xy[2*q+1]
		k0, k1 := s.pieceRings(i)
		for j, r := range ranges {
			switch {
			case r >= s.far[i]:
				out[j] += s.area[i]
			case r <= s.near[i]:
			default:
				for k := k0; k < k1; k++ {
					out[j] += planar.RingDiskArea(s.rings.Ring(k), qx, qy, r)
				}
			}
		}
	}
	return out
}

// kKeep stores a sub-piece (base vertex v, devices S and q at (qx, qy)):
// the rings j0 … j1−1 of kept labelled label (label < 0: all of them).
func kKeep(st *kStore, kept *planar.ClipRings, j0, j1 int, label int32, v int32, S []int32, q int32, qx, qy float64, p kPiece) {
	near := math.Inf(1)
	for j := j0; j < j1; j++ {
		if label >= 0 && kept.Label[j] != label {
			continue
		}
		ring := kept.Ring(j)
		st.rings.AppendRing(ring, int32(len(st.v)))
		copy(st.rings.Prov[len(st.rings.Prov)-len(ring)/2:], kept.RingProv(j))
		n := len(ring) / 2
		for a := 0; a < n; a++ {
			b := (a + 1) % n
			near = math.Min(near, planar.PointSegmentDistance(qx, qy, ring[2*a], ring[2*a+1], ring[2*b], ring[2*b+1]))
		}
	}
	st.v = append(st.v, v)
	st.set = append(append(st.set, S...), q)
	st.area = append(st.area, p.area)
	st.near = append(st.near, near)
	st.far = append(st.far, p.far)
	st.fx = append(st.fx, p.fx)
	st.fy = append(st.fy, p.fy)
	st.start = append(st.start, int32(st.rings.NumRings()))
}
