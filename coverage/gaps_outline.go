// Gap outlines: the boundary of each gap merged across cells.
//
// Math. Each piece component's loops keep the uncovered side on the left.
// Inside a gap, the bisector portions shared by two of its components are
// interior and are removed; the remaining elements (boundary portions,
// arcs, and any bisector portion without a partner) form chains whose ends
// lie on bisectors. A chain that stops where a removed block of portions on
// the bisector of the pair (i, j) begins continues in the neighbouring cell
// with the chain that starts where that cell's removed block ends: the same
// point of the same bisector, found by the canonical bisector coordinate.
// Arcs are replaced by chords of equal angular step with sagitta at most
// tol·r, i.e. step angle at most 2·acos(1 − tol); the chords lie inside the
// disk, so the outline contains the true gap and exceeds its area by less
// than the circular segments cut off (about (2/3)·tol·r·arc length).
// Rings are closed (first point repeated), outer rings counter-clockwise
// and holes clockwise, as RFC 7946 asks.

package coverage

import (
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// gapChain is a maximal run of kept elements of one loop.
type gapChain struct {
	gap        int32
	loop       int32
	first, n   int32 // first element (global) and element count (wrapping within the loop)
	v          int32 // the vertex of the loop's cell
	closed     bool  // the whole loop, nothing removed
	sKey, eKey uint64
	sTau, eTau float64
	sx, sy     float64 // start point (first element's start)
	ex, ey     float64 // end point (start of the removed element after it)
	next       int32
	seen       bool
	used       bool // another chain's end links to this chain's start
}

// gapBisector returns the canonical key of the pair (v, j) and the
// canonical bisector coordinate function's parameters.
func gapBisector(l *Layout, v, j int32) (key uint64, mx, my, ux, uy float64) {
	a, b := v, j
	if a > b {
		a, b = b, a
	}
	ax, ay := l.site(a)
	bx, by := l.site(b)
	dx, dy := bx-ax, by-ay
	d := math.Sqrt(dx*dx + dy*dy)
	if d > 0 {
		dx, dy = dx/d, dy/d
	}
	return uint64(a)<<32 | uint64(uint32(b)), (ax + bx) / 2, (ay + by) / 2, dx, dy
}

func gapTau(l *Layout, v, j int32, x, y float64) (uint64, float64) {
	key, mx, my, ux, uy := gapBisector(l, v, j)
	return key, ux*(y-my) - uy*(x-mx)
}

// countChains returns the number of chains outlines cuts loops [lp0, lp1)
// into: one per loop with no element removed, else one per maximal run of
// kept elements (cyclically, a kept element after a removed one starts a
// run). Counting first lets the chains, about 100 bytes each and millions
// at 10⁶ sites, be allocated once instead of grown by copying.
func (m *gapMerged) countChains(lp0, lp1 int) int {
	count := 0
	for lp := lp0; lp < lp1; lp++ {
		e0, e1 := m.loopElem[lp], m.loopElem[lp+1]
		runs, nRem := 0, 0
		for e := e0; e < e1; e++ {
			prev := e - 1
			if e == e0 {
				prev = e1 - 1
			}
			switch {
			case m.matched[e]:
				nRem++
			case m.matched[prev]:
				runs++
			}
		}
		if nRem == 0 && e1 > e0 {
			runs = 1
		}
		count += runs
	}
	return count
}

// gapOutlineLoopChunk is the number of loops per parallel chunk when the
// loops are cut into chains, and gapOutlineGapChunk the number of gaps per
// parallel chunk when chains are linked into rings (most gaps have a
// handful of chains).
const (
	gapOutlineLoopChunk = 1 << 14
	gapOutlineGapChunk  = 64
)

// outlines returns the outline of each of the ng gaps.
//
// Chains are cut from the loops in parallel chunks of loops, written in
// loop order; chains link only to chains of their own gap, so each gap's
// chains (in chain order) are linked and followed into rings on their own,
// gaps in parallel: the rings are those of linking all chains in order.
func (m *gapMerged) outlines(l *Layout, gapOf []int32, ng int, gp *gapParams, tol float64) []orb.MultiPolygon {
	nLoops := len(m.loopElem) - 1
	loopNode := make([]int32, nLoops)
	m.loopNode = loopNode
	for i := range m.nodes {
		for lp := m.nodes[i].loop0; lp < m.nodes[i].loop1; lp++ {
			loopNode[lp] = int32(i)
		}
	}
	nc := (nLoops + gapOutlineLoopChunk - 1) / gapOutlineLoopChunk
	start := make([]int, nc+1)
	planar.ParallelChunks(nLoops, gapOutlineLoopChunk, 0, func(ci, lo, hi int) {
		start[ci+1] = m.countChains(lo, hi)
	})
	for ci := range nc {
		start[ci+1] += start[ci]
	}
	chains := make([]gapChain, start[nc])
	planar.ParallelChunks(nLoops, gapOutlineLoopChunk, 0, func(ci, lo, hi int) {
		m.cutChains(l, gapOf, lo, hi, chains[start[ci]:start[ci]:start[ci+1]])
	})
	// The chains of each gap in chain order, in rows (CSR).
	gStart := make([]int32, ng+1)
	for i := range chains {
		gStart[chains[i].gap+1]++
	}
	for g := range ng {
		gStart[g+1] += gStart[g]
	}
	byGap := make([]int32, len(chains))
	fill := slices.Clone(gStart[:ng])
	for i := range chains {
		g := chains[i].gap
		byGap[fill[g]] = int32(i)
		fill[g]++
	}
	fill = nil
	b := l.Area.Bound()
	ext := math.Max(math.Max(math.Abs(b.Min[0]), math.Abs(b.Max[0])), math.Max(math.Abs(b.Min[1]), math.Abs(b.Max[1])))
	linkTol := gapLinkTolR*gp.r + gapLinkTolExt*ext
	if !(linkTol > 0) {
		linkTol = math.SmallestNonzeroFloat64
	}
	alpha := 2 * math.Acos(1-math.Min(tol, 1))
	out := make([]orb.MultiPolygon, ng)
	planar.ParallelChunks(ng, gapOutlineGapChunk, 0, func(_, lo, hi int) {
		var lk gapLinker
		var buf []orb.Point
		var rings []orb.Ring
		for g := lo; g < hi; g++ {
			cs := byGap[gStart[g]:gStart[g+1]]
			lk.link(m, l, chains, cs, linkTol)
			// Follow the links into rings.
			rings = rings[:0]
			for _, i := range cs {
				if chains[i].seen {
					continue
				}
				buf = buf[:0]
				cur := i
				for cur >= 0 && !chains[cur].seen {
					c := &chains[cur]
					c.seen = true
					buf = m.chainPoints(l, c, gp, alpha, buf)
					if c.closed {
						break
					}
					cur = c.next
				}
				if ring := gapCloseRing(buf); ring != nil {
					rings = append(rings, ring)
				}
			}
			out[g] = gapPolygons(rings)
		}
	})
	return out
}

// cutChains appends to chains (its capacity exactly enough) the chains of
// loops [lp0, lp1) in loop order: a loop with nothing removed whole, else
// each maximal run of kept elements, from the first kept element after a
// removed one, with its ends' canonical bisector coordinates.
func (m *gapMerged) cutChains(l *Layout, gapOf []int32, lp0, lp1 int, chains []gapChain) {
	loopNode := m.loopNode
	for lp := lp0; lp < lp1; lp++ {
		e0, e1 := m.loopElem[lp], m.loopElem[lp+1]
		n := e1 - e0
		if n == 0 {
			continue
		}
		nd := &m.nodes[loopNode[lp]]
		g := gapOf[loopNode[lp]]
		removed := func(k int32) bool { return m.matched[e0+((k%n)+n)%n] }
		nRem := int32(0)
		for k := int32(0); k < n; k++ {
			if removed(k) {
				nRem++
			}
		}
		if nRem == n {
			continue
		}
		if nRem == 0 {
			chains = append(chains, gapChain{gap: g, loop: int32(lp), first: e0, n: n, v: nd.v, closed: true, next: -1})
			continue
		}
		// Start at the first kept element following a removed one.
		f := int32(0)
		for !(removed(f-1) && !removed(f)) {
			f++
		}
		for k := f; k < f+n; {
			if removed(k) {
				k++
				continue
			}
			s := k
			for k < f+n && !removed(k) {
				k++
			}
			// Elements s..k-1 are kept; s-1 and k are removed.
			pe := &m.elems[e0+((s-1)%n+n)%n]
			fe := &m.elems[e0+s%n]
			ge := &m.elems[e0+k%n]
			ch := gapChain{gap: g, loop: int32(lp), first: e0 + s%n, n: k - s, v: nd.v, next: -1,
				sx: fe.x, sy: fe.y, ex: ge.x, ey: ge.y}
			ch.sKey, ch.sTau = gapTau(l, nd.v, pe.kind, fe.x, fe.y)
			ch.eKey, ch.eTau = gapTau(l, nd.v, ge.kind, ge.x, ge.y)
			chains = append(chains, ch)
		}
	}
}

// Link tolerance of linking chains: a chain end and the start that
// continues it are the same point computed in two cells, so they differ by
// rounding. A point computed from coordinates of magnitude E by a few dozen
// correctly rounded operations is within a few hundred ulps, under
// 1e-13·E; a crossing of a circle of radius r with a nearly tangent line is
// ill-conditioned, its error growing like √(2ε)·r ≈ 1.5e-8·r (ε = 2⁻⁵³).
// The tolerance gapLinkTolR·r + gapLinkTolExt·E covers both with a margin
// of about ten, and stays far below the distance between distinct chain
// ends of one gap.
const (
	gapLinkTolR   = 1e-7
	gapLinkTolExt = 1e-12
)

// gapStartPos is a chain start placed by x cell of side tol, then y.
type gapStartPos struct {
	chain int32
	qx    int64
	y     float64
}

// gapStartRec is a chain start placed by bisector and canonical coordinate.
type gapStartRec struct {
	chain int32
	key   uint64
	tau   float64
}

// gapLinker links the chains of one gap; its buffers are reused from gap
// to gap.
type gapLinker struct {
	pos    []gapStartPos
	starts []gapStartRec
	cand   []int32
}

// link links each chain end among cs (one gap's chains, ascending) to the
// chain start at the same point, taking the ends in chain order: among the
// unused starts within tol the one on the same bisector first, then the
// nearest. Where none is that close (a crossing of a circle with a nearly
// tangent bisector is computed less precisely), the nearest start along the
// same bisector is taken. Ties in position go to the smaller chain index.
func (lk *gapLinker) link(m *gapMerged, l *Layout, chains []gapChain, cs []int32, tol float64) {
	// Starts sorted by (x cell of side tol, y): the starts within tol of a
	// point are in three x cells, each searched by y. A start is used once
	// linked to (next of another chain being set).
	cmpPos := func(a, b gapStartPos) int {
		switch {
		case a.qx != b.qx:
			return cmp.Compare(a.qx, b.qx)
		case a.y != b.y:
			return cmp.Compare(a.y, b.y)
		}
		return cmp.Compare(a.chain, b.chain)
	}
	cmpRec := func(a, b gapStartRec) int {
		switch {
		case a.key != b.key:
			return cmp.Compare(a.key, b.key)
		case a.tau != b.tau:
			return cmp.Compare(a.tau, b.tau)
		}
		return cmp.Compare(a.chain, b.chain)
	}
	lk.pos = lk.pos[:0]
	built := false // lk.starts holds this gap's starts
	for _, i := range cs {
		if c := &chains[i]; !c.closed {
			lk.pos = append(lk.pos, gapStartPos{i, int64(math.Floor(c.sx / tol)), c.sy})
		}
	}
	if len(lk.pos) == 0 {
		return
	}
	slices.SortFunc(lk.pos, cmpPos)
	pos := lk.pos
	for _, i := range cs {
		c := &chains[i]
		if c.closed {
			continue
		}
		best, bestD := int32(-1), math.Inf(1)
		cand := lk.cand[:0]
		qx := int64(math.Floor(c.ex / tol))
		for ix := qx - 1; ix <= qx+1; ix++ {
			// First start not before (ix, ey − tol).
			k, _ := slices.BinarySearchFunc(pos, gapStartPos{chain: math.MinInt32, qx: ix, y: c.ey - tol}, cmpPos)
			for ; k < len(pos) && pos[k].qx == ix && pos[k].y <= c.ey+tol; k++ {
				j := pos[k].chain
				if !chains[j].used && math.Abs(chains[j].sx-c.ex) <= tol {
					cand = append(cand, j)
				}
			}
		}
		lk.cand = cand
		switch len(cand) {
		case 0:
		case 1:
			best = cand[0]
		default:
			// Several boundary strands meet at this point (the gap touches
			// itself there): turn most to the left, hugging the gap, so
			// that the rings do not cross.
			ix, iy := m.chainDir(l, c, false)
			bestA := math.Inf(-1)
			for _, j := range cand {
				ox, oy := m.chainDir(l, &chains[j], true)
				if a := math.Atan2(ix*oy-iy*ox, ix*ox+iy*oy); a > bestA {
					best, bestA = j, a
				}
			}
		}
		if best < 0 {
			if !built {
				// Built only when a chain end finds no start within tol.
				lk.starts = lk.starts[:0]
				for _, q := range cs {
					if s := &chains[q]; !s.closed {
						lk.starts = append(lk.starts, gapStartRec{q, s.sKey, s.sTau})
					}
				}
				slices.SortFunc(lk.starts, cmpRec)
				built = true
			}
			starts := lk.starts
			want := gapStartRec{chain: math.MinInt32, key: c.eKey, tau: c.eTau}
			at, _ := slices.BinarySearchFunc(starts, want, cmpRec)
			for q := at; q < len(starts) && starts[q].key == c.eKey; q++ {
				if !chains[starts[q].chain].used {
					best, bestD = starts[q].chain, math.Abs(starts[q].tau-c.eTau)
					break
				}
			}
			for q := at - 1; q >= 0 && starts[q].key == c.eKey; q-- {
				if !chains[starts[q].chain].used {
					if d := math.Abs(starts[q].tau - c.eTau); d < bestD {
						best = starts[q].chain
					}
					break
				}
			}
		}
		if best >= 0 {
			chains[best].used = true
			c.next = best
		}
	}
}

// chainDir returns the direction in which chain c leaves its start point
// (start true) or arrives at its end point: along a segment, or along the
// clockwise tangent of an arc.
func (m *gapMerged) chainDir(l *Layout, c *gapChain, start bool) (float64, float64) {
	e0, e1 := m.loopElem[c.loop], m.loopElem[c.loop+1]
	n := e1 - e0
	k := c.first - e0
	if !start {
		k = (k + c.n - 1) % n
	}
	el := &m.elems[e0+k]
	nx := &m.elems[e0+(k+1)%n]
	if el.kind != gapArc {
		return nx.x - el.x, nx.y - el.y
	}
	cx, cy := l.site(c.v)
	px, py := el.x, el.y
	if !start {
		px, py = nx.x, nx.y
	}
	return py - cy, -(px - cx)
}

// chainPoints appends the points of chain c: each element's start, and the
// chord points inside each arc.
func (m *gapMerged) chainPoints(l *Layout, c *gapChain, gp *gapParams, alpha float64, buf []orb.Point) []orb.Point {
	e0, e1 := m.loopElem[c.loop], m.loopElem[c.loop+1]
	n := e1 - e0
	off := c.first - e0
	v := c.v
	cx, cy := l.site(v)
	r := gp.radius(v)
	for k := int32(0); k < c.n; k++ {
		el := &m.elems[e0+(off+k)%n]
		buf = append(buf, orb.Point{el.x, el.y})
		phi := float64(el.phi)
		if el.kind != gapArc || phi <= 0 {
			continue
		}
		steps := int(math.Ceil(phi / alpha))
		if steps > 1 {
			th := math.Atan2(el.y-cy, el.x-cx)
			for s := 1; s < steps; s++ {
				a := th - phi*float64(s)/float64(steps)
				buf = append(buf, orb.Point{cx + r*math.Cos(a), cy + r*math.Sin(a)})
			}
		}
	}
	return buf
}

// gapCloseRing copies pts into a closed ring without repeated points; nil
// when fewer than three distinct points remain.
func gapCloseRing(pts []orb.Point) orb.Ring {
	ring := planar.DropRepeats(append(make(orb.Ring, 0, len(pts)+1), pts...))
	if len(ring) < 3 {
		return nil
	}
	return append(ring, ring[0])
}

// gapHoleInside reports whether the hole ring h lies inside the exterior
// ring e. Outline rings do not cross but may touch (a gap touching itself),
// so h is wholly inside or wholly outside e apart from touching points: the
// first vertex of h strictly inside or outside e decides (planar.PointInRing,
// exact). A vertex on e decides nothing — under the closed convention it is
// in e whichever side h lies on, and a half-open crossing rule would call it
// in or out by the side of e it lies on — so it is skipped. A hole with
// every vertex on e is taken as inside (the closed convention).
func gapHoleInside(e, h orb.Ring) bool {
	exy := planar.FlatRing(e)
	for _, p := range h {
		if s := planar.PointInRing(exy, p[0], p[1]); s != 0 {
			return s > 0
		}
	}
	return true
}

// gapPolygons groups rings into polygons: counter-clockwise rings are
// exteriors, clockwise rings holes of the smallest exterior containing them.
func gapPolygons(rings []orb.Ring) orb.MultiPolygon {
	var ext, holes []orb.Ring
	var extA []float64
	for _, r := range rings {
		a := planar.RingArea(planar.FlatRing(r))
		switch {
		case a > 0:
			ext = append(ext, r)
			extA = append(extA, a)
		case a < 0:
			holes = append(holes, r)
		}
	}
	if len(ext) == 0 {
		// Only clockwise rings (degenerate input): report them as exteriors.
		for _, h := range holes {
			h.Reverse()
			ext = append(ext, h)
			extA = append(extA, planar.RingArea(planar.FlatRing(h)))
		}
		holes = nil
	}
	mp := make(orb.MultiPolygon, len(ext))
	for i, e := range ext {
		mp[i] = orb.Polygon{e}
	}
	for _, h := range holes {
		best := 0
		if len(ext) > 1 {
			best = -1
			bestA := math.Inf(1)
			for i, e := range ext {
				if extA[i] < bestA && gapHoleInside(e, h) {
					best, bestA = i, extA[i]
				}
			}
			if best < 0 {
				best = 0
			}
		}
		mp[best] = append(mp[best], h)
	}
	return mp
}
