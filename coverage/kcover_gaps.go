// k-gaps: the connected parts of the site area reached by fewer than k
// devices at the planned range r.
//
// Inside a piece (S, q) of Lee's construction (kcover.go) a point is
// reached by fewer than k devices exactly when it lies outside D(q, r), so
// the k-gap set is the union over the pieces of piece \ D(q, r), and
// pieces are joined across shared edges: the k-th nearest distance is
// continuous, so on an edge shared by two pieces a point outside one
// piece's disk is outside the other's too.
//
// Per piece. The boundary of piece \ D is made of the outside chains of
// the piece's rings (maximal runs of ring edges, cut where an edge crosses
// the circle) and arcs of the circle inside the piece. Following the
// piece's rings (interior on the left), a chain starts where a ring leaves
// the disk (an exit) and ends where it enters it (an entry); from an entry
// the circle is followed clockwise about q (the gap, outside the circle,
// on the left) up to the next crossing of any ring, which is the next
// chain's exit. The loops so traced bound the components of piece \ D:
// counter-clockwise loops are outer boundaries, clockwise ones holes (a
// ring with no crossing is a loop by itself; a circle with no crossing
// inside the piece is a hole). Each loop's area is exact by Green's
// theorem about q: ½ a × b per chain edge (a, b relative to q) and −½ r² φ
// per arc turned clockwise through φ. When the crossings do not alternate
// (a ring grazing the circle within rounding, or the back-and-forth
// bridges a clipped non-convex piece may carry) the piece counts as one
// part with area area(piece) − area(piece ∩ D) and its rings as outline.
//
// Joining. For every outside chain edge, the point m just across the
// midpoint of its outside part (KGapProbe of the length scale outward) is
// located: its k nearest devices in order (a best-first walk of the
// Delaunay graph: the k nearest of a point are connected in it) name the
// piece across, and the part of that piece with an edge nearest m is
// joined to this one (planar.UnionFind). A probe outside the area means
// the edge lies on the area's boundary.
//
// The spot of a gap that needs the most range is the piece vertex farthest
// from its q among the gap's parts (a convex function's maximum over a
// part of a piece is at a vertex of the piece; on the arcs the distance is
// r); the devices around it are its k nearest, nearest first.
//
// Outlines are the parts' loops with arcs replaced by chords (sagitta at
// most chordTol·r), merged into the gap's own polygons by the exact union
// of planar.Union (one union for all the gaps of a level, kgMergeOutlines;
// a gap on its own, kgMergeOutline): the parts of one gap meet along the
// pieces' shared edges, whose ends were rounded by different clips, so the
// union may leave slivers between them; planar.Union drops those a few
// ulps wide, and a remaining hole thinner than KGapSliverRel (area over
// squared perimeter) is such a sliver too and is dropped. Before the
// union the vertices are snapped to a fine grid (KGapSnapBits) and spikes
// removed (kgCleanRing); a part whose outline still crosses itself (a
// chord of a thin part crossing a ring edge within the sagitta) is split
// at its self-meetings (kgSplitPolygon). A part the union still refuses is
// kept as it is beside the union of the others, and when the union fails
// altogether the gap keeps one polygon per part (they still tile it).

package coverage

import (
	"cmp"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// KGapProbe is the step across a piece edge, relative to the distance of
// the edge's midpoint from the piece's device plus the range, at which the
// piece across is located: far above the rounding of the clipped vertices
// (about 1e-15 relative) and far below any piece that matters (a sliver
// thinner than this is stepped over; its neighbour beyond is then joined,
// which is the right answer unless the gap is thinner than the step too).
const KGapProbe = 1e-9

// KGapArcTie is the angle (radians) below which a ring's exit from the disk
// and an entry into it count as the same spot when the arcs are linked:
// far above the rounding of the crossing angles (about 1e-15), far below
// any arc that matters.
const KGapArcTie = 1e-9

// KGap is one connected part of the site area reached by fewer than k
// devices at the planned range.
type KGap struct {
	// ID numbers the gaps of one k from 1, by decreasing ClosingRange
	// (with own ranges: decreasing ClosingPower), then decreasing Area.
	ID int
	// Area is the gap's area (m²).
	Area float64
	// Deepest is the spot of the gap that needs the most range.
	Deepest orb.Point
	// ClosingRange is the k-th nearest distance at Deepest: the common
	// range at which the gap vanishes. With own ranges it is the distance
	// from Deepest to its k-th device (smallest power first), and the
	// figure to plan with is ClosingPower.
	ClosingRange float64
	// ClosingPower is set with own ranges (KCoverRanges): the largest
	// k-th smallest power over the gap (m², at Deepest); the gap vanishes
	// when every range grows to √(r_i² + ClosingPower).
	ClosingPower float64
	// Sites are the input indices of the k devices nearest Deepest,
	// nearest first (with own ranges: the k of smallest power there,
	// smallest first).
	Sites []int
	// Outline is the gap as polygons, arcs replaced by chords: for k ≥ 2
	// the union of its parts (one polygon per connected part, with its
	// holes), or the parts themselves when the union refused them (see the
	// file comment).
	Outline orb.MultiPolygon
}

// kgPart is one component of piece \ D(q, r).
type kgPart struct {
	piece   int32 // global piece index
	area    float64
	far     float64
	pow     float64 // far² − r²: the largest k-th power over the part
	fx, fy  float64
	outline orb.Polygon
}

// kgCross is a crossing of a ring with the circle.
type kgCross struct {
	ang   float64 // angle about q
	x, y  float64
	exit  bool  // the ring leaves the disk here
	chain int32 // chain starting (exit) or ending (entry) here
}

// kgChain is an outside chain: its points (exit point, ring vertices,
// entry point; or a whole ring) and whether it is a closed ring.
type kgChain struct {
	pts    []float64
	closed bool
}

// gaps returns the k-gaps of level index li.
func (kc *KCoverage) gaps(l *Layout, li int, tol float64) []KGap {
	lv := &kc.Levels[li]
	r := kc.Range
	k := lv.K
	if k == 1 {
		if kc.dev != nil {
			return kc.dev.levelOneGaps(l, tol)
		}
		return kGapsFromLayout(l, r, tol)
	}
	// Global piece numbering and the lookup by (v, S, q).
	type ref struct{ st, i int32 }
	var pieces []ref
	index := map[string]int32{}
	var kb strings.Builder
	for si, st := range lv.store {
		for i := range st.v {
			if _, _, rq := kc.dev.at(l, st.set[i*k+k-1], r); st.far[i] <= rq {
				continue
			}
			index[kgKey(&kb, st.v[i], st.set[i*k:i*k+k])] = int32(len(pieces))
			pieces = append(pieces, ref{int32(si), int32(i)})
		}
	}
	if len(pieces) == 0 {
		return nil
	}
	parts := make([][]kgPart, len(pieces))
	segs := make([][]float64, len(pieces)) // per piece: ax, ay, bx, by, part
	planar.ParallelFor(len(pieces), 64, func(lo, hi int) {
		for p := lo; p < hi; p++ {
			st, i := lv.store[pieces[p].st], int(pieces[p].i)
			parts[p], segs[p] = kgPieceParts(l, kc.dev, st, i, int32(p), r, tol)
		}
	})
	// Parts numbered globally; joins across chain edges.
	first := make([]int32, len(pieces)+1)
	for p := range parts {
		first[p+1] = first[p] + int32(len(parts[p]))
	}
	uf := planar.NewUnionFind(int(first[len(pieces)]))
	// The joins are found in parallel chunks of pieces and applied in
	// piece order, so the components (and their numbering) do not depend
	// on the chunking.
	joins := make([][]int32, (len(pieces)+kgJoinChunk-1)/kgJoinChunk)
	planar.ParallelChunks(len(pieces), kgJoinChunk, 0, func(ci, lo, hi int) {
		var nn kgNearest
		var kb strings.Builder
		for p := lo; p < hi; p++ {
			joins[ci] = kc.pieceJoins(l, lv, pieces[p].st, pieces[p].i, segs, index, first, p, &nn, &kb, joins[ci])
		}
	})
	for _, js := range joins {
		for j := 0; j+1 < len(js); j += 2 {
			uf.Union(js[j], js[j+1])
		}
	}
	// Components.
	byRoot := map[int32]int{}
	var out []KGap
	for p := range parts {
		for j, pt := range parts[p] {
			root := uf.Find(first[p] + int32(j))
			gi, ok := byRoot[root]
			if !ok {
				gi = len(out)
				byRoot[root] = gi
				out = append(out, KGap{ClosingRange: -1, ClosingPower: math.Inf(-1)})
			}
			g := &out[gi]
			g.Area += pt.area
			if kc.dev == nil && pt.far > g.ClosingRange || kc.dev != nil && pt.pow > g.ClosingPower {
				g.ClosingRange, g.Deepest = pt.far, orb.Point{pt.fx, pt.fy}
				st, i := lv.store[pieces[p].st], int(pieces[p].i)
				g.Sites = kc.nearestFirst(l, st.set[i*k:i*k+k], g.Deepest)
				if kc.dev != nil {
					g.ClosingPower = pt.pow
				}
			}
			if len(pt.outline) > 0 {
				g.Outline = append(g.Outline, pt.outline)
			}
		}
	}
	// Parts of zero area (a chain grazing the circle) make no gap.
	out = slices.DeleteFunc(out, func(g KGap) bool { return !(g.Area > 0) })
	for i := range out {
		if kc.dev == nil {
			out[i].ClosingPower = 0
		}
	}
	slices.SortFunc(out, func(a, b KGap) int {
		if c := cmp.Compare(b.ClosingPower, a.ClosingPower); c != 0 {
			return c
		}
		if c := cmp.Compare(b.ClosingRange, a.ClosingRange); c != 0 {
			return c
		}
		return cmp.Compare(b.Area, a.Area)
	})
	for i := range out {
		out[i].ID = i + 1
	}
	return out
}

// kgJoinChunk is the number of pieces per parallel chunk of the joins in
// gaps (a few hundred k-nearest queries: large against the scheduling).
const kgJoinChunk = 256

// pieceJoins appends to dst the pairs of global part numbers (first[p] +
// part) that meet across the chain edges of piece p (store st, index i):
// a probe point just outside each edge finds the piece on the other side
// by its k nearest devices (index), and the nearest of that piece's edges
// names its part.
func (kc *KCoverage) pieceJoins(l *Layout, lv *KLevel, st, i int32, segs [][]float64, index map[string]int32, first []int32,
	p int, nn *kgNearest, kb *strings.Builder, dst []int32) []int32 {
	k := lv.K
	sg := segs[p]
	q := lv.store[st].set[int(i)*k+k-1]
	qx, qy, rq := kc.dev.at(l, q, kc.Range)
	for j := 0; j+4 < len(sg); j += 5 {
		ax, ay, bx, by := sg[j], sg[j+1], sg[j+2], sg[j+3]
		mx, my := (ax+bx)/2, (ay+by)/2
		dx, dy := bx-ax, by-ay
		ln := math.Hypot(dx, dy)
		if ln == 0 {
			continue
		}
		step := KGapProbe * (math.Hypot(mx-qx, my-qy) + rq)
		px, py := mx+dy/ln*step, my-dx/ln*step // right of a→b: outside the piece
		if !l.Area.Contains(px, py) {
			continue
		}
		var ord []int32
		if kc.dev != nil {
			ord = kc.dev.kSmallest(px, py, k, nn)
		} else {
			ord = nn.kNearest(l, px, py, k, q)
		}
		if len(ord) < k {
			continue
		}
		S := slices.Clone(ord[:k-1])
		slices.Sort(S)
		key := append(S, ord[k-1])
		other, ok := index[kgKey(kb, ord[0], key)]
		if !ok {
			other, ok = index[kgKey(kb, -1, key)]
		}
		if !ok {
			continue
		}
		best, bd := int32(-1), math.Inf(1)
		osg := segs[other]
		for j2 := 0; j2+4 < len(osg); j2 += 5 {
			if d := planar.PointSegmentDistance(mx, my, osg[j2], osg[j2+1], osg[j2+2], osg[j2+3]); d < bd {
				bd, best = d, int32(osg[j2+4])
			}
		}
		if best >= 0 {
			dst = append(dst, first[p]+int32(sg[j+4]), first[other]+best)
		}
	}
	return dst
}

// kGapsFromLayout returns the layout's own gaps (k = 1) as k-gaps.
func kGapsFromLayout(l *Layout, r, tol float64) []KGap {
	gs := l.Gaps(r, tol)
	out := make([]KGap, len(gs))
	for i, g := range gs {
		out[i] = KGap{ID: g.ID, Area: g.Area, Deepest: g.Deepest, ClosingRange: g.ClosingRange, Outline: g.Outline}
		v := l.Tri.Nearest(g.Deepest[0], g.Deepest[1], -1)
		if v >= 0 {
			out[i].Sites = []int{int(l.Tri.Source[v])}
		}
	}
	return out
}

// kgKey is the lookup key of a piece: base vertex v (−1 for a whole set)
// and its devices S ascending, then q.
func kgKey(b *strings.Builder, v int32, set []int32) string {
	b.Reset()
	b.WriteString(strconv.Itoa(int(v)))
	for _, s := range set {
		b.WriteByte(',')
		b.WriteString(strconv.Itoa(int(s)))
	}
	return b.String()
}

// kgPieceParts traces the parts of piece i of st outside D(q, r) (see the
// file comment) and returns them with their chain edges (ax, ay, bx, by,
// part index; only edges with a part outside the disk).
func kgPieceParts(l *Layout, dv *kDevs, st *kStore, i int, gid int32, r, tol float64) ([]kgPart, []float64) {
	k := st.k
	q := st.set[i*k+k-1]
	qx, qy, r := dv.at(l, q, r)
	k0, k1 := st.pieceRings(i)
	var chains []kgChain
	var cross []kgCross
	var free []int // closed chains (rings wholly outside)
	ok := true
	anyCross := false
	for ri := k0; ri < k1 && ok; ri++ {
		ring := st.rings.Ring(ri)
		cs, cr, good := kgRingChains(ring, qx, qy, r, int32(len(chains)))
		if !good {
			ok = false
			break
		}
		for _, c := range cs {
			if c.closed {
				free = append(free, len(chains))
			}
			chains = append(chains, c)
		}
		if len(cr) > 0 {
			anyCross = true
		}
		cross = append(cross, cr...)
	}
	if ok {
		parts, segs, good := kgTrace(l, st, i, gid, chains, cross, free, anyCross, qx, qy, r, tol)
		if good {
			return parts, segs
		}
	}
	return kgWholePiece(st, i, gid, qx, qy, r)
}

// kgRingChains cuts one ring into its outside chains and lists its
// crossings with the circle; false when entries and exits do not
// alternate.
func kgRingChains(ring []float64, qx, qy, r float64, base int32) ([]kgChain, []kgCross, bool) {
	n := len(ring) / 2
	out := func(j int) bool { return math.Hypot(ring[2*j]-qx, ring[2*j+1]-qy) > r }
	// Events along the ring: (edge, t, exit).
	type ev struct {
		e    int
		t    float64
		exit bool
	}
	var evs []ev
	for a := 0; a < n; a++ {
		b := (a + 1) % n
		ax, ay := ring[2*a]-qx, ring[2*a+1]-qy
		dx, dy := ring[2*b]-ring[2*a], ring[2*b+1]-ring[2*a+1]
		A := dx*dx + dy*dy
		if A == 0 {
			continue
		}
		B := ax*dx + ay*dy
		h := math.Abs(ax*dy-ay*dx) / math.Sqrt(A)
		if h >= r {
			continue
		}
		disc := A * (r - h) * (r + h)
		sq := math.Sqrt(disc)
		t1, t2 := (-B-sq)/A, (-B+sq)/A
		if t1 > 0 && t1 < 1 {
			evs = append(evs, ev{a, t1, false})
		}
		if t2 > 0 && t2 < 1 {
			evs = append(evs, ev{a, t2, true})
		}
	}
	if len(evs) == 0 {
		if !out(0) {
			return nil, nil, true // wholly inside (or on) the circle
		}
		return []kgChain{{pts: slices.Clone(ring), closed: true}}, nil, true
	}
	// Alternation: along the ring, exits and entries alternate, and the
	// state after each event matches the next vertex.
	for j := range evs {
		if evs[j].exit == evs[(j+1)%len(evs)].exit {
			return nil, nil, false
		}
	}
	var chains []kgChain
	var cross []kgCross
	pt := func(e ev) (float64, float64) {
		a, b := e.e, (e.e+1)%n
		return ring[2*a] + e.t*(ring[2*b]-ring[2*a]), ring[2*a+1] + e.t*(ring[2*b+1]-ring[2*a+1])
	}
	for j, e := range evs {
		if !e.exit {
			continue
		}
		x, y := pt(e)
		c := kgChain{pts: []float64{x, y}}
		nx := evs[(j+1)%len(evs)]
		// Vertices after e's edge up to and including nx's edge start.
		v := (e.e + 1) % n
		if !(nx.e == e.e && nx.t > e.t) {
			for {
				if !out(v) {
					// A vertex inside between an exit and an entry:
					// inconsistent rounding.
					return nil, nil, false
				}
				c.pts = append(c.pts, ring[2*v], ring[2*v+1])
				if v == nx.e {
					break
				}
				v = (v + 1) % n
			}
		}
		ex, ey := pt(nx)
		c.pts = append(c.pts, ex, ey)
		id := base + int32(len(chains))
		chains = append(chains, c)
		cross = append(cross,
			kgCross{ang: math.Atan2(y-qy, x-qx), x: x, y: y, exit: true, chain: id},
			kgCross{ang: math.Atan2(ey-qy, ex-qx), x: ex, y: ey, exit: false, chain: id})
	}
	return chains, cross, true
}

// kgLoop is a closed boundary of piece \ D: chains linked by arcs, its
// outline (arcs as chords), its exact signed area and its chains.
type kgLoop struct {
	ring   orb.Ring
	area   float64
	chains []int
}

// kgTrace links chains and arcs into loops (see the file comment) and
// groups them into parts (kgParts).
func kgTrace(l *Layout, st *kStore, i int, gid int32, chains []kgChain, cross []kgCross, free []int,
	anyCross bool, qx, qy, r, tol float64) ([]kgPart, []float64, bool) {
	slices.SortFunc(cross, func(a, b kgCross) int { return cmp.Compare(a.ang, b.ang) })
	// From each entry, clockwise (decreasing angle) to the next crossing.
	nextChain := make([]int32, len(chains))
	arcFrom := make([][2]float64, len(chains)) // arc angles: start (entry), turn
	for c := range nextChain {
		nextChain[c] = -1
	}
	nc := len(cross)
	for j, c := range cross {
		if c.exit {
			continue
		}
		// An exit at the same spot (a bridge of a clipped non-convex piece
		// leaving and re-entering there) may sort either side of the entry.
		nx, turn := cross[(j+1)%nc], 0.0
		if !nx.exit || math.Abs(nx.ang-c.ang) > KGapArcTie {
			nx = cross[(j-1+nc)%nc]
			if !nx.exit {
				return nil, nil, false
			}
			turn = c.ang - nx.ang
			if turn < -KGapArcTie {
				turn += 2 * math.Pi
			}
			turn = max(0, turn)
		}
		nextChain[c.chain] = nx.chain
		arcFrom[c.chain] = [2]float64{c.ang, turn}
	}
	step := 2 * math.Acos(max(-1, 1-tol)) // chord angle of sagitta tol·r
	if !(step > 0) {
		step = 0.01
	}
	var loops []kgLoop
	seen := make([]bool, len(chains))
	for c0 := range chains {
		if seen[c0] {
			continue
		}
		var lp kgLoop
		c := c0
		for !seen[c] {
			seen[c] = true
			lp.chains = append(lp.chains, c)
			pts := chains[c].pts
			m := len(pts) / 2
			for j := 0; j < m; j++ {
				lp.ring = append(lp.ring, orb.Point{pts[2*j], pts[2*j+1]})
				if j+1 < m || chains[c].closed {
					b := (j + 1) % m
					lp.area += 0.5 * ((pts[2*j]-qx)*(pts[2*b+1]-qy) - (pts[2*j+1]-qy)*(pts[2*b]-qx))
				}
			}
			if chains[c].closed {
				break
			}
			nx := nextChain[c]
			if nx < 0 {
				return nil, nil, false
			}
			a0, turn := arcFrom[c][0], arcFrom[c][1]
			lp.area -= 0.5 * r * r * turn
			ns := int(math.Ceil(turn / step))
			for s := 1; s < ns; s++ {
				a := a0 - turn*float64(s)/float64(ns)
				lp.ring = append(lp.ring, orb.Point{qx + r*math.Cos(a), qy + r*math.Sin(a)})
			}
			c = int(nx)
		}
		if len(lp.ring) > 0 {
			lp.ring = append(lp.ring, lp.ring[0])
		}
		loops = append(loops, lp)
	}
	// A circle meeting no ring, inside the piece: a hole of the part.
	if !anyCross && len(chains) > 0 && kgRingsHold(st, i, qx+r, qy) {
		var ring orb.Ring
		ns := int(math.Ceil(2 * math.Pi / step))
		for s := 0; s <= ns; s++ {
			a := -2 * math.Pi * float64(s) / float64(ns)
			ring = append(ring, orb.Point{qx + r*math.Cos(a), qy + r*math.Sin(a)})
		}
		loops = append(loops, kgLoop{ring: ring, area: -math.Pi * r * r})
	}
	return kgParts(l, st, i, gid, chains, loops, qx, qy, r)
}

// kgParts makes one part per counter-clockwise loop, adds each clockwise
// loop (a hole) to the part holding it, and takes each part's area, its
// farthest valid vertex from q and its chain edges.
func kgParts(l *Layout, st *kStore, i int, gid int32, chains []kgChain, loops []kgLoop, qx, qy, r float64) ([]kgPart, []float64, bool) {
	// Outer loops make parts; holes join the outer loop holding them.
	var parts []kgPart
	partOf := make([]int, len(loops))
	for j, lp := range loops {
		partOf[j] = -1
		if lp.area > 0 {
			partOf[j] = len(parts)
			parts = append(parts, kgPart{piece: gid, far: -1, outline: orb.Polygon{lp.ring}})
		}
	}
	if len(parts) == 0 {
		return nil, nil, true
	}
	for j, lp := range loops {
		if partOf[j] >= 0 || len(lp.ring) == 0 {
			continue
		}
		pi := 0
		for o, p := range parts {
			if planar.PointInRing(planar.FlatRing(p.outline[0]), lp.ring[0][0], lp.ring[0][1]) >= 0 {
				pi = o
				break
			}
		}
		partOf[j] = pi
		parts[pi].outline = append(parts[pi].outline, lp.ring)
	}
	valid := kgValid(l, st, i)
	var segs []float64
	for j, lp := range loops {
		p := &parts[partOf[j]]
		p.area += lp.area
		for _, c := range lp.chains {
			pts := chains[c].pts
			m := len(pts) / 2
			for a := 0; a < m; a++ {
				x, y := pts[2*a], pts[2*a+1]
				if d := math.Hypot(x-qx, y-qy); d > p.far && valid(x, y) {
					p.far, p.fx, p.fy = d, x, y
				}
				if a+1 < m || chains[c].closed {
					b := (a + 1) % m
					segs = append(segs, x, y, pts[2*b], pts[2*b+1], float64(partOf[j]))
				}
			}
		}
	}
	for j := range parts {
		if parts[j].far < 0 {
			parts[j].far, parts[j].fx, parts[j].fy = r, parts[j].outline[0][0][0], parts[j].outline[0][0][1]
		}
		parts[j].pow = parts[j].far*parts[j].far - r*r
	}
	return parts, segs, true
}

// kgRingsHold reports whether the rings of piece i hold (x, y) (winding
// number: exteriors counter-clockwise, holes clockwise).
func kgRingsHold(st *kStore, i int, x, y float64) bool {
	k0, k1 := st.pieceRings(i)
	w := 0
	for ri := k0; ri < k1; ri++ {
		ring := st.rings.Ring(ri)
		if planar.PointInRing(ring, x, y) > 0 {
			if planar.RingArea(ring) > 0 {
				w++
			} else {
				w--
			}
		}
	}
	return w > 0
}

// kgValid returns the test of whether a vertex of piece i is a point of
// the piece: as in planMeasures (the piece's farthest vertex, hence the
// level's cover figure), only the piece's candidate vertices
// (planar.ProvCandidate) of a clipped non-convex base cell are tested
// against that cell (planar/halfplane.go); every other vertex is a point
// of the piece, even where its rounding puts it an ulp outside the cell.
// Crossings of the circle are never candidates.
func kgValid(l *Layout, st *kStore, i int) func(x, y float64) bool {
	v := st.v[i]
	if v < 0 {
		return func(float64, float64) bool { return true }
	}
	rs := planCellRings(l.Cells, v)
	if rs.NumRings() == 1 && planar.RingConvex(rs.Ring(0)) {
		return func(float64, float64) bool { return true }
	}
	var cand []float64
	k0, k1 := st.pieceRings(i)
	for ri := k0; ri < k1; ri++ {
		ring, prov := st.rings.Ring(ri), st.rings.RingProv(ri)
		for j, f := range prov {
			if f&planar.ProvCandidate != 0 {
				cand = append(cand, ring[2*j], ring[2*j+1])
			}
		}
	}
	return func(x, y float64) bool {
		for j := 0; j+1 < len(cand); j += 2 {
			if cand[j] == x && cand[j+1] == y {
				return planCellHolds(&rs, x, y)
			}
		}
		return true
	}
}

// kgWholePiece is the fallback: the whole piece as one part (area exact,
// outline the piece's rings, every edge with a point outside the disk a
// chain edge).
func kgWholePiece(st *kStore, i int, gid int32, qx, qy, r float64) ([]kgPart, []float64) {
	k0, k1 := st.pieceRings(i)
	p := kgPart{piece: gid, far: st.far[i], fx: st.fx[i], fy: st.fy[i], pow: st.far[i]*st.far[i] - r*r}
	var segs []float64
	disk := 0.0
	for ri := k0; ri < k1; ri++ {
		ring := st.rings.Ring(ri)
		disk += planar.RingDiskArea(ring, qx, qy, r)
		var or orb.Ring
		n := len(ring) / 2
		for a := 0; a < n; a++ {
			b := (a + 1) % n
			or = append(or, orb.Point{ring[2*a], ring[2*a+1]})
			if math.Max(math.Hypot(ring[2*a]-qx, ring[2*a+1]-qy), math.Hypot(ring[2*b]-qx, ring[2*b+1]-qy)) > r {
				segs = append(segs, ring[2*a], ring[2*a+1], ring[2*b], ring[2*b+1], 0)
			}
		}
		or = append(or, or[0])
		p.outline = append(p.outline, or)
	}
	p.area = max(0, st.area[i]-disk)
	return []kgPart{p}, segs
}

// kgNearest is scratch space for k-nearest queries by a best-first walk
// of the Delaunay graph.
type kgNearest struct {
	pairs []kByDist // kDevs.kSmallest's scratch
	front []kByDist // the walk's frontier: devices seen, not yet taken
	seen  []int32   // every device seen (frontier and taken)
	out   []int32
	nb    []int32
}

// kNearest returns the k devices nearest (x, y), nearest first (ties by
// vertex index). The k nearest devices of a point are connected in the
// Delaunay graph (the sites in a closed disk are), so taking the nearest
// unvisited neighbour of the devices found so far k times finds them.
// The search for the nearest device starts at vertex hint (−1: anywhere;
// planar.Triangulation.Nearest's answer does not depend on it). The
// frontier and the seen set hold O(k·degree) devices, so they are plain
// slices scanned linearly: cheaper than a heap and a map at the small k
// asked for (and no allocation per query).
func (s *kgNearest) kNearest(l *Layout, x, y float64, k int, hint int32) []int32 {
	t := l.Tri
	s.out = s.out[:0]
	v := t.Nearest(x, y, hint)
	if v < 0 {
		return s.out
	}
	s.seen = append(s.seen[:0], v)
	vx, vy := l.site(v)
	s.front = append(s.front[:0], kByDist{(vx-x)*(vx-x) + (vy-y)*(vy-y), v})
	for len(s.out) < k && len(s.front) > 0 {
		bi := 0
		for i, c := range s.front[1:] {
			if b := s.front[bi]; c.d2 < b.d2 || c.d2 == b.d2 && c.v < b.v {
				bi = i + 1
			}
		}
		e := s.front[bi]
		s.front[bi] = s.front[len(s.front)-1]
		s.front = s.front[:len(s.front)-1]
		s.out = append(s.out, e.v)
		s.nb = t.Neighbors(e.v, s.nb)
		for _, u := range s.nb {
			if !slices.Contains(s.seen, u) {
				s.seen = append(s.seen, u)
				ux, uy := l.site(u)
				s.front = append(s.front, kByDist{(ux-x)*(ux-x) + (uy-y)*(uy-y), u})
			}
		}
	}
	return s.out
}
