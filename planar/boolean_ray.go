// Polygon overlay: the ray from a component's smallest vertex towards −x.
//
// The ray's nearest contact with another component names the face that
// holds the component (see boolean_graph.go). Contacts are edges crossed
// in their interior and vertices lying on the ray; their order along the
// ray is decided exactly:
//
//   - vertex w against vertex w′: by x (both lie on the ray);
//   - vertex w against edge LH (L below, H above the ray): the edge meets
//     the ray left of w iff w lies right of L→H, Orient2D(L, H, w) < 0;
//   - edge against edge: the two edges do not cross (the arrangement is
//     noded), so their order on the ray is their order at any height they
//     share; it is read off from an endpoint of one that lies within the
//     other's height range and off its line.
//
// A float64 estimate of the contact's x serves only to stop the walk
// through the grid, with a margin of two cells.

package planar

import (
	"errors"
	"math"
)

// errBooleanInconsistent reports face windings that disagree around a
// face: impossible for a noded arrangement, checked as a safeguard.
var errBooleanInconsistent = errors.New("internal error: face winding numbers are inconsistent")

// booleanRay casts rays over the noded rings' edges through a grid over
// those rings; ring edge e is graph edge ringHalf[e]>>1.
type booleanRay struct {
	gr *booleanGraph
	g  *regionGrid
}

// newBooleanRay uses grid if it is not nil (it must be built over the
// graph's rings) and otherwise builds one.
func newBooleanRay(gr *booleanGraph, grid *regionGrid) *booleanRay {
	if grid == nil {
		grid = &regionGrid{}
		grid.build(gr.ringXY, gr.ringStart)
	}
	return &booleanRay{gr: gr, g: grid}
}

// booleanContact is the nearest contact found so far: a vertex (v ≥ 0),
// an edge (m ≥ 0) or none.
type booleanContact struct {
	v, m int32
}

// cast returns the face cycle holding the component whose smallest
// vertex is v (−1 if none: the unbounded face). The ray runs towards −x:
// v is its component's lexicographically smallest vertex, so the ray meets
// nothing of its own component, and its nearest contact bounds the face
// that holds it. That contact lies left of v, so the holding component's
// smallest vertex precedes v: processing components in vertex order, its
// windings are already known. Cells are walked from v's leftwards, each
// edge tested in every cell it is registered in (repeats are harmless),
// and the walk stops once the nearest contact found lies right of every
// cell still to come.
func (r *booleanRay) cast(v int32) int32 {
	gr, g := r.gr, r.g
	px, py := gr.vx[2*v], gr.vx[2*v+1]
	best := booleanContact{-1, -1}
	bestX := math.Inf(-1) // approximate x of best, only for stopping
	row := g.clampRow((py - g.y0) / g.ch)
	c0 := g.clampCol((px - g.x0) / g.cw)
	for c := c0; c >= 0; c-- {
		cell := row*g.nx + c
		for _, ent := range g.entries[g.cellStart[cell]:g.cellStart[cell+1]] {
			e := ent >> 1
			m := gr.ringHalf[e] >> 1
			a, b := gr.eLo[m], gr.eHi[m]
			ax, ay, bx, by := gr.vx[2*a], gr.vx[2*a+1], gr.vx[2*b], gr.vx[2*b+1]
			if ay == py && ax < px {
				best, bestX = r.nearer(best, booleanContact{a, -1}, py), max(bestX, ax)
			}
			if by == py && bx < px {
				best, bestX = r.nearer(best, booleanContact{b, -1}, py), max(bestX, bx)
			}
			if (ay > py) == (by > py) || ay == py || by == py {
				continue
			}
			lx, ly, hx, hy := ax, ay, bx, by
			if by < ay {
				lx, ly, hx, hy = bx, by, ax, ay
			}
			if Orient2D(lx, ly, hx, hy, px, py) >= 0 {
				continue // the edge passes right of the vertex
			}
			best = r.nearer(best, booleanContact{-1, m}, py)
			bestX = max(bestX, lx+(py-ly)/(hy-ly)*(hx-lx))
		}
		// Cells left of c end at x0 + c·cw (plus the registration margin).
		if bestX > g.x0+float64(c)*g.cw+2*(g.padX+1)*g.cw {
			break
		}
	}
	switch {
	case best.v >= 0:
		// The face at the contact vertex holding direction +x: the sector
		// after its last outgoing half-edge (no edge leaves it along +x,
		// or that edge's far end would be a nearer contact).
		list := gr.out[gr.outStart[best.v]:gr.outStart[best.v+1]]
		return gr.face[list[len(list)-1]]
	case best.m >= 0:
		h := 2 * best.m // the downward half-edge has the vertex on its left
		if gr.vx[2*gr.eHi[best.m]+1] > gr.vx[2*gr.eLo[best.m]+1] {
			h++
		}
		return gr.face[h]
	}
	return -1
}

// nearer returns whichever of two contacts on the ray y = py (towards −x)
// comes first, that is, lies further right.
func (r *booleanRay) nearer(p, q booleanContact, py float64) booleanContact {
	vx := r.gr.vx
	switch {
	case p.v < 0 && p.m < 0:
		return q
	case p.v >= 0 && q.v >= 0:
		if vx[2*q.v] > vx[2*p.v] {
			return q
		}
		return p
	case p.v >= 0: // q is an edge
		if !r.edgeBeforeX(q.m, vx[2*p.v], py) {
			return q
		}
		return p
	case q.v >= 0: // p is an edge
		if !r.edgeBeforeX(p.m, vx[2*q.v], py) {
			return p
		}
		return q
	}
	if r.edgeLeftOf(p.m, q.m) {
		return q
	}
	return p
}

// lowHigh returns edge m's endpoints ordered by y.
func (r *booleanRay) lowHigh(m int32) (lx, ly, hx, hy float64) {
	vx := r.gr.vx
	a, b := r.gr.eLo[m], r.gr.eHi[m]
	lx, ly, hx, hy = vx[2*a], vx[2*a+1], vx[2*b], vx[2*b+1]
	if hy < ly {
		lx, ly, hx, hy = hx, hy, lx, ly
	}
	return
}

// edgeBeforeX reports whether edge m, which crosses the line y = py in its
// interior, meets it left of x.
func (r *booleanRay) edgeBeforeX(m int32, x, py float64) bool {
	lx, ly, hx, hy := r.lowHigh(m)
	return Orient2D(lx, ly, hx, hy, x, py) < 0
}

// edgeLeftOf reports whether edge m1 meets a horizontal line that both
// cross in their interiors left of edge m2. The edges do not cross.
func (r *booleanRay) edgeLeftOf(m1, m2 int32) bool {
	l1x, l1y, h1x, h1y := r.lowHigh(m1)
	l2x, l2y, h2x, h2y := r.lowHigh(m2)
	for _, q := range [2][2]float64{{l2x, l2y}, {h2x, h2y}} {
		if q[1] >= l1y && q[1] <= h1y {
			if o := Orient2D(l1x, l1y, h1x, h1y, q[0], q[1]); o != 0 {
				return o < 0 // m2's point lies right of m1
			}
		}
	}
	for _, q := range [2][2]float64{{l1x, l1y}, {h1x, h1y}} {
		if q[1] >= l2y && q[1] <= h2y {
			if o := Orient2D(l2x, l2y, h2x, h2y, q[0], q[1]); o != 0 {
				return o > 0 // m1's point lies left of m2
			}
		}
	}
	return false
}
