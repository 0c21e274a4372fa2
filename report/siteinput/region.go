// Assembling the site area from input polygons in the local plane.
//
// The site area is the union of the area polygons minus the union of the
// exclusion zones, computed exactly by planar.SiteArea (an overlay with
// exact predicates, Orient2D after Shewchuk 1997): parcels sharing an edge
// or overlapping are merged, exclusions touching the boundary or each other
// or reaching outside the area are clipped, and what was merged or clipped
// is stated in one line. Invalid rings (self-crossing, bow-tie, spike) are
// refused; planar's messages, which name "area polygon p, ring k" or
// "exclusion e, ring k" and a vertex of the projected ring, are translated
// back to the input features, vertex numbers and coordinates.
//
// Cost: that of planar.SiteArea, O((n + k) log n) for n vertices and k
// contacts.

package siteinput

import (
	"errors"
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

// buildArea computes the site area: the union of the area polygons minus
// the union of the exclusion zones (planar.SiteArea: exact overlay), so
// parcels that touch or overlap are merged and exclusions that touch the
// boundary, touch or overlap each other, or reach outside the area are
// clipped. It returns the region, the one-line account of what was merged
// or clipped ("" when nothing was), and warnings. A ring that crosses or
// touches itself, or a spike, is refused naming the file, feature, ring,
// vertex and the vertex's coordinates in the file.
func buildArea(polys []areaPoly) (*planar.Region, string, []string, error) {
	var area, excl orb.MultiPolygon
	var areaOf, exclOf []int // the input polygon of each operand polygon
	var warn []string
	for i, p := range polys {
		if p.Exclude {
			if len(p.Rings) > 1 {
				warn = append(warn, fmt.Sprintf("%s: an exclusion zone's holes are excluded too (%d ignored)", p.Where, len(p.Rings)-1))
			}
			excl = append(excl, orb.Polygon{p.Rings[0]})
			exclOf = append(exclOf, i)
			continue
		}
		area = append(area, orb.Polygon(p.Rings))
		areaOf = append(areaOf, i)
	}
	if len(area) == 0 {
		return nil, "", nil, errorf("%s: every polygon is an exclusion zone; no area is left to cover", polys[0].Where)
	}
	region, st, err := planar.SiteArea(area, excl)
	if errors.Is(err, planar.ErrEmptySite) {
		return nil, "", nil, errorf("%s: the exclusion zones cover the whole area; nothing is left to cover", polys[0].Where)
	}
	if err != nil {
		return nil, "", nil, siteAreaError(err, polys, areaOf, exclOf)
	}
	return region, st.String(), warn, nil
}

// siteAreaRef matches the polygon, ring and vertex references of
// planar.SiteArea's messages.
var siteAreaRef = regexp.MustCompile(`(area polygon|exclusion) (\d+), ring (\d+)|vertex (\d+) \([^)]*\)`)

// siteAreaError rewrites a planar.SiteArea error in terms of the inputs:
// "area polygon p, ring k" and "exclusion e, ring k" become the input
// names, and each following "vertex v (x, y)" the vertex number in the
// file and its coordinates there.
func siteAreaError(err error, polys []areaPoly, areaOf, exclOf []int) error {
	msg := strings.TrimPrefix(err.Error(), "planar: SiteArea: ")
	var cur *areaPoly
	ring := 0
	first := ""
	msg = siteAreaRef.ReplaceAllStringFunc(msg, func(m string) string {
		sub := siteAreaRef.FindStringSubmatch(m)
		if sub[4] != "" {
			v, _ := strconv.Atoi(sub[4])
			return fileVertex(cur, ring, v, m)
		}
		idx, _ := strconv.Atoi(sub[2])
		ring, _ = strconv.Atoi(sub[3])
		of := areaOf
		if sub[1] == "exclusion" {
			of = exclOf
		}
		if idx >= len(of) {
			cur = nil
			return m
		}
		cur = &polys[of[idx]]
		where := cur.Where
		if ring > 0 {
			where += fmt.Sprintf(" ring %d", ring)
		}
		if first == "" {
			first = where
			return where
		}
		return shortWhere(where, first)
	})
	return errorf("%s", msg)
}

// fileVertex names vertex v of ring k of p (a vertex of the projected,
// densified ring) by its number and coordinates in the input file; m is
// returned when p is unknown.
func fileVertex(p *areaPoly, k, v int, m string) string {
	if p == nil || k >= len(p.Rings) {
		return m
	}
	if k < len(p.Orig) && v < len(p.Orig[k]) {
		v = int(p.Orig[k][v])
	}
	rings := p.Rings
	if p.Input != nil {
		rings = p.Input
	}
	if k >= len(rings) || v >= len(rings[k]) {
		return m
	}
	q := rings[k][v]
	return fmt.Sprintf("vertex %d (%s, %s)", v, fmtCoord(q[0]), fmtCoord(q[1]))
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
