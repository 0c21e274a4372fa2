// Tests of analyze --reach (reach.go): the outputs of a good run, agreement
// with coverage.KCover and with the failures command's survive range, and
// the usage errors.

package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/geojson"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report"
)

func TestReachRun(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n22,30\n5,35\n38,38\n20,20\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	out := filepath.Join(dir, "out")
	r := runCLI(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "15", "--reach", "3,2", "--out", out, "--no-maps")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	for _, f := range []string{report.LayerFile(report.FileReach, true), report.LayerFile(report.FileReachGaps, true)} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	checkReachBands(t, filepath.Join(out, report.LayerFile(report.FileReach, true)), 3, 4, 40*40)
	b, err := os.ReadFile(filepath.Join(out, report.FileSummary))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		CoveredFraction float64          `json:"covered_fraction"`
		FullCoverRangeM float64          `json:"full_cover_range_m"`
		Reach           *report.ReachDoc `json:"reach"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Reach == nil || len(doc.Reach.Levels) != 3 {
		t.Fatalf("summary.json reach: %+v", doc.Reach)
	}
	// Reference: the ordinary analysis for k = 1 (the same figures).
	if l := doc.Reach.Levels[0]; l.CoveredFraction != doc.CoveredFraction || l.CoverRangeM != doc.FullCoverRangeM {
		t.Errorf("k = 1: %v %v, analysis %v %v", l.CoveredFraction, l.CoverRangeM, doc.CoveredFraction, doc.FullCoverRangeM)
	}
	// Reference: the failures command's survive range is the 2-cover range.
	fout := filepath.Join(dir, "fail")
	r = runCLI(t, "failures", "--planar", "--sites", sites, "--area", area, "--range", "15", "--out", fout, "--no-maps", "--json")
	if r.code != 0 {
		t.Fatalf("failures exit %d: %s", r.code, r.stderr)
	}
	var fd struct {
		Survive *float64 `json:"survive_any_single_failure_m"`
	}
	if err := json.Unmarshal([]byte(r.stdout), &fd); err != nil || fd.Survive == nil {
		t.Fatalf("failures summary: %v %s", err, r.stdout)
	}
	if *fd.Survive != doc.Reach.Levels[1].CoverRangeM {
		t.Errorf("failures survive range %v, 2-cover range %v", *fd.Survive, doc.Reach.Levels[1].CoverRangeM)
	}
	rep, err := os.ReadFile(filepath.Join(out, report.FileReport))
	if err != nil || !strings.Contains(string(rep), "REACHED BY k DEVICES") {
		t.Errorf("report.txt lacks the reach section (%v)", err)
	}
}

func TestReachBadUsage(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n22,30\n22,30\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	base := []string{"analyze", "--planar", "--sites", sites, "--area", area, "--range", "15", "--out", filepath.Join(dir, "o"), "--no-maps"}
	for _, c := range []failureCase{
		{"zero", append(base, "--reach", "0"), exitUsage, []string{"--reach", "at least 1"}},
		{"negative", append(base, "--reach", "2,-1"), exitUsage, []string{"at least 1"}},
		{"not-integer", append(base, "--reach", "2.5"), exitUsage, []string{"not a whole number"}},
		{"word", append(base, "--reach", "two"), exitUsage, []string{"not a whole number"}},
		{"above-distinct", append(base, "--reach", "4"), exitUsage, []string{"k = 4", "3 distinct"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			checkFailure(t, runCLI(t, c.args...), c.code, c.want)
		})
	}
}

// reachBandAreaRel is the tolerance of the band areas' sum against the site
// area: coverage.KBandAreaRel for the outlines (overlay rounding), and the
// exact areas are sums of closed forms (relative rounding far below it).
const reachBandAreaRel = 1e-9

// checkReachBands checks the reach layer (planar coordinates): one feature
// per non-empty band of 0 … K−1 and "K+" (bands of them), in order, whose
// outline areas and exact areas each sum to the site area.
func checkReachBands(t *testing.T, path string, K, bands int, site float64) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	fc, err := geojson.UnmarshalFeatureCollection(b)
	if err != nil {
		t.Fatal(err)
	}
	poly, exact := 0.0, 0.0
	last := -1
	for i, f := range fc.Features {
		n, _ := f.Properties["devices_in_reach"].(float64)
		want := strconv.Itoa(int(n))
		if int(n) == K {
			want += "+"
		}
		if f.Properties["band"] != want || int(n) <= last || int(n) > K {
			t.Errorf("feature %d: band %v, devices_in_reach %v", i, f.Properties["band"], f.Properties["devices_in_reach"])
		}
		last = int(n)
		exact += f.Properties["area_m2"].(float64)
		mp, ok := f.Geometry.(orb.MultiPolygon)
		if !ok {
			t.Fatalf("feature %d: geometry %T", i, f.Geometry)
		}
		for _, pg := range mp {
			for _, r := range pg {
				poly += planar.RingArea(planar.FlatRing(r))
			}
		}
	}
	if len(fc.Features) != bands {
		t.Errorf("%d bands, want %d", len(fc.Features), bands)
	}
	// The bands tile the site: outline areas (within the overlay's
	// rounding) and exact areas each sum to the site area.
	if math.Abs(poly-site) > reachBandAreaRel*site || math.Abs(exact-site) > reachBandAreaRel*site {
		t.Errorf("band areas: outlines %.12g, exact %.12g, site %v", poly, exact, site)
	}
}

func TestSuggestReachRun(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n22,30\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	out := filepath.Join(dir, "out")
	r := runCLI(t, "suggest", "--planar", "--sites", sites, "--area", area, "--range", "18", "--reach", "2", "--out", out, "--no-maps")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	for _, f := range report.ReachPlanFiles(report.Meta{Planar: true}) {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	b, err := os.ReadFile(filepath.Join(out, report.FileSummary))
	if err != nil {
		t.Fatal(err)
	}
	var doc report.ReachPlanDoc
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if !doc.Reached || doc.KCoverRangeAfterM == nil || *doc.KCoverRangeAfterM > 18 || len(doc.Added) == 0 {
		t.Fatalf("summary: reached %v, after %v, %d added", doc.Reached, doc.KCoverRangeAfterM, len(doc.Added))
	}
	// Reference: the analysis of the layout with the additions agrees
	// (the same exact computation).
	if lv := doc.Reach.Levels[len(doc.Reach.Levels)-1]; lv.K != 2 || lv.CoverRangeM != *doc.KCoverRangeAfterM || lv.CoveredFraction != 1 {
		t.Errorf("reach after: %+v, k-cover %v", lv, *doc.KCoverRangeAfterM)
	}
	checkReachBands(t, filepath.Join(out, report.LayerFile(report.FileReach, true)), 2, 1, 40*40)
}

func TestSuggestReachBadUsage(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	base := []string{"suggest", "--planar", "--sites", sites, "--area", area, "--out", filepath.Join(dir, "o"), "--no-maps"}
	for _, c := range []failureCase{
		{"zero", append(base, "--range", "15", "--reach", "0"), exitUsage, []string{"--reach", "at least 1"}},
		{"word", append(base, "--range", "15", "--reach", "two"), exitUsage, []string{"not a whole number"}},
		{"no-range", append(base, "--reach", "2"), exitUsage, []string{"--reach needs --range"}},
		{"with-add", append(base, "--range", "15", "--reach", "2", "--add", "3"), exitUsage, []string{"--add"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			checkFailure(t, runCLI(t, c.args...), c.code, c.want)
		})
	}
}
