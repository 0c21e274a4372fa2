// Splitting a region by the Voronoi diagram of a few candidate devices:
// the step shared by the order-k pieces (kcover_pieces.go) and the single-failure
// analysis (plan_failures.go).
//
// Given a region R (a clipped cell piece, as planar.ClipRings) and
// candidate devices c₁ … c_m whose Voronoi diagram restricted to R is
// wanted, the piece of candidate q is
//
//	R ∩ ⋂_{u ≠ q} H(q, u),
//
// H(q, u) the half-plane nearer q than u (planar.Bisector), clipped one
// half-plane at a time (planar.HalfPlane.ClipSet, Sutherland–Hodgman) and
// skipped when no vertex lies outside. For every non-empty piece the
// measures of plan_clip.go are taken about q: signed area, area within the
// range r of q (planar.RingDiskArea), and the farthest vertex of the piece
// from q (the maximum of the convex function |x − q| over the piece is at a
// vertex; candidate vertices count only when valid accepts them, see
// planar/halfplane.go).
//
// This is Lee's step from order k−1 to order k (D.-T. Lee, "On k-nearest
// neighbor Voronoi diagrams in the plane", IEEE Trans. Computers 31, 1982):
// inside the order-(k−1) cell of a set S the k-th nearest device is the
// nearest device of P \ S, so the cell is split by the Voronoi diagram of
// P \ S; and for k = 2 it is the deletion step of plan_failures.go (the
// cell of a failed device split among its neighbours). Both call kSplit,
// so the 2-cover range and the single-failure survive range are one
// computation.
//
// Error bounds: those of planar/halfplane.go (side tests, crossings) and
// planar.RingDiskArea (relative 1e-14 of the piece area per ring).

package coverage

import (
	"github.com/sitecover/sitecover/planar"
)

// kPiece holds the measures of one non-empty piece of kSplit.
type kPiece struct {
	cand       int32   // index of the piece's device in the candidate list
	area, disk float64 // signed area; area within r of the device
	far        float64 // farthest vertex distance from the device
	fx, fy     float64 // the farthest vertex
}

// kSplitScratch is per-goroutine scratch space of kSplit.
type kSplitScratch struct {
	cur, next *planar.ClipRings // clip scratch, swapped by kCut
	order     []kByDist
	// res receives one entry per non-empty piece, in candidate order.
	res []kPiece
	// kept receives the rings of every non-empty piece (label = index into
	// res) when kSplit is asked to keep them.
	kept planar.ClipRings
}

// kSplit splits base among the candidate devices cand (vertex indices of
// t) and measures each non-empty piece at range r (see the file comment).
// Results go to sc.res (reset first); with keep, the pieces' rings go to
// sc.kept (reset first). valid (nil: every vertex counts) decides whether a
// candidate vertex is a point of the piece.
func kSplit(t *planar.Triangulation, base *planar.ClipRings, cand []int32, r float64,
	valid func(int32, float64, float64) bool, keep bool, sc *kSplitScratch) {
	sc.res = sc.res[:0]
	if keep {
		sc.kept.Reset()
	}
	for wi, w := range cand {
		wx, wy := t.Coords[2*w], t.Coords[2*w+1]
		cur := base
		// Nearest candidates first: their half-planes cut most, so an empty
		// piece is found after few clips.
		sc.order = sc.order[:0]
		for _, u := range cand {
			if u != w {
				dx, dy := t.Coords[2*u]-wx, t.Coords[2*u+1]-wy
				sc.order = append(sc.order, kByDist{dx*dx + dy*dy, u})
			}
		}
		kSortByDist(sc.order)
		for _, o := range sc.order {
			u := o.v
			cur = kCut(planar.Bisector(wx, wy, t.Coords[2*u], t.Coords[2*u+1]), cur, &sc.cur, &sc.next)
			if len(cur.XY) == 0 {
				break
			}
		}
		if len(cur.XY) == 0 {
			continue
		}
		a, d, far, fx, fy := planMeasures(cur, wx, wy, r, valid)
		if keep {
			for k := 0; k < cur.NumRings(); k++ {
				sc.kept.AppendRing(cur.Ring(k), int32(len(sc.res)))
				// AppendRing marks every vertex as a point of the set;
				// carry the candidate bits along for later farthest tests.
				copy(sc.kept.Prov[len(sc.kept.Prov)-len(cur.RingProv(k)):], cur.RingProv(k))
			}
		}
		sc.res = append(sc.res, kPiece{cand: int32(wi), area: a, disk: d, far: far, fx: fx, fy: fy})
	}
}

// kByDist is a candidate device with its squared distance from a point.
type kByDist struct {
	d2 float64
	v  int32
}

// kSortByDist sorts a short list by increasing distance, ties by vertex
// (insertion sort: the lists hold a few dozen entries at most).
func kSortByDist(a []kByDist) {
	for i := 1; i < len(a); i++ {
		x := a[i]
		j := i
		for j > 0 && (a[j-1].d2 > x.d2 || a[j-1].d2 == x.d2 && a[j-1].v > x.v) {
			a[j] = a[j-1]
			j--
		}
		a[j] = x
	}
}

// kCut clips cur by hp when some vertex of cur lies outside it, leaving the
// result in **a (the previous *a goes to *b, reused as scratch; both are
// allocated on first use), and returns the set now current: cur itself
// when nothing was cut. The two are swapped as pointers, not copied.
func kCut(hp planar.HalfPlane, cur *planar.ClipRings, a, b **planar.ClipRings) *planar.ClipRings {
	if !hp.SomeOutside(cur.XY) {
		return cur
	}
	if *a == nil {
		*a = &planar.ClipRings{}
	}
	if *b == nil {
		*b = &planar.ClipRings{}
	}
	hp.ClipSet(cur, *b)
	*a, *b = *b, *a
	return *a
}
