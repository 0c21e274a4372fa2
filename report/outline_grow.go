// Conservative rounding of written gap and covered outlines.
//
// Output coordinates are rounded (scene.point), which moves every vertex
// by at most the rounding reach ε: half the diagonal of a rounding cell,
// mapped to metres of the local plane (roundingReach below). A gap
// outline computed in the plane contains its exact gap (its arcs are
// chords inside the disks, coverage/gaps_outline.go), but after rounding a
// vertex on a circle may move up to ε into the gap, and a vertex of the
// covered layer up to ε out of its disk. So before rounding each outline
// is moved by ε (roundingReach, slightly more than the largest move):
// gap outlines grow, covered parts shrink.
//
// Construction (offsetRing). The ring keeps its interior on the left
// (exteriors counter-clockwise, holes clockwise). Every edge that does not
// lie on the site area's boundary is moved parallel to itself by ε to its
// right (outward; a covered part is shrunk as its reversed ring is
// grown); edges on the area's boundary stay on it (areaEdges finds them).
// A vertex between two moved edges becomes the meeting point of the moved
// lines (a mitre), except at a convex corner turning by more than 90°,
// where it becomes two points on the moved lines whose joining edge is
// perpendicular to the corner's bisector at distance ε from the corner (a
// square cap: the mitre would reach far out). A vertex between a moved
// edge and an area edge slides along the area edge to the moved line.
//
// Why the written polygon then contains the exact gap G (the covered case
// is the same statement for the complement). (1) Every piece of the moved
// boundary ∂O is at least ε from G: along an arc the moved chords' ends
// are at distance r − ε/cos(θ/2) ≤ r − ε from the disk's centre (θ the
// chord angle), so the moved chords lie in the disk shrunk by ε, which G
// does not enter within ε; at a corner of two arcs (a convex corner of G,
// G locally in the wedge of the two chords) the mitre or cap lies on the
// far side of lines at distance ε from the wedge. (2) Every edge moves
// only to its right (area edges slide along themselves), so a point's
// winding number never decreases while the edges move: points of G keep
// winding ≥ 1 (offsetRing refuses an edge that would reverse, which would
// break this). (3) Rounding moves each vertex by less than ε, so the
// straight homotopy from ∂O to the rounded boundary passes no point of G,
// whose winding number stays ≥ 1; the written feature is checked valid
// (outline.go), so that number is 1 and the point is inside. In longitude
// and latitude the edges are straight in degrees rather than in metres;
// over an edge of the outline the difference is far below the margin of
// roundingMargin.
//
// What is left out, and why. (a) Beside the site area's boundary, up to ε:
// the outlines follow the area's edges, which are written rounded like
// everything else, so a gap there is only as exact as the written area
// (exact where the area's vertices are on the output grid: input vertices
// with no more decimals than written). (b) Features whose moved outline
// cannot be formed or written valid: where two parts of one outline come
// within about 2ε of each other (a covered neck or an exclusion narrower
// than about a rounding cell), an arc meets the area's boundary at so
// flat an angle that the slide would leave the area edge, or an edge
// would reverse. Such a feature is tried again with finerDigits more
// decimals and ε shrunk as much, then again, and finally written
// unrounded and unmoved (shortest round-trip doubles, exact to ~1e-9 m),
// as outline.go does for every outline. The figures (areas, counts) are
// those of the exact gaps; the outlines' own areas exceed them by the
// chords' segments and the ε strip.

package report

import (
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// Rounding reach. Planar output and projected copies round to 1 mm: a
// vertex moves at most half a cell along each axis, planarHalfCellDiag =
// 0.5·√2 mm in all. Geographic output rounds longitude and latitude to
// 1e-7° each; a degree of latitude is M·π/180 and of longitude
// N·cos φ·π/180 metres, with M and N cos φ at most a/√(1 − e²) (WGS84: a =
// 6378137 m, e² = f(2 − f), f = 1/298.257223563), so the move is at most
// geoHalfCellDiag = 0.5e-7·√2·(π/180)·a/√(1 − e²) ≈ 7.898 mm on the
// ellipsoid, and at most planar.MaxLocalScaleError more in the local
// plane (sites whose plane distorts more are refused). roundingMargin
// adds 1 % for the projected grids' scale (k ≥ 0.9993 for the grids
// offered, so at most 0.2 % between grid and local metres) and the
// floating-point conversions.
const (
	planarHalfCellDiag = 0.5e-3 * math.Sqrt2
	wgs84A             = 6378137.0
	wgs84F             = 1 / 298.257223563
	roundingMargin     = 1.01
)

// geoHalfCellDiag is the largest move, in metres on the ellipsoid, of
// rounding longitude and latitude to 1e-7° (see the constants above).
var geoHalfCellDiag = 0.5e-7 * math.Sqrt2 * math.Pi / 180 * wgs84A / math.Sqrt(1-wgs84F*(2-wgs84F))

// roundingReach returns ε, the distance in the local plane by which
// outlines are moved before s rounds them: at least the largest move of
// rounding a point (0 for an unrounded scene).
func (s *scene) roundingReach() float64 {
	if s.unrounded {
		return 0
	}
	e := planarHalfCellDiag
	if s.geographic() {
		e = geoHalfCellDiag * (1 + planar.MaxLocalScaleError)
	}
	return e * roundingMargin * math.Pow10(-s.extraDigits)
}

// onAreaRel is the distance, relative to the largest coordinate magnitude
// of the area plus its extent, within which an outline vertex lies on an
// area edge: vertices on the boundary are computed from the edge by a few
// operations (a few ulps, about 1e-15 relative, and the k-gap snapping a
// little more), others are much farther unless a circle all but touches
// the edge. A chord taken for an area edge is not moved: it lies within
// this distance of the boundary, inside what (a) of the file comment
// leaves out; an area edge taken for a chord is moved out of the area by
// ε: the polygon still contains the gap.
const onAreaRel = 1e-11

// areaEdges lists the site area's edges by the cells of a uniform grid,
// each edge in every cell its box (grown by tol) covers.
type areaEdges struct {
	xy          []float64 // ax, ay, bx, by per edge
	grid        planar.Grid
	start, list []int32 // edges of cell c: list[start[c]:start[c+1]]
	tol         float64
}

// areaEdgesOnce builds a scene's areaEdges once; scenes refined from it
// (finer) share it.
type areaEdgesOnce struct {
	once sync.Once
	ae   *areaEdges
}

// areaIndex returns the site area's edge index, built on first use (each
// time for a scene not made by newScene or finer).
func (s *scene) areaIndex() *areaEdges {
	if s.area == nil {
		return newAreaEdges(s.l.Area)
	}
	s.area.once.Do(func() { s.area.ae = newAreaEdges(s.l.Area) })
	return s.area.ae
}

func newAreaEdges(r *planar.Region) *areaEdges {
	ae := &areaEdges{}
	if r == nil || len(r.XY) < 6 {
		return ae
	}
	b := r.Bound()
	mag := max(math.Abs(b.Min[0]), math.Abs(b.Max[0]), math.Abs(b.Min[1]), math.Abs(b.Max[1]))
	ae.tol = onAreaRel * (mag + max(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]))
	regionEdges(r, func(ax, ay, bx, by float64) { ae.xy = append(ae.xy, ax, ay, bx, by) })
	t := ae.tol
	n := len(ae.xy) / 4
	ae.grid = planar.GridOfCells(b.Min[0]-t, b.Min[1]-t, b.Max[0]+t, b.Max[1]+t, max(areaCellsPerEdge*n, areaMinCells))
	g := &ae.grid
	ae.start = make([]int32, g.NumCells()+1)
	cells := func(e int, f func(c int)) {
		ax, ay, bx, by := ae.xy[4*e], ae.xy[4*e+1], ae.xy[4*e+2], ae.xy[4*e+3]
		r0, r1 := g.Row(min(ay, by)-t), g.Row(max(ay, by)+t)
		for y := r0; y <= r1; y++ {
			// The edge's x extent within the row's band (grown by
			// tol; the border rows reach to infinity).
			lo, hi := math.Inf(-1), math.Inf(1)
			if g.SY > 0 && y > 0 {
				lo = g.Y0 + float64(y)/g.SY - t
			}
			if g.SY > 0 && y < g.NY-1 {
				hi = g.Y0 + float64(y+1)/g.SY + t
			}
			x0, x1 := min(ax, bx), max(ax, bx)
			if ay != by {
				y0, y1 := max(lo, min(ay, by)), min(hi, max(ay, by))
				xa, xb := ax+(y0-ay)*(bx-ax)/(by-ay), ax+(y1-ay)*(bx-ax)/(by-ay)
				x0, x1 = max(x0, min(xa, xb)), min(x1, max(xa, xb))
			}
			for x := g.Col(x0 - t); x <= g.Col(x1+t); x++ {
				f(y*g.NX + x)
			}
		}
	}
	for e := range n {
		cells(e, func(c int) { ae.start[c+1]++ })
	}
	for c := 1; c < len(ae.start); c++ {
		ae.start[c] += ae.start[c-1]
	}
	ae.list = make([]int32, ae.start[len(ae.start)-1])
	fill := append([]int32(nil), ae.start[:len(ae.start)-1]...)
	for e := range n {
		cells(e, func(c int) { ae.list[fill[c]] = int32(e); fill[c]++ })
	}
	return ae
}

// regionEdges calls f with each edge of the region's rings.
func regionEdges(r *planar.Region, f func(ax, ay, bx, by float64)) {
	for k := 0; k+1 < len(r.RingStart); k++ {
		s, e := int(r.RingStart[k]), int(r.RingStart[k+1])
		for i := s; i < e; i++ {
			j := i + 1
			if j == e {
				j = s
			}
			f(r.XY[2*i], r.XY[2*i+1], r.XY[2*j], r.XY[2*j+1])
		}
	}
}

// The area edge grid has about areaCellsPerEdge cells per edge, at least
// areaMinCells: fine enough that most outline rings, away from the
// boundary, find their cells empty (nearBox).
const (
	areaCellsPerEdge = 4
	areaMinCells     = 4096
)

// near reports whether (x, y) lies within tol of area edge e.
func (ae *areaEdges) near(e int32, x, y float64) bool {
	ax, ay, bx, by := ae.xy[4*e], ae.xy[4*e+1], ae.xy[4*e+2], ae.xy[4*e+3]
	dx, dy := bx-ax, by-ay
	l := math.Hypot(dx, dy)
	if l == 0 {
		return math.Hypot(x-ax, y-ay) <= ae.tol
	}
	along := ((x-ax)*dx + (y-ay)*dy) / l
	return along >= -ae.tol && along <= l+ae.tol && math.Abs((x-ax)*dy-(y-ay)*dx)/l <= ae.tol
}

// nearBox reports whether a grid cell the box b covers lists an area
// edge (if none does, no point of b is within tol of the boundary).
func (ae *areaEdges) nearBox(b orb.Bound) bool {
	if len(ae.list) == 0 {
		return false
	}
	g := &ae.grid
	c0, r0, c1, r1 := g.Col(b.Min[0]), g.Row(b.Min[1]), g.Col(b.Max[0]), g.Row(b.Max[1])
	for y := r0; y <= r1; y++ {
		if ae.start[y*g.NX+c0] != ae.start[y*g.NX+c1+1] {
			return true
		}
	}
	return false
}

// edgeOf returns the area edge the segment (a, b) lies on (both ends
// within tol of it), or −1.
func (ae *areaEdges) edgeOf(ax, ay, bx, by float64) int32 {
	if len(ae.list) == 0 {
		return -1
	}
	c := ae.grid.Cell(ax, ay)
	for _, e := range ae.list[ae.start[c]:ae.start[c+1]] {
		if ae.near(e, ax, ay) && ae.near(e, bx, by) {
			return e
		}
	}
	return -1
}

// Shape limits of offsetRing. capTurnCos: a convex corner turning by more
// than 90° (cosine of the turn below 0) gets a square cap instead of a
// mitre, whose length ε/cos(turn/2) would exceed √2·ε. minTurnSlack: a
// mitre at a reflex corner is refused when 1 + cos(turn) is below it (a
// turn within 1.3° of 180°, mitre longer than 89·ε), as is a slide along
// an area edge longer than maxSlide·ε: such shapes go to the next level
// (finer rounding, 100 times smaller ε).
const (
	capTurnCos   = 0.0
	minTurnSlack = 2.5e-4
	maxSlide     = 64
)

// offsetScratch is the memory of offsetRing, reused from ring to ring and
// from feature to feature by a layer (in its polyBuf): the per-edge arrays
// of one ring and the moved ring.
type offsetScratch struct {
	pts         []orb.Point
	ux, uy      []float64
	area, first []int32
	out         []orb.Point
}

// moveRing returns the ring r moved by d (offsetRing) in the memory of
// sc, valid until its next use; false when it cannot be moved.
func (sc *offsetScratch) moveRing(r orb.Ring, d float64, ae *areaEdges) (orb.Ring, bool) {
	out, ok := sc.offsetRing(r, d, ae)
	sc.out = out[:0]
	return out, ok
}

// offsetRoundInto is roundInto of mp with each ring first moved by d
// (offsetRing; d > 0 grows, d < 0 shrinks), into the memory of b; false
// when a ring cannot be moved. Each ring is moved and at once converted,
// so the moved outline is never held whole; the rings of a feature of
// more than parallelPoints positions (the covered area of a large site,
// one part with a hole per gap) are moved and converted in chunks on all
// processors (offsetRoundChunks), with the same result.
func (s *scene) offsetRoundInto(b *polyBuf, mp orb.MultiPolygon, d float64) (orb.MultiPolygon, bool) {
	ae := s.areaIndex()
	if n := outlinePoints(mp); n > parallelPoints && runtime.GOMAXPROCS(0) > 1 {
		return s.offsetRoundChunks(b, mp, d, ae)
	}
	return s.offsetRoundRings(b, mp, d, ae)
}

// offsetRoundRings is offsetRoundInto ring after ring.
func (s *scene) offsetRoundRings(b *polyBuf, mp orb.MultiPolygon, d float64, ae *areaEdges) (orb.MultiPolygon, bool) {
	b.reset()
	b.reserve(mp)
	for _, poly := range mp {
		r0 := len(b.rings)
		dropped := false
		for k, r := range poly {
			moved, ok := b.off.moveRing(r, d, ae)
			if !ok {
				return nil, false
			}
			// As roundInto: a polygon whose exterior degenerates keeps
			// none of its rings (the others are still moved: one that
			// cannot be fails the feature).
			if !dropped && !s.addRing(b, planar.FlatRing(moved), k == 0) && k == 0 {
				dropped = true
			}
		}
		b.endPolygon(r0)
	}
	return b.polys, true
}

// parallelPoints is the number of positions beyond which offsetRoundInto
// works in chunks of rings on all processors.
const parallelPoints = 1 << 16

// outlinePoints returns the number of positions of mp's rings.
func outlinePoints(mp orb.MultiPolygon) int {
	n := 0
	for _, p := range mp {
		for _, r := range p {
			n += len(r)
		}
	}
	return n
}

// ringChunk is the conversion of a run of consecutive rings of one
// feature (offsetRoundChunks): the kept rings in buf, and for each ring of
// the run its index in buf.rings, or −1 when it degenerated.
type ringChunk struct {
	buf  polyBuf
	slot []int32
}

// offsetRoundChunks is offsetRoundInto working on chunks of consecutive
// rings in parallel, each moved and converted into a ringChunk of b; the
// polygons are then put together in order from the kept rings (a polygon
// whose exterior degenerated keeps none, as in roundInto).
func (s *scene) offsetRoundChunks(b *polyBuf, mp orb.MultiPolygon, d float64, ae *areaEdges) (orb.MultiPolygon, bool) {
	b.reset()
	all := b.all[:0]
	first := b.first[:0] // the index in all of each polygon's exterior
	for _, p := range mp {
		first = append(first, len(all))
		all = append(all, p...)
	}
	b.all, b.first = all, first
	exterior := func(g int) bool {
		_, found := slices.BinarySearch(first, g)
		return found
	}
	chunk := max(256, len(all)/(16*runtime.GOMAXPROCS(0)))
	nc := (len(all) + chunk - 1) / chunk
	for len(b.chunks) < nc {
		b.chunks = append(b.chunks, new(ringChunk))
	}
	var failed atomic.Bool
	planar.ParallelChunks(len(all), chunk, 0, func(ci, lo, hi int) {
		c := b.chunks[ci]
		c.buf.reset()
		c.buf.reserve(orb.MultiPolygon{all[lo:hi]})
		c.slot = slices.Grow(c.slot[:0], hi-lo)
		for g := lo; g < hi; g++ {
			if failed.Load() {
				return
			}
			moved, ok := c.buf.off.moveRing(all[g], d, ae)
			if !ok {
				failed.Store(true)
				return
			}
			slot := int32(-1)
			if s.addRing(&c.buf, planar.FlatRing(moved), exterior(g)) {
				slot = int32(len(c.buf.rings) - 1)
			}
			c.slot = append(c.slot, slot)
		}
	})
	if failed.Load() {
		return nil, false
	}
	b.rings = slices.Grow(b.rings[:0], len(all))
	for p, g0 := range first {
		g1 := len(all)
		if p+1 < len(first) {
			g1 = first[p+1]
		}
		r0 := len(b.rings)
		for g := g0; g < g1; g++ {
			c := b.chunks[g/chunk]
			slot := c.slot[g%chunk]
			if slot < 0 {
				if g == g0 {
					break // the exterior degenerated: the polygon goes
				}
				continue
			}
			b.rings = append(b.rings, c.buf.rings[slot])
		}
		b.endPolygon(r0)
	}
	return b.polys, true
}

// offsetRing moves every edge of the closed ring r that is not on an area
// edge by |d| to its right (d > 0) or left (d < 0), as the file comment
// describes, and returns it closed; false when an edge would reverse or a
// corner exceeds the shape limits. A ring of fewer than three distinct
// vertices is returned as it is. Its length (about 100 lines) is the
// corner cases of one loop, kept together.
func (sc *offsetScratch) offsetRing(r orb.Ring, d float64, ae *areaEdges) (orb.Ring, bool) {
	pts := sc.pts[:0]
	x0, y0, x1, y1 := r[0][0], r[0][1], r[0][0], r[0][1] // the ring's box
	for _, q := range r {
		if len(pts) == 0 || q != pts[len(pts)-1] {
			pts = append(pts, q)
			x0, y0, x1, y1 = min(x0, q[0]), min(y0, q[1]), max(x1, q[0]), max(y1, q[1])
		}
	}
	b := orb.Bound{Min: orb.Point{x0, y0}, Max: orb.Point{x1, y1}}
	sc.pts = pts[:0]
	for len(pts) > 1 && pts[len(pts)-1] == pts[0] {
		pts = pts[:len(pts)-1]
	}
	n := len(pts)
	out := sc.out
	if n < 3 {
		return append(out, r...), true
	}
	start := len(out)
	out = slices.Grow(out, n+n/4+1)
	rev := d < 0
	if rev {
		reverse(pts)
		d = -d
	}
	// Unit direction and area edge (or −1) of edge i from pts[i].
	sc.ux, sc.uy = slices.Grow(sc.ux[:0], n)[:n], slices.Grow(sc.uy[:0], n)[:n]
	sc.area, sc.first = slices.Grow(sc.area[:0], n)[:n], slices.Grow(sc.first[:0], n+1)[:n+1]
	ux, uy, area, first := sc.ux, sc.uy, sc.area, sc.first
	near := ae.nearBox(b) // most rings lie far from the area's boundary
	for i := range n {
		a, b := pts[i], pts[(i+1)%n]
		dx, dy := b[0]-a[0], b[1]-a[1]
		l := math.Sqrt(dx*dx + dy*dy) // coordinates are far from overflow
		ux[i], uy[i] = dx/l, dy/l
		area[i] = -1
		if near {
			area[i] = ae.edgeOf(a[0], a[1], b[0], b[1])
		}
	}
	// out[first[i]] .. out[first[i+1]-1] are vertex i's points.
	for i := range n {
		first[i] = int32(len(out))
		p := (i + n - 1) % n
		v := pts[i]
		npx, npy := uy[p], -ux[p] // right normals
		nix, niy := uy[i], -ux[i]
		onP, onI := area[p] >= 0, area[i] >= 0
		switch {
		case onP && onI:
			out = append(out, v)
		case onI: // moved edge p, then area edge i: slide along i
			den := ux[i]*npx + uy[i]*npy
			w, ok := slide(v, ux[i], uy[i], d, den, area[i], ae)
			if !ok {
				return out[:start], false
			}
			out = append(out, w)
		case onP: // area edge p, then moved edge i: slide back along p
			den := ux[p]*nix + uy[p]*niy
			w, ok := slide(v, ux[p], uy[p], d, den, area[p], ae)
			if !ok {
				return out[:start], false
			}
			out = append(out, w)
		default:
			cross := ux[p]*uy[i] - uy[p]*ux[i]
			dot := ux[p]*ux[i] + uy[p]*uy[i]
			if cross > 0 && dot < capTurnCos {
				// Square cap: t = d·tan(turn/4) along each moved line,
				// tan(α/4) = sin α / (1 + cos α + √((1 + cos α)² + sin² α)).
				c1 := 1 + dot
				den := c1 + math.Sqrt(c1*c1+cross*cross)
				if den < minTurnSlack {
					return out[:start], false // a spike turning back on itself
				}
				t := d * cross / den
				out = append(out,
					orb.Point{v[0] + d*npx + t*ux[p], v[1] + d*npy + t*uy[p]},
					orb.Point{v[0] + d*nix - t*ux[i], v[1] + d*niy - t*uy[i]})
				break
			}
			if 1+dot < minTurnSlack {
				return out[:start], false
			}
			k := d / (1 + dot)
			out = append(out, orb.Point{v[0] + k*(npx+nix), v[1] + k*(npy+niy)})
		}
	}
	first[n] = int32(len(out))
	// No edge reverses: from the last point of vertex i to the first of
	// vertex i+1 the direction stays that of edge i.
	for i := range n {
		a := out[first[i+1]-1]
		b := out[first[(i+1)%n]]
		if (b[0]-a[0])*ux[i]+(b[1]-a[1])*uy[i] <= 0 {
			return out[:start], false
		}
	}
	if rev {
		reverse(out[start:])
	}
	return append(out, out[start]), true
}

// slide returns v moved along the unit direction (ux, uy) of area edge e
// to the line of the neighbouring edge moved by d, where den is the sine
// between them (the area edge's direction against that edge's right
// normal); false when the slide is longer than maxSlide·d or leaves e.
func slide(v orb.Point, ux, uy, d, den float64, e int32, ae *areaEdges) (orb.Point, bool) {
	if math.Abs(den)*maxSlide < 1 {
		return v, false
	}
	t := d / den
	w := orb.Point{v[0] + t*ux, v[1] + t*uy}
	return w, ae.near(e, w[0], w[1])
}

// reverse reverses pts in place.
func reverse(pts []orb.Point) {
	for i, j := 0, len(pts)-1; i < j; i, j = i+1, j-1 {
		pts[i], pts[j] = pts[j], pts[i]
	}
}

// roundingNote is what report.txt says about the written outlines after
// rounding (ACCURACY AND NOTES): the rounding reach, what the gap and
// covered outlines promise, and what is left out.
func (s *scene) roundingNote() []string {
	return []string{
		"Written outlines are rounded; before rounding, gap outlines are moved out and",
		fmt.Sprintf("covered parts in by %.2f mm, more than rounding moves a point: each written", 1000*s.roundingReach()),
		"gap polygon still contains its gap and no covered part claims an uncovered",
		"spot. Left out: beside the site area's boundary the outlines follow the",
		"area's edges as written (rounded too), so there a gap is only as exact as",
		"the written area; a feature whose moved outline is not valid (parts of it",
		"within about a rounding cell of each other) is written with more decimals.",
	}
}
