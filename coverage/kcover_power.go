// Exact k-coverage when devices have their own ranges: the order-k power
// diagram.
//
// Math. Device i at p_i with range r_i reaches x when |x − p_i| ≤ r_i, i.e.
// when its power π_i(x) = |x − p_i|² − r_i² is ≤ 0. So x is reached by at
// least k devices exactly when the k-th smallest power π_(k)(x) is ≤ 0. The
// order-k power diagram — the power diagram (Aurenhammer, "Power diagrams:
// properties, algorithms and applications", SIAM J. Comput. 16, 1987) taken
// to order k as Lee's order-k Voronoi diagram (IEEE Trans. Computers 31,
// 1982) takes the Voronoi diagram — splits the plane by the set of the k
// devices of smallest power, and Lee's step carries over: inside the
// order-(k−1) cell C_S of a set S of k−1 devices, the k-th smallest power
// is the smallest power over P \ S, so C_S is split by the power diagram of
// P \ S into pieces (S, q), on which π_(k) = π_q. Hence, as in kcover.go,
//
//	k-covered area = Σ_{pieces (S,q)} area((S,q) ∩ A ∩ D(p_q, r_q)),
//
// each term closed form (planar.RingDiskArea at the piece's own range), and
// under uniform growth (every r_i² + t; the power diagrams do not change)
// the k-cover figure t_k = max over A of π_(k) is the largest π_q over the
// vertices of the pieces (π_q is convex; its maximum over a polygon is at a
// vertex). It is reported in metres as the ranges √(r_i² + t_k) each device
// would need (KLevel.CoverRanges; the convention of RangesFullCover), and
// per k-gap as ClosingPower with the same meaning.
//
// The pieces of S are built per visible member v ∈ S (a device whose power
// cell P_v is not empty): C_S ∩ A = ⋃_v P_v ∩ A ∩ ⋂_{s ∈ S\{v}, u ∉ S} L(s, u),
// L(s, u) = {π_s ≤ π_u} the half-plane of planPowerLine (at a point of C_S
// the smallest power over all devices is a member's, so the members'
// power cells cover C_S), and each restricted cell is split by
// powerSplit among the candidates.
//
// Candidates. With unequal ranges the Delaunay argument of kcover.go
// fails: a hidden device (empty power cell) can be among the k of smallest
// power, and so can a device that is no regular-triangulation neighbour of
// S. The candidates are therefore found and then proved complete. A first
// set N is the neighbours of the visible members of S in the regular
// triangulation; the base cell is restricted and split with N. Let M be
// the largest power of a piece's owner over its piece (at a piece vertex).
// A device u ∉ S ∪ N changes the answer only if, at some x of the
// restricted cell, π_u(x) < π_s(x) for a member s (it cuts C_S) or
// π_u(x) < π_q(x) for the owner q of x (it takes part of a piece); on the
// restricted cell π_s ≤ π_q for every member (the half-planes L(s, ·)), so
// both need π_u(x) < π_q(x) ≤ M, hence |x − p_u|² < r_u² + M: only devices
// within √(r_u² + M) of the cell's bounding box are examined (bucket grids
// per class of r², kDevs.near). On a piece π_u − π_q is affine, so u beats
// the owner somewhere on it exactly when it does at a vertex: those devices
// join N and the cell is restricted and split once more. That second
// answer is exact: a device that beats no owner of the first split beats
// none of the second (its pieces lie in the first's, with owners of power
// no larger), and the first examined every device that could. Hidden
// devices are thus handled like any other; a hidden device is never a base
// (its power cell is empty, and at every point the device of smallest
// power is visible, so every S with a piece has a visible member).
//
// Duplicates. Devices at exactly the same spot count once, with the
// largest range among them (the regular triangulation keeps that one as
// the vertex and hides the others), as KCover counts distinct positions.
//
// Equal ranges. When every input range is the same r the layout is
// NewLayout's and KCoverRanges is KCover at r, with the power fields
// filled in (CoverPower = CoverRange² − r², CoverRanges all CoverRange):
// one code path, the unweighted figures to the last digit.
//
// Levels between those asked for are built in full (the edge shortcut of
// kEnumerateSet needs every piece to touch its cell's edges, which fails
// for power diagrams: a device of small range deep inside a large disk has
// an island of a piece), without keeping the pieces.
//
// Coverage-depth curve. Under uniform growth t the pieces do not change,
// so the area reached by k devices at growth t is Σ area((S,q) ∩ A ∩
// D(p_q, √(r_q² + t))) over the same pieces, each term closed form
// (SharesGrown; k = 1 is the own-range coverage curve, Layout.CurveRanges).
// With opt.CurveSamples the curve is sampled as the common-range one is,
// against the range R of the longest-range devices (as the own-range
// coverage curve is reported): R from 0 to √(r_max² + max_k t_k), t =
// R² − r_max²; KCoverage.CurveRanges holds those R. Unlike the common
// range, the owner q may lie inside its own piece (a device of small range
// inside a large disk is the k-th at its own spot), so only the "radius
// beyond the farthest vertex: the whole piece" shortcut is taken.
//
// Error bounds: those of planar/halfplane.go for the clips (the power line
// carries one more rounding than a bisector; plan_failures_ranges.go),
// planar.RingDiskArea for the areas (relative 1e-14 of the piece area), and
// the device filter keeps the relative slack hiddenSlack on r_u² + M.

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

// KCoverRanges computes the k-coverage of a layout with per-device ranges
// (NewLayoutRanges) at the planned ranges, for k = 1 … opt.MaxK (or
// opt.Levels): the share and area reached by at least k devices, the
// k-cover figure as the uniform growth CoverPower with the ranges it needs
// (CoverRanges), and with opt.Gaps the k-gaps (ClosingPower) and Bands.
// With all ranges equal it is KCover at that range with the power fields
// filled in. With unequal ranges there is no common range: SharesAt gives
// NaN; opt.CurveSamples samples each level's Curve against the range of
// the longest-range devices under uniform growth (CurveRanges; see the
// file comment), and SharesGrown gives the share at any growth. Hidden
// devices (empty power cell) count: they may be among the k devices
// reaching a spot.
func KCoverRanges(l *Layout, opt KOptions) (*KCoverage, error) {
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("coverage: KCoverRanges: %w", err)
	}
	if !l.weighted() {
		return nil, errors.New("coverage: KCoverRanges: the layout has one common range (use KCover)")
	}
	if l.inputRangesEqual() {
		return kCoverEqualRanges(l, opt)
	}
	dv := newKDevs(l)
	nd := len(dv.src)
	want, K, tol, err := kCheckOptions(opt, nd)
	if err != nil {
		return nil, fmt.Errorf("coverage: KCoverRanges: %w", err)
	}
	kc := &KCoverage{AreaM2: l.AreaM2, Devices: nd, OwnRanges: true, dev: dv}
	kc.warnDuplicates(len(l.Sites) - nd)
	keep := opt.Gaps || opt.keepPieces || opt.CurveSamples > 0
	if want[1] {
		kc.Levels = append(kc.Levels, dv.levelOne(l))
	}
	sets := kFirstSets(l)
	g := newKGraph(l.Tri, l.Cells)
	for k := 2; k <= K; k++ {
		lv, next := dv.level(l, g, k, sets, keep && want[k], k < K)
		if want[k] {
			lv.CoverRanges = l.GrownRanges(lv.CoverPower)
			kc.Levels = append(kc.Levels, lv)
		}
		sets = next
	}
	if opt.CurveSamples > 0 {
		kc.curveGrown(l, opt.CurveSamples)
	}
	if opt.Gaps {
		kc.allGaps(l, tol)
	}
	return kc, nil
}

// curveGrown samples every level's coverage-depth curve at n ranges of
// the longest-range devices, from 0 to the one at which every level is
// reached everywhere (file comment).
func (kc *KCoverage) curveGrown(l *Layout, n int) {
	wmax, top := kc.dev.wmax, math.Inf(-1)
	for _, lv := range kc.Levels {
		top = math.Max(top, lv.CoverPower)
	}
	rtop := math.Sqrt(math.Max(0, wmax+top))
	kc.CurveRanges = make([]float64, n)
	ts := make([]float64, n)
	for i := range kc.CurveRanges {
		if n > 1 {
			kc.CurveRanges[i] = rtop * float64(i) / float64(n-1)
		}
		ts[i] = kc.CurveRanges[i]*kc.CurveRanges[i] - wmax
	}
	for i := range kc.Levels {
		kc.Levels[i].Curve = kc.SharesGrown(l, kc.Levels[i].K, ts)
	}
}

// SharesGrown returns, for a k-coverage with own ranges (KCoverRanges,
// ranges not all equal), the share of the area reached by at least k
// devices when every r_i² grows by t, for each t of growths (m²; −r_i² …),
// each exact (file comment). It needs level k computed with its pieces
// (KOptions.Gaps or CurveSamples); NaN otherwise, and for a common-range
// k-coverage (use SharesAt).
func (kc *KCoverage) SharesGrown(l *Layout, k int, growths []float64) []float64 {
	out := make([]float64, len(growths))
	lv := kc.Level(k)
	switch {
	case kc.dev == nil || lv == nil || (k > 1 && lv.store == nil):
		for i := range out {
			out[i] = math.NaN()
		}
	case k == 1:
		cv := l.CurveRanges()
		for i, t := range growths {
			out[i] = cv.CoveredFraction(t)
		}
	default:
		part := make([][]float64, len(lv.store))
		planar.ParallelChunks(len(lv.store), 1, 0, func(ci, _, _ int) {
			part[ci] = kc.dev.grownAreas(lv.store[ci], growths)
		})
		for _, p := range part {
			for i, a := range p {
				out[i] += a
			}
		}
		for i, a := range out {
			out[i] = min(1, max(0, a/kc.AreaM2))
		}
	}
	return out
}

// grownAreas returns the area of the pieces of st within their owner's
// grown range √(r_q² + t), for each growth t.
func (dv *kDevs) grownAreas(st *kStore, growths []float64) []float64 {
	out := make([]float64, len(growths))
	for i := range st.v {
		q := st.set[i*st.k+st.k-1]
		qx, qy, w := dv.xy[2*q], dv.xy[2*q+1], dv.w[q]
		k0, k1 := st.pieceRings(i)
		for j, t := range growths {
			switch {
			case w+t <= 0: // the disk has vanished
			case w+t >= st.far[i]*st.far[i]:
				out[j] += st.area[i]
			default:
				r := math.Sqrt(w + t)
				for k := k0; k < k1; k++ {
					out[j] += planar.RingDiskArea(st.rings.Ring(k), qx, qy, r)
				}
			}
		}
	}
	return out
}

// kCoverEqualRanges is KCoverRanges for equal ranges r: KCover at r with
// the power fields filled in.
func kCoverEqualRanges(l *Layout, opt KOptions) (*KCoverage, error) {
	r := l.InputRanges[0]
	kc, err := KCover(l, r, opt)
	if err != nil {
		return nil, err
	}
	kc.OwnRanges = true
	for i := range kc.Levels {
		lv := &kc.Levels[i]
		lv.CoverPower = lv.CoverRange*lv.CoverRange - r*r
		lv.CoverRanges = make([]float64, len(l.Sites))
		for j := range lv.CoverRanges {
			lv.CoverRanges[j] = lv.CoverRange
		}
		for j := range lv.Gaps {
			g := &lv.Gaps[j]
			g.ClosingPower = g.ClosingRange*g.ClosingRange - r*r
		}
	}
	return kc, nil
}

// kDevs are the distinct devices of a layout with own ranges: devices
// 0 … nv−1 are the triangulation's vertices, the others the hidden devices
// at spots of their own; with bucket grids per class of r² (kDevClass).
type kDevs struct {
	nv      int
	xy      []float64 // position of each device
	w       []float64 // r² of each
	rad     []float64 // range of each
	src     []int32   // input index of each
	classes []kDevClass
	wmax    float64    // largest r²
	box     [4]float64 // bounds of the devices: minX, minY, maxX, maxY
	step    float64    // first search reach of kSmallest
}

// kDevClass is one class of devices of similar r² (the same binary
// exponent) in a bucket grid, with the class's largest r².
type kDevClass struct {
	exp  int
	wmax float64
	ids  []int32
	grid *planar.BucketGrid
}

// newKDevs collects the distinct devices of a layout with own ranges.
func newKDevs(l *Layout) *kDevs {
	t := l.Tri
	nv := t.NumVertices()
	dv := &kDevs{nv: nv, xy: slices.Clone(t.Coords[:2*nv])}
	pos := make(map[orb.Point]int32, nv)
	for v := int32(0); v < int32(nv); v++ {
		r := l.Ranges[v]
		dv.rad = append(dv.rad, r)
		dv.w = append(dv.w, r*r)
		dv.src = append(dv.src, t.Source[v])
		pos[orb.Point{dv.xy[2*v], dv.xy[2*v+1]}] = v
	}
	for _, i := range l.Hidden {
		p, r := l.Sites[i], l.InputRanges[i]
		if d, ok := pos[p]; ok {
			if d >= int32(nv) && r > dv.rad[d] {
				dv.rad[d], dv.w[d], dv.src[d] = r, r*r, int32(i)
			}
			continue
		}
		pos[p] = int32(len(dv.src))
		dv.xy = append(dv.xy, p[0], p[1])
		dv.rad = append(dv.rad, r)
		dv.w = append(dv.w, r*r)
		dv.src = append(dv.src, int32(i))
	}
	n := len(dv.src)
	minX, minY, maxX, maxY := planar.BoundsXY(dv.xy, nil)
	dv.box = [4]float64{minX, minY, maxX, maxY}
	dv.step = math.Max(math.Max(maxX-minX, maxY-minY)/math.Sqrt(float64(n)), 1e-9*(1+math.Abs(minX)+math.Abs(minY)))
	for d := int32(0); d < int32(n); d++ {
		e := math.Ilogb(dv.w[d])
		ci := slices.IndexFunc(dv.classes, func(c kDevClass) bool { return c.exp == e })
		if ci < 0 {
			dv.classes = append(dv.classes, kDevClass{exp: e})
			ci = len(dv.classes) - 1
		}
		c := &dv.classes[ci]
		c.ids = append(c.ids, d)
		c.wmax = math.Max(c.wmax, dv.w[d])
		dv.wmax = math.Max(dv.wmax, dv.w[d])
	}
	for ci := range dv.classes {
		c := &dv.classes[ci]
		c.grid = planar.NewBucketGrid(planar.GridOfCells(minX, minY, maxX, maxY, len(c.ids)), dv.xy, c.ids)
	}
	return dv
}

// at returns the position and range of device q (a vertex of l and the
// common range r when dv is nil).
func (dv *kDevs) at(l *Layout, q int32, r float64) (x, y, rq float64) {
	if dv == nil {
		x, y = l.site(q)
		return x, y, r
	}
	return dv.xy[2*q], dv.xy[2*q+1], dv.rad[q]
}

// power returns π_d(x, y).
func (dv *kDevs) power(d int32, x, y float64) float64 {
	dx, dy := dv.xy[2*d]-x, dv.xy[2*d+1]-y
	return dx*dx + dy*dy - dv.w[d]
}

// near calls fn for every device u with dist(p_u, box)² ≤ (r_u² + m)
// (1 + hiddenSlack), box = [minX, maxX] × [minY, maxY] (every device when m
// is +Inf): a superset of the devices with a power below m somewhere in
// the box.
func (dv *kDevs) near(minX, minY, maxX, maxY, m float64, fn func(d int32)) {
	for ci := range dv.classes {
		c := &dv.classes[ci]
		if math.IsInf(m, 1) {
			for _, d := range c.ids {
				fn(d)
			}
			continue
		}
		reach2 := (c.wmax + m) * (1 + hiddenSlack)
		if !(reach2 >= 0) {
			continue
		}
		half := math.Max(maxX-minX, maxY-minY) / 2
		c.grid.Near((minX+maxX)/2, (minY+maxY)/2, half+math.Sqrt(reach2), func(d int32) {
			x, y := dv.xy[2*d], dv.xy[2*d+1]
			dx := math.Max(0, math.Max(minX-x, x-maxX))
			dy := math.Max(0, math.Max(minY-y, y-maxY))
			if dx*dx+dy*dy <= (dv.w[d]+m)*(1+hiddenSlack) {
				fn(d)
			}
		})
	}
}

// kSmallest returns the k devices of smallest power at (x, y), smallest
// first (ties by device index), in nn's scratch. For a bound P, a device of
// class c with power ≤ P lies within √(P + max r² of c) of (x, y), so the
// buckets within that reach hold every device of power ≤ P; P doubles
// until k of them are found (or every bucket was searched).
func (dv *kDevs) kSmallest(x, y float64, k int, nn *kgNearest) []int32 {
	P := dv.step * dv.step
	for {
		nn.pairs = nn.pairs[:0]
		all, within := true, 0
		for ci := range dv.classes {
			c := &dv.classes[ci]
			if P+c.wmax < 0 {
				all = false
				continue
			}
			reach := math.Sqrt(P + c.wmax)
			c.grid.Near(x, y, reach, func(d int32) {
				nn.pairs = append(nn.pairs, kByDist{dv.power(d, x, y), d})
			})
			all = all && x-reach <= dv.box[0] && y-reach <= dv.box[1] && x+reach >= dv.box[2] && y+reach >= dv.box[3]
		}
		for _, p := range nn.pairs {
			if p.d2 <= P {
				within++
			}
		}
		if within >= k || all {
			break
		}
		P *= 2
	}
	slices.SortFunc(nn.pairs, func(a, b kByDist) int { return cmp.Or(cmp.Compare(a.d2, b.d2), cmp.Compare(a.v, b.v)) })
	nn.out = nn.out[:0]
	for _, p := range nn.pairs[:min(k, len(nn.pairs))] {
		nn.out = append(nn.out, p.v)
	}
	return nn.out
}

// order returns the input indices of the devices ds ordered by power at p
// (ties by input index).
func (dv *kDevs) order(ds []int32, p orb.Point) []int {
	vv := slices.Clone(ds)
	slices.SortFunc(vv, func(a, b int32) int {
		return cmp.Or(cmp.Compare(dv.power(a, p[0], p[1]), dv.power(b, p[0], p[1])), cmp.Compare(dv.src[a], dv.src[b]))
	})
	out := make([]int, len(vv))
	for i, d := range vv {
		out[i] = int(dv.src[d])
	}
	return out
}

// nearestFirst orders the devices ds of a piece by distance from p, or by
// power with own ranges, as input indices.
func (kc *KCoverage) nearestFirst(l *Layout, ds []int32, p orb.Point) []int {
	if kc.dev != nil {
		return kc.dev.order(ds, p)
	}
	return kNearestFirst(l, ds, p)
}

// levelOne is level 1 from the layout's own figures (the power cells).
func (dv *kDevs) levelOne(l *Layout) KLevel {
	unc := l.UncoveredAreaGrown(0)
	fc := l.FullCoverRanges()
	lv := KLevel{K: 1, CoveredArea: l.AreaM2 - unc, Share: coveredFromUncovered(unc, l.AreaM2),
		CoverPower: fc.Power, CoverRanges: l.GrownRanges(fc.Power)}
	if len(fc.Worst) > 0 {
		lv.CoverPoint = fc.Worst[0]
		lv.CoverSites = []int{fc.WorstSites[0]}
		s := l.Sites[fc.WorstSites[0]]
		lv.CoverRange = math.Hypot(lv.CoverPoint[0]-s[0], lv.CoverPoint[1]-s[1])
	}
	lv.Cells, lv.PieceArea = kCellCount(l)
	lv.Pieces = lv.Cells
	return lv
}

// levelOneGaps returns the layout's own gaps at the planned ranges
// (GapsRanges at growth 0) as k-gaps.
func (dv *kDevs) levelOneGaps(l *Layout, tol float64) []KGap {
	gs := l.GapsRanges(0, tol)
	out := make([]KGap, len(gs))
	var nn kgNearest
	for i, g := range gs {
		out[i] = KGap{ID: g.ID, Area: g.Area, Deepest: g.Deepest, ClosingRange: g.ClosingRange, Outline: g.Outline}
		if g.Closing != nil {
			out[i].ClosingPower = g.Closing.Power
		}
		out[i].Sites = dv.order(dv.kSmallest(g.Deepest[0], g.Deepest[1], 1, &nn), g.Deepest)
	}
	return out
}

// kpScratch is per-chunk scratch space of kDevs.level.
type kpScratch struct {
	pp     planPowerScratch
	nb     []int32 // candidates (device indices), parallel to pp.cand
	qs     []int32 // devices with a piece, of the current set
	tset   []int32
	a, b   *planar.ClipRings // restriction scratch, swapped by kCut
	base   planar.RingSet    // the current base cell (for holdFn)
	holdFn func(int32, float64, float64) bool
}

// level computes level k ≥ 2 from the order-(k−1) sets (stride k−1, each
// ascending) as kLevelBuild does, with power in place of distance (see the
// file comment); with wantNext it returns the order-k sets.
func (dv *kDevs) level(l *Layout, g *kGraph, k int, sets []int32, keep, wantNext bool) (KLevel, []int32) {
	m := k - 1
	ns := len(sets) / m
	chunks := make([]kChunk, (ns+kSetChunk-1)/kSetChunk)
	planar.ParallelChunks(ns, kSetChunk, 0, func(ci, lo, hi int) {
		sc := &kpScratch{}
		sc.holdFn = func(_ int32, x, y float64) bool { return planCellHolds(&sc.base, x, y) }
		ch := &chunks[ci]
		ch.far = math.Inf(-1)
		ch.next = make([]int32, 0, (hi-lo)*k*kNextPerSet)
		if keep {
			ch.store = &kStore{k: k, start: []int32{0}}
		}
		for i := lo; i < hi; i++ {
			dv.setPieces(l, g, sets[i*m:(i+1)*m], keep, sc, ch)
		}
	})
	lv := KLevel{K: k}
	var farSet, next []int32
	lv.CoverPower, farSet, next = kMergeChunks(l, &lv, chunks, keep)
	if len(farSet) > 0 {
		lv.CoverSites = dv.order(farSet, lv.CoverPoint)
		q := farSet[len(farSet)-1]
		lv.CoverRange = math.Hypot(lv.CoverPoint[0]-dv.xy[2*q], lv.CoverPoint[1]-dv.xy[2*q+1])
	}
	next = kUniqueSets(next, k, len(dv.src))
	lv.Cells = len(next) / k
	if !wantNext {
		next = nil
	}
	return lv, next
}

// setPieces computes the pieces (S, q) of one order-(k−1) set S, one
// visible member's power cell at a time, with the candidates completed as
// the file comment proves.
func (dv *kDevs) setPieces(l *Layout, g *kGraph, S []int32, keep bool, sc *kpScratch, ch *kChunk) {
	sc.nb = sc.nb[:0]
	for _, s := range S {
		if s >= int32(dv.nv) {
			continue
		}
		for _, u := range g.Adj[g.Start[s]:g.Start[s+1]] {
			if !slices.Contains(S, u) && !slices.Contains(sc.nb, u) {
				sc.nb = append(sc.nb, u)
			}
		}
	}
	sc.qs = sc.qs[:0]
	for _, v := range S {
		if v >= int32(dv.nv) || l.Cells.SiteStart[v] == l.Cells.SiteStart[v+1] {
			continue
		}
		sc.base = planCellRings(l.Cells, v)
		var valid func(int32, float64, float64) bool
		if !planCellConvex(&sc.base) {
			valid = sc.holdFn
		}
		for pass := 0; ; pass++ {
			if !dv.restrictSplit(S, v, valid, sc) {
				break
			}
			if pass == 0 && dv.appearing(S, sc) {
				continue
			}
			dv.takePieces(S, v, keep, sc, ch)
			break
		}
	}
	for _, q := range sc.qs {
		ch.pieces++
		sc.tset = append(append(sc.tset[:0], S...), q)
		slices.Sort(sc.tset)
		ch.next = append(ch.next, sc.tset...)
	}
}

// restrictSplit clips the base cell sc.base of member v to L(s, u) for
// s ∈ S \ {v}, u ∈ sc.nb and splits the result among sc.nb by power
// (powerSplit, results in sc.pp); false when nothing remains.
func (dv *kDevs) restrictSplit(S []int32, v int32, valid func(int32, float64, float64) bool, sc *kpScratch) bool {
	pp := &sc.pp
	pp.cell.Reset()
	for j := 0; j < sc.base.NumRings(); j++ {
		pp.cell.AppendRing(sc.base.Ring(j), v)
	}
	cur := &pp.cell
	for _, u := range sc.nb {
		ux, uy := dv.xy[2*u], dv.xy[2*u+1]
		for _, s := range S {
			if s == v {
				continue
			}
			cur = kCut(planPowerLine(dv.xy[2*s], dv.xy[2*s+1], dv.w[s], ux, uy, dv.w[u]), cur, &sc.a, &sc.b)
			if len(cur.XY) == 0 {
				return false
			}
		}
	}
	if cur != &pp.cell {
		pp.cell.Reset()
		for j := 0; j < cur.NumRings(); j++ {
			pp.cell.AppendRing(cur.Ring(j), cur.Label[j])
			copy(pp.cell.Prov[len(pp.cell.Prov)-len(cur.RingProv(j)):], cur.RingProv(j))
		}
	}
	pp.cand = pp.cand[:0]
	for _, u := range sc.nb {
		pp.cand = append(pp.cand, planPowerCand{x: dv.xy[2*u], y: dv.xy[2*u+1], r: dv.rad[u], w: dv.w[u], site: int(u)})
	}
	powerSplit(valid, pp)
	return true
}

// appearing adds to sc.nb the devices outside S and sc.nb that beat the
// owner of a piece of the last split at one of its vertices (every device
// but S's when there is no candidate), and reports whether it added any
// (see the file comment).
func (dv *kDevs) appearing(S []int32, sc *kpScratch) bool {
	pp := &sc.pp
	m := math.Inf(1)
	if len(pp.cand) > 0 {
		m = math.Inf(-1)
		for _, p := range pp.res {
			m = math.Max(m, p.pow)
		}
	}
	if math.IsInf(m, -1) {
		return false
	}
	none := math.IsInf(m, 1)
	minX, minY, maxX, maxY := planar.BoundsXY(pp.cell.XY, nil)
	n0 := len(sc.nb)
	dv.near(minX, minY, maxX, maxY, m, func(d int32) {
		if slices.Contains(S, d) || slices.Contains(sc.nb, d) {
			return
		}
		if none || pp.beaten(orb.Point{dv.xy[2*d], dv.xy[2*d+1]}, dv.w[d]) {
			sc.nb = append(sc.nb, d)
		}
	})
	return len(sc.nb) > n0
}

// takePieces adds the pieces of the last split (base v) to the chunk.
func (dv *kDevs) takePieces(S []int32, v int32, keep bool, sc *kpScratch, ch *kChunk) {
	pp := &sc.pp
	for _, p := range pp.res {
		q := sc.nb[p.cand]
		area := 0.0
		for j := p.ring0; j < p.ring0+p.nr; j++ {
			area += planar.RingArea(pp.kept.Ring(j))
		}
		ch.covered += p.disk
		ch.pieceArea += area
		if p.pow > ch.far {
			ch.far, ch.fx, ch.fy = p.pow, p.fx, p.fy
			ch.farSet = append(append(ch.farSet[:0], S...), q)
		}
		if keep {
			kKeep(ch.store, &pp.kept, p.ring0, p.ring0+p.nr, -1, v, S, q, dv.xy[2*q], dv.xy[2*q+1],
				kPiece{area: area, disk: p.disk, far: p.far, fx: p.fx, fy: p.fy})
		}
		if !slices.Contains(sc.qs, q) {
			sc.qs = append(sc.qs, q)
		}
	}
}
