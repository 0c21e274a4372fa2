// The Delaunay graph of the devices in compressed rows with each vertex's
// clipped-cell box and whether that cell lies inside the area (kGraph),
// and the neighbourhood N(S) of a set of devices: the candidates for the
// k-th nearest device in Lee's construction (kcover.go).

package coverage

import (
	"slices"

	"github.com/sitecover/sitecover/planar"
)

// kGraph is the Delaunay graph in compressed rows (the neighbours of
// vertex v are Adj[Start[v]:Start[v+1]], in Triangulation.Neighbors order),
// with, per vertex, whether its clipped cell is its whole Voronoi cell (one
// ring, every edge on a bisector: the cell lies inside the area) and the
// cell's bounding box.
type kGraph struct {
	Start []int32
	Adj   []int32
	Inner []bool
	BoxXY []float64 // minX, minY, maxX, maxY per vertex
}

// newKGraph collects the neighbour lists and cell boxes of every vertex.
func newKGraph(t *planar.Triangulation, c *planar.Cells) *kGraph {
	nv := t.NumVertices()
	g := &kGraph{Start: make([]int32, nv+1), Inner: make([]bool, nv), BoxXY: make([]float64, 4*nv)}
	var buf []int32
	for v := int32(0); v < int32(nv); v++ {
		buf = t.Neighbors(v, buf)
		g.Adj = append(g.Adj, buf...)
		g.Start[v+1] = int32(len(g.Adj))
	}
	planar.ParallelFor(nv, 4096, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
			if p1-p0 != 1 || c.PolyStart[p0+1]-c.PolyStart[p0] != 1 {
				continue
			}
			k := c.PolyStart[p0]
			i0, i1 := c.RingStart[k], c.RingStart[k+1]
			inner := true
			for i := i0; i < i1; i++ {
				if c.EdgeSource[i] < 0 {
					inner = false
					break
				}
			}
			g.Inner[v] = inner
			minX, minY, maxX, maxY := planar.BoundsXY(c.XY[2*i0:2*i1], nil)
			copy(g.BoxXY[4*v:], []float64{minX, minY, maxX, maxY})
		}
	})
	return g
}

// kNeighbourhood returns N(S) in buf: the Delaunay neighbours of the
// members of S that are not in S, each once, in the order met. For one
// member it is exactly Triangulation.Neighbors (as Failures uses; g may
// then be nil).
func kNeighbourhood(t *planar.Triangulation, g *kGraph, S []int32, buf []int32) []int32 {
	if len(S) == 1 {
		return t.Neighbors(S[0], buf)
	}
	buf = buf[:0]
	for _, s := range S {
		for _, u := range g.Adj[g.Start[s]:g.Start[s+1]] {
			if !slices.Contains(S, u) && !slices.Contains(buf, u) {
				buf = append(buf, u)
			}
		}
	}
	return buf
}
