// Batched neighbour lists for the cells emitted whole.
//
// clipper.around walks the triangles about one vertex: each step loads the
// next half-edge's opposite, so the loads of one walk depend on each other,
// and with vertices numbered in input order (spatially random) nearly
// every step misses the cache. aroundBatch walks the cells of many
// vertices in lock-step, one step of each per round: the loads of
// different walks are independent, so the processor overlaps their misses.
// The lists are those around gives, element for element. The cells'
// corners are then gathered the same way, in a loop of independent loads.

package planar

// aroundLanes is the number of walks advanced in lock-step, and
// aroundLaneCap the longest walk kept in a lane (a vertex of higher
// degree, or a hull vertex, is left to around).
const (
	aroundLanes   = 16
	aroundLaneCap = 64
)

// aroundBatch lists, for each vertex v in [lo, hi) whose cell is emitted
// whole (state clipInside), its neighbours and triangles as around does
// for a bounded cell, into b.nb[b.off[v-lo]:b.off[v-lo]+b.n[v-lo]] (and
// b.tri likewise); b.n is -1 for the vertices left out (another state, a
// hull vertex, or a degree above aroundLaneCap), whose lists around gives.
func (c *clipper) aroundBatch(lo, hi int32, b *aroundBuf) {
	n := int(hi - lo)
	if cap(b.off) < n {
		b.off, b.n = make([]int32, n), make([]int32, n)
	}
	b.lo, b.off, b.n = lo, b.off[:n], b.n[:n]
	b.nb, b.tri = b.nb[:0], b.tri[:0]
	t := c.t
	tr, he := t.Triangles, t.Halfedges
	var lv, le0, le, lcnt [aroundLanes]int32
	var lnb, ltri [aroundLanes][aroundLaneCap]int32
	next := lo
	// fill loads the next wanted vertex into lane i; false when none is
	// left.
	fill := func(i int) bool {
		for ; next < hi; next++ {
			v := next
			b.n[v-lo] = -1
			if c.state[v] != clipInside {
				continue
			}
			e := t.Inedge[v]
			if e < 0 {
				continue
			}
			lv[i], le0[i], le[i], lcnt[i] = v, e, e, 0
			next++
			return true
		}
		return false
	}
	active := 0
	var live [aroundLanes]bool
	for i := range aroundLanes {
		if fill(i) {
			live[i] = true
			active++
		}
	}
	for active > 0 {
		for i := range aroundLanes {
			if !live[i] {
				continue
			}
			e := le[i]
			k := lcnt[i]
			lnb[i][k] = tr[e]
			ltri[i][k] = e / 3
			k++
			lcnt[i] = k
			ne := he[NextHalfedge(e)]
			done := false
			switch {
			case ne == le0[i]:
				// Bounded: nb is the walk reversed, tri the walk reversed
				// and rotated left by one.
				b.off[lv[i]-lo] = int32(len(b.nb))
				b.n[lv[i]-lo] = k
				for j := k - 1; j >= 0; j-- {
					b.nb = append(b.nb, lnb[i][j])
				}
				for j := int32(0); j < k; j++ {
					b.tri = append(b.tri, ltri[i][k-1-(j+1)%k])
				}
				done = true
			case ne < 0 || k == aroundLaneCap:
				done = true // left to around
			default:
				le[i] = ne
			}
			if done && !fill(i) {
				live[i] = false
				active--
			}
		}
	}
	// The corners (circumcentres of the triangles), gathered in a loop of
	// independent loads.
	if cap(b.cc) < 2*len(b.tri) {
		b.cc = make([]float64, 2*len(b.tri), 2*cap(b.tri))
	}
	b.cc = b.cc[:2*len(b.tri)]
	cc := c.cc
	for i, t := range b.tri {
		b.cc[2*i], b.cc[2*i+1] = cc[2*t], cc[2*t+1]
	}
}

// aroundBuf holds aroundBatch's lists for the vertices from lo on, and
// the corner of each listed triangle (cc interleaved, like tri).
type aroundBuf struct {
	lo      int32
	off, n  []int32
	nb, tri []int32
	cc      []float64
}

// lists returns the lists of v held in b and the corners of its
// triangles, ok false when b has none.
func (b *aroundBuf) lists(v int32) (nb, tri []int32, cc []float64, ok bool) {
	i := int(v - b.lo)
	if i < 0 || i >= len(b.n) || b.n[i] < 0 {
		return nil, nil, nil, false
	}
	o, k := b.off[i], b.n[i]
	return b.nb[o : o+k], b.tri[o : o+k], b.cc[2*o : 2*(o+k)], true
}
