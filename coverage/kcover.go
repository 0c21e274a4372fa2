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
// k = 1 is the ordinary analysis: its figures are the Layout's own
// (UncoveredArea, FullCover, Curve), not recomputed.
//
// Cost. Lee's bound: the order-k diagram of n sites has O(k(n − k)) cells
// (at most (2k − 1)n − k² + 1 in general position); each has O(k) pieces
// and each piece O(k) sub-pieces of O(|N(S)|) clips, so level k costs
// O(k³ n) clips of small polygons, in parallel over the sets.
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
	// KMaxDefault.
	MaxK int
	// CurveSamples is the number of ranges on each coverage-depth curve,
	// evenly spaced from 0 to the largest k-cover range (0: no curve).
	CurveSamples int
	// Gaps asks for the k-gaps at the planned range (see kcover_gaps.go).
	Gaps bool
	// ChordTolerance is the largest distance between a gap outline's arc
	// and its chords (metres); 0 means DefaultChordTolerance.
	ChordTolerance float64
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
	// CoverPoint is a spot that needs CoverRange.
	CoverPoint orb.Point
	// CoverSites are the input indices of the K devices nearest
	// CoverPoint, nearest first.
	CoverSites []int
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
	// Levels holds k = 1 … MaxK in order.
	Levels []KLevel
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
	K := opt.MaxK
	if K == 0 {
		K = KMaxDefault
	}
	nv := l.Tri.NumVertices()
	if K < 1 {
		return nil, fmt.Errorf("coverage: KCover: k = %d must be at least 1", K)
	}
	if K > nv {
		return nil, fmt.Errorf("coverage: KCover: k = %d but the layout has %d distinct devices: %w", K, nv, ErrKTooLarge)
	}
	if opt.CurveSamples < 0 {
		return nil, fmt.Errorf("coverage: KCover: %d curve samples", opt.CurveSamples)
	}
	tol := opt.ChordTolerance
	if tol == 0 {
		tol = DefaultChordTolerance
	}
	if !(tol > 0) || math.IsInf(tol, 0) {
		return nil, fmt.Errorf("coverage: KCover: chord tolerance %v must be a finite number > 0", opt.ChordTolerance)
	}
	kc := &KCoverage{Range: r, AreaM2: l.AreaM2, Devices: nv}
	if d := len(l.Sites) - nv; d > 0 {
		kc.Warnings = append(kc.Warnings, fmt.Sprintf("%d devices stand at exactly the same spot as another; each spot counts once", d))
	}
	keep := opt.CurveSamples > 0 || opt.Gaps
	kc.Levels = append(kc.Levels, kLevelOne(l, r))
	sets := make([]int32, 0, nv)
	for v := int32(0); v < int32(nv); v++ {
		if l.Cells.SiteStart[v] < l.Cells.SiteStart[v+1] {
			sets = append(sets, v)
		}
	}
	for k := 2; k <= K; k++ {
		lv, next := kLevelBuild(l, k, sets, r, keep, k < K)
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
		for i := range kc.Levels {
			kc.Levels[i].Gaps = kc.gaps(l, i+1, tol)
		}
	}
	return kc, nil
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
	nv := l.Tri.NumVertices()
	for v := 0; v < nv; v++ {
		if l.Cells.SiteStart[v] < l.Cells.SiteStart[v+1] {
			lv.Cells++
		}
		lv.PieceArea += l.Cells.Area[v]
	}
	lv.Pieces = lv.Cells
	return lv
}

// SharesAt returns the share of the area reached by at least k devices at
// each of the ranges, each exact (the sum over the pieces of the piece ∩
// disk areas). It needs the pieces kept by KCover (CurveSamples > 0 or
// Gaps); k = 1 uses the layout's coverage curve.
func (kc *KCoverage) SharesAt(l *Layout, k int, ranges []float64) []float64 {
	out := make([]float64, len(ranges))
	if k == 1 {
		cv := l.Curve()
		for i, r := range ranges {
			out[i] = cv.CoveredFraction(r)
		}
		return out
	}
	if k < 1 || k > len(kc.Levels) {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	lv := &kc.Levels[k-1]
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
	cell   planar.ClipRings
	a, b   planar.ClipRings
	hit    []bool
	split  kSplitScratch
	holdFn func(int32, float64, float64) bool
	tset   []int32
}

// kSetChunk is the number of sets per chunk of a level (the unit of
// parallel work and of the fixed summation order).
const kSetChunk = 1024

// kLevelBuild computes level k ≥ 2 from the order-(k−1) sets (stride k−1,
// each ascending), returning the level and, with wantNext, the order-k sets
// (ascending tuples, sorted, distinct; they are always found, to count the
// cells).
func kLevelBuild(l *Layout, k int, sets []int32, r float64, keep, wantNext bool) (KLevel, []int32) {
	m := k - 1
	ns := len(sets) / m
	nc := (ns + kSetChunk - 1) / kSetChunk
	chunks := make([]kChunk, nc)
	planar.ParallelChunks(ns, kSetChunk, 0, func(ci, lo, hi int) {
		sc := &kScratch{}
		sc.holdFn = func(_ int32, x, y float64) bool { return planCellHolds(&sc.cell.RingSet, x, y) }
		ch := &chunks[ci]
		ch.far = -1
		if keep {
			ch.store = &kStore{k: k, start: []int32{0}}
		}
		for i := lo; i < hi; i++ {
			kSetPieces(l, sets[i*m:(i+1)*m], r, keep, sc, ch)
		}
	})
	lv := KLevel{K: k, CoverRange: -1}
	var next []int32
	var farSet []int32
	for ci := range chunks {
		ch := &chunks[ci]
		lv.CoveredArea += ch.covered
		lv.PieceArea += ch.pieceArea
		lv.Pieces += ch.pieces
		if ch.far > lv.CoverRange {
			lv.CoverRange, lv.CoverPoint, farSet = ch.far, orb.Point{ch.fx, ch.fy}, ch.farSet
		}
		if keep {
			lv.store = append(lv.store, ch.store)
		}
		next = append(next, ch.next...)
		ch.next = nil
	}
	lv.CoveredArea = min(l.AreaM2, max(0, lv.CoveredArea))
	lv.Share = lv.CoveredArea / l.AreaM2
	if lv.CoverRange < 0 {
		lv.CoverRange = 0
	}
	lv.CoverSites = kNearestFirst(l, farSet, lv.CoverPoint)
	next = kUniqueSets(next, k)
	lv.Cells = len(next) / k
	if !wantNext {
		next = nil
	}
	return lv, next
}

// kSetPieces computes the pieces (S, q) of one order-(k−1) set S.
func kSetPieces(l *Layout, S []int32, r float64, keep bool, sc *kScratch, ch *kChunk) {
	t, c := l.Tri, l.Cells
	sc.nb = kNeighbourhood(t, S, sc.nb)
	nb := sc.nb
	if len(nb) == 0 {
		return
	}
	sc.hit = append(sc.hit[:0], make([]bool, len(nb))...)
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
		for pi, p := range sc.split.res {
			ch.covered += p.disk
			ch.pieceArea += p.area
			sc.hit[p.cand] = true
			if p.far > ch.far {
				ch.far, ch.fx, ch.fy = p.far, p.fx, p.fy
				ch.farSet = append(append(ch.farSet[:0], S...), nb[p.cand])
			}
			if keep {
				kKeep(t, ch.store, &sc.split.kept, pi, v, S, nb[p.cand], p)
			}
		}
	}
	for qi, h := range sc.hit {
		if !h {
			continue
		}
		ch.pieces++
		sc.tset = append(append(sc.tset[:0], S...), nb[qi])
		slices.Sort(sc.tset)
		ch.next = append(ch.next, sc.tset...)
	}
}

// kRestrict clips the base cell of v to the order-(k−1) cell of S:
// ⋂ H(s, u) over s ∈ S \ {v}, u ∈ nb (V_v already gives H(v, u)). It
// returns nil when nothing remains.
func kRestrict(t *planar.Triangulation, cell *planar.ClipRings, S []int32, v int32, nb []int32, sc *kScratch) *planar.ClipRings {
	cur := cell
	for _, s := range S {
		if s == v {
			continue
		}
		sx, sy := t.Coords[2*s], t.Coords[2*s+1]
		for _, u := range nb {
			hp := planar.Bisector(sx, sy, t.Coords[2*u], t.Coords[2*u+1])
			if !hp.SomeOutside(cur.XY) {
				continue
			}
			hp.ClipSet(cur, &sc.b)
			sc.a, sc.b = sc.b, sc.a
			cur = &sc.a
			if len(cur.XY) == 0 {
				return nil
			}
		}
	}
	return cur
}

// kKeep stores sub-piece pi of kept (base vertex v, devices S and q).
func kKeep(t *planar.Triangulation, st *kStore, kept *planar.ClipRings, pi int, v int32, S []int32, q int32, p kPiece) {
	qx, qy := t.Coords[2*q], t.Coords[2*q+1]
	near := math.Inf(1)
	for j := 0; j < kept.NumRings(); j++ {
		if kept.Label[j] != int32(pi) {
			continue
		}
		ring := kept.Ring(j)
		st.rings.AppendRing(ring, int32(len(st.v)))
		copy(st.rings.Prov[len(st.rings.Prov)-len(ring)/2:], kept.RingProv(j))
		n := len(ring) / 2
		for a := 0; a < n; a++ {
			b := (a + 1) % n
			near = math.Min(near, kSegDist(ring[2*a], ring[2*a+1], ring[2*b], ring[2*b+1], qx, qy))
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

// kSegDist returns the distance from (px, py) to the segment ab.
func kSegDist(ax, ay, bx, by, px, py float64) float64 {
	dx, dy := bx-ax, by-ay
	t := 0.0
	if l2 := dx*dx + dy*dy; l2 > 0 {
		t = min(1, max(0, ((px-ax)*dx+(py-ay)*dy)/l2))
	}
	return math.Hypot(ax+t*dx-px, ay+t*dy-py)
}

// kNeighbourhood returns N(S) in buf: the Delaunay neighbours of the
// members of S that are not in S, each once, in the order met (for one
// member exactly Triangulation.Neighbors).
func kNeighbourhood(t *planar.Triangulation, S []int32, buf []int32) []int32 {
	if len(S) == 1 {
		return t.Neighbors(S[0], buf)
	}
	buf = buf[:0]
	var tmp [32]int32
	for _, s := range S {
		for _, u := range t.Neighbors(s, tmp[:0]) {
			if !slices.Contains(S, u) && !slices.Contains(buf, u) {
				buf = append(buf, u)
			}
		}
	}
	return buf
}

// kUniqueSets sorts the stride-k tuples of sets and removes repeats.
func kUniqueSets(sets []int32, k int) []int32 {
	n := len(sets) / k
	idx := make([]int32, n)
	for i := range idx {
		idx[i] = int32(i)
	}
	slices.SortFunc(idx, func(a, b int32) int {
		return slices.Compare(sets[int(a)*k:int(a)*k+k], sets[int(b)*k:int(b)*k+k])
	})
	out := make([]int32, 0, len(sets))
	for j, i := range idx {
		tup := sets[int(i)*k : int(i)*k+k]
		if j > 0 && slices.Equal(tup, out[len(out)-k:]) {
			continue
		}
		out = append(out, tup...)
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
