// Exact k-coverage: the part of the site area reached by at least k
// devices, the range at which all of it is, and how that share grows with
// the range, for k = 1 … K.
//
// Order-k pieces (Lee's construction). D.-T. Lee, "On k-nearest neighbor
// Voronoi diagrams in the plane", IEEE Trans. Computers 31, 1982, builds
// the order-k Voronoi diagram (Shamos & Hoey, FOCS 1975) from order k−1:
// inside the order-(k−1) cell C_S of a set S of k−1 devices, the k-th
// nearest device of a point is its nearest device of P \ S, so C_S is split
// by the Voronoi diagram of P \ S; the piece (S, q) is where S are the k−1
// nearest devices and q the k-th. Within (S, q) a point x is reached by at
// least k devices at range r exactly when |x − q| ≤ r, so
//
//	k-covered area(r) = Σ_{pieces (S,q)} area((S,q) ∩ A ∩ D(q, r)),
//
// each term the closed form of planar.RingDiskArea (no sampling), and the
// k-cover range — the largest k-th-nearest distance over the area — is the
// largest |x − q| over the vertices x of the pieces (a convex function's
// maximum over a polygon is at a vertex). Pieces need not be merged into
// order-k cells for either.
//
// Candidates. The sites in a closed disk induce a connected subgraph of
// the Delaunay triangulation, so the k nearest devices of a point (the
// sites in the disk through its k-th nearest) are connected, and the k-th
// nearest q of a point of C_S is a Delaunay neighbour of S: q ∈ N(S), the
// union of the neighbour lists of S minus S. Hence, exactly (up to sets of
// zero area, where ties let two pieces claim a boundary),
//
//	C_S ∩ A       = ⋃_{v ∈ S} (V_v ∩ A) ∩ ⋂_{s ∈ S\{v}, u ∈ N(S)} H(s, u)
//	(S, q) ∩ A    = C_S ∩ A ∩ ⋂_{u ∈ N(S)\{q}} H(q, u),
//
// V_v ∩ A the Voronoi cell of v clipped to the area (planar.ClipCells, with
// holes and several parts), H(a, b) the half-plane nearer a than b. The
// sub-piece of (S, q) in V_v is clipped with planar.HalfPlane
// (kcover_split.go); for k = 2, S = {v}, C_S = V_v and the split is the one
// the single-failure analysis makes (plan_failures.go), through the same
// function, so the 2-cover range equals FailureReport.SurviveRange to the
// last digit (TestKCoverFailures). The order-k sets are the S ∪ {q} of the
// non-empty pieces, deduplicated; level k+1 starts from them.
//
// Cells inside the area. When the clipped cells of all members of S are
// whole Voronoi cells (inside the area, no hole), C_S ∩ A = C_S, a convex
// polygon: it is clipped once from the bounding box of those cells (which
// holds C_S ⊂ ⋃ V_s) rather than once per member, and split only among the
// devices across its edges (kEdgeCandidates): every piece of C_S holds a
// strip along a whole edge of C_S.
//
// Levels not asked for (KOptions.Levels) are only enumerated: their sets
// come from the devices across the edges of the cells of the level below
// (kLevelEnumerate), without pieces or measures.
//
// k = 1 is the ordinary analysis: its figures are the Layout's own
// (UncoveredArea, FullCover, Curve), not recomputed.
//
// Cost. Lee's bound: the order-k diagram of n sites has O(k(n − k)) cells
// (at most (2k − 1)n − k² + 1 in general position); a cell inside the area
// costs O(k·|N(S)|) half-plane tests and a few clips of a small convex
// polygon, one meeting the area's boundary O(k) sub-pieces of O(|N(S)|²)
// clips; so a level costs O(k² n) small clips, in parallel over the sets.
//
// Duplicates (devices at exactly the same spot) count once: "reached by k
// devices" means k distinct positions; KCover warns when it merged some.
//
// Error bounds: those of planar/halfplane.go and planar.RingDiskArea: areas
// to a relative error of order 1e-14 of the area, sums in a fixed order
// (independent of the number of threads); ranges exact up to the rounding
// of the clipped vertices (about 1e-15 relative of the coordinates).

package coverage

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// KMaxDefault is the largest k computed when KOptions.MaxK is 0.
const KMaxDefault = 3

// KOptions selects what KCover computes.
type KOptions struct {
	// MaxK is the largest k (levels 1 … MaxK are computed); 0 means
	// KMaxDefault. Ignored when Levels is set.
	MaxK int
	// Levels lists the k to compute and report (any order, repeats
	// allowed); the levels in between are only enumerated (their order-k
	// sets, not their pieces). nil: 1 … MaxK.
	Levels []int
	// CurveSamples is the number of ranges on each coverage-depth curve,
	// evenly spaced from 0 to the largest k-cover range (0: no curve).
	CurveSamples int
	// Gaps asks for the k-gaps at the planned range (see kcover_gaps.go).
	Gaps bool
	// ChordTolerance is the largest distance between a gap outline's arc
	// and its chords (metres); 0 means DefaultChordTolerance.
	ChordTolerance float64

	keepPieces bool // keep the pieces (for ReachAdditions) without curve or gaps
}

// KLevel is the k-coverage of a layout for one k.
type KLevel struct {
	// K is the number of devices that must reach a spot.
	K int
	// CoveredArea is the area reached by at least K devices at the planned
	// range (m²).
	CoveredArea float64
	// Share is CoveredArea divided by the site area, in [0, 1].
	Share float64
	// CoverRange is the k-cover range: the smallest common range at which
	// every spot of the area is reached by K devices (the largest K-th
	// nearest distance over the area).
	CoverRange float64
	// With own ranges (KCoverRanges, ranges not all equal) CoverRange is
	// the distance from CoverPoint to the K-th device there; the figure to
	// plan with is then CoverPower and CoverRanges.
	//
	// CoverPoint is a spot that needs CoverRange.
	CoverPoint orb.Point
	// CoverSites are the input indices of the K devices nearest
	// CoverPoint, nearest first (with own ranges: smallest power first).
	CoverSites []int
	// CoverPower is set by KCoverRanges: the largest K-th smallest power
	// π(x) = |x − p_i|² − r_i² over the area (m²), at CoverPoint. Growing
	// every range to √(r_i² + CoverPower) reaches every spot by K devices,
	// and no smaller uniform growth does; ≤ 0 when the planned ranges
	// already do. With equal ranges r it is CoverRange² − r².
	CoverPower float64
	// CoverRanges is set by KCoverRanges: the range each device needs
	// under that growth, by input index (hidden devices included; 0 where
	// √(r_i² + CoverPower) is not real). With equal ranges every entry is
	// CoverRange.
	CoverRanges []float64
	// Cells is the number of order-K Voronoi cells meeting the area
	// (distinct sets of K nearest devices).
	Cells int
	// Pieces is the number of pieces (S, q) meeting the area: K−1 nearest
	// devices S and K-th nearest q (Lee's construction).
	Pieces int
	// PieceArea is the sum of the piece areas: the site area, to rounding
	// (the pieces tile it).
	PieceArea float64
	// Curve is the coverage-depth curve: the share reached by at least K
	// devices at each range of KCoverage.CurveRanges, each point exact.
	Curve []float64
	// Gaps are the k-gaps at the planned range (only with KOptions.Gaps).
	Gaps []KGap

	store []*kStore // the pieces, kept for the curve and the gaps
}

// KCoverage is the k-coverage of a layout for k = 1 … MaxK.
type KCoverage struct {
	// Range is the planned range the areas and gaps refer to (metres).
	Range float64
	// AreaM2 is the site area (m²).
	AreaM2 float64
	// Devices is the number of distinct device positions.
	Devices int
	// Warnings lists remarks on the input (merged duplicates).
	Warnings []string
	// CurveRanges are the ranges of every level's Curve.
	CurveRanges []float64
	// Levels holds the levels asked for, by increasing k.
	Levels []KLevel

	// OwnRanges is set by KCoverRanges: the levels carry CoverPower and
	// CoverRanges, the gaps ClosingPower, and Range is 0 unless the ranges
	// are all equal (then it is that range and every figure is KCover's).
	OwnRanges bool

	hasGaps bool   // the levels' gaps were computed (KOptions.Gaps)
	dev     *kDevs // the devices with their own ranges (nil: one common range)
}

// ErrKTooLarge is returned (wrapped) when k exceeds the number of distinct
// devices.
var ErrKTooLarge = errors.New("k exceeds the number of distinct devices")

// KCover computes the k-coverage of the layout at the planned range r for
// k = 1 … opt.MaxK (see the file comment for the method).
func KCover(l *Layout, r float64, opt KOptions) (*KCoverage, error) {
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("coverage: KCover: %w", err)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r < 0 {
		return nil, fmt.Errorf("coverage: KCover: range %v must be a finite number ≥ 0", r)
	}
	nv := l.Tri.NumVertices()
	want, K, tol, err := kCheckOptions(opt, nv)
	if err != nil {
		return nil, fmt.Errorf("coverage: KCover: %w", err)
	}
	kc := &KCoverage{Range: r, AreaM2: l.AreaM2, Devices: nv}
	kc.warnDuplicates(len(l.Sites) - nv)
	keep := opt.CurveSamples > 0 || opt.Gaps || opt.keepPieces
	if want[1] {
		kc.Levels = append(kc.Levels, kLevelOne(l, r))
	}
	sets := kFirstSets(l)
	var g *kGraph
	if K > 2 {
		g = newKGraph(l.Tri, l.Cells)
	}
	for k := 2; k <= K; k++ {
		if !want[k] {
			sets = kLevelEnumerate(l, g, k, sets)
			continue
		}
		lv, next := kLevelBuild(l, g, k, sets, r, keep, k < K)
		kc.Levels = append(kc.Levels, lv)
		sets = next
	}
	if opt.CurveSamples > 0 {
		top := 0.0
		for _, lv := range kc.Levels {
			top = math.Max(top, lv.CoverRange)
		}
		kc.CurveRanges = make([]float64, opt.CurveSamples)
		for i := range kc.CurveRanges {
			if opt.CurveSamples > 1 {
				kc.CurveRanges[i] = top * float64(i) / float64(opt.CurveSamples-1)
			}
		}
		for i := range kc.Levels {
			kc.Levels[i].Curve = kc.SharesAt(l, kc.Levels[i].K, kc.CurveRanges)
		}
	}
	if opt.Gaps {
		kc.allGaps(l, tol)
	}
	return kc, nil
}

// allGaps computes the k-gaps of every level. The levels are independent
// and run in parallel (the serial overlay of each level's merge then
// overlaps with the others' work), the largest (highest k) first.
func (kc *KCoverage) allGaps(l *Layout, tol float64) {
	kc.hasGaps = true
	n := len(kc.Levels)
	planar.ParallelChunks(n, 1, 0, func(ci, _, _ int) {
		i := n - 1 - ci
		kc.Levels[i].Gaps = kc.gaps(l, i, tol)
		if kc.Levels[i].K > 1 {
			kgMergeOutlines(kc.Levels[i].Gaps)
		}
	})
}

// warnDuplicates notes d devices merged with another at the same spot.
func (kc *KCoverage) warnDuplicates(d int) {
	if d > 0 {
		kc.Warnings = append(kc.Warnings, fmt.Sprintf("%d devices stand at exactly the same spot as another; each spot counts once", d))
	}
}

// kCheckOptions checks opt for a layout of nv distinct devices: the
// levels asked for (kWanted) and the chord tolerance (0: the default).
func kCheckOptions(opt KOptions, nv int) ([]bool, int, float64, error) {
	want, K, err := kWanted(opt, nv)
	if err != nil {
		return nil, 0, 0, err
	}
	if opt.CurveSamples < 0 {
		return nil, 0, 0, fmt.Errorf("%d curve samples", opt.CurveSamples)
	}
	tol := opt.ChordTolerance
	if tol == 0 {
		tol = DefaultChordTolerance
	}
	if !(tol > 0) || math.IsInf(tol, 0) {
		return nil, 0, 0, fmt.Errorf("chord tolerance %v must be a finite number > 0", opt.ChordTolerance)
	}
	return want, K, tol, nil
}

// kFirstSets returns the order-1 sets: the vertices with a non-empty
// clipped cell.
func kFirstSets(l *Layout) []int32 {
	nv := l.Tri.NumVertices()
	sets := make([]int32, 0, nv)
	for v := int32(0); v < int32(nv); v++ {
		if l.Cells.SiteStart[v] < l.Cells.SiteStart[v+1] {
			sets = append(sets, v)
		}
	}
	return sets
}

// kLevelOne is level 1 from the layout's own figures.
func kLevelOne(l *Layout, r float64) KLevel {
	unc := l.UncoveredArea(r)
	fc := l.FullCover()
	lv := KLevel{K: 1, CoveredArea: l.AreaM2 - unc, Share: coveredFromUncovered(unc, l.AreaM2), CoverRange: fc.Range}
	if len(fc.Worst) > 0 {
		lv.CoverPoint = fc.Worst[0]
		lv.CoverSites = []int{fc.WorstSites[0]}
	}
	lv.Cells, lv.PieceArea = kCellCount(l)
	lv.Pieces = lv.Cells
	return lv
}

// kCellCount returns the number of non-empty clipped cells of the layout
// and the sum of their areas.
func kCellCount(l *Layout) (int, float64) {
	n, a := 0, 0.0
	nv := l.Tri.NumVertices()
	for v := 0; v < nv; v++ {
		if l.Cells.SiteStart[v] < l.Cells.SiteStart[v+1] {
			n++
		}
		a += l.Cells.Area[v]
	}
	return n, a
}

// Level returns the computed level k, nil when k was not asked for.
func (kc *KCoverage) Level(k int) *KLevel {
	for i := range kc.Levels {
		if kc.Levels[i].K == k {
			return &kc.Levels[i]
		}
	}
	return nil
}

// kWanted checks the levels asked for and returns them as a mask over
// 0 … K, with K the largest.
func kWanted(opt KOptions, nv int) ([]bool, int, error) {
	ks := opt.Levels
	if ks == nil {
		K := opt.MaxK
		if K == 0 {
			K = KMaxDefault
		}
		if K < 1 {
			return nil, 0, fmt.Errorf("k = %d must be at least 1", K)
		}
		for k := 1; k <= K; k++ {
			ks = append(ks, k)
		}
	}
	if len(ks) == 0 {
		return nil, 0, errors.New("no k asked for")
	}
	K := slices.Max(ks)
	if K > nv {
		return nil, 0, fmt.Errorf("k = %d but the layout has %d distinct devices: %w", K, nv, ErrKTooLarge)
	}
	want := make([]bool, K+1)
	for _, k := range ks {
		if k < 1 {
			return nil, 0, fmt.Errorf("k = %d must be at least 1", k)
		}
		want[k] = true
	}
	return want, K, nil
}

// SharesAt returns the share of the area reached by at least k devices at
// each of the ranges, each exact (the sum over the pieces of the piece ∩
// disk areas). It needs the pieces kept by KCover (CurveSamples > 0 or
// Gaps); k = 1 uses the layout's coverage curve. With own ranges (not all
// equal) there is no common range: NaN.
func (kc *KCoverage) SharesAt(l *Layout, k int, ranges []float64) []float64 {
	out := make([]float64, len(ranges))
	if kc.dev != nil {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	if k == 1 {
		cv := l.Curve()
		for i, r := range ranges {
			out[i] = cv.CoveredFraction(r)
		}
		return out
	}
	lv := kc.Level(k)
	if lv == nil {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	part := make([][]float64, len(lv.store))
	planar.ParallelChunks(len(lv.store), 1, 0, func(ci, _, _ int) {
		part[ci] = lv.store[ci].diskAreas(l, ranges)
	})
	for i := range out {
		s := 0.0
		for _, p := range part {
			s += p[i]
		}
		out[i] = min(1, max(0, s/kc.AreaM2))
	}
	return out
}

// kStore keeps the sub-pieces of one chunk of sets: the rings of each
// (label = sub-piece index) and per sub-piece its base vertex v, its
// devices S ∪ {q} (q last) and its measures.
type kStore struct {
	k     int
	rings planar.ClipRings
	v     []int32
	set   []int32 // stride k: S ascending, then q
	area  []float64
	near  []float64 // distance from q to the sub-piece boundary
	far   []float64 // distance from q to its farthest vertex
	fx    []float64
	fy    []float64
	start []int32 // rings start[i] … start[i+1]−1 are sub-piece i's
}

// pieceRings returns the ring index range of sub-piece i.
func (s *kStore) pieceRings(i int) (int, int) { return int(s.start[i]), int(s.start[i+1]) }

// diskAreas returns, per range, the sum over the sub-pieces of the area
// within that range of their k-th device. A sub-piece lies outside the open
// disk of radius near (q is never inside its own piece for k ≥ 2: at q, q
// itself is the nearest device) and inside the disk of radius far.
func (s *kStore) diskAreas(l *Layout, ranges []float64) []float64 {
	out := make([]float64, len(ranges))
	xy := l.Tri.Coords
	for i := range s.v {
		q := s.set[i*s.k+s.k-1]
		qx, qy := xy[2*q], xy[2*q+1]
		k0, k1 := s.pieceRings(i)
		for j, r := range ranges {
			switch {
			case r >= s.far[i]:
				out[j] += s.area[i]
			case r <= s.near[i]:
			default:
				for k := k0; k < k1; k++ {
					out[j] += planar.RingDiskArea(s.rings.Ring(k), qx, qy, r)
				}
			}
		}
	}
	return out
}

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

// kKeep stores a sub-piece (base vertex v, devices S and q at (qx, qy)):
// the rings j0 … j1−1 of kept labelled label (label < 0: all of them).
func kKeep(st *kStore, kept *planar.ClipRings, j0, j1 int, label int32, v int32, S []int32, q int32, qx, qy float64, p kPiece) {
	near := math.Inf(1)
	for j := j0; j < j1; j++ {
		if label >= 0 && kept.Label[j] != label {
			continue
		}
		ring := kept.Ring(j)
		st.rings.AppendRing(ring, int32(len(st.v)))
		copy(st.rings.Prov[len(st.rings.Prov)-len(ring)/2:], kept.RingProv(j))
		n := len(ring) / 2
		for a := 0; a < n; a++ {
			b := (a + 1) % n
			near = math.Min(near, planar.PointSegmentDistance(qx, qy, ring[2*a], ring[2*a+1], ring[2*b], ring[2*b+1]))
		}
	}
	st.v = append(st.v, v)
	st.set = append(append(st.set, S...), q)
	st.area = append(st.area, p.area)
	st.near = append(st.near, near)
	st.far = append(st.far, p.far)
	st.fx = append(st.fx, p.fx)
	st.fy = append(st.fy, p.fy)
	st.start = append(st.start, int32(st.rings.NumRings()))
}

// kGraph is the Delaunay graph in compressed rows (the neighbours of
// vertex v are Adj[Start[v]:Start[v+1]], in Triangulation.Neighbors order),
// with, per vertex, whether its clipped cell is its whole Voronoi cell (one
// ring, every edge on a bisector: the cell lies inside the area) and the
// cell's bounding box.
type kGraph struct {
	Start []int32
	Adj   []int32
	Inner []bool
	BoxXY []float64 // minX, minY, maxX, maxY per vertex
}

// newKGraph collects the neighbour lists and cell boxes of every vertex.
func newKGraph(t *planar.Triangulation, c *planar.Cells) *kGraph {
	nv := t.NumVertices()
	g := &kGraph{Start: make([]int32, nv+1), Inner: make([]bool, nv), BoxXY: make([]float64, 4*nv)}
	var buf []int32
	for v := int32(0); v < int32(nv); v++ {
		buf = t.Neighbors(v, buf)
		g.Adj = append(g.Adj, buf...)
		g.Start[v+1] = int32(len(g.Adj))
	}
	planar.ParallelFor(nv, 4096, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
			if p1-p0 != 1 || c.PolyStart[p0+1]-c.PolyStart[p0] != 1 {
				continue
			}
			k := c.PolyStart[p0]
			i0, i1 := c.RingStart[k], c.RingStart[k+1]
			inner := true
			for i := i0; i < i1; i++ {
				if c.EdgeSource[i] < 0 {
					inner = false
					break
				}
			}
			g.Inner[v] = inner
			minX, minY, maxX, maxY := planar.BoundsXY(c.XY[2*i0:2*i1], nil)
			copy(g.BoxXY[4*v:], []float64{minX, minY, maxX, maxY})
		}
	})
	return g
}

// kNeighbourhood returns N(S) in buf: the Delaunay neighbours of the
// members of S that are not in S, each once, in the order met. For one
// member it is exactly Triangulation.Neighbors (as Failures uses; g may
// then be nil).
func kNeighbourhood(t *planar.Triangulation, g *kGraph, S []int32, buf []int32) []int32 {
	if len(S) == 1 {
		return t.Neighbors(S[0], buf)
	}
	buf = buf[:0]
	for _, s := range S {
		for _, u := range g.Adj[g.Start[s]:g.Start[s+1]] {
			if !slices.Contains(S, u) && !slices.Contains(buf, u) {
				buf = append(buf, u)
			}
		}
	}
	return buf
}

// kPackBits is the number of bits per member when the members after the
// first of a tuple are packed into one uint64 key (kUniquePacked): up to
// three members of up to 2^21 − 1 (2 097 151 vertices).
const kPackBits = 21

// kUniqueSets sorts the stride-k tuples of sets (each ascending) and
// removes repeats: a counting sort by the first member, then a sort of
// each (short) group.
func kUniqueSets(sets []int32, k int, nv int) []int32 {
	n := len(sets) / k
	cnt := make([]int32, nv+1)
	for i := 0; i < n; i++ {
		cnt[sets[i*k]+1]++
	}
	for v := 0; v < nv; v++ {
		cnt[v+1] += cnt[v]
	}
	if k-1 <= 64/kPackBits && nv < 1<<kPackBits {
		return kUniquePacked(sets, k, nv, cnt)
	}
	idx := make([]int32, n)
	pos := slices.Clone(cnt[:nv])
	for i := 0; i < n; i++ {
		f := sets[i*k]
		idx[pos[f]] = int32(i)
		pos[f]++
	}
	cmpTup := func(a, b int32) int {
		return slices.Compare(sets[int(a)*k:int(a)*k+k], sets[int(b)*k:int(b)*k+k])
	}
	planar.ParallelFor(nv, 4096, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			slices.SortFunc(idx[cnt[v]:cnt[v+1]], cmpTup)
		}
	})
	out := make([]int32, 0, len(sets)/2)
	for v := 0; v < nv; v++ {
		grp := idx[cnt[v]:cnt[v+1]]
		for j, i := range grp {
			tup := sets[int(i)*k : int(i)*k+k]
			if j > 0 && slices.Equal(tup, out[len(out)-k:]) {
				continue
			}
			out = append(out, tup...)
		}
	}
	return out
}

// kUniquePacked is kUniqueSets with the members after the first packed
// into one uint64 per tuple (most significant first, so the order of the
// keys is the lexicographic order of the tuples): a sort of plain integers
// per group instead of one of tuples. cnt holds the group starts.
func kUniquePacked(sets []int32, k int, nv int, cnt []int32) []int32 {
	n := len(sets) / k
	keys := make([]uint64, n)
	pos := slices.Clone(cnt[:nv])
	for i := 0; i < n; i++ {
		var key uint64
		for _, m := range sets[i*k+1 : i*k+k] {
			key = key<<kPackBits | uint64(m)
		}
		f := sets[i*k]
		keys[pos[f]] = key
		pos[f]++
	}
	planar.ParallelFor(nv, 4096, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			slices.Sort(keys[cnt[v]:cnt[v+1]])
		}
	})
	out := make([]int32, 0, len(sets)/2)
	const mask = 1<<kPackBits - 1
	for v := 0; v < nv; v++ {
		grp := keys[cnt[v]:cnt[v+1]]
		for j, key := range grp {
			if j > 0 && key == grp[j-1] {
				continue
			}
			out = append(out, int32(v))
			out = slices.Grow(out, k-1)[:len(out)+k-1]
			for m := len(out) - 1; m > len(out)-k; m-- {
				out[m] = int32(key & mask)
				key >>= kPackBits
			}
		}
	}
	return out
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
