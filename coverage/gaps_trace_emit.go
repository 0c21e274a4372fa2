// Tracing P \ D(c, r), part 3: grouping the traced loops into polygons
// (holes to the outer loop containing them), emitting them with their
// areas and first moments, and the exact-area self-check with its
// fallback (see gaps_trace.go for the mathematics).

package coverage

import "math"

// group assigns hole loops to the outer loops containing them; it reports
// false when a hole has no outer loop.
func (t *gapTracer) group() bool {
	nOuter := 0
	lastOuter := int32(-1)
	for i := range t.loops {
		if t.loops[i].area > 0 {
			nOuter++
			lastOuter = int32(i)
		}
	}
	for i := range t.loops {
		lp := &t.loops[i]
		if lp.area >= 0 {
			continue
		}
		switch nOuter {
		case 0:
			return false
		case 1:
			lp.owner = lastOuter
		default:
			qx, qy := t.loopPoint(lp)
			best, bestA := int32(-1), math.Inf(1)
			for j := range t.loops {
				o := &t.loops[j]
				if o.area <= 0 || o.area >= bestA {
					continue
				}
				if t.loopContains(o, qx, qy) {
					best, bestA = int32(j), o.area
				}
			}
			if best < 0 {
				return false
			}
			lp.owner = best
		}
	}
	return true
}

// loopPoint returns a point on loop lp away from its element ends.
func (t *gapTracer) loopPoint(lp *gapLoop) (float64, float64) {
	for e := lp.e0; e < lp.e1; e++ {
		el := &t.elems[e]
		nx, ny := t.elemEnd(lp, e)
		if el.kind != gapArc {
			return (el.x + nx) / 2, (el.y + ny) / 2
		}
		th := math.Atan2(el.y, el.x) - float64(el.phi)/2
		return t.r * math.Cos(th), t.r * math.Sin(th)
	}
	return 0, 0
}

// elemEnd returns the end point of element e of loop lp.
func (t *gapTracer) elemEnd(lp *gapLoop, e int32) (float64, float64) {
	n := e + 1
	if n == lp.e1 {
		n = lp.e0
	}
	return t.elems[n].x, t.elems[n].y
}

// loopContains reports whether (qx, qy) lies inside loop lp (crossing
// number of the rightward ray, arcs handled exactly).
func (t *gapTracer) loopContains(lp *gapLoop, qx, qy float64) bool {
	in := false
	r := t.r
	for e := lp.e0; e < lp.e1; e++ {
		el := &t.elems[e]
		nx, ny := t.elemEnd(lp, e)
		if el.kind != gapArc {
			if (el.y > qy) != (ny > qy) {
				x := el.x + (qy-el.y)*(nx-el.x)/(ny-el.y)
				if x > qx {
					in = !in
				}
			}
			continue
		}
		if math.Abs(qy) >= r {
			continue
		}
		h := math.Sqrt(r*r - qy*qy)
		th0 := math.Atan2(el.y, el.x)
		for _, x := range [2]float64{h, -h} {
			if x <= qx {
				continue
			}
			d := math.Mod(th0-math.Atan2(qy, x), 2*math.Pi)
			if d < 0 {
				d += 2 * math.Pi
			}
			if d > 0 && d < float64(el.phi) {
				in = !in
			}
		}
	}
	return in
}

// emit appends the grouped components to ch: one node per outer loop with
// its holes, elements in absolute coordinates, bisector portions.
func (t *gapTracer) emit(ch *gapChunk) {
	for i := range t.loops {
		o := &t.loops[i]
		if !(o.area > 0) {
			continue
		}
		nElem, nPort := len(ch.elems), len(ch.portions)
		nd := gapNode{
			v: t.v, loop0: int32(len(ch.loopElem)),
			minX: math.Inf(1), minY: math.Inf(1), maxX: math.Inf(-1), maxY: math.Inf(-1), deepD: -1,
		}
		nodeIdx := int32(len(ch.nodes))
		for j := range t.loops {
			lp := &t.loops[j]
			if j != i && lp.owner != int32(i) {
				continue
			}
			nd.area += lp.area
			nd.mx += lp.mx
			nd.my += lp.my
			nd.minX, nd.minY = math.Min(nd.minX, lp.minX+t.cx), math.Min(nd.minY, lp.minY+t.cy)
			nd.maxX, nd.maxY = math.Max(nd.maxX, lp.maxX+t.cx), math.Max(nd.maxY, lp.maxY+t.cy)
			if lp.deepD > nd.deepD {
				nd.deepD, nd.deepX, nd.deepY = lp.deepD, lp.deepX+t.cx, lp.deepY+t.cy
			}
			nd.touches = nd.touches || lp.touches
			t.emitLoop(ch, lp, nodeIdx)
		}
		if !(nd.area > 0) {
			// Degenerate (holes as large as the outer loop): drop it.
			ch.loopElem = ch.loopElem[:nd.loop0]
			ch.elems, ch.portions = ch.elems[:nElem], ch.portions[:nPort]
			continue
		}
		if nd.deepD < 0 {
			// No ring vertex outside the disk (cannot happen for a component
			// of positive area; keep the range meaningful anyway).
			nd.deepD, nd.deepX, nd.deepY = t.r, nd.minX, nd.minY
		}
		nd.loop1 = int32(len(ch.loopElem))
		ch.nodes = append(ch.nodes, nd)
	}
}

// emitLoop records the bisector portions of loop lp (node nodeIdx) and,
// when outlines are wanted, copies its elements to ch in absolute
// coordinates.
func (t *gapTracer) emitLoop(ch *gapChunk, lp *gapLoop, nodeIdx int32) {
	base := int32(-1)
	if t.keep {
		ch.loopElem = append(ch.loopElem, int32(len(ch.elems)))
		base = int32(len(ch.elems))
		for e := lp.e0; e < lp.e1; e++ {
			el := t.elems[e]
			el.x += t.cx
			el.y += t.cy
			ch.elems = append(ch.elems, el)
		}
	}
	n := lp.e1 - lp.e0
	for k := int32(0); k < n; k++ {
		el := &t.elems[lp.e0+k]
		if el.kind < 0 {
			continue
		}
		nx := &t.elems[lp.e0+(k+1)%n]
		key, ax, ay, ux, uy := gapBisector(t.l, t.v, el.kind)
		x0, y0 := el.x+t.cx, el.y+t.cy
		x1, y1 := nx.x+t.cx, nx.y+t.cy
		t0 := ux*(y0-ay) - uy*(x0-ax)
		t1 := ux*(y1-ay) - uy*(x1-ax)
		if t0 > t1 {
			t0, t1 = t1, t0
		}
		elem := int32(-1)
		if t.keep {
			elem = base + k
		}
		ch.portions = append(ch.portions, gapPortion{key: key, lo: t0, hi: t1, elem: elem, node: nodeIdx})
	}
}

// pieceArea returns the signed area of the current piece.
func (t *gapTracer) pieceArea() float64 {
	s := 0.0
	for _, w := range t.cr {
		s += w
	}
	return s / 2
}

// exactUncovered returns the closed-form uncovered area of the current
// piece (the coverage-curve edge sum), for the self-check.
func (t *gapTracer) exactUncovered() float64 {
	xy := make([]float64, 0, 2*len(t.px))
	th := make([]float64, len(t.px))
	rs := make([]int32, 0, len(t.ringLo)+1)
	for i := range t.px {
		xy = append(xy, t.px[i], t.py[i])
		j := t.nextPt[i]
		th[i] = math.Atan2(t.cr[i], t.px[i]*t.px[j]+t.py[i]*t.py[j])
	}
	for _, lo := range t.ringLo {
		rs = append(rs, lo)
	}
	if len(t.ringHi) > 0 {
		rs = append(rs, t.ringHi[len(t.ringHi)-1])
	}
	cov, _ := crvPieceDisk(xy, rs, th, 0, 0, t.r)
	u := t.pieceArea() - cov
	if u < 0 {
		u = 0
	}
	return u
}

// fallback replaces a piece whose tracing failed by one component with the
// closed-form area, the piece's outside vertices and its rings as outline.
func (t *gapTracer) fallback(ch *gapChunk) {
	u := t.exactUncovered()
	if !(u > 0) {
		return
	}
	t.elems, t.loops = t.elems[:0], t.loops[:0]
	var mx, my, ar float64
	lp0 := -1
	for ri := range t.ringLo {
		lp := t.newLoop()
		if lp0 < 0 {
			lp0 = len(t.loops) - 1
		}
		for i := t.ringLo[ri]; i < t.ringHi[ri]; i++ {
			t.segment(lp, i, 0, 1)
			if t.out[i] {
				t.vertex(lp, i)
			}
		}
		t.closeLoop(lp)
		mx, my, ar = mx+lp.mx, my+lp.my, ar+lp.area
		if ri > 0 {
			lp.owner = int32(lp0)
		}
	}
	for i := range t.loops {
		t.loops[i].area = 0
	}
	t.loops[lp0].area = u
	if ar > 0 {
		t.loops[lp0].mx, t.loops[lp0].my = mx*u/ar, my*u/ar
	}
	for i := 1; i < len(t.loops); i++ {
		t.loops[i].mx, t.loops[i].my = 0, 0
	}
	t.emit(ch)
}
