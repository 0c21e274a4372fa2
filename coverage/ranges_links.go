// Links between devices with their own ranges.
//
// What a link means. Two devices link when each is within the other's
// range: |p_i − p_j| ≤ min(r_i, r_j), a two-way link being limited by the
// weaker device. With a common range r this is |p_i − p_j| ≤ r, so the
// devices form one network exactly when r is at least Persistence's
// LinkRange (the longest edge of the Euclidean minimum spanning tree).
//
// Method. Devices are bucketed in a square grid of side max r_i (a linked
// pair lies in the same or a neighbouring cell), each pair of neighbouring
// buckets is tested and linked pairs are joined by union-find. The test
// compares squared distances in floating point (exact up to a few ulps of
// the squared range at an exact tie).

package coverage

import (
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// LinkSummary describes the network of devices linked two-way by their own
// ranges (the file comment defines a link).
type LinkSummary struct {
	// Components is the number of groups of devices connected by links.
	Components int
	// Largest is the number of devices in the largest group.
	Largest int
	// Isolated lists the input indices of devices with no link, ascending.
	Isolated []int
	// Group holds, per input device, the smallest input index in its group.
	Group []int
}

// LinksRanges returns the link network of the devices at sites with the
// given ranges (metres, one per site; hidden devices take part: hiding is
// about coverage only). Non-finite or negative ranges link nothing.
func LinksRanges(sites []orb.Point, ranges []float64) LinkSummary {
	n := len(sites)
	var ls LinkSummary
	if n == 0 || len(ranges) != n {
		return ls
	}
	side := 0.0
	for _, r := range ranges {
		if r > side && !math.IsInf(r, 0) {
			side = r
		}
	}
	if !(side > 0) {
		side = 1
	}
	type cell struct {
		q, r int64
		i    int32
	}
	cells := make([]cell, n)
	for i, p := range sites {
		cells[i] = cell{int64(math.Floor(p[0] / side)), int64(math.Floor(p[1] / side)), int32(i)}
	}
	slices.SortFunc(cells, func(a, b cell) int {
		if c := cmp.Compare(a.q, b.q); c != 0 {
			return c
		}
		if c := cmp.Compare(a.r, b.r); c != 0 {
			return c
		}
		return cmp.Compare(a.i, b.i)
	})
	// find returns the start of bucket (q, r) in cells and its end.
	find := func(q, r int64) (int, int) {
		lo, _ := slices.BinarySearchFunc(cells, cell{q, r, -1}, func(a, b cell) int {
			if c := cmp.Compare(a.q, b.q); c != 0 {
				return c
			}
			if c := cmp.Compare(a.r, b.r); c != 0 {
				return c
			}
			return cmp.Compare(a.i, b.i)
		})
		hi := lo
		for hi < n && cells[hi].q == q && cells[hi].r == r {
			hi++
		}
		return lo, hi
	}
	uf := planar.NewUnionFind(n)
	linked := make([]bool, n)
	for s := 0; s < n; {
		e := s
		for e < n && cells[e].q == cells[s].q && cells[e].r == cells[s].r {
			e++
		}
		// This bucket against itself and its four "forward" neighbours.
		for _, d := range [5][2]int64{{0, 0}, {1, -1}, {1, 0}, {1, 1}, {0, 1}} {
			lo, hi := s, e
			if d != [2]int64{0, 0} {
				lo, hi = find(cells[s].q+d[0], cells[s].r+d[1])
			}
			for a := s; a < e; a++ {
				i := cells[a].i
				b0 := lo
				if d == [2]int64{0, 0} {
					b0 = a + 1
				}
				for b := b0; b < hi; b++ {
					j := cells[b].i
					m := math.Min(ranges[i], ranges[j])
					dx, dy := sites[i][0]-sites[j][0], sites[i][1]-sites[j][1]
					if m >= 0 && dx*dx+dy*dy <= m*m {
						uf.UnionMin(i, j)
						linked[i], linked[j] = true, true
					}
				}
			}
		}
		s = e
	}
	ls.Group = make([]int, n)
	size := make([]int, n)
	for i := 0; i < n; i++ {
		g := int(uf.Find(int32(i)))
		ls.Group[i] = g
		size[g]++
		if g == i {
			ls.Components++
		}
		if !linked[i] {
			ls.Isolated = append(ls.Isolated, i)
		}
	}
	ls.Largest = slices.Max(size)
	return ls
}
