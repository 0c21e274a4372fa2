// Links between devices with their own ranges.
//
// What a link means. Two devices link when each is within the other's
// range: |p_i − p_j| ≤ min(r_i, r_j), a two-way link being limited by the
// weaker device. With a common range r this is |p_i − p_j| ≤ r, so the
// devices form one network exactly when r is at least Persistence's
// LinkRange (the longest edge of the Euclidean minimum spanning tree).
//
// Method. Devices are bucketed in a square grid of side at least max r_i
// (a linked pair lies in the same or a neighbouring bucket; the side grows
// when the extent would need more than linkBucketsPerSite buckets per
// device), each pair of neighbouring buckets is tested (rows of buckets in
// parallel) and linked pairs are joined by union-find (serially: the
// groups and their smallest members do not depend on the order). The test
// compares squared distances in floating point (exact up to a few ulps of
// the squared range at an exact tie).

package coverage

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// linkBucketsPerSite bounds the grid's buckets per device (2: an empty
// bucket costs a few loads, so the grid stays O(n) for any extent).
const linkBucketsPerSite = 2

// linkRowsChunk is the number of bucket rows per parallel chunk.
const linkRowsChunk = 16

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
	xy := make([]float64, 2*n)
	for i, p := range sites {
		xy[2*i], xy[2*i+1] = p[0], p[1]
	}
	minX, minY, maxX, maxY := planar.BoundsXY(xy, nil)
	// Buckets of side at least max r_i (a linked pair lies in the same or
	// neighbouring buckets), and no more than about linkBucketsPerSite·n
	// of them.
	if a := (maxX - minX) * (maxY - minY); a > 0 && !math.IsInf(a, 0) {
		side = math.Max(side, math.Sqrt(a/(linkBucketsPerSite*float64(n))))
	}
	bg := planar.NewBucketGrid(planar.GridOfSide(minX, minY, maxX, maxY, side), xy, nil)
	// Each chunk of bucket rows lists its linked pairs (i | j<<32); the
	// union is serial, in chunk order.
	nx, ny := bg.NX, bg.NY
	nc := (ny + linkRowsChunk - 1) / linkRowsChunk
	pairs := make([][]uint64, nc)
	planar.ParallelChunks(ny, linkRowsChunk, 0, func(ci, lo, hi int) {
		var out []uint64
		for row := lo; row < hi; row++ {
			for col := range nx {
				cell := bg.Bucket(row*nx + col)
				// This bucket against itself and its four "forward"
				// neighbours.
				for _, d := range [5][2]int{{0, 0}, {1, -1}, {1, 0}, {1, 1}, {0, 1}} {
					c2, r2 := col+d[0], row+d[1]
					if c2 >= nx || r2 < 0 || r2 >= ny {
						continue
					}
					other := bg.Bucket(r2*nx + c2)
					for a, i := range cell {
						if d == [2]int{0, 0} {
							other = cell[a+1:]
						}
						for _, j := range other {
							m := math.Min(ranges[i], ranges[j])
							dx, dy := sites[i][0]-sites[j][0], sites[i][1]-sites[j][1]
							if m >= 0 && dx*dx+dy*dy <= m*m {
								out = append(out, uint64(uint32(i))|uint64(uint32(j))<<32)
							}
						}
					}
				}
			}
		}
		pairs[ci] = out
	})
	uf := planar.NewUnionFind(n)
	linked := make([]bool, n)
	for _, ps := range pairs {
		for _, ij := range ps {
			i, j := int32(uint32(ij)), int32(ij>>32)
			uf.UnionMin(i, j)
			linked[i], linked[j] = true, true
		}
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
