// Polygon overlay, step 1: noding. The rings of both operands are split at
// every point where two edges meet, until any two edges either are
// disjoint, share exactly one endpoint, or coincide.
//
// Pairs of edges are found with the uniform grid of region.go (Franklin,
// "Adaptive grids for geometric operations", Cartographica 21, 1984) and
// classified with the exact Orient2D predicate. An endpoint lying on
// another edge splits that edge at the endpoint itself (exact, no new
// coordinate). A proper crossing splits both edges at the crossing point,
// rounded to float64:
//
//	oa = orient(c, d, a), ob = orient(c, d, b)   (opposite signs)
//	t  = oa / (oa − ob),  p = a + t (b − a)       (or from b when t > ½)
//
// oa and ob are evaluated as exact expansions (Shewchuk 1997, as in
// expansion.go) and rounded, so each has relative error ≤ 2ε (ε = 2⁻⁵³);
// the denominator has no cancellation (the signs differ), so t has relative
// error ≤ 6ε and, with min(t, 1−t) ≤ ½, each coordinate of p is within
// about 4ε·|b − a| + ½ ulp(p) of the true crossing: a few ulps of the
// larger of the segment's length and the coordinate. p is then clamped to
// the intersection of the two segments' bounding boxes, which holds the
// true point, so clamping only reduces the error.
//
// Snap rule. A rounded crossing point lies a few ulps off both segments,
// so the split pieces may now cross a third edge passing within ulps of
// it. Noding therefore repeats, on the refined rings and testing only
// pairs with a new piece, until a round finds nothing to split (iterated
// snapping to the float64 grid in the spirit of Hobby's snap rounding,
// "Practical segment intersection with finite precision output",
// Computational Geometry 13, 1999): the final edge set is noded exactly,
// as verified by that last round's exact predicates. A round whose split
// points all lie exactly on their edges needs no successor (the pieces
// cover the same points, and every contact is now a shared vertex). A
// split point is kept only once per edge and never at an endpoint, so no
// zero-length edge arises. A crossing point within booleanSnapRel (2⁻⁴⁶)
// times the coordinate magnitude of an endpoint of either edge is snapped
// to that endpoint (the hot pixel of snap rounding), so clusters of
// nearly concurrent edges converge on one vertex instead of producing new
// points ulps apart each round; input vertices never move, so points
// 1e-9 apart stay apart unless an edge crosses between them. Rounds are
// capped (booleanMaxNodeRounds); in practice a second round finds nothing.

package planar

import (
	"cmp"
	"fmt"
	"math"
	"slices"
)

// booleanMaxNodeRounds caps the noding rounds. Each round after the first
// only resolves crossings created by rounding the previous round's points,
// which are within a few ulps of them; two rounds are the rule.
const booleanMaxNodeRounds = 32

// booleanGridDensity is the number of grid cells per vertex for the pair
// search. Ring vertices lie along curves, not spread over the bounding
// box, so one cell per vertex puts many edges in each cell that a long
// boundary passes through; more cells cost more registrations per edge.
// 2 was no slower than 1, 4 or 8 on the SiteArea benchmarks.
const booleanGridDensity = 2

// booleanSnapRel is the snap radius for crossing points, relative to the
// largest coordinate magnitude of the two edges (2⁻⁴⁶, 64 ulps): a crossing
// point that close to an endpoint of either edge is replaced by that
// endpoint. Without it, nearly concurrent edges near a point where one
// coordinate is tiny (float64 is very fine near 0) can keep producing new
// crossing points ulps apart, round after round; with it, the edges are
// pulled into one vertex (a hot pixel in the sense of snap rounding).
const booleanSnapRel = 0x1p-46

// booleanSplit is a point at which ring edge e (from vertex e to its ring
// successor) must be split.
type booleanSplit struct {
	e    int32
	x, y float64
}

// booleanRingFault is a self-contact found while noding the input rings:
// edges e1 < e2 of the same ring, kind as regionGrid.edgePair.
type booleanRingFault struct {
	e1, e2 int32
	kind   int
}

// booleanNode splits the rings (xy, ringStart) until they are noded and
// returns the refined rings and, when the last round built it, the grid
// over them. In the first round, a contact between two edges of the same
// ring is a fault: the first such pair (in edge order) is returned and
// nothing is split.
func booleanNode(xy []float64, ringStart []int32) ([]float64, []int32, *regionGrid, *booleanRingFault, error) {
	var fresh []bool // edges created by the last round's splits; nil: all
	var last booleanSplit
	for round := 0; round < booleanMaxNodeRounds; round++ {
		g := &regionGrid{}
		g.buildDensity(xy, ringStart, booleanGridDensity)
		var ringOf []int32
		if round == 0 {
			ringOf = booleanRingOf(ringStart)
		}
		splits, fault := booleanFindSplits(g, ringOf, fresh)
		if fault != nil {
			return nil, nil, nil, fault, nil
		}
		if len(splits) == 0 {
			return xy, ringStart, g, nil, nil
		}
		last = splits[0]
		exact := booleanSplitsExact(g, splits)
		xy, ringStart, fresh = booleanApplySplits(xy, ringStart, g.next, splits)
		if exact {
			// Every split point lies exactly on its edge: the pieces cover
			// the same points as before and every contact is now a shared
			// vertex, so no further round can find anything.
			return xy, ringStart, nil, nil, nil
		}
	}
	// Rounded crossing points that keep creating crossings: edges
	// within ulps of one another near the last split point.
	return nil, nil, nil, nil, &NearDegenerateError{X: last.x, Y: last.y,
		Detail: fmt.Sprintf("noding did not settle after %d rounds (rounded crossing points keep creating crossings)", booleanMaxNodeRounds)}
}

// booleanSplitsExact reports whether every split point lies exactly on
// its edge (always so for touching endpoints; for a crossing point when it
// is representable, e.g. where axis-parallel edges cross, the bounding-box
// clamp of booleanCrossing makes it exact).
func booleanSplitsExact(g *regionGrid, splits []booleanSplit) bool {
	for _, sp := range splits {
		e, n := sp.e, g.next[sp.e]
		if Orient2D(g.xy[2*e], g.xy[2*e+1], g.xy[2*n], g.xy[2*n+1], sp.x, sp.y) != 0 {
			return false
		}
	}
	return true
}

// booleanRingOf returns the ring index of every vertex.
func booleanRingOf(ringStart []int32) []int32 {
	ringOf := make([]int32, ringStart[len(ringStart)-1])
	for k := 0; k+1 < len(ringStart); k++ {
		for i := ringStart[k]; i < ringStart[k+1]; i++ {
			ringOf[i] = int32(k)
		}
	}
	return ringOf
}

// booleanFindSplits tests every pair of edges sharing a grid cell. If
// ringOf is not nil, pairs within one ring are checked for contact instead
// (the input must be simple rings) and the first fault is returned. If
// fresh is not nil, only pairs with a fresh edge are tested: a pair of
// edges that the previous round tested and left unsplit has no contact.
func booleanFindSplits(g *regionGrid, ringOf []int32, fresh []bool) ([]booleanSplit, *booleanRingFault) {
	var splits []booleanSplit
	var fault *booleanRingFault
	g.cellPairs(func(a, b int32) {
		if fresh != nil && !fresh[a] && !fresh[b] {
			return
		}
		if ringOf != nil && ringOf[a] == ringOf[b] {
			if fault != nil && (a > fault.e1 || a == fault.e1 && b >= fault.e2) {
				return
			}
			if kind := g.edgePair(a, b); kind != 0 {
				fault = &booleanRingFault{a, b, kind}
			}
			return
		}
		splits = booleanPairSplits(g, a, b, splits)
	})
	return splits, fault
}

// booleanPairSplits appends the split points of edges a and b (different
// edges) caused by their contact: an endpoint of one in the relative
// interior of the other, or a proper crossing.
func booleanPairSplits(g *regionGrid, a, b int32, splits []booleanSplit) []booleanSplit {
	an, bn := g.next[a], g.next[b]
	ax, ay, bx, by := g.xy[2*a], g.xy[2*a+1], g.xy[2*an], g.xy[2*an+1]
	cx, cy, dx, dy := g.xy[2*b], g.xy[2*b+1], g.xy[2*bn], g.xy[2*bn+1]
	if max(ax, bx) < min(cx, dx) || max(cx, dx) < min(ax, bx) ||
		max(ay, by) < min(cy, dy) || max(cy, dy) < min(ay, by) {
		return splits
	}
	o1 := Orient2D(ax, ay, bx, by, cx, cy)
	o2 := Orient2D(ax, ay, bx, by, dx, dy)
	if o1 > 0 && o2 > 0 || o1 < 0 && o2 < 0 {
		return splits
	}
	o3 := Orient2D(cx, cy, dx, dy, ax, ay)
	o4 := Orient2D(cx, cy, dx, dy, bx, by)
	if o3 > 0 && o4 > 0 || o3 < 0 && o4 < 0 {
		return splits
	}
	if o1 != 0 && o2 != 0 && o3 != 0 && o4 != 0 {
		px, py := booleanCrossing(ax, ay, bx, by, cx, cy, dx, dy, o3, o4)
		px, py = booleanSnap(px, py, ax, ay, bx, by, cx, cy, dx, dy)
		if !(px == ax && py == ay) && !(px == bx && py == by) {
			splits = append(splits, booleanSplit{a, px, py})
		}
		if !(px == cx && py == cy) && !(px == dx && py == dy) {
			splits = append(splits, booleanSplit{b, px, py})
		}
		return splits
	}
	// Touching or collinear: split at endpoints strictly inside the other.
	if o1 == 0 && booleanStrictlyInside(ax, ay, bx, by, cx, cy) {
		splits = append(splits, booleanSplit{a, cx, cy})
	}
	if o2 == 0 && booleanStrictlyInside(ax, ay, bx, by, dx, dy) {
		splits = append(splits, booleanSplit{a, dx, dy})
	}
	if o3 == 0 && booleanStrictlyInside(cx, cy, dx, dy, ax, ay) {
		splits = append(splits, booleanSplit{b, ax, ay})
	}
	if o4 == 0 && booleanStrictlyInside(cx, cy, dx, dy, bx, by) {
		splits = append(splits, booleanSplit{b, bx, by})
	}
	return splits
}

// booleanSnap returns the endpoint among a, b, c, d nearest to p (in the
// max norm) if it lies within booleanSnapRel times their largest
// coordinate magnitude, else p itself.
func booleanSnap(px, py, ax, ay, bx, by, cx, cy, dx, dy float64) (float64, float64) {
	m := max(math.Abs(ax), math.Abs(ay), math.Abs(bx), math.Abs(by), math.Abs(cx), math.Abs(cy), math.Abs(dx), math.Abs(dy))
	best, qx, qy := booleanSnapRel*m, px, py
	for _, q := range [4][2]float64{{ax, ay}, {bx, by}, {cx, cy}, {dx, dy}} {
		if d := max(math.Abs(q[0]-px), math.Abs(q[1]-py)); d <= best {
			best, qx, qy = d, q[0], q[1]
		}
	}
	return qx, qy
}

// booleanStrictlyInside reports whether p, known to be collinear with a
// and b, lies on the segment ab and is neither endpoint. Exact.
func booleanStrictlyInside(ax, ay, bx, by, px, py float64) bool {
	if px == ax && py == ay || px == bx && py == by {
		return false
	}
	return px >= math.Min(ax, bx) && px <= math.Max(ax, bx) && py >= math.Min(ay, by) && py <= math.Max(ay, by)
}

// booleanCrossing returns the crossing point of segments ab and cd, which
// cross properly, rounded as described in the file comment. The signs of
// orient(c, d, a) and orient(c, d, b) are given (o3, o4, nonzero, opposite).
func booleanCrossing(ax, ay, bx, by, cx, cy, dx, dy, o3, o4 float64) (float64, float64) {
	oa := booleanOrientValue(cx, cy, dx, dy, ax, ay)
	ob := booleanOrientValue(cx, cy, dx, dy, bx, by)
	// Exact values carry the signs of o3, o4; guard against a zero estimate.
	if oa == 0 || (oa > 0) != (o3 > 0) || ob == 0 || (ob > 0) != (o4 > 0) {
		oa, ob = o3, o4
	}
	var px, py float64
	if t := oa / (oa - ob); t <= 0.5 {
		px, py = ax+t*(bx-ax), ay+t*(by-ay)
	} else {
		s := ob / (ob - oa)
		px, py = bx+s*(ax-bx), by+s*(ay-by)
	}
	// Clamp to both bounding boxes (they hold the true point).
	px = math.Min(math.Max(px, math.Max(math.Min(ax, bx), math.Min(cx, dx))), math.Min(math.Max(ax, bx), math.Max(cx, dx)))
	py = math.Min(math.Max(py, math.Max(math.Min(ay, by), math.Min(cy, dy))), math.Min(math.Max(ay, by), math.Max(cy, dy)))
	return px, py
}

// booleanOrientValue returns (ax−cx)(by−cy) − (ay−cy)(bx−cx) evaluated as
// an exact expansion and rounded: relative error ≤ 2ε for inputs within
// the exact range of Orient2D (see predicates.go); outside it the float64
// estimate from Orient2D is returned.
func booleanOrientValue(ax, ay, bx, by, cx, cy float64) float64 {
	if !safe6(ax, ay, bx, by, cx, cy, orientLo, orientHi) {
		return Orient2D(ax, ay, bx, by, cx, cy)
	}
	acx1, acx0 := twoDiff(ax, cx)
	bcy1, bcy0 := twoDiff(by, cy)
	acy1, acy0 := twoDiff(ay, cy)
	bcx1, bcx0 := twoDiff(bx, cx)
	var p, q [8]float64
	np := booleanTwoTwoProduct(acx1, acx0, bcy1, bcy0, p[:])
	nq := booleanTwoTwoProduct(acy1, acy0, bcx1, bcx0, q[:])
	negateExpansion(q[:nq])
	var h [16]float64
	n := expansionSum(p[:np], q[:nq], h[:])
	return estimate(h[:n])
}

// booleanTwoTwoProduct writes the exact product (a1+a0)(b1+b0) of two
// two-component expansions (|a0| ≤ ulp(a1)/2, likewise b) into h and
// returns its length.
func booleanTwoTwoProduct(a1, a0, b1, b0 float64, h []float64) int {
	e := [2]float64{a0, a1}
	var s, t [4]float64
	ns := scaleExpansion(e[:], b1, s[:])
	if b0 == 0 {
		return copy(h, s[:ns])
	}
	nt := scaleExpansion(e[:], b0, t[:])
	return expansionSum(s[:ns], t[:nt], h)
}

// booleanApplySplits inserts the split points into their edges, in order
// along each edge, and returns the refined rings and which of their edges
// are new (pieces of a split edge).
func booleanApplySplits(xy []float64, ringStart []int32, next []int32, splits []booleanSplit) ([]float64, []int32, []bool) {
	slices.SortFunc(splits, func(p, q booleanSplit) int {
		if c := cmp.Compare(p.e, q.e); c != 0 {
			return c
		}
		// Along the edge: by the dominant coordinate, in the edge's
		// direction; ties (points ulps off the edge) by the other one, so
		// equal points end up adjacent and are kept once.
		e, n := p.e, next[p.e]
		dx, dy := xy[2*n]-xy[2*e], xy[2*n+1]-xy[2*e+1]
		pu, qu, pv, qv := p.x, q.x, p.y, q.y
		if math.Abs(dx) < math.Abs(dy) {
			pu, qu, pv, qv, dx = p.y, q.y, p.x, q.x, dy
		}
		if dx < 0 {
			pu, qu = qu, pu
		}
		if c := cmp.Compare(pu, qu); c != 0 {
			return c
		}
		return cmp.Compare(pv, qv)
	})
	out := make([]float64, 0, len(xy)+4*len(splits))
	fresh := make([]bool, 0, cap(out)/2)
	rs := make([]int32, 1, len(ringStart))
	s := 0
	for k := 0; k+1 < len(ringStart); k++ {
		for e := ringStart[k]; e < ringStart[k+1]; e++ {
			x, y := xy[2*e], xy[2*e+1]
			out = append(out, x, y)
			fresh = append(fresh, false)
			split := len(fresh) - 1
			n := next[e]
			nx, ny := xy[2*n], xy[2*n+1]
			lx, ly := x, y
			for ; s < len(splits) && splits[s].e == e; s++ {
				sx, sy := splits[s].x, splits[s].y
				if sx == lx && sy == ly || sx == nx && sy == ny {
					continue
				}
				out = append(out, sx, sy)
				fresh = append(fresh, true)
				fresh[split] = true
				lx, ly = sx, sy
			}
		}
		rs = append(rs, int32(len(out)/2))
	}
	return out, rs, fresh
}
