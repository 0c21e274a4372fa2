// Service-area colouring: cells sharing an edge get different colours.
//
// The adjacency of the clipped cells is a subgraph of the Delaunay
// triangulation, hence planar and 5-degenerate, and greedy colouring in
// smallest-last order (Matula & Beck, "Smallest-last ordering and
// clustering and graph coloring algorithms", J. ACM 30, 1983) uses at most
// six colours; the palette has six (draw.go), far apart for every reader
// (colourdiff.go). O(n + e log e) for n cells and e
// shared edges (the edge keys are sorted once).

package report

import "slices"

// cellColours colours the clipped cells so that neighbours differ, by
// greedy colouring in smallest-last order. It returns a palette index per
// triangulation vertex.
func (s *scene) cellColours() []int8 {
	cl := s.l.Cells
	n := len(cl.SiteStart) - 1
	if n <= 0 {
		return nil
	}
	// neighbour pairs from the cell edges lying on bisectors
	var keys []uint64
	for v := range n {
		for p := cl.SiteStart[v]; p < cl.SiteStart[v+1]; p++ {
			for k := cl.PolyStart[p]; k < cl.PolyStart[p+1]; k++ {
				for i := cl.RingStart[k]; i < cl.RingStart[k+1]; i++ {
					j := cl.EdgeSource[i]
					if j < 0 || int(j) == v || int(j) >= n {
						continue
					}
					a, b := uint64(v), uint64(j)
					if a > b {
						a, b = b, a
					}
					keys = append(keys, a<<32|b)
				}
			}
		}
	}
	slices.Sort(keys)
	keys = slices.Compact(keys)
	deg := make([]int32, n+1)
	for _, key := range keys {
		deg[key>>32]++
		deg[key&0xffffffff]++
	}
	start := make([]int32, n+1)
	for v := range n {
		start[v+1] = start[v] + deg[v]
	}
	adj := make([]int32, start[n])
	fill := slices.Clone(start[:n])
	for _, key := range keys {
		a, b := int32(key>>32), int32(key&0xffffffff)
		adj[fill[a]] = b
		fill[a]++
		adj[fill[b]] = a
		fill[b]++
	}
	// smallest-last order with degree buckets
	d := make([]int32, n)
	maxDeg := int32(0)
	for v := range n {
		d[v] = start[v+1] - start[v]
		maxDeg = max(maxDeg, d[v])
	}
	buckets := make([][]int32, maxDeg+1)
	for v := range n {
		buckets[d[v]] = append(buckets[d[v]], int32(v))
	}
	removed := make([]bool, n)
	order := make([]int32, 0, n)
	low := int32(0)
	for len(order) < n {
		for low > 0 && len(buckets[low-1]) > 0 {
			low--
		}
		for len(buckets[low]) == 0 {
			low++
		}
		b := buckets[low]
		v := b[len(b)-1]
		buckets[low] = b[:len(b)-1]
		if removed[v] || d[v] != low {
			continue // stale entry
		}
		removed[v] = true
		order = append(order, v)
		for _, w := range adj[start[v]:start[v+1]] {
			if !removed[w] {
				d[w]--
				buckets[d[w]] = append(buckets[d[w]], w)
			}
		}
	}
	col := make([]int8, n)
	for i := range col {
		col[i] = -1
	}
	var used [64]bool
	for i := n - 1; i >= 0; i-- {
		v := order[i]
		for k := range used {
			used[k] = false
		}
		for _, w := range adj[start[v]:start[v+1]] {
			if c := col[w]; c >= 0 && int(c) < len(used) {
				used[c] = true
			}
		}
		c := 0
		for c < len(used)-1 && used[c] {
			c++
		}
		col[v] = int8(c)
	}
	return col
}
