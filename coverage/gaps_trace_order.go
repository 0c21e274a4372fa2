// Tracing P \ D(c, r), part 2: ordering the crossings of a piece's rings
// with the circle by angle (chains of close crossings summed in
// double-double along the ring, exact ties broken by the perturbation that
// grows the disk; see gaps_trace.go for the mathematics) and tracing the
// loops of the uncovered part from them.

package coverage

import (
	"math"
	"sort"

	"github.com/sitecover/sitecover/planar"
)

// gapDelta is the angle subtended by the ring portion between consecutive
// crossings.
type gapDelta struct {
	hi, lo  float64
	tv      float64 // total variation: sum of the absolute sub-segment angles
	through bool    // the portion passes through the site: no defined angle
}

// delta measures the ring portion from crossing a to crossing b = next(a).
func (t *gapTracer) delta(a, b int32) gapDelta {
	A, B := &t.xs[a], &t.xs[b]
	e, s := A.edge, A.t
	around := A.edge == B.edge && (b <= a || B.t < A.t)
	var hi, lo, tv float64
	through := false
	for {
		s1 := 1.0
		last := e == B.edge && !around
		if last {
			s1 = B.t
		}
		if s1 > s {
			x0, y0 := t.pt(e, s)
			x1, y1 := t.pt(e, s1)
			w, dot := (s1-s)*t.cr[e], x0*x1+y0*y1
			if w == 0 && dot <= 0 {
				through = true
			}
			a := math.Atan2(w, dot)
			hi, lo = planar.DDAdd(hi, lo, a)
			tv += math.Abs(a)
		}
		if last {
			break
		}
		e = t.nextPt[e]
		s = 0
		around = false
	}
	return gapDelta{hi: hi, lo: lo, tv: tv, through: through}
}

// gapChainAngle is the largest portion angle (radians, total variation)
// across which the angle of a crossing is carried from the previous one.
const gapChainAngle = 1e-3

// linked reports whether the next crossing's angle is carried from this
// one's.
func (d gapDelta) linked() bool { return !d.through && d.tv < gapChainAngle }

func sgn(x float64) float64 {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

// traceGeneral sorts the crossings by angle and traces the loops; it
// reports false when the crossings do not alternate (numerical trouble).
func (t *gapTracer) traceGeneral() bool {
	t.crossingAngles()
	if !t.sortCrossings() || !t.traceLoops() {
		return false
	}
	t.missedRings()
	return true
}

// crossingAngles sets the double-double angle (hi, lo) in [0, 2π) of every
// crossing.
func (t *gapTracer) crossingAngles() {
	// Angles: atan2 of each crossing, except along chains of crossings
	// that follow each other closely on a ring (portion angle below
	// gapChainAngle), where each angle is the previous one plus the exact
	// portion angle, so that their order is that of the ring.
	for k0 := 0; k0 < len(t.xs); {
		ring := t.xs[k0].ring
		k1 := k0
		for k1 < len(t.xs) && t.xs[k1].ring == ring {
			k1++
		}
		m := k1 - k0
		deltas := t.deltas[:0]
		best, bestAbs := -1, -1.0
		nLinks := 0
		for j := 0; j < m; j++ {
			d := t.delta(int32(k0+j), t.xs[k0+j].next)
			deltas = append(deltas, d)
			X := &t.xs[k0+j]
			X.hi, X.lo = math.Atan2(X.y, X.x), 0
			if d.linked() {
				nLinks++
				if d.tv > bestAbs {
					best, bestAbs = j, d.tv
				}
			}
		}
		if nLinks == m {
			deltas[best].through = true // break the cycle at its largest step
		}
		for j := 0; j < m; j++ {
			if deltas[(j+m-1)%m].linked() {
				continue // not the start of a chain
			}
			for cur := j; deltas[cur].linked(); cur = (cur + 1) % m {
				nx := (cur + 1) % m
				P, C, d := &t.xs[k0+cur], &t.xs[k0+nx], deltas[cur]
				C.hi, C.lo = planar.DDAddDD(P.hi, P.lo, d.hi, d.lo)
			}
		}
		for j := k0; j < k1; j++ {
			t.xs[j].hi, t.xs[j].lo = planar.DDReduceTwoPi(t.xs[j].hi, t.xs[j].lo)
		}
		t.deltas = deltas
		k0 = k1
	}
}

// sortCrossings sorts the crossings by angle (then by their perturbation
// key), records each one's position and each entry's predecessor, and
// reports false when entries and exits do not alternate.
func (t *gapTracer) sortCrossings() bool {
	m := len(t.xs)
	t.sorted = t.sorted[:0]
	for k := 0; k < m; k++ {
		t.sorted = append(t.sorted, int32(k))
	}
	xs := t.xs
	sort.Slice(t.sorted, func(i, j int) bool {
		a, b := &xs[t.sorted[i]], &xs[t.sorted[j]]
		if a.hi != b.hi {
			return a.hi < b.hi
		}
		if a.lo != b.lo {
			return a.lo < b.lo
		}
		if a.key2 != b.key2 {
			return a.key2 < b.key2
		}
		return t.sorted[i] < t.sorted[j]
	})
	for q := 0; q < m; q++ {
		xs[t.sorted[q]].pos = int32(q)
	}
	for q := 0; q < m; q++ {
		a := &xs[t.sorted[q]]
		b := &xs[t.sorted[(q+1)%m]]
		if a.exit == b.exit {
			return false
		}
		if !b.exit {
			b.pred = t.sorted[q]
		}
	}
	return true
}

// traceLoops traces the loops (run along the ring from an exit to the next
// entry, then the arc from that entry clockwise back to the exit before
// it), reporting false on an inconsistent structure.
func (t *gapTracer) traceLoops() bool {
	xs, m := t.xs, len(t.xs)
	// Trace loops.
	for k := range xs {
		if !xs[k].exit || xs[k].seen {
			continue
		}
		t.newLoop()
		cur := int32(k)
		for steps := 0; ; steps++ {
			if steps > m {
				return false
			}
			X := &t.xs[cur]
			X.seen = true
			ei := X.next
			t.run(&t.loops[len(t.loops)-1], cur, ei)
			E := &t.xs[ei]
			P := &t.xs[E.pred]
			phiHi, phiLo := planar.DDAddDD(E.hi, E.lo, -P.hi, -P.lo)
			phi := phiHi + phiLo
			if E.pos == 0 {
				phi += 2 * math.Pi
			}
			if phi < 0 {
				phi = 0
			}
			if phi > 2*math.Pi {
				phi = 2 * math.Pi
			}
			t.arc(&t.loops[len(t.loops)-1], E.x, E.y, phi, P.x, P.y)
			cur = E.pred
			if cur == int32(k) {
				break
			}
			if t.xs[cur].seen {
				return false
			}
		}
		t.closeLoop(&t.loops[len(t.loops)-1])
	}
	return true
}

// missedRings adds the rings that do not meet the circle and lie outside
// the disk as loops of their own.
func (t *gapTracer) missedRings() {
	// Rings that miss the circle.
	for ri := range t.ringLo {
		has := false
		for k := range t.xs {
			if t.xs[k].ring == int32(ri) {
				has = true
				break
			}
		}
		if has {
			continue
		}
		lo, hi := t.ringLo[ri], t.ringHi[ri]
		if !t.out[lo] {
			continue
		}
		lp := t.newLoop()
		for i := lo; i < hi; i++ {
			t.segment(lp, i, 0, 1)
			t.vertex(lp, i)
		}
		t.closeLoop(lp)
	}
}
