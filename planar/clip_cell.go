// ClipCells, the per-cell engine: one convex Voronoi cell C against the
// ring edges that can meet it (clip.go states the method and its
// degeneracy rules).
//
// For the cell of site p with Delaunay neighbours j, each half-plane is
// g_j(x) = (x − p)·n_j − |n_j|²/2 ≤ 0 with n_j = p_j − p. A ring vertex is
// classified once per cell (slot): its g_j and their derivatives under the
// erosion of the area (g'_j = w·n_j, w the vertex's miter vector), a zero
// g_j taking the sign of g'_j (clipSign). A ring edge with inside vertices
// extends to a chain with an entry event and an exit event on C's boundary
// (crossing: Cyrus–Beck parameters t = g_a/(g_a − g_b), interpolated from
// the endpoint nearer the bisector, ties broken by dt/dδ in edgeEvents); a
// ring with every vertex inside is a whole ring. clipCell collects the
// chains from the ring edges in the grid cells overlapping C (gridSeeds,
// a Sutherland–Hodgman clip of the grid's box to C), and clip_trace.go
// joins them into rings. A cell that meets no ring and lies inside the
// area is emitted whole (wholeCell).

package planar

import (
	"math"
	"slices"
)

const (
	// clipSliverT is the shortest piece, as a fraction of a ring edge,
	// that an edge with both ends outside a cell must cut through it to
	// count. A crossing parameter is off by a few u (u = 2⁻⁵³) times the
	// ratio of the distance from the site (coordinates are taken relative
	// to it) to the edge length, below 2⁻⁴⁰ for edges longer than about
	// 2⁻¹⁰ of that distance; a piece that short adds area only at rounding
	// level.
	clipSliverT = 0x1p-40
	// clipBoxPadRel widens the clipped box of gridSeeds by this fraction
	// of its size, over the rounding of its Sutherland–Hodgman corners
	// (a few ulps each).
	clipBoxPadRel = 1e-9
)

// clipEvent is a point where a chain enters or leaves the cell.
type clipEvent struct {
	k        int32   // cell edge (constraint) it lies on
	s, kappa float64 // position along edge k, and d(position)/dδ
	vx, vy   float64 // velocity of the point under the perturbation
	pre      int8    // sorts before (-1) others at the same place
	// The point is base + lam·(dx, dy) relative to the site, base being
	// the ring vertex nearer the bisector (at (bx, by)); off is the
	// offset part of s, compared exactly between events of one base.
	base                int32
	lam, bx, by, dx, dy float64
	off                 float64
	x, y                float64 // absolute coordinates
	entry               bool
	chain               int32
}

// clipChain is a run of ring points inside the cell.
type clipChain struct {
	p0, p1      int32 // points [p0, p1) in clipWork.cx/cy
	label       int32 // BoundaryEdge of its ring
	entry, exit int32 // event indices, -1 for a whole ring
	area        float64
}

// clipRing is a traced output ring.
type clipRing struct {
	p0, p1 int32 // points [p0, p1) in clipWork.ox/oy/ol
	area   float64
	hole   bool
	owner  int32 // for holes: exterior index
}

// clipWork is one goroutine's scratch space.
type clipWork struct {
	c        *clipper
	nb, tri  []int32
	ab       aroundBuf // the chunk's whole cells' lists (aroundBatch)
	corners  []float64 // a cell's corners when ab has none
	cnx, cny []float64 // constraint normals p_j − p_v
	ch       []float64 // |n|²/2
	// Ring-vertex cache for the current cell.
	stamp        int32
	vstamp       []int32
	vslot        []int32
	estamp       []int32
	sx, sy       []float64 // translated coordinates per slot
	sin          []bool
	sg           []float64 // g values per slot, m per slot
	sgp          []float64 // their derivatives under the erosion
	svert        []int32   // region vertex of each slot
	cx, cy       []float64 // chain points (absolute)
	chains       []clipChain
	chainVertex  []int32 // first ring vertex of each chain (-1 if none)
	tmp, tmp2    []float64
	seedBuf      []int32
	events       []clipEvent
	order        []int32
	pairOf       []int32
	used         []bool
	ox, oy       []float64 // traced ring points
	ol           []int32
	rings        []clipRing
	exteriorsBuf []int32
}

func newClipWork(c *clipper) *clipWork {
	m := len(c.r.XY) / 2
	w := &clipWork{c: c, vstamp: make([]int32, m), vslot: make([]int32, m), estamp: make([]int32, m)}
	for i := range w.vstamp {
		w.vstamp[i], w.estamp[i] = -1, -1
	}
	return w
}

// wholeCell emits the complete (bounded) cell of v.
func (w *clipWork) wholeCell(v int32, out *clipOut) {
	c := w.c
	nb, _, cc, ok := w.ab.lists(v)
	if !ok {
		w.nb, w.tri, _ = c.around(v, w.nb, w.tri)
		nb = w.nb
		w.corners = w.corners[:0]
		for _, t := range w.tri {
			w.corners = append(w.corners, c.cc[2*t], c.cc[2*t+1])
		}
		cc = w.corners
	}
	m := len(cc) / 2
	px, py := c.xy[2*v], c.xy[2*v+1]
	start := len(out.src)
	for k := 0; k < m; k++ {
		k1 := (k + 1) % m
		x, y := cc[2*k], cc[2*k+1]
		if x == cc[2*k1] && y == cc[2*k1+1] {
			continue // zero-length edge
		}
		out.xy = append(out.xy, x, y)
		out.src = append(out.src, nb[(k+1)%m])
	}
	n := len(out.src) - start
	if n < 3 {
		out.xy = out.xy[:2*start]
		out.src = out.src[:start]
		out.sitePolys = append(out.sitePolys, 0)
		out.area = append(out.area, 0)
		if c.wt == nil {
			// A Voronoi cell always has area; a power cell of a vertex
			// whose lift lies exactly on its neighbours' plane (kept by
			// the perturbation) is a point, and empty is right.
			w.c.anomalies.Add(1)
		}
		return
	}
	out.ringPts = append(out.ringPts, int32(n))
	out.polyRings = append(out.polyRings, 1)
	out.sitePolys = append(out.sitePolys, 1)
	out.area = append(out.area, RingAreaAbout(out.xy[2*start:], px, py))
}

// interleave writes x and y interleaved into *buf and returns it.
func clipInterleave(x, y []float64, buf *[]float64) []float64 {
	b := (*buf)[:0]
	for i := range x {
		b = append(b, x[i], y[i])
	}
	*buf = b
	return b
}

// slot returns the cache slot of region vertex i for the current cell,
// classifying it on first use: for each half-plane k it stores g_k and its
// derivative g'_k = w·n_k under erosion of the area (w is the vertex's
// miter vector), and the vertex is inside when every perturbed sign is
// negative.
func (w *clipWork) slot(i int32, px, py float64) int32 {
	if w.vstamp[i] == w.stamp {
		return w.vslot[i]
	}
	s := int32(len(w.sx))
	w.vstamp[i], w.vslot[i] = w.stamp, s
	c := w.c
	x, y := c.r.XY[2*i]-px, c.r.XY[2*i+1]-py
	mx, my := c.miter[2*i], c.miter[2*i+1]
	w.sx = append(w.sx, x)
	w.sy = append(w.sy, y)
	w.svert = append(w.svert, i)
	in := true
	for k := range w.cnx {
		g := x*w.cnx[k] + y*w.cny[k] - w.ch[k]
		gp := mx*w.cnx[k] + my*w.cny[k]
		w.sg = append(w.sg, g)
		w.sgp = append(w.sgp, gp)
		if clipSign(g, gp) > 0 {
			in = false
		}
	}
	w.sin = append(w.sin, in)
	return s
}

// clipSign is the sign of g + δ·gp for an infinitesimal δ > 0, with an
// exact double zero counted as outside (+1).
func clipSign(g, gp float64) int {
	switch {
	case g < 0:
		return -1
	case g > 0:
		return 1
	case gp < 0:
		return -1
	}
	return 1
}

// gridSeeds returns the ring edges to examine for the current cell: the
// walk's seeds and every edge registered in a grid cell that overlaps the
// bounding box of (cell ∩ the area's bounding box), the latter found by
// clipping the box to the cell's half-planes (Sutherland & Hodgman,
// "Reentrant polygon clipping", CACM 17, 1974). Every ring edge that meets
// the cell is among them, whatever the walk found. Sorted, no repeats.
func (w *clipWork) gridSeeds(walk []int32, px, py float64) []int32 {
	g := &w.c.grid
	poly := append(w.tmp[:0],
		g.x0-px, g.y0-py, g.x0+float64(g.nx)*g.cw-px, g.y0-py,
		g.x0+float64(g.nx)*g.cw-px, g.y0+float64(g.ny)*g.ch-py, g.x0-px, g.y0+float64(g.ny)*g.ch-py)
	next := w.tmp2[:0]
	for k := range w.cnx {
		nx, ny, h := w.cnx[k], w.cny[k], w.ch[k]
		next = next[:0]
		n := len(poly) / 2
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			ax, ay, bx, by := poly[2*i], poly[2*i+1], poly[2*j], poly[2*j+1]
			ga, gb := ax*nx+ay*ny-h, bx*nx+by*ny-h
			if ga <= 0 {
				next = append(next, ax, ay)
			}
			if ga < 0 && gb > 0 || ga > 0 && gb < 0 {
				t := ga / (ga - gb)
				next = append(next, ax+t*(bx-ax), ay+t*(by-ay))
			}
		}
		poly, next = next, poly
		if len(poly) == 0 {
			break
		}
	}
	w.tmp, w.tmp2 = poly, next
	out := append(w.seedBuf[:0], walk...)
	if len(poly) > 0 {
		x0, y0, x1, y1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
		for i := 0; i < len(poly); i += 2 {
			x0, x1 = math.Min(x0, poly[i]), math.Max(x1, poly[i])
			y0, y1 = math.Min(y0, poly[i+1]), math.Max(y1, poly[i+1])
		}
		// Margin for the rounding of the clipped box: the grid's rounding
		// margin (gridRoundRel of the magnitudes) plus clipBoxPadRel of
		// its size.
		mx := clipBoxPadRel*(x1-x0) + gridRoundRel*(math.Abs(px)+math.Abs(x0)+math.Abs(x1))
		my := clipBoxPadRel*(y1-y0) + gridRoundRel*(math.Abs(py)+math.Abs(y0)+math.Abs(y1))
		g.cellEdges(px+x0-mx, py+y0-my, px+x1+mx, py+y1+my, func(e int32) { out = append(out, e) })
	}
	slices.Sort(out)
	out = slices.Compact(out)
	w.seedBuf = out
	return out
}

// crossing fills ev with the point where edge (slot i → slot j) meets the
// bisector of constraint k, interpolated from the endpoint nearer to it,
// with its position along the cell edge and that position's derivative
// under the erosion.
func (w *clipWork) crossing(i, j int32, k int, px, py float64, ev *clipEvent) {
	m := len(w.cnx)
	gi, gj := w.sg[int(i)*m+k], w.sg[int(j)*m+k]
	gpi, gpj := w.sgp[int(i)*m+k], w.sgp[int(j)*m+k]
	base, other, gb, gotr := i, j, gi, gj
	if math.Abs(gj) < math.Abs(gi) {
		base, other, gb, gotr = j, i, gj, gi
	}
	lam := 0.0
	if gb != 0 {
		lam = gb / (gb - gotr)
	}
	ux, uy := -w.cny[k], w.cnx[k]
	bx, by := w.sx[base], w.sy[base]
	dx, dy := w.sx[other]-bx, w.sy[other]-by
	ev.k = int32(k)
	ev.base, ev.lam = w.svert[base], lam
	ev.bx, ev.by, ev.dx, ev.dy = bx, by, dx, dy
	ev.off = lam * (dx*ux + dy*uy)
	ev.s = bx*ux + by*uy + ev.off
	// Derivative of the position: the crossing of the moved edge
	// A' = A + δ w_A, B' = B + δ w_B with line k, at t(δ) from A.
	c := w.c
	va, vb := w.svert[i], w.svert[j]
	t, tp := clipParam(gi, gj, gpi, gpj)
	wax, way := c.miter[2*va], c.miter[2*va+1]
	wbx, wby := c.miter[2*vb], c.miter[2*vb+1]
	abu := (w.sx[j]-w.sx[i])*ux + (w.sy[j]-w.sy[i])*uy
	ev.kappa = (wax+t*(wbx-wax))*ux + (way+t*(wby-way))*uy + tp*abu
	uu := ux*ux + uy*uy
	ev.vx, ev.vy = ev.kappa*ux/uu, ev.kappa*uy/uu
	if lam == 0 {
		v := w.svert[base]
		ev.x, ev.y = c.r.XY[2*v], c.r.XY[2*v+1]
	} else {
		ev.x, ev.y = px+(bx+lam*dx), py+(by+lam*dy)
	}
}

// clipParam returns the parameter t = gA/(gA−gB) where an edge meets a
// bisector and its derivative under the perturbation, dt/dδ.
func clipParam(ga, gb, gpa, gpb float64) (t, tp float64) {
	d := ga - gb
	if d == 0 {
		return 0, 0
	}
	return ga / d, (ga*gpb - gb*gpa) / (d * d)
}

// edgeEvents computes the entry and/or exit constraint of edge (slot i →
// slot j) under the perturbed signs. It returns the constraint indices (-1
// when absent) and whether the edge meets the cell at all (meaningful when
// both ends are outside). Ties in the parameter are broken by its
// derivative, as in the perturbed configuration.
func (w *clipWork) edgeEvents(i, j int32) (kin, kout int, meets bool) {
	m := len(w.cnx)
	gi, gj := w.sg[int(i)*m:int(i)*m+m], w.sg[int(j)*m:int(j)*m+m]
	pi, pj := w.sgp[int(i)*m:int(i)*m+m], w.sgp[int(j)*m:int(j)*m+m]
	kin, kout = -1, -1
	var tin, pin, tout, pout float64
	for k := 0; k < m; k++ {
		sa, sb := clipSign(gi[k], pi[k]), clipSign(gj[k], pj[k])
		if gi[k] == gj[k] {
			sb = sa // parallel to the bisector: one side only
		}
		switch {
		case sa > 0 && sb > 0:
			return -1, -1, false
		case sa > 0: // enters this half-plane
			t, tp := clipParam(gi[k], gj[k], pi[k], pj[k])
			if kin < 0 || t > tin || t == tin && tp > pin {
				kin, tin, pin = k, t, tp
			}
		case sb > 0: // leaves it
			t, tp := clipParam(gi[k], gj[k], pi[k], pj[k])
			if kout < 0 || t < tout || t == tout && tp < pout {
				kout, tout, pout = k, t, tp
			}
		}
	}
	// An edge through (or within rounding of) a cell corner, with both
	// ends outside, would cut at most a sliver of length ~u off it; the
	// sliver's ends cannot be ordered reliably, and leaving it out changes
	// no area beyond rounding, so a piece shorter than clipSliverT of the
	// edge counts as none (an exact touch included: zero area either way).
	meets = kin < 0 || kout < 0 || tout-tin > clipSliverT
	return kin, kout, meets
}

// clipCell clips the cell of v to the region given the ring edges that
// the boundary walk found in it, and appends the result to out.
func (w *clipWork) clipCell(v int32, seeds []int32, out *clipOut) {
	c := w.c
	px, py, bounded := w.startCell(v)
	w.collectChains(w.gridSeeds(seeds, px, py), px, py)
	w.ox, w.oy, w.ol, w.rings = w.ox[:0], w.oy[:0], w.ol[:0], w.rings[:0]
	if len(w.events) > 0 {
		if len(w.nb) == 0 {
			c.anomalies.Add(1)
		} else {
			w.traceRings(v, bounded)
		}
	}
	largest := w.wholeRings(px, py)
	if len(w.events) == 0 {
		w.boundaryRing(v, largest, px, py, bounded)
	}
	w.emit(out, px, py)
}

// startCell loads the neighbours and half-planes of the cell of v into w
// and clears the per-cell scratch; it returns the site and whether the
// cell is bounded.
func (w *clipWork) startCell(v int32) (px, py float64, bounded bool) {
	c := w.c
	w.nb, w.tri, bounded = c.around(v, w.nb, w.tri)
	px, py = c.xy[2*v], c.xy[2*v+1]
	w.cnx, w.cny, w.ch = w.cnx[:0], w.cny[:0], w.ch[:0]
	for _, j := range w.nb {
		nx, ny := c.xy[2*j]-px, c.xy[2*j+1]-py
		w.cnx = append(w.cnx, nx)
		w.cny = append(w.cny, ny)
		w.ch = append(w.ch, c.halfOffset(v, j, nx, ny))
	}
	w.stamp++
	w.sx, w.sy, w.sin, w.sg, w.sgp, w.svert = w.sx[:0], w.sy[:0], w.sin[:0], w.sg[:0], w.sgp[:0], w.svert[:0]
	w.cx, w.cy = w.cx[:0], w.cy[:0]
	w.chains = w.chains[:0]
	w.chainVertex = w.chainVertex[:0]
	w.events = w.events[:0]
	return px, py, bounded
}

// newEvent records the crossing of edge (slot i → slot j) with constraint
// k as an entry or exit event of chain, and as a chain point.
func (w *clipWork) newEvent(i, j int32, k int, entry bool, chain int32, px, py float64) int32 {
	var ev clipEvent
	w.crossing(i, j, k, px, py, &ev)
	ev.entry, ev.chain = entry, chain
	w.events = append(w.events, ev)
	w.cx = append(w.cx, ev.x)
	w.cy = append(w.cy, ev.y)
	return int32(len(w.events) - 1)
}

// addVertex appends region vertex i as a chain point.
func (w *clipWork) addVertex(i int32) {
	w.cx = append(w.cx, w.c.r.XY[2*i])
	w.cy = append(w.cy, w.c.r.XY[2*i+1])
}

// collectChains builds the chains (runs of ring points inside the cell,
// with their entry and exit events) and whole rings from the ring edges
// in seeds, each ring edge used once.
func (w *clipWork) collectChains(seeds []int32, px, py float64) {
	c := w.c
	rnext, rprev := c.rnext, c.rprev
	for _, e := range seeds {
		if w.estamp[e] == w.stamp {
			continue
		}
		a, b := e, rnext[e]
		sa, sb := w.slot(a, px, py), w.slot(b, px, py)
		label := BoundaryEdge(int(c.rring[e]))
		ch := int32(len(w.chains))
		if !w.sin[sa] && !w.sin[sb] {
			w.estamp[e] = w.stamp
			kin, kout, meets := w.edgeEvents(sa, sb)
			if !meets || kin < 0 || kout < 0 {
				continue
			}
			p0 := int32(len(w.cx))
			ein := w.newEvent(sa, sb, kin, true, ch, px, py)
			eout := w.newEvent(sa, sb, kout, false, ch, px, py)
			w.chains = append(w.chains, clipChain{p0: p0, p1: int32(len(w.cx)), label: label, entry: ein, exit: eout})
			w.chainVertex = append(w.chainVertex, -1)
			continue
		}
		// Find the chain's entry edge (or a whole ring) going backwards.
		f := e
		closed := false
		if w.sin[sa] {
			for {
				p := rprev[f]
				if !w.sin[w.slot(p, px, py)] {
					f = p
					break
				}
				f = p
				if f == e {
					closed = true
					break
				}
			}
		}
		p0 := int32(len(w.cx))
		if closed {
			g := e
			for {
				w.estamp[g] = w.stamp
				w.addVertex(g)
				g = rnext[g]
				if g == e {
					break
				}
			}
			w.chains = append(w.chains, clipChain{p0: p0, p1: int32(len(w.cx)), label: label, entry: -1, exit: -1})
			w.chainVertex = append(w.chainVertex, e)
			continue
		}
		// f runs from an outside vertex to an inside one.
		w.estamp[f] = w.stamp
		sf, sg := w.slot(f, px, py), w.slot(rnext[f], px, py)
		kin, _, _ := w.edgeEvents(sf, sg)
		if kin < 0 {
			// Outside vertex with no violated half-plane cannot be; guard.
			c.anomalies.Add(1)
			kin = 0
		}
		ein := w.newEvent(sf, sg, kin, true, ch, px, py)
		g := rnext[f]
		for {
			w.addVertex(g)
			h := rnext[g]
			w.estamp[g] = w.stamp
			sh := w.slot(h, px, py)
			if w.sin[sh] {
				g = h
				continue
			}
			_, kout, _ := w.edgeEvents(w.slot(g, px, py), sh)
			if kout < 0 {
				c.anomalies.Add(1)
				kout = 0
			}
			eout := w.newEvent(w.slot(g, px, py), sh, kout, false, ch, px, py)
			w.chains = append(w.chains, clipChain{p0: p0, p1: int32(len(w.cx)), label: label, entry: ein, exit: eout})
			w.chainVertex = append(w.chainVertex, rnext[f])
			break
		}
	}
}

// wholeRings records the rings lying wholly inside the cell and returns
// the index of the largest in w.rings (−1 when none).
func (w *clipWork) wholeRings(px, py float64) int {
	// Whole rings inside the cell.
	largest, largestArea := -1, 0.0
	for ci := range w.chains {
		chn := &w.chains[ci]
		if chn.entry >= 0 {
			continue
		}
		p0 := int32(len(w.ox))
		for p := chn.p0; p < chn.p1; p++ {
			w.ox = append(w.ox, w.cx[p])
			w.oy = append(w.oy, w.cy[p])
			w.ol = append(w.ol, chn.label)
		}
		w.finishRing(p0, px, py)
		if n := len(w.rings); n > 0 && w.rings[n-1].p0 == p0 {
			if a := math.Abs(w.rings[n-1].area); a > largestArea {
				largest, largestArea = n-1, a
			}
		}
	}
	return largest
}

// cornerArea returns the signed area of the current bounded cell's corner
// polygon (its circumcentres or power centres in order).
func (w *clipWork) cornerArea() float64 {
	xy := w.tmp[:0]
	for _, t := range w.tri {
		xy = append(xy, w.c.cc[2*t], w.c.cc[2*t+1])
	}
	w.tmp = xy
	return RingArea(xy)
}

// boundaryRing handles a cell whose boundary no chain touches: the cell's
// own boundary lies in the area exactly when the largest whole ring is a
// hole (or, with none, when the site is in the area; for a power cell a
// point of the cell, cellPointOf), and then it is an exterior ring.
func (w *clipWork) boundaryRing(v int32, largest int, px, py float64, bounded bool) {
	c := w.c
	boundaryIn := false
	if largest >= 0 {
		boundaryIn = w.rings[largest].hole
	} else {
		x, y := c.cellPointOf(v, w.nb, w.tri, bounded)
		in, on := c.grid.locate(x, y, nil, nil)
		boundaryIn = in && !on
		if on && !(c.wt != nil && bounded && w.cornerArea() == 0) {
			// (A power cell of zero area, a point or a segment, may lie
			// on the area's boundary; it is empty either way.)
			c.anomalies.Add(1)
		}
	}
	if boundaryIn {
		if !bounded || len(w.tri) < 3 {
			c.anomalies.Add(1)
		} else {
			p0 := int32(len(w.ox))
			m := len(w.tri)
			for k := 0; k < m; k++ {
				t0 := w.tri[k]
				w.ox = append(w.ox, c.cc[2*t0])
				w.oy = append(w.oy, c.cc[2*t0+1])
				w.ol = append(w.ol, w.nb[(k+1)%m])
			}
			w.finishRing(p0, px, py)
		}
	}
}
