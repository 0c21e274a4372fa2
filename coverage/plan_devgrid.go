// A dynamic uniform bucket grid over the planned devices, for the
// neighbourhood queries of the incremental cells (plan_overlay.go).
//
// Buckets are squares of side h keyed by their integer coordinates in a
// hash map, so devices may lie anywhere (candidate spots beyond the site).
// A point within distance R of q lies in a bucket at Chebyshev distance at
// most ⌈R/h⌉ from q's bucket, and every point of a bucket at Chebyshev
// distance k ≥ 1 is farther than (k − 1)·h from q, which bounds the
// nearest-first search. Scans are clipped to the bounding box of the
// buckets ever occupied. h is chosen as √(area / max(16, n)) for n
// devices and the grid is rebuilt whenever the number of devices has
// doubled or fallen to a quarter since the last build (amortised O(1) per
// edit), so a bucket holds O(1) devices when they are spread over the site.
// No geometric decision depends on the grid: it only lists candidates,
// which the callers test exactly.

package coverage

import (
	"math"
	"slices"
)

type planDevGrid struct {
	h, inv                 float64
	buckets                map[int64][]int32
	built                  int // live devices at the last build
	live                   int
	minI, maxI, minJ, maxJ int64
	area                   float64
}

func newPlanDevGrid(area float64) *planDevGrid {
	g := &planDevGrid{area: area}
	g.reset(0)
	return g
}

func (g *planDevGrid) reset(n int) {
	g.h = math.Sqrt(g.area / float64(max(16, n)))
	if !(g.h > 0) || math.IsInf(g.h, 0) {
		g.h = 1
	}
	g.inv = 1 / g.h
	g.buckets = make(map[int64][]int32)
	g.built, g.live = n, 0
	g.minI, g.minJ = math.MaxInt64, math.MaxInt64
	g.maxI, g.maxJ = math.MinInt64, math.MinInt64
}

func (g *planDevGrid) cell(x, y float64) (int64, int64) {
	return int64(math.Floor(x * g.inv)), int64(math.Floor(y * g.inv))
}

func planDevKey(i, j int64) int64 { return i<<32 | (j & 0xffffffff) }

func (g *planDevGrid) insert(id int32, x, y float64) {
	i, j := g.cell(x, y)
	k := planDevKey(i, j)
	g.buckets[k] = append(g.buckets[k], id)
	g.live++
	g.minI, g.maxI = min(g.minI, i), max(g.maxI, i)
	g.minJ, g.maxJ = min(g.minJ, j), max(g.maxJ, j)
}

func (g *planDevGrid) remove(id int32, x, y float64) {
	i, j := g.cell(x, y)
	k := planDevKey(i, j)
	b := g.buckets[k]
	if p := slices.Index(b, id); p >= 0 {
		b[p] = b[len(b)-1]
		b = b[:len(b)-1]
		g.live--
	}
	if len(b) == 0 {
		delete(g.buckets, k)
	} else {
		g.buckets[k] = b
	}
}

// needsRebuild reports whether the device count moved far from the count
// the bucket size was chosen for.
func (g *planDevGrid) needsRebuild() bool {
	return g.live > 2*max(16, g.built) || (g.built > 64 && 4*g.live < g.built)
}

// ring calls fn for every device in the buckets at Chebyshev distance
// exactly k from (x, y)'s bucket, in no particular order; it reports false
// when the ring surrounds the occupied box (no ring from k on holds a
// device).
func (g *planDevGrid) ring(x, y float64, k int64, fn func(id int32)) bool {
	ci, cj := g.cell(x, y)
	if ci-k < g.minI && ci+k > g.maxI && cj-k < g.minJ && cj+k > g.maxJ {
		return false
	}
	visit := func(i, j int64) {
		if i < g.minI || i > g.maxI || j < g.minJ || j > g.maxJ {
			return
		}
		for _, id := range g.buckets[planDevKey(i, j)] {
			fn(id)
		}
	}
	if k == 0 {
		visit(ci, cj)
		return true
	}
	for i := max(ci-k, g.minI); i <= min(ci+k, g.maxI); i++ {
		visit(i, cj-k)
		visit(i, cj+k)
	}
	for j := max(cj-k+1, g.minJ); j <= min(cj+k-1, g.maxJ); j++ {
		visit(ci-k, j)
		visit(ci+k, j)
	}
	return true
}

// within appends to buf[:0], in increasing order, every device in the
// buckets that may hold points within distance r of (x, y) (a superset;
// callers test the distance).
func (g *planDevGrid) within(x, y, r float64, buf []int32) []int32 {
	buf = buf[:0]
	if g.live == 0 {
		return buf
	}
	ci, cj := g.cell(x, y)
	kr := int64(1 << 40)
	if r*g.inv < 1<<40 {
		kr = int64(math.Ceil(r*g.inv)) + 1
	}
	i0, i1 := max(ci-kr, g.minI), min(ci+kr, g.maxI)
	j0, j1 := max(cj-kr, g.minJ), min(cj+kr, g.maxJ)
	if i0 > i1 || j0 > j1 {
		return buf
	}
	if (i1-i0+1)*(j1-j0+1) > int64(2*len(g.buckets)+16) {
		// Sparse: walk the occupied buckets instead.
		for k, b := range g.buckets {
			i, j := k>>32, int64(int32(k))
			if i >= i0 && i <= i1 && j >= j0 && j <= j1 {
				buf = append(buf, b...)
			}
		}
	} else {
		for i := i0; i <= i1; i++ {
			for j := j0; j <= j1; j++ {
				buf = append(buf, g.buckets[planDevKey(i, j)]...)
			}
		}
	}
	slices.Sort(buf)
	return buf
}
