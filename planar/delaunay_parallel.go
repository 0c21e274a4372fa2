// Two-worker insertion of the last BRIO rounds.
//
// After the first rounds are inserted sequentially, the coarse Delaunay
// triangulation covers the site area. The remaining points are split by an
// abscissa x0 into a left side (x < x0) and a right side; one worker inserts
// each side's points into the shared triangulation at the same time. A
// triangle is owned by a side when its three vertices belong to that side;
// a triangle with vertices on both sides is mixed and is never modified
// while the workers run. A worker reads and writes only triangles it owns,
// reads mixed triangles, and crosses an edge of a mixed triangle only when
// both endpoints are on its side. Since a neighbour of an owned triangle
// shares two of its vertices, it is owned by the same side or mixed, so the
// two workers never touch the same data (no locks, no races) and each one's
// results do not depend on the other's timing: the output is the same
// whether the workers run in parallel or one after the other.
//
// Each insertion is Bowyer–Watson (Bowyer 1981; Watson 1981): the cavity
// is the set of triangles whose circumcircle holds the new point strictly
// inside (InCircle > 0, exact), found by a search from the triangle
// containing the point; it is a topological disk, star-shaped from the
// point, and is replaced by the fan joining the point to its boundary
// edges. This yields the same triangulation as Lawson's flips. A point is
// deferred, and later inserted sequentially by the general method, when its
// walk or cavity reaches a triangle it does not own, when it lies outside
// the hull or on a hull edge, or when its cavity is unusually large. Each
// insertion uses exactly two new triangle slots from the worker's own range;
// ranges left partly unused are closed up afterwards by moving triangles.

package planar

// worker inserts the points of one side.
type worker struct {
	b        *builder
	left     bool
	n1, mid  int32                // ids >= n1 are left below mid, right from mid
	side1    []bool               // side of ids < n1: true for left
	nt, end  int32                // next free half-edge and end of the worker's range
	last     int32                // a half-edge of an owned triangle near the last insertion
	nc, nb   int                  // cavity triangles and boundary edges found
	cav      [maxCavity + 2]int32 // cavity triangles (first half-edges), then fan slots
	us, vs   [maxCavity + 2]int32 // boundary edges u→v
	outs     [maxCavity + 2]int32 // and the half-edges opposite them
	deferred []int32
}

// maxCavity bounds the cavity size handled by the workers (larger ones are
// deferred to the sequential pass).
const maxCavity = 64

// insertSplit inserts internal ids [lo, mid) (left side) and [mid, hi)
// (right side) with two workers and returns the deferred ids, left ones
// first.
func (b *builder) insertSplit(lo, mid, hi int32, x0 float64, isSeed func(int32) bool) []int32 {
	base := b.nt
	side1 := make([]bool, lo)
	for v := range side1 {
		side1[v] = b.ps[v].x < x0
	}
	wl := &worker{b: b, left: true, n1: lo, mid: mid, side1: side1, nt: base, end: base + 6*(mid-lo)}
	wr := &worker{b: b, left: false, n1: lo, mid: mid, side1: side1, nt: wl.end, end: wl.end + 6*(hi-mid)}
	for _, w := range []*worker{wl, wr} {
		w.last = -1
		for t := int32(0); t < base; t += 3 {
			if w.owned(t) {
				w.last = t
				break
			}
		}
	}
	runPair(func() { wl.run(lo, mid, isSeed) }, func() { wr.run(mid, hi, isSeed) })
	b.nt = wr.nt
	b.closeGap(wl.nt, wl.end)
	return append(wl.deferred, wr.deferred...)
}

// closeGap moves triangles from the end of the used range into the unused
// half-edge range [lo, hi).
func (b *builder) closeGap(lo, hi int32) {
	tri, half := b.tri, b.half
	d := lo
	for d < hi && b.nt > hi {
		s := b.nt - 3
		for k := int32(0); k < 3; k++ {
			tri[d+k] = tri[s+k]
			h := half[s+k]
			half[d+k] = h
			if h >= 0 {
				half[h] = d + k
			} else {
				b.hedge[tri[s+k]] = d + k
			}
		}
		b.nt -= 3
		d += 3
	}
	if b.nt <= hi {
		b.nt = d
	}
}

func (w *worker) run(lo, hi int32, isSeed func(int32) bool) {
	for k := lo; k < hi; k++ {
		if isSeed(k) {
			continue
		}
		if w.last < 0 || !w.insert(k) {
			w.deferred = append(w.deferred, k)
		}
	}
}

// own reports whether vertex v is on the worker's side (x < x0 for the
// left side), from its id.
func (w *worker) own(v int32) bool {
	if v >= w.n1 {
		return (v < w.mid) == w.left
	}
	return w.side1[v] == w.left
}

// owned reports whether the triangle of first half-edge t is the worker's.
func (w *worker) owned(t int32) bool {
	tri := w.b.tri
	return w.own(tri[t]) && w.own(tri[t+1]) && w.own(tri[t+2])
}

// locate walks from the last insertion to the owned triangle holding
// (x, y) and returns its first half-edge, or -1 when that triangle is not
// reachable through owned triangles (or the point is outside the hull).
// The walk moves only between owned triangles (the neighbours of an owned
// triangle may be read: they are owned or mixed); among the edges with the
// point strictly beyond, one leading to an owned triangle is taken, and
// any such choice keeps the walk acyclic on a Delaunay triangulation
// (Edelsbrunner 1990). After a failure the next walk starts from the last
// triangle reached.
func (w *worker) locate(x, y float64) int32 {
	tri, half, ps := w.b.tri, w.b.half, w.b.ps
	b := triStart(w.last)
	came := int32(-1)
	for steps := 0; steps < 1<<16; steps++ {
		e := b
		if came >= 0 {
			e = nextHE(came)
		}
		next, blocked := int32(-1), false
		for k := 0; k < 3; k++ {
			if e != came {
				if orientNegative(ps[tri[e]], ps[tri[nextHE(e)]], x, y) {
					// The neighbour shares e's endpoints (owned): it is
					// owned when its third vertex is.
					h := half[e]
					if h >= 0 && w.own(tri[prevHE(h)]) {
						next = h
						break
					}
					blocked = true
				}
			}
			e = nextHE(e)
		}
		if next < 0 {
			w.last = b
			if blocked {
				return -1
			}
			return b
		}
		came, b = next, triStart(next)
	}
	w.last = b
	return -1
}

// insert adds internal vertex i by Bowyer–Watson; false means deferred
// (nothing was changed).
func (w *worker) insert(i int32) bool {
	b := w.b
	tri, ps := b.tri, b.ps
	p := ps[i]
	t := w.locate(p.x, p.y)
	if t < 0 {
		return false
	}
	v0, v1, v2 := tri[t], tri[t+1], tri[t+2]
	for _, v := range [3]int32{v0, v1, v2} {
		if ps[v] == p {
			b.next[i] = dupMark
			b.prev[i] = v
			return true
		}
	}
	// Any other point of the closed triangle is strictly inside its
	// circumcircle: t starts the cavity. A cavity triangle is marked by
	// complementing its first vertex; boundary edges are recorded as
	// (u, v, opposite half-edge).
	w.nc, w.nb = 0, 0
	tri[t] = ^v0
	w.cav[0] = t
	w.nc = 1
	ok := true
	for j := 0; j < w.nc && ok; j++ {
		c := w.cav[j]
		c0, c1, c2 := ^tri[c], tri[c+1], tri[c+2]
		ok = w.edge(c, c0, c1, p) && w.edge(c+1, c1, c2, p) && w.edge(c+2, c2, c0, p)
	}
	nc, nb := w.nc, w.nb
	if !ok || nb != nc+2 || w.nt+6 > w.end {
		for _, c := range w.cav[:nc] {
			tri[c] = ^tri[c]
		}
		return false
	}

	// The fan: boundary edge u→v becomes triangle (u, v, i), in the cavity's
	// slots and two new ones.
	half := b.half
	w.cav[nc], w.cav[nc+1] = w.nt, w.nt+3
	w.nt += 6
	slots := w.cav[:nb]
	us, vs, outs := w.us[:nb], w.vs[:nb], w.outs[:nb]
	for j, s := range slots {
		tri[s], tri[s+1], tri[s+2] = us[j], vs[j], i
		o := outs[j]
		half[s] = o
		if o >= 0 {
			half[o] = s
		} else {
			b.hedge[us[j]] = s
		}
	}
	linkFan(half, slots, us, vs)
	w.last = slots[0]
	return true
}

// linkFan joins the fan of triangles around a new vertex i: the triangle
// in slots[j] is (us[j], vs[j], i), its edge v→i (slot+1) lies across
// the edge i→u (slot+2) of the triangle whose u is its v. The fan is
// small (at most maxCavity+2 triangles): a scan finds each neighbour.
func linkFan(half, slots, us, vs []int32) {
	for j, s := range slots {
		v := vs[j]
		for m, u := range us {
			if u == v {
				sm := slots[m]
				half[s+1] = sm + 2
				half[sm+2] = s + 1
				break
			}
		}
	}
}

// edge examines half-edge e = u→v of a cavity triangle: the triangle
// across it joins the cavity if p is strictly inside its circumcircle,
// otherwise e is a boundary edge. It returns false to abandon the
// insertion (a conflict with a triangle the worker does not own, a point on
// a hull edge, or a cavity too large).
func (w *worker) edge(e, u, v int32, p xyPt) bool {
	tri, ps := w.b.tri, w.b.ps
	h := w.b.half[e]
	if h >= 0 {
		nb := triStart(h)
		a0 := tri[nb]
		if a0 < 0 {
			return true // shared with another cavity triangle
		}
		a1, a2 := tri[nb+1], tri[nb+2]
		if inCircleFiltered(ps[a0], ps[a1], ps[a2], p.x, p.y) {
			if !w.own(tri[prevHE(h)]) || w.nc == maxCavity { // the apex (u, v are owned)
				return false
			}
			tri[nb] = ^a0
			w.cav[w.nc] = nb
			w.nc++
			return true
		}
	} else if w.b.orient(u, v, p.x, p.y) == 0 {
		return false // on a hull edge
	}
	if w.nb == maxCavity+2 {
		return false
	}
	w.us[w.nb], w.vs[w.nb], w.outs[w.nb] = u, v, h
	w.nb++
	return true
}
