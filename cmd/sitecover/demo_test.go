// The demo writes every file of the report, and its figures agree with the
// campus reference computed outside sitecover (examplesites/gen_campus.py:
// GEOS, GUDHI, GeographicLib, PROJ). The same campus read from CSV gives
// the same figures; --json prints summary.json unchanged.

package main

import (
	"bytes"
	"encoding/json"
	_ "image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
)

func campusReference(t *testing.T) (*refFigures, float64) {
	t.Helper()
	var ref refFigures
	if err := json.Unmarshal(examplesites.ReferenceJSON(), &ref); err != nil {
		t.Fatal(err)
	}
	var extra struct {
		AreaPlane float64 `json:"area_m2_plane"`
		Geodesic  float64 `json:"area_m2_geodesic"`
	}
	json.Unmarshal(examplesites.ReferenceJSON(), &extra)
	ref.AreaM2 = extra.AreaPlane
	return &ref, extra.Geodesic
}

func TestDemoWritesEverything(t *testing.T) {
	out := filepath.Join(t.TempDir(), "campus")
	r := mustRun(t, "demo", "--out", out)
	files := report.Files(false, report.Meta{}, report.Options{Maps: true, Charts: true, GeoPackage: true})
	for _, name := range files {
		fi, err := os.Stat(filepath.Join(out, name))
		if err != nil || fi.Size() == 0 {
			t.Errorf("%s: %v", name, err)
		}
	}
	ents, _ := os.ReadDir(out)
	var names []string
	dirs := 0
	for _, e := range ents {
		if e.IsDir() {
			dirs++ // the planning sub-folders, checked in plan_test.go
			continue
		}
		names = append(names, e.Name())
	}
	if len(names) != len(files) || dirs != len(demoPlans(examplesites.PlannedRange))+1 {
		t.Errorf("out folder holds %v and %d folders, want exactly %v, the mixed-range folder and the planning folders (no temporary files left)", names, dirs, files)
	}
	checkPNGWidths(t, out, files)
	if !strings.Contains(r.stdout, examplesites.Title) || !strings.Contains(r.stdout, "Wrote") {
		t.Errorf("stdout: %s", r.stdout)
	}

	s := readSummary(t, out)
	ref, geodesic := campusReference(t)
	if s.Sites != 40 || s.RangeM != examplesites.PlannedRange {
		t.Errorf("sites %d range %g", s.Sites, s.RangeM)
	}
	compareWithReference(t, s, ref, true)
	// Reference: GeographicLib Planimeter (geodesic area on WGS84); the
	// local plane's scale error over 1 km is ~1e-8.
	checkNear(t, "area vs geodesic", s.AreaM2, geodesic, 0.5)
	var refWorst struct {
		W []float64 `json:"full_cover_worst_lonlat"`
	}
	json.Unmarshal(examplesites.ReferenceJSON(), &refWorst)
	w := s.FullCoverWorstPoint
	if !near(w[0], refWorst.W[0], 2e-7) || !near(w[1], refWorst.W[1], 2e-7) {
		t.Errorf("full-cover worst point %v, reference [lon, lat] %v", w, refWorst.W)
	}
	if !strings.Contains(s.Projection, "transverse Mercator") {
		t.Errorf("projection %q", s.Projection)
	}
	for _, phase := range []string{"read inputs", "project", "build area"} {
		if _, ok := s.Timings[phase]; !ok {
			t.Errorf("timings lack %q: %v", phase, s.Timings)
		}
	}
	// The demo is meant to have gaps at the planned range, one inner.
	enclosed := 0
	for _, g := range s.Gaps {
		if !g.TouchesBoundary {
			enclosed++
		}
	}
	if len(s.Gaps) == 0 || enclosed == 0 || s.FullCoverRangeM <= s.RangeM {
		t.Errorf("demo: %d gaps (%d enclosed), full cover %.1f m", len(s.Gaps), enclosed, s.FullCoverRangeM)
	}
	// One site stands just outside the south fence.
	found := false
	for _, w := range s.Warnings {
		if strings.Contains(w, "outside the area") {
			found = true
		}
	}
	if !found {
		t.Errorf("no warning about the site outside the area: %v", s.Warnings)
	}

	// GeoJSON layers: [lon, lat] order (RFC 7946 §3.1.1) and
	// counter-clockwise exteriors (§3.1.6).
	checkLayer(t, filepath.Join(out, report.FileGaps), len(s.Gaps))
	checkLayer(t, filepath.Join(out, report.FileServiceAreas), 40)
}

// geoLayer is the part of a GeoJSON layer the layer checks read.
type geoLayer struct {
	Features []struct {
		Geometry struct {
			Type        string          `json:"type"`
			Coordinates json.RawMessage `json:"coordinates"`
		} `json:"geometry"`
	} `json:"features"`
}

// checkLayer checks that every position of a GeoJSON layer lies on the
// campus in [lon, lat] order and that polygon exteriors are
// counter-clockwise; with wantFeatures >= 0 it also checks the count.
func checkLayer(t *testing.T, path string, wantFeatures int) {
	t.Helper()
	var fc geoLayer
	loadJSON(t, path, &fc)
	if wantFeatures >= 0 && len(fc.Features) != wantFeatures {
		t.Errorf("%s: %d features, want %d", filepath.Base(path), len(fc.Features), wantFeatures)
	}
	onCampus := func(p []float64) bool {
		return p[0] > -99.88 && p[0] < -99.84 && p[1] > 44.37 && p[1] < 44.39
	}
	for i, f := range fc.Features {
		var polys [][][][]float64
		switch f.Geometry.Type {
		case "Polygon":
			var rings [][][]float64
			json.Unmarshal(f.Geometry.Coordinates, &rings)
			polys = [][][][]float64{rings}
		case "MultiPolygon":
			json.Unmarshal(f.Geometry.Coordinates, &polys)
		default:
			continue
		}
		for _, rings := range polys {
			for k, ring := range rings {
				a := 0.0
				for j := 0; j+1 < len(ring); j++ {
					if !onCampus(ring[j]) {
						t.Fatalf("%s feature %d: position %v is not [lon, lat] on the campus", filepath.Base(path), i, ring[j])
					}
					a += ring[j][0]*ring[j+1][1] - ring[j+1][0]*ring[j][1]
				}
				if (k == 0) != (a > 0) {
					t.Errorf("%s feature %d ring %d: wrong winding (signed area %g)", filepath.Base(path), i, k, a)
				}
			}
		}
	}
}

func TestCampusCSVMatchesGeoJSON(t *testing.T) {
	dir := t.TempDir()
	csv := writeFile(t, dir, "campus.csv", string(examplesites.SitesCSV()))
	gj := writeFile(t, dir, "campus.geojson", string(examplesites.SitesGeoJSON()))
	area := writeFile(t, dir, "area.geojson", string(examplesites.AreaGeoJSON()))
	var docs [2]*summaryJSON
	for i, sites := range []string{csv, gj} {
		out := filepath.Join(dir, "out", filepath.Base(sites))
		r := mustRun(t, "analyze", "--sites", sites, "--area", area, "--range", "120m", "--out", out, "--json", "--no-maps")
		docs[i] = parseSummary(t, []byte(r.stdout))
	}
	a, b := docs[0], docs[1]
	if a.FullCoverRangeM != b.FullCoverRangeM || a.UncoveredAreaM2 != b.UncoveredAreaM2 || len(a.Gaps) != len(b.Gaps) || len(a.Cells) != len(b.Cells) {
		t.Errorf("CSV and GeoJSON differ: %g/%g %g/%g %d/%d", a.FullCoverRangeM, b.FullCoverRangeM, a.UncoveredAreaM2, b.UncoveredAreaM2, len(a.Gaps), len(b.Gaps))
	}
	for i := range a.Cells {
		if a.Cells[i].Name != b.Cells[i].Name || a.Cells[i].AreaM2 != b.Cells[i].AreaM2 {
			t.Errorf("cell %d: %+v vs %+v", i, a.Cells[i], b.Cells[i])
		}
	}
}

func TestJSONToStdout(t *testing.T) {
	out := filepath.Join(t.TempDir(), "r")
	r := mustRun(t, "demo", "--out", out, "--json", "--no-maps")
	file, err := os.ReadFile(filepath.Join(out, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal([]byte(r.stdout), file) {
		t.Errorf("--json stdout differs from summary.json")
	}
	if !json.Valid([]byte(r.stdout)) {
		t.Errorf("stdout is not JSON")
	}
	if _, err := os.Stat(filepath.Join(out, report.FileMapCoverage)); err == nil {
		t.Errorf("--no-maps still wrote %s", report.FileMapCoverage)
	}
}

func TestCellsAndGapsCommands(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.geojson", string(examplesites.SitesGeoJSON()))
	area := writeFile(t, dir, "a.geojson", string(examplesites.AreaGeoJSON()))
	out := filepath.Join(dir, "cells")
	r := mustRun(t, "cells", "--sites", sites, "--area", area, "--out", out)
	for _, name := range report.Files(true, report.Meta{}, report.Options{Maps: true}) {
		if _, err := os.Stat(filepath.Join(out, name)); err != nil {
			t.Errorf("cells: %v", err)
		}
	}
	if !strings.Contains(r.stdout, "service areas") {
		t.Errorf("cells stdout: %s", r.stdout)
	}
	var cells struct {
		Cells []struct {
			AreaM2 float64 `json:"area_m2"`
		} `json:"cells"`
		AreaM2 float64 `json:"area_m2"`
	}
	loadJSON(t, filepath.Join(out, "summary.json"), &cells)
	total := 0.0
	for _, c := range cells.Cells {
		total += c.AreaM2
	}
	// The service areas partition the site area.
	checkNear(t, "sum of service areas", total, cells.AreaM2, 1e-6*cells.AreaM2)

	out = filepath.Join(dir, "gaps")
	r = mustRun(t, "gaps", "--sites", sites, "--area", area, "--range", "120m", "--out", out)
	if !strings.Contains(r.stdout, "Gaps at 120.00 m") || !strings.Contains(r.stdout, "inner") {
		t.Errorf("gaps stdout: %s", r.stdout)
	}
	if _, err := os.Stat(filepath.Join(out, report.FileChartCurve)); err == nil {
		t.Errorf("gaps wrote the charts")
	}
	if _, err := os.Stat(filepath.Join(out, report.FileMapCoverage)); err != nil {
		t.Errorf("gaps: %v", err)
	}
}

func TestAreaFromHull(t *testing.T) {
	// Without --area the convex hull of the sites is the area, and the
	// report says so. Sites at the corners and the centre of a square of
	// side 100: hull area 10⁴ m²; the Voronoi vertices are the edge
	// midpoints, 50 m from two corners and from the centre, so the
	// full-cover range is 50 m.
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n0,0\n100,0\n100,100\n0,100\n50,50\n")
	out := filepath.Join(dir, "out")
	r := mustRun(t, "analyze", "--planar", "--sites", sites, "--range", "30", "--out", out, "--no-maps")
	s := readSummary(t, out)
	checkNear(t, "hull area", s.AreaM2, 1e4, 1e-9)
	checkNear(t, "full cover", s.FullCoverRangeM, 50, 1e-9)
	hull := false
	for _, w := range s.Warnings {
		if strings.Contains(w, "convex hull") {
			hull = true
		}
	}
	if !hull || !strings.Contains(r.stderr, "convex hull") {
		t.Errorf("no convex-hull warning: %v / %q", s.Warnings, r.stderr)
	}
}

func TestExcludeFile(t *testing.T) {
	// A separate --exclude file cuts its polygons out of the area: a 20×20
	// pond in a 100×100 square leaves 9600 m².
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n25,25\n75,25\n75,75\n25,75\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 100))
	pond := writeFile(t, dir, "pond.geojson", squareGeoJSON(40, 40, 20))
	out := filepath.Join(dir, "out")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--exclude", pond, "--range", "40", "--out", out, "--no-maps")
	s := readSummary(t, out)
	checkNear(t, "area less pond", s.AreaM2, 9600, 1e-9)
	// Same result with the pond as a feature with "exclude": true.
	both := `{"type":"FeatureCollection","features":[` +
		strings.TrimSuffix(strings.TrimPrefix(squareGeoJSON(0, 0, 100), `{"features":[`), `],"type":"FeatureCollection"}`) + "," +
		strings.Replace(strings.TrimSuffix(strings.TrimPrefix(squareGeoJSON(40, 40, 20), `{"features":[`), `],"type":"FeatureCollection"}`),
			`"properties":{"name":"square"}`, `"properties":{"exclude":true}`, 1) + `]}`
	area2 := writeFile(t, dir, "a2.geojson", both)
	out2 := filepath.Join(dir, "out2")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area2, "--range", "40", "--out", out2, "--no-maps")
	s2 := readSummary(t, out2)
	if s2.AreaM2 != s.AreaM2 || s2.UncoveredAreaM2 != s.UncoveredAreaM2 {
		t.Errorf("exclude property: area %g uncovered %g; --exclude: %g %g", s2.AreaM2, s2.UncoveredAreaM2, s.AreaM2, s.UncoveredAreaM2)
	}
}
