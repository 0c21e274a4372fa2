// The GeoJSON layers and sitecover.gpkg of every report (analysis, cells,
// each planning move; geographic and planar) hold the same layers with the
// same features and fields, and every property is a plain scalar under a
// plain name.

package report

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/report/gpkg"
)

var plainFieldName = regexp.MustCompile(`^[a-z][a-z0-9_]*$`)

// geoJSONFields decodes a layer and returns its features' properties and
// the field names of its first feature in file order.
func geoJSONFields(t *testing.T, path string) ([]map[string]any, []string) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Features []struct {
			Properties json.RawMessage `json:"properties"`
		} `json:"features"`
	}
	if err := json.Unmarshal(b, &fc); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	var props []map[string]any
	var names []string
	for i, f := range fc.Features {
		var p map[string]any
		json.Unmarshal(f.Properties, &p)
		props = append(props, p)
		if i == 0 {
			dec := json.NewDecoder(strings.NewReader(string(f.Properties)))
			dec.Token() // {
			for dec.More() {
				k, _ := dec.Token()
				names = append(names, k.(string))
				var v json.RawMessage
				dec.Decode(&v)
			}
		}
	}
	return props, names
}

// checkLayerSet checks the layers of one report folder against its
// GeoPackage.
func checkLayerSet(t *testing.T, dir string, planarOut bool) {
	t.Helper()
	files, _ := filepath.Glob(filepath.Join(dir, "*.geojson"))
	r, err := gpkg.Open(filepath.Join(dir, FileGeoPackage))
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	layers, err := r.Layers()
	if err != nil {
		t.Fatal(err)
	}
	if len(layers) != len(files) || len(files) == 0 {
		t.Fatalf("%s: %d GeoPackage tables for %d GeoJSON layers", dir, len(layers), len(files))
	}
	for _, path := range files {
		base := strings.Replace(filepath.Base(path), "-xy.geojson", ".geojson", 1)
		table := tableName(base)
		props, names := geoJSONFields(t, path)
		li, err := r.Layer(table)
		if err != nil {
			t.Errorf("%s: no table %q: %v", FileGeoPackage, table, err)
			continue
		}
		if li.SRS.IsWGS84() == planarOut {
			t.Errorf("%s: table %q in %s (planar output %v)", FileGeoPackage, table, li.SRS.Name, planarOut)
		}
		var cols []string
		for _, f := range li.Fields {
			cols = append(cols, f.Name)
			if !plainFieldName.MatchString(f.Name) || len(f.Name) > 30 {
				t.Errorf("%s: field name %q is not lower_snake of at most 30 characters", table, f.Name)
			}
		}
		if len(props) > 0 && !slices.Equal(names, cols) {
			t.Errorf("%s: GeoJSON fields %v, GeoPackage fields %v", table, names, cols)
		}
		var got []map[string]any
		if err := r.ReadLayer(table, func(f gpkg.Feature) error {
			got = append(got, f.Properties)
			return nil
		}); err != nil {
			t.Fatal(err)
		}
		if len(got) != len(props) {
			t.Errorf("%s: %d GeoPackage features, %d GeoJSON features", table, len(got), len(props))
			continue
		}
		for i, p := range props {
			for k, v := range p {
				switch v.(type) {
				case []any, map[string]any:
					t.Errorf("%s: feature %d: property %q is an array or object", path, i, k)
				}
				if !sameValue(v, got[i][k]) {
					t.Errorf("%s: feature %d: %s is %v in GeoJSON, %v in the GeoPackage", table, i, k, v, got[i][k])
				}
			}
		}
	}
}

// sameValue compares a decoded GeoJSON value with a GeoPackage one (numbers
// as float64 against int64 or float64, booleans against 0/1 or bool).
func sameValue(j, g any) bool {
	switch j := j.(type) {
	case float64:
		switch g := g.(type) {
		case int64:
			return j == float64(g)
		case float64:
			// GeoJSON carries the shortest round-trip form; coordinates
			// may be rounded the same way, so equal up to the last bit.
			return j == g || math.Abs(j-g) <= 1e-15*math.Abs(g)
		}
		return false
	case bool:
		switch g := g.(type) {
		case bool:
			return j == g
		case int64:
			return j == (g != 0)
		}
		return false
	}
	return fmt.Sprint(j) == fmt.Sprint(g) || (j == nil && g == nil)
}

func TestLayersMatchGeoPackage(t *testing.T) {
	an := gridScene(t)
	for _, planarOut := range []bool{true, false} {
		m := Meta{Planar: planarOut, Command: "test"}
		if !planarOut {
			m.ToLonLat = func(x, y float64) (float64, float64) { return 8 + x*1e-5, 47 + y*1e-5 }
		}
		t.Run(fmt.Sprintf("analysis/planar=%v", planarOut), func(t *testing.T) {
			dir := t.TempDir()
			if _, err := WriteAnalysis(dir, an, m, Options{GeoPackage: true}); err != nil {
				t.Fatal(err)
			}
			checkLayerSet(t, dir, planarOut)
		})
		t.Run(fmt.Sprintf("cells/planar=%v", planarOut), func(t *testing.T) {
			dir := t.TempDir()
			if _, err := WriteCells(dir, an.Layout, m, Options{GeoPackage: true}); err != nil {
				t.Fatal(err)
			}
			checkLayerSet(t, dir, planarOut)
		})
		for _, mv := range allMoves {
			t.Run(fmt.Sprintf("%s/planar=%v", mv, planarOut), func(t *testing.T) {
				dir := t.TempDir()
				if _, err := WritePlan(dir, latticePlan(t, mv, 10/math.Sqrt2), m, Options{GeoPackage: true}); err != nil {
					t.Fatal(err)
				}
				checkLayerSet(t, dir, planarOut)
			})
		}
	}
}
