// One k-coverage level k ≥ 2 from the order-(k−1) sets (kcover.go): the
// sets run in parallel chunks of kSetChunk (each computing its sets'
// pieces, kcover_pieces.go), merged in chunk order so the sums do not
// depend on the number of threads; the k-cover range and its devices; and,
// for levels not asked for, the order-k sets alone (kLevelEnumerate).

package coverage

import (
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// kChunk accumulates one chunk of sets of a level.
type kChunk struct {
	covered, pieceArea float64
	pieces             int
	far, fx, fy        float64
	farSet             []int32 // S then q of the farthest vertex
	next               []int32 // the order-k sets found, stride k
	store              *kStore
}

// kScratch is per-chunk scratch space of kLevelBuild.
type kScratch struct {
	nb     []int32
	cand   []int32
	cell   planar.ClipRings
	a, b   *planar.ClipRings // clip scratch, swapped by kCut
	hit    []bool
	split  kSplitScratch
	holdFn func(int32, float64, float64) bool
	tset   []int32
	box    []float64
	pairs  []kByDist
}

// kNextPerSet is the room reserved per set for the sets of the next level
// (the mean number of pieces per order-k cell is below 4 for k ≥ 2 on
// random sites, 6 for k = 1: a reserve, not a limit).
const kNextPerSet = 4

// kSetChunk is the number of sets per chunk of a level (the unit of
// parallel work and of the fixed summation order).
const kSetChunk = 1024

// kLevelBuild computes level k ≥ 2 from the order-(k−1) sets (stride k−1,
// each ascending), returning the level and, with wantNext, the order-k sets
// (ascending tuples, sorted, distinct; they are always found, to count the
// cells).
func kLevelBuild(l *Layout, g *kGraph, k int, sets []int32, r float64, keep, wantNext bool) (KLevel, []int32) {
	m := k - 1
	ns := len(sets) / m
	nc := (ns + kSetChunk - 1) / kSetChunk
	chunks := make([]kChunk, nc)
	planar.ParallelChunks(ns, kSetChunk, 0, func(ci, lo, hi int) {
		sc := &kScratch{}
		sc.holdFn = func(_ int32, x, y float64) bool { return planCellHolds(&sc.cell.RingSet, x, y) }
		ch := &chunks[ci]
		ch.far = -1
		ch.next = make([]int32, 0, (hi-lo)*k*kNextPerSet)
		if keep {
			ch.store = &kStore{k: k, start: []int32{0}}
		}
		for i := lo; i < hi; i++ {
			kSetPieces(l, g, sets[i*m:(i+1)*m], r, keep, sc, ch)
		}
	})
	lv := KLevel{K: k}
	far, farSet, next := kMergeChunks(l, &lv, chunks, keep)
	lv.CoverRange = max(0, far)
	lv.CoverSites = kNearestFirst(l, farSet, lv.CoverPoint)
	next = kUniqueSets(next, k, l.Tri.NumVertices())
	lv.Cells = len(next) / k
	if !wantNext {
		next = nil
	}
	return lv, next
}

// kMergeChunks adds the chunks' areas, pieces and (with keep) stores to
// lv in chunk order, clamps the covered area to the site's and sets the
// share; it returns the largest of the chunks' far measures (−Inf with no
// chunk) with its point in lv.CoverPoint and its devices, and the next
// level's sets of every chunk concatenated.
func kMergeChunks(l *Layout, lv *KLevel, chunks []kChunk, keep bool) (far float64, farSet, next []int32) {
	far = math.Inf(-1)
	nn := 0
	for ci := range chunks {
		ch := &chunks[ci]
		lv.CoveredArea += ch.covered
		lv.PieceArea += ch.pieceArea
		lv.Pieces += ch.pieces
		if ch.far > far {
			far, lv.CoverPoint, farSet = ch.far, orb.Point{ch.fx, ch.fy}, ch.farSet
		}
		if keep {
			lv.store = append(lv.store, ch.store)
		}
		nn += len(ch.next)
	}
	next = make([]int32, 0, nn)
	for ci := range chunks {
		next = append(next, chunks[ci].next...)
		chunks[ci].next = nil
	}
	lv.CoveredArea = min(l.AreaM2, max(0, lv.CoveredArea))
	lv.Share = lv.CoveredArea / l.AreaM2
	return far, farSet, next
}

// kLevelEnumerate returns the order-k sets (ascending tuples, sorted,
// distinct) from the order-(k−1) sets, without the pieces: each order-k
// cell meeting the area is S ∪ {u} for an order-(k−1) cell S and a device
// u across one of its edges (kEnumerateSet). A superset near the area's
// boundary is harmless: a set whose cell misses the area gets no piece.
func kLevelEnumerate(l *Layout, g *kGraph, k int, sets []int32) []int32 {
	m := k - 1
	ns := len(sets) / m
	nc := (ns + kSetChunk - 1) / kSetChunk
	next := make([][]int32, nc)
	b := l.Area.Bound()
	box := []float64{b.Min[0], b.Min[1], b.Max[0], b.Min[1], b.Max[0], b.Max[1], b.Min[0], b.Max[1]}
	planar.ParallelChunks(ns, kSetChunk, 0, func(ci, lo, hi int) {
		sc := &kScratch{}
		out := make([]int32, 0, (hi-lo)*k*kNextPerSet)
		for i := lo; i < hi; i++ {
			S := sets[i*m : (i+1)*m]
			for _, u := range kEnumerateSet(l, g, S, box, sc) {
				sc.tset = append(append(sc.tset[:0], S...), u)
				slices.Sort(sc.tset)
				out = append(out, sc.tset...)
			}
		}
		next[ci] = out
	})
	return kUniqueSets(slices.Concat(next...), k, l.Tri.NumVertices())
}

// kEnumerateSet returns the devices u such that S ∪ {u} may be an order-k
// cell meeting the area. For one member v these are its Delaunay
// neighbours. Otherwise C_S is clipped from a box holding C_S ∩ A (the
// members' cell boxes when their cells lie inside the area, else the
// area's bounding box) and the devices across its edges are taken
// (kEdgeCandidates); an edge along the box (a piece of C_S may reach the
// area there without touching C_S's own edges inside the box) takes all of
// N(S).
func kEnumerateSet(l *Layout, g *kGraph, S []int32, areaBox []float64, sc *kScratch) []int32 {
	t := l.Tri
	sc.nb = kNeighbourhood(t, g, S, sc.nb)
	if len(S) == 1 || len(sc.nb) == 0 {
		return sc.nb
	}
	sc.cell.Reset()
	box := areaBox
	if kAllInner(g, S) {
		box = kCellsBox(g, S, sc.box[:0])
		sc.box = box
	}
	sc.cell.AppendRing(box, S[0])
	cs := kRestrict(t, &sc.cell, S, -1, sc.nb, sc)
	if cs == nil {
		return nil
	}
	if box[0] == areaBox[0] && box[1] == areaBox[1] && box[4] == areaBox[4] && box[5] == areaBox[5] && kTouchesBox(cs, box) {
		return sc.nb
	}
	sc.cand = kEdgeCandidates(t, cs, sc.nb, sc.cand[:0])
	return sc.cand
}

// kTouchesBox reports whether some edge of the rings lies along a side of
// the axis-parallel box (x0, y0, x1, y0, x1, y1, x0, y1): a crossing of a
// box side keeps that side's coordinate exactly (a + t·0).
func kTouchesBox(cs *planar.ClipRings, box []float64) bool {
	x0, y0, x1, y1 := box[0], box[1], box[4], box[5]
	for k := 0; k < cs.NumRings(); k++ {
		ring := cs.Ring(k)
		n := len(ring) / 2
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			ax, ay, bx, by := ring[2*i], ring[2*i+1], ring[2*j], ring[2*j+1]
			if ax == bx && (ax == x0 || ax == x1) || ay == by && (ay == y0 || ay == y1) {
				return true
			}
		}
	}
	return false
}

// kNearestFirst returns the input indices of the vertices vs ordered by
// distance from p (ties by input index).
func kNearestFirst(l *Layout, vs []int32, p orb.Point) []int {
	if len(vs) == 0 {
		return nil
	}
	vv := slices.Clone(vs)
	t := l.Tri
	d := func(v int32) float64 { return math.Hypot(t.Coords[2*v]-p[0], t.Coords[2*v+1]-p[1]) }
	slices.SortFunc(vv, func(a, b int32) int {
		if c := cmp.Compare(d(a), d(b)); c != 0 {
			return c
		}
		return cmp.Compare(t.Source[a], t.Source[b])
	})
	out := make([]int, len(vv))
	for i, v := range vv {
		out[i] = int(t.Source[v])
	}
	return out
}
