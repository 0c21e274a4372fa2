// Every bad-input and bad-usage case of issue 4: one line on stderr that
// names the file, the feature/ring/vertex or CSV line, and the problem;
// exit code 1 for bad input, 2 for bad usage; never a stack trace.

package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestBadInput(t *testing.T) {
	dir := t.TempDir()
	w := func(name, content string) string { return writeFile(t, dir, name, content) }
	goodCSV := w("good.csv", "lat,lon\n44.0,-99.0\n44.001,-99.001\n44.0,-99.002\n")
	goodArea := w("good.geojson", `{"type":"Polygon","coordinates":[[[-99.01,43.99],[-98.99,43.99],[-98.99,44.01],[-99.01,44.01],[-99.01,43.99]]]}`)
	planarSites := w("p.csv", "x,y\n10,10\n20,20\n30,10\n")
	planarArea := w("p.geojson", squareGeoJSON(0, 0, 40))

	// sites.csv with 13 good lines, then latitude 95.2 on line 14.
	var lines strings.Builder
	lines.WriteString("name,lat,lon\n")
	for i := 2; i <= 13; i++ {
		fmt.Fprintf(&lines, "s%d,44.%03d,-99.0\n", i, i)
	}
	lines.WriteString("s14,95.2,-99.0\n")
	lat95 := w("sites.csv", lines.String())

	nanCSV := w("nan.csv", "lat,lon\n44,-99\n44.1,NaN\n")
	infCSV := w("inf.csv", "x,y\n1,2\n3,inf\n")
	textCSV := w("word.csv", "lat,lon\n44,-99\n44.1,east\n")
	emptyField := w("emptyfield.csv", "lat,lon\n44,-99\n,-99\n")
	shortRow := w("short.csv", "name,lat,lon\na,44\n")
	quoteCSV := w("quote.csv", "lat,lon\n\"44,-99\n")
	headerOnly := w("header.csv", "lat,lon\n")
	noCols := w("nocols.csv", "alpha,beta\n1,2\n")
	xyOnly := w("xy.csv", "x,y\n1,2\n")
	dupCols := w("dup.csv", "lat,latitude,lon\n1,2,3\n")
	notData := w("notes.txt", "These are my notes about the site.\nNothing tabular here.\n")
	binary := w("photo.dat", "\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR")
	empty := w("empty.geojson", "  \n")
	badJSON := w("bad.geojson", "{\"type\": \"FeatureCollection\",\n \"features\": [\n  {\"type\": \"Feature\" \"geometry\": null}\n ]}\n")
	nanJSON := w("nan.geojson", "{\"type\":\"Point\",\n\"coordinates\":[NaN, 44]}")
	hugeJSON := w("huge.geojson", "{\"type\":\"Point\",\n\n\"coordinates\":[1e999, 44]}")
	notGeo := w("other.json", `{"hello": "world"}`)
	lineSites := w("line.geojson", `{"type":"FeatureCollection","features":[
		{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[-99,44]}},
		{"type":"Feature","properties":{},"geometry":{"type":"LineString","coordinates":[[-99,44],[-99.1,44]]}}]}`)
	nullGeom := w("nullgeom.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":null}]}`)
	emptyFC := w("emptyfc.geojson", `{"type":"FeatureCollection","features":[]}`)
	lonOut := w("lon.geojson", `{"type":"FeatureCollection","features":[
		{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[-99,44]}},
		{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[-99,44.1]}},
		{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[200.5,44]}}]}`)
	metresAsDegrees := w("metres.csv", "lat,lon\n5200345,413000\n")
	oneNumber := w("onenum.geojson", `{"type":"Point","coordinates":[44]}`)
	pointArea := w("pointarea.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[-99,44]}}]}`)
	emptyArea := w("emptyarea.geojson", `{"type":"FeatureCollection","features":[]}`)
	csvArea := w("area.csv", "lat,lon\n1,2\n")
	latArea := w("latarea.geojson", `{"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[[[-99,44],[-98,44],[-98,91],[-99,44]]]}}`)
	twoVertex := w("twovertex.geojson", `{"type":"Polygon","coordinates":[[[-99,44],[-98,44],[-99,44]]]}`)
	badExclude := w("badexcl.geojson", `{"type":"Feature","properties":{"exclude":"yes"},"geometry":{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]]}}`)
	allExcluded := w("allexcl.geojson", `{"type":"Feature","properties":{"exclude":true},"geometry":{"type":"Polygon","coordinates":[[[0,0],[40,0],[40,40],[0,0]]]}}`)
	selfCross := w("bowtie.geojson", `{"type":"Polygon","coordinates":[[[0,0],[40,40],[40,0],[0,40],[0,0]]]}`)
	// 10° × 10° of the Earth: far beyond a 0.1 % scale error.
	wide := w("wide.csv", "lat,lon\n40,-105\n50,-95\n45,-100\n")
	collinear := w("fence.csv", "x,y\n0,0\n10,10\n20,20\n")
	fileAsDir := w("plainfile", "x")

	an := func(extra ...string) []string {
		return append([]string{"analyze", "--range", "100m", "--out", filepath.Join(dir, "out")}, extra...)
	}
	cases := []failureCase{
		{"missing sites file", an("--sites", filepath.Join(dir, "nope.csv")), 1, []string{"nope.csv: no such file", "--sites"}},
		{"missing area file", an("--sites", goodCSV, "--area", filepath.Join(dir, "nope.geojson")), 1, []string{"nope.geojson: no such file", "--area"}},
		{"missing exclude file", an("--sites", goodCSV, "--area", goodArea, "--exclude", filepath.Join(dir, "x.geojson")), 1, []string{"x.geojson: no such file", "--exclude"}},
		{"folder as sites", an("--sites", dir), 1, []string{"is a folder, not a file"}},
		{"empty file", an("--sites", empty), 1, []string{"empty.geojson: file is empty"}},
		{"not JSON or CSV (text)", an("--sites", notData), 1, []string{"notes.txt: not GeoJSON or CSV", "no lat/lon or x/y column"}},
		{"not JSON or CSV (binary)", an("--sites", binary), 1, []string{"photo.dat: not GeoJSON or CSV (binary data)"}},
		{"JSON syntax error", an("--sites", badJSON), 1, []string{"bad.geojson line 3: not valid JSON"}},
		{"NaN in GeoJSON", an("--sites", nanJSON), 1, []string{"nan.geojson line 2: not valid JSON"}},
		{"1e999 in GeoJSON", an("--sites", hugeJSON), 1, []string{"huge.geojson feature 0: Point coordinates: coordinate 1e999 is not a finite float64 number"}},
		{"JSON but not GeoJSON", an("--sites", notGeo), 1, []string{"other.json: not GeoJSON", "no \"type\""}},
		{"wrong geometry for sites", an("--sites", lineSites), 1, []string{"line.geojson feature 1: geometry type LineString, expected Point or MultiPoint"}},
		{"null geometry", an("--sites", nullGeom), 1, []string{"nullgeom.geojson feature 0: no geometry"}},
		{"empty FeatureCollection", an("--sites", emptyFC), 1, []string{"emptyfc.geojson: no sites"}},
		{"CSV header only", an("--sites", headerOnly), 1, []string{"header.csv: no sites", "no data lines"}},
		{"position with one number", an("--sites", oneNumber), 1, []string{"onenum.geojson feature 0: a position needs 2 numbers, got 1"}},
		{"latitude out of range", an("--sites", lat95), 1, []string{"sites.csv line 14: latitude 95.2 is outside -90..90"}},
		{"longitude out of range", an("--sites", lonOut), 1, []string{"lon.geojson feature 2: longitude 200.5 is outside -180..180"}},
		{"metres given as degrees", an("--sites", metresAsDegrees), 1, []string{"metres.csv line 2: longitude 413000 is outside -180..180", "--planar"}},
		{"NaN in CSV", an("--sites", nanCSV), 1, []string{"nan.csv line 3: longitude is NaN"}},
		{"Inf in planar CSV", an("--planar", "--sites", infCSV, "--area", planarArea), 1, []string{"inf.csv line 3: y is infinite"}},
		{"word in CSV", an("--sites", textCSV), 1, []string{`word.csv line 3: longitude "east" is not a number`}},
		{"empty CSV field", an("--sites", emptyField), 1, []string{"emptyfield.csv line 3: latitude is empty"}},
		{"short CSV row", an("--sites", shortRow), 1, []string{"short.csv line 2: 2 fields, the header has 3"}},
		{"bad CSV quoting", an("--sites", quoteCSV), 1, []string{"quote.csv line 2: not valid CSV"}},
		{"CSV without coordinate columns", an("--sites", noCols), 1, []string{"nocols.csv: not GeoJSON or CSV", `"alpha", "beta"`}},
		{"x/y without --planar", an("--sites", xyOnly), 1, []string{"xy.csv line 1: needs lat and lon columns", "add --planar"}},
		{"lat/lon with --planar", an("--planar", "--sites", goodCSV), 1, []string{"good.csv line 1: --planar needs x and y columns", "drop --planar"}},
		{"duplicate CSV columns", an("--sites", dupCols), 1, []string{"dup.csv line 1: columns 1 (\"lat\") and 2 (\"latitude\") are both lat"}},
		{"point as area", an("--sites", goodCSV, "--area", pointArea), 1, []string{"pointarea.geojson feature 0: geometry type Point, expected Polygon or MultiPolygon"}},
		{"empty area collection", an("--sites", goodCSV, "--area", emptyArea), 1, []string{"emptyarea.geojson: no Polygon or MultiPolygon features"}},
		{"CSV as area", an("--sites", goodCSV, "--area", csvArea), 1, []string{"area.csv: an area must be GeoJSON"}},
		{"area vertex out of range", an("--sites", goodCSV, "--area", latArea), 1, []string{"latarea.geojson feature 0 ring 0 vertex 2: latitude 91 is outside -90..90"}},
		{"ring with two vertices", an("--sites", goodCSV, "--area", twoVertex), 1, []string{"twovertex.geojson feature 0 ring 0: 2 distinct vertices"}},
		{"exclude not boolean", an("--planar", "--sites", planarSites, "--area", badExclude), 1, []string{"badexcl.geojson feature 0: property \"exclude\" must be true or false, got \"yes\""}},
		{"everything excluded", an("--planar", "--sites", planarSites, "--area", allExcluded), 1, []string{"allexcl.geojson feature 0: every polygon is an exclusion zone"}},
		{"self-crossing ring", an("--planar", "--sites", planarSites, "--area", selfCross), 1, []string{"bowtie.geojson feature 0", "cross"}},
		{"area too large for one plane", an("--sites", wide), 1, []string{"wide.csv: area too large for one local plane: scale error", "km ×", "split the site"}},
		{"collinear sites, no area", an("--planar", "--sites", collinear), 1, []string{"fence.csv: the sites are all on one line", "--area"}},
		{"range zero", []string{"analyze", "--sites", goodCSV, "--range", "0"}, 1, []string{`--range "0": must be greater than 0`}},
		{"range negative", []string{"analyze", "--sites", goodCSV, "--range", "-5m"}, 1, []string{`--range "-5m": must be greater than 0`}},
		{"range unparseable", []string{"gaps", "--sites", goodCSV, "--range", "far"}, 1, []string{`--range "far": not a number`}},
		{"range unknown unit", []string{"analyze", "--sites", goodCSV, "--range", "5yd"}, 1, []string{`unknown unit "yd"`}},
		{"demo range invalid", []string{"demo", "--range", "-1km", "--out", filepath.Join(dir, "d")}, 1, []string{`--range "-1km": must be greater than 0`}},
		{"out is a file", []string{"analyze", "--range", "100m", "--planar", "--sites", planarSites, "--area", planarArea, "--out", fileAsDir}, 1, []string{"plainfile", "not a folder"}},
		{"out under a file", []string{"analyze", "--range", "100m", "--planar", "--sites", planarSites, "--area", planarArea, "--out", filepath.Join(fileAsDir, "sub")}, 1, []string{"plainfile/sub", "cannot create"}},

		// Bad usage: exit 2.
		{"unknown flag", []string{"analyze", "--sites", goodCSV, "--range", "1m", "--colour"}, 2, []string{"unknown flag: --colour", "sitecover analyze --help"}},
		{"missing --sites", []string{"analyze", "--range", "100m"}, 2, []string{"required flag --sites is missing"}},
		{"missing --range", []string{"gaps", "--sites", goodCSV}, 2, []string{"required flag --range is missing"}},
		{"cells missing --sites", []string{"cells"}, 2, []string{"required flag --sites is missing"}},
		{"extra argument", []string{"analyze", "--sites", goodCSV, "--range", "1m", "extra.csv"}, 2, []string{`unexpected argument "extra.csv"`}},
		{"demo extra argument", []string{"demo", "now"}, 2, []string{`unexpected argument "now"`}},
		{"unknown command", []string{"analyse-everything"}, 2, []string{`unknown command "analyse-everything"`}},
		{"misspelt command", []string{"analyse", "--sites", goodCSV}, 2, []string{`unknown command "analyse"`, "did you mean analyze?"}},
		{"flag without value", []string{"analyze", "--sites"}, 2, []string{"flag needs an argument: --sites"}},
		{"bad int flag", []string{"analyze", "--sites", goodCSV, "--range", "1m", "--map-width", "wide"}, 2, []string{"--map-width"}},
		{"exclude without area", an("--sites", goodCSV, "--exclude", goodArea), 2, []string{"--exclude needs --area"}},
		{"range given twice", []string{"analyze", "--sites", goodCSV, "--range", "150m", "--range", "40m"}, 2, []string{"--range", `given twice ("150m" and "40m")`}},
		{"sites given twice", []string{"gaps", "--sites", goodCSV, "--sites", planarSites, "--range", "1m"}, 2, []string{"--sites", "given twice"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := runCLI(t, c.args...)
			checkFailure(t, r, c.code, c.want)
			if strings.Contains(r.stderr, "goroutine") || strings.Contains(r.stderr, "panic") {
				t.Errorf("stack trace on stderr: %q", r.stderr)
			}
		})
	}
}

// failureCase is a run that must fail: its arguments, exit code and the
// substrings of its one stderr line.
type failureCase struct {
	name string
	args []string
	code int
	want []string
}

// checkFailure checks a failed run: exit code, one "sitecover: ..." line
// on stderr holding every wanted text, nothing on stdout.
func checkFailure(t *testing.T, r result, code int, want []string) {
	t.Helper()
	if r.code != code {
		t.Errorf("exit code %d, want %d; stderr %q", r.code, code, r.stderr)
	}
	line := strings.TrimSuffix(r.stderr, "\n")
	if strings.Contains(line, "\n") || !strings.HasPrefix(line, "sitecover: ") {
		t.Errorf("stderr is not one line \"sitecover: ...\": %q", r.stderr)
	}
	for _, w := range want {
		if !strings.Contains(line, w) {
			t.Errorf("stderr %q lacks %q", line, w)
		}
	}
	if r.stdout != "" {
		t.Errorf("stdout not empty on failure: %q", r.stdout)
	}
}

func TestNoOverwriteOfInputs(t *testing.T) {
	// The sites are stored as summary.json and the area as report.txt in
	// the very folder given to --out: the run must refuse before writing
	// anything, and both inputs must be unchanged.
	dir := t.TempDir()
	sitesJSON := `{"type":"FeatureCollection","features":[` +
		`{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[10,10]}},` +
		`{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[30,30]}},` +
		`{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[10,30]}}]}`
	sites := writeFile(t, dir, "summary.json", sitesJSON)
	for _, c := range []struct {
		name string
		args []string
	}{
		{"analyze", []string{"analyze", "--planar", "--sites", sites, "--range", "10", "--out", dir}},
		{"cells", []string{"cells", "--planar", "--sites", sites, "--out", dir}},
		{"gaps, out given as dir/.", []string{"gaps", "--planar", "--sites", sites, "--range", "10", "--out", dir + string(os.PathSeparator) + "."}},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := runCLI(t, c.args...)
			if r.code != 1 || !strings.Contains(r.stderr, "summary.json") || !strings.Contains(r.stderr, "overwrite") {
				t.Errorf("%v: exit %d, stderr %q", c.args, r.code, r.stderr)
			}
			b, err := os.ReadFile(sites)
			if err != nil || string(b) != sitesJSON {
				t.Fatalf("input overwritten: %q %v", b, err)
			}
			ents, _ := os.ReadDir(dir)
			if len(ents) != 1 {
				t.Errorf("%v: out folder holds %d entries, want only the input", c.args, len(ents))
			}
		})
	}
}

// TestBadRangeInput: per-device ranges that are bad, missing or given by
// two sources: one line naming the file, the line or feature and the
// value; exit 1 (2 for bad usage); nothing written.
func TestBadRangeInput(t *testing.T) {
	dir := t.TempDir()
	w := func(name, content string) string { return writeFile(t, dir, name, content) }
	area := w("p.geojson", squareGeoJSON(0, 0, 400))
	rows := func(r2 string) string {
		return "name,x,y,type,range\ng1,50,50,gateway,150m\ns1,300,50,sensor," + r2 + "\ns2,200,300,sensor,40m\n"
	}
	typed := w("typed.csv", "name,x,y,type\ng1,50,50,gateway\ns1,300,50,sensor\ns2,200,300,siren\n")
	table := w("types.csv", "type,range\ngateway,150m\nsensor,nan\n")
	out := filepath.Join(dir, "out")
	an := func(sites string, extra ...string) []string {
		return append([]string{"analyze", "--planar", "--sites", sites, "--area", area, "--out", out}, extra...)
	}
	cases := []failureCase{
		{"range NaN", an(w("nan.csv", rows("NaN"))), 1, []string{"nan.csv line 3", `("s1")`, `"NaN"`}},
		{"range zero", an(w("zero.csv", rows("0"))), 1, []string{"zero.csv line 3", `"0"`, "greater than 0"}},
		{"range negative", an(w("neg.csv", rows("-40m"))), 1, []string{"neg.csv line 3", `"-40m"`, "greater than 0"}},
		{"range unparseable", an(w("word.csv", rows("far"))), 1, []string{"word.csv line 3", `"far"`}},
		{"range unknown unit", an(w("yd.csv", rows("40yd"))), 1, []string{"yd.csv line 3", `unknown unit "yd"`}},
		{"range out of bounds", an(w("big.csv", rows("5000km"))), 1, []string{"big.csv line 3", "between 1 mm and 1000 km"}},
		{"range missing on a row", an(w("gap.csv", rows(""))), 1, []string{"gap.csv line 3", "no range"}},
		{"GeoJSON range property zero", an(w("zero.geojson", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"name":"g1","range":0},"geometry":{"type":"Point","coordinates":[50,50]}}]}`)), 1,
			[]string{"zero.geojson feature 0", `("g1")`, "greater than 0"}},
		{"type with no range", an(typed, "--type-range", "gateway=150m", "--type-range", "sensor=40m"), 1,
			[]string{"typed.csv line 4", `type "siren" has no range in --type-range`}},
		{"range table with a bad range", an(typed, "--range-table", table), 1, []string{"types.csv line 3", `"nan"`}},
		{"type-range bad value", an(typed, "--type-range", "gateway:150m"), 1, []string{"--type-range", "TYPE=LENGTH"}},
		{"range column and type table", an(w("both.csv", rows("40m")), "--type-range", "gateway=150m"), 1,
			[]string{"both.csv has a range column", "two range sources"}},
		{"suggest with a range column, no range for the new devices", []string{"suggest", "--planar", "--sites", w("own.csv", rows("40m")), "--area", area, "--add", "1", "--out", out}, 2,
			[]string{"own ranges", "--range LENGTH or --new-type TYPE"}},
		// review models own ranges (TestReviewOwnRanges); what it still
		// refuses is a second range source, as analyze does
		{"review with a range column and a type table", []string{"review", "--planar", "--sites", w("rev.csv", rows("40m")), "--area", area, "--type-range", "gateway=150m", "--out", out}, 1,
			[]string{"rev.csv has a range column", "two range sources"}},
		{"both type tables", an(typed, "--type-range", "gateway=150m", "--range-table", table), 2, []string{"--type-range and --range-table"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			checkFailure(t, runCLI(t, c.args...), c.code, c.want)
			if ents, err := os.ReadDir(out); err == nil && len(ents) > 0 {
				t.Errorf("%d files written to %s", len(ents), out)
			}
		})
	}
}
