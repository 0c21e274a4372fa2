// Site geometry as a GIS exports it: parcels that touch or overlap and
// exclusion zones on the boundary, overlapping each other or reaching
// outside are merged and clipped (planar.SiteArea), not refused. The areas
// are elementary geometry of axis-aligned squares; GEOS (shapely
// unary_union/difference) agrees with the same values on these shapes.

package main

import (
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

func TestSiteGeometryAsItComes(t *testing.T) {
	dir := t.TempDir()
	w := func(name, content string) string { return writeFile(t, dir, name, content) }
	sites := w("p.csv", "x,y\n10,10\n20,20\n30,10\n")
	feature := func(props string, ring string) string {
		return `{"type":"Feature","properties":{` + props + `},"geometry":{"type":"Polygon","coordinates":[` + ring + `]}}`
	}
	fc := func(fs ...string) string {
		s := `{"type":"FeatureCollection","features":[`
		for i, f := range fs {
			if i > 0 {
				s += ","
			}
			s += f
		}
		return s + "]}"
	}
	sq := func(x0, y0, x1, y1 int) string {
		return "[[" + strconv.Itoa(x0) + "," + strconv.Itoa(y0) + "],[" + strconv.Itoa(x1) + "," + strconv.Itoa(y0) + "],[" + strconv.Itoa(x1) + "," + strconv.Itoa(y1) + "],[" + strconv.Itoa(x0) + "," + strconv.Itoa(y1) + "],[" + strconv.Itoa(x0) + "," + strconv.Itoa(y0) + "]]"
	}
	excl := `"exclude":true`
	cases := []struct {
		name string
		area string
		want float64 // m²
	}{
		{"exclusion crossing the boundary", fc(feature("", sq(0, 0, 40, 40)), feature(excl, sq(30, 30, 50, 50))), 1600 - 100},
		{"overlapping parcels", fc(feature("", sq(0, 0, 40, 40)), feature("", sq(20, 20, 60, 60))), 1600 + 1600 - 400},
		{"parcels sharing an edge", fc(feature("", sq(0, 0, 40, 40)), feature("", sq(40, 0, 80, 40))), 3200},
		{"exclusion along the boundary edge", fc(feature("", sq(0, 0, 40, 40)), feature(excl, sq(0, 0, 10, 40))), 1600 - 400},
		{"exclusion touching the boundary at a point", fc(feature("", sq(0, 0, 40, 40)), feature(excl, sq(40, 40, 50, 50))), 1600},
		{"exclusions sharing an edge", fc(feature("", sq(0, 0, 40, 40)), feature(excl, sq(5, 5, 15, 15)), feature(excl, sq(15, 5, 25, 15))), 1600 - 200},
		{"overlapping exclusions", fc(feature("", sq(0, 0, 40, 40)), feature(excl, sq(5, 5, 15, 15)), feature(excl, sq(10, 10, 20, 20))), 1600 - 175},
		{"exclusion outside the area", fc(feature("", sq(0, 0, 40, 40)), feature(excl, sq(100, 100, 110, 110))), 1600},
	}
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			area := w("area"+strconv.Itoa(i)+".geojson", c.area)
			out := filepath.Join(dir, "out"+strconv.Itoa(i))
			mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "100", "--out", out, "--no-maps")
			s := readSummary(t, out)
			checkNear(t, "site area", s.AreaM2, c.want, 1e-9*c.want)
		})
	}
}

// --context draws buildings under the coverage and is never analysed: the
// figures are those of the same run without it, and a bad context file is
// refused naming it.
func TestContextLayer(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "p.csv", "x,y\n10,10\n20,20\n30,10\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	ctx := writeFile(t, dir, "buildings.geojson", `{"type":"FeatureCollection","features":[
		{"type":"Feature","properties":{"name":"Hall"},"geometry":{"type":"Polygon","coordinates":[[[2,2],[8,2],[8,8],[2,8],[2,2]]]}},
		{"type":"Feature","properties":{"name":"Kiosk"},"geometry":{"type":"Point","coordinates":[35,35]}}]}`)
	with, without := filepath.Join(dir, "with"), filepath.Join(dir, "without")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "12", "--context", ctx, "--out", with, "--map-width", "600")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "12", "--out", without, "--no-maps")
	a, b := readSummary(t, with), readSummary(t, without)
	if a.UncoveredAreaM2 != b.UncoveredAreaM2 || a.FullCoverRangeM != b.FullCoverRangeM {
		t.Errorf("context changed the figures: %v/%v vs %v/%v", a.UncoveredAreaM2, a.FullCoverRangeM, b.UncoveredAreaM2, b.FullCoverRangeM)
	}
	bad := writeFile(t, dir, "bad.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"LineString","coordinates":[[0,0],[1,1]]}}]}`)
	r := runCLI(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "12", "--context", bad, "--out", filepath.Join(dir, "bad"))
	if r.code != 1 || !strings.Contains(r.stderr, "bad.geojson") {
		t.Errorf("bad context: exit %d, stderr %q", r.code, r.stderr)
	}
}
