// Assembling the site area from input polygons in the local plane.
//
// Each polygon that is not an exclusion zone keeps its holes; each
// exclusion zone becomes a hole of the polygon whose exterior contains it.
// Rings are passed on exactly as given; planar.NewRegion then validates the
// result (simple rings, nothing touching) and orients it, and its messages,
// which name "polygon p, ring k", are translated back to the input features.
//
// Ring relations are decided with planar's exact ring primitives
// (planar.SegmentsCross, planar.PointInRing; every sign from Orient2D,
// Shewchuk 1997), so "crosses", "inside" and "outside" are exact for the
// float64 coordinates given: two rings cross when two of their edges cross
// properly or when one ring has vertices strictly on both sides of the
// other (a vertex on the other ring, PointInRing = 0, is on neither side). Touching is not crossing; whether a hole may touch
// its exterior is left to planar.NewRegion.
//
// Cost: O(|a|·|b|) predicate calls per pair of rings whose bounding boxes
// meet (edges outside the other ring's box are skipped).

package siteinput

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// shortWhere drops the file name from where when ref names the same file
// ("a.geojson feature 2" next to "a.geojson feature 0" reads "feature 2").
func shortWhere(where, ref string) string {
	i, j := strings.LastIndex(where, " feature "), strings.LastIndex(ref, " feature ")
	if i > 0 && j > 0 && where[:i] == ref[:j] {
		return where[i+1:]
	}
	return where
}

// ringRelation is how ring a lies with respect to ring b.
type ringRelation int

const (
	relDisjoint ringRelation = iota // interiors do not meet
	relCross                        // boundaries cross
	relAInB                         // a inside b (touching allowed)
	relBInA                         // b inside a (touching allowed)
)

// buildArea assembles the region polygons. It returns the polygons ready
// for planar.NewRegion, the input name of each of their rings, and
// warnings.
func buildArea(polys []areaPoly) (orb.MultiPolygon, [][]string, []string, error) {
	type inc struct {
		rings []orb.Ring
		where []string // where of each ring (holes from exclusion zones)
		bound orb.Bound
		drop  bool
	}
	var incs []*inc
	var excl []areaPoly
	var warn []string
	for _, p := range polys {
		if p.Exclude {
			if len(p.Rings) > 1 {
				warn = append(warn, fmt.Sprintf("%s: an exclusion zone's holes are excluded too (%d ignored)", p.Where, len(p.Rings)-1))
			}
			excl = append(excl, p)
			continue
		}
		in := &inc{rings: p.Rings, bound: p.Rings[0].Bound()}
		for k := range p.Rings {
			if k == 0 {
				in.where = append(in.where, p.Where)
			} else {
				in.where = append(in.where, fmt.Sprintf("%s ring %d", p.Where, k))
			}
		}
		incs = append(incs, in)
	}
	if len(incs) == 0 {
		return nil, nil, nil, errorf("%s: every polygon is an exclusion zone; no area is left to cover", polys[0].Where)
	}
	// Polygons to cover must not overlap, except one lying in another's hole.
	for i := range incs {
		for j := i + 1; j < len(incs); j++ {
			a, b := incs[i], incs[j]
			if !a.bound.Intersects(b.bound) {
				continue
			}
			rel := relate(a.rings[0], b.rings[0])
			switch rel {
			case relCross:
				return nil, nil, nil, errorf("%s overlaps %s: merge them into one polygon", b.where[0], shortWhere(a.where[0], b.where[0]))
			case relAInB, relBInA:
				outer, inner := b, a
				if rel == relBInA {
					outer, inner = a, b
				}
				inHole := false
				for _, h := range outer.rings[1:] {
					if r := relate(inner.rings[0], h); r == relAInB {
						inHole = true
						break
					}
				}
				if !inHole {
					return nil, nil, nil, errorf("%s lies inside %s: overlapping area polygons (to exclude it, set \"exclude\": true)", inner.where[0], shortWhere(outer.where[0], inner.where[0]))
				}
			}
		}
	}
	for _, e := range excl {
		ring := e.Rings[0]
		eb := ring.Bound()
		used := false
		for _, in := range incs {
			if in.drop || !eb.Intersects(in.bound) {
				continue
			}
			switch relate(ring, in.rings[0]) {
			case relCross:
				return nil, nil, nil, errorf("%s: exclusion zone crosses the boundary of %s; clip it to the area or move the boundary", e.Where, shortWhere(in.where[0], e.Where))
			case relBInA:
				in.drop = true
				used = true
				warn = append(warn, fmt.Sprintf("%s: exclusion zone covers all of %s, which is dropped", e.Where, shortWhere(in.where[0], e.Where)))
			case relAInB:
				used = true
				redundant := false
				keep := in.rings[:1]
				keepWhere := in.where[:1]
				for k, h := range in.rings[1:] {
					switch relate(ring, h) {
					case relCross:
						return nil, nil, nil, errorf("%s: exclusion zone overlaps %s; merge them into one", e.Where, shortWhere(in.where[k+1], e.Where))
					case relAInB:
						redundant = true
					case relBInA:
						warn = append(warn, fmt.Sprintf("%s lies inside the exclusion zone %s", in.where[k+1], shortWhere(e.Where, in.where[k+1])))
						continue
					}
					keep = append(keep, h)
					keepWhere = append(keepWhere, in.where[k+1])
				}
				if redundant {
					warn = append(warn, fmt.Sprintf("%s: exclusion zone lies inside another one; ignored", e.Where))
				} else {
					keep = append(keep, ring)
					keepWhere = append(keepWhere, e.Where)
				}
				in.rings, in.where = keep, keepWhere
			}
		}
		if !used {
			warn = append(warn, fmt.Sprintf("%s: exclusion zone lies outside the area; ignored", e.Where))
		}
	}
	var mp orb.MultiPolygon
	var names [][]string
	for _, in := range incs {
		if in.drop {
			continue
		}
		mp = append(mp, orb.Polygon(in.rings))
		names = append(names, in.where)
	}
	if len(mp) == 0 {
		return nil, nil, nil, errorf("%s: the exclusion zones cover the whole area; nothing is left to cover", polys[0].Where)
	}
	return mp, names, warn, nil
}

// regionRef matches the ring and vertex references of planar.NewRegion's
// messages.
var regionRef = regexp.MustCompile(`polygon (\d+), ring (\d+)|vertex (\d+)`)

// regionError rewrites a planar.NewRegion error in terms of the inputs:
// "polygon p, ring k" becomes the input name of that ring, a following
// "vertex v" the input vertex (origs, from densification; nil: as is),
// and the package prefix is dropped.
func regionError(err error, names [][]string, origs [][][]int32) error {
	msg := strings.TrimPrefix(err.Error(), "planar: NewRegion: ")
	first := ""
	var orig []int32 // the vertex map of the ring named last
	msg = regionRef.ReplaceAllStringFunc(msg, func(m string) string {
		sub := regionRef.FindStringSubmatch(m)
		if sub[3] != "" {
			v, _ := strconv.Atoi(sub[3])
			if v < len(orig) {
				return "vertex " + strconv.Itoa(int(orig[v]))
			}
			return m
		}
		p, _ := strconv.Atoi(sub[1])
		k, _ := strconv.Atoi(sub[2])
		orig = nil
		if p < len(origs) && k < len(origs[p]) {
			orig = origs[p][k]
		}
		if p >= len(names) || k >= len(names[p]) {
			return m
		}
		if first == "" {
			first = names[p][k]
			return first
		}
		return shortWhere(names[p][k], first)
	})
	if strings.Contains(msg, "touch") {
		msg += "; merge polygons that share an edge, and keep exclusion zones off the boundary"
	}
	return errorf("%s", msg)
}

// relate returns how ring a lies with respect to ring b (closed or open;
// a closing repeat is a zero-length edge, which never crosses).
func relate(a, b orb.Ring) ringRelation {
	if edgesCross(a, b) {
		return relCross
	}
	ain, aout := sides(a, b)
	if ain && aout {
		return relCross
	}
	bin, bout := sides(b, a)
	if bin && bout {
		return relCross
	}
	switch {
	case ain:
		return relAInB
	case bin:
		return relBInA
	case aout || bout:
		return relDisjoint
	}
	// Every vertex of each lies on the other: the same ring.
	return relCross
}

// sides reports whether a has vertices strictly inside and strictly
// outside b (planar.PointInRing; a vertex on b counts as neither).
func sides(a, b orb.Ring) (in, out bool) {
	bb := b.Bound()
	bxy := planar.FlatRing(b)
	for _, p := range a {
		if !bb.Contains(p) {
			out = true
			continue
		}
		switch planar.PointInRing(bxy, p[0], p[1]) {
		case 1:
			in = true
		case -1:
			out = true
		}
		if in && out {
			return
		}
	}
	return
}

// edgesCross reports whether an edge of a crosses an edge of b properly
// (planar.SegmentsCross: each strictly separates the other's endpoints).
func edgesCross(a, b orb.Ring) bool {
	bb := b.Bound()
	for i := range a {
		p, q := a[i], a[(i+1)%len(a)]
		eb := orb.Bound{Min: orb.Point{min(p[0], q[0]), min(p[1], q[1])}, Max: orb.Point{max(p[0], q[0]), max(p[1], q[1])}}
		if !eb.Intersects(bb) {
			continue
		}
		for j := range b {
			r, s := b[j], b[(j+1)%len(b)]
			if max(r[0], s[0]) < eb.Min[0] || min(r[0], s[0]) > eb.Max[0] ||
				max(r[1], s[1]) < eb.Min[1] || min(r[1], s[1]) > eb.Max[1] {
				continue
			}
			if planar.SegmentsCross(p[0], p[1], q[0], q[1], r[0], r[1], s[0], s[1]) {
				return true
			}
		}
	}
	return false
}
