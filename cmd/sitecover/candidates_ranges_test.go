// Tests of suggest --candidates with spots of their own ranges (a range
// or type column in the candidates file; plan.go candidateRanges).

package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
)

func TestSuggestCandidatesOwnRanges(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n22,30\n")
	cands := writeFile(t, dir, "c.csv", "x,y,range,name\n5,35,12,mast\n35,35,,roof\n20,20,4m\n38,5,0.02km\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	out := filepath.Join(dir, "out")
	r := runCLI(t, "suggest", "--planar", "--sites", sites, "--area", area, "--candidates", cands, "--range", "9", "--out", out, "--no-maps")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, report.FileSummary))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Candidates *report.CandidatesDoc `json:"candidates"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	c := doc.Candidates
	if c == nil || !c.OwnRanges || c.NewRangeM != 9 || c.FullCoverRangeForM != 20 {
		t.Fatalf("candidates: %+v", c)
	}
	// Reference: the library's choice with each spot's range (its own, or
	// --range for the roof), the devices at --range.
	own := []float64{12, 9, 4, 20}
	l, err := coverage.NewLayoutRanges([]orb.Point{{10, 10}, {30, 12}, {22, 30}}, []float64{9, 9, 9}, squareRegion(t, 40))
	if err != nil {
		t.Fatal(err)
	}
	ch, err := coverage.ChooseCandidatesEach(l, []orb.Point{{5, 35}, {35, 35}, {20, 20}, {38, 5}}, own, 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Picked) != len(ch.Picked) || c.CoveredAfterM2 != ch.CoveredAfter {
		t.Fatalf("CLI %d picks, covered %v; library %v, %v", len(c.Picked), c.CoveredAfterM2, ch.Picked, ch.CoveredAfter)
	}
	for j, pk := range c.Picked {
		if pk.Candidate != ch.Picked[j] || pk.RangeM != own[pk.Candidate] || pk.GainM2 != ch.Gains[j] {
			t.Errorf("pick %d: %+v, library candidate %d gain %v range %v", j+1, pk, ch.Picked[j], ch.Gains[j], own[pk.Candidate])
		}
	}
}

func TestSuggestCandidatesOwnRangesRefused(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "x,y\n10,10\n30,12\n22,30\n")
	bad := writeFile(t, dir, "bad.csv", "x,y,range\n5,35,12\n35,35,-3\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 40))
	base := []string{"suggest", "--planar", "--sites", sites, "--area", area, "--out", filepath.Join(dir, "o"), "--no-maps", "--range", "9"}
	for _, c := range []failureCase{
		{"bad-range", append(base, "--candidates", bad), exitInput, []string{`bad.csv line 3: range "-3": must be greater than 0`}},
	} {
		t.Run(c.name, func(t *testing.T) {
			checkFailure(t, runCLI(t, c.args...), c.code, c.want)
		})
	}
}
