// Polygon overlay, step 3: selecting the result's faces and tracing its
// rings.
//
// A face belongs to the result when its winding numbers satisfy the
// operation (union: wA ≥ 1; intersection: wA ≥ 1 and wB ≥ 1; difference:
// wA ≥ 1 and wB = 0). The result's boundary is the set of half-edges with
// a result face on the left and a non-result face on the right. Rings are
// traced along them with the face rule (arriving at a vertex, leave by the
// first boundary half-edge clockwise after the reverse of the arriving
// one), so every ring has the result on its left: exteriors come out
// counter-clockwise and holes clockwise, and where the boundary passes a
// vertex more than once (a pinch point) each passage keeps to its own
// sector of the result. Rings are grouped into polygons by the connected
// parts of the result (faces joined across edges interior to the result,
// and face cycles of one face joined through the ray links); in each part
// the ring through the part's smallest vertex is the exterior (the
// lexicographically smallest point of a bounded set lies on its outer
// boundary, and a hole touching the exterior there is, by the face rule,
// part of the same ring).

package planar

import "math"

// Overlay operations.
const (
	booleanUnion = iota
	booleanIntersection
	booleanDifference
)

// booleanSelect returns, for each face cycle, whether it is in the result
// of operation op over the given operands (0: wA, 1: wB).
func (gr *booleanGraph) booleanSelect(op int) []bool {
	in := make([]bool, gr.nFace)
	for f, w := range gr.wind {
		a, b := w[0] >= 1, w[1] >= 1
		switch op {
		case booleanUnion:
			in[f] = a
		case booleanIntersection:
			in[f] = a && b
		case booleanDifference:
			in[f] = a && !b
		}
	}
	return in
}

// pieces returns a union-find forest over face cycles joining the result
// faces that form one connected part of the result.
func (gr *booleanGraph) pieces(in []bool) []int32 {
	parent := make([]int32, gr.nFace)
	for f := range parent {
		parent[f] = int32(f)
	}
	for m := range gr.eLo {
		f, g := gr.face[2*m], gr.face[2*m+1]
		if in[f] && in[g] {
			booleanUnite(parent, f, g)
		}
	}
	for f, h := range gr.holder {
		if h >= 0 && in[f] {
			booleanUnite(parent, int32(f), h)
		}
	}
	return parent
}

// countPieces returns the number of connected parts of the result.
func (gr *booleanGraph) countPieces(in []bool) int {
	parent := gr.pieces(in)
	n := 0
	for f := range parent {
		if in[f] && booleanFind(parent, int32(f)) == int32(f) {
			n++
		}
	}
	return n
}

// booleanRings is an overlay result: rings as interleaved coordinates with
// the arrangement vertex of each ring vertex; polygon p has rings
// polyStart[p] (its exterior) to polyStart[p+1]−1 (its holes).
type booleanRings struct {
	xy        []float64
	vid       []int32
	ringStart []int32
	polyStart []int32
	pinch     []bool // per arrangement vertex: the boundary passes it more than once

	// Scratch of mergeNearVertices (sliverLoop): per arrangement vertex
	// its last position on the merging stack, and a loop's coordinates.
	lastAt []int32
	loopXY []float64
}

// extract traces the boundary of the result faces in into rings grouped
// into polygons.
func (gr *booleanGraph) extract(in []bool) *booleanRings {
	nh := int32(len(gr.out))
	boundary := func(h int32) bool { return in[gr.face[h]] && !in[gr.face[h^1]] }
	nv := len(gr.vx) / 2
	bdeg := make([]int32, nv)
	for h := int32(0); h < nh; h++ {
		if boundary(h) {
			bdeg[gr.origin(h)]++
		}
	}
	parent := gr.pieces(in)
	type ringInfo struct{ piece, minV, start, end int32 }
	var rings []ringInfo
	var xy []float64
	var vid []int32
	seen := make([]bool, nh)
	for h0 := int32(0); h0 < nh; h0++ {
		if seen[h0] || !boundary(h0) {
			continue
		}
		ri := ringInfo{piece: booleanFind(parent, gr.face[h0]), minV: int32(nv), start: int32(len(vid))}
		for h := h0; !seen[h]; h = gr.nextBoundary(h, in) {
			seen[h] = true
			v := gr.origin(h)
			xy = append(xy, gr.vx[2*v], gr.vx[2*v+1])
			vid = append(vid, v)
			ri.minV = min(ri.minV, v)
		}
		ri.end = int32(len(vid))
		rings = append(rings, ri)
	}
	// Group by piece, exterior (smallest minV) first.
	exterior := make(map[int32]int, len(rings))
	for i, r := range rings {
		if j, ok := exterior[r.piece]; !ok || r.minV < rings[j].minV {
			exterior[r.piece] = i
		}
	}
	out := &booleanRings{ringStart: []int32{0}, polyStart: []int32{0}, pinch: make([]bool, nv)}
	for v, d := range bdeg {
		out.pinch[v] = d > 1
	}
	holes := make(map[int32][]int, len(exterior))
	var order []int32
	for i, r := range rings {
		if exterior[r.piece] == i {
			order = append(order, r.piece)
		} else {
			holes[r.piece] = append(holes[r.piece], i)
		}
	}
	emit := func(i int) {
		r := rings[i]
		out.xy = append(out.xy, xy[2*r.start:2*r.end]...)
		out.vid = append(out.vid, vid[r.start:r.end]...)
		out.ringStart = append(out.ringStart, int32(len(out.vid)))
	}
	for _, p := range order {
		emit(exterior[p])
		for _, i := range holes[p] {
			emit(i)
		}
		out.polyStart = append(out.polyStart, int32(len(out.ringStart)-1))
	}
	return out
}

// nextBoundary returns the boundary half-edge that follows boundary
// half-edge h: the first one clockwise after h's twin around h's end.
func (gr *booleanGraph) nextBoundary(h int32, in []bool) int32 {
	t := h ^ 1
	v := gr.origin(t)
	s, n := gr.outStart[v], gr.outStart[v+1]-gr.outStart[v]
	i := gr.pos[t]
	for k := int32(1); k < n; k++ {
		g := gr.out[s+(i-k+n)%n]
		if in[gr.face[g]] && !in[gr.face[g^1]] {
			return g
		}
	}
	return t // unreachable: the sector after h is in the result
}

// dropStraight removes ring vertices at which the ring runs straight on
// (the previous kept vertex, the vertex and the next one are collinear, by
// Orient2D): noding leaves such vertices where merged parcels' corners or
// split points met a straight boundary. Called after openPinches, when no
// ring touches another, so the point set of every ring and with it the
// validity are unchanged. Rings keep at least 3 vertices.
func (r *booleanRings) dropStraight() {
	out := r.xy[:0]
	vid := r.vid[:0]
	rs := make([]int32, 1, len(r.ringStart))
	for k := 0; k+1 < len(r.ringStart); k++ {
		s, e := int(r.ringStart[k]), int(r.ringStart[k+1])
		n := e - s
		keep := make([]bool, n)
		for i := range keep {
			keep[i] = true
		}
		kept := n
		// prev is the last kept vertex before i (cyclically).
		prev := n - 1
		for i := 0; i < n && kept > 3; i++ {
			nx := (i + 1) % n
			for !keep[nx] {
				nx = (nx + 1) % n
			}
			a, b, c := s+prev, s+i, s+nx
			if Orient2D(r.xy[2*a], r.xy[2*a+1], r.xy[2*b], r.xy[2*b+1], r.xy[2*c], r.xy[2*c+1]) == 0 {
				keep[i] = false
				kept--
				continue
			}
			prev = i
		}
		for i := 0; i < n; i++ {
			if keep[i] {
				out = append(out, r.xy[2*(s+i)], r.xy[2*(s+i)+1])
				vid = append(vid, r.vid[s+i])
			}
		}
		rs = append(rs, int32(len(vid)))
	}
	r.xy, r.vid, r.ringStart = out, vid, rs
}

// dropSlivers first merges ring vertices an ulp or two apart
// (mergeNearVertices), then removes the rings whose mean width is below booleanPinchSep
// ulps: |area| ≤ booleanPinchSep·ulp·perimeter, ulp = 2⁻⁵² times the
// largest coordinate magnitude of the ring. Such a ring is an artefact of
// rounded crossing points (where the exact result has zero width, two
// rounded crossings a few ulps apart enclose a sliver); it cannot be
// separated from its neighbours by pinch opening, whose pull-back is capped
// by the sliver's own edges. Dropping an exterior drops its polygon;
// dropping a hole fills it. The area changes by at most booleanPinchSep·ulp
// times the sliver's perimeter. The pinch flags are then recounted over the
// rings that remain. It reports how many rings it dropped.
func (r *booleanRings) dropSlivers() int {
	sliver := func(k int) bool {
		s, e := int(r.ringStart[k]), int(r.ringStart[k+1])
		return booleanSliver(r.xy[2*s : 2*e])
	}
	merged := r.mergeNearVertices()
	out := &booleanRings{ringStart: []int32{0}, polyStart: []int32{0}, pinch: make([]bool, len(r.pinch))}
	dropped := 0
	for p := 0; p+1 < len(r.polyStart); p++ {
		k0, k1 := int(r.polyStart[p]), int(r.polyStart[p+1])
		if sliver(k0) {
			dropped += k1 - k0
			continue
		}
		for k := k0; k < k1; k++ {
			if k > k0 && sliver(k) {
				dropped++
				continue
			}
			s, e := r.ringStart[k], r.ringStart[k+1]
			out.xy = append(out.xy, r.xy[2*s:2*e]...)
			out.vid = append(out.vid, r.vid[s:e]...)
			out.ringStart = append(out.ringStart, int32(len(out.vid)))
		}
		out.polyStart = append(out.polyStart, int32(len(out.ringStart)-1))
	}
	if dropped == 0 && merged == 0 {
		return 0
	}
	seen := make([]int32, len(r.pinch))
	for _, v := range out.vid {
		seen[v]++
	}
	for v, c := range seen {
		out.pinch[v] = c > 1
	}
	*r = *out
	return dropped
}

// booleanSliver reports whether the ring xy (flat, unclosed) is a sliver
// in the sense of dropSlivers: fewer than 3 vertices, or a mean width
// below booleanPinchSep ulps (|area| ≤ booleanPinchSep·ulp·perimeter, ulp
// = 2⁻⁵² times the largest coordinate magnitude of the ring).
func booleanSliver(xy []float64) bool { return booleanSliverAt(xy, 0) }

// booleanSliverAt is booleanSliver with the ulp taken at the larger of
// scale and the ring's largest coordinate magnitude. Noding snaps a
// crossing point to an endpoint within booleanSnapRel (64 ulps) of the
// larger coordinates of the two edges (boolean_node.go), so a face bounded
// by pieces of long edges far from the origin can be folded by up to 64
// ulps of those edges' coordinates, not of its own vertices': checkNesting
// passes the largest coordinate of the noded rings as scale.
func booleanSliverAt(xy []float64, scale float64) bool {
	n := len(xy) / 2
	if n < 3 {
		return true
	}
	per, m := 0.0, scale
	for i := 0; i < n; i++ {
		j := (i + 1) % n
		per += math.Hypot(xy[2*j]-xy[2*i], xy[2*j+1]-xy[2*i+1])
		m = math.Max(m, math.Max(math.Abs(xy[2*i]), math.Abs(xy[2*i+1])))
	}
	ulp := m * 0x1p-52
	return math.Abs(RingArea(xy)) <= booleanPinchSep*ulp*per
}

// booleanNearUlps is the distance, in ulps of the coordinates, within which
// consecutive ring vertices are taken as one point by mergeNearVertices.
const booleanNearUlps = 4

// mergeNearVertices makes each run of consecutive ring vertices lying
// within booleanNearUlps ulps (in x and in y) of the run's kept vertex one
// point, in place, keeping a pinch vertex when the run has one. Rounded
// crossing points of different edge pairs at one true point can land an
// ulp or two apart; the edges between them are too short for pinch opening
// to pull a passage back from the other, so they are made one point first.
// A dropped vertex lies within booleanNearUlps ulps of the kept vertex at
// the time it is dropped, and within a pass the kept vertex changes at
// most once (to a pinch vertex, which is never replaced), so each dropped
// vertex is within 2·booleanNearUlps ulps of the vertex replacing it.
//
// Merging can leave a ring passing a point twice in a row (a loop of
// ulp-close vertices collapsed, as where the traced boundary ran
// v → a → b → v with a and b an ulp from v) or doubling back (x → y → x).
// Both are removed too (booleanMergePass), so no ring edge has zero length
// (pinch opening divides by edge lengths); a ring left with fewer than 3
// vertices has no area and is dropped by dropSlivers. So is, more
// generally, a loop v → … → v of a ring (between two passes of a pinch
// vertex v) that is a sliver (booleanSliver): where two long thin
// polygons overlap along a line, their rounded crossings zigzag within
// ulps of it and the boundary closes loops a few ulps wide, whose passages
// through v leave sectors too thin for pinch opening to pull apart. The
// area changes by the loop's, at most booleanPinchSep ulps times its
// perimeter (the bound of dropSlivers). It returns the number of vertices
// dropped; the pinch flags are recounted by the caller.
func (r *booleanRings) mergeNearVertices() int {
	r.lastAt = make([]int32, len(r.pinch))
	xy, vid := r.xy[:0], r.vid[:0]
	rs := make([]int32, 1, len(r.ringStart))
	dropped := 0
	var cur, nxt []int32
	for k := 0; k+1 < len(r.ringStart); k++ {
		s, e := r.ringStart[k], r.ringStart[k+1]
		cur = cur[:0]
		for i := s; i < e; i++ {
			cur = append(cur, i)
		}
		// A pass does not look across its seam (last → first), so the
		// list is turned half-way round after each pass, putting the
		// seam inside the next one; done when a pass after the first
		// changes nothing (every pass that changes something drops a
		// vertex, so this ends; normally after two passes).
		for pass := 0; ; pass++ {
			nxt = r.booleanMergePass(nxt[:0], cur)
			changed := len(nxt) != len(cur)
			h := len(nxt) / 2
			cur = append(append(cur[:0], nxt[h:]...), nxt[:h]...)
			if (pass > 0 && !changed) || len(cur) < 3 {
				break
			}
		}
		// Back to the ring's own starting vertex (positions increase
		// along the ring from it).
		first := 0
		for j, i := range cur {
			if i < cur[first] {
				first = j
			}
		}
		dropped += int(e-s) - len(cur)
		for _, i := range append(cur[first:], cur[:first]...) {
			xy = append(xy, r.xy[2*i], r.xy[2*i+1])
			vid = append(vid, r.vid[i])
		}
		rs = append(rs, int32(len(vid)))
	}
	r.xy, r.vid, r.ringStart = xy, vid, rs
	return dropped
}

// booleanMergePass appends to st the ring positions of ring (in order)
// that one merging pass of mergeNearVertices keeps: each vertex close to
// the last kept one merged into it, then repeated vertices, spikes
// (x → y → x, by arrangement vertex) and sliver loops (sliverLoop) popped.
// Each position is pushed once and popped at most once; the sliver test
// of a loop that stays reads it once more per pass (loops are rare: pinch
// points). The pair (last, first) is not looked at.
func (r *booleanRings) booleanMergePass(st, ring []int32) []int32 {
	same := func(i, j int32) bool { return r.vid[i] == r.vid[j] }
	for _, i := range ring {
		n := len(st)
		switch {
		case n == 0 || !r.near(st[n-1], i):
			st = append(st, i)
		case r.pinch[r.vid[i]] && !r.pinch[r.vid[st[n-1]]]:
			st[n-1] = i
		}
		st = r.sliverLoop(st)
		for {
			n = len(st)
			if n >= 2 && same(st[n-2], st[n-1]) {
				st = st[:n-1]
			} else if n >= 3 && same(st[n-3], st[n-1]) {
				st = st[:n-2]
			} else {
				break
			}
		}
	}
	return st
}

// sliverLoop pops, when the last position of st passes a pinch vertex v
// that st passed before (at position k, as lastAt records), the loop
// st[k:] back to v if it is a sliver (booleanSliver). It records the last
// position of each pinch vertex pushed in lastAt (per arrangement vertex;
// an entry not naming a position of st with that vertex is stale).
func (r *booleanRings) sliverLoop(st []int32) []int32 {
	n := len(st)
	if n == 0 || !r.pinch[r.vid[st[n-1]]] {
		return st
	}
	w := r.vid[st[n-1]]
	k := int(r.lastAt[w])
	if k < n-1 && r.vid[st[k]] == w {
		r.loopXY = r.loopXY[:0]
		for _, j := range st[k : n-1] {
			r.loopXY = append(r.loopXY, r.xy[2*j], r.xy[2*j+1])
		}
		if booleanSliver(r.loopXY) {
			return st[:k+1]
		}
	}
	r.lastAt[w] = int32(n - 1)
	return st
}

// near reports whether ring positions i and j are within booleanNearUlps
// ulps of each other in x and in y.
func (r *booleanRings) near(i, j int32) bool {
	xi, yi, xj, yj := r.xy[2*i], r.xy[2*i+1], r.xy[2*j], r.xy[2*j+1]
	tol := booleanNearUlps * 0x1p-52 * math.Max(math.Max(math.Abs(xi), math.Abs(yi)), math.Max(math.Abs(xj), math.Abs(yj)))
	return math.Abs(xi-xj) <= tol && math.Abs(yi-yj) <= tol
}
