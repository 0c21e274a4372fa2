// GeoPackage inputs: a .gpkg read for the sites and the area gives the
// same figures as the same features in GeoJSON; a file with two point
// layers is refused, naming them. The GeoPackage is written with package
// gpkg, whose files GDAL reads and validates (report/gpkg tests).

package main

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/report/gpkg"
)

// writeGPKG writes layers of features (geometry and a name) into a new
// GeoPackage in WGS84.
func writeGPKG(t *testing.T, path string, layers map[string][]orb.Geometry, kinds map[string]gpkg.GeometryType) {
	t.Helper()
	writeGPKGIn(t, path, gpkg.WGS84, layers, kinds)
}

// writeGPKGIn is writeGPKG in the coordinate system srs.
func writeGPKGIn(t *testing.T, path string, srs gpkg.SRS, layers map[string][]orb.Geometry, kinds map[string]gpkg.GeometryType) {
	t.Helper()
	w, err := gpkg.Create(path, gpkg.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for name, geoms := range layers {
		l, err := w.AddLayer(gpkg.LayerSpec{Name: name, Geometry: kinds[name], SRS: srs, Fields: []gpkg.Field{{Name: "name", Type: gpkg.Text}}})
		if err != nil {
			t.Fatal(err)
		}
		for i, g := range geoms {
			if err := l.Insert(g, name+string(rune('A'+i))); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

func TestGeoPackageInputs(t *testing.T) {
	dir := t.TempDir()
	pts := []orb.Geometry{orb.Point{-99.0, 44.0}, orb.Point{-99.002, 44.001}, orb.Point{-99.001, 44.002}}
	area := orb.Polygon{{{-99.004, 43.998}, {-98.998, 43.998}, {-98.998, 44.004}, {-99.004, 44.004}, {-99.004, 43.998}}}
	sitesG := filepath.Join(dir, "sites.gpkg")
	areaG := filepath.Join(dir, "area.gpkg")
	writeGPKG(t, sitesG, map[string][]orb.Geometry{"devices": pts}, map[string]gpkg.GeometryType{"devices": gpkg.Point})
	writeGPKG(t, areaG, map[string][]orb.Geometry{"site": {area}}, map[string]gpkg.GeometryType{"site": gpkg.Polygon})
	sitesJ := writeFile(t, dir, "sites.geojson", `{"type":"FeatureCollection","features":[
		{"type":"Feature","properties":{"name":"devicesA"},"geometry":{"type":"Point","coordinates":[-99.0,44.0]}},
		{"type":"Feature","properties":{"name":"devicesB"},"geometry":{"type":"Point","coordinates":[-99.002,44.001]}},
		{"type":"Feature","properties":{"name":"devicesC"},"geometry":{"type":"Point","coordinates":[-99.001,44.002]}}]}`)
	areaJ := writeFile(t, dir, "area.geojson", `{"type":"Polygon","coordinates":[[[-99.004,43.998],[-98.998,43.998],[-98.998,44.004],[-99.004,44.004],[-99.004,43.998]]]}`)
	a, b := filepath.Join(dir, "from-gpkg"), filepath.Join(dir, "from-geojson")
	mustRun(t, "analyze", "--sites", sitesG, "--area", areaG, "--range", "80m", "--no-maps", "--out", a)
	mustRun(t, "analyze", "--sites", sitesJ, "--area", areaJ, "--range", "80m", "--no-maps", "--out", b)
	ga, gb := readSummary(t, a), readSummary(t, b)
	if ga.AreaM2 != gb.AreaM2 || ga.UncoveredAreaM2 != gb.UncoveredAreaM2 || ga.FullCoverRangeM != gb.FullCoverRangeM || ga.Sites != 3 {
		t.Errorf("GeoPackage %+v vs GeoJSON %+v", ga, gb)
	}

	two := filepath.Join(dir, "two.gpkg")
	writeGPKG(t, two, map[string][]orb.Geometry{"a": pts, "b": pts}, map[string]gpkg.GeometryType{"a": gpkg.Point, "b": gpkg.Point})
	r := runCLI(t, "analyze", "--sites", two, "--range", "80m", "--out", filepath.Join(dir, "x"))
	if r.code != 1 || !strings.Contains(r.stderr, "two.gpkg: 2 point layers (") || !strings.Contains(r.stderr, "a, b") && !strings.Contains(r.stderr, "b, a") {
		t.Errorf("two point layers: exit %d, stderr %q", r.code, r.stderr)
	}
	r = runCLI(t, "analyze", "--sites", sitesG, "--area", sitesG, "--range", "80m", "--out", filepath.Join(dir, "y"))
	if r.code != 1 || !strings.Contains(r.stderr, "no polygon layer for --area (layers: devices (point))") {
		t.Errorf("points as area: exit %d, stderr %q", r.code, r.stderr)
	}

	// A layer in local metres (undefined Cartesian) is read with --planar
	// and refused without it: small metre values would pass as degrees.
	local := filepath.Join(dir, "local.gpkg")
	writeGPKGIn(t, local, gpkg.UndefinedCartesian, map[string][]orb.Geometry{"plan": {orb.Point{10, 10}, orb.Point{30, 10}, orb.Point{20, 30}}}, map[string]gpkg.GeometryType{"plan": gpkg.Point})
	r = runCLI(t, "analyze", "--sites", local, "--range", "20", "--out", filepath.Join(dir, "z"))
	if r.code != 1 || !strings.Contains(r.stderr, "layer plan has local coordinates") || !strings.Contains(r.stderr, "--planar") {
		t.Errorf("local layer without --planar: exit %d, stderr %q", r.code, r.stderr)
	}
	mustRun(t, "analyze", "--planar", "--sites", local, "--range", "20", "--no-maps", "--out", filepath.Join(dir, "zz"))
}
