// Tests of analyze --reach and suggest --reach with devices of their own
// ranges (coverage.KCoverRanges, coverage.ReachAdditionsRanges): the
// outputs in metres per group of devices, the first k-gap closing at the
// k-cover figure, equal ranges giving the common-range answer, k above the
// distinct devices (hidden ones included) refused, the additions reaching
// every spot K times, and the choice among candidate spots with own
// ranges.

package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
)

// reachDocOf reads the reach member of the summary.json in dir.
func reachDocOf(t *testing.T, dir string) *report.ReachDoc {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, report.FileSummary))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Reach *report.ReachDoc `json:"reach"`
	}
	if err := json.Unmarshal(b, &doc); err != nil || doc.Reach == nil {
		t.Fatalf("summary.json reach: %v %+v", err, doc.Reach)
	}
	return doc.Reach
}

func TestReachOwnRangesCampus(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.geojson", string(examplesites.MixedSitesGeoJSON()))
	area := writeFile(t, dir, "a.geojson", string(examplesites.AreaGeoJSON()))
	out := filepath.Join(dir, "out")
	r := runCLI(t, "analyze", "--sites", sites, "--area", area, "--reach", "3", "--out", out, "--no-maps")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	d := reachDocOf(t, out)
	if !d.OwnRanges || len(d.Levels) != 3 || len(d.RangeGroups) != 2 {
		t.Fatalf("reach: own %v, %d levels, groups %+v", d.OwnRanges, len(d.Levels), d.RangeGroups)
	}
	// The coverage-depth curves, against the gateways' range (the longest)
	// grown with every other: from 0 to every spot reached.
	if n := len(d.CurveRangesM); n != reachCurveSamples || d.CurveRangesM[0] != 0 {
		t.Fatalf("curve ranges %v", d.CurveRangesM)
	}
	for _, lv := range d.Levels {
		if lv.CoverPowerM2 == nil || len(lv.CoverRanges) != 2 {
			t.Fatalf("k = %d: power %v, ranges %+v", lv.K, lv.CoverPowerM2, lv.CoverRanges)
		}
		if c := lv.CoverageCurve; len(c) != reachCurveSamples || c[0] != 0 || math.Abs(c[len(c)-1]-1) > 1e-9 {
			t.Errorf("k = %d: curve %v", lv.K, c)
		}
		p := *lv.CoverPowerM2
		for gi, g := range lv.CoverRanges {
			r0 := d.RangeGroups[gi].RangeM
			if want := math.Sqrt(r0*r0 + p); math.Abs(g.RangeM-want) > 1e-9*want {
				t.Errorf("k = %d: %s needs %v m, want √(%v² + %v) = %v", lv.K, g.Type, g.RangeM, r0, p, want)
			}
		}
		// The gap that needs the most closes at the k-cover figure (the
		// same vertex: gap tracing and the level agree on which vertices
		// are points of a piece).
		if len(lv.Gaps) == 0 || lv.Gaps[0].ClosingPowerM2 == nil || math.Abs(*lv.Gaps[0].ClosingPowerM2-p) > 1e-9*math.Abs(p) {
			t.Errorf("k = %d: first gap %+v, k-cover power %v", lv.K, lv.Gaps, p)
		}
	}
	rep, err := os.ReadFile(filepath.Join(out, report.FileReport))
	if err != nil || !strings.Contains(string(rep), "each device at its own planned range") || !strings.Contains(string(rep), "gateway (180.00 m) → ") {
		t.Errorf("report.txt lacks the own-range reach section (%v)", err)
	}
	if !strings.Contains(r.stdout, "reached by 3+ devices") || !strings.Contains(r.stdout, "sensor (80.00 m) → ") {
		t.Errorf("stdout: %s", r.stdout)
	}
}

func TestReachOwnRangesPlanar(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	mixed := writeFile(t, dir, "mixed.csv", mixedCSV)
	out := filepath.Join(dir, "out")
	r := runCLI(t, "analyze", "--planar", "--sites", mixed, "--area", area, "--reach", "2", "--out", out, "--map-width", "600")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	// The map is drawn with own ranges, titled for them.
	if _, err := os.Stat(filepath.Join(out, report.FileMapReach)); err != nil {
		t.Errorf("map: %v", err)
	}
	// The hidden sensor s3 counts among the devices in reach.
	if d := reachDocOf(t, out); d.DistinctDevices != 4 {
		t.Errorf("%d distinct devices, want 4 (the hidden one counts)", d.DistinctDevices)
	}
	checkReachBands(t, filepath.Join(out, report.LayerFile(report.FileReach, true)), 2, 3, 310*230)
	base := []string{"analyze", "--planar", "--sites", mixed, "--area", area, "--out", filepath.Join(dir, "o"), "--no-maps"}
	checkFailure(t, runCLI(t, append(base, "--reach", "5")...), exitUsage, []string{"k = 5", "4 distinct"})
}

// TestReachEqualOwnRanges: a range column with one range everywhere gives
// the --range answer.
func TestReachEqualOwnRanges(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	own := writeFile(t, dir, "own.csv", "x,y,range\n10,10,15\n30,12,15\n22,30,15\n5,35,15\n38,38,15\n20,20,15\n")
	plain := writeFile(t, dir, "plain.csv", "x,y\n10,10\n30,12\n22,30\n5,35\n38,38\n20,20\n")
	o1, o2 := filepath.Join(dir, "o1"), filepath.Join(dir, "o2")
	if r := runCLI(t, "analyze", "--planar", "--sites", own, "--area", area, "--reach", "3", "--out", o1, "--no-maps"); r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	if r := runCLI(t, "analyze", "--planar", "--sites", plain, "--area", area, "--range", "15", "--reach", "3", "--out", o2, "--no-maps"); r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	a, b := reachDocOf(t, o1), reachDocOf(t, o2)
	for i := range b.Levels {
		if a.Levels[i].CoveredAreaM2 != b.Levels[i].CoveredAreaM2 || a.Levels[i].CoverRangeM != b.Levels[i].CoverRangeM || a.RangeM != 15 {
			t.Errorf("k = %d: own ranges %+v, --range %+v", b.Levels[i].K, a.Levels[i], b.Levels[i])
		}
	}
}

// TestSuggestReachOwnRanges: suggest --reach adds devices of --range or
// --new-type to devices of their own ranges until every spot is reached by
// K at those ranges; the figures are ranges per group of devices, the
// k-coverage after (computed anew by the report, KCoverRanges) agrees with
// the suggestion's, and the map is drawn.
func TestSuggestReachOwnRanges(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	mixed := writeFile(t, dir, "mixed.csv", mixedCSV)
	typed := writeFile(t, dir, "typed.csv", "name,x,y,type\ng1,0,0,gateway\ns1,200,0,sensor\ns2,100,120,sensor\n")
	type plan struct {
		OwnRanges  bool                   `json:"own_ranges"`
		NewType    string                 `json:"new_type"`
		RangeM     float64                `json:"range_m"`
		Reached    bool                   `json:"reached"`
		Added      []report.ReachAddedDoc `json:"added"`
		PowerAfter *float64               `json:"k_cover_power_after_m2"`
		RangeAfter *float64               `json:"k_cover_range_after_m"`
		Before     []report.RangeGroup    `json:"k_cover_ranges_before"`
		After      []report.RangeGroup    `json:"k_cover_ranges_after"`
		ShareAfter float64                `json:"covered_fraction_after"`
		Reach      *report.ReachDoc       `json:"reach_after"`
	}
	for _, c := range []struct {
		name, newType string
		args          []string
		groups        int // groups of devices after (type and planned range)
		stdout        string
	}{
		{"range", "", []string{"--sites", mixed, "--range", "60"}, 3, "gateway (150.00 m) → "},
		{"new-type", "sensor", []string{"--sites", typed, "--type-range", "gateway=150m", "--type-range", "sensor=40m", "--new-type", "sensor"}, 2, "sensor (40.00 m) → "},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, c.name)
			args := append([]string{"suggest", "--planar", "--area", area, "--reach", "2", "--out", out, "--map-width", "600"}, c.args...)
			r := runCLI(t, args...)
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			var d plan
			loadJSON(t, filepath.Join(out, report.FileSummary), &d)
			if !d.OwnRanges || d.NewType != c.newType || !d.Reached || len(d.Added) == 0 || d.RangeAfter != nil || d.PowerAfter == nil || *d.PowerAfter > 0 {
				t.Fatalf("summary: %+v", d)
			}
			if len(d.After) != c.groups || len(d.Before) != 2 || d.Reach == nil || !d.Reach.OwnRanges || len(d.Reach.RangeGroups) != c.groups {
				t.Fatalf("groups: before %+v, after %+v, reach %+v", d.Before, d.After, d.Reach)
			}
			// Every group needs at most its planned range after, more before.
			for gi, g := range d.After {
				if planned := d.Reach.RangeGroups[gi].RangeM; g.RangeM > planned*(1+1e-9) {
					t.Errorf("after: %s needs %v m, planned %v m", g.Type, g.RangeM, planned)
				}
			}
			lv := d.Reach.Levels[len(d.Reach.Levels)-1]
			if lv.K != 2 || lv.CoveredFraction != d.ShareAfter || d.ShareAfter < 1-1e-12 || len(lv.Gaps) != 0 {
				t.Errorf("reach after: level %+v, share after %v", lv, d.ShareAfter)
			}
			last := d.Added[len(d.Added)-1]
			if last.KCoverPowerM2 == nil || *last.KCoverPowerM2 != *d.PowerAfter || len(last.KCoverRanges) != c.groups {
				t.Errorf("last step %+v, power after %v", last, *d.PowerAfter)
			}
			rep, err := os.ReadFile(filepath.Join(out, report.FileReport))
			if err != nil || !strings.Contains(string(rep), "each device at its own planned range") || !strings.Contains(string(rep), "all ranges grow together") {
				t.Errorf("report.txt: %v\n%s", err, rep)
			}
			if _, err := os.Stat(filepath.Join(out, report.FileMapReach)); err != nil {
				t.Errorf("map: %v", err)
			}
			if !strings.Contains(r.stdout, "2-cover ranges") || !strings.Contains(r.stdout, c.stdout) {
				t.Errorf("stdout: %s", r.stdout)
			}
		})
	}
}

// TestSuggestReachCandidatesOwnRanges: suggest --reach --candidates with
// devices or spots of their own ranges picks what
// coverage.ChooseCandidatesReachRanges picks (a spot without a range at
// --range or of --new-type), words the figures as ranges per group of
// devices in every output, and the k-coverage after (computed anew,
// KCoverRanges) agrees with the choice's; own ranges without --range or
// --new-type for spots without one is bad usage.
func TestSuggestReachCandidatesOwnRanges(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	mixed := writeFile(t, dir, "mixed.csv", mixedCSV)
	typed := writeFile(t, dir, "typed.csv", "name,x,y,type\ng1,0,0,gateway\ns1,200,0,sensor\ns2,100,120,sensor\n")
	plain := writeFile(t, dir, "plain.csv", "x,y\n0,0\n200,0\n100,120\n")
	candsCSV := "name,x,y,range\nc1,100,60,200\nc2,200,120,\nc3,0,150,180\nc4,220,-20,160\nc5,100,-40,120\nc6,-40,60,\n"
	cands := writeFile(t, dir, "c.csv", candsCSV)
	type pick struct {
		Candidate     int                 `json:"candidate"`
		RangeM        float64             `json:"range_m"`
		KCoverPowerM2 *float64            `json:"k_cover_power_m2"`
		KCoverRanges  []report.RangeGroup `json:"k_cover_ranges"`
		RangeNull     *float64            `json:"k_cover_range_m"`
	}
	type plan struct {
		OwnRanges  bool                `json:"own_ranges"`
		NewType    string              `json:"new_type"`
		Reached    bool                `json:"reached"`
		PowerAfter *float64            `json:"k_cover_power_after_m2"`
		RangeAfter *float64            `json:"k_cover_range_after_m"`
		Before     []report.RangeGroup `json:"k_cover_ranges_before"`
		After      []report.RangeGroup `json:"k_cover_ranges_after"`
		ShareAfter float64             `json:"covered_fraction_after"`
		Candidates struct {
			Picked []pick `json:"picked"`
		} `json:"candidates"`
		Reach *report.ReachDoc `json:"reach_after"`
	}
	for _, c := range []struct {
		name, newType string
		args          []string
		defaultR      float64 // range of a spot without its own
	}{
		{"range", "", []string{"--sites", mixed, "--range", "60"}, 60},
		{"new-type", "sensor", []string{"--sites", typed, "--type-range", "gateway=150m", "--type-range", "sensor=40m", "--new-type", "sensor"}, 40},
		{"common-sites", "", []string{"--sites", plain, "--range", "90"}, 90},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, c.name)
			args := append([]string{"suggest", "--planar", "--area", area, "--reach", "2", "--candidates", cands, "--out", out, "--map-width", "600"}, c.args...)
			r := runCLI(t, args...)
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			var d plan
			loadJSON(t, filepath.Join(out, report.FileSummary), &d)
			if !d.OwnRanges || d.NewType != c.newType || d.RangeAfter != nil || d.PowerAfter == nil || len(d.After) == 0 || len(d.Before) == 0 || d.Reach == nil || !d.Reach.OwnRanges {
				t.Fatalf("summary: %+v", d)
			}
			if d.Reached != (*d.PowerAfter <= 0) || len(d.Candidates.Picked) == 0 {
				t.Fatalf("reached %v, power after %v, %d picks", d.Reached, *d.PowerAfter, len(d.Candidates.Picked))
			}
			own := []float64{200, c.defaultR, 180, 160, 120, c.defaultR}
			for j, pk := range d.Candidates.Picked {
				if pk.RangeM != own[pk.Candidate] || pk.KCoverPowerM2 == nil || pk.RangeNull != nil || len(pk.KCoverRanges) == 0 {
					t.Errorf("pick %d: %+v, own range %v", j+1, pk, own[pk.Candidate])
				}
			}
			if last := d.Candidates.Picked[len(d.Candidates.Picked)-1]; *last.KCoverPowerM2 != *d.PowerAfter {
				t.Errorf("last pick power %v, after %v", *last.KCoverPowerM2, *d.PowerAfter)
			}
			lv := d.Reach.Levels[len(d.Reach.Levels)-1]
			if lv.K != 2 || math.Abs(lv.CoveredFraction-d.ShareAfter) > 1e-12 {
				t.Errorf("reach after: level %+v, share after %v", lv, d.ShareAfter)
			}
			rep, err := os.ReadFile(filepath.Join(out, report.FileReport))
			if err != nil || !strings.Contains(string(rep), "each device at its own planned range") || !strings.Contains(string(rep), "all ranges grow together") {
				t.Errorf("report.txt: %v\n%s", err, rep)
			}
			layer, err := os.ReadFile(filepath.Join(out, report.LayerFile(report.FileCandidates, true)))
			if err != nil || !strings.Contains(string(layer), `"k_cover_ranges"`) || strings.Contains(string(layer), `"k_cover_range_m"`) {
				t.Errorf("candidates layer: %v\n%s", err, layer)
			}
			if _, err := os.Stat(filepath.Join(out, report.FileMapReach)); err != nil {
				t.Errorf("map: %v", err)
			}
			if !strings.Contains(r.stdout, "2-cover ranges") {
				t.Errorf("stdout: %s", r.stdout)
			}
		})
	}
	t.Run("equal-ranges", func(t *testing.T) {
		// Every range 90: the common-range choice and wording.
		eq := writeFile(t, dir, "eq.csv", "x,y,range\n100,60,90\n200,120,\n0,150,90\n")
		res := map[string]string{}
		for _, cf := range []string{eq, writeFile(t, dir, "eq0.csv", "x,y\n100,60\n200,120\n0,150\n")} {
			out := filepath.Join(dir, filepath.Base(cf)+".out")
			r := runCLI(t, "suggest", "--planar", "--area", area, "--reach", "2", "--candidates", cf, "--out", out, "--no-maps", "--sites", plain, "--range", "90")
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			b, err := os.ReadFile(filepath.Join(out, report.FileSummary))
			if err != nil {
				t.Fatal(err)
			}
			res[cf] = strings.ReplaceAll(string(b), filepath.Base(cf), "")
		}
		if a, b := res[eq], res[filepath.Join(dir, "eq0.csv")]; a != b || strings.Contains(a, "own_ranges") {
			t.Errorf("equal ranges:\n%s\ncommon range:\n%s", a, b)
		}
	})
	r := runCLI(t, "suggest", "--planar", "--sites", mixed, "--area", area, "--reach", "2", "--candidates", writeFile(t, dir, "bare.csv", "x,y\n50,50\n"), "--out", filepath.Join(dir, "o"), "--no-maps")
	checkFailure(t, r, exitUsage, []string{"--range", "--new-type"})
	r = runCLI(t, "suggest", "--planar", "--sites", mixed, "--area", area, "--reach", "2", "--out", filepath.Join(dir, "o"), "--no-maps")
	checkFailure(t, r, exitUsage, []string{"--range", "--new-type"})
}
