// Tests of suggest --reach K --candidates FILE (candidates_reach.go) and
// of the map and GeoPackage of suggest --reach.

package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report"
)

// readReachPlanDoc reads summary.json of a suggest --reach run.
func readReachPlanDoc(t *testing.T, out string) *report.ReachPlanDoc {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(out, report.FileSummary))
	if err != nil {
		t.Fatal(err)
	}
	var doc report.ReachPlanDoc
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	return &doc
}

// checkOutputs fails the test for every file of names missing from dir.
func checkOutputs(t *testing.T, dir string, names []string) {
	t.Helper()
	for _, f := range names {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
}

func TestSuggestReachCandidatesRun(t *testing.T) {
	dir := t.TempDir()
	sitesCSV := "x,y\n10,10\n30,12\n22,30\n"
	sites := writeFile(t, dir, "s.csv", sitesCSV)
	cands := writeFile(t, dir, "c.csv", "x,y,name\n5,35\n35,35,roof\n20,20\n38,5\n10,10\n2,2\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	for _, c := range []struct {
		name    string
		args    []string
		reached bool
		picks   int
	}{
		{"fewest", []string{"--range", "25"}, true, -1},
		{"two", []string{"--range", "25", "--add", "2"}, false, 2},
		{"cannot", []string{"--range", "9"}, false, -1},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, c.name)
			args := append([]string{"suggest", "--planar", "--sites", sites, "--area", area, "--candidates", cands, "--reach", "2", "--out", out, "--gpkg", "--map-width", "600"}, c.args...)
			r := runCLI(t, args...)
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			p := &report.ReachPlan{Choice: &coverage.ReachChoice{}}
			checkOutputs(t, out, report.ReachPlanOutputs(p, report.Meta{Planar: true}, report.Options{Maps: true, GeoPackage: true}))
			doc := readReachPlanDoc(t, out)
			if doc.Candidates == nil || doc.Reached != c.reached || c.picks >= 0 && len(doc.Candidates.Picked) != c.picks {
				t.Fatalf("summary: reached %v, candidates %+v", doc.Reached, doc.Candidates)
			}
			// Reference: the same exact computation through the library.
			l, err := coverage.NewLayout([]orb.Point{{10, 10}, {30, 12}, {22, 30}}, squareRegion(t, 40))
			if err != nil {
				t.Fatal(err)
			}
			rng := 25.0
			if c.name == "cannot" {
				rng = 9
			}
			ch, err := coverage.ChooseCandidatesReach(l, []orb.Point{{5, 35}, {35, 35}, {20, 20}, {38, 5}, {10, 10}, {2, 2}}, 2, rng, max(c.picks, 0))
			if err != nil {
				t.Fatal(err)
			}
			if len(ch.Picks) != len(doc.Candidates.Picked) || ch.ShareAfter != doc.CoveredFractionAfter || ch.Exhausted != doc.Candidates.Exhausted {
				t.Errorf("CLI %+v, library %d picks, share %v", doc.Candidates, len(ch.Picks), ch.ShareAfter)
			}
			for j, pk := range doc.Candidates.Picked {
				if pk.Candidate == 4 {
					t.Errorf("pick %d: candidate 5 stands on a device", j+1)
				}
			}
			if lv := doc.Reach.Levels[len(doc.Reach.Levels)-1]; lv.CoveredFraction != doc.CoveredFractionAfter {
				t.Errorf("reach after %v, choice %v", lv.CoveredFraction, doc.CoveredFractionAfter)
			}
			if c.name == "cannot" && (!doc.Candidates.Exhausted || !strings.Contains(r.stdout, "CANNOT REACH")) {
				t.Errorf("stdout %q, exhausted %v", r.stdout, doc.Candidates.Exhausted)
			}
		})
	}
}

// squareRegion is the site area [0, a]².
func squareRegion(t *testing.T, a float64) *planar.Region {
	t.Helper()
	reg, _, err := planar.SiteArea(orb.MultiPolygon{{{{0, 0}, {a, 0}, {a, a}, {0, a}, {0, 0}}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	return reg
}

func TestSuggestReachMapAndGeoPackage(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n22,30\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	out := filepath.Join(dir, "out")
	r := runCLI(t, "suggest", "--planar", "--sites", sites, "--area", area, "--range", "18", "--reach", "2", "--out", out, "--gpkg", "--map-width", "600")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	p := &report.ReachPlan{}
	checkOutputs(t, out, report.ReachPlanOutputs(p, report.Meta{Planar: true}, report.Options{Maps: true, GeoPackage: true}))
}

func TestSuggestReachCandidatesBadUsage(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n")
	cands := writeFile(t, dir, "c.csv", "x,y\n5,5\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	base := []string{"suggest", "--planar", "--sites", sites, "--area", area, "--candidates", cands, "--out", filepath.Join(dir, "o"), "--no-maps"}
	for _, c := range []failureCase{
		{"no-range", append(base, "--reach", "2"), exitUsage, []string{"--reach", "--range"}},
		{"add-zero", append(base, "--reach", "2", "--range", "10", "--add", "0"), exitInput, []string{"--add 0"}},
		{"new-type", append(base, "--reach", "2", "--range", "10", "--new-type", "gateway"), exitUsage, []string{"--new-type"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			checkFailure(t, runCLI(t, c.args...), c.code, c.want)
		})
	}
}
