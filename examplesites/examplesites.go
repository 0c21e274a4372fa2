// Package examplesites embeds an invented demo campus for sitecover: the
// Quillmere Science Park, with forty environmental sensors to be served by
// one common radio range.
//
// All of it is invented: the park, its outline, buildings, pond, quarry and
// sensor names describe no real place or installation. The campus was laid
// out in local metres and placed at an arbitrary point in open country
// (44.3771° N, 99.8623° W) by the inverse of a transverse Mercator projection
// (PROJ, WGS84), so that it exercises the geographic input path. The files
// are made by gen_campus.py in this folder, which also writes
// campus-reference.json: figures computed with GEOS (shapely), GUDHI and
// GeographicLib for the command's tests. The candidate mounting spots of
// the planning demo are made by gen_candidates.py, the mixed-range variant
// (short-range sensors among long-range gateways, each with its own range
// in the sites file) by gen_mixed.py.
//
// The layout is meant to give a design review something to find: at the
// planned range of 120 m about 97% of the park is covered and ten gaps
// remain (one enclosed by coverage, the rest against the boundary or the
// pond and quarry); every point is covered from about 166 m.
//
// Coordinates follow RFC 7946: [longitude, latitude] in WGS84 degrees, 7
// decimals, counter-clockwise exterior rings.
package examplesites

import (
	_ "embed"
)

// Title is the demo campus's display name.
const Title = "Quillmere Science Park (invented demo campus)"

// PlannedRange is the planned device range of the demo, in metres.
const PlannedRange = 120.0

// File names of the embedded data, as they appear in messages and reports.
const (
	AreaFile       = "campus-area.geojson"
	SitesFile      = "campus-sensors.geojson"
	SitesCSVFile   = "campus-sensors.csv"
	BuildingsFile  = "campus-buildings.geojson"
	CandidatesFile = "campus-candidates.geojson"
	ReferenceFile  = "campus-reference.json"
	// MixedSitesFile and MixedReferenceFile are the mixed-range variant
	// (gen_mixed.py): the sensors at a short range among long-range
	// gateways, and its figures computed outside sitecover.
	MixedSitesFile     = "campus-mixed-sites.geojson"
	MixedReferenceFile = "campus-mixed-reference.json"
)

//go:embed campus-mixed-sites.geojson
var mixedSites []byte

//go:embed campus-mixed-reference.json
var mixedReference []byte

// MixedSitesGeoJSON returns a copy of campus-mixed-sites.geojson: the 40
// sensors of SitesGeoJSON with "type": "sensor" and "range": "80m", then
// six invented gateways on building roofs with "type": "gateway" and
// "range": "180m" (made by gen_mixed.py).
func MixedSitesGeoJSON() []byte { return clone(mixedSites) }

// MixedReferenceJSON returns a copy of campus-mixed-reference.json: the
// mixed-range campus's uncovered area, gap count and redundant devices
// computed with GEOS (see gen_mixed.py for the method and its bound).
func MixedReferenceJSON() []byte { return clone(mixedReference) }

//go:embed campus-area.geojson
var area []byte

//go:embed campus-sensors.geojson
var sites []byte

//go:embed campus-sensors.csv
var sitesCSV []byte

//go:embed campus-buildings.geojson
var buildings []byte

//go:embed campus-candidates.geojson
var candidates []byte

//go:embed campus-reference.json
var reference []byte

// Campus returns the demo campus: the sensor sites (GeoJSON FeatureCollection
// of Points with "id" and "name" properties), the area (GeoJSON
// FeatureCollection: the park's Polygon boundary, then the pond and the
// quarry as Polygons with "exclude": true), the planned range in metres and
// the title. The byte slices are fresh copies the caller may modify.
func Campus() (sites, area []byte, rangeM float64, title string) {
	return SitesGeoJSON(), AreaGeoJSON(), PlannedRange, Title
}

// AreaGeoJSON returns a copy of campus-area.geojson.
func AreaGeoJSON() []byte { return clone(area) }

// SitesGeoJSON returns a copy of campus-sensors.geojson: 40 Point features.
func SitesGeoJSON() []byte { return clone(sites) }

// SitesCSV returns a copy of campus-sensors.csv: the same 40 sites as
// SitesGeoJSON, in the same order, with columns id, name, lat, lon.
func SitesCSV() []byte { return clone(sitesCSV) }

// BuildingsGeoJSON returns a copy of campus-buildings.geojson: named Point
// features for the park's buildings (not used by the coverage analysis).
func BuildingsGeoJSON() []byte { return clone(buildings) }

// CandidatesGeoJSON returns a copy of campus-candidates.geojson: 22 named
// Point features, invented spots where a new sensor could be mounted
// (lamp posts, roofs, walls, fence posts; two just outside the boundary),
// made by gen_candidates.py.
func CandidatesGeoJSON() []byte { return clone(candidates) }

// ReferenceJSON returns a copy of campus-reference.json: the campus's
// figures at the planned range computed outside sitecover (see
// gen_campus.py for the tools and tolerances).
func ReferenceJSON() []byte { return clone(reference) }

func clone(b []byte) []byte { return append([]byte(nil), b...) }
