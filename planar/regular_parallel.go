// Two-worker insertion of the last BRIO rounds of the regular
// triangulation, in the scheme of delaunay_parallel.go.
//
// After the first rounds are inserted sequentially (regular.go), the
// remaining points are split by an abscissa x0 into a left side (x < x0)
// and a right side, and one worker inserts each side's points into the
// shared arrays at the same time. A triangle is owned by a side when its
// three vertices belong to that side (the infinite vertex belongs to
// neither); a triangle with vertices on both sides, or an infinite one, is
// never modified while the workers run. A worker reads and writes only
// triangles it owns and reads the triangles next to them (owned or mixed:
// they share two of its vertices), so the two workers never touch the same
// data and each one's results do not depend on the other's timing: the
// output is the same whether they run in parallel or one after the other.
//
// Each insertion is Bowyer–Watson in the lifted view (Edelsbrunner & Shah
// 1996, section 2): the conflict region of a new weighted point p is the
// set of triangles whose lifted plane passes above p's lift (PowerTest > 0
// under the symbolic perturbation, powerConflict, exactly as in the flips
// of regular.go); these are the lower-hull faces visible from p's lift, a
// topological disk holding p that is found by a search over adjacency from
// the triangle containing p. If p is not in conflict with that triangle it
// is hidden. Otherwise the region is replaced by the fan joining p to its
// boundary edges (the new lower hull), and the vertices strictly inside
// the region become hidden: with k of them the fan has two triangles more
// than the region, less 2k. Since the perturbed regular triangulation is
// unique, this gives the same triangles as the flips.
//
// A point is located by a walk from the previous insertion through owned
// triangles; when that is blocked by a triangle the worker does not own
// (the owned area is jagged along x0), a second walk starts from the
// triangle last made in the point's cell of a coarse grid. A point is
// deferred when both walks or its conflict region reach a triangle it
// does not own (including the infinite ones: points outside the hull),
// when it lies on an edge or a vertex of the triangle holding it, or when
// its region is unusually large. The deferred points lie mostly in the
// band of mixed triangles along x0: a second pass gives them to the same
// two workers split at their median ordinate y0, and what that pass
// defers is inserted sequentially by regular.go's method. A worker takes
// triangle slots from the ones its insertions freed, then from its own
// range; slots left unused are marked free for finish, which skips them.

package planar

import (
	"math"
	"slices"
)

// rworker inserts the points of one side into a regular triangulation.
type rworker struct {
	b        *rbuilder
	left     bool // left side, or bottom side when byY
	byY      bool // second pass: sides split at ordinate y0
	y0       float64
	n1, mid  int32   // ids >= n1 are left below mid, right from mid
	side1    []bool  // side of ids < n1: true for left
	nt, end  int32   // next unused half-edge and the far end of the worker's range
	down     bool    // the range is used from its top down (right worker)
	free     []int32 // slots freed by this worker's insertions
	last     int32   // a half-edge of an owned triangle near the last insertion
	rng      uint64
	nc, nb   int
	cav      [maxCavity + 2]int32 // conflict triangles (first half-edges), then fan slots
	us, vs   [maxCavity + 2]int32 // boundary edges u→v
	outs     [maxCavity + 2]int32 // and the half-edges opposite them
	gone     [maxCavity + 2]int32 // vertices strictly inside the region
	deferred []int32
	// A coarse grid over the bounding box holds, per cell, a triangle
	// made by the last insertion of a point in it (-1: none): a second
	// start for walks blocked on the way.
	grid       []int32
	gside      int
	gx, gy, gs float64 // origin and cells per unit
}

// initGrid sets up the start grid for about n points of the box.
func (w *rworker) initGrid(box bbox, n int) {
	side := max(box.maxX-box.minX, box.maxY-box.minY)
	g := 1
	for g < 1024 && 8*g*g < n {
		g *= 2
	}
	if !(side > 0 && side <= 1e300) {
		g = 1
	}
	w.gside, w.gx, w.gy = g, box.minX, box.minY
	if g > 1 {
		w.gs = float64(g) / side
	}
	w.grid = make([]int32, g*g)
	for k := range w.grid {
		w.grid[k] = -1
	}
}

// cell returns the grid cell of (x, y).
func (w *rworker) cell(x, y float64) int {
	cx := int((x - w.gx) * w.gs)
	cy := int((y - w.gy) * w.gs)
	g := w.gside
	return min(max(cy, 0), g-1)*g + min(max(cx, 0), g-1)
}

// insertSplit inserts internal ids [lo, mid) (left side, x < x0) and
// [mid, hi) (right side) with two workers and returns the deferred ids.
// When many are deferred (they lie mostly in the band of mixed triangles
// along x0), a second pass inserts them with the same two workers split at
// their median ordinate y0 instead (bottom, y < y0, and top), each in the
// triangles whose three vertices are on its side of y0.
func (b *rbuilder) insertSplit(lo, mid, hi int32, box bbox, x0 float64, isSeed func(int32) bool) []int32 {
	base := b.nt
	end := base + 6*(hi-lo) // two new slots per insertion at most
	if int(end) > cap(b.tri) {
		b.tri = append(b.tri[:cap(b.tri)], make([]int32, int(end)-cap(b.tri))...)
		b.half = append(b.half[:cap(b.half)], make([]int32, int(end)-cap(b.half))...)
	}
	b.tri, b.half = b.tri[:end], b.half[:end]
	side1 := make([]bool, lo)
	for v := range side1 {
		side1[v] = b.ps[v].x < x0
	}
	// The left worker uses its range from the bottom up, the right one
	// from the top down: the slots left unused form one gap between
	// them, which is never touched (nor its memory faulted in).
	wl := &rworker{b: b, left: true, n1: lo, mid: mid, side1: side1, nt: base, end: base + 6*(mid-lo), rng: 0x9e3779b97f4a7c15}
	wr := &rworker{b: b, left: false, n1: lo, mid: mid, side1: side1, nt: end, end: wl.end, down: true, rng: 0xd1b54a32d192ed03}
	b.gapLo, b.gapHi = wl.nt, wr.nt
	for _, w := range []*rworker{wl, wr} {
		w.initGrid(box, int(hi-lo))
		w.start(base)
	}
	runPair(func() { wl.run(lo, mid, isSeed) }, func() { wr.run(mid, hi, isSeed) })
	b.gapLo, b.gapHi = wl.nt, wr.nt
	deferred := append(wl.deferred, wr.deferred...)
	if len(deferred) >= splitAgain {
		ys := make([]float64, len(deferred))
		for k, i := range deferred {
			ys[k] = b.ps[i].y
		}
		slices.Sort(ys)
		y0 := ys[len(ys)/2]
		var bottom, top []int32
		for _, i := range b.hilbertOrder(deferred, box) {
			if b.ps[i].y < y0 {
				bottom = append(bottom, i)
			} else {
				top = append(top, i)
			}
		}
		// Each worker keeps its slots: the rest of its range and its
		// free list.
		for _, w := range []*rworker{wl, wr} {
			w.byY, w.y0, w.deferred = true, y0, nil
			for k := range w.grid {
				w.grid[k] = -1
			}
			w.start(end)
		}
		runPair(func() { wl.runList(bottom) }, func() { wr.runList(top) })
		deferred = b.hilbertOrder(append(wl.deferred, wr.deferred...), box)
		b.gapLo, b.gapHi = wl.nt, wr.nt
	}
	// The sequential insertion of the deferred points takes at most two
	// slots each (regular.go): that many, from the bottom of the gap, go
	// to its free list with the workers' freed slots; finish skips the
	// rest of the gap.
	want := 2*len(deferred) + 2
	for len(b.free) < want && b.gapLo < b.gapHi {
		s := b.gapLo
		b.tri[s], b.tri[s+1], b.tri[s+2] = -1, -1, -1
		b.free = append(b.free, s)
		b.gapLo += 3
	}
	for _, w := range []*rworker{wl, wr} {
		b.free = append(b.free, w.free...)
	}
	b.nt = end
	// A live finite triangle to start the next walk from.
	switch {
	case wl.last >= 0:
		b.last = triStart(wl.last)
	case wr.last >= 0:
		b.last = triStart(wr.last)
	default:
		for t := int32(0); t < end; t += 3 {
			if t == b.gapLo && b.gapHi > t {
				t = b.gapHi - 3
				continue
			}
			if b.tri[t] >= 0 && !b.isInfinite(t) {
				b.last = t
				break
			}
		}
	}
	return deferred
}

// hilbertOrder sorts ids along a Hilbert curve of order 16 over the box
// (ties by id), so that walks between consecutive points are short: the
// deferred points come from all rounds, and in round order each round
// sweeps the band again.
func (b *rbuilder) hilbertOrder(ids []int32, box bbox) []int32 {
	side := max(box.maxX-box.minX, box.maxY-box.minY)
	if !(side > 0 && side <= math.MaxFloat64) {
		return ids
	}
	scale := 65536 / side
	q := func(v float64) uint32 { return uint32(min(max(v*scale, 0), 65535)) }
	keys := make([]uint64, len(ids))
	for k, i := range ids {
		p := b.ps[i]
		keys[k] = uint64(hilbert16(q(p.x-box.minX), q(p.y-box.minY)))<<32 | uint64(uint32(i))
	}
	slices.Sort(keys)
	for k, key := range keys {
		ids[k] = int32(uint32(key))
	}
	return ids
}

// splitAgain is the number of points deferred by the first pass from
// which insertSplit makes the second.
const splitAgain = 64

// start sets the walk start to the first live owned triangle below
// half-edge end (-1: none), outside the gap of unused slots.
func (w *rworker) start(end int32) {
	w.last = -1
	for t := int32(0); t < end; t += 3 {
		if t == w.b.gapLo && w.b.gapHi > t {
			t = w.b.gapHi - 3
			continue
		}
		if w.b.tri[t] >= 0 && w.owned(t) {
			w.last = t
			return
		}
	}
}

// runList inserts the ids listed, deferring those it cannot.
func (w *rworker) runList(ids []int32) {
	for _, k := range ids {
		w.try(k)
	}
}

// run inserts ids [lo, hi) but the seed ones, deferring those it cannot.
func (w *rworker) run(lo, hi int32, isSeed func(int32) bool) {
	for k := lo; k < hi; k++ {
		if !isSeed(k) {
			w.try(k)
		}
	}
}

// try inserts id k, or defers it to the sequential pass.
func (w *rworker) try(k int32) {
	if w.last < 0 || !w.insert(k) {
		w.deferred = append(w.deferred, k)
	}
}

// own reports whether vertex v is on the worker's side: in the first
// pass x < x0 for the left side, from its id, in the second y < y0 for
// the bottom side; the infinite vertex is on neither.
func (w *rworker) own(v int32) bool {
	if w.byY {
		return v != w.b.inf && (w.b.ps[v].y < w.y0) == w.left
	}
	if v >= w.n1 {
		return v != w.b.inf && (v < w.mid) == w.left
	}
	return w.side1[v] == w.left
}

// owned reports whether the live triangle of first half-edge t is the
// worker's.
func (w *rworker) owned(t int32) bool {
	tri := w.b.tri
	return w.own(tri[t]) && w.own(tri[t+1]) && w.own(tri[t+2])
}

// Walk outcomes of locate.
const (
	walkFound   = iota // strictly inside an owned triangle
	walkBlocked        // the way leads through a triangle not owned
	walkFailed         // on an edge or a vertex, or too many steps
)

// locate walks from the triangle of half-edge start to the owned triangle
// holding (x, y) strictly inside and returns its first half-edge and
// walkFound, or the last triangle reached and why it stopped. The walk is
// the stochastic visibility walk of regular.go restricted to owned
// triangles: among the edges with the point strictly beyond, taken in
// random order, it crosses the first that leads to an owned triangle.
func (w *rworker) locate(start int32, x, y float64) (int32, int) {
	tri, half, ps := w.b.tri, w.b.half, w.b.ps
	t := triStart(start)
	came := int32(-1)
	for steps := 0; steps < 1<<16; steps++ {
		w.rng ^= w.rng << 13
		w.rng ^= w.rng >> 7
		w.rng ^= w.rng << 17
		r := int32(w.rng % 3)
		next, blocked, zero := int32(-1), false, false
		for k := int32(0); k < 3; k++ {
			e := t + (r+k)%3
			if e == came {
				continue
			}
			a, c := ps[tri[e]], ps[tri[nextHE(e)]]
			s := orientSign(xyPt{a.x, a.y}, xyPt{c.x, c.y}, x, y)
			if s < 0 {
				// The neighbour shares e's endpoints (owned): it is
				// owned when its third vertex is.
				h := half[e]
				if w.own(tri[prevHE(h)]) {
					next = h
					break
				}
				blocked = true
			} else if s == 0 {
				zero = true
			}
		}
		switch {
		case next >= 0:
			came, t = next, triStart(next)
			continue
		case blocked:
			return t, walkBlocked
		case zero:
			return t, walkFailed
		}
		return t, walkFound
	}
	return t, walkFailed
}

// find locates (x, y) for insert: a walk from the last insertion, and when
// it is blocked a second one from the grid cell of (x, y). It returns the
// first half-edge of the owned triangle holding the point strictly
// inside, or -1. The next walk starts from the last triangle reached.
func (w *rworker) find(x, y float64) int32 {
	t, how := w.locate(w.last, x, y)
	if how == walkBlocked {
		if s := w.grid[w.cell(x, y)]; s >= 0 && w.b.tri[s] >= 0 && s != t {
			// A slot the worker filled is owned while live.
			t, how = w.locate(s, x, y)
		}
	}
	w.last = t
	if how != walkFound {
		return -1
	}
	return t
}

// insert adds internal point i by Bowyer–Watson, or marks it hidden; false
// means deferred (nothing was changed).
func (w *rworker) insert(i int32) bool {
	b := w.b
	tri, half, ps := b.tri, b.half, b.ps
	p := ps[i]
	t := w.find(p.x, p.y)
	if t < 0 {
		return false
	}
	v0 := tri[t]
	if !powerConflict(ps[v0], ps[tri[t+1]], ps[tri[t+2]], p) {
		b.hidden[i] = true
		return true
	}
	// The conflict region, from t. A region triangle is marked by
	// complementing its first vertex; boundary edges are recorded as
	// (u, v, opposite half-edge).
	// The triangle across a boundary edge of an owned triangle shares its
	// endpoints: it is owned when its third vertex is. An infinite
	// triangle is never in conflict: p is strictly inside an owned
	// triangle, so strictly inside the hull.
	tri[t] = ^v0
	cav, us, vs, outs := &w.cav, &w.us, &w.vs, &w.outs
	cav[0] = t
	nc, nb := 1, 0
	ok := true
search:
	for j := 0; j < nc; j++ {
		c := cav[j]
		for e := c; e < c+3; e++ {
			h := half[e]
			o := triStart(h)
			a0 := tri[o]
			if a0 < 0 {
				continue // shared with another region triangle
			}
			if apex := tri[prevHE(h)]; apex != b.inf && powerConflict(ps[a0], ps[tri[o+1]], ps[tri[o+2]], p) {
				if !w.own(apex) || nc == maxCavity {
					ok = false
					break search
				}
				tri[o] = ^a0
				cav[nc] = o
				nc++
				continue
			}
			if nb == maxCavity+2 {
				ok = false
				break search
			}
			// e = u→v; the first vertex of c is marked.
			u, v := tri[e], tri[nextHE(e)]
			if e == c {
				u = ^u
			} else if e == c+2 {
				v = ^v
			}
			us[nb], vs[nb], outs[nb] = u, v, h
			nb++
		}
	}
	w.nc, w.nb = nc, nb
	gone := 0
	if ok {
		// The region is a disk: nb = nc + 2 − 2k with k vertices inside.
		d := nc + 2 - nb
		need := max(nb-nc-len(w.free), 0)
		room := w.end - w.nt
		if w.down {
			room = -room
		}
		ok = d >= 0 && d%2 == 0 && 3*int32(need) <= room
		if ok && d > 0 {
			// The inner vertices are marked hidden.
			gone = w.inner()
			if ok = 2*gone == d; !ok && gone > 0 {
				for _, v := range w.gone[:gone] {
					b.hidden[v] = false
				}
			}
		}
	}
	if !ok {
		for _, c := range w.cav[:nc] {
			tri[c] = ^tri[c]
		}
		return false
	}
	// The fan: boundary edge u→v becomes triangle (u, v, i), in the
	// region's slots, then freed ones, then new ones; region slots left
	// over are freed.
	for j := nc; j < nb; j++ {
		if k := len(w.free); k > 0 {
			w.cav[j] = w.free[k-1]
			w.free = w.free[:k-1]
		} else {
			if w.down {
				w.nt -= 3
				w.cav[j] = w.nt
			} else {
				w.cav[j] = w.nt
				w.nt += 3
			}
		}
	}
	for j := nb; j < nc; j++ {
		s := w.cav[j]
		tri[s], tri[s+1], tri[s+2] = -1, -1, -1
		w.free = append(w.free, s)
	}
	slots := w.cav[:nb]
	for j, s := range slots {
		tri[s], tri[s+1], tri[s+2] = us[j], vs[j], i
		o := outs[j]
		half[s] = o
		half[o] = s
	}
	linkFan(half, slots, us[:nb], vs[:nb])
	w.last = slots[0]
	w.grid[w.cell(p.x, p.y)] = slots[0]
	return true
}

// inner lists in w.gone the vertices of the marked region that are not on
// its boundary, marks them hidden and returns their number, or -1 (none
// marked) when there are more than w.gone holds. The boundary vertices are marked meanwhile in b.hidden:
// they are the worker's own vertices, whose entries no other goroutine
// reads or writes while the workers run.
func (w *rworker) inner() int {
	tri, hidden := w.b.tri, w.b.hidden
	us := w.us[:w.nb]
	for _, u := range us {
		hidden[u] = true
	}
	k := 0
	for _, c := range w.cav[:w.nc] {
		for _, v := range [3]int32{^tri[c], tri[c+1], tri[c+2]} {
			if hidden[v] {
				continue
			}
			if k == len(w.gone) {
				k = -1
				break
			}
			hidden[v] = true
			w.gone[k] = v
			k++
		}
		if k < 0 {
			break
		}
	}
	for _, u := range us {
		hidden[u] = false
	}
	if k < 0 {
		for _, v := range w.gone {
			hidden[v] = false
		}
	}
	return k
}
