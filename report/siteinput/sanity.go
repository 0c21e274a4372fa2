// Plausibility checks that turn silent wrong answers into refusals: degrees
// read as metres (--planar on a longitude/latitude export), a site area that
// is numerically tiny against the spread of the sites (the area and the
// sites in different units), and a convex hull that is a sliver (sites
// along one street with no --area).
//
// Every test compares an area with the square of a length of the same data,
// so it is scale-free: the ratios below are pure numbers.
//
//   - Hull sliver. For a convex hull of area A whose bounding box has the
//     diagonal D (D/√2 ≤ diameter ≤ D), the mean width across the longest
//     direction is about A/D. A hull with A < sliverAreaRatio·D² is under
//     1/1000 of its length wide (a 1 km line of devices less than about 1 m
//     wide): no planner means that strip as the site, and a "covered"
//     figure for it is meaningless. Exactly collinear sites (A = 0) are the
//     limit case and were already refused.
//   - Tiny given area. An area A < tinyAreaRatio·D² (D the bounding-box
//     diagonal of the sites) is a millionth of the sites' spread squared: a
//     100 m campus would have to be under 1 cm² for this to trigger, while
//     an area in degrees against sites in metres gives ratios below 1e-9.
//   - Extent. All inputs together (in plane metres) must span at least
//     minInputExtent = 1 mm: below that nothing a device serves can be told
//     apart, and sizes near the bottom of the float64 range (1e-160 m)
//     make the exact geometry crawl through underflowing expansions.
//   - Degrees in planar mode. Every coordinate lies within ±180 (x) and ±90
//     (y), the data span at most planarDegreesMaxSpan units and lie at least
//     planarDegreesOffset spans from the origin. Longitude/latitude of a
//     site or town (13.40, 52.51 spanning 0.05) passes all three; a local
//     plan in metres almost never does: its origin is at or near the site,
//     so its offset is a few spans at most, and a span of 2 m is no site.

package siteinput

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// sliverAreaRatio: a convex hull of the sites with area below this times
// the squared bounding-box diagonal is a sliver (see the file comment).
const sliverAreaRatio = 1e-3

// tinyAreaRatio: a given site area below this times the squared
// bounding-box diagonal of the sites is numerically tiny against them.
const tinyAreaRatio = 1e-6

// planarDegreesMaxSpan and planarDegreesOffset define coordinates that look
// like degrees in planar mode (see the file comment): all within ±180/±90,
// spanning at most 2 units, at least 10 spans from the origin.
const (
	planarDegreesMaxSpan = 2.0
	planarDegreesOffset  = 10.0
)

// boundOf returns the bounding box of pts (pts non-empty).
func boundOf(pts []orb.Point) orb.Bound {
	b := orb.Bound{Min: pts[0], Max: pts[0]}
	for _, p := range pts[1:] {
		b = b.Extend(p)
	}
	return b
}

// diagonal is the length of the bounding box's diagonal.
func diagonal(b orb.Bound) float64 {
	return math.Hypot(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1])
}

// looksLikeDegrees reports whether planar coordinates look like
// longitude/latitude degrees (see the file comment), and their bound.
func looksLikeDegrees(pts []orb.Point) (orb.Bound, bool) {
	if len(pts) == 0 {
		return orb.Bound{}, false
	}
	b := boundOf(pts)
	if b.Min[0] < -180 || b.Max[0] > 180 || b.Min[1] < -90 || b.Max[1] > 90 {
		return b, false
	}
	span := math.Max(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1])
	c := b.Center()
	off := math.Max(math.Abs(c[0]), math.Abs(c[1]))
	return b, span <= planarDegreesMaxSpan && off >= planarDegreesOffset*span
}

// degreesInPlanar refuses --planar input whose coordinates look like
// longitude/latitude degrees.
func degreesInPlanar(files string, pts []orb.Point) error {
	b, ok := looksLikeDegrees(pts)
	if !ok {
		return nil
	}
	return errorf("%s: with --planar the coordinates are metres, but these span only %.3g × %.3g around x %.6g, y %.6g, as longitude/latitude degrees do: they are probably WGS84 longitude/latitude: drop --planar and give --crs EPSG:4326 (x read as longitude, y as latitude)",
		files, b.Max[0]-b.Min[0], b.Max[1]-b.Min[1], b.Center()[0], b.Center()[1])
}

// sliverHull refuses a convex hull of the sites that is a sliver.
func sliverHull(name string, hull orb.Ring, sites []orb.Point) error {
	d := diagonal(boundOf(sites))
	a := math.Abs(ringArea(hull))
	if a >= sliverAreaRatio*d*d {
		return nil
	}
	return errorf("%s: the sites lie (nearly) on one line: their convex hull is %s over %s, less than %g of its length wide (%s), so it is no site area; give the site area with --area",
		name, fmtArea(a), fmtLen(d), sliverAreaRatio, fmtLen(a/d))
}

// tinyArea refuses a given site area that is numerically tiny against the
// spread of the sites.
func tinyArea(files string, area float64, sites []orb.Point) error {
	d := diagonal(boundOf(sites))
	if d == 0 || area >= tinyAreaRatio*d*d {
		return nil
	}
	return errorf("%s: the site area is %s but the sites spread over %s: the area and the sites are probably not in the same units or coordinate system (degrees against metres? a different grid?)",
		files, fmtArea(area), fmtLen(d))
}

// ringArea is the signed shoelace area of an open or closed ring.
func ringArea(r orb.Ring) float64 {
	s := 0.0
	for i := range r {
		p, q := r[i], r[(i+1)%len(r)]
		s += (p[0] - q[0]) * (p[1] + q[1])
	}
	return s / 2
}

// fmtArea and fmtLen format an area in m² and a length in m or km.
func fmtArea(a float64) string { return fmt.Sprintf("%.3g m²", a) }

func fmtLen(d float64) string {
	if d >= 10000 {
		return fmt.Sprintf("%.4g km", d/1000)
	}
	return fmt.Sprintf("%.3g m", d)
}

// minInputExtent is the least span of all inputs together, in metres
// (file comment).
const minInputExtent = 1e-3

// tooSmall refuses inputs that together span less than minInputExtent in
// the plane (sites, area and planning items).
func tooSmall(files string, sc *Scene, polys []areaPoly) error {
	b := boundOf(sc.Sites)
	for _, p := range polys {
		for _, r := range p.Rings {
			for _, q := range r {
				b = b.Extend(q)
			}
		}
	}
	for _, it := range []*Items{sc.Candidates, sc.Demand} {
		if it != nil {
			for _, q := range it.allVertices() {
				b = b.Extend(q)
			}
		}
	}
	w, h := b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]
	if math.Max(w, h) >= minInputExtent {
		return nil
	}
	return errorf("%s: the inputs span only %.3g m × %.3g m, less than %g m: no site is that small (check the units)", files, w, h, minInputExtent)
}
