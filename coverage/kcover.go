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
//
// Files. This one: the options, the results and KCover's driver over the
// levels. kcover_level.go builds a level from the sets below it,
// kcover_pieces.go the pieces of one set, kcover_split.go splits a region
// among candidate devices; kcover_graph.go holds the Delaunay graph and
// N(S), kcover_sets.go the order-k sets, kcover_store.go the kept pieces
// and the shares at any range; kcover_gaps.go, kcover_merge.go and
// kcover_bands.go the gaps and bands; kcover_power.go own ranges.

package coverage

import (
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
