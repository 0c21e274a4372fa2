// ClipCells, deciding which cells meet the area's boundary.
//
// walkBoundary walks every ring edge through the Voronoi diagram: it starts
// in the cell of the site nearest the edge's first vertex and leaves each
// cell across the bisector that the edge crosses first (Cyrus–Beck
// parameters along the edge), recording every (site, ring edge) pair met,
// and near ties (within clipWalkTieT of the edge parameter) as well, since
// rounding may pick the wrong one of two bisectors crossing at almost one
// point. markCrossedEdges then tests every Voronoi edge that can reach a ring
// edge exactly against the ring edges in the fine grid (SegmentsMeet), so a
// cell that a ring edge enters through its boundary is always marked even
// where the walk stepped past it. classify groups the unmarked cells joined
// by Voronoi edges of positive length (union-find over the Delaunay edges)
// and decides each group with one exact point-in-area test at a site.

package planar

import (
	"math"
	"slices"
	"sync"
)

// clipWalkTieT is the tolerance, in the edge parameter t ∈ [0, 1], within
// which two bisector crossings of a ring edge count as a near tie that the
// walk records on both sides. A computed parameter is off by a few u
// (u = 2⁻⁵³) times the ratio of the distances involved to the edge length,
// far below 1e-9 for any edge longer than 1e-6 of its distance from the
// sites. The walk's pairs are only a starting set: markCrossedEdges and
// each cell's grid seeds add every pair it misses, so this tolerance
// affects speed, never the result.
const clipWalkTieT = 1e-9

// walkBoundary walks every ring edge through the Voronoi diagram and
// records each (site, edge) pair whose cell the edge passes through.
func (c *clipper) walkBoundary() {
	r := c.r
	c.state = make([]uint8, c.nv)
	visited := make([]int32, c.nv)
	for i := range visited {
		visited[i] = -1
	}
	var nb, tri []int32
	var pairs []uint64
	site := int32(0)
	for k := 0; k < r.NumRings(); k++ {
		s0 := r.RingStart[k]
		site = c.nearest(r.XY[2*s0], r.XY[2*s0+1], site, nb, tri)
		for e := s0; e < r.RingStart[k+1]; e++ {
			b := c.rnext[e]
			ax, ay := r.XY[2*e], r.XY[2*e+1]
			bx, by := r.XY[2*b], r.XY[2*b+1]
			visited[site] = e
			pairs = append(pairs, uint64(site)<<32|uint64(e))
			// Walk along a→b. tcur is the parameter reached so far. Near
			// ties between exits (bisectors crossing the edge at almost
			// the same point: a Voronoi vertex, or near-duplicate sites)
			// are all recorded, since rounding may pick the wrong one;
			// and if the point at tcur turns out to lie beyond a bisector
			// of the cell entered, the walk moves on across it.
			tcur := 0.0
			for steps := 0; steps < c.nv; steps++ {
				nb, tri, _ = c.around(site, nb, tri)
				px, py := c.xy[2*site], c.xy[2*site+1]
				best, bt := int32(-1), 0.0
				back, tb := int32(-1), 0.0
				for _, j := range nb {
					if visited[j] == e {
						continue
					}
					nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
					h := c.halfOffset(site, j, nx, ny)
					ga := (ax-px)*nx + (ay-py)*ny - h
					gb := (bx-px)*nx + (by-py)*ny - h
					if ga == 0 && gb == 0 {
						// The edge lies on this bisector: it borders
						// both cells.
						visited[j] = e
						pairs = append(pairs, uint64(j)<<32|uint64(e))
						continue
					}
					if ga > gb && ga > 0 {
						// Entering this cell across bisector j at tj:
						// before tj the edge is on j's side.
						if tj := ga / (ga - gb); tj > tcur+clipWalkTieT && (back < 0 || tj > tb) {
							back, tb = j, tj
						}
						continue
					}
					if !(gb > 0 && gb > ga) {
						continue
					}
					tj := ga / (ga - gb)
					if best < 0 || tj < bt {
						best, bt = j, tj
					}
				}
				if back >= 0 {
					site = back
					visited[site] = e
					pairs = append(pairs, uint64(site)<<32|uint64(e))
					continue
				}
				if best < 0 {
					break
				}
				// Record near-tied exits too.
				for _, j := range nb {
					if visited[j] == e || j == best {
						continue
					}
					nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
					h := c.halfOffset(site, j, nx, ny)
					ga := (ax-px)*nx + (ay-py)*ny - h
					gb := (bx-px)*nx + (by-py)*ny - h
					if gb > 0 && gb > ga && ga/(ga-gb) <= bt+clipWalkTieT {
						pairs = append(pairs, uint64(j)<<32|uint64(e))
					}
				}
				site = best
				tcur = math.Max(tcur, bt)
				visited[site] = e
				pairs = append(pairs, uint64(site)<<32|uint64(e))
			}
		}
	}
	slices.Sort(pairs)
	pairs = slices.Compact(pairs)
	c.pairSite = make([]int32, len(pairs))
	c.pairEdge = make([]int32, len(pairs))
	for i, p := range pairs {
		c.pairSite[i], c.pairEdge[i] = int32(p>>32), int32(p&0xffffffff)
		c.state[c.pairSite[i]] = clipCrossed
	}
}

// markCrossedEdges completes the marks of the boundary walk: every
// Voronoi edge (a segment between two circumcentres, or a ray from one
// for a hull edge) that meets a ring edge, by an exact test, marks both
// its cells as crossed. The walk alone can step past a cell where
// bisectors almost coincide (near-duplicate sites); with this pass every
// cell that a ring edge enters through its boundary is marked, so the
// groups of unmarked cells that classify decides with one test each are
// truly on one side of the area's boundary. Rings lying inside one cell
// cross no Voronoi edge; the walk marks their cell.
func (c *clipper) markCrossedEdges() {
	if c.collinear {
		return
	}
	t := c.t
	g := &c.fine
	// Far enough along a hull ray to leave the grid's box.
	bx0, by0 := g.x0, g.y0
	bx1, by1 := g.x0+float64(g.nx)*g.cw, g.y0+float64(g.ny)*g.ch
	// An edge between two triangles that are both not "near" (circumradius
	// below half a grid cell, centre in a cell with no ring edge in or next
	// to it) is shorter than a cell and stays in that empty neighbourhood:
	// it meets no ring edge. So only the edges of near triangles are
	// tested, each once (from its smaller half-edge when both are near).
	var mu sync.Mutex
	var hits []int32
	ParallelChunks(len(t.Triangles)/3, 1<<15, c.workers, func(_, lo, hi int) {
		var local []int32
		for tr := lo; tr < hi; tr++ {
			if !c.near[tr] {
				continue
			}
			for e := int32(3 * tr); e < int32(3*tr+3); e++ {
				o := t.Halfedges[e]
				if o >= 0 && o < e && c.near[o/3] {
					continue
				}
				a, b := t.Triangles[e], t.Triangles[NextHalfedge(e)]
				if c.state[a] != clipUnknown && c.state[b] != clipUnknown {
					continue
				}
				x0, y0 := c.cc[2*tr], c.cc[2*tr+1]
				var x1, y1 float64
				if o >= 0 {
					x1, y1 = c.cc[2*(o/3)], c.cc[2*(o/3)+1]
				} else {
					// Hull edge a→b (interior on the left): the ray runs
					// along the outward normal.
					nx, ny := c.xy[2*b+1]-c.xy[2*a+1], -(c.xy[2*b] - c.xy[2*a])
					l := math.Hypot(nx, ny)
					reach := math.Hypot(bx1-bx0, by1-by0) + math.Abs(x0-bx0) + math.Abs(y0-by0) + math.Abs(x0-bx1) + math.Abs(y0-by1)
					x1, y1 = x0+nx/l*reach, y0+ny/l*reach
				}
				if g.segmentHits(x0, y0, x1, y1) {
					local = append(local, a, b)
				}
			}
		}
		if len(local) > 0 {
			mu.Lock()
			hits = append(hits, local...)
			mu.Unlock()
		}
	})
	for _, v := range hits {
		c.state[v] = clipCrossed
	}
}

// classify decides every uncrossed cell: uncrossed cells joined by a
// Voronoi edge of positive length lie on the same side of the area's
// boundary, so one point-in-area test (at a site, which lies strictly
// inside its own Voronoi cell; for a power cell at cellPoint) decides a
// whole group. Groups are found by
// union-find over the Delaunay edges in one linear pass.
func (c *clipper) classify() {
	uf := NewUnionFind(c.nv)
	find := uf.Find
	union := func(a, b int32) {
		if c.state[a] != clipUnknown || c.state[b] != clipUnknown {
			return
		}
		uf.UnionMin(a, b)
	}
	t := c.t
	if c.collinear {
		for i := 1; i < len(t.Hull); i++ {
			union(t.Hull[i-1], t.Hull[i])
		}
	} else {
		for e := range t.Halfedges {
			o := t.Halfedges[e]
			if o >= 0 && o < int32(e) {
				continue
			}
			if o >= 0 && c.class[e/3] == c.class[o/3] {
				continue // zero-length Voronoi edge: the cells only touch
			}
			union(t.Triangles[e], t.Triangles[NextHalfedge(int32(e))])
		}
	}
	// Verdict per group: 0 undecided, 1 inside, 2 outside, 3 only sites on
	// the boundary seen so far.
	verdict := make([]uint8, c.nv)
	var nb, tri []int32
	for v := int32(0); int(v) < c.nv; v++ {
		if c.state[v] != clipUnknown {
			continue
		}
		r := find(v)
		if verdict[r] == 1 || verdict[r] == 2 {
			continue
		}
		x, y := c.cellPoint(v, nb, tri)
		in, on := c.grid.locate(x, y, nil, nil)
		switch {
		case on:
			verdict[r] = 3
		case in:
			verdict[r] = 1
		default:
			verdict[r] = 2
		}
	}
	for v := int32(0); int(v) < c.nv; v++ {
		if c.state[v] != clipUnknown {
			continue
		}
		switch verdict[find(v)] {
		case 1:
			c.state[v] = clipInside
		case 2:
			c.state[v] = clipOutside
		default:
			c.state[v] = clipCrossed
		}
	}
	// Unbounded cells (hull sites; every site when collinear) cannot lie
	// whole inside a bounded area; if a group said so (only on
	// inconsistency), clip them in full.
	for _, v := range t.Hull {
		if c.state[v] == clipInside {
			c.state[v] = clipCrossed
		}
	}
}
