// Tests of the embedded campus: the files parse, have the advertised
// contents, and agree with each other (GeoJSON and CSV sites).

package examplesites

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"strconv"
	"testing"
)

type fc struct {
	Type     string `json:"type"`
	Features []struct {
		Type       string         `json:"type"`
		Properties map[string]any `json:"properties"`
		Geometry   struct {
			Type        string          `json:"type"`
			Coordinates json.RawMessage `json:"coordinates"`
		} `json:"geometry"`
	} `json:"features"`
}

func decode(t *testing.T, name string, b []byte) fc {
	t.Helper()
	var c fc
	if err := json.Unmarshal(b, &c); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	if c.Type != "FeatureCollection" {
		t.Fatalf("%s: type %q", name, c.Type)
	}
	return c
}

// signedArea is the shoelace area of a closed lon/lat ring in square
// degrees: positive when counter-clockwise (RFC 7946 §3.1.6 asks exterior
// rings to be counter-clockwise).
func signedArea(r [][]float64) float64 {
	s := 0.0
	for i := 0; i+1 < len(r); i++ {
		s += r[i][0]*r[i+1][1] - r[i+1][0]*r[i][1]
	}
	return s / 2
}

func TestCampusArea(t *testing.T) {
	c := decode(t, AreaFile, AreaGeoJSON())
	if len(c.Features) != 3 {
		t.Fatalf("want boundary, pond and quarry, got %d features", len(c.Features))
	}
	excluded := 0
	for i, f := range c.Features {
		if f.Geometry.Type != "Polygon" {
			t.Fatalf("feature %d: %s", i, f.Geometry.Type)
		}
		var rings [][][]float64
		if err := json.Unmarshal(f.Geometry.Coordinates, &rings); err != nil {
			t.Fatal(err)
		}
		r := rings[0]
		if first, last := r[0], r[len(r)-1]; first[0] != last[0] || first[1] != last[1] {
			t.Errorf("feature %d: ring not closed", i)
		}
		if signedArea(r) <= 0 {
			t.Errorf("feature %d: exterior ring not counter-clockwise (RFC 7946)", i)
		}
		if ex, _ := f.Properties["exclude"].(bool); ex {
			excluded++
		}
	}
	if excluded != 2 {
		t.Errorf("want pond and quarry excluded, got %d exclusions", excluded)
	}
}

func TestCampusSitesAgree(t *testing.T) {
	c := decode(t, SitesFile, SitesGeoJSON())
	if len(c.Features) != 40 {
		t.Fatalf("want 40 sites, got %d", len(c.Features))
	}
	rows, err := csv.NewReader(bytes.NewReader(SitesCSV())).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 41 || rows[0][2] != "lat" || rows[0][3] != "lon" {
		t.Fatalf("CSV: %d rows, header %v", len(rows), rows[0])
	}
	names := map[string]bool{}
	for i, f := range c.Features {
		var p []float64
		if err := json.Unmarshal(f.Geometry.Coordinates, &p); err != nil || f.Geometry.Type != "Point" {
			t.Fatalf("site %d: %v %s", i, err, f.Geometry.Type)
		}
		name, _ := f.Properties["name"].(string)
		if name == "" || names[name] {
			t.Errorf("site %d: name %q missing or repeated", i, name)
		}
		names[name] = true
		lat, _ := strconv.ParseFloat(rows[i+1][2], 64)
		lon, _ := strconv.ParseFloat(rows[i+1][3], 64)
		if rows[i+1][1] != name || math.Abs(lat-p[1]) > 1e-9 || math.Abs(lon-p[0]) > 1e-9 {
			t.Errorf("site %d: CSV %v differs from GeoJSON %v %q", i, rows[i+1], p, name)
		}
	}
}

func TestCampusReference(t *testing.T) {
	var ref struct {
		Sites        int     `json:"sites"`
		AreaPlane    float64 `json:"area_m2_plane"`
		AreaGeodesic float64 `json:"area_m2_geodesic"`
		FullCover    float64 `json:"full_cover_range_m"`
		PlannedRange float64 `json:"planned_range_m"`
		CoveredFrac  float64 `json:"covered_fraction"`
		Gaps         []any   `json:"gaps"`
	}
	if err := json.Unmarshal(ReferenceJSON(), &ref); err != nil {
		t.Fatal(err)
	}
	if ref.Sites != 40 || ref.PlannedRange != PlannedRange {
		t.Errorf("reference made for %d sites at %g m", ref.Sites, ref.PlannedRange)
	}
	// The design promise of the package doc: gaps at the planned range,
	// full cover moderately larger.
	if len(ref.Gaps) == 0 || ref.FullCover < 1.2*PlannedRange || ref.FullCover > 1.6*PlannedRange {
		t.Errorf("%d gaps, full cover %.1f m", len(ref.Gaps), ref.FullCover)
	}
	// Reference: GeographicLib Planimeter (geodesic area) against the GEOS
	// area in the local transverse Mercator plane; for a 1 km site the
	// scale factor differs from 1 by < 1e-8, and Planimeter prints 0.1 m².
	if math.Abs(ref.AreaPlane-ref.AreaGeodesic) > 0.5 {
		t.Errorf("plane area %.2f vs geodesic %.2f", ref.AreaPlane, ref.AreaGeodesic)
	}
}

func TestCampusCopies(t *testing.T) {
	s, a, r, title := Campus()
	s[0], a[0] = 'x', 'x'
	s2, a2, _, _ := Campus()
	if s2[0] != '{' || a2[0] != '{' || r != PlannedRange || title != Title {
		t.Error("Campus must return fresh copies")
	}
}
