// Gaps: the connected components of the uncovered part of the site area.
//
// Math. Inside the Voronoi cell of site i, U(r) ∩ V_i = D(p_i, r) ∩ V_i, so
// A \ U(r) is the union over clipped cell pieces P of P \ D(p_i, r). Each
// piece's components are traced exactly (gaps_trace.go). Components of
// neighbouring cells i, j join exactly where they share a portion of the
// bisector edge of positive length: a point x of the bisector has
// |x − p_i| = |x − p_j|, so a portion outside D(p_i, r) is also outside
// D(p_j, r) and is traced, reversed, in j's piece too. Portions are compared
// by the canonical coordinate along the bisector of the pair (the same
// formula from both sides); two portions of the pair overlapping by more
// than the rounding of that coordinate share a piece of the bisector
// (different portions of one bisector, separated by the boundary of the
// area or by a point where the circles touch it, overlap at most at a
// point). Union-find over the piece components then gives the gaps.
//
// Per gap: the area and first moments are sums of the exact per-piece
// values; the deepest point is the farthest ring vertex from its own site
// over the gap's pieces (the distance to the nearest site is convex on each
// cell, so on a piece component its maximum is at a vertex of the traced
// boundary; arc points are at distance r and every component of positive
// area has a ring vertex outside the disk), which is the range that closes
// the gap; the bounding box includes the extreme points of the arcs; the
// sites are those whose cells the gap meets.

package coverage

import (
	"cmp"
	"math"
	"slices"
	"sync"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// DefaultChordTolerance is the default sagitta of outline chords, relative
// to the range.
const DefaultChordTolerance = 0.002

// Gaps returns the connected components of the part of the site area
// farther than r from every site, ordered by decreasing closing range, then
// decreasing area; IDs number them from 1. Outlines replace arcs by chords
// whose sagitta is at most chordTol·r (0 or NaN: DefaultChordTolerance;
// negative: no outlines). r <= 0 gives the whole area (one gap per
// connected part); NaN gives nil.
func (l *Layout) Gaps(r, chordTol float64) []Gap {
	gs, _ := l.gaps(r, chordTol, false)
	return gs
}

// gapMerged holds the traced components of all cells, with global indices.
type gapMerged struct {
	nodes    []gapNode
	loopElem []int32 // len = loops + 1
	elems    []gapElem
	portions []gapPortion
	matched  []bool  // per element: a bisector portion shared with another cell
	loopNode []int32 // per loop: its node (filled by outlines)
}

var gapTracerPool = sync.Pool{New: func() any { return new(gapTracer) }}

// gaps is Gaps with an optional per-piece self-check of the traced areas
// against the closed form; it also returns the number of pieces that
// needed the fallback or failed the check.
func (l *Layout) gaps(r, chordTol float64, selfCheck bool) ([]Gap, int) {
	return l.gapsAt(gapParams{r: r}, chordTol, selfCheck)
}

// gapParams selects the disks of a gap computation: radius r for every
// cell, or, with radii set (a layout with per-device ranges), radii[v] for
// the cell of vertex v, r being their largest; closing asks for each
// gap's GapClosing (with t the uniform power growth the radii stand for).
type gapParams struct {
	r       float64
	radii   []float64
	t       float64
	closing bool
}

// radius returns the disk radius of vertex v's cell.
func (gp *gapParams) radius(v int32) float64 {
	if gp.radii != nil {
		return gp.radii[v]
	}
	return gp.r
}

// gapsAt is gaps for the disks gp selects.
func (l *Layout) gapsAt(gp gapParams, chordTol float64, selfCheck bool) ([]Gap, int) {
	r := gp.r
	if math.IsNaN(r) {
		return nil, 0
	}
	if r < 0 {
		r = 0
	}
	gp.r = r
	if chordTol == 0 || math.IsNaN(chordTol) {
		chordTol = DefaultChordTolerance
	}
	c := l.Cells
	nv := l.numVertices()
	const chunk = 1024
	nc := (nv + chunk - 1) / chunk
	chunks := make([]gapChunk, nc)
	planar.ParallelChunks(nv, chunk, 0, func(ci, lo, hi int) {
		t := gapTracerPool.Get().(*gapTracer)
		t.l, t.r, t.r2, t.selfCheck, t.keep = l, r, r*r, selfCheck, chordTol > 0 || gp.closing
		// Trace into the tracer's reused buffers, then keep an exact-size
		// copy: appending to fresh slices would leave about twice the
		// result in discarded backing arrays.
		ch := &t.chunk
		ch.reset()
		for v := int32(lo); v < int32(hi); v++ {
			if c.SiteStart[v] == c.SiteStart[v+1] {
				continue
			}
			if gp.radii != nil {
				t.r = gp.radii[v]
				t.r2 = t.r * t.r
			}
			if d, _, _ := l.vertexFarthest(v); t.r >= d {
				continue
			}
			for p := c.SiteStart[v]; p < c.SiteStart[v+1]; p++ {
				t.piece(p, v, ch)
			}
		}
		chunks[ci] = ch.clone()
		t.l = nil
		gapTracerPool.Put(t)
	})
	m, anomalies := gapMerge(chunks)
	chunks = nil
	// Portions overlapping by more than the rounding of the canonical
	// coordinate (gapPortionUlps of the coordinates) are the same piece of
	// bisector.
	b := l.Area.Bound()
	ext := math.Max(math.Max(math.Abs(b.Min[0]), math.Abs(b.Max[0])), math.Max(math.Abs(b.Min[1]), math.Abs(b.Max[1])))
	gapUnion := m.union(gapPortionUlps * (ext + r))
	// (r is the largest radius when they differ.)
	return l.gapAssemble(m, gapUnion, &gp, chordTol), anomalies
}

// gapPortionUlps is the overlap, relative to the coordinates' magnitude,
// beyond which two bisector portions are the same piece of bisector: the
// canonical coordinate along a bisector is computed by a few operations from
// clipped-cell vertices that themselves carry a few ulps of error, so two
// copies of one portion agree within a few ulps; 64 ulps (64·2⁻⁵²) is far
// above that and far below any real overlap of two different cells' pieces.
const gapPortionUlps = 64 * 0x1p-52

// gapMerge concatenates the chunks, converting to global indices; the
// chunks are copied into place at once, each freed once copied.
func gapMerge(chunks []gapChunk) (*gapMerged, int) {
	// Offsets of each chunk's nodes, loops, elements and portions.
	off := make([][4]int, len(chunks)+1)
	an := 0
	for i := range chunks {
		ch := &chunks[i]
		o := off[i]
		off[i+1] = [4]int{o[0] + len(ch.nodes), o[1] + len(ch.loopElem), o[2] + len(ch.elems), o[3] + len(ch.portions)}
		an += ch.anomalies
	}
	tot := off[len(chunks)]
	m := &gapMerged{
		nodes:    make([]gapNode, tot[0]),
		loopElem: make([]int32, tot[1]+1),
		elems:    make([]gapElem, tot[2]),
		portions: make([]gapPortion, tot[3]),
	}
	planar.ParallelChunks(len(chunks), 1, 0, func(i, _, _ int) {
		ch := &chunks[i]
		o := off[i]
		n0, l0, e0 := int32(o[0]), int32(o[1]), int32(o[2])
		for k, nd := range ch.nodes {
			nd.loop0 += l0
			nd.loop1 += l0
			m.nodes[o[0]+k] = nd
		}
		for k, le := range ch.loopElem {
			m.loopElem[o[1]+k] = le + e0
		}
		copy(m.elems[o[2]:], ch.elems)
		for k, p := range ch.portions {
			if p.elem >= 0 {
				p.elem += e0
			}
			p.node += n0
			m.portions[o[3]+k] = p
		}
		*ch = gapChunk{}
	})
	m.loopElem[tot[1]] = int32(tot[2])
	m.matched = make([]bool, len(m.elems))
	return m, an
}

// union joins the components sharing bisector portions and returns the
// union-find parent array (roots are their own parents, fully compressed).
func (m *gapMerged) union(tolLen float64) []int32 {
	uf := planar.NewUnionFind(len(m.nodes))
	ps := m.portions
	// Any order by (key, lo) gives the same unions: ties are tested both
	// ways round.
	planar.ParallelSortFunc(ps, func(a, b gapPortion) int {
		if a.key != b.key {
			if a.key < b.key {
				return -1
			}
			return 1
		}
		return cmp.Compare(a.lo, b.lo)
	})
	for g0 := 0; g0 < len(ps); {
		g1 := g0 + 1
		for g1 < len(ps) && ps[g1].key == ps[g0].key {
			g1++
		}
		for i := g0; i < g1; i++ {
			a := &ps[i]
			for k := i + 1; k < g1; k++ {
				b := &ps[k]
				if b.lo >= a.hi {
					break // sorted by lo: no later portion overlaps a
				}
				if m.nodes[a.node].v == m.nodes[b.node].v {
					continue
				}
				if ov := math.Min(a.hi, b.hi) - b.lo; !(ov > tolLen) {
					continue
				}
				uf.UnionMin(a.node, b.node)
				if a.elem >= 0 {
					m.matched[a.elem] = true
				}
				if b.elem >= 0 {
					m.matched[b.elem] = true
				}
			}
		}
		g0 = g1
	}
	return uf.Flatten()
}

// gapAssemble builds the Gap values from the components and their roots.
func (l *Layout) gapAssemble(m *gapMerged, root []int32, gp *gapParams, chordTol float64) []Gap {
	gapOf := make([]int32, len(m.nodes))
	index := make([]int32, len(m.nodes)) // per root node: its gap + 1
	var gs []Gap
	type acc struct{ mx, my float64 }
	var accs []acc
	var pow []float64 // per gap, with radii: the largest power of a deepest point
	for i := range m.nodes {
		rt := root[i]
		g := index[rt] - 1
		if g < 0 {
			g = int32(len(gs))
			index[rt] = g + 1
			gs = append(gs, Gap{
				Bound:        orb.Bound{Min: orb.Point{math.Inf(1), math.Inf(1)}, Max: orb.Point{math.Inf(-1), math.Inf(-1)}},
				ClosingRange: -1,
			})
			accs = append(accs, acc{})
			pow = append(pow, math.Inf(-1))
		}
		gapOf[i] = g
		nd := &m.nodes[i]
		G := &gs[g]
		cx, cy := l.site(nd.v)
		G.Area += nd.area
		accs[g].mx += nd.mx + cx*nd.area
		accs[g].my += nd.my + cy*nd.area
		G.Bound.Min[0] = math.Min(G.Bound.Min[0], nd.minX)
		G.Bound.Min[1] = math.Min(G.Bound.Min[1], nd.minY)
		G.Bound.Max[0] = math.Max(G.Bound.Max[0], nd.maxX)
		G.Bound.Max[1] = math.Max(G.Bound.Max[1], nd.maxY)
		G.TouchesBoundary = G.TouchesBoundary || nd.touches
		if gp.radii != nil {
			// Deepest by power: the device of the cell holding the point
			// needs its distance, every other one its power plus r².
			rv := gp.radii[nd.v]
			if p := nd.deepD*nd.deepD - rv*rv; p > pow[g] {
				pow[g] = p
				G.ClosingRange = nd.deepD
				G.Deepest = orb.Point{nd.deepX, nd.deepY}
			}
		} else if nd.deepD > G.ClosingRange {
			G.ClosingRange = nd.deepD
			G.Deepest = orb.Point{nd.deepX, nd.deepY}
		}
	}
	index = nil
	// Sites per gap, ascending and unique: pairs gap << 32 | site sorted.
	pairs := make([]uint64, len(m.nodes))
	for i := range m.nodes {
		pairs[i] = uint64(gapOf[i])<<32 | uint64(l.Tri.Source[m.nodes[i].v])
	}
	planar.ParallelSortFunc(pairs, cmp.Compare[uint64])
	for i, p := range pairs {
		if i > 0 && pairs[i-1] == p {
			continue
		}
		gs[p>>32].Sites = append(gs[p>>32].Sites, int(uint32(p)))
	}
	pairs = nil
	for g := range gs {
		if gs[g].Area > 0 {
			gs[g].Centroid = orb.Point{accs[g].mx / gs[g].Area, accs[g].my / gs[g].Area}
		}
	}
	if gp.closing {
		l.gapClosings(m, gapOf, gs, pow, gp)
	}
	if chordTol > 0 {
		outl := m.outlines(l, gapOf, len(gs), gp, chordTol)
		for g := range gs {
			gs[g].Outline = outl[g]
		}
	}
	order := make([]int32, len(gs))
	for i := range order {
		order[i] = int32(i)
	}
	slices.SortStableFunc(order, func(i, j int32) int {
		a, b := &gs[i], &gs[j]
		switch {
		case gp.radii != nil && pow[i] != pow[j]:
			return -cmp.Compare(pow[i], pow[j])
		case a.ClosingRange != b.ClosingRange:
			return -cmp.Compare(a.ClosingRange, b.ClosingRange)
		case a.Area != b.Area:
			return -cmp.Compare(a.Area, b.Area)
		case a.Centroid[0] != b.Centroid[0]:
			return cmp.Compare(a.Centroid[0], b.Centroid[0])
		}
		return cmp.Compare(a.Centroid[1], b.Centroid[1])
	})
	out := make([]Gap, len(gs))
	for i, g := range order {
		out[i] = gs[g]
		out[i].ID = i + 1
	}
	return out
}
