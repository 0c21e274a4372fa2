// The layers in a projected system on request (Meta.OutCRS; the CLI's
// --out-crs): besides the RFC 7946 layers in WGS84 longitude/latitude,
// each layer of WriteAnalysis (with the k-coverage layers of --reach),
// WriteCells, WriteRangesAnalysis, WritePlan and WriteReachPlan is
// written once more as
// "<layer>-epsg<code>.geojson" (e.g. sites-epsg32632.geojson), in the
// system's easting/northing rounded to 1 mm, with the GeoJSON 2008 "crs"
// member naming it ({"type":"name","properties":{"name":
// "urn:ogc:def:crs:EPSG::32632"}}), which GDAL and desktop GIS read. The
// copies hold the same features and fields, except that point properties
// are x/y in the system (farthest_x, farthest_y, ...) instead of
// longitude/latitude; they are not in the GeoPackage, whose layers stay
// WGS84. Outlines are checked as every written outline (outline.go).
//
// A point goes from the local plane to longitude/latitude (Meta.ToLonLat,
// unrounded) and on to the grid (siteinput.CRS.FromLonLat); both are
// Krüger series exact to nanometres, so the only error is the 1 mm
// rounding (checked against PROJ's cs2cs in outcrs_test.go).

package report

import (
	"io"
	"strings"

	"github.com/sitecover/sitecover/report/siteinput"
)

// gridOutput converts local-plane points to a projected output system.
type gridOutput struct {
	crs      *siteinput.CRS
	toLonLat func(x, y float64) (lon, lat float64)
	// member is the "crs" member of the layer files, with a trailing
	// comma.
	member string
}

// forward converts a local-plane point to the system.
func (g *gridOutput) forward(x, y float64) (float64, float64) {
	lon, lat := g.toLonLat(x, y)
	return g.crs.FromLonLat(lon, lat)
}

// gridWanted reports whether m asks for the layers in a projected system.
func gridWanted(m Meta) bool {
	return m.OutCRS != nil && m.OutCRS.TM != nil && !m.Planar && m.ToLonLat != nil
}

// GridLayerFile returns the name of the copy of a layer file in the
// projected system c: "sites.geojson" → "sites-epsg32632.geojson".
func GridLayerFile(name string, c *siteinput.CRS) string {
	code := strings.ToLower(strings.ReplaceAll(c.Code, ":", ""))
	return strings.TrimSuffix(name, ".geojson") + "-" + code + ".geojson"
}

// gridLayerFiles returns the names of the projected copies of the layer
// files names that a report with m writes (none unless gridWanted).
func gridLayerFiles(m Meta, names ...string) []string {
	if !gridWanted(m) {
		return nil
	}
	out := make([]string, len(names))
	for i, n := range names {
		out[i] = GridLayerFile(n, m.OutCRS)
	}
	return out
}

// gridCopies returns the steps writing the projected copies of the layer
// steps layers makes for a scene (none unless gridWanted).
func (s *scene) gridCopies(layers func(*scene) []step) []step {
	if !gridWanted(s.m) {
		return nil
	}
	c := s.m.OutCRS
	code := strings.TrimPrefix(c.Code, "EPSG:")
	g := newScene(s.l, s.a, s.m)
	g.grid = &gridOutput{crs: c, toLonLat: s.m.ToLonLat,
		member: `"crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::` + code + `"}},`}
	var out []step
	for _, st := range layers(g) {
		def := st.layer
		out = append(out, step{name: GridLayerFile(st.name, c), write: func(w io.Writer) error { return g.writeLayer(w, def, nil) }})
	}
	return out
}
