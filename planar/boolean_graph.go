// Polygon overlay, step 2: the planar arrangement of the noded rings and
// the winding numbers of its faces.
//
// Method: an exact overlay through the arrangement with winding numbers
// (the approach of Hobby's snap-rounded arrangements and of GEOS's
// overlay; the face labelling by winding number as in Vatti, "A generic
// solution to polygon clipping", CACM 35, 1992, which labels each edge
// with the winding counts on its two sides). Each operand ring contributes
// a jump of +1 in its operand's winding number when crossing an edge from
// right to left (rings are oriented so that their polygon's interior is on
// the left: exteriors counter-clockwise, holes clockwise). Coinciding edges
// are merged and their jumps added, so adjacent parcels' shared edge has
// jump 0 and overlapping identical edges jump 2.
//
//   - Vertices are the distinct points of the noded rings, numbered in
//     lexicographic (x, y) order; edges are the distinct vertex pairs.
//   - Around each vertex the outgoing half-edges are sorted by angle,
//     exactly: by half-plane, then by Orient2D.
//   - Face cycles are traced with the rule next(h) = the half-edge leaving
//     h's end that comes first clockwise after h's twin, so each cycle has
//     its face on the left.
//   - In each connected component, the cycle around the component (its
//     outer cycle) is the face at its smallest vertex containing the
//     direction −x. A ray from that vertex towards −x, walked through a
//     uniform grid as in region.go, finds the nearest edge or vertex of
//     another component: it bounds the face that holds the component
//     (Shimrat's ray, CACM 5, 1962, used for location rather than
//     parity). The outer cycle takes that face's winding numbers (0 if
//     the ray meets nothing), which are known because the holding
//     component has a vertex left of the ray's origin and so a smaller
//     smallest vertex: components are processed in that order. Within a
//     component every other cycle's winding follows across edges:
//     w(left of h) = w(right of h) + jump(h).
//   - The link from the outer cycle to the holding face also joins face
//     cycles that belong to one geometric face (a hole inside a polygon)
//     when grouping the output rings.
//
// No decision uses a tolerance: vertex identity is float64 equality, and
// every sidedness and angular order is an exact Orient2D sign.

package planar

import (
	"cmp"
	"slices"
)

// booleanGraph is the noded arrangement with face windings. Half-edge h
// belongs to edge h>>1 and runs lo→hi when h is even, hi→lo when odd.
type booleanGraph struct {
	vx        []float64 // vertex coordinates, interleaved, in (x, y) order
	eLo, eHi  []int32   // edge endpoints, eLo < eHi
	jump      [][2]int32
	outStart  []int32 // half-edges leaving each vertex: out[outStart[v]:outStart[v+1]]
	out       []int32 // sorted counter-clockwise from direction +x
	pos       []int32 // index of each half-edge within its origin's list
	face      []int32 // face cycle on the left of each half-edge
	nFace     int
	faceHE    []int32 // some half-edge of each face cycle
	comp      []int32 // component (its smallest vertex) of each vertex
	wind      [][2]int32
	holder    []int32 // per face cycle: the face cycle of the same face it is linked to, or -1
	ringHalf  []int32 // per noded ring edge: the half-edge it became
	ringXY    []float64
	ringStart []int32 // the noded rings, kept for the ray grid
}

func (gr *booleanGraph) origin(h int32) int32 {
	if h&1 == 0 {
		return gr.eLo[h>>1]
	}
	return gr.eHi[h>>1]
}

// jumpOf returns the winding jumps (left minus right) across half-edge h.
func (gr *booleanGraph) jumpOf(h int32) [2]int32 {
	j := gr.jump[h>>1]
	if h&1 == 1 {
		return [2]int32{-j[0], -j[1]}
	}
	return j
}

// next returns the half-edge after h on h's face cycle.
func (gr *booleanGraph) next(h int32) int32 {
	t := h ^ 1
	v := gr.origin(t)
	s, n := gr.outStart[v], gr.outStart[v+1]-gr.outStart[v]
	return gr.out[s+(gr.pos[t]-1+n)%n]
}

// booleanBuildGraph builds the arrangement of noded rings; operand[k] (0 or
// 1) and sign[k] (+1 if ring k runs with its interior on the left, else
// −1) give each ring's winding contribution.
func booleanBuildGraph(xy []float64, ringStart []int32, operand []uint8, sign []int8) *booleanGraph {
	gr := &booleanGraph{}
	nv := len(xy) / 2
	order := make([]int32, nv)
	for i := range order {
		order[i] = int32(i)
	}
	slices.SortFunc(order, func(a, b int32) int {
		if c := cmp.Compare(xy[2*a], xy[2*b]); c != 0 {
			return c
		}
		return cmp.Compare(xy[2*a+1], xy[2*b+1])
	})
	id := make([]int32, nv)
	for i, o := range order {
		if i > 0 && xy[2*o] == gr.vx[len(gr.vx)-2] && xy[2*o+1] == gr.vx[len(gr.vx)-1] {
			id[o] = int32(len(gr.vx)/2 - 1)
			continue
		}
		gr.vx = append(gr.vx, xy[2*o], xy[2*o+1])
		id[o] = int32(len(gr.vx)/2 - 1)
	}
	gr.ringXY, gr.ringStart = xy, ringStart
	gr.mergeEdges(id, ringStart, operand, sign)
	gr.sortAround()
	gr.traceFaces()
	gr.components()
	return gr
}

// mergeEdges turns every ring edge into an undirected edge, merging equal
// ones and adding their jumps.
func (gr *booleanGraph) mergeEdges(id []int32, ringStart []int32, operand []uint8, sign []int8) {
	type rec struct {
		lo, hi, e int32
		d         int8
		op        uint8
	}
	recs := make([]rec, 0, len(id))
	for k := 0; k+1 < len(ringStart); k++ {
		for e := ringStart[k]; e < ringStart[k+1]; e++ {
			n := e + 1
			if n == ringStart[k+1] {
				n = ringStart[k]
			}
			u, v := id[e], id[n]
			d := sign[k]
			if u > v {
				u, v, d = v, u, -d
			}
			recs = append(recs, rec{u, v, e, d, operand[k]})
		}
	}
	slices.SortFunc(recs, func(a, b rec) int {
		if c := cmp.Compare(a.lo, b.lo); c != 0 {
			return c
		}
		return cmp.Compare(a.hi, b.hi)
	})
	gr.ringHalf = make([]int32, len(id))
	for i, r := range recs {
		if i == 0 || r.lo != recs[i-1].lo || r.hi != recs[i-1].hi {
			gr.eLo = append(gr.eLo, r.lo)
			gr.eHi = append(gr.eHi, r.hi)
			gr.jump = append(gr.jump, [2]int32{})
		}
		m := int32(len(gr.eLo) - 1)
		gr.jump[m][r.op] += int32(r.d)
		gr.ringHalf[r.e] = 2 * m
		if id[r.e] != r.lo {
			gr.ringHalf[r.e]++
		}
	}
}

// sortAround builds the outgoing half-edge lists, sorted by angle.
func (gr *booleanGraph) sortAround() {
	nv := len(gr.vx) / 2
	nh := 2 * len(gr.eLo)
	gr.outStart = make([]int32, nv+1)
	for h := int32(0); h < int32(nh); h++ {
		gr.outStart[gr.origin(h)+1]++
	}
	for v := 0; v < nv; v++ {
		gr.outStart[v+1] += gr.outStart[v]
	}
	gr.out = make([]int32, nh)
	fill := slices.Clone(gr.outStart[:nv])
	for h := int32(0); h < int32(nh); h++ {
		v := gr.origin(h)
		gr.out[fill[v]] = h
		fill[v]++
	}
	gr.pos = make([]int32, nh)
	vx := gr.vx
	for v := 0; v < nv; v++ {
		ox, oy := vx[2*v], vx[2*v+1]
		list := gr.out[gr.outStart[v]:gr.outStart[v+1]]
		slices.SortFunc(list, func(a, b int32) int {
			ta, tb := gr.origin(a^1), gr.origin(b^1)
			ax, ay := vx[2*ta]-ox, vx[2*ta+1]-oy
			bx, by := vx[2*tb]-ox, vx[2*tb+1]-oy
			if c := cmp.Compare(booleanHalfPlane(ax, ay), booleanHalfPlane(bx, by)); c != 0 {
				return c
			}
			o := Orient2D(ox, oy, vx[2*ta], vx[2*ta+1], vx[2*tb], vx[2*tb+1])
			switch {
			case o > 0:
				return -1
			case o < 0:
				return 1
			}
			return 0
		})
		for i, h := range list {
			gr.pos[h] = int32(i)
		}
	}
}

// booleanHalfPlane is 0 for directions with angle in [0, π) and 1 for
// [π, 2π). Callers pass float64 differences of coordinates, whose signs
// are exact (a rounded difference is zero only for equal operands and
// never changes sign).
func booleanHalfPlane(dx, dy float64) int {
	if dy > 0 || dy == 0 && dx > 0 {
		return 0
	}
	return 1
}

// traceFaces labels every half-edge with its face cycle.
func (gr *booleanGraph) traceFaces() {
	nh := int32(len(gr.out))
	gr.face = make([]int32, nh)
	for h := range gr.face {
		gr.face[h] = -1
	}
	for h := int32(0); h < nh; h++ {
		if gr.face[h] >= 0 {
			continue
		}
		f := int32(gr.nFace)
		gr.nFace++
		gr.faceHE = append(gr.faceHE, h)
		for g := h; gr.face[g] < 0; g = gr.next(g) {
			gr.face[g] = f
		}
	}
}

// components labels each vertex with its component's smallest vertex.
func (gr *booleanGraph) components() {
	nv := len(gr.vx) / 2
	parent := make([]int32, nv)
	for v := range parent {
		parent[v] = int32(v)
	}
	for m := range gr.eLo {
		booleanUnite(parent, gr.eLo[m], gr.eHi[m])
	}
	gr.comp = make([]int32, nv)
	for v := range parent {
		gr.comp[v] = booleanFind(parent, int32(v))
	}
}

// booleanFind returns the root of x in a union-find forest whose roots
// are the smallest members (path halving).
func booleanFind(parent []int32, x int32) int32 {
	for parent[x] != x {
		parent[x] = parent[parent[x]]
		x = parent[x]
	}
	return x
}

// booleanUnite merges the sets of a and b, keeping the smaller root.
func booleanUnite(parent []int32, a, b int32) {
	ra, rb := booleanFind(parent, a), booleanFind(parent, b)
	if ra < rb {
		parent[rb] = ra
	} else if rb < ra {
		parent[ra] = rb
	}
}

// faceTowardMinusX returns the face cycle at vertex v that contains the
// direction −x from v (no edge leaves v in exactly that direction).
func (gr *booleanGraph) faceTowardMinusX(v int32) int32 {
	list := gr.out[gr.outStart[v]:gr.outStart[v+1]]
	// The sector holding angle π starts at the last half-edge with angle
	// below π (the last of half-plane 0), or at the last one overall.
	last := list[len(list)-1]
	vx := gr.vx
	for _, h := range list {
		t := gr.origin(h ^ 1)
		if booleanHalfPlane(vx[2*t]-vx[2*v], vx[2*t+1]-vx[2*v+1]) != 0 {
			break
		}
		last = h
	}
	return gr.face[last]
}

// windings sets every face cycle's winding numbers and holder link. grid,
// if not nil, is a regionGrid over the graph's noded rings.
func (gr *booleanGraph) windings(grid *regionGrid) error {
	nv := int32(len(gr.vx) / 2)
	gr.wind = make([][2]int32, gr.nFace)
	gr.holder = make([]int32, gr.nFace)
	known := make([]bool, gr.nFace)
	var ray *booleanRay // built only if there is more than one component
	for v := int32(1); v < nv && ray == nil; v++ {
		if gr.comp[v] == v {
			ray = newBooleanRay(gr, grid)
		}
	}
	var queue []int32
	for v := int32(0); v < nv; v++ {
		if gr.comp[v] != v {
			continue
		}
		outer := gr.faceTowardMinusX(v)
		var w [2]int32
		hold := int32(-1)
		if ray != nil {
			hold = ray.cast(v)
		}
		if hold >= 0 {
			if !known[hold] {
				return errBooleanInconsistent
			}
			w = gr.wind[hold]
		}
		gr.wind[outer] = w
		gr.holder[outer] = hold
		known[outer] = true
		queue = append(queue[:0], outer)
		for len(queue) > 0 {
			f := queue[len(queue)-1]
			queue = queue[:len(queue)-1]
			h0 := gr.faceHE[f]
			h := h0
			for {
				g := gr.face[h^1]
				j := gr.jumpOf(h)
				want := [2]int32{gr.wind[f][0] - j[0], gr.wind[f][1] - j[1]}
				if !known[g] {
					known[g] = true
					gr.wind[g] = want
					gr.holder[g] = -1
					queue = append(queue, g)
				} else if gr.wind[g] != want {
					return errBooleanInconsistent
				}
				if h = gr.next(h); h == h0 {
					break
				}
			}
		}
	}
	return nil
}
