// ClipCells, tracing the rings of one clipped cell from its chains.
//
// traceRings sorts the entry and exit events counter-clockwise along the
// cell's boundary (by cell edge, then position along the bisector, then
// the δ-derivatives of the perturbation) and pairs each exit with the next
// unused entry; a ring is traced chain, boundary stretch with the cell's
// corners, chain, … until it closes. finishRing removes zero-length edges
// (points within clipSameRel relative of each other) and points between
// two edges on one bisector; splitPinched splits a ring that passes twice
// through one point into simple loops (an exterior and a hole touching it,
// as OGC allows); addRing drops rings whose shoelace area is below
// clipAreaNoise of the sum of its absolute terms (rounding noise). emit
// gives each hole to the smallest exterior holding it (PointInRing) and
// writes the polygons.

package planar

import (
	"cmp"
	"math"
	"slices"
)

const (
	// clipSameRel is the relative distance within which two traced points
	// count as one: a crossing point computed on a bisector and the
	// circumcentre ending that bisector's edge agree to a few ulps
	// (the CircumcentreErr bound and the crossing's interpolation error,
	// each several u = 2⁻⁵³ of the magnitudes); 2⁻⁵⁰ = 8u per coordinate
	// of the sum of magnitudes, i.e. about 16u of either point.
	clipSameRel = 0x1p-50
	// clipAreaNoise: a ring whose shoelace sum is below this fraction of
	// the sum of its terms' absolute values is rounding noise (the sum
	// of k terms carries an error of about k·u of that; 2⁻⁴⁶ = 128u covers
	// rings of up to about a hundred points with margin, and a real ring
	// of area this small relative to its extent is a zero-width path).
	clipAreaNoise = 0x1p-46
)

// traceRings pairs exits with entries along the cell boundary and traces
// the rings of cell ∩ area that touch the boundary.
//
// Events are ordered counter-clockwise along the boundary by cell edge,
// then by position along that edge's bisector. An event is computed on the
// bisector whose Cyrus–Beck parameter won; when two neighbours are almost
// the same point their bisectors almost coincide and that choice is
// arbitrary, so each event is moved to the edge whose extent (between its
// corners, measured along the bisector) holds it. Events at one point are
// ordered by their velocity under the perturbation. In the collinear case
// each bisector is a line of its own.
func (w *clipWork) traceRings(v int32, bounded bool) {
	c := w.c
	px, py := c.xy[2*v], c.xy[2*v+1]
	cyclic := bounded && !c.collinear
	if !c.collinear && len(w.tri) > 0 {
		w.moveEventsToEdges(px, py, cyclic)
	}
	w.orderDips(px, py)
	next := w.pairEvents(cyclic)
	w.traceChains(next, px, py, cyclic)
}

// cornerXY returns corner k of the current cell (the circumcentre between
// neighbours k and k+1).
func (w *clipWork) cornerXY(k int) (x, y float64) {
	t := w.tri[k]
	return w.c.cc[2*t], w.c.cc[2*t+1]
}

// along returns the position of (x, y) along the bisector of constraint k
// of the cell of the site at (px, py).
func (w *clipWork) along(k int, x, y, px, py float64) float64 {
	return (x-px)*(-w.cny[k]) + (y-py)*w.cnx[k]
}

// moveEventsToEdges moves each event to the cell edge whose extent, between
// its corners measured along the bisector, holds it (see traceRings), and
// recomputes its position on that edge.
func (w *clipWork) moveEventsToEdges(px, py float64, cyclic bool) {
	m := len(w.nb)
	evs := w.events
	for i := range evs {
		e := &evs[i]
		k, dir := int(e.k), 0
		for step := 0; step < m; step++ {
			s := w.along(k, e.x, e.y, px, py)
			start, end := -1, -1
			if cyclic {
				start, end = (k+m-1)%m, k
			} else {
				if k >= 1 {
					start = k - 1
				}
				if k <= m-2 {
					end = k
				}
			}
			if start >= 0 && dir <= 0 {
				if x, y := w.cornerXY(start); s < w.along(k, x, y, px, py) {
					k, dir = (k+m-1)%m, -1
					continue
				}
			}
			if end >= 0 && dir >= 0 {
				if x, y := w.cornerXY(end); s > w.along(k, x, y, px, py) {
					k, dir = (k+1)%m, 1
					continue
				}
			}
			break
		}
		if k != int(e.k) {
			ux, uy := -w.cny[k], w.cnx[k]
			e.k = int32(k)
			e.off = e.lam * (e.dx*ux + e.dy*uy)
			e.s = e.bx*ux + e.by*uy + e.off
			e.kappa = e.vx*ux + e.vy*uy
		}
	}
}

// orderDips fixes the order of the two events of every chain that leaves
// by the cell edge it came in by.
func (w *clipWork) orderDips(px, py float64) {
	c := w.c
	evs := w.events
	// A chain that leaves by the edge it came in by closes, with the
	// stretch of that edge between its ends, a simple polygon: counter-
	// clockwise exactly when the exit comes first along the edge. When
	// the chain barely dips into the cell (a ring vertex within rounding
	// of a bisector) the two crossing points are too close for their
	// computed positions to tell; the orientation, exact for a one-vertex
	// chain (Orient2D of the vertex and its ring neighbours), decides.
	for ci := range w.chains {
		ch := &w.chains[ci]
		if ch.entry < 0 {
			continue
		}
		en, ex := &evs[ch.entry], &evs[ch.exit]
		if en.k != ex.k || c.collinear {
			continue
		}
		var o float64
		if ch.p1-ch.p0 == 3 {
			vtx := w.chainVertex[ci]
			a, b := c.rprev[vtx], c.rnext[vtx]
			xy := c.r.XY
			o = Orient2D(xy[2*a], xy[2*a+1], xy[2*vtx], xy[2*vtx+1], xy[2*b], xy[2*b+1])
		} else {
			o = RingAreaAbout(clipInterleave(w.cx[ch.p0:ch.p1], w.cy[ch.p0:ch.p1], &w.tmp), px, py)
		}
		// Enforce the order (a tie in the computed positions is a
		// rounding artefact here, not a shared point to perturb).
		switch {
		case o > 0 && !(ex.s < en.s || ex.s == en.s && ex.kappa < en.kappa):
			ex.s, ex.kappa, ex.pre, en.pre = en.s, en.kappa, -1, 0
		case o < 0 && !(en.s < ex.s || en.s == ex.s && en.kappa < ex.kappa):
			en.s, en.kappa, en.pre, ex.pre = ex.s, ex.kappa, -1, 0
		}
	}
}

// pairEvents sorts the events along the cell boundary into w.order and
// returns, for each exit event, the entry event that follows it (the next
// unused entry counter-clockwise); w.pairOf holds each event's rank.
func (w *clipWork) pairEvents(cyclic bool) []int32 {
	c := w.c
	nev := len(w.events)
	evs := w.events
	w.order = w.order[:0]
	for i := 0; i < nev; i++ {
		w.order = append(w.order, int32(i))
	}
	slices.SortFunc(w.order, func(a, b int32) int {
		ea, eb := &evs[a], &evs[b]
		if r := cmp.Compare(ea.k, eb.k); r != 0 {
			return r
		}
		if r := cmp.Compare(ea.s, eb.s); r != 0 {
			return r
		}
		if ea.base == eb.base && ea.pre == 0 && eb.pre == 0 {
			// Same base vertex: the offsets order the points exactly
			// where their sum with the base position rounded equal.
			if r := cmp.Compare(ea.off, eb.off); r != 0 {
				return r
			}
		}
		if r := cmp.Compare(ea.kappa, eb.kappa); r != 0 {
			return r
		}
		if r := cmp.Compare(ea.pre, eb.pre); r != 0 {
			return r
		}
		if ea.entry != eb.entry {
			if !ea.entry {
				return -1 // exit first: a touching chain closes at once
			}
			return 1
		}
		return cmp.Compare(a, b)
	})
	w.pairOf = slices.Grow(w.pairOf[:0], nev)[:nev]
	rank := w.pairOf
	for r, e := range w.order {
		rank[e] = int32(r)
	}
	next := make([]int32, nev) // exit event -> entry event
	w.used = slices.Grow(w.used[:0], nev)[:nev]
	for i := range w.used {
		w.used[i] = false
	}
	for ei := 0; ei < nev; ei++ {
		if evs[ei].entry {
			continue
		}
		r0 := int(rank[ei])
		found := int32(-1)
		for step := 1; step <= nev; step++ {
			r := r0 + step
			if r >= nev {
				if !cyclic {
					break
				}
				r -= nev
			}
			cand := w.order[r]
			ce := &evs[cand]
			if c.collinear && ce.k != evs[ei].k {
				break
			}
			if !ce.entry {
				c.anomalies.Add(1) // two exits in a row
				continue
			}
			if w.used[cand] {
				continue
			}
			found = cand
			break
		}
		if found < 0 {
			c.anomalies.Add(1)
			found = w.chains[evs[ei].chain].entry // close on itself
		}
		w.used[found] = true
		next[ei] = found
	}
	return next
}

// traceChains traces the rings: chain, boundary stretch with the cell's
// corners up to the paired entry, next chain, … until the ring closes.
func (w *clipWork) traceChains(next []int32, px, py float64, cyclic bool) {
	c := w.c
	m := len(w.nb)
	evs := w.events
	rank := w.pairOf
	ncorner := len(w.tri)
	// Trace.
	done := make([]bool, len(w.chains))
	for c0 := range w.chains {
		ch0 := &w.chains[c0]
		if ch0.entry < 0 || done[c0] {
			continue
		}
		p0 := int32(len(w.ox))
		ci := int32(c0)
		for guard := 0; guard <= len(w.chains); guard++ {
			done[ci] = true
			chn := &w.chains[ci]
			for p := chn.p0; p < chn.p1; p++ {
				w.ox = append(w.ox, w.cx[p])
				w.oy = append(w.oy, w.cy[p])
				w.ol = append(w.ol, chn.label)
			}
			x := &evs[chn.exit]
			en := next[chn.exit]
			e := &evs[en]
			w.ol[len(w.ol)-1] = w.nb[x.k]
			// Corners between x and e, counter-clockwise.
			var cnt int
			if c.collinear {
				cnt = 0
			} else if rank[en] > rank[chn.exit] {
				cnt = int(e.k - x.k)
			} else if cyclic {
				cnt = int(e.k-x.k) + m
			} else {
				c.anomalies.Add(1)
				cnt = 0
			}
			for i := 0; i < cnt; i++ {
				k := (int(x.k) + i) % m
				if k >= ncorner {
					break
				}
				x, y := w.cornerXY(k)
				w.ox = append(w.ox, x)
				w.oy = append(w.oy, y)
				w.ol = append(w.ol, w.nb[(k+1)%m])
			}
			ci = e.chain
			if ci == int32(c0) {
				break
			}
			if done[ci] {
				c.anomalies.Add(1)
				break
			}
		}
		w.finishRing(p0, px, py)
	}
}

// finishRing drops zero-length edges of the ring starting at point p0 (the
// last ring in ox/oy/ol), computes its area and records it, or discards it
// when degenerate.
func (w *clipWork) finishRing(p0 int32, px, py float64) {
	n := int32(len(w.ox))
	ox, oy, ol := w.ox, w.oy, w.ol
	// Compact in place, dropping zero-length edges (a point equal to the
	// previous kept one replaces it: its label carries on) and points
	// between two edges on the same bisector (a chain that only touched
	// the cell boundary there; also removes zero-width spikes along it).
	// Points a few ulps apart (a crossing point computed on a bisector and
	// the circumcentre ending that bisector's edge) count as equal.
	same := func(ax, ay, bx, by float64) bool {
		return math.Abs(ax-bx) <= clipSameRel*(math.Abs(ax)+math.Abs(bx)) && math.Abs(ay-by) <= clipSameRel*(math.Abs(ay)+math.Abs(by))
	}
	k := p0
	for i := p0; i < n; i++ {
		x, y, l := ox[i], oy[i], ol[i]
		for k > p0 && same(ox[k-1], oy[k-1], x, y) {
			k--
		}
		if k > p0 && l >= 0 && ol[k-1] == l {
			continue
		}
		ox[k], oy[k], ol[k] = x, y, l
		k++
	}
	// The same across the wrap from the last point to the first.
	for changed := true; changed && k-p0 >= 2; {
		changed = false
		if same(ox[k-1], oy[k-1], ox[p0], oy[p0]) {
			k--
			changed = true
		} else if l := ol[p0]; l >= 0 && ol[k-1] == l {
			copy(ox[p0:k-1], ox[p0+1:k])
			copy(oy[p0:k-1], oy[p0+1:k])
			copy(ol[p0:k-1], ol[p0+1:k])
			k--
			changed = true
		}
	}
	w.ox, w.oy, w.ol = w.ox[:k], w.oy[:k], w.ol[:k]
	if k-p0 < 3 {
		w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
		return
	}
	if !w.splitPinched(p0, px, py) {
		w.addRing(p0, px, py)
	}
}

// splitPinched splits the ring at p0 (the last ring in ox/oy/ol) where it
// passes twice through the same point — where the area's boundary touches
// a cell edge at a vertex, the traced ring is pinched there — into simple
// loops, each recorded as its own ring: counter-clockwise loops become
// exteriors and clockwise ones holes touching them at that point, the
// representation the OGC simple-features rules allow. It reports false,
// leaving the ring alone, when no point repeats.
func (w *clipWork) splitPinched(p0 int32, px, py float64) bool {
	k := int32(len(w.ox))
	n := k - p0
	dup := false
	if n <= 64 {
		for i := p0; i < k && !dup; i++ {
			for j := i + 1; j < k; j++ {
				if w.ox[i] == w.ox[j] && w.oy[i] == w.oy[j] {
					dup = true
					break
				}
			}
		}
	} else {
		seen := make(map[[2]float64]struct{}, n)
		for i := p0; i < k; i++ {
			key := [2]float64{w.ox[i], w.oy[i]}
			if _, ok := seen[key]; ok {
				dup = true
				break
			}
			seen[key] = struct{}{}
		}
	}
	if !dup {
		return false
	}
	xs := slices.Clone(w.ox[p0:k])
	ys := slices.Clone(w.oy[p0:k])
	ls := slices.Clone(w.ol[p0:k])
	w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
	// Stack of point indices; pos maps a point to its stack position.
	var stack []int32
	pos := make(map[[2]float64]int, n)
	lab := slices.Clone(ls) // labels as they evolve on the stack
	for i := int32(0); i < n; i++ {
		key := [2]float64{xs[i], ys[i]}
		if s, ok := pos[key]; ok {
			// Loop stack[s..]: closes back at point stack[s].
			q0 := int32(len(w.ox))
			for _, j := range stack[s:] {
				w.ox = append(w.ox, xs[j])
				w.oy = append(w.oy, ys[j])
				w.ol = append(w.ol, lab[j])
				delete(pos, [2]float64{xs[j], ys[j]})
			}
			w.addRing(q0, px, py)
			stack = stack[:s+1]
			pos[key] = s
			lab[stack[s]] = ls[i] // continues along point i's edge
			continue
		}
		pos[key] = len(stack)
		stack = append(stack, i)
	}
	q0 := int32(len(w.ox))
	for _, j := range stack {
		w.ox = append(w.ox, xs[j])
		w.oy = append(w.oy, ys[j])
		w.ol = append(w.ol, lab[j])
	}
	w.addRing(q0, px, py)
	return true
}

// addRing records the ring of points [p0, len) with its area, or discards
// it when it has fewer than 3 points or an area within rounding of zero (a
// degenerate there-and-back path, such as a region edge along a cell edge
// seen from the side it does not bound).
func (w *clipWork) addRing(p0 int32, px, py float64) {
	k := int32(len(w.ox))
	if k-p0 < 3 {
		w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
		return
	}
	a, abs := 0.0, 0.0
	ax, ay := w.ox[k-1]-px, w.oy[k-1]-py
	for i := p0; i < k; i++ {
		bx, by := w.ox[i]-px, w.oy[i]-py
		a += ax*by - ay*bx
		abs += math.Abs(ax*by) + math.Abs(ay*bx)
		ax, ay = bx, by
	}
	a *= 0.5
	// abs bounds the terms before cancellation: an area below
	// clipAreaNoise·abs is rounding noise.
	if math.Abs(a) <= clipAreaNoise*abs {
		w.ox, w.oy, w.ol = w.ox[:p0], w.oy[:p0], w.ol[:p0]
		return
	}
	w.rings = append(w.rings, clipRing{p0: p0, p1: k, area: a, hole: a < 0, owner: -1})
}

// emit assigns holes to exteriors and appends the polygons to out.
func (w *clipWork) emit(out *clipOut, px, py float64) {
	ext := w.exteriorsBuf[:0]
	for i := range w.rings {
		if !w.rings[i].hole {
			ext = append(ext, int32(i))
		}
	}
	w.exteriorsBuf = ext
	for i := range w.rings {
		h := &w.rings[i]
		if !h.hole {
			continue
		}
		best, ba := int32(-1), 0.0
		for _, e := range ext {
			er := &w.rings[e]
			if best >= 0 && er.area >= ba {
				continue
			}
			if w.ringHolds(er, h) {
				best, ba = e, er.area
			}
		}
		if best < 0 {
			w.c.anomalies.Add(1)
		}
		h.owner = best
	}
	total := 0.0
	for _, e := range ext {
		nr := int32(1)
		w.copyRing(&w.rings[e], out)
		total += w.rings[e].area
		for i := range w.rings {
			if h := &w.rings[i]; h.hole && h.owner == e {
				w.copyRing(h, out)
				total += h.area
				nr++
			}
		}
		out.polyRings = append(out.polyRings, nr)
	}
	out.sitePolys = append(out.sitePolys, int32(len(ext)))
	out.area = append(out.area, total)
}

func (w *clipWork) copyRing(r *clipRing, out *clipOut) {
	for i := r.p0; i < r.p1; i++ {
		out.xy = append(out.xy, w.ox[i], w.oy[i])
		out.src = append(out.src, w.ol[i])
	}
	out.ringPts = append(out.ringPts, r.p1-r.p0)
}

// ringHolds reports whether ring h lies inside ring r, judged at the first
// vertex of h that is not on r (h may touch r at isolated points), by the
// exact PointInRing.
func (w *clipWork) ringHolds(r, h *clipRing) bool {
	rxy := clipInterleave(w.ox[r.p0:r.p1], w.oy[r.p0:r.p1], &w.tmp)
	for i := h.p0; i < h.p1; i++ {
		if s := PointInRing(rxy, w.ox[i], w.oy[i]); s != 0 {
			return s > 0
		}
	}
	return false
}
