// Site areas: validation, normalisation and point location.
//
// A Region is a finite union of polygons with holes whose rings are simple
// and pairwise disjoint: no ring crosses or touches itself or another ring,
// holes lie inside their own exterior and not inside one another, and the
// interiors of different polygons are disjoint (a polygon may sit inside
// another's hole). This is the OGC simple-features validity rule made
// strict: OGC lets rings touch at isolated points; a Region does not, so
// that every clipping step downstream sees a proper polygon set.
//
// Method. Every ring edge is registered in the cells of a uniform grid
// (region_grid.go) that it passes through (about one cell per edge over the
// bounding box, cells found conservatively with a rounding margin), and only
// edges sharing a grid cell are tested against one another — the
// uniform-grid bucketing of Franklin ("Adaptive grids for geometric
// operations", Cartographica 21, 1984; common practice in GIS overlay). Each
// test is decided by the exact Orient2D predicate, so crossing, touching and
// collinear overlap are detected without tolerance. For polygon data whose
// edges are short compared with the extent the cost is O(m) expected plus
// the pairs that really are close; nothing is O(m²) unless many edges crowd
// into one cell. Ring nesting is decided by the crossing-number (even–odd)
// rule on a horizontal ray walked through the same grid (Shimrat, "Algorithm
// 112: position of point relative to polygon", CACM 5, 1962), again with
// exact Orient2D, so a point's side of every ring edge is exact.
//
// Error bounds: none for the decisions (all exact). Area() is the shoelace
// sum taken relative to each ring's first vertex: relative error about
// m·u times the sum of the absolute triangle areas (u = 2⁻⁵³).
package planar

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// NewRegion validates and normalises a site area given as a MultiPolygon.
//
// Each ring may be given closed (first point repeated at the end) or not;
// the closing repeat and consecutive duplicate vertices are dropped. Every
// coordinate must be finite; every ring needs at least 3 distinct points
// and non-zero area; a ring must not cross or touch itself or any other
// ring; each hole must lie inside its polygon's exterior ring and outside
// its other holes; the interiors of different polygons must be disjoint.
// Exterior rings are made counter-clockwise and holes clockwise.
//
// An error names the polygon, ring and input vertex index concerned, for
// example "polygon 1, ring 2: edge at vertex 5 crosses edge at vertex 11".
// Ring 0 of each polygon is its exterior.
func NewRegion(mp orb.MultiPolygon) (*Region, error) {
	const where = "planar: NewRegion"
	if len(mp) == 0 {
		return nil, fmt.Errorf("%s: no polygon", where)
	}
	polys := make([][]regionRingIn, len(mp))
	for p, poly := range mp {
		if len(poly) == 0 {
			return nil, fmt.Errorf("%s: polygon %d: no ring", where, p)
		}
		polys[p] = make([]regionRingIn, len(poly))
		for k, ring := range poly {
			name := fmt.Sprintf("polygon %d, ring %d", p, k)
			in, err := regionCleanRing(ring, name)
			if err != nil {
				return nil, fmt.Errorf("%s: %w", where, err)
			}
			in.hole = k > 0
			polys[p][k] = in
		}
	}
	reg, err := regionAssemble(polys)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	return reg, nil
}

// Subtract returns a new Region with each polygon of holes cut out of the
// site area as an extra hole (an exclusion zone that needs no coverage).
//
// Each exclusion polygon must have no holes of its own, and its ring must
// lie strictly inside the area: inside one exterior ring, outside that
// polygon's existing holes, touching no ring. An exclusion that crosses or
// touches the area's boundary or another exclusion is reported as an error
// (clipping an exclusion to the boundary is not supported yet); so is one
// lying outside the area. Errors name exclusions by their index in holes.
func (r *Region) Subtract(holes orb.MultiPolygon) (*Region, error) {
	const where = "planar: Region.Subtract"
	np := r.NumPolygons()
	polys := make([][]regionRingIn, np)
	for p := 0; p < np; p++ {
		for k := int(r.PolyStart[p]); k < int(r.PolyStart[p+1]); k++ {
			xy := slices.Clone(r.Ring(k))
			orig := make([]int32, len(xy)/2)
			for i := range orig {
				orig[i] = int32(i)
			}
			polys[p] = append(polys[p], regionRingIn{
				xy: xy, orig: orig, hole: k > int(r.PolyStart[p]),
				name: fmt.Sprintf("polygon %d, ring %d", p, k-int(r.PolyStart[p])),
			})
		}
	}
	ix := r.Index()
	for e, poly := range holes {
		name := fmt.Sprintf("exclusion %d", e)
		if len(poly) == 0 {
			return nil, fmt.Errorf("%s: %s: no ring", where, name)
		}
		if len(poly) > 1 {
			return nil, fmt.Errorf("%s: %s: has %d holes of its own; an exclusion zone must be a single ring", where, name, len(poly)-1)
		}
		in, err := regionCleanRing(poly[0], name)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", where, err)
		}
		in.hole = true
		x, y := in.xy[0], in.xy[1]
		p, onEdge := ix.polygonAt(x, y)
		if onEdge {
			return nil, fmt.Errorf("%s: %s, vertex %d lies on the site boundary; exclusions crossing or touching the boundary are not supported yet",
				where, name, in.orig[0])
		}
		if p < 0 {
			return nil, fmt.Errorf("%s: %s, vertex %d lies outside the site area; each exclusion must lie inside an exterior ring (exclusions crossing the boundary are not supported yet)",
				where, name, in.orig[0])
		}
		polys[p] = append(polys[p], in)
	}
	reg, err := regionAssemble(polys)
	if err != nil {
		return nil, fmt.Errorf("%s: %w (exclusions crossing the site boundary or each other are not supported yet)", where, err)
	}
	return reg, nil
}

// Area returns the area of the site area: exterior rings minus holes.
func (r *Region) Area() float64 {
	s := 0.0
	for k := 0; k < r.NumRings(); k++ {
		ring := r.Ring(k)
		s += RingArea(ring)
	}
	return s
}

// Bound returns the bounding box of the site area.
func (r *Region) Bound() orb.Bound {
	if len(r.XY) == 0 {
		return orb.Bound{}
	}
	b := orb.Bound{Min: orb.Point{r.XY[0], r.XY[1]}, Max: orb.Point{r.XY[0], r.XY[1]}}
	for i := 0; i+1 < len(r.XY); i += 2 {
		b.Min[0] = math.Min(b.Min[0], r.XY[i])
		b.Max[0] = math.Max(b.Max[0], r.XY[i])
		b.Min[1] = math.Min(b.Min[1], r.XY[i+1])
		b.Max[1] = math.Max(b.Max[1], r.XY[i+1])
	}
	return b
}

// Contains reports whether the point (x, y) lies in the site area. The area
// is closed: points on a ring (an exterior boundary or the edge of a hole)
// count as contained. The answer is exact (decided by Orient2D). It scans
// every edge, O(m) per call; for many queries use Index.
func (r *Region) Contains(x, y float64) bool {
	rs := RingSet{XY: r.XY, RingStart: r.RingStart}
	return rs.Locate(x, y) >= 0
}

// MultiPolygon returns the site area as an orb.MultiPolygon with closed
// rings (first point repeated at the end), exteriors counter-clockwise and
// holes clockwise.
func (r *Region) MultiPolygon() orb.MultiPolygon {
	mp := make(orb.MultiPolygon, r.NumPolygons())
	for p := range mp {
		k0, k1 := int(r.PolyStart[p]), int(r.PolyStart[p+1])
		poly := make(orb.Polygon, 0, k1-k0)
		for k := k0; k < k1; k++ {
			ring := r.Ring(k)
			n := len(ring) / 2
			or := make(orb.Ring, n+1)
			for i := 0; i < n; i++ {
				or[i] = orb.Point{ring[2*i], ring[2*i+1]}
			}
			or[n] = or[0]
			poly = append(poly, or)
		}
		mp[p] = poly
	}
	return mp
}

// RegionIndex answers point-in-area queries for a Region in about
// O(√m) time each, using a uniform grid over the ring edges. It is safe
// for concurrent use. Changing the Region after building the index makes
// the index stale.
type RegionIndex struct {
	g    regionGrid
	reg  *Region
	ring []int32 // ring of each vertex (edge start)
}

// Index builds a RegionIndex for r in O(m) time and memory.
func (r *Region) Index() *RegionIndex {
	ix := &RegionIndex{reg: r}
	ix.ring = make([]int32, len(r.XY)/2)
	for k := 0; k < r.NumRings(); k++ {
		for i := r.RingStart[k]; i < r.RingStart[k+1]; i++ {
			ix.ring[i] = int32(k)
		}
	}
	ix.g.build(r.XY, r.RingStart)
	return ix
}

// Contains reports whether (x, y) lies in the site area; points on the
// boundary count as contained, as for Region.Contains, and the answer is
// exact.
func (ix *RegionIndex) Contains(x, y float64) bool {
	inside, on := ix.g.locate(x, y, nil, nil)
	return inside || on
}

// polygonAt returns the polygon whose interior holds (x, y), or -1, and
// whether the point lies on a ring.
func (ix *RegionIndex) polygonAt(x, y float64) (poly int, onEdge bool) {
	var hits []int32
	_, on := ix.g.locate(x, y, nil, func(e int32) { hits = append(hits, ix.ring[e]) })
	if on {
		return -1, true
	}
	odd := regionOddRings(hits)
	r := ix.reg
	// The polygon whose exterior holds the point and none of whose holes do.
	best := -1
	for p := 0; p < r.NumPolygons(); p++ {
		ext := r.PolyStart[p]
		if !slices.Contains(odd, ext) {
			continue
		}
		inHole := false
		for k := ext + 1; k < r.PolyStart[p+1]; k++ {
			if slices.Contains(odd, k) {
				inHole = true
				break
			}
		}
		if !inHole {
			best = p
		}
	}
	return best, false
}

// regionOddRings returns, sorted, the ring ids that occur an odd number of
// times in hits (the rings a point lies inside, by the crossing rule).
func regionOddRings(hits []int32) []int32 {
	slices.Sort(hits)
	var odd []int32
	for i := 0; i < len(hits); {
		j := i
		for j < len(hits) && hits[j] == hits[i] {
			j++
		}
		if (j-i)%2 == 1 {
			odd = append(odd, hits[i])
		}
		i = j
	}
	return odd
}

// regionRingIn is a cleaned input ring awaiting assembly into a Region.
type regionRingIn struct {
	xy   []float64 // interleaved, no closing repeat, no consecutive duplicates
	orig []int32   // input vertex index of each kept vertex
	name string    // "polygon p, ring k" or "exclusion e", for messages
	hole bool
}

// regionCleanRing checks coordinates, drops the closing repeat and
// consecutive duplicates, and rejects rings with fewer than 3 distinct
// points or all points collinear.
func regionCleanRing(ring orb.Ring, name string) (regionRingIn, error) {
	in := regionRingIn{name: name}
	for i, pt := range ring {
		for a := 0; a < 2; a++ {
			c := pt[a]
			if math.IsNaN(c) || math.IsInf(c, 0) {
				axis := "x"
				if a == 1 {
					axis = "y"
				}
				what := "NaN"
				if math.IsInf(c, 0) {
					what = "infinite"
				}
				return in, fmt.Errorf("%s, vertex %d: %s coordinate is %s", name, i, axis, what)
			}
		}
	}
	n := len(ring)
	for n > 1 && ring[n-1] == ring[0] {
		n--
	}
	for i := 0; i < n; i++ {
		m := len(in.orig)
		if m > 0 && ring[in.orig[m-1]] == ring[i] {
			continue
		}
		in.orig = append(in.orig, int32(i))
	}
	for len(in.orig) > 1 && ring[in.orig[len(in.orig)-1]] == ring[in.orig[0]] {
		in.orig = in.orig[:len(in.orig)-1]
	}
	if len(in.orig) < 3 {
		return in, fmt.Errorf("%s: fewer than 3 distinct points", name)
	}
	in.xy = make([]float64, 0, 2*len(in.orig))
	for _, i := range in.orig {
		in.xy = append(in.xy, ring[i][0], ring[i][1])
	}
	// All collinear? Compare with the line through vertex 0 and the vertex
	// farthest from it (any other vertex would do; this one is exact too).
	m := len(in.orig)
	far, fd := 1, -1.0
	for i := 1; i < m; i++ {
		d := math.Abs(in.xy[2*i]-in.xy[0]) + math.Abs(in.xy[2*i+1]-in.xy[1])
		if d > fd {
			far, fd = i, d
		}
	}
	collinear := true
	for i := 1; i < m && collinear; i++ {
		if Orient2D(in.xy[0], in.xy[1], in.xy[2*far], in.xy[2*far+1], in.xy[2*i], in.xy[2*i+1]) != 0 {
			collinear = false
		}
	}
	if collinear {
		return in, fmt.Errorf("%s: zero area (all %d distinct points are collinear)", name, m)
	}
	return in, nil
}

// regionAssemble validates cleaned rings (crossings, nesting) and builds
// the Region with exteriors counter-clockwise and holes clockwise.
func regionAssemble(polys [][]regionRingIn) (*Region, error) {
	reg := &Region{PolyStart: []int32{0}, RingStart: []int32{0}}
	var rings []*regionRingIn
	for p := range polys {
		for k := range polys[p] {
			in := &polys[p][k]
			rings = append(rings, in)
			reg.XY = append(reg.XY, in.xy...)
			reg.RingStart = append(reg.RingStart, int32(len(reg.XY)/2))
		}
		reg.PolyStart = append(reg.PolyStart, int32(len(rings)))
	}
	if len(reg.XY)/2 >= math.MaxInt32/2 {
		return nil, fmt.Errorf("too many vertices (%d)", len(reg.XY)/2)
	}
	nv := len(reg.XY) / 2
	ringOf := make([]int32, nv)
	for k := range rings {
		for i := reg.RingStart[k]; i < reg.RingStart[k+1]; i++ {
			ringOf[i] = int32(k)
		}
	}
	var g regionGrid
	g.build(reg.XY, reg.RingStart)

	if err := regionEdgeFault(&g, reg, rings, ringOf); err != nil {
		return nil, err
	}
	// Orientation of each (now known simple) ring: the turn at its lowest,
	// then leftmost, vertex, which is a convex corner.
	ccw := make([]bool, len(rings))
	for k := range rings {
		ccw[k] = regionRingCCW(reg.XY[2*reg.RingStart[k] : 2*reg.RingStart[k+1]])
	}

	if err := regionCheckNesting(&g, reg, rings, ringOf); err != nil {
		return nil, err
	}

	// Orient: exterior counter-clockwise, holes clockwise.
	for k := range rings {
		if ccw[k] == rings[k].hole {
			regionReverse(reg.XY[2*reg.RingStart[k] : 2*reg.RingStart[k+1]])
		}
	}
	return reg, nil
}

// regionEdgeFault tests the ring edges sharing a grid cell pairwise
// (exactly, edgePair) and describes the first crossing, touching or
// overlapping pair in ring order; nil when there is none.
func regionEdgeFault(g *regionGrid, reg *Region, rings []*regionRingIn, ringOf []int32) error {
	// Pairwise edge tests within grid cells; keep the first offending pair
	// in ring order so that the message is deterministic.
	type fault struct {
		e1, e2 int32
		kind   int // 1 crosses, 2 touches, 3 overlaps (doubles back)
	}
	best := fault{e1: -1}
	g.cellPairs(func(a, b int32) {
		if best.e1 >= 0 && (a > best.e1 || a == best.e1 && b >= best.e2) {
			return
		}
		if kind := g.edgePair(a, b); kind != 0 {
			best = fault{a, b, kind}
		}
	})
	if best.e1 >= 0 {
		k1, k2 := ringOf[best.e1], ringOf[best.e2]
		v1 := rings[k1].orig[best.e1-reg.RingStart[k1]]
		v2 := rings[k2].orig[best.e2-reg.RingStart[k2]]
		verb := [...]string{1: "crosses", 2: "touches", 3: "overlaps"}[best.kind]
		if best.kind == 3 {
			return fmt.Errorf("%s: edges at vertex %d and vertex %d overlap (the ring doubles back on itself)", rings[k1].name, v1, v2)
		}
		if k1 == k2 {
			return fmt.Errorf("%s: edge at vertex %d %s edge at vertex %d", rings[k1].name, v1, verb, v2)
		}
		return fmt.Errorf("%s: edge at vertex %d %s %s, edge at vertex %d (rings must not cross or touch)",
			rings[k1].name, v1, verb, rings[k2].name, v2)
	}

	return nil
}

// regionCheckNesting checks that each hole lies directly inside its own
// exterior and that polygon interiors do not overlap, by the rings that
// hold each ring's first vertex (crossing-number rule along the grid).
func regionCheckNesting(g *regionGrid, reg *Region, rings []*regionRingIn, ringOf []int32) error {
	// Nesting: which rings hold each ring's first vertex. Rings are
	// disjoint, so the vertex is strictly inside or outside every other
	// ring and one point decides the whole ring.
	containers := make([][]int32, len(rings))
	for k := range rings {
		v := reg.RingStart[k]
		var hits []int32
		kk := int32(k)
		g.locate(reg.XY[2*v], reg.XY[2*v+1],
			func(e int32) bool { return ringOf[e] == kk },
			func(e int32) { hits = append(hits, ringOf[e]) })
		containers[k] = regionOddRings(hits)
	}
	polyOf := make([]int, len(rings))
	for p := 0; p+1 < len(reg.PolyStart); p++ {
		for k := reg.PolyStart[p]; k < reg.PolyStart[p+1]; k++ {
			polyOf[k] = p
		}
	}
	for p := 0; p+1 < len(reg.PolyStart); p++ {
		ext := reg.PolyStart[p]
		// Holes: inside their exterior and directly so.
		for h := ext + 1; h < reg.PolyStart[p+1]; h++ {
			ch := containers[h]
			if !slices.Contains(ch, ext) {
				return fmt.Errorf("%s: hole is not inside its exterior ring (%s)", rings[h].name, rings[ext].name)
			}
			for _, b := range ch {
				if b != ext && !slices.Contains(containers[ext], b) {
					what := "another polygon's ring"
					if polyOf[b] == p {
						what = "another hole of the same polygon"
					}
					return fmt.Errorf("%s: hole lies inside %s (%s)", rings[h].name, what, rings[b].name)
				}
			}
		}
		// Exterior: inside another polygon only through one of its holes.
		for _, b := range containers[ext] {
			q := polyOf[b]
			if b != reg.PolyStart[q] {
				continue // a hole of q; q's exterior is then listed too
			}
			ok := false
			for h := b + 1; h < reg.PolyStart[q+1]; h++ {
				if slices.Contains(containers[ext], h) {
					ok = true
					break
				}
			}
			if !ok {
				return fmt.Errorf("%s: polygon %d lies inside polygon %d (%s); polygon interiors must not overlap",
					rings[ext].name, p, q, rings[b].name)
			}
		}
	}

	return nil
}

// regionRingCCW reports whether a simple ring runs counter-clockwise, from
// the exact turn at its lowest-then-leftmost vertex.
func regionRingCCW(ring []float64) bool {
	n := len(ring) / 2
	lo := 0
	for i := 1; i < n; i++ {
		if ring[2*i+1] < ring[2*lo+1] || ring[2*i+1] == ring[2*lo+1] && ring[2*i] < ring[2*lo] {
			lo = i
		}
	}
	p, q := (lo+n-1)%n, (lo+1)%n
	return Orient2D(ring[2*p], ring[2*p+1], ring[2*lo], ring[2*lo+1], ring[2*q], ring[2*q+1]) > 0
}

// regionReverse reverses the vertex order of an interleaved ring.
func regionReverse(ring []float64) {
	n := len(ring) / 2
	for i, j := 0, n-1; i < j; i, j = i+1, j-1 {
		ring[2*i], ring[2*j] = ring[2*j], ring[2*i]
		ring[2*i+1], ring[2*j+1] = ring[2*j+1], ring[2*i+1]
	}
}
