// Tests of the report outputs against closed-form scenes, RFC 7946 rules,
// and the file system contract (atomic writes, inputs never overwritten).
//
// Every analysis here comes from a real coverage.Analyze call; the report
// is checked against values derived independently: elementary geometry
// for a single site in a square, the inputs themselves for coordinates.

package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"image"
	"image/png"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/geojson"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// region builds a validated site area from rings (first exterior, then
// exclusion zones) given as x, y lists.
func region(t testing.TB, rings ...[]float64) *planar.Region {
	t.Helper()
	var poly orb.Polygon
	for _, xy := range rings {
		var r orb.Ring
		for i := 0; i+1 < len(xy); i += 2 {
			r = append(r, orb.Point{xy[i], xy[i+1]})
		}
		poly = append(poly, r)
	}
	reg, err := planar.NewRegion(orb.MultiPolygon{poly})
	if err != nil {
		t.Fatal(err)
	}
	return reg
}

func square(a float64) []float64 { return []float64{0, 0, a, 0, a, a, 0, a} }

func analyze(t testing.TB, sites []orb.Point, area *planar.Region, r float64) *coverage.Analysis {
	t.Helper()
	a, err := coverage.Analyze(sites, area, r, coverage.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func near(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// singleSite is one site at the centre of the square [0, a]² with range
// r < a/2: the disk lies inside the square.
func singleSite(t testing.TB, a, r float64) *coverage.Analysis {
	return analyze(t, []orb.Point{{a / 2, a / 2}}, region(t, square(a)), r)
}

// coveredInSquare is the area of the disk of radius r centred in the
// square of side a: πr² minus the four circular segments beyond the sides
// when a/2 < r < a/√2. Reference: elementary geometry (segment area
// r²·acos(d/r) − d·√(r² − d²) at distance d from the centre).
func coveredInSquare(a, r float64) float64 {
	d := a / 2
	if r <= d {
		return math.Pi * r * r
	}
	if r >= d*math.Sqrt2 {
		return a * a
	}
	seg := r*r*math.Acos(d/r) - d*math.Sqrt(r*r-d*d)
	return math.Pi*r*r - 4*seg
}

func TestSummarySingleSiteClosedForm(t *testing.T) {
	const a, r = 100.0, 30.0
	an := singleSite(t, a, r)
	m := Meta{Command: "analyze", Planar: true, SiteNames: []string{"Mast"}}
	doc := Summary(an, m)
	// Reference: closed form — the farthest point of a square from its
	// centre is a corner, at half the diagonal a/√2.
	if !near(doc.FullCoverRangeM, a/math.Sqrt2, 1e-12) {
		t.Errorf("full_cover_range_m = %v, want a/√2 = %v", doc.FullCoverRangeM, a/math.Sqrt2)
	}
	// Reference: closed form — the uncovered area is a² − πr² for r < a/2.
	if want := a*a - math.Pi*r*r; !near(doc.UncoveredAreaM2, want, 1e-9) {
		t.Errorf("uncovered_area_m2 = %v, want a²−πr² = %v", doc.UncoveredAreaM2, want)
	}
	if want := math.Pi * r * r / (a * a); !near(doc.CoveredFraction, want, 1e-9) {
		t.Errorf("covered_fraction = %v, want πr²/a² = %v", doc.CoveredFraction, want)
	}
	if doc.AreaM2 != a*a || doc.RangeM != r || doc.Sites != 1 {
		t.Errorf("area_m2, range_m, sites = %v, %v, %v; want %v, %v, 1", doc.AreaM2, doc.RangeM, doc.Sites, a*a, r)
	}
	corner := func(p Point) bool {
		return (p[0] == 0 || p[0] == a) && (p[1] == 0 || p[1] == a)
	}
	if !corner(doc.FullCoverWorstPoint) {
		t.Errorf("full_cover_worst_point = %v, want a corner of the square", doc.FullCoverWorstPoint)
	}
	if len(doc.Gaps) != 1 {
		t.Fatalf("%d gaps, want 1 (the square minus the disk is connected)", len(doc.Gaps))
	}
	g := doc.Gaps[0]
	if g.ID != 1 || !g.TouchesBoundary || !near(g.AreaM2, a*a-math.Pi*r*r, 1e-9) || !near(g.ClosingRangeM, a/math.Sqrt2, 1e-12) || !corner(g.DeepestPoint) {
		t.Errorf("gap = %+v, want id 1, edge, area a²−πr², closing a/√2 at a corner", g)
	}
	if len(doc.Cells) != 1 {
		t.Fatalf("%d cells, want 1", len(doc.Cells))
	}
	c := doc.Cells[0]
	if c.Site != 0 || c.Name != "Mast" || !near(c.AreaM2, a*a, 1e-12) || !near(c.Share, 1, 1e-12) || !near(c.FarthestM, a/math.Sqrt2, 1e-12) || !corner(c.FarthestPoint) {
		t.Errorf("cell = %+v, want site 0 \"Mast\", area a², share 1, farthest a/√2 at a corner", c)
	}
	// Reference: closed form — the range covering a share f of the square
	// solves coveredInSquare(a, r) = f·a² (monotone in r; bisection here).
	for _, k := range []struct {
		name string
		f    float64
		got  float64
	}{{"p50", 0.50, doc.RangePercentiles.P50}, {"p90", 0.90, doc.RangePercentiles.P90}, {"p95", 0.95, doc.RangePercentiles.P95}, {"p99", 0.99, doc.RangePercentiles.P99}} {
		t.Run(k.name, func(t *testing.T) {
			lo, hi := 0.0, a
			for range 200 {
				mid := (lo + hi) / 2
				if coveredInSquare(a, mid) >= k.f*a*a {
					hi = mid
				} else {
					lo = mid
				}
			}
			if !near(k.got, hi, 1e-6) {
				t.Errorf("%s = %v, want %v", k.name, k.got, hi)
			}
		})
	}
	if len(doc.Holes) != 0 || doc.LinkRangeM != 0 || doc.ConnectRangeM != 0 {
		t.Errorf("holes %v, link %v, connect %v: want none, 0, 0 for one site", doc.Holes, doc.LinkRangeM, doc.ConnectRangeM)
	}
}

func TestSummaryJSONFieldNames(t *testing.T) {
	an := analyze(t, []orb.Point{{20, 20}, {80, 25}, {50, 80}, {20, 20}}, region(t, square(100)), 25)
	m := Meta{Command: "analyze", Planar: true, Warnings: []string{"site 3 repeats site 0"},
		Timings: []coverage.Timing{{Phase: "load inputs", Seconds: 0.25}}}
	b, err := Summary(an, m).MarshalIndent()
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatalf("summary.json does not parse: %v", err)
	}
	// Reference: issue 4, the summary.json field list.
	required := []string{"sites", "area_m2", "range_m", "full_cover_range_m", "full_cover_worst_point",
		"covered_fraction", "uncovered_area_m2", "gaps", "holes", "range_percentiles", "link_range_m",
		"cells", "projection", "warnings", "timings"}
	for _, k := range required {
		if _, ok := doc[k]; !ok {
			t.Errorf("summary.json lacks %q", k)
		}
	}
	sub := func(key string, want ...string) {
		var arr []map[string]json.RawMessage
		if err := json.Unmarshal(doc[key], &arr); err != nil || len(arr) == 0 {
			t.Errorf("%s: %v (%d entries)", key, err, len(arr))
			return
		}
		for _, k := range want {
			if _, ok := arr[0][k]; !ok {
				t.Errorf("%s[0] lacks %q", key, k)
			}
		}
	}
	sub("gaps", "id", "area_m2", "closing_range_m", "deepest_point", "touches_boundary", "sites", "site_labels")
	sub("cells", "site", "name", "area_m2", "farthest_m", "farthest_point")
	// The run is named: its title and input files (issue 16).
	for _, k := range []string{"title", "sites_file", "area_file", "exclude_file"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("summary.json lacks %q", k)
		}
	}
	var pc map[string]float64
	if err := json.Unmarshal(doc["range_percentiles"], &pc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"p50", "p90", "p95", "p99"} {
		if _, ok := pc[k]; !ok {
			t.Errorf("range_percentiles lacks %q", k)
		}
	}
	if !(pc["p50"] <= pc["p90"] && pc["p90"] <= pc["p95"] && pc["p95"] <= pc["p99"]) {
		t.Errorf("percentiles not increasing: %v", pc)
	}
	var sites, dups int
	json.Unmarshal(doc["sites"], &sites)
	json.Unmarshal(doc["duplicates"], &dups)
	if sites != 4 || dups != 1 {
		t.Errorf("sites %d, duplicates %d; want 4, 1", sites, dups)
	}
	var cells []SummaryCell
	json.Unmarshal(doc["cells"], &cells)
	if len(cells) != 3 {
		t.Errorf("%d cells, want 3 distinct positions", len(cells))
	}
	for _, c := range cells {
		if c.Site == 0 && !slices.Equal(c.Merged, []int{3}) {
			t.Errorf("cell of site 0 merged %v, want [3]", c.Merged)
		}
	}
	var timings map[string]float64
	if err := json.Unmarshal(doc["timings"], &timings); err != nil {
		t.Fatalf("timings: %v", err)
	}
	if timings["load inputs"] != 0.25 {
		t.Errorf("timings = %v, want \"load inputs\": 0.25 among them", timings)
	}
	var warns []string
	json.Unmarshal(doc["warnings"], &warns)
	if !slices.Contains(warns, "site 3 repeats site 0") {
		t.Errorf("warnings = %v", warns)
	}
	var gaps []SummaryGap
	json.Unmarshal(doc["gaps"], &gaps)
	for i, g := range gaps {
		if g.ID != i+1 || (i > 0 && g.ClosingRangeM > gaps[i-1].ClosingRangeM) {
			t.Errorf("gap %d: id %d closing %v: want ids 1.. by decreasing closing range", i, g.ID, g.ClosingRangeM)
		}
	}
}

// geoScene is a small campus given in WGS84, analysed in a local plane.
type geoScene struct {
	lonlat []orb.Point
	an     *coverage.Analysis
	meta   Meta
	tm     *planar.TransverseMercator
}

// refLayers is testdata/ref_layers.json, written by ref_layers.py.
type refLayers struct {
	Scene     refScene `json:"scene"`
	Reference refFigs  `json:"reference"`
}

type refScene struct {
	Sites  [][2]float64   `json:"sites"`
	Area   [][][2]float64 `json:"area"`
	RangeM float64        `json:"range_m"`
}

type refFigs struct {
	Lon0, Lat0  float64
	AreaM2      float64   `json:"area_m2"`
	UncoveredM2 float64   `json:"uncovered_m2"`
	GapAreasM2  []float64 `json:"gap_areas_m2"`
	Problems    []string  `json:"problems"`
	MaxDecimals int       `json:"max_decimals"`
}

func loadRefLayers(t testing.TB) refLayers {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", "ref_layers.json"))
	if err != nil {
		t.Fatal(err)
	}
	var r refLayers
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	return r
}

// newGeoScene is the campus of testdata/ref_layers.json (four sites, an
// area with an exclusion zone, given in WGS84), projected to a local
// plane with planar.NewLocalPlane and analysed.
func newGeoScene(t testing.TB) *geoScene {
	t.Helper()
	return geoSceneFrom(t, loadRefLayers(t).Scene, []string{"North gate", "Lab", "", "Depot"})
}

func geoSceneFrom(t testing.TB, sc refScene, names []string) *geoScene {
	t.Helper()
	var sites []orb.Point
	for _, p := range sc.Sites {
		sites = append(sites, orb.Point(p))
	}
	all := append([]orb.Point{}, sites...)
	for _, r := range sc.Area {
		for _, p := range r {
			all = append(all, orb.Point(p))
		}
	}
	tm, err := planar.NewLocalPlane(all)
	if err != nil {
		t.Fatal(err)
	}
	var local []orb.Point
	for _, p := range sites {
		x, y := tm.Forward(p[0], p[1])
		local = append(local, orb.Point{x, y})
	}
	var rings [][]float64
	for _, r := range sc.Area {
		var xy []float64
		for _, p := range r {
			x, y := tm.Forward(p[0], p[1])
			xy = append(xy, x, y)
		}
		rings = append(rings, xy)
	}
	an := analyze(t, local, region(t, rings...), sc.RangeM)
	b, _ := planar.LonLatBound(all)
	return &geoScene{lonlat: sites, an: an, tm: tm, meta: Meta{
		Title: "Test campus", Command: "analyze", SiteNames: names,
		Projection: "transverse Mercator on WGS84, centred on the data", MaxScaleError: tm.MaxScaleError(b),
		ToLonLat: tm.Inverse, Version: "test",
	}}
}

// geoLayer is the raw structure of a GeoJSON layer, numbers kept as text.
type geoLayer struct {
	Type     string            `json:"type"`
	CRS      json.RawMessage   `json:"crs"`
	Features []json.RawMessage `json:"features"`
}

type geoFeature struct {
	Type     string `json:"type"`
	Geometry struct {
		Type        string          `json:"type"`
		Coordinates json.RawMessage `json:"coordinates"`
	} `json:"geometry"`
	Properties map[string]any `json:"properties"`
}

// decimals returns the number of decimals of a JSON number.
func decimals(n json.Number) int {
	s := string(n)
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		exp, _ := strconv.Atoi(s[i+1:])
		s = s[:i]
		d := 0
		if j := strings.IndexByte(s, '.'); j >= 0 {
			d = len(s) - j - 1
		}
		return max(0, d-exp)
	}
	if j := strings.IndexByte(s, '.'); j >= 0 {
		return len(s) - j - 1
	}
	return 0
}

func parseNumbers(t *testing.T, raw json.RawMessage, v any) {
	t.Helper()
	d := json.NewDecoder(bytes.NewReader(raw))
	d.UseNumber()
	if err := d.Decode(v); err != nil {
		t.Fatal(err)
	}
}

func shoelace(r [][2]float64) float64 {
	var a float64
	for i := 0; i+1 < len(r); i++ {
		a += (r[i][0]-r[0][0])*(r[i+1][1]-r[0][1]) - (r[i+1][0]-r[0][0])*(r[i][1]-r[0][1])
	}
	return a / 2
}

// checkLayer validates a layer against RFC 7946 and returns its features.
func checkLayer(t *testing.T, path string, lonRange, latRange [2]float64) []geoFeature {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var l geoLayer
	if err := json.Unmarshal(b, &l); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	// Reference: RFC 7946 §3.3 (FeatureCollection) and §4 (no "crs").
	if l.Type != "FeatureCollection" || l.CRS != nil {
		t.Errorf("%s: type %q, crs %s", path, l.Type, l.CRS)
	}
	if bytes.Contains(b, []byte(`"crs"`)) {
		t.Errorf("%s has a crs member", path)
	}
	var out []geoFeature
	for fi, raw := range l.Features {
		var f geoFeature
		if err := json.Unmarshal(raw, &f); err != nil {
			t.Fatal(err)
		}
		out = append(out, f)
		checkPos := func(p []json.Number) [2]float64 {
			if len(p) != 2 {
				t.Fatalf("%s feature %d: position %v", path, fi, p)
			}
			lon, _ := p[0].Float64()
			lat, _ := p[1].Float64()
			for _, n := range p {
				if d := decimals(n); d > 7 {
					t.Errorf("%s feature %d: %s has %d decimals, want <= 7", path, fi, n, d)
				}
			}
			// Reference: RFC 7946 §3.1.1 — longitude first, then latitude;
			// here they must also fall in the input's ranges.
			if lon < lonRange[0] || lon > lonRange[1] || lat < latRange[0] || lat > latRange[1] {
				t.Errorf("%s feature %d: position (%v, %v) outside lon %v lat %v", path, fi, lon, lat, lonRange, latRange)
			}
			return [2]float64{lon, lat}
		}
		checkPoly := func(rings [][][]json.Number) {
			for k, ring := range rings {
				var r [][2]float64
				for _, p := range ring {
					r = append(r, checkPos(p))
				}
				// Reference: RFC 7946 §3.1.6 — linear rings closed, >= 4
				// positions, exterior counter-clockwise, holes clockwise.
				if len(r) < 4 || r[0] != r[len(r)-1] {
					t.Errorf("%s feature %d ring %d: %d positions, closed %v", path, fi, k, len(r), len(r) > 0 && r[0] == r[len(r)-1])
				}
				a := shoelace(r)
				if k == 0 && !(a > 0) || k > 0 && !(a < 0) {
					t.Errorf("%s feature %d ring %d: signed area %g in lon/lat (exterior must be > 0, holes < 0)", path, fi, k, a)
				}
			}
		}
		switch f.Geometry.Type {
		case "Point":
			var p []json.Number
			parseNumbers(t, f.Geometry.Coordinates, &p)
			checkPos(p)
		case "Polygon":
			var rings [][][]json.Number
			parseNumbers(t, f.Geometry.Coordinates, &rings)
			checkPoly(rings)
		case "MultiPolygon":
			var polys [][][][]json.Number
			parseNumbers(t, f.Geometry.Coordinates, &polys)
			for _, p := range polys {
				checkPoly(p)
			}
		default:
			t.Errorf("%s feature %d: geometry %q", path, fi, f.Geometry.Type)
		}
	}
	return out
}

func TestGeoJSONLayers(t *testing.T) {
	g := newGeoScene(t)
	dir := t.TempDir()
	files, err := WriteAnalysis(dir, g.an, g.meta, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != 8 {
		t.Errorf("wrote %v, want 8 files (7 and the manifest) without maps and charts", files)
	}
	lonR := [2]float64{8.54 - 1e-7, 8.544 + 1e-7}
	latR := [2]float64{47.37 - 1e-7, 47.373 + 1e-7}
	sites := checkLayer(t, filepath.Join(dir, FileSites), lonR, latR)
	if len(sites) != len(g.lonlat) {
		t.Fatalf("%d site features, want %d", len(sites), len(g.lonlat))
	}
	for i, f := range sites {
		var p [2]float64
		json.Unmarshal(f.Geometry.Coordinates, &p)
		// Reference: the input longitudes and latitudes themselves (the
		// round trip through the local plane is exact to ~1e-9°).
		if math.Abs(p[0]-g.lonlat[i][0]) > 1e-7 || math.Abs(p[1]-g.lonlat[i][1]) > 1e-7 {
			t.Errorf("site %d at %v, input %v", i, p, g.lonlat[i])
		}
		if int(f.Properties["site"].(float64)) != i || f.Properties["name"] != g.meta.SiteNames[i] {
			t.Errorf("site %d properties %v", i, f.Properties)
		}
	}
	cells := checkLayer(t, filepath.Join(dir, FileServiceAreas), lonR, latR)
	if len(cells) != len(g.lonlat) {
		t.Errorf("%d service areas, want %d", len(cells), len(g.lonlat))
	}
	for _, f := range cells {
		for _, k := range []string{"site", "name", "area_m2", "share", "farthest_m", "farthest_lon", "farthest_lat", "merged"} {
			if _, ok := f.Properties[k]; !ok {
				t.Errorf("service area lacks property %q", k)
			}
		}
	}
	gaps := checkLayer(t, filepath.Join(dir, FileGaps), lonR, latR)
	if len(gaps) != len(g.an.Gaps) || len(gaps) == 0 {
		t.Errorf("%d gap features, analysis has %d gaps", len(gaps), len(g.an.Gaps))
	}
	for _, f := range gaps {
		for _, k := range []string{"id", "area_m2", "closing_range_m", "deepest_lon", "deepest_lat", "touches_boundary", "sites"} {
			if _, ok := f.Properties[k]; !ok {
				t.Errorf("gap lacks property %q", k)
			}
		}
	}
	checkLayer(t, filepath.Join(dir, FileHoleClosings), lonR, latR)
}

func TestGeoJSONRingRepair(t *testing.T) {
	// A clockwise ring with two vertices closer than the 7-decimal rounding
	// (they merge), given to the converter as an exterior: it must come out
	// closed, counter-clockwise and without repeated positions.
	s := &scene{m: Meta{ToLonLat: func(x, y float64) (float64, float64) { return x, y }}}
	in := orb.Ring{{0, 0}, {0, 1}, {1, 1}, {1, 1 + 1e-9}, {1, 0}, {0, 0}}
	r := s.ring(in, true)
	if len(r) != 5 || r[0] != r[len(r)-1] || planar.RingArea(planar.FlatRing(r)) <= 0 {
		t.Fatalf("repaired ring %v: want 4 distinct positions, closed, counter-clockwise", r)
	}
	for i := 1; i < len(r); i++ {
		if r[i] == r[i-1] {
			t.Errorf("repeated position %v", r[i])
		}
	}
	if h := s.ring(in, false); planar.RingArea(planar.FlatRing(h)) >= 0 {
		t.Errorf("hole ring %v not clockwise", h)
	}
	// a sliver thinner than the rounding vanishes
	if r := s.ring(orb.Ring{{0, 0}, {1, 1e-9}, {2, 0}}, true); r != nil {
		t.Errorf("sliver kept as %v", r)
	}
}

func TestPlanarLayers(t *testing.T) {
	an := analyze(t, []orb.Point{{1000, 2000}, {1100, 2050}}, region(t, []float64{950, 1950, 1200, 1950, 1200, 2150, 950, 2150}), 60)
	dir := t.TempDir()
	m := Meta{Command: "analyze", Planar: true}
	files, err := WriteAnalysis(dir, an, m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"sites-xy.geojson", "service-areas-xy.geojson", "gaps-xy.geojson", "hole-closings-xy.geojson"} {
		if !slices.Contains(files, filepath.Join(dir, name)) {
			t.Errorf("%s not written (wrote %v)", name, files)
		}
	}
	f := checkLayer(t, filepath.Join(dir, "sites-xy.geojson"), [2]float64{999, 1101}, [2]float64{1999, 2051})
	var p [2]float64
	json.Unmarshal(f[0].Geometry.Coordinates, &p)
	if p != [2]float64{1000, 2000} {
		t.Errorf("planar site at %v, want [1000, 2000]", p)
	}
	b, _ := os.ReadFile(filepath.Join(dir, "sites-xy.geojson"))
	if !bytes.Contains(b, []byte(`"coordinates":"local plane x/y in metres`)) {
		t.Errorf("planar layer does not say its coordinates are local metres")
	}
	txt, _ := os.ReadFile(filepath.Join(dir, FileReport))
	if !bytes.Contains(txt, []byte("not WGS84")) {
		t.Errorf("report.txt does not state that the planar layers are not WGS84")
	}
}

func TestAtomicWrite(t *testing.T) {
	an := singleSite(t, 100, 30)
	// A folder holding a file sitecover did not write is refused before
	// anything is written: the swap replaces a folder's entries.
	mine := t.TempDir()
	keep := filepath.Join(mine, "notes.txt")
	if err := os.WriteFile(keep, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := WriteAnalysis(mine, an, Meta{Planar: true}, Options{}); err == nil || !strings.Contains(err.Error(), "notes.txt") {
		t.Fatalf("err = %v, want a refusal naming notes.txt", err)
	}
	if b, _ := os.ReadFile(keep); string(b) != "mine" {
		t.Errorf("unrelated file changed to %q", b)
	}
	if ents, _ := os.ReadDir(mine); len(ents) != 1 {
		t.Errorf("refused folder holds %d entries, want 1", len(ents))
	}
	dir := filepath.Join(t.TempDir(), "out")
	if _, err := WriteAnalysis(dir, an, Meta{Planar: true}, Options{Maps: true, Charts: true, MapWidth: 600}); err != nil {
		t.Fatal(err)
	}
	ents, _ := os.ReadDir(dir)
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
		if strings.HasPrefix(e.Name(), ".") || strings.Contains(e.Name(), ".tmp") {
			t.Errorf("temporary file left: %s", e.Name())
		}
	}
	want := Files(false, Meta{Planar: true}, Options{Maps: true, Charts: true})
	slices.Sort(want)
	if !slices.Equal(names, want) {
		t.Errorf("folder holds %v, want %v", names, want)
	}

	// An output path that is an input file is refused before anything is
	// written; the input keeps its content.
	dir2 := t.TempDir()
	input := filepath.Join(dir2, FileSummary)
	os.WriteFile(input, []byte(`{"type":"FeatureCollection"}`), 0o644)
	_, err := WriteAnalysis(dir2, an, Meta{Planar: true, SitesFile: input}, Options{})
	if err == nil || !strings.Contains(err.Error(), input) || !strings.Contains(err.Error(), "refusing") {
		t.Errorf("err = %v, want a refusal naming %s", err, input)
	}
	if b, _ := os.ReadFile(input); string(b) != `{"type":"FeatureCollection"}` {
		t.Errorf("input overwritten: %q", b)
	}
	if _, err := os.Stat(filepath.Join(dir2, FileReport)); err == nil {
		t.Errorf("report.txt written despite the refusal")
	}
	// the same input named by a relative path with ".." is still caught
	wd, _ := os.Getwd()
	rel, _ := filepath.Rel(wd, filepath.Join(dir2, "x", "..", FileSummary))
	if _, err := WriteAnalysis(dir2, an, Meta{Planar: true, AreaFile: rel}, Options{}); err == nil {
		t.Errorf("refusal missed for %s", rel)
	}

	// An output folder that cannot be created is named in the error.
	bad := filepath.Join(keep, "sub")
	if _, err := WriteAnalysis(bad, an, Meta{Planar: true}, Options{}); err == nil || !strings.Contains(err.Error(), bad) {
		t.Errorf("err = %v, want one naming %s", err, bad)
	}
	if _, err := WriteAnalysis(keep, an, Meta{Planar: true}, Options{}); err == nil || !strings.Contains(err.Error(), "not a folder") {
		t.Errorf("err = %v, want 'not a folder'", err)
	}
}

func TestReportText(t *testing.T) {
	g := newGeoScene(t)
	txt := string(newScene(g.an.Layout, g.an, g.meta).text())
	for _, want := range []string{
		"Site coverage report: Test campus", "Full-cover range", metres(g.an.FullCover.Range),
		"Range covering 95 %", "Link range", "GAPS AT 70.00 m", "SERVICE AREAS", "North gate", "CAUTIONS",
		"life-safety", "Latitude", "transverse Mercator on WGS84",
	} {
		if !strings.Contains(txt, want) {
			t.Errorf("report.txt lacks %q", want)
		}
	}
	// tables: every row has its numeric cells right-aligned on the rule
	lines := strings.Split(txt, "\n")
	tables := 0
	for i, l := range lines {
		if !strings.HasPrefix(l, "  --") || i == 0 {
			continue
		}
		tables++
		var ends []int
		for j := 0; j < len(l); j++ {
			if l[j] == '-' && (j+1 == len(l) || l[j+1] == ' ') {
				ends = append(ends, j)
			}
		}
		for _, row := range lines[i+1:] {
			if strings.TrimSpace(row) == "" {
				break
			}
			// the first three columns are numbers or #ids in every table
			for _, e := range ends[:3] {
				if e >= len(row) || row[e] == ' ' || (e+1 < len(row) && row[e+1] != ' ') {
					t.Errorf("row %q not aligned at column end %d", row, e)
					break
				}
			}
		}
	}
	if tables < 2 {
		t.Errorf("%d tables found, want gaps and service areas", tables)
	}
	if n := strings.Count(txt, "\n"); n < 40 {
		t.Errorf("report.txt has %d lines", n)
	}
}

func TestLifeSafetyCautionsFirst(t *testing.T) {
	an := singleSite(t, 100, 30)
	m := Meta{Planar: true, LifeSafety: true}
	txt := string(newScene(an.Layout, an, m).text())
	c := strings.Index(txt, "CAUTIONS (LIFE-SAFETY DEVICES)")
	in := strings.Index(txt, "INPUTS")
	if c < 0 || c > in {
		t.Errorf("cautions at %d, inputs at %d: life-safety cautions must come first", c, in)
	}
	if lc := strings.ToLower(Cautions()); !strings.Contains(lc, "defibrillator") || !strings.Contains(lc, "walls") || !strings.Contains(lc, "terrain") || !strings.Contains(lc, "interference") {
		t.Errorf("cautions lack the required points:\n%s", Cautions())
	}
}

func TestWriteCells(t *testing.T) {
	g := newGeoScene(t)
	dir := t.TempDir()
	files, err := WriteCells(dir, g.an.Layout, g.meta, Options{Maps: true, MapWidth: 800})
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != 6 {
		t.Errorf("wrote %v", files)
	}
	b, _ := os.ReadFile(filepath.Join(dir, FileSummary))
	var doc map[string]json.RawMessage
	json.Unmarshal(b, &doc)
	if _, ok := doc["gaps"]; ok {
		t.Errorf("cells summary has gaps")
	}
	var cells []SummaryCell
	json.Unmarshal(doc["cells"], &cells)
	if len(cells) != 4 {
		t.Errorf("%d cells", len(cells))
	}
	var total float64
	for _, c := range cells {
		total += c.AreaM2
	}
	// Reference: the service areas partition the site area.
	if !near(total, g.an.Layout.AreaM2, 1e-9) {
		t.Errorf("service areas sum to %v m², area is %v m²", total, g.an.Layout.AreaM2)
	}
	txt, _ := os.ReadFile(filepath.Join(dir, FileReport))
	if !bytes.Contains(txt, []byte("Service-area report")) || bytes.Contains(txt, []byte("GAPS AT")) {
		t.Errorf("cells report.txt has the wrong sections")
	}
}

// gridScene is four sites on a 100 m grid in a 200 m square at range
// 60 m: nine gaps (four corners, four edge midpoints, the inner centre),
// all closing at 50√2 m. Reference: elementary geometry.
func gridScene(t testing.TB) *coverage.Analysis {
	return analyze(t, []orb.Point{{50, 50}, {150, 50}, {50, 150}, {150, 150}}, region(t, square(200)), 60)
}

func TestGridSceneGaps(t *testing.T) {
	an := gridScene(t)
	if len(an.Gaps) != 9 {
		t.Fatalf("%d gaps, want 9", len(an.Gaps))
	}
	inner := 0
	for _, g := range an.Gaps {
		if !near(g.ClosingRange, 50*math.Sqrt2, 1e-9) {
			t.Errorf("gap %d closes at %v, want 50√2", g.ID, g.ClosingRange)
		}
		if !g.TouchesBoundary {
			inner++
			if math.Hypot(g.Deepest[0]-100, g.Deepest[1]-100) > 1e-9 {
				t.Errorf("inner gap deepest at %v, want (100, 100)", g.Deepest)
			}
		}
	}
	if inner != 1 {
		t.Errorf("%d inner gaps, want 1", inner)
	}
}

func isColour(img image.Image, x, y int, c [3]uint8) bool {
	r, g, b, _ := img.At(x, y).RGBA()
	return uint8(r>>8) == c[0] && uint8(g>>8) == c[1] && uint8(b>>8) == c[2]
}

// anyColour reports whether colour c occurs within rad px of (x, y).
func anyColour(img image.Image, x, y float64, rad int, c [3]uint8) bool {
	cx, cy := int(math.Round(x)), int(math.Round(y))
	for dy := -rad; dy <= rad; dy++ {
		for dx := -rad; dx <= rad; dx++ {
			if dx*dx+dy*dy <= rad*rad && isColour(img, cx+dx, cy+dy, c) {
				return true
			}
		}
	}
	return false
}

func TestCoverageMapPixels(t *testing.T) {
	an := gridScene(t)
	s := newScene(an.Layout, an, Meta{Planar: true, Title: "Grid"})
	c, err := s.drawCoverageMap(1600)
	if err != nil {
		t.Fatal(err)
	}
	img := c.dc.Image()
	if b := img.Bounds(); b.Dx() != 1600 || b.Dy() != c.h {
		t.Fatalf("image %v, want 1600 x %d", b, c.h)
	}
	gap := [3]uint8{colGap.R, colGap.G, colGap.B}
	for _, g := range an.Gaps {
		x, y := c.px(g.Deepest)
		if !anyColour(img, x, y, 3, gap) {
			t.Errorf("gap %d: no gap colour within 3 px of its deepest point %v (pixel %.1f, %.1f)", g.ID, g.Deepest, x, y)
		}
	}
	// well inside the disks (half the range from a site) there is no gap
	// colour
	for _, p := range an.Layout.Sites {
		for k := range 8 {
			a := float64(k) * math.Pi / 4
			q := orb.Point{p[0] + 30*math.Cos(a), p[1] + 30*math.Sin(a)}
			x, y := c.px(q)
			if anyColour(img, x, y, 2, gap) {
				t.Errorf("gap colour at %v, 30 m from site %v", q, p)
			}
		}
	}
	// the encoded file decodes to the same size
	b, err := c.encode()
	if err != nil {
		t.Fatal(err)
	}
	cfg, err := png.DecodeConfig(bytes.NewReader(b))
	if err != nil || cfg.Width != 1600 || cfg.Height != c.h {
		t.Errorf("PNG %v x %v, err %v", cfg.Width, cfg.Height, err)
	}
}

func TestMapsAndChartsDecode(t *testing.T) {
	g := newGeoScene(t)
	dir := t.TempDir()
	if _, err := WriteAnalysis(dir, g.an, g.meta, Options{Maps: true, Charts: true}); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{FileMapServiceAreas, FileMapCoverage, FileChartCurve, FileChartHoles} {
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(f)
		f.Close()
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if w := img.Bounds().Dx(); w != DefaultMapWidth {
			t.Errorf("%s is %d px wide, want %d", name, w, DefaultMapWidth)
		}
	}
	if keep := os.Getenv("SITECOVER_REPORT_KEEP"); keep != "" {
		WriteAnalysis(keep, g.an, g.meta, Options{Maps: true, Charts: true})
	}
}

func TestCellColours(t *testing.T) {
	sites := make([]orb.Point, 0, 400)
	for i := range 400 {
		// a deterministic scatter (golden-angle spiral)
		a := float64(i) * 2.399963229728653
		r := 10 * math.Sqrt(float64(i))
		sites = append(sites, orb.Point{250 + r*math.Cos(a), 250 + r*math.Sin(a)})
	}
	an := analyze(t, sites, region(t, square(500)), 10)
	s := newScene(an.Layout, an, Meta{Planar: true})
	col := s.cellColours()
	cl := an.Layout.Cells
	used := map[int8]bool{}
	for v := range len(cl.SiteStart) - 1 {
		used[col[v]] = true
		for p := cl.SiteStart[v]; p < cl.SiteStart[v+1]; p++ {
			for k := cl.PolyStart[p]; k < cl.PolyStart[p+1]; k++ {
				for i := cl.RingStart[k]; i < cl.RingStart[k+1]; i++ {
					if j := cl.EdgeSource[i]; j >= 0 && col[j] == col[v] {
						t.Errorf("cells %d and %d share an edge and colour %d", v, j, col[v])
					}
				}
			}
		}
	}
	// Reference: Matula & Beck (J. ACM 1983) — smallest-last greedy
	// colouring of a planar graph uses at most 6 colours.
	if len(used) > 6 || len(used) > len(cellPalette) {
		t.Errorf("%d colours used", len(used))
	}
}

func TestDrawingHelpers(t *testing.T) {
	// Reference: common practice — scale bars show 1, 2 or 5 × 10^k.
	for _, c := range []struct{ in, want float64 }{{0.7, 0.5}, {1, 1}, {3.9, 2}, {7, 5}, {180, 100}, {260, 200}, {999, 500}, {4200, 2000}} {
		t.Run(fmt.Sprintf("niceLength/%v", c.in), func(t *testing.T) {
			if got := niceLength(c.in); got != c.want {
				t.Errorf("niceLength(%v) = %v, want %v", c.in, got, c.want)
			}
		})
	}
	for _, c := range []struct {
		m    float64
		want string
	}{{500, "500 m"}, {2000, "2 km"}, {2500, "2.5 km"}, {0.5, "50 cm"}} {
		t.Run(fmt.Sprintf("lengthLabel/%v", c.m), func(t *testing.T) {
			if got := lengthLabel(c.m); got != c.want {
				t.Errorf("lengthLabel(%v) = %q, want %q", c.m, got, c.want)
			}
		})
	}
	// chord deviation r(1 − cos(π/n)) stays within 0.2 px
	for _, rho := range []float64{0.1, 1, 3, 10, 100, 1000, 5000} {
		t.Run(fmt.Sprintf("circleSides/%vpx", rho), func(t *testing.T) {
			n := circleSides(rho)
			if dev := rho * (1 - math.Cos(math.Pi/float64(n))); dev > 0.2+1e-12 && n < 720 {
				t.Errorf("radius %v px: %d sides deviate %v px", rho, n, dev)
			}
		})
	}
}

// layerGapAreas reads gaps.geojson with orb/geojson and returns each gap's
// area and perimeter in the local plane (vertices projected with tm),
// largest first.
func layerGapAreas(t *testing.T, path string, tm *planar.TransverseMercator) (areas, perims []float64) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	// Reference: the orb/geojson decoder (github.com/paulmach/orb).
	fc, err := geojson.UnmarshalFeatureCollection(b)
	if err != nil {
		t.Fatalf("%s: orb/geojson cannot read it: %v", path, err)
	}
	type ap struct{ a, p float64 }
	var out []ap
	for _, f := range fc.Features {
		mp, ok := f.Geometry.(orb.MultiPolygon)
		if !ok {
			t.Fatalf("gap geometry %T", f.Geometry)
		}
		var a, per float64
		for _, poly := range mp {
			for k, ring := range poly {
				var r [][2]float64
				for _, q := range ring {
					x, y := tm.Forward(q[0], q[1])
					r = append(r, [2]float64{x, y})
				}
				for i := 0; i+1 < len(r); i++ {
					per += math.Hypot(r[i+1][0]-r[i][0], r[i+1][1]-r[i][1])
				}
				if k == 0 {
					a += shoelace(r)
				} else {
					a += shoelace(r) // holes are clockwise: negative
				}
			}
		}
		out = append(out, ap{a, per})
	}
	slices.SortFunc(out, func(x, y ap) int { return -cmpFloat(x.a, y.a) })
	for _, v := range out {
		areas = append(areas, v.a)
		perims = append(perims, v.p)
	}
	return areas, perims
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// checkAgainstGEOS compares the summary and the gaps layer of g with the
// PROJ + GEOS reference figures.
func checkAgainstGEOS(t *testing.T, g *geoScene, dir string, ref refFigs) {
	t.Helper()
	doc := Summary(g.an, g.meta)
	areas, perims := layerGapAreas(t, filepath.Join(dir, LayerFile(FileGaps, false)), g.tm)
	// GEOS buffers are inscribed 4096-gons (1024 segments a quarter):
	// along an arc each chord cuts off a segment, so GEOS gaps are larger
	// by at most (2/3)·sagitta per metre of arc, sagitta = r(1 − cos(π/4096));
	// the gap perimeter bounds the arc length.
	sag := g.an.Range * (1 - math.Cos(math.Pi/4096))
	var totalPerim float64
	for _, p := range perims {
		totalPerim += p
	}
	if math.Abs(doc.AreaM2-ref.AreaM2) > 1e-9*ref.AreaM2 {
		t.Errorf("area_m2 %v, GEOS %v", doc.AreaM2, ref.AreaM2)
	}
	if d := ref.UncoveredM2 - doc.UncoveredAreaM2; d < -1e-3 || d > sag*totalPerim+1e-3 {
		t.Errorf("uncovered_area_m2 %v, GEOS %v (GEOS may exceed by up to %v)", doc.UncoveredAreaM2, ref.UncoveredM2, sag*totalPerim)
	}
	var sumAreas []float64
	for _, gp := range doc.Gaps {
		sumAreas = append(sumAreas, gp.AreaM2)
	}
	slices.SortFunc(sumAreas, func(x, y float64) int { return -cmpFloat(x, y) })
	// GEOS may keep slivers the analysis drops (or the reverse) far below
	// a square metre; compare the gaps above 0.01 m².
	big := func(v []float64) []float64 {
		var o []float64
		for _, x := range v {
			if x > 0.01 {
				o = append(o, x)
			}
		}
		return o
	}
	want := big(ref.GapAreasM2)
	got := big(sumAreas)
	if len(got) != len(want) || len(areas) < len(want) {
		t.Fatalf("%d gaps in summary.json, %d in the layer, GEOS finds %d: %v vs %v", len(got), len(areas), len(want), got, want)
	}
	for i := range want {
		if d := want[i] - got[i]; d < -1e-3 || d > sag*perims[i]+1e-3 {
			t.Errorf("gap %d area %v m², GEOS %v m² (GEOS may exceed by up to %v)", i, got[i], want[i], sag*perims[i])
		}
	}
	// The outlines in gaps.geojson (lon/lat, 7 decimals) projected back:
	// they contain the true gap (chords inside the disks), exceed it by
	// less than the circular segments (sagitta 0.2 % of r along at most the
	// perimeter), and rounding to 1e-7° moves each vertex by at most 1 cm.
	for i := range want {
		excess := coverage.DefaultChordTolerance * g.an.Range * perims[i]
		round := 0.01 * perims[i]
		if areas[i] < want[i]-round-1e-3 || areas[i] > want[i]+excess+round {
			t.Errorf("gaps.geojson gap %d: %v m² in the plane, GEOS %v m² (allowed -%v/+%v)", i, areas[i], want[i], round, excess+round)
		}
	}
}

func TestGapsAgainstGEOS(t *testing.T) {
	ref := loadRefLayers(t)
	g := newGeoScene(t)
	dir := t.TempDir()
	if _, err := WriteAnalysis(dir, g.an, g.meta, Options{}); err != nil {
		t.Fatal(err)
	}
	// Reference: PROJ (cs2cs) and GEOS (shapely), testdata/ref_layers.py.
	checkAgainstGEOS(t, g, dir, ref.Reference)
}

// TestLiveLayersAgainstGEOS re-runs ref_layers.py on a fresh random scene
// and has GEOS validate the written layers (SITECOVER_LIVE=1).
func TestLiveLayersAgainstGEOS(t *testing.T) {
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skip("set SITECOVER_LIVE=1 to check fresh scenes against PROJ and GEOS (needs /usr/bin/python3 with shapely, and cs2cs)")
	}
	base := loadRefLayers(t).Scene
	seed := uint64(time.Now().UnixNano())
	rng := rand.New(rand.NewPCG(seed, 11))
	sc := refScene{Area: base.Area, RangeM: 30 + 60*rng.Float64()}
	lo, hi := base.Area[0][0], base.Area[0][2]
	for range 5 + rng.IntN(20) {
		sc.Sites = append(sc.Sites, [2]float64{lo[0] + (hi[0]-lo[0])*rng.Float64(), lo[1] + (hi[1]-lo[1])*rng.Float64()})
	}
	t.Logf("seed %d: %d sites, range %.2f m", seed, len(sc.Sites), sc.RangeM)
	g := geoSceneFrom(t, sc, nil)
	dir := t.TempDir()
	if _, err := WriteAnalysis(dir, g.an, g.meta, Options{}); err != nil {
		t.Fatal(err)
	}
	scenePath := filepath.Join(t.TempDir(), "scene.json")
	b, _ := json.Marshal(sc)
	os.WriteFile(scenePath, b, 0o644)
	out, err := exec.Command("/usr/bin/python3", filepath.Join("testdata", "ref_layers.py"), "live", scenePath, dir).Output()
	if err != nil {
		if ee, ok := err.(*exec.ExitError); ok {
			t.Fatalf("ref_layers.py: %v\n%s", err, ee.Stderr)
		}
		t.Fatalf("ref_layers.py: %v", err)
	}
	var ref refFigs
	if err := json.Unmarshal(out, &ref); err != nil {
		t.Fatalf("ref_layers.py output: %v\n%s", err, out)
	}
	// Reference: GEOS validity and ring orientation of the written layers.
	for _, p := range ref.Problems {
		t.Error(p)
	}
	if ref.MaxDecimals > 7 {
		t.Errorf("layers have %d decimals", ref.MaxDecimals)
	}
	checkAgainstGEOS(t, g, dir, ref)
}

// appendNum's integer path must print exactly what strconv's shortest
// round-trip formatting prints (reference: strconv.AppendFloat 'f', -1),
// and null for what is not finite.
func TestAppendNumMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	vals := []float64{0, 1, -1, 0.5, -0.5, 1e-7, -1e-7, 12.3456789, -98.9833163, 44.0761164, 179.9999999, -180, 89.9999999,
		99999999.9999999, 1e8, 1e8 + 0.5, 4484124.434, 127106.467, 0.1 + 0.2, math.Pi, 1e300, 5e-324,
		5e-8, -5e-8, 1.5e-7, -2.5e-7, 0.12345675, -0.12345665, math.NaN(), math.Inf(1), math.Inf(-1)}
	for range 200000 {
		v := (rng.Float64()*2 - 1) * math.Pow(10, float64(rng.IntN(10)))
		vals = append(vals, v, round(v, 7), round(v, 3), round(v, rng.IntN(8)))
	}
	for _, v := range vals {
		got := string(appendNum(nil, v))
		want := strconv.FormatFloat(v, 'f', -1, 64)
		if math.IsNaN(v) || math.IsInf(v, 0) {
			want = "null"
		}
		if got != want {
			t.Fatalf("appendNum(%v) = %s, strconv %s", v, got, want)
		}
	}
}

// TestSummaryCapped checks that SummaryCapped caps the long lists at
// SummaryListMax, keeps the totals, and otherwise agrees with Summary.
func TestSummaryCapped(t *testing.T) {
	var sites []orb.Point
	for i := range 40 {
		for j := range 40 {
			sites = append(sites, orb.Point{float64(10*i) + 0.5*float64(j%3), float64(10*j) + 0.5*float64(i%2)})
		}
	}
	a := analyze(t, sites, region(t, square(400)), 3)
	full, capped := Summary(a, Meta{Planar: true}), SummaryCapped(a, Meta{Planar: true})
	for _, c := range []struct {
		name                string
		full, capped, total int
	}{
		{"cells", len(full.Cells), len(capped.Cells), capped.CellsTotal},
		{"gaps", len(full.Gaps), len(capped.Gaps), capped.GapsTotal},
		{"holes", len(full.Holes), len(capped.Holes), capped.HolesTotal},
	} {
		t.Run(c.name, func(t *testing.T) {
			if c.full != c.total || c.capped != min(c.total, SummaryListMax) {
				t.Errorf("full list %d, capped %d, total %d (cap %d)", c.full, c.capped, c.total, SummaryListMax)
			}
		})
	}
	if len(full.Cells) <= SummaryListMax {
		t.Fatalf("only %d cells: the test needs more than %d", len(full.Cells), SummaryListMax)
	}
	// The capped document (built from the first service areas only, its
	// listed points converted one by one) is the full one with its lists
	// cut, entry for entry.
	cut := *full
	cut.Cells = cut.Cells[:min(len(cut.Cells), SummaryListMax)]
	cut.Gaps = cut.Gaps[:min(len(cut.Gaps), SummaryListMax)]
	cut.Holes = cut.Holes[:min(len(cut.Holes), SummaryListMax)]
	cut.Timings, capped.Timings = nil, nil
	want, err1 := json.Marshal(&cut)
	got, err2 := json.Marshal(capped)
	if err1 != nil || err2 != nil || !bytes.Equal(got, want) {
		t.Errorf("capped document differs from the full one cut to %d entries (%v, %v)", SummaryListMax, err1, err2)
	}
}
