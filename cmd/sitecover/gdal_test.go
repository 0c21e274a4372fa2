// Every layer the demo writes (its own folder and each planning
// sub-folder), as GeoJSON and in the folder's GeoPackage, is read by GDAL's
// ogrinfo (Debian package gdal-bin 3.6) with the expected feature count,
// geometry type and field names; the GeoJSON and the GeoPackage of a
// folder hold the same layers with the same fields. The test runs
// whenever ogrinfo is installed; under SITECOVER_LIVE=1 (CI's live pass) a
// missing ogrinfo is a failure, not a skip.

package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
)

// demoLayerFields are the fields of each layer (GeoPackage table name) of
// a geographic run, in order; the per-site layers end with the demo
// sensors' own attribute "id" (report/attributes.go).
var demoLayerFields = map[string][]string{
	"sites":            {"site", "name", "range_m", "type", "duplicate_of", "id"},
	"service_areas":    {"site", "name", "area_m2", "share", "farthest_m", "farthest_lon", "farthest_lat", "merged", "id"},
	"gaps":             gapFieldNames,
	"gaps_before":      gapFieldNames,
	"gaps_after":       gapFieldNames,
	"hole_closings":    {"birth_m", "death_m", "lifetime_m", "note", "birth_sites"},
	"proposed_devices": {"n", "full_cover_before_m", "full_cover_after_m", "covered_fraction_before", "covered_fraction_after", "uncovered_before_m2", "uncovered_after_m2", "range_m"},
	"candidates":       {"candidate", "name", "picked", "pick_order", "gain_m2", "range_m"},
	"failures":         {"rank", "site", "name", "shared", "service_area_m2", "added_uncovered_m2", "uncovered_area_m2", "closing_range_m", "deepest_lon", "deepest_lat", "backup", "full_cover_range_m", "range_m", "id"},
	"assignment":       {"point", "name", "device", "device_name", "distance_m", "within_range", "weight"},
	"device_load":      {"device", "name", "count", "weight", "in_range", "in_range_weight", "id"},
	"covered":          {"part", "outline_area_m2", "range_m"},
}

var gapFieldNames = []string{"id", "area_m2", "closing_range_m", "deepest_lon", "deepest_lat", "touches_boundary", "sites", "range_m"}

// demoLayerGeometry is the geometry type ogrinfo names for each layer.
var demoLayerGeometry = map[string]string{
	"sites": "Point", "service_areas": "Multi Polygon", "gaps": "Multi Polygon", "gaps_before": "Multi Polygon",
	"gaps_after": "Multi Polygon", "hole_closings": "Point", "proposed_devices": "Point", "candidates": "Point",
	"failures": "Point", "assignment": "Line String", "device_load": "Point", "covered": "Multi Polygon",
}

// ogrLayer is what ogrinfo -so -al says about one layer.
type ogrLayer struct {
	geometry string
	count    int
	fields   []string
}

var (
	ogrFieldLine = regexp.MustCompile(`^([a-z][a-z0-9_]*): (Integer|Integer64|Real|String|Date|DateTime)(\(\w+\))? \(`)
	plainName    = regexp.MustCompile(`^[a-z][a-z0-9_]*$`)
)

// ogrinfo runs ogrinfo -so -al on path and returns its layers by name.
func ogrinfo(t *testing.T, path string) map[string]ogrLayer {
	t.Helper()
	out, err := exec.Command("ogrinfo", "-so", "-al", path).CombinedOutput()
	if err != nil {
		t.Fatalf("ogrinfo -so -al %s: %v\n%s", path, err, out)
	}
	layers := map[string]ogrLayer{}
	var name string
	var cur ogrLayer
	flush := func() {
		if name != "" {
			layers[name] = cur
		}
	}
	for _, line := range strings.Split(string(out), "\n") {
		switch {
		case strings.HasPrefix(line, "Layer name: "):
			flush()
			name, cur = strings.TrimPrefix(line, "Layer name: "), ogrLayer{count: -1}
		case strings.HasPrefix(line, "Geometry: "):
			cur.geometry = strings.TrimPrefix(line, "Geometry: ")
		case strings.HasPrefix(line, "Feature Count: "):
			cur.count, _ = strconv.Atoi(strings.TrimPrefix(line, "Feature Count: "))
		default:
			if m := ogrFieldLine.FindStringSubmatch(line); m != nil {
				cur.fields = append(cur.fields, m[1])
			}
		}
	}
	flush()
	return layers
}

// geoJSONLayer decodes a layer file: its feature count, and fails on a
// property that is an array or an object or whose name is not plain.
func geoJSONLayer(t *testing.T, path string) int {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Features []struct {
			Properties map[string]any `json:"properties"`
		} `json:"features"`
	}
	if err := json.Unmarshal(b, &fc); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	for i, f := range fc.Features {
		for k, v := range f.Properties {
			switch v.(type) {
			case []any, map[string]any:
				t.Errorf("%s: feature %d: property %q is an array or object: %v", path, i, k, v)
			}
			if !plainName.MatchString(k) || len(k) > 30 {
				t.Errorf("%s: property name %q is not lower_snake of at most 30 characters", path, k)
			}
		}
	}
	return len(fc.Features)
}

func TestDemoLayersGDALLive(t *testing.T) {
	if _, err := exec.LookPath("ogrinfo"); err != nil {
		msg := "reference tool ogrinfo unavailable (" + err.Error() + "); install gdal-bin"
		if os.Getenv("SITECOVER_LIVE") == "1" {
			t.Fatal(msg)
		}
		t.Skip(msg)
	}
	out := filepath.Join(t.TempDir(), "campus")
	mustRun(t, "demo", "--out", out)
	folders := []string{out}
	for _, p := range demoPlans(examplesites.PlannedRange) {
		folders = append(folders, filepath.Join(out, p.dir))
	}
	for _, dir := range folders {
		t.Run(filepath.Base(dir), func(t *testing.T) {
			layers, _ := filepath.Glob(filepath.Join(dir, "*.geojson"))
			if len(layers) == 0 {
				t.Fatalf("%s holds no layer", dir)
			}
			pkg := ogrinfo(t, filepath.Join(dir, report.FileGeoPackage))
			if len(pkg) != len(layers) {
				t.Errorf("%s has %d layers, the folder %d GeoJSON layers", report.FileGeoPackage, len(pkg), len(layers))
			}
			for _, path := range layers {
				table := strings.ReplaceAll(strings.TrimSuffix(filepath.Base(path), ".geojson"), "-", "_")
				want, known := demoLayerFields[table]
				if !known {
					t.Errorf("%s: no expected fields for layer %q", path, table)
					continue
				}
				n := geoJSONLayer(t, path)
				gj := ogrinfo(t, path)
				if len(gj) != 1 {
					t.Fatalf("%s: ogrinfo reads %d layers, want 1", path, len(gj))
				}
				var g ogrLayer
				for _, g = range gj {
				}
				if g.count != n {
					t.Errorf("%s: ogrinfo counts %d features, the file holds %d", path, g.count, n)
				}
				if n > 0 && (g.geometry != demoLayerGeometry[table] || !slices.Equal(g.fields, want)) {
					t.Errorf("%s: ogrinfo reads %s with fields %v, want %s with %v", path, g.geometry, g.fields, demoLayerGeometry[table], want)
				}
				p, ok := pkg[table]
				if !ok {
					t.Errorf("%s lacks layer %q", report.FileGeoPackage, table)
					continue
				}
				if p.count != n || p.geometry != demoLayerGeometry[table] || !slices.Equal(p.fields, want) {
					t.Errorf("%s layer %s: %d features of %s with fields %v, want %d of %s with %v",
						report.FileGeoPackage, table, p.count, p.geometry, p.fields, n, demoLayerGeometry[table], want)
				}
			}
		})
	}
}
