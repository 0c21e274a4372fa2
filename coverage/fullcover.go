// Full-cover range: the largest distance from a point of the site area to
// its nearest site.
//
// Math: on the Voronoi cell V_i the distance to the nearest site is
// x ↦ |x − p_i|, a convex function, so its maximum over the clipped cell
// V_i ∩ A (a polygon set inside V_i) is attained at a vertex of that polygon
// set: a Voronoi vertex inside A, a crossing of a cell edge with the boundary
// of A, or a corner of A. The full-cover range is the largest vertex
// distance over all cells, exact up to the rounding of the cell vertices
// (a few ulps of the coordinates). Every vertex within 1e-9 relative of the
// maximum is reported; coincident copies of one point (a Voronoi vertex
// appears in each cell around it) are merged when closer than 1e-9 of the
// range.

package coverage

import (
	"math"
	"sort"

	"github.com/paulmach/orb"
)

// fcTieRel is the relative tolerance within which vertices tie for the
// full-cover range.
const fcTieRel = 1e-9

// FullCover returns the smallest common range at which the disks cover the
// whole site area, and the points where that range is needed.
func (l *Layout) FullCover() FullCover {
	nv := l.numVertices()
	const chunk = 4096
	nc := (nv + chunk - 1) / chunk
	best := make([]float64, nc)
	cvParallel(nv, chunk, func(ci, lo, hi int) {
		m := 0.0
		for v := int32(lo); v < int32(hi); v++ {
			if d, _, _ := l.vertexFarthest(v); d > m {
				m = d
			}
		}
		best[ci] = m
	})
	R := 0.0
	for _, m := range best {
		if m > R {
			R = m
		}
	}
	fc := FullCover{Range: R}
	if R == 0 {
		return fc
	}
	thr := R * (1 - fcTieRel)
	type cand struct {
		x, y, d float64
		src     int
	}
	parts := make([][]cand, nc)
	c := l.Cells
	cvParallel(nv, chunk, func(ci, lo, hi int) {
		var out []cand
		for v := int32(lo); v < int32(hi); v++ {
			p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
			if p0 == p1 {
				continue
			}
			cx, cy := l.site(v)
			i0, i1 := c.RingStart[c.PolyStart[p0]], c.RingStart[c.PolyStart[p1]]
			for i := i0; i < i1; i++ {
				px, py := c.XY[2*i], c.XY[2*i+1]
				dx, dy := px-cx, py-cy
				if d := math.Sqrt(dx*dx + dy*dy); d >= thr {
					out = append(out, cand{px, py, d, int(l.Tri.Source[v])})
				}
			}
		}
		parts[ci] = out
	})
	var all []cand
	for _, p := range parts {
		all = append(all, p...)
	}
	sort.Slice(all, func(i, j int) bool {
		if all[i].x != all[j].x {
			return all[i].x < all[j].x
		}
		if all[i].y != all[j].y {
			return all[i].y < all[j].y
		}
		return all[i].src < all[j].src
	})
	// Merge copies closer than tol, found through a hash of the points
	// quantized to cells of side tol (a copy lies in one of the 3×3 cells
	// around the point).
	tol := fcTieRel * R
	type qkey struct{ x, y int64 }
	grid := make(map[qkey]int32, len(all))
	var kept []cand
	for _, p := range all {
		qx, qy := int64(math.Floor(p.x/tol)), int64(math.Floor(p.y/tol))
		dup := false
		for ix := qx - 1; ix <= qx+1 && !dup; ix++ {
			for iy := qy - 1; iy <= qy+1; iy++ {
				k, ok := grid[qkey{ix, iy}]
				if !ok {
					continue
				}
				q := &kept[k]
				if math.Abs(q.y-p.y) <= tol && math.Abs(q.x-p.x) <= tol {
					if p.d > q.d {
						q.d = p.d
					}
					if p.src < q.src {
						q.src = p.src
					}
					dup = true
					break
				}
			}
		}
		if !dup {
			grid[qkey{qx, qy}] = int32(len(kept))
			kept = append(kept, p)
		}
	}
	sort.SliceStable(kept, func(i, j int) bool {
		if kept[i].d != kept[j].d {
			return kept[i].d > kept[j].d
		}
		if kept[i].x != kept[j].x {
			return kept[i].x < kept[j].x
		}
		return kept[i].y < kept[j].y
	})
	fc.Worst = make([]orb.Point, len(kept))
	fc.WorstSites = make([]int, len(kept))
	for i, p := range kept {
		fc.Worst[i] = orb.Point{p.x, p.y}
		fc.WorstSites[i] = p.src
	}
	return fc
}
