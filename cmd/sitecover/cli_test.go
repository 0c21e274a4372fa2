// Test harness: run the command in-process with captured output, write
// input files, and read summary.json into a struct keyed by the field
// names issue 4 fixes (so a renamed field fails here).

package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

type result struct {
	stdout, stderr string
	code           int
}

// runCLI runs sitecover with args in-process.
func runCLI(t *testing.T, args ...string) result {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, &out, &errb)
	return result{out.String(), errb.String(), code}
}

// mustRun runs sitecover and fails the test unless it exits 0.
func mustRun(t *testing.T, args ...string) result {
	t.Helper()
	r := runCLI(t, args...)
	if r.code != 0 {
		t.Fatalf("sitecover %s: exit %d\nstderr: %s", strings.Join(args, " "), r.code, r.stderr)
	}
	return r
}

// writeFile writes content to dir/name and returns the path.
func writeFile(t *testing.T, dir, name, content string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

type point [2]float64

// summaryJSON mirrors the summary.json fields of issue 4.
type summaryJSON struct {
	Sites               int          `json:"sites"`
	AreaM2              float64      `json:"area_m2"`
	RangeM              float64      `json:"range_m"`
	FullCoverRangeM     float64      `json:"full_cover_range_m"`
	FullCoverWorstPoint point        `json:"full_cover_worst_point"`
	CoveredFraction     float64      `json:"covered_fraction"`
	UncoveredAreaM2     float64      `json:"uncovered_area_m2"`
	Gaps                []summaryGap `json:"gaps"`
	Holes               []struct {
		BirthM     float64 `json:"birth_m"`
		DeathM     float64 `json:"death_m"`
		DeathPoint point   `json:"death_point"`
	} `json:"holes"`
	RangePercentiles struct {
		P50 float64 `json:"p50"`
		P90 float64 `json:"p90"`
		P95 float64 `json:"p95"`
		P99 float64 `json:"p99"`
	} `json:"range_percentiles"`
	LinkRangeM float64 `json:"link_range_m"`
	Cells      []struct {
		Site          int     `json:"site"`
		Name          string  `json:"name"`
		AreaM2        float64 `json:"area_m2"`
		FarthestM     float64 `json:"farthest_m"`
		FarthestPoint point   `json:"farthest_point"`
	} `json:"cells"`
	Projection string             `json:"projection"`
	Warnings   []string           `json:"warnings"`
	Timings    map[string]float64 `json:"timings"`
}

// summaryGap is one entry of summary.json's gaps.
type summaryGap struct {
	ID              int     `json:"id"`
	AreaM2          float64 `json:"area_m2"`
	ClosingRangeM   float64 `json:"closing_range_m"`
	DeepestPoint    point   `json:"deepest_point"`
	TouchesBoundary bool    `json:"touches_boundary"`
	Sites           []int   `json:"sites"`
}

// issueFields are the summary.json keys issue 4 requires.
var issueFields = []string{"sites", "area_m2", "range_m", "full_cover_range_m", "full_cover_worst_point",
	"covered_fraction", "uncovered_area_m2", "gaps", "holes", "range_percentiles", "link_range_m",
	"cells", "projection", "warnings", "timings"}

// readSummary reads dir/summary.json, checking the issue's keys exist.
func readSummary(t *testing.T, dir string) *summaryJSON {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	return parseSummary(t, b)
}

func parseSummary(t *testing.T, b []byte) *summaryJSON {
	t.Helper()
	var keys map[string]json.RawMessage
	if err := json.Unmarshal(b, &keys); err != nil {
		t.Fatalf("summary.json: %v", err)
	}
	for _, k := range issueFields {
		if _, ok := keys[k]; !ok {
			t.Errorf("summary.json lacks %q", k)
		}
	}
	var s summaryJSON
	if err := json.Unmarshal(b, &s); err != nil {
		t.Fatalf("summary.json: %v", err)
	}
	return &s
}

// near reports |got − want| ≤ tol.
func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

// checkNear fails the test when |got − want| > tol.
func checkNear(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !near(got, want, tol) {
		t.Errorf("%s = %.12g, want %.12g (±%g)", what, got, want, tol)
	}
}

// squareGeoJSON is an axis-parallel square area with lower-left corner
// (x0, y0) and side a, as a counter-clockwise closed ring.
func squareGeoJSON(x0, y0, a float64) string {
	b, _ := json.Marshal(map[string]any{
		"type": "FeatureCollection",
		"features": []any{map[string]any{
			"type": "Feature", "properties": map[string]any{"name": "square"},
			"geometry": map[string]any{"type": "Polygon", "coordinates": [][][2]float64{{
				{x0, y0}, {x0 + a, y0}, {x0 + a, y0 + a}, {x0, y0 + a}, {x0, y0}}}},
		}},
	})
	return string(b)
}
