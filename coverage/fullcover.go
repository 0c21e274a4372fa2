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
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// fcTieRel is the relative tolerance within which vertices tie for the
// full-cover range.
const fcTieRel = 1e-9

// FullCover returns the smallest common range at which the disks cover the
// whole site area, and the points where that range is needed.
func (l *Layout) FullCover() FullCover {
	return l.fullCover(false)
}

// fullCover is FullCover, or with powers set (a layout with per-device
// ranges) the same search by power: Range then holds the largest power
// max_x min_i π_i(x) over the cell vertices, ties within fcTieRel of
// R_max² where R_max is the largest distance from a worst point to its
// device (the scale of the powers compared), and points within fcTieRel
// of R_max merged.
func (l *Layout) fullCover(powers bool) FullCover {
	R, S := l.fcLargest(powers)
	fc := FullCover{Range: R}
	if !powers && R == 0 || powers && S == 0 {
		return fc
	}
	thr := R * (1 - fcTieRel)
	tol := fcTieRel * R
	if powers {
		thr, tol = R-fcTieRel*S*S, fcTieRel*S
	}
	kept := fcMergeCopies(l.fcCandidates(powers, thr, tol), tol)
	slices.SortStableFunc(kept, func(a, b fcCand) int {
		switch {
		case a.d != b.d:
			return -cmp.Compare(a.d, b.d)
		case a.x != b.x:
			return cmp.Compare(a.x, b.x)
		}
		return cmp.Compare(a.y, b.y)
	})
	fc.Worst = make([]orb.Point, len(kept))
	fc.WorstSites = make([]int, len(kept))
	for i, p := range kept {
		fc.Worst[i] = orb.Point{p.x, p.y}
		fc.WorstSites[i] = int(p.src)
	}
	return fc
}

// fcChunk is the number of vertices per parallel chunk of the full-cover
// passes.
const fcChunk = 4096

// fcLargest returns the largest distance (or, with powers, power) from a
// cell vertex to its device over all cells, and with powers the distance
// S of the vertex attaining it (the scale of the powers compared).
func (l *Layout) fcLargest(powers bool) (R, S float64) {
	nv := l.numVertices()
	nc := (nv + fcChunk - 1) / fcChunk
	best := make([]float64, nc)
	scale := make([]float64, nc)
	planar.ParallelChunks(nv, fcChunk, 0, func(ci, lo, hi int) {
		m := 0.0
		if powers {
			m = math.Inf(-1)
		}
		for v := int32(lo); v < int32(hi); v++ {
			d, _, _ := l.vertexFarthest(v)
			if powers {
				if d < 0 {
					continue
				}
				w := l.Ranges[v] * l.Ranges[v]
				if p := d*d - w; p > m {
					m = p
					scale[ci] = math.Max(scale[ci], d)
				}
				continue
			}
			if d > m {
				m = d
			}
		}
		best[ci] = m
	})
	if powers {
		R = math.Inf(-1)
	}
	for ci, m := range best {
		if m > R {
			R = m
		}
		S = math.Max(S, scale[ci])
	}
	return R, S
}

// fcCand is a cell vertex whose distance (or power) d reaches the
// full-cover threshold; qx is its x cell of side tol for merging copies.
type fcCand struct {
	x, y, d float64
	src     int32
	qx      int64
}

// fcCandidates returns the cell vertices at distance (or power) ≥ thr from
// their device, each shared vertex emitted once where possible.
func (l *Layout) fcCandidates(powers bool, thr, tol float64) []fcCand {
	nv := l.numVertices()
	nc := (nv + fcChunk - 1) / fcChunk
	parts := make([][]fcCand, nc)
	c := l.Cells
	planar.ParallelChunks(nv, fcChunk, 0, func(ci, lo, hi int) {
		var out []fcCand
		for v := int32(lo); v < int32(hi); v++ {
			p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
			if p0 == p1 {
				continue
			}
			cx, cy := l.site(v)
			w := 0.0
			if powers {
				w = l.Ranges[v] * l.Ranges[v]
			}
			for k := c.PolyStart[p0]; k < c.PolyStart[p1]; k++ {
				i0, i1 := c.RingStart[k], c.RingStart[k+1]
				for i := i0; i < i1; i++ {
					px, py := c.XY[2*i], c.XY[2*i+1]
					dx, dy := px-cx, py-cy
					var d float64
					if powers {
						d = dx*dx + dy*dy - w
					} else {
						d = math.Sqrt(dx*dx + dy*dy)
					}
					if d < thr {
						continue
					}
					// A vertex between two bisector edges is shared with
					// those neighbours: emit it from the smallest vertex
					// index only (copies that slip through are merged later).
					prev := i - 1
					if i == i0 {
						prev = i1 - 1
					}
					if a, b := c.EdgeSource[prev], c.EdgeSource[i]; (a >= 0 && a < v) || (b >= 0 && b < v) {
						continue
					}
					out = append(out, fcCand{px, py, d, l.Tri.Source[v], int64(math.Floor(px / tol))})
				}
			}
		}
		parts[ci] = out
	})
	var all []fcCand
	for _, p := range parts {
		all = append(all, p...)
	}
	return all
}

// fcMergeCopies drops candidates within tol (in x and y) of an earlier
// kept one. Sorted by (x cell, y), a copy of a point is in its own x cell
// within tol in y, or in the previous x cell. O(m log m).
func fcMergeCopies(all []fcCand, tol float64) []fcCand {
	slices.SortFunc(all, func(a, b fcCand) int {
		switch {
		case a.qx != b.qx:
			return cmp.Compare(a.qx, b.qx)
		case a.y != b.y:
			return cmp.Compare(a.y, b.y)
		case a.x != b.x:
			return cmp.Compare(a.x, b.x)
		}
		return cmp.Compare(a.src, b.src)
	})
	dup := make([]bool, len(all))
	prevStart, curStart := 0, 0 // first index of the previous and current x cells
	for i := range all {
		p := &all[i]
		if i > 0 && p.qx != all[i-1].qx {
			if all[i-1].qx == p.qx-1 {
				prevStart = curStart
			} else {
				prevStart = i
			}
			curStart = i
		}
		// Earlier points within tol: in this x cell (just before in y
		// order) and in the previous x cell (found by binary search on y).
		for j := i - 1; j >= curStart && p.y-all[j].y <= tol; j-- {
			if !dup[j] && math.Abs(all[j].x-p.x) <= tol {
				dup[i] = true
				break
			}
		}
		if !dup[i] && prevStart < curStart {
			seg := all[prevStart:curStart]
			j, _ := slices.BinarySearchFunc(seg, p.y-tol, func(a fcCand, y float64) int { return cmp.Compare(a.y, y) })
			for ; j < len(seg) && seg[j].y <= p.y+tol; j++ {
				if !dup[prevStart+j] && math.Abs(seg[j].x-p.x) <= tol {
					dup[i] = true
					break
				}
			}
		}
	}
	kept := all[:0]
	for i := range all {
		if !dup[i] {
			kept = append(kept, all[i])
		}
	}
	return kept
}
