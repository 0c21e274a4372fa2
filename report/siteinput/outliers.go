// Naming the inputs that make the extent too large: swapped latitude and
// longitude, or a site or area polygon far from the rest.
//
// One swapped site among many (52.52, 13.40 written as 13.40, 52.52) is a
// valid position 4 000 km away, so each coordinate passes its check and the
// only symptom is an extent too large for one local plane. When that
// happens, farInputs looks for the culprits before the extent is refused:
//
//   - the centre of the sites is their componentwise median longitude and
//     latitude (longitudes unwrapped around the antimeridian when that
//     makes them tighter), which a minority of stray sites cannot move far;
//   - the spread is the median great-circle distance of the sites from the
//     centre (haversine on the IUGG mean sphere; a message figure only),
//     floored at outlierMinSpread;
//   - a site, or an area polygon with a vertex, farther than outlierFactor
//     spreads from the centre is far; a far site whose coordinates read the
//     other way round fall within that distance (a polygon: all of its
//     vertices) is reported as swapped.
//
// Uniform sites in a disc have their farthest site at about √2 spreads, so
// a factor of 10 names only true strays; the test runs only after the
// extent was already refused, so it never rejects good data by itself.

package siteinput

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
)

// outlierFactor and outlierMinSpread define a far input (see the file
// comment): farther from the sites' median centre than outlierFactor times
// their median distance from it, and that distance at least 1 km.
const (
	outlierFactor    = 10.0
	outlierMinSpread = 1.0 // km
)

// maxNamedOutliers bounds the inputs named in one message.
const maxNamedOutliers = 5

// farInputs returns a description of the sites and area polygons far from
// the median centre of the sites ("" when none is) and their number.
func farInputs(siteFile string, sites *siteSet, polys []areaPoly) (string, int) {
	if len(sites.Pts) == 0 {
		return "", 0
	}
	c := medianCentre(sites.Pts)
	d := make([]float64, len(sites.Pts))
	for i, p := range sites.Pts {
		d[i] = haversineKm(c, p)
	}
	spread := math.Max(median(slices.Clone(d)), outlierMinSpread)
	limit := outlierFactor * spread
	var named []string
	total := 0
	note := func(s string) {
		total++
		if len(named) < maxNamedOutliers {
			named = append(named, s)
		}
	}
	for i, p := range sites.Pts {
		if d[i] <= limit {
			continue
		}
		s := fmt.Sprintf("%s %s lies %.0f km from the other sites", siteFile, sites.label(i), d[i])
		if q := (orb.Point{p[1], p[0]}); validLonLat(q) && haversineKm(c, q) <= limit {
			s += fmt.Sprintf(": latitude and longitude swapped? read the other way round it lies %.3g km from them", haversineKm(c, q))
		}
		note(s)
	}
	for _, pl := range polys {
		far, swapOK, worst := false, true, 0.0
		for _, r := range pl.Rings {
			for _, p := range r {
				dist := haversineKm(c, p)
				worst = math.Max(worst, dist)
				far = far || dist > limit
				q := orb.Point{p[1], p[0]}
				swapOK = swapOK && validLonLat(q) && haversineKm(c, q) <= limit
			}
		}
		if !far {
			continue
		}
		s := fmt.Sprintf("%s reaches %.0f km from the sites", pl.Where, worst)
		if swapOK {
			s += ": latitude and longitude swapped? read the other way round it lies among them"
		}
		note(s)
	}
	if total == 0 {
		return "", 0
	}
	out := strings.Join(named, "; ")
	if total > len(named) {
		out += fmt.Sprintf("; and %d more", total-len(named))
	}
	return out, total
}

// validLonLat reports whether p is a valid longitude/latitude.
func validLonLat(p orb.Point) bool {
	return p[0] >= -180 && p[0] <= 180 && p[1] >= -90 && p[1] <= 90
}

// medianCentre is the componentwise median of lon/lat points, with the
// longitudes taken in [0, 360) instead when that makes their range
// narrower (data around the antimeridian).
func medianCentre(pts []orb.Point) orb.Point {
	lon := make([]float64, len(pts))
	lat := make([]float64, len(pts))
	shifted := make([]float64, len(pts))
	for i, p := range pts {
		lon[i], lat[i] = p[0], p[1]
		shifted[i] = math.Mod(p[0]+360, 360)
	}
	m := median(lon)
	if spanOf(shifted) < spanOf(lon) {
		m = median(shifted)
		if m > 180 {
			m -= 360
		}
	}
	return orb.Point{m, median(lat)}
}

// median returns the median of v (reordering v).
func median(v []float64) float64 {
	slices.Sort(v)
	n := len(v)
	if n%2 == 1 {
		return v[n/2]
	}
	return (v[n/2-1] + v[n/2]) / 2
}

func spanOf(v []float64) float64 {
	return slices.Max(v) - slices.Min(v)
}

// haversineKm is the great-circle distance in km between two lon/lat
// points on the mean sphere (meanRadiusKm).
func haversineKm(a, b orb.Point) float64 {
	const r = math.Pi / 180
	dlat := (b[1] - a[1]) * r
	dlon := (b[0] - a[0]) * r
	h := math.Sin(dlat/2)*math.Sin(dlat/2) + math.Cos(a[1]*r)*math.Cos(b[1]*r)*math.Sin(dlon/2)*math.Sin(dlon/2)
	return 2 * meanRadiusKm * math.Asin(math.Min(1, math.Sqrt(h)))
}
