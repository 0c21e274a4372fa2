// Bucket grids: uniform grids of square or rectangular buckets that list
// the points falling in each, for neighbourhood queries and spatially
// coherent orders.
//
// Three forms share the bucket arithmetic of Grid (bucket of a point =
// ⌊(x − X0)·SX⌋, ⌊(y − Y0)·SY⌋, clamped to the grid, so points outside the
// box fall in its border buckets):
//
//   - BucketGrid: static, built once from a point list into two flat
//     arrays (compressed sparse rows: Start per bucket, Items), O(n + buckets)
//     to build, no per-bucket allocation. Used where the points are fixed:
//     the planners' base sites, the serpentine order of nearest-site
//     queries.
//   - HashGrid: dynamic, buckets keyed by their integer coordinates in a
//     hash map, so points may lie anywhere (no box) and be inserted and
//     removed one at a time; it rebuilds itself with a new bucket side when
//     the number of points has moved far from the one the side was chosen
//     for. Used for the planned devices, which appear, move and leave.
//   - Grid alone with one value per bucket (the nearest-site search's hint
//     grid, delaunay_locate.go).
//
// No geometric decision depends on a grid: it only lists candidates, which
// callers test exactly. A point within distance R of q lies in a bucket at
// Chebyshev distance at most ⌈R/side⌉ from q's bucket, and every point of a
// bucket at Chebyshev distance k ≥ 1 is farther than (k − 1)·side from q.

package planar

import (
	"math"
	"slices"
)

// MaxGridSide is the largest number of buckets along either axis of a Grid
// made by GridOfSide (2¹⁵: at most 2³⁰ buckets).
const MaxGridSide = 1 << 15

// Grid is the bucket arithmetic of a uniform NX × NY grid with lower-left
// corner (X0, Y0) and SX, SY buckets per unit length (0 for a single column
// or row).
type Grid struct {
	X0, Y0 float64
	SX, SY float64
	NX, NY int
}

// GridOfCells returns a grid over the box [minX, maxX] × [minY, maxY] with
// about cells buckets (at least 1) of the box's aspect ratio; a box of zero
// height (width) gets a single row (column) of cells buckets, and a box
// without extent, or an infinite one, a single bucket.
func GridOfCells(minX, minY, maxX, maxY float64, cells int) Grid {
	cells = max(1, cells)
	w, h := maxX-minX, maxY-minY
	okW, okH := w > 0 && !math.IsInf(w, 0), h > 0 && !math.IsInf(h, 0)
	g := Grid{X0: minX, Y0: minY, NX: 1, NY: 1}
	switch {
	case okW && okH:
		g.NX = max(1, min(cells, int(math.Sqrt(float64(cells)*w/h))))
		g.NY = max(1, min(cells, cells/g.NX))
	case okW:
		g.NX = cells
	case okH:
		g.NY = cells
	}
	if g.NX > 1 {
		g.SX = float64(g.NX) / w
	}
	if g.NY > 1 {
		g.SY = float64(g.NY) / h
	}
	return g
}

// GridOfSide returns a grid over the box [minX, maxX] × [minY, maxY] of
// square buckets of the given side (> 0), at most MaxGridSide along each
// axis (the last bucket then takes the rest).
func GridOfSide(minX, minY, maxX, maxY, side float64) Grid {
	inv := 1 / side
	return Grid{
		X0: minX, Y0: minY, SX: inv, SY: inv,
		NX: max(1, min(MaxGridSide, int((maxX-minX)*inv)+1)),
		NY: max(1, min(MaxGridSide, int((maxY-minY)*inv)+1)),
	}
}

// BoundsXY returns the bounding box of the points of xy (interleaved)
// listed in ids (nil: every point); +Inf, −Inf for no point.
func BoundsXY(xy []float64, ids []int32) (minX, minY, maxX, maxY float64) {
	minX, minY = math.Inf(1), math.Inf(1)
	maxX, maxY = math.Inf(-1), math.Inf(-1)
	n := len(ids)
	if ids == nil {
		n = len(xy) / 2
	}
	for k := 0; k < n; k++ {
		v := int32(k)
		if ids != nil {
			v = ids[k]
		}
		x, y := xy[2*v], xy[2*v+1]
		minX, maxX = math.Min(minX, x), math.Max(maxX, x)
		minY, maxY = math.Min(minY, y), math.Max(maxY, y)
	}
	return minX, minY, maxX, maxY
}

// gridIndex returns ⌊f⌋ clamped to [0, n−1] (NaN to 0).
func gridIndex(f float64, n int) int {
	switch {
	case !(f >= 0):
		return 0
	case f >= float64(n):
		return n - 1
	}
	return int(f)
}

// Col returns the bucket column of x, clamped to the grid.
func (g *Grid) Col(x float64) int { return gridIndex((x-g.X0)*g.SX, g.NX) }

// Row returns the bucket row of y, clamped to the grid.
func (g *Grid) Row(y float64) int { return gridIndex((y-g.Y0)*g.SY, g.NY) }

// Cell returns the bucket index (row-major) of (x, y), clamped to the grid.
func (g *Grid) Cell(x, y float64) int { return g.Row(y)*g.NX + g.Col(x) }

// NumCells returns the number of buckets.
func (g *Grid) NumCells() int { return g.NX * g.NY }

// BucketGrid is a static bucket grid: bucket c (row-major) holds the point
// ids Items[Start[c]:Start[c+1]], in the order they were given.
type BucketGrid struct {
	Grid
	Start []int32
	Items []int32
}

// NewBucketGrid buckets the points of xy (interleaved) listed in ids (nil:
// every point, in index order) on the grid g. O(points + buckets).
func NewBucketGrid(g Grid, xy []float64, ids []int32) *BucketGrid {
	b := &BucketGrid{Grid: g}
	n := len(ids)
	if ids == nil {
		n = len(xy) / 2
	}
	key := make([]int32, n)
	b.Start = make([]int32, g.NumCells()+1)
	for k := 0; k < n; k++ {
		v := int32(k)
		if ids != nil {
			v = ids[k]
		}
		c := int32(g.Cell(xy[2*v], xy[2*v+1]))
		key[k] = c
		b.Start[c+1]++
	}
	for c := 1; c < len(b.Start); c++ {
		b.Start[c] += b.Start[c-1]
	}
	b.Items = make([]int32, n)
	fill := slices.Clone(b.Start[:len(b.Start)-1])
	for k := 0; k < n; k++ {
		v := int32(k)
		if ids != nil {
			v = ids[k]
		}
		c := key[k]
		b.Items[fill[c]] = v
		fill[c]++
	}
	return b
}

// Bucket returns the ids in bucket c.
func (b *BucketGrid) Bucket(c int) []int32 { return b.Items[b.Start[c]:b.Start[c+1]] }

// Near calls fn for every id in the buckets meeting the square of
// half-side reach around (x, y) (a superset of the points within reach).
func (b *BucketGrid) Near(x, y, reach float64, fn func(id int32)) {
	if len(b.Items) == 0 {
		return
	}
	c0, c1 := b.Col(x-reach), b.Col(x+reach)
	r0, r1 := b.Row(y-reach), b.Row(y+reach)
	for j := r0; j <= r1; j++ {
		for i := c0; i <= c1; i++ {
			c := j*b.NX + i
			for _, v := range b.Items[b.Start[c]:b.Start[c+1]] {
				fn(v)
			}
		}
	}
}

// HashGrid is a dynamic bucket grid: square buckets of side Side() keyed by
// their integer coordinates in a hash map, holding point ids inserted and
// removed one at a time. The side is √(area / max(16, n)) for the n points
// the grid was last reset for, so a bucket holds O(1) points when they are
// spread over a site of the given area; NeedsRebuild reports when the count
// has doubled or fallen to a quarter since (amortised O(1) per edit when
// the caller then resets and reinserts). Scans are clipped to the bounding
// box of the buckets ever occupied since the last reset.
type HashGrid struct {
	h, inv                 float64
	buckets                map[int64][]int32
	built                  int // points at the last reset
	live                   int
	minI, maxI, minJ, maxJ int64
	area                   float64
}

// NewHashGrid returns an empty grid for points spread over a site of the
// given area (m²).
func NewHashGrid(area float64) *HashGrid {
	g := &HashGrid{area: area}
	g.Reset(0)
	return g
}

// Reset empties the grid and chooses the bucket side for n points.
func (g *HashGrid) Reset(n int) {
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

// Side returns the bucket side.
func (g *HashGrid) Side() float64 { return g.h }

// Len returns the number of points in the grid.
func (g *HashGrid) Len() int { return g.live }

func (g *HashGrid) cell(x, y float64) (int64, int64) {
	return int64(math.Floor(x * g.inv)), int64(math.Floor(y * g.inv))
}

func hashGridKey(i, j int64) int64 { return i<<32 | (j & 0xffffffff) }

// Insert adds point id at (x, y).
func (g *HashGrid) Insert(id int32, x, y float64) {
	i, j := g.cell(x, y)
	k := hashGridKey(i, j)
	g.buckets[k] = append(g.buckets[k], id)
	g.live++
	g.minI, g.maxI = min(g.minI, i), max(g.maxI, i)
	g.minJ, g.maxJ = min(g.minJ, j), max(g.maxJ, j)
}

// Remove removes point id, inserted at (x, y); an id not there is ignored.
func (g *HashGrid) Remove(id int32, x, y float64) {
	i, j := g.cell(x, y)
	k := hashGridKey(i, j)
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

// NeedsRebuild reports whether the number of points moved far from the
// count the bucket side was chosen for (doubled, or fallen to a quarter).
func (g *HashGrid) NeedsRebuild() bool {
	return g.live > 2*max(16, g.built) || (g.built > 64 && 4*g.live < g.built)
}

// Ring calls fn for every point in the buckets at Chebyshev distance
// exactly k from (x, y)'s bucket, in no particular order; it reports false
// when the ring surrounds the occupied box (no ring from k on holds a
// point). Every such point is farther than (k − 1)·Side() from (x, y).
func (g *HashGrid) Ring(x, y float64, k int64, fn func(id int32)) bool {
	ci, cj := g.cell(x, y)
	if ci-k < g.minI && ci+k > g.maxI && cj-k < g.minJ && cj+k > g.maxJ {
		return false
	}
	visit := func(i, j int64) {
		if i < g.minI || i > g.maxI || j < g.minJ || j > g.maxJ {
			return
		}
		for _, id := range g.buckets[hashGridKey(i, j)] {
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

// Within appends to buf[:0], in increasing order, every point in the
// buckets that may hold points within distance r of (x, y) (a superset;
// callers test the distance).
func (g *HashGrid) Within(x, y, r float64, buf []int32) []int32 {
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
				buf = append(buf, g.buckets[hashGridKey(i, j)]...)
			}
		}
	}
	slices.Sort(buf)
	return buf
}
