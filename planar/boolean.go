// Polygon union, intersection and difference, and the site area built from
// area polygons and exclusion zones as they come from a GIS.
//
// Method: exact overlay through the planar arrangement of both operands'
// rings, labelled with winding numbers (Vatti, "A generic solution to
// polygon clipping", CACM 35, 1992, for the winding-count labelling; the
// arrangement built with exact predicates and iterated snapping of crossing
// points as in Hobby, "Practical segment intersection with finite
// precision output", Computational Geometry 13, 1999). The steps, each in
// its own file:
//
//  1. boolean_node.go: split all edges where they meet, exactly; crossing
//     points are rounded to float64 (a few ulps from the true point) and
//     the splitting repeats until the edge set is noded exactly.
//  2. boolean_graph.go, boolean_ray.go: the arrangement, its faces, and
//     each face's winding numbers in both operands.
//  3. boolean_extract.go: the faces that satisfy the operation, and their
//     boundary traced into rings grouped into polygons.
//  4. boolean_pinch.go: pinch points opened (each passage through the
//     point pulled back into its own sector by a few dozen ulps) so that
//     the rings are pairwise disjoint and simple, as NewRegion requires.
//
// Every topological decision (which edges meet, where a point lies, the
// angular order at a vertex, which face a component lies in) is an exact
// Orient2D sign; vertex identity is float64 equality, so points 1e-9 apart
// stay apart. The only rounded values are crossing points and pulled-back
// pinch points; the result is checked exactly by NewRegion in SiteArea.
//
// Input rings must be simple: a ring that crosses or touches itself, or
// doubles back (a spike), is refused with the polygon, ring, vertex and its
// coordinates. Rings of different polygons may meet in any way, and a
// polygon's rings may touch; a polygon's holes are subtracted through the
// winding numbers (a point counts as inside operand A when its winding
// number in A is at least 1). A hole outside its exterior, or two holes of
// one polygon overlapping, makes some winding number negative and is
// refused, naming a ring concerned.
//
// Cost: O((n + k) log n) for sorting vertices, edges and the angular order,
// plus the pair search in the uniform grid, which is O(n + k) expected for
// edges short compared with the extent (k = number of contacts), and one
// grid ray per connected component of the arrangement.

package planar

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
)

// ErrEmptySite is returned (wrapped) by SiteArea when the exclusions
// cover the whole site area.
var ErrEmptySite = errors.New("the exclusions cover the whole site area")

// Union returns the union of the polygons of mp (which may overlap, share
// edges or touch) as pairwise disjoint simple polygons: exteriors
// counter-clockwise, holes clockwise, closed rings, pinch points opened
// (see SiteArea). An empty union gives an empty MultiPolygon.
func Union(mp orb.MultiPolygon) (orb.MultiPolygon, error) {
	res, _, err := booleanRun(mp, nil, booleanUnion, "polygon", "")
	if err != nil {
		return nil, fmt.Errorf("planar: Union: %w", err)
	}
	if err := checkResult(res, booleanScale(mp)); err != nil {
		return nil, fmt.Errorf("planar: Union: %w", err)
	}
	return res, nil
}

// Intersection returns the intersection of the unions of a and b, in the
// form described at Union.
func Intersection(a, b orb.MultiPolygon) (orb.MultiPolygon, error) {
	res, _, err := booleanRun(a, b, booleanIntersection, "a: polygon", "b: polygon")
	if err != nil {
		return nil, fmt.Errorf("planar: Intersection: %w", err)
	}
	if err := checkResult(res, booleanScale(a, b)); err != nil {
		return nil, fmt.Errorf("planar: Intersection: %w", err)
	}
	return res, nil
}

// Difference returns the union of a minus the union of b, in the form
// described at Union.
func Difference(a, b orb.MultiPolygon) (orb.MultiPolygon, error) {
	res, _, err := booleanRun(a, b, booleanDifference, "a: polygon", "b: polygon")
	if err != nil {
		return nil, fmt.Errorf("planar: Difference: %w", err)
	}
	if err := checkResult(res, booleanScale(a, b)); err != nil {
		return nil, fmt.Errorf("planar: Difference: %w", err)
	}
	return res, nil
}

// SiteAreaStats says what SiteArea merged, clipped or dropped.
type SiteAreaStats struct {
	AreaPolygons      int // area polygons given
	AreaParts         int // connected parts of their union
	Exclusions        int // exclusion polygons given
	ExclusionParts    int // connected parts of the exclusions' union
	ExclusionsClipped int // exclusions reaching outside the area, cut to it
	ExclusionsOutside int // exclusions not overlapping the area, dropped
	Pinches           int // points where parts touch, opened (see SiteArea)
	Polygons          int // polygons of the site area
}

// String returns the one-line summary for the report, or "" when nothing
// was merged, clipped, dropped or opened.
func (s SiteAreaStats) String() string {
	var parts []string
	if s.AreaParts < s.AreaPolygons {
		parts = append(parts, fmt.Sprintf("%s merged into %d", booleanCount(s.AreaPolygons, "area polygon"), s.AreaParts))
	}
	if s.ExclusionParts < s.Exclusions {
		parts = append(parts, fmt.Sprintf("%s merged into %d", booleanCount(s.Exclusions, "touching or overlapping exclusion"), s.ExclusionParts))
	}
	if s.ExclusionsClipped > 0 {
		parts = append(parts, booleanCount(s.ExclusionsClipped, "exclusion")+" clipped to the area")
	}
	if s.ExclusionsOutside > 0 {
		parts = append(parts, booleanCount(s.ExclusionsOutside, "exclusion")+" outside the area dropped")
	}
	if s.Pinches > 0 {
		parts = append(parts, booleanCount(s.Pinches, "touching point")+" opened")
	}
	return strings.Join(parts, "; ")
}

// booleanCount returns "1 word" or "n words".
func booleanCount(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// SiteArea returns the site area: the union of the area polygons minus the
// union of the exclusion polygons, with what was merged or clipped.
//
// The area polygons may share edges, overlap or touch; exclusions may
// touch the area's boundary along an edge or at a point, share edges with
// or overlap one another, and stick out of the area. All of that is
// resolved exactly (see the file comment). The result is returned as the
// Region that NewRegion builds from it (so it passed NewRegion's exact
// validation: rings simple and pairwise disjoint, exteriors
// counter-clockwise, holes clockwise); Region.MultiPolygon gives the
// polygons.
//
// Pinch points. Where parts of the result touch only at a point (two
// parcels meeting at a corner, an exclusion touching the boundary at a
// vertex, a hole touching its exterior) a Region cannot represent the
// contact, so each passage of a ring through that point is pulled back
// into its own sector by booleanPinchSep (64) ulps, normally; the area lost
// is at most ½(|vp| + |vq|)·64 ulp per passage (see boolean_pinch.go). A
// part joined to the rest only at a point thus becomes a separate polygon,
// and a hole touching its exterior becomes a bay of the exterior.
//
// Errors name the polygon ("area polygon 2, ring 0" or "exclusion 5,
// ring 1") and, for a self-intersecting ring, a bow-tie or a spike, the
// vertex and its coordinates. If the exclusions cover the whole area the
// error wraps ErrEmptySite.
func SiteArea(area, exclusions orb.MultiPolygon) (*Region, SiteAreaStats, error) {
	const where = "planar: SiteArea"
	if len(area) == 0 {
		return nil, SiteAreaStats{}, fmt.Errorf("%s: no area polygon", where)
	}
	res, st, err := booleanRun(area, exclusions, booleanDifference, "area polygon", "exclusion")
	if err != nil {
		return nil, st, fmt.Errorf("%s: %w", where, err)
	}
	if len(res) == 0 {
		return nil, st, fmt.Errorf("%s: %w", where, ErrEmptySite)
	}
	if err := checkResult(res, booleanScale(area, exclusions)); err != nil {
		return nil, st, fmt.Errorf("%s: %w", where, err)
	}
	reg, err := NewRegion(res)
	if err != nil {
		return nil, st, fmt.Errorf("%s: internal error: %w", where, err)
	}
	return reg, st, nil
}

// booleanRun validates the operands, runs the overlay op and returns the
// result (pinch points opened) and the statistics. nameA and nameB prefix
// the polygon indices in messages.
func booleanRun(a, b orb.MultiPolygon, op int, nameA, nameB string) (orb.MultiPolygon, SiteAreaStats, error) {
	st := SiteAreaStats{AreaPolygons: len(a), Exclusions: len(b)}
	var in booleanInput
	if err := in.add(a, 0, nameA); err != nil {
		return nil, st, err
	}
	if err := in.add(b, 1, nameB); err != nil {
		return nil, st, err
	}
	if len(in.ringStart) == 1 {
		return orb.MultiPolygon{}, st, nil
	}
	xy, rs, grid, fault, err := booleanNode(in.xy, in.ringStart)
	if err != nil {
		return nil, st, err
	}
	if fault != nil {
		return nil, st, in.faultError(fault)
	}
	gr := booleanBuildGraph(xy, rs, in.operand, in.sign)
	if err := gr.windings(grid); err != nil {
		return nil, st, err
	}
	if err := gr.checkNesting(&in, rs, xy); err != nil {
		return nil, st, err
	}
	st.AreaParts = gr.countPieces(gr.booleanSelect(booleanUnion))
	st.ExclusionParts = gr.countExclusionParts()
	st.ExclusionsClipped, st.ExclusionsOutside = gr.exclusionFates(&in, rs)
	extracted := gr.extract(gr.booleanSelect(op))
	extracted.dropSlivers()
	rings, pinches, err := extracted.openPinches()
	if err != nil {
		return nil, st, err
	}
	rings.dropStraight()
	if err := rings.checkFinite(); err != nil {
		return nil, st, err
	}
	st.Pinches = pinches
	res := rings.multiPolygon()
	st.Polygons = len(res)
	return res, st, nil
}

// checkNesting refuses polygons whose holes are not inside their exterior
// or overlap one another: exactly the inputs that give some face a
// negative winding number in their operand (a valid polygon's winding is
// 0 or 1 everywhere, and sums of those are never negative). The error
// names a ring bounding such a face and a point on it.
//
// A face cycle that is a sliver (booleanSliver: mean width below
// booleanPinchSep ulps) is not taken as evidence: rounded crossing points
// can fold a part of a valid ring thinner than a few ulps over itself (two
// crossings on its two sides rounded past each other), leaving a face of
// winding −1 and ulp-scale width. Such a face is outside the operand (its
// winding is below 1), as the exact, unfolded ring would have it to within
// its width. Snapping folds by up to 64 ulps of the snapped edges'
// coordinates, which may be far larger than the face's own, so the sliver
// test takes its ulp at the largest coordinate of the noded rings
// (booleanSliverAt).
func (gr *booleanGraph) checkNesting(in *booleanInput, rs []int32, xy []float64) error {
	bad := -1
	var cyc []float64
	scale := 0.0
	for _, c := range xy {
		scale = math.Max(scale, math.Abs(c))
	}
	for f, w := range gr.wind {
		if w[0] >= 0 && w[1] >= 0 {
			continue
		}
		cyc = cyc[:0]
		for h := gr.faceHE[f]; ; {
			v := gr.origin(h)
			cyc = append(cyc, gr.vx[2*v], gr.vx[2*v+1])
			if h = gr.next(h); h == gr.faceHE[f] {
				break
			}
		}
		if !booleanSliverAt(cyc, scale) {
			bad = f
			break
		}
	}
	if bad < 0 {
		return nil
	}
	op := uint8(0)
	if gr.wind[bad][0] >= 0 {
		op = 1
	}
	for k := range in.operand {
		if in.operand[k] != op {
			continue
		}
		for e := rs[k]; e < rs[k+1]; e++ {
			h := gr.ringHalf[e]
			if gr.face[h] == int32(bad) || gr.face[h^1] == int32(bad) {
				return fmt.Errorf("%s: a hole lies outside its exterior ring or overlaps another hole of the same polygon (near (%v, %v))",
					in.names[k], xy[2*e], xy[2*e+1])
			}
		}
	}
	return fmt.Errorf("a hole lies outside its exterior ring or overlaps another hole")
}

// countExclusionParts returns the number of connected parts of operand B.
func (gr *booleanGraph) countExclusionParts() int {
	in := make([]bool, gr.nFace)
	for f, w := range gr.wind {
		in[f] = w[1] >= 1
	}
	return gr.countPieces(in)
}

// exclusionFates classifies each polygon of operand B by the faces along
// the inner side of its rings' edges: clipped when some lie inside the
// union of A and some outside, outside when none lie inside. (A part of A
// lying wholly inside an exclusion without touching it is not seen here.)
func (gr *booleanGraph) exclusionFates(in *booleanInput, rs []int32) (clipped, outside int) {
	type fate struct{ in, out bool }
	fates := make(map[int32]*fate)
	for k := range in.operand {
		if in.operand[k] != 1 {
			continue
		}
		p := in.ringPoly[k]
		f := fates[p]
		if f == nil {
			f = &fate{}
			fates[p] = f
		}
		for e := rs[k]; e < rs[k+1]; e++ {
			h := gr.ringHalf[e]
			if in.sign[k] < 0 {
				h ^= 1 // the ring runs with its interior on the right
			}
			if gr.wind[gr.face[h]][0] >= 1 {
				f.in = true
			} else {
				f.out = true
			}
		}
	}
	for _, f := range fates {
		switch {
		case !f.in:
			outside++
		case f.out:
			clipped++
		}
	}
	return clipped, outside
}

// checkFinite returns an error naming the first non-finite result vertex.
// The inputs are finite and every result vertex is an input vertex, a
// rounded crossing point or a pulled-back pinch point, so this never
// fails unless a degenerate configuration escaped the steps above; it
// turns such a failure into an error instead of NaN coordinates.
func (r *booleanRings) checkFinite() error {
	for i, c := range r.xy {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			k, _ := slices.BinarySearch(r.ringStart, int32(i/2)+1)
			return fmt.Errorf("internal error: result ring %d has a non-finite vertex (%v, %v); the input has a configuration the overlay could not resolve",
				k-1, r.xy[i&^1], r.xy[i|1])
		}
	}
	return nil
}

// multiPolygon converts overlay rings to closed orb rings.
func (r *booleanRings) multiPolygon() orb.MultiPolygon {
	mp := make(orb.MultiPolygon, 0, len(r.polyStart)-1)
	for p := 0; p+1 < len(r.polyStart); p++ {
		poly := make(orb.Polygon, 0, r.polyStart[p+1]-r.polyStart[p])
		for k := r.polyStart[p]; k < r.polyStart[p+1]; k++ {
			s, e := r.ringStart[k], r.ringStart[k+1]
			ring := make(orb.Ring, 0, e-s+1)
			for i := s; i < e; i++ {
				ring = append(ring, orb.Point{r.xy[2*i], r.xy[2*i+1]})
			}
			ring = append(ring, ring[0])
			poly = append(poly, ring)
		}
		mp = append(mp, poly)
	}
	return mp
}

// booleanInput holds both operands' cleaned rings, concatenated.
type booleanInput struct {
	xy        []float64
	ringStart []int32
	operand   []uint8   // 0 or 1
	sign      []int8    // +1 if the ring runs with its polygon's interior on the left
	ringPoly  []int32   // polygon index within its operand
	names     []string  // "area polygon 2, ring 0"
	orig      [][]int32 // input vertex index of each kept vertex
}

// add appends the rings of mp as operand op.
func (in *booleanInput) add(mp orb.MultiPolygon, op uint8, name string) error {
	if len(in.ringStart) == 0 {
		in.ringStart = []int32{0}
	}
	for p, poly := range mp {
		if len(poly) == 0 {
			return fmt.Errorf("%s %d: no ring", name, p)
		}
		for k, ring := range poly {
			rname := fmt.Sprintf("%s %d, ring %d", name, p, k)
			c, err := regionCleanRing(ring, rname)
			if err != nil {
				if len(ring) > 0 {
					return fmt.Errorf("%w (vertex 0 at (%v, %v))", err, ring[0][0], ring[0][1])
				}
				return err
			}
			in.xy = append(in.xy, c.xy...)
			in.ringStart = append(in.ringStart, int32(len(in.xy)/2))
			in.operand = append(in.operand, op)
			var s int8 = 1
			if regionRingCCW(c.xy) == (k > 0) {
				s = -1
			}
			in.sign = append(in.sign, s)
			in.ringPoly = append(in.ringPoly, int32(p))
			in.names = append(in.names, rname)
			in.orig = append(in.orig, c.orig)
		}
	}
	return nil
}

// faultError describes a self-contact of an input ring, naming the
// vertices concerned and the point of contact.
func (in *booleanInput) faultError(f *booleanRingFault) error {
	k := booleanRingOf(in.ringStart)[f.e1]
	s, e := in.ringStart[k], in.ringStart[k+1]
	nxt := func(i int32) int32 {
		if i+1 == e {
			return s
		}
		return i + 1
	}
	vert := func(i int32) string {
		return fmt.Sprintf("vertex %d (%v, %v)", in.orig[k][i-s], in.xy[2*i], in.xy[2*i+1])
	}
	switch f.kind {
	case 1:
		return fmt.Errorf("%s: edge at %s crosses edge at %s (a self-intersecting ring or bow-tie)", in.names[k], vert(f.e1), vert(f.e2))
	case 3:
		tip := f.e2 // the vertex both edges share
		if nxt(f.e2) == f.e1 {
			tip = f.e1
		}
		return fmt.Errorf("%s: the ring doubles back at %s (a spike)", in.names[k], vert(tip))
	}
	// A touch: some endpoint of one edge lies on the other.
	at := ""
	for _, p := range [4][2]int32{{f.e1, f.e2}, {nxt(f.e1), f.e2}, {f.e2, f.e1}, {nxt(f.e2), f.e1}} {
		q, a, b := p[0], p[1], nxt(p[1])
		if OnSegment(in.xy[2*a], in.xy[2*a+1], in.xy[2*b], in.xy[2*b+1], in.xy[2*q], in.xy[2*q+1]) {
			at = fmt.Sprintf(" at (%v, %v)", in.xy[2*q], in.xy[2*q+1])
			break
		}
	}
	return fmt.Errorf("%s: edge at %s touches edge at %s%s (the ring touches itself)", in.names[k], vert(f.e1), vert(f.e2), at)
}
