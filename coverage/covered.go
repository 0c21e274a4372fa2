// The covered part of the site area as polygons: A ∩ U(r), the union of the
// disks inside the area, from the outlines of its gaps.
//
// Math. C = A \ G with G the union of the gaps, so as oriented boundary
// chains ∂C = ∂A − ∂G: the area's rings (exteriors counter-clockwise,
// holes clockwise: the area on the left) and the gap outlines (the gap on
// the left) run the same way where a gap meets the area boundary, and those
// portions cancel; what is left is the covered part of ∂A plus every other
// piece of gap outline — the chords standing for arcs — reversed, which
// puts C on the left. Each area edge is split at the outline vertices that
// lie on it (within coveredOnEdgeRel of the coordinates' magnitude; a
// vertex that close to an area vertex is that vertex), a sub-edge cancels
// when a gap outline has the same segment, and the remaining segments are
// linked into rings, at a vertex where several leave taking the sharpest
// left turn so that parts touching at a point become separate rings.
// Rings of positive area are exteriors, the others holes, each given to
// the smallest exterior containing it.
//
// Accuracy: the gap outlines replace arcs by chords lying inside the disks
// (sagitta at most chordTol·r, see Gaps), so each outline contains its gap
// and the polygons returned lie inside the true covered part, short of it
// by the circular segments, about (2/3)·chordTol·r per metre of arc; no
// point outside the disks is ever claimed covered.

package coverage

import (
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// coveredOnEdgeRel is the distance, relative to the largest coordinate
// magnitude of the area plus its extent, within which a gap outline vertex
// lies on an area edge: such vertices are computed from the edge by a few
// operations (a few ulps, about 1e-15 relative), while outline vertices off
// the boundary (chord ends on a circle) are much farther unless a circle
// all but touches the edge; 1e-11 leaves a margin of 10⁴.
const coveredOnEdgeRel = 1e-11

// Covered returns the covered part of the site area at the range of gaps,
// which must be the gaps with outlines that Gaps returned for that range
// (no gaps: the whole area). Polygons have a counter-clockwise exterior
// and clockwise holes, one polygon per connected covered part (parts
// touching at a single point are separate polygons). See the file comment
// for the accuracy.
func (l *Layout) Covered(gaps []Gap) orb.MultiPolygon {
	areaRings := l.coveredAreaRings()
	if len(gaps) == 0 {
		out := make(orb.MultiPolygon, 0, len(areaRings))
		return append(out, l.Area.MultiPolygon()...)
	}
	b := l.Area.Bound()
	mag := math.Max(math.Max(math.Abs(b.Min[0]), math.Abs(b.Max[0])), math.Max(math.Abs(b.Min[1]), math.Abs(b.Max[1])))
	tol := coveredOnEdgeRel * (mag + math.Max(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]))
	idx := newCoveredEdgeIndex(areaRings, b, tol)

	// The outline rings that reach the boundary, with their vertices on it
	// snapped to area vertices and recorded as split points of their edges
	// (flat, ring k from touched[start[k]] to touched[start[k+1]]). Every
	// other outline ring (those of gaps enclosed by coverage, and the rings
	// around covered islands) is a whole ring of ∂C, reversed, and needs
	// no linking.
	var whole []orb.Ring
	var touched []orb.Point
	start := []int{0}
	splits := make([][]coveredSplit, len(idx.edges))
	for gi := range gaps {
		touch := gaps[gi].TouchesBoundary
		for _, poly := range gaps[gi].Outline {
			for _, ring := range poly {
				n := len(ring)
				if n > 1 && ring[0] == ring[n-1] {
					n--
				}
				on := false
				if touch {
					for i := range n {
						q, hit := idx.touch(ring[i], splits)
						touched = append(touched, q)
						on = on || hit
					}
					if on {
						start = append(start, len(touched))
						continue
					}
					touched = touched[:start[len(start)-1]]
				}
				r := append(orb.Ring(nil), ring...)
				slices.Reverse(r)
				whole = append(whole, r)
			}
		}
	}

	// The area edges, split; a sub-edge that a touching outline ring runs
	// along cancels with it, the rest of those rings is reversed.
	var sub []coveredSeg
	subAt := map[[2]orb.Point]int32{}
	for e, ed := range idx.edges {
		sp := splits[e]
		slices.SortFunc(sp, func(x, y coveredSplit) int { return cmp.Compare(x.t, y.t) })
		prev := ed.a
		for k := 0; k <= len(sp); k++ {
			next := ed.b
			if k < len(sp) {
				next = sp[k].p
			}
			if next == prev {
				continue
			}
			subAt[[2]orb.Point{prev, next}] = int32(len(sub))
			sub = append(sub, coveredSeg{prev, next})
			prev = next
		}
	}
	gone := make([]bool, len(sub))
	var out []coveredSeg
	for k := 0; k+1 < len(start); k++ {
		ring := touched[start[k]:start[k+1]]
		for i, p := range ring {
			q := ring[(i+1)%len(ring)]
			if p == q {
				continue
			}
			if j, ok := subAt[[2]orb.Point{p, q}]; ok && !gone[j] {
				gone[j] = true
				continue
			}
			out = append(out, coveredSeg{q, p})
		}
	}
	for j, sg := range sub {
		if !gone[j] {
			out = append(out, sg)
		}
	}
	return coveredPolygons(append(coveredRings(out), whole...))
}

// coveredAreaRings returns the area's rings, open (no repeated first
// point), exteriors counter-clockwise and holes clockwise.
func (l *Layout) coveredAreaRings() []orb.Ring {
	var rings []orb.Ring
	for _, poly := range l.Area.MultiPolygon() {
		for k, ring := range poly {
			r := append(orb.Ring(nil), ring...)
			if n := len(r); n > 1 && r[0] == r[n-1] {
				r = r[:n-1]
			}
			if len(r) < 3 {
				continue
			}
			if a := planar.RingArea(planar.FlatRing(r)); (a > 0) != (k == 0) {
				slices.Reverse(r)
			}
			rings = append(rings, r)
		}
	}
	return rings
}

// coveredSeg is one directed segment of the covered boundary.
type coveredSeg struct{ a, b orb.Point }

// coveredSplit is a point p at parameter t along an area edge.
type coveredSplit struct {
	t float64
	p orb.Point
}

// coveredEdgeIndex finds the area edges near a point: a uniform grid of
// about one edge per cell over the area's bounding box.
type coveredEdgeIndex struct {
	edges    []coveredSeg
	grid     planar.Grid
	cells    [][]int32
	tol      float64
	vertices map[orb.Point]bool
}

func newCoveredEdgeIndex(rings []orb.Ring, b orb.Bound, tol float64) *coveredEdgeIndex {
	idx := &coveredEdgeIndex{tol: tol, vertices: map[orb.Point]bool{}}
	for _, r := range rings {
		for i := range r {
			idx.edges = append(idx.edges, coveredSeg{r[i], r[(i+1)%len(r)]})
			idx.vertices[r[i]] = true
		}
	}
	idx.grid = planar.GridOfCells(b.Min[0]-tol, b.Min[1]-tol, b.Max[0]+tol, b.Max[1]+tol, len(idx.edges))
	g := &idx.grid
	idx.cells = make([][]int32, g.NumCells())
	for e, ed := range idx.edges {
		i0, j0 := g.Col(math.Min(ed.a[0], ed.b[0])-tol), g.Row(math.Min(ed.a[1], ed.b[1])-tol)
		i1, j1 := g.Col(math.Max(ed.a[0], ed.b[0])+tol), g.Row(math.Max(ed.a[1], ed.b[1])+tol)
		for j := j0; j <= j1; j++ {
			for i := i0; i <= i1; i++ {
				c := j*idx.grid.NX + i
				idx.cells[c] = append(idx.cells[c], int32(e))
			}
		}
	}
	return idx
}

// touch returns q, or the area vertex within tol of it, and records it as
// a split point of every area edge it lies on; hit reports that q is on
// the area boundary.
func (idx *coveredEdgeIndex) touch(q orb.Point, splits [][]coveredSplit) (p orb.Point, hit bool) {
	if idx.vertices[q] {
		return q, true
	}
	cell := idx.cells[idx.grid.Cell(q[0], q[1])]
	for _, e := range cell {
		ed := idx.edges[e]
		if math.Hypot(q[0]-ed.a[0], q[1]-ed.a[1]) <= idx.tol {
			return ed.a, true
		}
		if math.Hypot(q[0]-ed.b[0], q[1]-ed.b[1]) <= idx.tol {
			return ed.b, true
		}
	}
	for _, e := range cell {
		ed := idx.edges[e]
		dx, dy := ed.b[0]-ed.a[0], ed.b[1]-ed.a[1]
		l2 := dx*dx + dy*dy
		t := ((q[0]-ed.a[0])*dx + (q[1]-ed.a[1])*dy) / l2
		if !(t > 0 && t < 1) {
			continue
		}
		if math.Abs((q[0]-ed.a[0])*dy-(q[1]-ed.a[1])*dx)/math.Sqrt(l2) <= idx.tol {
			splits[e] = append(splits[e], coveredSplit{t, q})
			hit = true
		}
	}
	return q, hit
}

// coveredRings links directed segments into closed rings; where several
// segments leave a point, the one turning most to the left of the
// arriving direction is taken.
func coveredRings(segs []coveredSeg) []orb.Ring {
	// The segments leaving each point: first[p], then along next.
	first := make(map[orb.Point]int32, len(segs))
	next := make([]int32, len(segs))
	for i := len(segs) - 1; i >= 0; i-- {
		f, ok := first[segs[i].a]
		if !ok {
			f = -1
		}
		next[i], first[segs[i].a] = f, int32(i)
	}
	used := make([]bool, len(segs))
	var rings []orb.Ring
	for s0 := range segs {
		if used[s0] {
			continue
		}
		used[s0] = true
		ring := orb.Ring{segs[s0].a}
		cur := s0
		for {
			p := segs[cur].b
			if p == segs[s0].a {
				break
			}
			ring = append(ring, p)
			f, ok := first[p]
			if !ok {
				f = -1
			}
			nx := coveredNext(segs, f, next, used, segs[cur])
			if nx < 0 {
				ring = nil // an open chain: the outlines did not match up
				break
			}
			used[nx] = true
			cur = int(nx)
		}
		if len(ring) >= 3 {
			rings = append(rings, append(ring, ring[0]))
		}
	}
	return rings
}

// coveredNext picks the unused segment among those leaving a point (c,
// then along next) that turns most to the left from the direction of in;
// −1 when none is left.
func coveredNext(segs []coveredSeg, c int32, next []int32, used []bool, in coveredSeg) int32 {
	best, bestAng := int32(-1), 0.0
	dx, dy := in.b[0]-in.a[0], in.b[1]-in.a[1]
	for ; c >= 0; c = next[c] {
		if used[c] {
			continue
		}
		ex, ey := segs[c].b[0]-segs[c].a[0], segs[c].b[1]-segs[c].a[1]
		ang := math.Atan2(dx*ey-dy*ex, dx*ex+dy*ey) // turn angle, left positive
		if best < 0 || ang > bestAng {
			best, bestAng = c, ang
		}
	}
	return best
}

// coveredPolygons sorts rings into exteriors (positive area) and holes,
// each hole going to the smallest exterior that contains it (found through
// a grid of the exteriors' bounding boxes; when only one exterior's box
// holds the hole's, the hole is in it).
func coveredPolygons(rings []orb.Ring) orb.MultiPolygon {
	type ext struct {
		ring orb.Ring
		flat []float64 // the ring flattened, made when first needed
		area float64
		b    orb.Bound
		hole []orb.Ring
	}
	var exts []*ext
	var holes []orb.Ring
	for _, r := range rings {
		switch a := coveredRingArea(r); {
		case a > 0:
			exts = append(exts, &ext{ring: r, area: a, b: r.Bound()})
		case a < 0:
			holes = append(holes, r)
		}
	}
	slices.SortFunc(exts, func(x, y *ext) int { return cmp.Compare(x.area, y.area) })
	// A grid of about one exterior per cell, each cell listing the
	// exteriors whose bounding box meets it, smallest first.
	var all orb.Bound
	for i, e := range exts {
		if i == 0 {
			all = e.b
		} else {
			all = all.Union(e.b)
		}
	}
	g := planar.GridOfCells(all.Min[0], all.Min[1], all.Max[0], all.Max[1], len(exts))
	cells := make([][]int32, g.NumCells())
	for k, e := range exts {
		for j := g.Row(e.b.Min[1]); j <= g.Row(e.b.Max[1]); j++ {
			for i := g.Col(e.b.Min[0]); i <= g.Col(e.b.Max[0]); i++ {
				cells[j*g.NX+i] = append(cells[j*g.NX+i], int32(k))
			}
		}
	}
	for _, h := range holes {
		hb := h.Bound()
		var cands []*ext
		for _, k := range cells[g.Cell(hb.Min[0], hb.Min[1])] {
			if e := exts[k]; e.b.Contains(hb.Min) && e.b.Contains(hb.Max) {
				cands = append(cands, e)
			}
		}
		for k, e := range cands {
			if k == len(cands)-1 {
				e.hole = append(e.hole, h)
				break
			}
			if e.flat == nil {
				e.flat = planar.FlatRing(e.ring)
			}
			if coveredInside(e.flat, h) {
				e.hole = append(e.hole, h)
				break
			}
		}
	}
	out := make(orb.MultiPolygon, 0, len(exts))
	for _, e := range exts {
		out = append(out, append(orb.Polygon{e.ring}, e.hole...))
	}
	return out
}

// coveredRingArea is the shoelace area of a closed ring, positive when
// counter-clockwise (as planar.RingArea, without a flat copy).
func coveredRingArea(r orb.Ring) float64 {
	a := 0.0
	for i := 1; i < len(r); i++ {
		a += r[i-1][0]*r[i][1] - r[i][0]*r[i-1][1]
	}
	return a / 2
}

// coveredInside reports whether ring h lies inside the ring flat, judged at
// its first vertex not on that ring.
func coveredInside(flat []float64, h orb.Ring) bool {
	for _, p := range h {
		if c := planar.PointInRing(flat, p[0], p[1]); c != 0 {
			return c > 0
		}
	}
	return false
}
