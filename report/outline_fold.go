// Thin folds of an outline in the local plane.
//
// A ring that runs along an edge of the site area and back (a band or
// gap bounded by that edge on both sides of a spike) has its two sides on
// one line in exact arithmetic; the points computed on the edge lie
// within a few ulps of it, so in the plane the spike is a face some
// 1e-11 m wide, valid, while its conversion to longitude and latitude
// (exact to about 1e-9 m, not better) can fold the tip across itself:
// GEOS then reports a self-intersection even in unrounded output. Such a
// fold is below any figure's precision, so the writer drops it when the
// unrounded output is invalid (validRounded): each vertex v where the
// ring turns back (the edges u→v and v→w point in opposite directions,
// (v − u)·(w − v) < 0) and the triangle u v w is no higher than
// foldWidth over its longer edge at v is removed, until none is left.
// Each removal changes the ring's area by at most foldWidth times that
// edge's length. The unrounded output is tried without such folds in the
// plane, then without those of the converted rings (width foldWidth in
// output units, outUnitsPerMetre).

package report

import (
	"math"

	"github.com/paulmach/orb"
)

// foldWidth is the width (metres in the local plane) below which a turn
// back of a ring is taken as a fold to drop: 1 nm, about 10⁴ ulps of a
// coordinate of 10⁵ m (the local plane's extent is at most a few hundred
// km), far above the few-ulp width of points computed on one edge and far
// below the 1 mm of the written coordinates.
const foldWidth = 1e-9

// dropFolds returns mp with the thin folds of its rings removed (see the
// file comment) and true, or mp and false when it has none. Rings left
// with fewer than 3 distinct vertices are dropped, and a polygon whose
// exterior ring is dropped goes with its holes.
func dropFolds(mp orb.MultiPolygon, width float64) (orb.MultiPolygon, bool) {
	changed := false
	out := make(orb.MultiPolygon, 0, len(mp))
	for _, p := range mp {
		var q orb.Polygon
		for i, r := range p {
			k, ch := ringDropFolds(r, width)
			changed = changed || ch
			if len(k) < 4 {
				if i == 0 {
					break
				}
				continue
			}
			q = append(q, k)
		}
		if len(q) > 0 {
			out = append(out, q)
		}
	}
	if !changed {
		return mp, false
	}
	return out, true
}

// ringDropFolds returns the closed ring r without its thin folds and
// whether any was removed. O(n) per pass; a pass removes every fold it
// meets, including those its removals uncover behind it, and the passes
// repeat for the folds across the ring's start.
func ringDropFolds(r orb.Ring, width float64) (orb.Ring, bool) {
	if len(r) < 4 {
		return r, false
	}
	pts := append([]orb.Point(nil), r[:len(r)-1]...) // unclosed
	changed := false
	for pass := true; pass && len(pts) >= 3; {
		pass = false
		k := pts[:0:0]
		for _, w := range pts {
			k = append(k, w)
			for len(k) >= 3 && isFold(k[len(k)-3], k[len(k)-2], k[len(k)-1], width) {
				k = append(k[:len(k)-2], k[len(k)-1])
				pass = true
			}
		}
		// the turns at the start and end of the unclosed list
		for len(k) >= 3 {
			n := len(k)
			switch {
			case isFold(k[n-2], k[n-1], k[0], width):
				k = k[:n-1]
			case isFold(k[n-1], k[0], k[1], width):
				k = k[1:]
			default:
				n = -1
			}
			if n < 0 {
				break
			}
			pass = true
		}
		changed = changed || pass
		pts = k
	}
	if !changed {
		return r, false
	}
	return append(orb.Ring(pts), pts[0]), true
}

// isFold reports whether the ring turns back at v (from u, towards w)
// with the triangle u v w no higher than width over its longer edge at v
// (|(v − u) × (w − v)| ≤ width · max(|v − u|, |w − v|)).
func isFold(u, v, w orb.Point, width float64) bool {
	ax, ay := v[0]-u[0], v[1]-u[1]
	bx, by := w[0]-v[0], w[1]-v[1]
	if ax*bx+ay*by >= 0 {
		return false
	}
	long := math.Max(math.Hypot(ax, ay), math.Hypot(bx, by))
	return math.Abs(ax*by-ay*bx) <= width*long
}

// metresPerDegreeMin is the shortest length of a degree of longitude or
// latitude within the latitudes a local plane serves (|φ| ≤ 85°: 9.7 km of
// longitude at 85°, 111 km of latitude), rounded down: output widths in
// degrees taken from metres with it are at least as wide as meant.
const metresPerDegreeMin = 9.7e3

// outUnitsPerMetre is an upper bound of the output units per metre of the
// local plane: 1 for planar and grid output, 1/metresPerDegreeMin for
// longitude and latitude.
func (s *scene) outUnitsPerMetre() float64 {
	if s.geographic() {
		return 1 / metresPerDegreeMin
	}
	return 1
}

// snapWidth is the grid (metres, converted to output units by
// outUnitsPerMetre) the unrounded output is snapped to as a last resort:
// 10 nm, ten times foldWidth, far below the 1 mm of rounded output.
const snapWidth = 1e-8

// snapOutline returns a copy of mp with every coordinate rounded to a
// multiple of g; rings reduced to fewer than 4 positions stay as they
// are (outlineValid then refuses them).
func snapOutline(mp orb.MultiPolygon, g float64) orb.MultiPolygon {
	out := make(orb.MultiPolygon, len(mp))
	for i, p := range mp {
		out[i] = make(orb.Polygon, len(p))
		for j, r := range p {
			q := make(orb.Ring, 0, len(r))
			for _, v := range r {
				w := orb.Point{math.Round(v[0]/g) * g, math.Round(v[1]/g) * g}
				if len(q) > 0 && q[len(q)-1] == w {
					continue // a repeat made by snapping
				}
				q = append(q, w)
			}
			out[i][j] = q
		}
	}
	return out
}
