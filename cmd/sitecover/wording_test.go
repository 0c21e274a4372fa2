// The wording rules of every text output (stdout, report.txt, summary.json,
// CSV tables), checked on the demo (exclusion zones, ten gaps) and on a
// square with one site and no exclusion zone (one gap): gaps and holes
// are never called "enclosed", both are defined once in report.txt;
// square metres are m²; a count of one is singular.

package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// textOutputs returns stdout and every text file under dir (report.txt,
// summary.json, CSV tables, recursively), keyed by path.
func textOutputs(t *testing.T, dir, stdout string) map[string]string {
	t.Helper()
	texts := map[string]string{"stdout": stdout}
	err := filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		switch filepath.Ext(p) {
		case ".txt", ".json", ".csv":
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			texts[p] = string(b)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return texts
}

// wordingScenes runs the demo and the one-site square (no exclusion zone)
// and returns their output folders with stdout.
func wordingScenes(t *testing.T) map[string]map[string]string {
	t.Helper()
	dir := t.TempDir()
	demo := filepath.Join(dir, "demo")
	r := mustRun(t, "demo", "--out", demo)
	scenes := map[string]map[string]string{"demo": textOutputs(t, demo, r.stdout)}

	sites := writeFile(t, dir, "site.csv", "name,x,y\ncentre,50,50\n")
	area := writeFile(t, dir, "square.geojson", squareGeoJSON(0, 0, 100))
	sq := filepath.Join(dir, "square")
	r = mustRun(t, "gaps", "--planar", "--sites", sites, "--area", area, "--range", "40m", "--out", sq)
	scenes["square"] = textOutputs(t, sq, r.stdout)
	return scenes
}

// hemisphere is the one text form of a geographic point.
var hemisphere = regexp.MustCompile(`\d+\.\d{7}°[NS] +\d+\.\d{7}°[EW]`)

// wordingRule is a pattern no text output may contain, and why.
type wordingRule struct {
	name string
	bad  *regexp.Regexp
	// prose restricts the rule to stdout and report.txt (summary.json and
	// the CSV tables hold numbers).
	prose bool
}

var wordingRules = []wordingRule{
	// Gaps are "edge" or "inner"; holes are "open"; "enclosed" meant both.
	{"no-enclosed", regexp.MustCompile(`(?i)enclosed`), false},
	// Square metres are written m² (JSON keys such as area_m2 excepted).
	{"no-m2", regexp.MustCompile(`(^|[^_A-Za-z0-9])k?m2\b`), false},
	// A count of one takes the singular; no "(s)" hedges.
	{"no-1-plurals", regexp.MustCompile(`(^|[^0-9.,])1 (gaps|holes|sites|items|devices|files|polygons|exclusion zones|points|pieces|spots|candidates)\b`), false},
	{"no-(s)", regexp.MustCompile(`[a-z]\(s\)`), false},
	// A device is named by its label alone, never an index beside it
	// ("#10 Q11 ..."); a candidate by its name ("C01", not "c0 C01").
	{"no-index-and-label", regexp.MustCompile(`#\d+ [A-Z]`), false},
	{"no-candidate-index", regexp.MustCompile(`\bc\d+ C\d`), false},
	// One coordinate form in text: 44.3807215°N 99.8651782°W, never signed
	// decimal degrees or "lat ..., lon ...".
	{"one-coordinate-form", regexp.MustCompile(`\blat -?\d|Lat deg|-\d{1,3}\.\d{5,}`), true},
}

func TestWordingRules(t *testing.T) {
	for scene, texts := range wordingScenes(t) {
		t.Run(scene, func(t *testing.T) {
			for _, rule := range wordingRules {
				t.Run(rule.name, func(t *testing.T) {
					for path, txt := range texts {
						if rule.prose && path != "stdout" && filepath.Base(path) != "report.txt" {
							continue
						}
						if m := rule.bad.FindString(txt); m != "" {
							i := strings.Index(txt, m)
							t.Errorf("%s: %q in %q", path, m, txt[max(0, i-60):min(len(txt), i+60)])
						}
					}
				})
			}
			for path, txt := range texts {
				if filepath.Base(path) != "report.txt" {
					continue
				}
				if scene == "demo" && !hemisphere.MatchString(txt) {
					t.Errorf("%s: no point written as 44.3807215°N 99.8651782°W", path)
				}
				if strings.Count(txt, "\nTERMS\n") != 1 || !strings.Contains(txt, "\n  Gap   ") || !strings.Contains(txt, "\n  Hole  ") {
					t.Errorf("%s: gaps and holes are not defined once in a TERMS section", path)
				}
			}
		})
	}
}

func TestNearlyFullCoverNeverReads100(t *testing.T) {
	// One site at the centre of a 100 m square at 70.70 m, 1.07 cm short of
	// the corners (a/√2 = 70.7107 m): about 1e-4 m² stays uncovered
	// (elementary geometry), so no output may say 100.00 % (issue 11).
	dir := t.TempDir()
	sites := writeFile(t, dir, "site.csv", "name,x,y\ncentre,50,50\n")
	area := writeFile(t, dir, "square.geojson", squareGeoJSON(0, 0, 100))
	out := filepath.Join(dir, "r")
	r := mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "70.70m", "--out", out, "--no-maps")
	if s := readSummary(t, out); !(s.UncoveredAreaM2 > 0) {
		t.Fatalf("uncovered %g m², want > 0", s.UncoveredAreaM2)
	}
	for path, txt := range textOutputs(t, out, r.stdout) {
		if path != "stdout" && filepath.Base(path) != "report.txt" {
			continue
		}
		if strings.Contains(txt, "100.00 %") || strings.Contains(txt, "100.000 %") || !strings.Contains(txt, "> 99.99") {
			t.Errorf("%s rounds the covered share up to 100 %%:\n%s", path, txt[:min(len(txt), 1200)])
		}
		if strings.Contains(txt, " 0.0 m²") || !strings.Contains(txt, "< 0.1 m²") {
			t.Errorf("%s rounds the uncovered area down to 0:\n%s", path, txt[:min(len(txt), 1200)])
		}
	}
}
