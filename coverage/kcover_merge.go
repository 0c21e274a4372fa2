// k-gap outlines merged: a k-gap is traced piece by piece (kcover_gaps.go);
// its outline is the union of its parts' polygons by planar's exact
// overlay (planar.Union), after snapping the vertices to a grid of
// 2^-KGapSnapBits of the coordinates' magnitude and removing spikes
// (KGapSpikeSin); parts whose outline crosses itself are split first, and
// parts the union still refuses are kept beside it. Sliver holes
// (KGapSliverRel) are dropped. A gap whose merged polygons do not have
// its parts' area (KGapMergeAreaRel) keeps the parts as they are.

package coverage

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// kgMergeOutlines merges each gap's part polygons. The parts of every gap
// with several go through one union (the gaps are disjoint, so its
// polygons are the gaps' own, each found by a vertex it shares with the
// parts of its gap): one overlay instead of one per gap, whose fixed cost
// dominates for thousands of small gaps. A gap whose polygons do not have
// the area of its parts (or every gap, when the union fails or a polygon
// shares no vertex with any part) is merged on its own (kgMergeOutline),
// in parallel over the gaps.
func kgMergeOutlines(gs []KGap) {
	var multi []int
	for i := range gs {
		if len(gs[i].Outline) >= 2 {
			multi = append(multi, i)
		}
	}
	if len(multi) == 0 {
		return
	}
	m := 0.0
	for _, gi := range multi {
		m = max(m, kgMaxAbs(gs[gi].Outline))
	}
	snap := kgSnapStep(m)
	var in orb.MultiPolygon
	var gapOf, partOf []int32
	for _, gi := range multi {
		for pi, pg := range gs[gi].Outline {
			if q := kgCleanPolygon(pg, snap); q != nil {
				in = append(in, q)
				gapOf = append(gapOf, int32(gi))
				partOf = append(partOf, int32(pi))
			}
		}
	}
	alone := make([]bool, len(gs)) // merged on its own
	merged, bad, err := kgUnionSimple(in)
	if err != nil {
		merged = nil
		for _, gi := range multi {
			alone[gi] = true
		}
	}
	out := make(map[int32]orb.MultiPolygon, len(multi))
	if err == nil {
		where := make(map[orb.Point]int32)
		isBad := make(map[int]bool, len(bad))
		for _, j := range bad {
			isBad[j] = true
		}
		goodOf := make(map[int32]orb.MultiPolygon, len(multi))
		for j, q := range in {
			if isBad[j] {
				// Refused even after repair: kept as it is.
				out[gapOf[j]] = append(out[gapOf[j]], gs[gapOf[j]].Outline[partOf[j]])
				continue
			}
			goodOf[gapOf[j]] = append(goodOf[gapOf[j]], q)
			for _, ring := range q {
				for _, p := range ring {
					where[p] = gapOf[j]
				}
			}
		}
		mg := make(map[int32]orb.MultiPolygon, len(multi))
		for _, pg := range merged {
			gi, found := int32(-1), false
			for _, p := range pg[0] {
				if gi, found = where[p]; found {
					break
				}
			}
			if !found {
				for _, g := range multi {
					alone[g] = true
				}
				break
			}
			mg[gi] = append(mg[gi], pg)
		}
		for _, gi := range multi {
			if !alone[gi] && (len(goodOf[int32(gi)]) > 0 && !kgSameArea(goodOf[int32(gi)], mg[int32(gi)])) {
				alone[gi] = true
			}
			if !alone[gi] {
				out[int32(gi)] = append(kgDropSliverHoles(mg[int32(gi)]), out[int32(gi)]...)
			}
		}
	}
	planar.ParallelFor(len(multi), 1, func(lo, hi int) {
		for _, gi := range multi[lo:hi] {
			if alone[gi] {
				gs[gi].Outline, _ = kgMergeOutline(gs[gi].Outline)
			}
		}
	})
	for _, gi := range multi {
		if !alone[gi] {
			gs[gi].Outline = out[int32(gi)]
		}
	}
}

// kgMaxAbs returns the largest coordinate magnitude of mp.
func kgMaxAbs(mp orb.MultiPolygon) float64 {
	m := 0.0
	for _, pg := range mp {
		for _, ring := range pg {
			for _, p := range ring {
				m = max(m, math.Abs(p[0]), math.Abs(p[1]))
			}
		}
	}
	return m
}

// kgSnapStep returns the snapping grid for coordinates of magnitude up to
// m (KGapSnapBits).
func kgSnapStep(m float64) float64 {
	_, e := math.Frexp(m)
	return math.Ldexp(1, e-KGapSnapBits)
}

// kgCleanPolygon returns the polygon with its rings cleaned
// (kgCleanRing), nil when its exterior vanishes; holes that vanish are
// dropped.
func kgCleanPolygon(pg orb.Polygon, snap float64) orb.Polygon {
	var q orb.Polygon
	for k, ring := range pg {
		rr := kgCleanRing(ring, snap)
		if len(rr) >= 4 {
			q = append(q, rr)
		} else if k == 0 {
			return nil
		}
	}
	return q
}

// kgDropSliverHoles removes from each polygon the holes that are slivers
// (KGapSliverRel), in place.
func kgDropSliverHoles(mp orb.MultiPolygon) orb.MultiPolygon {
	for pi, pg := range mp {
		holes := pg[:1]
		for _, h := range pg[1:] {
			per := 0.0
			for j := 1; j < len(h); j++ {
				per += math.Hypot(h[j][0]-h[j-1][0], h[j][1]-h[j-1][1])
			}
			if math.Abs(planar.RingArea(planar.FlatRing(h))) > KGapSliverRel*per*per {
				holes = append(holes, h)
			}
		}
		mp[pi] = holes
	}
	return mp
}

// KGapSliverRel is the largest ratio area / perimeter² of a hole of a
// merged gap outline that counts as a sliver left between two parts'
// shared edge (whose ends different clips rounded apart, by about 1e-15
// relative to the coordinates): such a hole has a width of that order, so
// the ratio is about 1e-15·|x| / (4·length), while a real hole's is at
// least its width over four times its length (a disk's is 1/(4π)); a hole
// 1e-9 times thinner than it is long is dropped.
const KGapSliverRel = 1e-9

// kgMergeOutline returns the union of the part polygons of one gap
// (planar.Union), without sliver holes (KGapSliverRel), and the number of
// parts left out of the union (see kgUnionSimple): those are kept as they
// are beside the union of the others (the parts do not overlap, so the
// outline still tiles the gap). When the union fails altogether the parts
// are returned as they are.
func kgMergeOutline(parts orb.MultiPolygon) (orb.MultiPolygon, int) {
	if len(parts) < 2 {
		return parts, 0
	}
	snap := kgSnapStep(kgMaxAbs(parts))
	in := make(orb.MultiPolygon, 0, len(parts))
	src := make([]int, 0, len(parts)) // part index of each polygon of in
	for i, pg := range parts {
		if q := kgCleanPolygon(pg, snap); q != nil {
			in = append(in, q)
			src = append(src, i)
		}
	}
	merged, bad, err := kgUnionSimple(in)
	// The area is that of the parts as they were, not as kgSplitPolygon
	// repaired them (as in kgMergeOutlines): a repair that changed the
	// area keeps the parts.
	kept := make(orb.MultiPolygon, 0, len(in))
	for j, pg := range in {
		if !slices.Contains(bad, j) {
			kept = append(kept, pg)
		}
	}
	if err != nil || !kgSameArea(kept, merged) {
		return parts, len(parts)
	}
	var refused orb.MultiPolygon
	for _, j := range bad {
		refused = append(refused, parts[src[j]])
	}
	return append(kgDropSliverHoles(merged), refused...), len(refused)
}

// kgUnionSimple returns the union of the polygons of mp (planar.Union)
// and the indices of those it left out: when the union refuses mp, each
// polygon is tried alone (one union each), one that is refused is tried
// repaired (kgSplitPolygon), and those still refused (non-simple rings)
// are left out.
func kgUnionSimple(mp orb.MultiPolygon) (orb.MultiPolygon, []int, error) {
	u, err := planar.Union(mp)
	if err == nil {
		return u, nil, nil
	}
	good := mp[:0:0]
	var bad []int
	for j, pg := range mp {
		if _, e := planar.Union(orb.MultiPolygon{pg}); e == nil {
			good = append(good, pg)
			continue
		}
		if fixed := kgSplitPolygon(pg); fixed != nil {
			if _, e := planar.Union(fixed); e == nil {
				good = append(good, fixed...)
				continue
			}
		}
		bad = append(bad, j)
	}
	u, err = planar.Union(good)
	return u, bad, err
}

// kgSplitPolygon repairs a part polygon whose exterior crosses or touches
// itself (a chord of a thin part crossing a ring edge within the sagitta):
// the exterior is split at its self-meetings into simple loops
// (kgSplitRing); the counter-clockwise loops are the part; a clockwise
// loop inside one of them is a hole pinched to the exterior at the
// meeting point and goes with it, a clockwise loop outside them is a
// twisted lobe (a sliver between the chord and the edge, outside the
// part) and is dropped; the holes go with the loop holding them. Nil when
// no loop remains or a hole lies in none (a hole crossing the exterior):
// the repair would change the part's area.
func kgSplitPolygon(pg orb.Polygon) orb.MultiPolygon {
	var out orb.MultiPolygon
	var cw []orb.Ring
	for _, lp := range kgSplitRing(pg[0], 0) {
		if a := planar.RingArea(planar.FlatRing(lp)); a > 0 {
			out = append(out, orb.Polygon{lp})
		} else if a < 0 {
			cw = append(cw, lp)
		}
	}
	for _, h := range cw {
		if i := kgLoopHolding(out, h); i >= 0 {
			out[i] = append(out[i], h)
		}
	}
	for _, h := range pg[1:] {
		i := kgLoopHolding(out, h)
		if i < 0 {
			return nil
		}
		out[i] = append(out[i], h)
	}
	return out
}

// kgLoopHolding returns the index of the polygon of mp whose exterior
// holds ring h (its first vertex strictly inside or outside the exterior
// decides; h touches the exterior at a meeting point at most), −1 when
// none does.
func kgLoopHolding(mp orb.MultiPolygon, h orb.Ring) int {
	for i, pg := range mp {
		ext := planar.FlatRing(pg[0])
		for _, p := range h {
			if side := planar.PointInRing(ext, p[0], p[1]); side != 0 {
				if side > 0 {
					return i
				}
				break
			}
		}
	}
	return -1
}

// kgSplitMaxDepth caps the recursion of kgSplitRing (each level removes
// one self-meeting; a part has a handful at most).
const kgSplitMaxDepth = 32

// kgSplitRing splits the closed ring at its first meeting of two
// non-adjacent edges (planar.SegmentsMeet, exact) into two closed loops
// through the meeting point, recursively, and returns the simple loops.
func kgSplitRing(ring orb.Ring, depth int) []orb.Ring {
	n := len(ring) - 1 // ring[n] == ring[0]
	if n < 3 || depth > kgSplitMaxDepth {
		return []orb.Ring{ring}
	}
	for i := 0; i < n; i++ {
		a, b := ring[i], ring[i+1]
		for j := i + 2; j < n; j++ {
			if i == 0 && j == n-1 {
				continue // adjacent through the closing vertex
			}
			c, d := ring[j], ring[j+1]
			if !planar.SegmentsMeet(a[0], a[1], b[0], b[1], c[0], c[1], d[0], d[1]) {
				continue
			}
			x := kgMeetPoint(a, b, c, d)
			la := append(append(append(orb.Ring{}, ring[:i+1]...), x), ring[j+1:]...)
			lb := append(append(orb.Ring{x}, ring[i+1:j+1]...), x)
			var out []orb.Ring
			for _, lp := range []orb.Ring{planar.DropRepeats(la), planar.DropRepeats(lb)} {
				if len(lp) >= 3 {
					out = append(out, kgSplitRing(append(lp, lp[0]), depth+1)...)
				}
			}
			return out
		}
	}
	return []orb.Ring{ring}
}

// kgMeetPoint returns the meeting point of the segments ab and cd: their
// crossing (rounded), or the endpoint lying on the other segment when
// they touch or overlap.
func kgMeetPoint(a, b, c, d orb.Point) orb.Point {
	for _, p := range [][3]orb.Point{{c, a, b}, {d, a, b}, {a, c, d}, {b, c, d}} {
		if planar.Orient2D(p[1][0], p[1][1], p[2][0], p[2][1], p[0][0], p[0][1]) == 0 &&
			planar.OnSegment(p[1][0], p[1][1], p[2][0], p[2][1], p[0][0], p[0][1]) {
			return p[0]
		}
	}
	ux, uy := b[0]-a[0], b[1]-a[1]
	vx, vy := d[0]-c[0], d[1]-c[1]
	t := ((c[0]-a[0])*vy - (c[1]-a[1])*vx) / (ux*vy - uy*vx)
	return orb.Point{a[0] + t*ux, a[1] + t*uy}
}

// KGapMergeAreaRel is the largest relative difference between the area of
// a merged gap outline and the sum of its parts' areas (the parts do not
// overlap, so the two agree up to the rounded crossing points and the
// slivers dropped, each of area a few ulps times a perimeter: far below
// this) beyond which the union is not trusted and the parts are kept.
const KGapMergeAreaRel = 1e-9

// kgSameArea reports whether merged has finite coordinates and the area of
// the parts (KGapMergeAreaRel). The check guards against a union that
// returned non-finite vertices (seen with ring vertices an ulp apart:
// TestKGapMergeFallback).
func kgSameArea(parts, merged orb.MultiPolygon) bool {
	area := func(mp orb.MultiPolygon) (float64, bool) {
		a := 0.0
		for _, pg := range mp {
			for _, ring := range pg {
				for _, p := range ring {
					if math.IsNaN(p[0]) || math.IsNaN(p[1]) || math.IsInf(p[0], 0) || math.IsInf(p[1], 0) {
						return 0, false
					}
				}
				a += planar.RingArea(planar.FlatRing(ring))
			}
		}
		return a, true
	}
	a, ok1 := area(parts)
	b, ok2 := area(merged)
	return ok1 && ok2 && (len(merged) > 0 || len(parts) == 0) && math.Abs(a-b) <= KGapMergeAreaRel*math.Abs(a)
}

// KGapSnapBits sets the grid the part vertices are snapped to before the
// union: a power of two 2^−KGapSnapBits times the largest coordinate
// magnitude (rounded up to a power of two), so snapping is exact in
// float64 and moves a vertex by at most 2^−41 ≈ 5e-13 of that magnitude,
// far below the chord tolerance. The ends of a shared edge, rounded apart
// by different clips by a few ulps (2^−52 relative), then mostly fall on
// one grid point and the parts meet exactly.
const KGapSnapBits = 40

// kgCleanRing returns the closed ring with its vertices snapped to
// multiples of snap (KGapSnapBits), without repeated consecutive vertices
// (a zero-turn arc leaves a chain's end and the next chain's start at one
// point) and without spikes (kgSpike), as planar.Union requires; nil when
// fewer than three vertices remain.
func kgCleanRing(ring orb.Ring, snap float64) orb.Ring {
	out := make(orb.Ring, 0, len(ring))
	for _, p := range ring {
		p = orb.Point{math.Round(p[0]/snap) * snap, math.Round(p[1]/snap) * snap}
		for len(out) >= 2 && kgSpike(out[len(out)-2], out[len(out)-1], p) {
			out = out[:len(out)-1]
		}
		if len(out) == 0 || p != out[len(out)-1] {
			out = append(out, p)
		}
	}
	for changed := true; changed && len(out) >= 3; {
		changed = false
		n := len(out)
		switch {
		case out[0] == out[n-1] || kgSpike(out[n-2], out[n-1], out[0]):
			out, changed = out[:n-1], true
		case kgSpike(out[n-1], out[0], out[1]):
			out, changed = out[1:], true
		}
	}
	if len(out) < 3 {
		return nil
	}
	return append(out, out[0])
}

// KGapSpikeSin is the largest sine of the angle between the edges a→b and
// b→c, turning back at b, for which b is the tip of a spike: a
// back-and-forth bridge of a clipped non-convex piece (planar/halfplane.go)
// runs out and back along one line, up to the rounding of its crossing
// points (about 1e-15 relative); a real corner of a part is far wider.
const KGapSpikeSin = 1e-9

// kgSpike reports whether b is the tip of a spike a → b → c (see
// KGapSpikeSin).
func kgSpike(a, b, c orb.Point) bool {
	ux, uy := b[0]-a[0], b[1]-a[1]
	vx, vy := c[0]-b[0], c[1]-b[1]
	if ux*vx+uy*vy >= 0 {
		return false
	}
	return math.Abs(ux*vy-uy*vx) <= KGapSpikeSin*math.Hypot(ux, uy)*math.Hypot(vx, vy)
}
