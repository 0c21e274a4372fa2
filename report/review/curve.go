// The coverage curve beside the range slider, kept incrementally.
//
// Math: inside the clipped Voronoi cell V_i ∩ A of device i only its own
// disk matters, so the covered area at range r is
//
//	C(r) = Σ_i area(V_i ∩ A ∩ D(p_i, r)),
//
// each term the exact polygon–disk area planar.RingDiskArea summed over
// the cell's rings — the primitive coverage.Layout.UncoveredArea uses, with
// its error bound (relative error of order 1e-14 of the cell area). The
// curve is sampled at fixed ranges r_k = k·R/(curveSamples−1), R the
// slider's upper end (Config: fixed for the session), plus the exact
// full-cover range, where the covered share reaches 1.
//
// Incremental: a cell's terms depend only on its site and its clipped
// rings. Each cell's terms are cached under its site position together
// with a copy of its rings, each ring rotated to start at its least point
// (x, then y): the clipper starts a ring at a point that depends on the
// vertex numbering, which shifts when a device is removed or switched
// off. After an edit a cell whose site and rings are unchanged (bit for
// bit, up to that rotation) reuses its terms, and only the cells around
// the edited device — its old and new Delaunay neighbourhoods, a dozen or
// two — are evaluated again. A cell whose rings come out in a different
// order is merely recomputed. The sum over the cells is O(n) additions
// per sample.

package review

import (
	"math"
	"slices"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// cellTerms is one cell's cached contribution to the curve.
type cellTerms struct {
	// xy and ringLen are the cell's rings (all its pieces), each rotated
	// to start at its least point (canonicalRings).
	xy      []float64
	ringLen []int32
	// cov[k] is the covered area of the cell at the k-th sample range.
	cov []float64
}

// curveCells maps a site position to its cell's terms.
type curveCells map[[2]float64]*cellTerms

// curveFor computes the covered share at the sample ranges grid for the
// layout, reusing the terms of unchanged cells from prev. It returns the
// new cache and the number of cells evaluated afresh.
func curveFor(l *coverage.Layout, grid []float64, prev curveCells) (curveCells, []float64, int) {
	c := l.Cells
	nv := len(c.SiteStart) - 1
	next := make(curveCells, nv)
	sum := make([]float64, len(grid))
	fresh := 0
	var buf []float64
	for v := 0; v < nv; v++ {
		x, y := l.Tri.Coords[2*v], l.Tri.Coords[2*v+1]
		k0, k1 := c.PolyStart[c.SiteStart[v]], c.PolyStart[c.SiteStart[v+1]]
		buf = canonicalRings(buf[:0], c, k0, k1)
		key := [2]float64{x, y}
		t := prev[key]
		if t == nil || !sameRings(t, buf, c.RingStart[k0:k1+1]) {
			t = cellCurve(c, k0, k1, x, y, c.Area[v], grid)
			t.xy = slices.Clone(buf)
			fresh++
		}
		next[key] = t
		for k, a := range t.cov {
			sum[k] += a
		}
	}
	for k := range sum {
		sum[k] = min(1, max(0, sum[k]/l.AreaM2))
	}
	return next, sum, fresh
}

// sameRings reports whether the cached rings equal the cell's rings.
func sameRings(t *cellTerms, xy []float64, ringStart []int32) bool {
	if len(t.ringLen) != len(ringStart)-1 || !slices.Equal(t.xy, xy) {
		return false
	}
	for i := range t.ringLen {
		if t.ringLen[i] != ringStart[i+1]-ringStart[i] {
			return false
		}
	}
	return true
}

// cellCurve evaluates one cell's terms: rings k0..k1 of the cells, site
// (x, y), cell area a.
func cellCurve(c *planar.Cells, k0, k1 int32, x, y, a float64, grid []float64) *cellTerms {
	t := &cellTerms{cov: make([]float64, len(grid))}
	far := 0.0
	xy := c.XY[2*c.RingStart[k0] : 2*c.RingStart[k1]]
	for i := 0; i < len(xy); i += 2 {
		far = max(far, math.Hypot(xy[i]-x, xy[i+1]-y))
	}
	for k := k0; k < k1; k++ {
		t.ringLen = append(t.ringLen, c.RingStart[k+1]-c.RingStart[k])
	}
	for i, r := range grid {
		switch {
		case r <= 0:
		case r >= far:
			t.cov[i] = a
		default:
			s := 0.0
			for k := k0; k < k1; k++ {
				s += planar.RingDiskArea(c.XY[2*c.RingStart[k]:2*c.RingStart[k+1]], x, y, r)
			}
			t.cov[i] = min(a, max(0, s))
		}
	}
	return t
}

// canonicalRings appends rings k0..k1 of the cells to buf, each rotated
// to start at its least point (by x, then y).
func canonicalRings(buf []float64, c *planar.Cells, k0, k1 int32) []float64 {
	for k := k0; k < k1; k++ {
		ring := c.XY[2*c.RingStart[k] : 2*c.RingStart[k+1]]
		j := 0
		for i := 2; i < len(ring); i += 2 {
			if ring[i] < ring[j] || ring[i] == ring[j] && ring[i+1] < ring[j+1] {
				j = i
			}
		}
		buf = append(append(buf, ring[j:]...), ring[:j]...)
	}
	return buf
}

// curveGrid is the fixed sample ranges from 0 to top.
func curveGrid(top float64) []float64 {
	g := make([]float64, curveSamples)
	for k := range g {
		g[k] = top * float64(k) / float64(curveSamples-1)
	}
	return g
}

// curveTop is the upper end of the range slider and the curve: the larger
// of 1.3 × the full-cover range and 1.5 × the planned range, rounded up
// to 10 m, within the largest range accepted.
func curveTop(full, r, maxRange float64) float64 {
	return min(maxRange, math.Ceil(max(1.3*full, 1.5*r, 10)/10)*10)
}
