// Persistent homology (H0 and H1) of the alpha filtration, by union-find.
//
// In the plane no matrix reduction is needed (Edelsbrunner & Harer,
// Computational Topology, AMS 2010, sections VII.1 and VII.2; Edelsbrunner,
// "The union of balls and its dual shape", 1995):
//
//   - Order. Simplices are totally ordered by filtration value; at equal
//     value by dimension (vertices, then edges, then triangles, so every
//     simplex follows its faces); equal-valued edges by length, then by
//     half-edge index; equal-valued triangles by index. Any such refinement
//     is a valid filtration and gives the same diagram off the diagonal;
//     ordering equal-valued edges by length makes every negative edge
//     Gabriel, so the merge edges reported are edges of a Euclidean
//     minimum spanning tree.
//   - H0. Union-find over the vertices, edges in increasing order
//     (Kruskal): an edge joining two components is negative and kills one
//     of them (birth 0, death = its value = half its length); these edges
//     form a Euclidean minimum spanning tree.
//   - H1 by Alexander duality. Every other edge is positive: it closes a
//     loop. Dually, with the triangles and one extra node for the outside
//     as the vertices of the dual graph, process the edges in decreasing
//     order and join the two sides of each edge (its two triangles, or its
//     triangle and the outside for a hull edge). A dual component is
//     represented by its oldest member in decreasing order: its triangle
//     latest in the filtration, the outside being older than every
//     triangle. When a positive edge joins two dual components the younger
//     of the two representatives (earlier in the filtration) dies: the
//     pair is (edge value, triangle value) = (Birth, Death) of a hole of the
//     union of disks, filled at the circumcentre of that triangle. The
//     negative edges are exactly those whose two sides are already joined
//     (tree–cotree duality of planar graphs), so each edge is used by
//     exactly one of the two passes.
//
// Holes are listed by decreasing persistence, ties by increasing filtration
// position of the birth edge; merges by increasing Death (filtration order).
//
// Values are those of NewFiltration (relative error below 1e-14); the
// pairing itself is exact for those values. H1 pairs shorter than
// HoleResolution relative are dropped as zero-length (rounding of nearly
// cocircular sites makes them).
//
// Cost: radix sorts (11-bit digits) of the edges and of the triangles on
// the upper 32 bits of their values' bits packed above the index (runs
// that tie there then ordered by the full bits), then the two union-find
// passes side by side: Kruskal over int32 site indices (path halving,
// union by rank) and the dual pass over triangles numbered by filtration
// rank (path halving, linking the younger root below the older, so the
// root is the representative). Memory is flat int32/uint64/float64 arrays, about 150
// bytes per site at the peak besides the result.

package coverage

import (
	"cmp"
	"math"
	"runtime"
	"slices"
	"sort"
	"sync"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// HoleResolution is the relative persistence below which an H1 pair is
// treated as zero-length and left out of Persistence.Holes: a pair is kept
// when Death − Birth > HoleResolution·Death. Filtration values carry a
// relative error below 1e-14, so when four or more sites are nearly
// cocircular (a ring of sites placed with cos and sin, a rotated grid),
// values that tie in exact arithmetic can come out in either order and
// create pairs about 1e-16 long that exact arithmetic does not have; a pair
// this short cannot be told from those.
const HoleResolution = 1e-12

// ComputePersistence returns the H0 and H1 persistence pairs of the alpha
// filtration f of triangulation t (see the file comment for the method).
// When f is nil, or does not match t, it is computed with NewFiltration. A
// nil t gives an empty result.
func ComputePersistence(t *planar.Triangulation, f *Filtration) *Persistence {
	p := &Persistence{}
	if t == nil {
		return p
	}
	p.Vertices = t.NumVertices()
	nt := t.NumTriangles()
	if f == nil || len(f.Triangle) != nt || len(f.Edge) != len(t.Triangles) ||
		(nt == 0 && len(t.Hull) >= 2 && len(f.Line) != len(t.Hull)-1) {
		f = NewFiltration(t)
	}
	if nt == 0 {
		persistLine(t, f, p)
		return p
	}

	ne, ids, keys, tkeys, tids, rank := persistOrder(t, f)

	// Gather, in filtration order, each edge's endpoints (as input indices,
	// Source) and its two sides (triangle ranks; nt stands for the
	// outside), so that both passes below read memory sequentially.
	tr, src := t.Triangles, t.Source
	he := t.Halfedges
	outside := int32(nt)
	ends := make([]uint64, ne)  // site a | site b << 32, a < b
	sides := make([]uint64, ne) // rank a | rank b << 32
	planar.ParallelFor(ne, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			e := ids[i]
			a, b := src[tr[e]], src[tr[planar.NextHalfedge(e)]]
			ends[i] = uint64(uint32(min(a, b))) | uint64(uint32(max(a, b)))<<32
			sb := outside
			if o := he[e]; o >= 0 {
				sb = rank[o/3]
			}
			sides[i] = uint64(uint32(rank[e/3])) | uint64(uint32(sb))<<32
		}
	})
	ids, rank = nil, nil

	// The two passes are independent; run them side by side. Kruskal's
	// union-find runs over input indices (each vertex is its Source).
	var mpos []int32 // H0: positions of the negative edges
	done := make(chan struct{})
	go func() {
		n := int32(0)
		for _, s := range src {
			n = max(n, s+1)
		}
		mpos = persistKruskal(int(n), ends)
		close(done)
	}()
	recs := persistDual(nt, tkeys, keys, ends, sides)

	order := persistHoleOrder(recs, sides)
	sides = nil
	<-done
	p.Holes = persistHoleList(t, f, recs, order, tids)

	p.Merges = make([]Merge, len(mpos))
	planar.ParallelFor(len(mpos), alphaGrain, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			i := mpos[k]
			p.Merges[k] = Merge{
				Death: math.Float64frombits(keys[i]),
				Sites: [2]int{int(uint32(ends[i])), int(ends[i] >> 32)},
			}
		}
	})
	persistRanges(p)
	return p
}

// persistOrder sorts the edges (one canonical half-edge each: the hull
// half-edge or the larger of the two halves) by filtration value, ties by
// length, and concurrently the triangles by (value, index); a triangle's
// rank in that order is its position in the filtration. It returns the
// number of edges, their half-edges and keys in order, the triangles' keys
// and indices in order, and each triangle's rank. Keys are the bits of the
// values (non-negative, so their unsigned order is the values' order);
// each sort is persistSortPacked on the upper 32 bits packed above the
// index, then persistFixTies on the full bits.
func persistOrder(t *planar.Triangulation, f *Filtration) (ne int, ids []int32, keys, tkeys []uint64, tids, rank []int32) {
	nt := t.NumTriangles()
	he := t.Halfedges
	for e, o := range he {
		if o < int32(e) {
			ne++
		}
	}
	// Sort the edges, and concurrently the triangles by (value, index): a
	// triangle's rank in that order is its position in the filtration.
	tv := f.Triangle
	rank = make([]int32, nt)
	sorted := make(chan struct{})
	go func() {
		tkeys = make([]uint64, nt)
		for i, v := range tv {
			tkeys[i] = math.Float64bits(v)>>32<<32 | uint64(i)
		}
		tkeys, _ = persistSortPacked(tkeys, make([]uint64, nt))
		persistFixTies(tkeys, func(i uint32) uint64 { return math.Float64bits(tv[i]) })
		tids = make([]int32, nt)
		for r, x := range tkeys {
			i := int32(uint32(x))
			tids[r] = i
			rank[i] = int32(r)
			tkeys[r] = math.Float64bits(tv[i])
		}
		close(sorted)
	}()
	keys = make([]uint64, 0, ne)
	for e, o := range he {
		if o < int32(e) {
			keys = append(keys, math.Float64bits(f.Edge[e])>>32<<32|uint64(e))
		}
	}
	keys, _ = persistSortPacked(keys, make([]uint64, ne))
	persistFixTies(keys, func(e uint32) uint64 { return math.Float64bits(f.Edge[e]) })
	ids = make([]int32, ne)
	planar.ParallelFor(ne, alphaGrain, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			e := int32(uint32(keys[i]))
			ids[i] = e
			keys[i] = math.Float64bits(f.Edge[e])
		}
	})
	persistTieByLength(t, keys, ids)
	<-sorted

	return ne, ids, keys, tkeys, tids, rank
}

// persistHoleOrder orders the holes by decreasing persistence, then
// increasing filtration position of the birth edge (recs is reversed in
// place to increasing birth position; the low 32 bits of each returned
// word index it). buf is used as scratch when it holds 2·len(recs) words.
func persistHoleOrder(recs []persistHoleRec, buf []uint64) []uint64 {
	// Complemented bits (descending order) packed above the position in
	// recs after reversing it: ties in increasing birth position.
	nh := len(recs)
	slices.Reverse(recs)
	if len(buf) < 2*nh {
		buf = make([]uint64, 2*nh)
	}
	hk := buf[:nh]
	key := func(k uint32) uint64 { return ^math.Float64bits(recs[k].death - recs[k].birth) }
	for k := range recs {
		hk[k] = key(uint32(k))>>32<<32 | uint64(k)
	}
	hk, _ = persistSortPacked(hk, buf[nh:2*nh])
	persistFixTies(hk, key)
	return hk
}

// persistHoleList writes the holes in the given order, each with its death
// point (the circumcentre of the triangle that fills it).
func persistHoleList(t *planar.Triangulation, f *Filtration, recs []persistHoleRec, order []uint64, tids []int32) []Hole {
	nt, nh, tr := t.NumTriangles(), len(recs), t.Triangles
	xy := t.Coords
	holes := make([]Hole, nh)
	centre := f.centre
	if len(centre) != 2*nt {
		centre = nil
	}
	planar.ParallelFor(nh, alphaGrain, func(lo, hi int) {
		for j := lo; j < hi; j++ {
			r := &recs[uint32(order[j])]
			y := tids[r.rank]
			var cx, cy float64
			if centre != nil {
				cx, cy = centre[2*y], centre[2*y+1]
			} else {
				cx, cy = alphaCircumcentre(xy, tr[3*y], tr[3*y+1], tr[3*y+2])
			}
			holes[j] = Hole{
				Birth:      r.birth,
				Death:      r.death,
				DeathPoint: orb.Point{cx, cy},
				BirthSites: [2]int{int(uint32(r.sites)), int(r.sites >> 32)},
			}
		}
	})

	return holes
}

// persistKruskal runs union-find over n nodes along the edges in
// filtration order (ends packs the two node indices of each edge) and
// returns the positions of the edges that join two components.
func persistKruskal(n int, ends []uint64) []int32 {
	uf := planar.NewUnionFind(n)
	out := make([]int32, 0, max(n-1, 0))
	for i, ab := range ends {
		if uf.Union(int32(uint32(ab)), int32(ab>>32)) {
			out = append(out, int32(i))
		}
	}
	return out
}

// persistHoleRec is an H1 pair found by persistDual: the values, the birth
// edge's sites (packed as in ends) and the rank of the killing triangle.
type persistHoleRec struct {
	birth, death float64
	sites        uint64
	rank         int32
}

// persistDual runs union-find over the nt triangles, numbered by their
// rank in the filtration, plus the outside (node nt, older than every
// triangle), along the edges in decreasing filtration order. sides packs
// the two nodes each edge separates and ends its two sites; keys and tkeys
// hold the bits of the edge and triangle values in filtration order. The
// root of each dual component is its oldest node, its largest number,
// because the root with the smaller number is always linked below the
// other (linking by index, with path halving). When an edge joins two
// components, the younger root dies; the pair is returned when its
// persistence exceeds HoleResolution relative.
func persistDual(nt int, tkeys, keys, ends, sides []uint64) []persistHoleRec {
	uf := planar.NewUnionFind(nt + 1)
	out := make([]persistHoleRec, 0, nt/2+16)
	for i := len(sides) - 1; i >= 0; i-- {
		s := sides[i]
		ra, rb := uf.Find(int32(uint32(s))), uf.Find(int32(s>>32))
		if ra == rb {
			continue // negative edge: a merge, found by Kruskal
		}
		young, old := min(ra, rb), max(ra, rb)
		uf.Parent[young] = old // link by index: the older root survives
		birth, death := math.Float64frombits(keys[i]), math.Float64frombits(tkeys[young])
		// (Weighted values may be negative: the scale is the larger
		// magnitude; for values ≥ 0 it is death.)
		if death-birth > HoleResolution*math.Max(math.Abs(death), math.Abs(birth)) {
			out = append(out, persistHoleRec{birth, death, ends[i], young})
		}
	}
	return out
}

// persistLine fills p for collinear input: the complex is a path, every
// edge is a merge.
func persistLine(t *planar.Triangulation, f *Filtration, p *Persistence) {
	n := len(f.Line)
	if n == 0 {
		return
	}
	order := make([]int32, n)
	for i := range order {
		order[i] = int32(i)
	}
	slices.SortFunc(order, func(a, b int32) int {
		if c := cmp.Compare(f.Line[a], f.Line[b]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	p.Merges = make([]Merge, n)
	for k, i := range order {
		a, b := t.Hull[i], t.Hull[i+1]
		p.Merges[k] = Merge{Death: f.Line[i], Sites: persistSitePair(t.Source[a], t.Source[b])}
	}
	persistRanges(p)
}

// persistRanges sets ConnectRange and LinkRange from the merges.
func persistRanges(p *Persistence) {
	if n := len(p.Merges); n > 0 {
		p.ConnectRange = p.Merges[n-1].Death
		p.LinkRange = 2 * p.ConnectRange
	}
}

// persistSitePair returns the two input indices in increasing order.
func persistSitePair(a, b int32) [2]int {
	if a > b {
		a, b = b, a
	}
	return [2]int{int(a), int(b)}
}

// Betti returns the Betti numbers of the union of the closed disks of
// radius r around the sites: the number of connected pieces and the number
// of enclosed holes. Disks are closed, so two sites 2r apart touch at r
// (a merge with Death == r counts as merged) and a hole with Death == r is
// already filled (holes counted satisfy Birth <= r < Death). For r < 0 or
// NaN the union is empty and both numbers are 0.
func (p *Persistence) Betti(r float64) (pieces, holes int) {
	if p == nil || !(r >= 0) {
		return 0, 0
	}
	merged := sort.Search(len(p.Merges), func(i int) bool { return p.Merges[i].Death > r })
	pieces = p.Vertices - merged
	for _, h := range p.Holes {
		if h.Birth <= r && r < h.Death {
			holes++
		}
	}
	return pieces, holes
}

// persistSortPacked sorts words packed as key<<32 | index ascending by
// their upper 32 bits, a stable least-significant-digit radix sort with
// 11-bit digits (digits equal across all words skipped), so that words
// with equal keys stay in input order; tmp is scratch of the same length.
// It returns the sorted slice (a or tmp) and the other one. Long slices
// are cut in GOMAXPROCS parts (at most persistSortParts) that count and
// scatter at once, each pass placing the parts' words of a digit one
// after the other (so the sort stays stable).
func persistSortPacked(a, tmp []uint64) (sorted, free []uint64) {
	n := len(a)
	w := min(runtime.GOMAXPROCS(0), persistSortParts, n/persistSortGrain)
	if w < 2 {
		return persistRadixSortFrom(a, tmp, 32)
	}
	const bits = 11
	const nb = 1 << bits
	var hist [persistSortParts][nb]int32
	src, dst := a, tmp
	run := func(f func(k, lo, hi int)) {
		var wg sync.WaitGroup
		for k := 1; k < w; k++ {
			wg.Add(1)
			go func() {
				defer wg.Done()
				f(k, n*k/w, n*(k+1)/w)
			}()
		}
		f(0, 0, n/w)
		wg.Wait()
	}
	for shift := uint(32); shift < 64; shift += bits {
		run(func(k, lo, hi int) {
			h := &hist[k]
			*h = [nb]int32{}
			for _, x := range src[lo:hi] {
				h[(x>>shift)&(nb-1)]++
			}
		})
		d0 := (src[0] >> shift) & (nb - 1)
		total := int32(0)
		for k := range w {
			total += hist[k][d0]
		}
		if total == int32(n) {
			continue // all words share this digit
		}
		var sum int32
		for b := range nb {
			for k := range w {
				c := hist[k][b]
				hist[k][b] = sum
				sum += c
			}
		}
		run(func(k, lo, hi int) {
			h := &hist[k]
			for _, x := range src[lo:hi] {
				b := (x >> shift) & (nb - 1)
				j := h[b]
				h[b] = j + 1
				dst[j] = x
			}
		})
		src, dst = dst, src
	}
	return src, dst
}

// persistSortParts is the most parts persistSortPacked sorts at once, and
// persistSortGrain the least number of words per part.
const (
	persistSortParts = 4
	persistSortGrain = 1 << 14
)

// persistRadixSortFrom sorts a by bits from and up (a stable LSD radix
// sort of 11-bit digits; digits equal across all words are skipped) using
// tmp, of the same length, as scratch. It returns the sorted slice (a or
// tmp) and the other one.
func persistRadixSortFrom(a, tmp []uint64, from uint) (sorted, free []uint64) {
	const bits = 11
	const nb = 1 << bits
	const maxPasses = (64 + bits - 1) / bits
	n := len(a)
	if n < 2 {
		return a, tmp
	}
	passes := int((64 - from + bits - 1) / bits)
	var hist [maxPasses][nb]int32
	switch passes {
	case 3:
		for _, k := range a {
			hist[0][(k>>from)&(nb-1)]++
			hist[1][(k>>(from+bits))&(nb-1)]++
			hist[2][(k>>(from+2*bits))&(nb-1)]++
		}
	default:
		for _, k := range a {
			for d := 0; d < passes; d++ {
				hist[d][(k>>(from+uint(d)*bits))&(nb-1)]++
			}
		}
	}
	src, dst := a, tmp
	for d := 0; d < passes; d++ {
		shift := from + uint(d)*bits
		h := &hist[d]
		if h[(a[0]>>shift)&(nb-1)] == int32(n) {
			continue // all words share this digit
		}
		var sum int32
		for b := range h {
			c := h[b]
			h[b] = sum
			sum += c
		}
		for _, k := range src {
			b := (k >> shift) & (nb - 1)
			j := h[b]
			h[b] = j + 1
			dst[j] = k
		}
		src, dst = dst, src
	}
	return src, dst
}

// persistFixTies orders each run of words of s (sorted by persistSortPacked)
// with equal upper 32 bits by full(index), then index: the key in the upper
// bits being a prefix of full, s is then ordered by (full, index). Long
// slices are cut at run starts into GOMAXPROCS parts ordered at once.
func persistFixTies(s []uint64, full func(i uint32) uint64) {
	n := len(s)
	w := min(runtime.GOMAXPROCS(0), n/persistSortGrain)
	if w < 2 {
		persistFixTiesIn(s, full)
		return
	}
	cut := make([]int, w+1)
	cut[w] = n
	for k := 1; k < w; k++ {
		c := max(n*k/w, cut[k-1])
		for c < n && s[c]>>32 == s[c-1]>>32 {
			c++ // inside a run: cut after it
		}
		cut[k] = c
	}
	var wg sync.WaitGroup
	for k := 1; k < w; k++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			persistFixTiesIn(s[cut[k]:cut[k+1]], full)
		}()
	}
	persistFixTiesIn(s[:cut[1]], full)
	wg.Wait()
}

// persistFixTiesIn is persistFixTies on one goroutine.
func persistFixTiesIn(s []uint64, full func(i uint32) uint64) {
	n := len(s)
	for i := 0; i < n; {
		j := i + 1
		for j < n && s[j]>>32 == s[i]>>32 {
			j++
		}
		if j-i > 1 {
			persistFixRun(s[i:j], full)
		}
		i = j
	}
}

// persistFixRun orders a run of words with equal upper bits by (full key,
// index), unless it is in that order already.
func persistFixRun(run []uint64, full func(i uint32) uint64) {
	prev := full(uint32(run[0]))
	for _, x := range run[1:] {
		k := full(uint32(x))
		if k < prev {
			slices.SortFunc(run, func(x, y uint64) int {
				if c := cmp.Compare(full(uint32(x)), full(uint32(y))); c != 0 {
					return c
				}
				return cmp.Compare(uint32(x), uint32(y))
			})
			return
		}
		prev = k
	}
}

// persistTieByLength reorders each run of equal keys by increasing squared
// edge length (then half-edge index) when the run is not already in that
// order.
func persistTieByLength(t *planar.Triangulation, keys []uint64, ids []int32) {
	tr, xy := t.Triangles, t.Coords
	len2 := func(e int32) float64 {
		a, b := tr[e], tr[planar.NextHalfedge(e)]
		dx := xy[2*a] - xy[2*b]
		dy := xy[2*a+1] - xy[2*b+1]
		return float64(dx*dx) + float64(dy*dy)
	}
	n := len(keys)
	for i := 0; i < n; {
		j := i + 1
		for j < n && keys[j] == keys[i] {
			j++
		}
		if j-i > 1 {
			run := ids[i:j]
			sorted := true
			prev := len2(run[0])
			for _, e := range run[1:] {
				l := len2(e)
				if l < prev {
					sorted = false
					break
				}
				prev = l
			}
			if !sorted {
				slices.SortFunc(run, func(a, b int32) int {
					if c := cmp.Compare(len2(a), len2(b)); c != 0 {
						return c
					}
					return cmp.Compare(a, b)
				})
			}
		}
		i = j
	}
}
