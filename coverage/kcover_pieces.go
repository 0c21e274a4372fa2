// The pieces (S, q) of one order-(k−1) set S (Lee's construction,
// kcover.go): the order-(k−1) cell C_S cut from each member's clipped cell
// by the half-planes H(s, u) (kRestrict), or once from the members' cell
// box when their cells lie inside the area (kWholeSet, split only among
// the devices across C_S's edges, kEdgeCandidates), then split among the
// candidates q (kSplit, kcover_split.go) and added to the chunk.

package coverage

import (
	"math"
	"slices"

	"github.com/sitecover/sitecover/planar"
)

// kCellsBox returns in dst the counter-clockwise ring of the bounding box
// of the members' cells.
func kCellsBox(g *kGraph, S []int32, dst []float64) []float64 {
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, s := range S {
		b := g.BoxXY[4*s : 4*s+4]
		minX, minY, maxX, maxY = min(minX, b[0]), min(minY, b[1]), max(maxX, b[2]), max(maxY, b[3])
	}
	return append(dst, minX, minY, maxX, minY, maxX, maxY, minX, maxY)
}

// kSetPieces computes the pieces (S, q) of one order-(k−1) set S.
func kSetPieces(l *Layout, g *kGraph, S []int32, r float64, keep bool, sc *kScratch, ch *kChunk) {
	t := l.Tri
	sc.nb = kNeighbourhood(t, g, S, sc.nb)
	nb := sc.nb
	if len(nb) == 0 {
		return
	}
	sc.hit = slices.Grow(sc.hit[:0], len(nb))[:len(nb)]
	clear(sc.hit)
	if len(S) > 1 && kAllInner(g, S) {
		kWholeSet(l, g, S, r, keep, sc, ch)
	} else {
		kSetPerBase(l, S, r, keep, sc, ch)
	}
	for qi, h := range sc.hit[:len(sc.nb)] {
		if !h {
			continue
		}
		ch.pieces++
		sc.tset = append(append(sc.tset[:0], S...), sc.nb[qi])
		slices.Sort(sc.tset)
		ch.next = append(ch.next, sc.tset...)
	}
}

// kAllInner reports whether every member of S has a cell inside the area.
func kAllInner(g *kGraph, S []int32) bool {
	for _, s := range S {
		if !g.Inner[s] {
			return false
		}
	}
	return true
}

// kWholeSet computes the pieces of S when the cells of its members lie
// inside the area: then C_S ∩ A = C_S, a convex polygon, clipped from the
// bounding box of those cells (which holds C_S ⊂ ⋃ V_s) by the half-planes
// H(s, u), s ∈ S, u ∈ N(S), and split once (not once per member).
func kWholeSet(l *Layout, g *kGraph, S []int32, r float64, keep bool, sc *kScratch, ch *kChunk) {
	t := l.Tri
	sc.box = kCellsBox(g, S, sc.box[:0])
	sc.cell.Reset()
	sc.cell.AppendRing(sc.box, S[0])
	base := kRestrict(t, &sc.cell, S, -1, sc.nb, sc)
	if base == nil {
		return
	}
	// Only the devices across the edges of C_S split it (see
	// kEdgeCandidates); sc.nb is replaced by that shorter list.
	old := sc.nb
	sc.nb = kEdgeCandidates(t, base, old, sc.cand[:0])
	sc.cand = old
	kSplit(t, base, sc.nb, r, nil, keep, &sc.split)
	kTakePieces(t, S, -1, keep, sc, ch)
}

// kEdgeTieRel is the relative tolerance within which devices count as tied
// at the midpoint of an edge of C_S: far above the rounding of the clipped vertices
// (planar/halfplane.go, about 1e-15 relative), far below any real gap
// between distances that matters (a device wrongly admitted as a candidate
// only costs a clip; its piece comes out empty).
const kEdgeTieRel = 1e-9

// kEdgeCandidates returns (in dst) the members of nb that split the convex
// order-(k−1) cell C_S with the given rings into pieces of positive area.
// Every piece of C_S touches its boundary: the piece of q holds the
// segment from q (outside C_S, q being its own nearest device) to any of
// its points, inside q's convex Voronoi cell of P \ S. Along a whole edge
// of C_S on the bisector of s ∈ S and u, u is the nearest device of P \ S
// (on C_S's boundary s and u tie, every other device is at least as far),
// so the piece of u holds a strip along the edge, and u is the device of
// N(S) nearest the edge's midpoint. A piece meeting the boundary at a
// vertex only has zero area unless five devices tie there; its vertices
// are vertices of the pieces around it, so the range does not need it, and
// an order-(k+1) cell of positive area is found from one of its order-k
// subsets of positive area. Devices within kEdgeTieRel of the nearest at a
// midpoint (cocircular lattices) are all taken. The list keeps the order
// of nb.
func kEdgeCandidates(t *planar.Triangulation, cs *planar.ClipRings, nb, dst []int32) []int32 {
	var take [64]bool
	if len(nb) > len(take) {
		return append(dst, nb...)
	}
	for k := 0; k < cs.NumRings(); k++ {
		ring := cs.Ring(k)
		n := len(ring) / 2
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			mx, my := (ring[2*i]+ring[2*j])/2, (ring[2*i+1]+ring[2*j+1])/2
			kMarkNearest(t, nb, mx, my, kEdgeTieRel, &take)
		}
	}
	for i, u := range nb {
		if take[i] {
			dst = append(dst, u)
		}
	}
	return dst
}

// kMarkNearest marks the members of nb nearest (x, y), and those within
// rel (relative) of the nearest distance.
func kMarkNearest(t *planar.Triangulation, nb []int32, x, y, rel float64, take *[64]bool) {
	best := math.Inf(1)
	for _, u := range nb {
		dx, dy := t.Coords[2*u]-x, t.Coords[2*u+1]-y
		best = min(best, dx*dx+dy*dy)
	}
	lim := best * (1 + rel) * (1 + rel)
	for i, u := range nb {
		dx, dy := t.Coords[2*u]-x, t.Coords[2*u+1]-y
		if dx*dx+dy*dy <= lim {
			take[i] = true
		}
	}
}

// kSetPerBase computes the pieces of S one member's clipped cell at a
// time (cells that meet the area's boundary or its holes, and k = 2).
func kSetPerBase(l *Layout, S []int32, r float64, keep bool, sc *kScratch, ch *kChunk) {
	t, c := l.Tri, l.Cells
	nb := sc.nb
	for _, v := range S {
		rs := planCellRings(c, v)
		if rs.NumRings() == 0 {
			continue
		}
		sc.cell.Reset()
		for j := 0; j < rs.NumRings(); j++ {
			sc.cell.AppendRing(rs.Ring(j), v)
		}
		var valid func(int32, float64, float64) bool
		if !planCellConvex(&sc.cell.RingSet) {
			valid = sc.holdFn
		}
		base := kRestrict(t, &sc.cell, S, v, nb, sc)
		if base == nil {
			continue
		}
		kSplit(t, base, nb, r, valid, keep, &sc.split)
		kTakePieces(t, S, v, keep, sc, ch)
	}
}

// kTakePieces adds the pieces kSplit left in sc.split (base vertex v, −1
// for a whole set) to the chunk.
func kTakePieces(t *planar.Triangulation, S []int32, v int32, keep bool, sc *kScratch, ch *kChunk) {
	nb := sc.nb
	for pi, p := range sc.split.res {
		ch.covered += p.disk
		ch.pieceArea += p.area
		sc.hit[p.cand] = true
		if p.far > ch.far {
			ch.far, ch.fx, ch.fy = p.far, p.fx, p.fy
			ch.farSet = append(append(ch.farSet[:0], S...), nb[p.cand])
		}
		if keep {
			q := nb[p.cand]
			kept := &sc.split.kept
			kKeep(ch.store, kept, 0, kept.NumRings(), int32(pi), v, S, q, t.Coords[2*q], t.Coords[2*q+1], p)
		}
	}
}

// kRestrict clips the base cell of v to the order-(k−1) cell of S:
// ⋂ H(s, u) over s ∈ S \ {v}, u ∈ nb (V_v already gives H(v, u); v = −1
// takes every member). It returns nil when nothing remains.
func kRestrict(t *planar.Triangulation, cell *planar.ClipRings, S []int32, v int32, nb []int32, sc *kScratch) *planar.ClipRings {
	// Devices nearest the members' centre first: their bisectors cut
	// most, so later half-planes mostly find nothing outside (one pass,
	// no copy).
	cx, cy := 0.0, 0.0
	for _, s := range S {
		cx += t.Coords[2*s]
		cy += t.Coords[2*s+1]
	}
	cx /= float64(len(S))
	cy /= float64(len(S))
	sc.pairs = sc.pairs[:0]
	for _, u := range nb {
		dx, dy := t.Coords[2*u]-cx, t.Coords[2*u+1]-cy
		sc.pairs = append(sc.pairs, kByDist{dx*dx + dy*dy, u})
	}
	kSortByDist(sc.pairs)
	cur := cell
	for _, p := range sc.pairs {
		ux, uy := t.Coords[2*p.v], t.Coords[2*p.v+1]
		for _, s := range S {
			if s == v {
				continue
			}
			cur = kCut(planar.Bisector(t.Coords[2*s], t.Coords[2*s+1], ux, uy), cur, &sc.a, &sc.b)
			if len(cur.XY) == 0 {
				return nil
			}
		}
	}
	return cur
}
