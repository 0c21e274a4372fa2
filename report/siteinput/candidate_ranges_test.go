// Tests of candidate spots with their own ranges (candidate_ranges.go):
// the range column and property, the type with a table, the default for
// spots without one, and every refusal, each naming file, line or feature
// and value.

package siteinput

import (
	"slices"
	"strings"
	"testing"
)

// loadCandidates loads two planar sites (of a type in the table when one
// is given), the square area and the candidates file cands.
func loadCandidates(cands string, in Inputs) (*Scene, error) {
	name := "cands.csv"
	if strings.HasPrefix(strings.TrimSpace(cands), "{") {
		name = "cands.geojson"
	}
	c := src(name, cands)
	in.Candidates = &c
	in.Range = 50
	if in.TypeRanges != nil {
		return loadRanges("x,y,type\n0,0,gateway\n100,100,gateway\n", in)
	}
	return loadRanges("x,y\n0,0\n100,100\n", in)
}

func TestCandidateRanges(t *testing.T) {
	table, err := ParseTypeRanges([]string{"gateway=150m", "sensor=40m"}, "--type-range")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name, cands string
		in          Inputs
		ranges      []float64
	}{
		{"none", "x,y\n10,10\n20,20\n", Inputs{}, nil},
		{"CSV range column, empty cell has none", "x,y,range\n10,10,150m\n20,20,\n30,30,0.1km\n", Inputs{}, []float64{150, 0, 100}},
		{"CSV empty range column", "x,y,range\n10,10,\n20,20,\n", Inputs{}, nil},
		{"type with a table", "x,y,type\n10,10,gateway\n20,20,\n30,30, Sensor\n", Inputs{TypeRanges: table}, []float64{150, 0, 40}},
		{"type without a table: a label", "x,y,type\n10,10,pole\n", Inputs{}, nil},
		{"GeoJSON number, string, MultiPoint shares", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"range":80},"geometry":{"type":"Point","coordinates":[10,10]}},
			{"type":"Feature","properties":{"range":"0.2km"},"geometry":{"type":"MultiPoint","coordinates":[[20,20],[30,30]]}},
			{"type":"Feature","properties":{"name":"plain"},"geometry":{"type":"Point","coordinates":[40,40]}}]}`,
			Inputs{}, []float64{80, 200, 200, 0}},
		{"GeoJSON no range property", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"type":"pole"},"geometry":{"type":"Point","coordinates":[10,10]}}]}`, Inputs{}, nil},
	} {
		t.Run(c.name, func(t *testing.T) {
			sc, err := loadCandidates(c.cands, c.in)
			if err != nil {
				t.Fatal(err)
			}
			if got := sc.Candidates.Ranges; !slices.Equal(got, c.ranges) {
				t.Errorf("ranges %v, want %v", got, c.ranges)
			}
		})
	}
}

func TestCandidateRangesRefused(t *testing.T) {
	table, err := ParseTypeRanges([]string{"gateway=150m"}, "--type-range")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name, cands string
		in          Inputs
		want        string
	}{
		{"not a length", "x,y,range,name\n10,10,150m,a\n20,20,abc,roof\n", Inputs{}, `cands.csv line 3 ("roof"): range "abc": not a number with a unit`},
		{"zero", "x,y,range\n10,10,0\n", Inputs{}, `cands.csv line 2: range "0": must be greater than 0`},
		{"negative", "x,y,range\n10,10,-5m\n", Inputs{}, `cands.csv line 2: range "-5m"`},
		{"unknown unit", "x,y,range\n10,10,5 parsecs\n", Inputs{}, `unknown unit "parsecs"`},
		{"NaN", "x,y,range\n10,10,NaN\n", Inputs{}, `cands.csv line 2: range "NaN": not a positive number`},
		{"type not in the table", "x,y,type\n10,10,gateway\n20,20,siren\n", Inputs{TypeRanges: table}, `cands.csv line 3: type "siren" has no range in --type-range`},
		{"two range sources", "x,y,range,type\n10,10,5m,gateway\n", Inputs{TypeRanges: table}, "two range sources for the candidate spots"},
		{"GeoJSON not a length", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"range":true},"geometry":{"type":"Point","coordinates":[10,10]}}]}`, Inputs{}, "cands.geojson feature 0: range true is not a length"},
		{"GeoJSON zero", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"range":0,"name":"mast"},"geometry":{"type":"Point","coordinates":[10,10]}}]}`, Inputs{}, `cands.geojson feature 0 ("mast"): range "0": must be greater than 0`},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := loadCandidates(c.cands, c.in)
			if err == nil || !strings.Contains(err.Error(), c.want) || strings.Contains(err.Error(), "\n") {
				t.Errorf("error %v, want one line with %q", err, c.want)
			}
		})
	}
}
