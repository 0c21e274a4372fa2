// End-to-end tests of the planning commands (suggest, failures, assign)
// on scenes whose answers are known in closed form — square lattices with
// and without a missing device, derived beside each check from elementary
// geometry — and against brute-force nearest-device searches; plus the
// GeoJSON layers (RFC 7946 order and winding) on the geographic demo
// campus, the demo's planning folders, help and --json.

package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"image"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
)

// cellLatticeCSV is the n×n square lattice of spacing s with devices at cell
// centres ((i+½)s, (j+½)s) of the square [0, ns]², as planar CSV,
// without the devices in skip ([i, j]).
func cellLatticeCSV(n int, s float64, skip ...[2]int) string {
	var b strings.Builder
	b.WriteString("name,x,y\n")
	for j := range n {
		for i := range n {
			if slices.Contains(skip, [2]int{i, j}) {
				continue
			}
			fmt.Fprintf(&b, "L%d-%d,%g,%g\n", i, j, (float64(i)+0.5)*s, (float64(j)+0.5)*s)
		}
	}
	return b.String()
}

// rangeArg formats a range in metres exactly (shortest round trip).
func rangeArg(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// planJSON mirrors the summary.json members of the planning moves.
type planJSON struct {
	Command         string   `json:"command"`
	Move            string   `json:"move"`
	Sites           int      `json:"sites"`
	AreaM2          float64  `json:"area_m2"`
	RangeM          *float64 `json:"range_m"`
	RangeGiven      bool     `json:"range_given"`
	RangeNote       string   `json:"range_note"`
	FullCoverRangeM float64  `json:"full_cover_range_m"`
	CoveredFraction *float64 `json:"covered_fraction"`
	UncoveredAreaM2 *float64 `json:"uncovered_area_m2"`
	Suggestions     *struct {
		Mode      string  `json:"mode"`
		Requested int     `json:"requested"`
		RangeM    float64 `json:"range_m"`
		Added     []struct {
			N               int     `json:"n"`
			Point           point   `json:"point"`
			FullCoverBefore float64 `json:"full_cover_before_m"`
			FullCoverAfter  float64 `json:"full_cover_after_m"`
			UncoveredBefore float64 `json:"uncovered_before_m2"`
			UncoveredAfter  float64 `json:"uncovered_after_m2"`
		} `json:"added"`
		FullCoverBefore float64      `json:"full_cover_range_before_m"`
		FullCoverAfter  float64      `json:"full_cover_range_after_m"`
		CoveredAfter    float64      `json:"covered_fraction_after"`
		UncoveredBefore float64      `json:"uncovered_area_before_m2"`
		UncoveredAfter  float64      `json:"uncovered_area_after_m2"`
		GapsBefore      []summaryGap `json:"gaps_before"`
		GapsAfter       []summaryGap `json:"gaps_after"`
		Reached         *bool        `json:"reached"`
		Method          string       `json:"method"`
		TotalDevices    int          `json:"total_devices"`
		HexEstimate     float64      `json:"hex_estimate"`
		HexDevices      int          `json:"hex_devices"`
		HexRatio        float64      `json:"hex_ratio"`
	} `json:"suggestions"`
	Candidates *struct {
		Count     int `json:"count"`
		Requested int `json:"requested"`
		Picked    []struct {
			Order     int     `json:"order"`
			Candidate int     `json:"candidate"`
			Name      string  `json:"name"`
			Point     point   `json:"point"`
			GainM2    float64 `json:"gain_m2"`
		} `json:"picked"`
		UncoveredBefore float64      `json:"uncovered_area_before_m2"`
		UncoveredAfter  float64      `json:"uncovered_area_after_m2"`
		Complete        bool         `json:"complete"`
		Exhausted       bool         `json:"exhausted"`
		Remaining       []summaryGap `json:"remaining"`
	} `json:"candidates"`
	Failures []struct {
		Rank             int      `json:"rank"`
		Site             int      `json:"site"`
		Name             string   `json:"name"`
		AddedUncoveredM2 float64  `json:"added_uncovered_m2"`
		UncoveredM2      float64  `json:"uncovered_area_m2"`
		ClosingRangeM    *float64 `json:"closing_range_m"`
		DeepestPoint     point    `json:"deepest_point"`
		Backup           int      `json:"backup"`
	} `json:"failures"`
	Survive      *float64 `json:"survive_any_single_failure_m"`
	SurvivePoint point    `json:"survive_point"`
	SurviveSite  *int     `json:"survive_site"`
	Assignment   *struct {
		Points         int      `json:"points"`
		Polygons       int      `json:"polygons"`
		Weighted       bool     `json:"weighted"`
		Served         *int     `json:"served"`
		Unserved       *int     `json:"unserved"`
		ServedWeight   *float64 `json:"served_weight"`
		UnservedWeight *float64 `json:"unserved_weight"`
		Assignments    []struct {
			Point       int     `json:"point"`
			Name        string  `json:"name"`
			Position    point   `json:"position"`
			Device      int     `json:"device"`
			DistanceM   float64 `json:"distance_m"`
			WithinRange *bool   `json:"within_range"`
			Weight      float64 `json:"weight"`
		} `json:"assignments"`
		Load []struct {
			Device int     `json:"device"`
			Count  int     `json:"count"`
			Weight float64 `json:"weight"`
		} `json:"load"`
	} `json:"assignment"`
	Warnings []string           `json:"warnings"`
	Timings  map[string]float64 `json:"timings"`
}

func readPlan(t *testing.T, dir string) *planJSON {
	t.Helper()
	var p planJSON
	loadJSON(t, filepath.Join(dir, "summary.json"), &p)
	return &p
}

// readCSV reads a CSV output file.
func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return rows
}

// checkPNGWidths checks that each PNG among names in dir decodes and has
// the default map width.
func checkPNGWidths(t *testing.T, dir string, names []string) {
	t.Helper()
	for _, name := range names {
		if !strings.HasSuffix(name, ".png") {
			continue
		}
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		cfg, _, err := image.DecodeConfig(f)
		f.Close()
		if err != nil || cfg.Width != report.DefaultMapWidth {
			t.Errorf("%s: %v, width %d", name, err, cfg.Width)
		}
	}
}

// checkFiles checks that dir holds exactly the files of a planning move.
func checkFiles(t *testing.T, dir string, move report.Move, planarOut, maps, gpkg bool) {
	t.Helper()
	want := report.PlanFiles(move, report.Meta{Planar: planarOut}, report.Options{Maps: maps, GeoPackage: gpkg})
	ents, _ := os.ReadDir(dir)
	var got []string
	for _, e := range ents {
		got = append(got, e.Name())
	}
	slices.Sort(got)
	w := slices.Clone(want)
	slices.Sort(w)
	if !slices.Equal(got, w) {
		t.Errorf("%s holds %v, want %v", dir, got, w)
	}
	checkPNGWidths(t, dir, want)
}

func TestSuggestPutsMissingDeviceBack(t *testing.T) {
	// A 6×6 lattice of spacing s = 10 m over [0, 60]² without the device
	// at (2, 3), i.e. at (25, 35). Reference (elementary geometry): the
	// missing spot is s from its four neighbours, the farthest point from
	// every device, so the full-cover range is s; with the device back
	// every cell is a square of side s around its device and the
	// full-cover range is s/√2. At r = s/√2 the four neighbours' disks
	// each cut a circular segment r²·acos((s/2)/r) − (s/2)√(r² − s²/4) =
	// s²(π/8 − 1/4) off the empty cell and the diagonal ones only touch
	// its corners: s²(2 − π/2) stays uncovered.
	const s = 10.0
	r := s / math.Sqrt2
	dir := t.TempDir()
	sites := writeFile(t, dir, "lattice.csv", cellLatticeCSV(6, s, [2]int{2, 3}))
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 60))
	out := filepath.Join(dir, "add")
	res := mustRun(t, "suggest", "--planar", "--sites", sites, "--area", area, "--add", "1", "--range", rangeArg(r), "--out", out)
	checkFiles(t, out, report.MoveAdd, true, true, false)
	p := readPlan(t, out)
	sg := p.Suggestions
	if p.Command != "suggest" || p.Move != "add" || sg == nil || len(sg.Added) != 1 || sg.Requested != 1 {
		t.Fatalf("summary: %+v", p)
	}
	a := sg.Added[0]
	if math.Hypot(a.Point[0]-25, a.Point[1]-35) > 1e-6*s {
		t.Errorf("added device at %v, want the missing spot (25, 35) within %g m", a.Point, 1e-6*s)
	}
	checkNear(t, "full cover before", sg.FullCoverBefore, s, 1e-9)
	checkNear(t, "full cover after", sg.FullCoverAfter, r, 1e-9)
	checkNear(t, "uncovered before", sg.UncoveredBefore, s*s*(2-math.Pi/2), 1e-9)
	checkNear(t, "uncovered after", sg.UncoveredAfter, 0, 1e-9)
	checkNear(t, "existing uncovered (top-level field)", *p.UncoveredAreaM2, s*s*(2-math.Pi/2), 1e-9)
	checkNear(t, "existing full cover (top-level field)", p.FullCoverRangeM, s, 1e-9)
	if len(sg.GapsBefore) != 1 || len(sg.GapsAfter) != 0 || sg.GapsBefore[0].TouchesBoundary {
		t.Errorf("gaps %d inner before, %d after", len(sg.GapsBefore), len(sg.GapsAfter))
	}
	if !strings.Contains(res.stdout, "suggested devices          1 new + 35 existing") || !strings.Contains(res.stdout, "+1  x 25.000 m, y 35.000 m") {
		t.Errorf("stdout:\n%s", res.stdout)
	}
	for _, ph := range []string{"layout", "suggest", "gaps"} {
		if _, ok := p.Timings[ph]; !ok {
			t.Errorf("timings lack %q", ph)
		}
	}

	// Without --range the figures are given at the full-cover range the
	// new layout needs (here s/√2), and the summary says so.
	out = filepath.Join(dir, "add-norange")
	mustRun(t, "suggest", "--planar", "--sites", sites, "--area", area, "--add", "1", "--out", out, "--no-maps")
	checkFiles(t, out, report.MoveAdd, true, false, false)
	p = readPlan(t, out)
	if p.RangeGiven || p.RangeM == nil || !near(*p.RangeM, r, 1e-9) || !strings.Contains(p.RangeNote, "full-cover range") {
		t.Errorf("range %v given %v note %q, want the full-cover range after, %g", p.RangeM, p.RangeGiven, p.RangeNote, r)
	}
	checkNear(t, "covered after, at the full-cover range", p.Suggestions.CoveredAfter, 1, 1e-12)

	// Fewest additions at s/√2: the one device, against the hexagonal
	// estimate area/((3√3/2) r²) = 3600/(75√3) (Kershner 1939).
	out = filepath.Join(dir, "fewest")
	res = mustRun(t, "suggest", "--planar", "--sites", sites, "--area", area, "--range", rangeArg(r), "--out", out, "--no-maps")
	p = readPlan(t, out)
	f := p.Suggestions
	hex := 3600 / (1.5 * math.Sqrt(3) * r * r)
	if p.Move != "fewest" || len(f.Added) != 1 || f.Reached == nil || !*f.Reached || f.TotalDevices != 36 || f.HexDevices != 28 {
		t.Fatalf("fewest: %+v", f)
	}
	checkNear(t, "hex estimate", f.HexEstimate, hex, 1e-9)
	checkNear(t, "hex ratio", f.HexRatio, 36/hex, 1e-9)
	if math.Hypot(f.Added[0].Point[0]-25, f.Added[0].Point[1]-35) > 1e-6*s {
		t.Errorf("fewest added %v, want (25, 35)", f.Added[0].Point)
	}
	if !strings.Contains(res.stdout, "fewest additions           1 (") || !strings.Contains(res.stdout, "hexagonal estimate         27.7 devices") {
		t.Errorf("stdout:\n%s", res.stdout)
	}
}

func TestFailuresOnLattice(t *testing.T) {
	// A 5×5 lattice of spacing s = 10 m over [0, 50]², every cell a square
	// of side s around its device, at r = s/√2 (full cover exactly).
	// Reference (elementary geometry): when a device fails, each
	// remaining neighbour at distance s covers a circular segment
	// s²(π/8 − 1/4) of its cell and the diagonal ones only touch the
	// corners, so an interior device (4 neighbours) leaves s²(2 − π/2)
	// uncovered, an edge device (3) s²(7/4 − 3π/8), a corner device (2)
	// s²(3/2 − π/4). The deepest new gap: an interior cell's centre is s
	// from the four neighbours; an edge cell's outer edge midpoint is
	// √(s² + s²/4) = (√5/2)s from the two beside it; a corner cell's area
	// corner is √((3s/2)² + (s/2)²) = (√10/2)s from the two nearest.
	// The range surviving any single failure is the largest of these,
	// (√10/2)s, at a corner of the area.
	const s = 10.0
	r := s / math.Sqrt2
	dir := t.TempDir()
	sites := writeFile(t, dir, "lattice.csv", cellLatticeCSV(5, s))
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 50))
	out := filepath.Join(dir, "failures")
	res := mustRun(t, "failures", "--planar", "--sites", sites, "--area", area, "--range", rangeArg(r), "--out", out)
	checkFiles(t, out, report.MoveFailures, true, true, false)
	p := readPlan(t, out)
	if p.Survive == nil || len(p.Failures) != 25 {
		t.Fatalf("survive %v, %d failures", p.Survive, len(p.Failures))
	}
	checkNear(t, "survive any single failure", *p.Survive, math.Sqrt(10)/2*s, 1e-9)
	corner := func(q point) bool {
		return (near(q[0], 0, 1e-9) || near(q[0], 50, 1e-9)) && (near(q[1], 0, 1e-9) || near(q[1], 50, 1e-9))
	}
	if !corner(p.SurvivePoint) || p.SurviveSite == nil || !slices.Contains([]int{0, 4, 20, 24}, *p.SurviveSite) {
		t.Errorf("survive point %v site %v, want an area corner and a corner device", p.SurvivePoint, p.SurviveSite)
	}
	kind := func(site int) int { // 2 corner, 1 edge, 0 interior
		i, j := site%5, site/5
		k := 0
		if i == 0 || i == 4 {
			k++
		}
		if j == 0 || j == 4 {
			k++
		}
		return k
	}
	loss := [3]float64{s * s * (2 - math.Pi/2), s * s * (7.0/4 - 3*math.Pi/8), s * s * (1.5 - math.Pi/4)}
	closing := [3]float64{s, math.Sqrt(5) / 2 * s, math.Sqrt(10) / 2 * s}
	for k, fl := range p.Failures {
		want := 0 // ranked: 4 corners, 12 edges, 9 interior
		switch {
		case k < 4:
			want = 2
		case k < 16:
			want = 1
		}
		if kind(fl.Site) != want || fl.Rank != k+1 {
			t.Errorf("rank %d: site %d of kind %d, want kind %d", fl.Rank, fl.Site, kind(fl.Site), want)
			continue
		}
		checkNear(t, fmt.Sprintf("loss of site %d", fl.Site), fl.AddedUncoveredM2, loss[want], 1e-9)
		checkNear(t, fmt.Sprintf("uncovered without site %d", fl.Site), fl.UncoveredM2, loss[want], 1e-9)
		checkNear(t, fmt.Sprintf("closing range of site %d", fl.Site), *fl.ClosingRangeM, closing[want], 1e-9)
		if fl.Backup < 0 || fl.Backup == fl.Site {
			t.Errorf("site %d: backup %d", fl.Site, fl.Backup)
		}
	}
	// Reference: brute force over a 0.25 m sample grid of the area (corners
	// included): the largest distance to the second-nearest device.
	var d2max float64
	for yi := 0; yi <= 200; yi++ {
		for xi := 0; xi <= 200; xi++ {
			x, y := float64(xi)*0.25, float64(yi)*0.25
			d1, d2 := math.Inf(1), math.Inf(1)
			for j := range 5 {
				for i := range 5 {
					d := math.Hypot(x-(float64(i)+0.5)*s, y-(float64(j)+0.5)*s)
					if d < d1 {
						d1, d2 = d, d1
					} else if d < d2 {
						d2 = d
					}
				}
			}
			d2max = math.Max(d2max, d2)
		}
	}
	checkNear(t, "survive range vs brute-force sample", *p.Survive, d2max, 1e-9)
	if !strings.Contains(res.stdout, "survive any single failure 15.81 m") {
		t.Errorf("stdout:\n%s", res.stdout)
	}
	rows := readCSV(t, filepath.Join(out, report.FileFailuresCSV))
	if len(rows) != 26 || rows[0][0] != "rank" || rows[0][len(rows[0])-2] != "deepest_x" {
		t.Errorf("failures.csv: %d rows, header %v", len(rows), rows[0])
	}
	var fc struct {
		Features []struct {
			Geometry struct {
				Type        string    `json:"type"`
				Coordinates []float64 `json:"coordinates"`
			} `json:"geometry"`
			Properties struct {
				Rank int `json:"rank"`
				Site int `json:"site"`
			} `json:"properties"`
		} `json:"features"`
	}
	loadJSON(t, filepath.Join(out, report.LayerFile(report.FileFailures, true)), &fc)
	if len(fc.Features) != 25 {
		t.Fatalf("failures layer: %d features", len(fc.Features))
	}
	for k, f := range fc.Features {
		i, j := f.Properties.Site%5, f.Properties.Site/5
		c := f.Geometry.Coordinates
		if f.Geometry.Type != "Point" || f.Properties.Rank != k+1 || c[0] != (float64(i)+0.5)*s || c[1] != (float64(j)+0.5)*s {
			t.Errorf("failures layer feature %d: %+v", k, f)
		}
	}
}

func TestAssignAgainstBruteForce(t *testing.T) {
	// Random devices and weighted demand points in a 1 km square.
	// Reference: brute-force nearest device (exact comparisons of
	// math.Hypot distances; ties have probability zero here).
	rng := rand.New(rand.NewPCG(5, 17))
	dir := t.TempDir()
	const n, m, r = 40, 600, 120.0
	var sb, pb strings.Builder
	sb.WriteString("name,x,y\n")
	sites := make([][2]float64, n)
	for i := range sites {
		sites[i] = [2]float64{1000 * rng.Float64(), 1000 * rng.Float64()}
		fmt.Fprintf(&sb, "D%d,%s,%s\n", i, rangeArg(sites[i][0]), rangeArg(sites[i][1]))
	}
	pb.WriteString("id;x;y;weight\n") // semicolons and a decimal comma, like --sites
	pts := make([][2]float64, m)
	wts := make([]float64, m)
	for i := range pts {
		pts[i] = [2]float64{1100*rng.Float64() - 50, 1100*rng.Float64() - 50}
		wts[i] = float64(rng.IntN(40)) / 4
		fmt.Fprintf(&pb, "P%d;%s;%s;%s\n", i, rangeArg(pts[i][0]), rangeArg(pts[i][1]), strings.Replace(rangeArg(wts[i]), ".", ",", 1))
	}
	sf := writeFile(t, dir, "devices.csv", sb.String())
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 1000))
	pf := writeFile(t, dir, "points.csv", pb.String())
	out := filepath.Join(dir, "assign")
	mustRun(t, "assign", "--planar", "--sites", sf, "--area", area, "--points", pf, "--range", rangeArg(r), "--out", out)
	checkFiles(t, out, report.MoveAssign, true, true, false)
	rows := readCSV(t, filepath.Join(out, report.FileAssignmentCSV))
	if strings.Join(rows[0], ",") != "point,name,device,device_name,distance_m,within_range,weight,x,y" || len(rows) != m+1 {
		t.Fatalf("assignment.csv: %d rows, header %v", len(rows), rows[0])
	}
	count := make([]int, n)
	weight := make([]float64, n)
	served := 0
	for i, q := range pts {
		best, bd := -1, math.Inf(1)
		for k, s := range sites {
			if d := math.Hypot(q[0]-s[0], q[1]-s[1]); d < bd {
				best, bd = k, d
			}
		}
		row := rows[i+1]
		dist, _ := strconv.ParseFloat(row[4], 64)
		w, _ := strconv.ParseFloat(row[6], 64)
		if row[0] != strconv.Itoa(i) || row[1] != fmt.Sprintf("P%d", i) || row[2] != strconv.Itoa(best) || row[3] != fmt.Sprintf("D%d", best) ||
			!near(dist, bd, 1e-9) || row[5] != strconv.FormatBool(bd <= r) || w != wts[i] {
			t.Errorf("point %d: %v; brute force device %d at %.9g m, weight %g", i, row, best, bd, wts[i])
		}
		count[best]++
		weight[best] += wts[i]
		if bd <= r {
			served++
		}
	}
	load := readCSV(t, filepath.Join(out, report.FileDeviceLoadCSV))
	if len(load) != n+1 {
		t.Fatalf("device-load.csv: %d rows", len(load))
	}
	for k := range n {
		c, _ := strconv.Atoi(load[k+1][2])
		w, _ := strconv.ParseFloat(load[k+1][3], 64)
		if c != count[k] || !near(w, weight[k], 1e-9) {
			t.Errorf("device %d: load %d / %g, brute force %d / %g", k, c, w, count[k], weight[k])
		}
	}
	p := readPlan(t, out)
	a := p.Assignment
	if a == nil || !a.Weighted || a.Points != m || *a.Served != served || *a.Unserved != m-served || len(a.Load) != n {
		t.Errorf("summary assignment: %+v", a)
	}

	// Without --range: distances only, within_range null.
	out = filepath.Join(dir, "norange")
	mustRun(t, "assign", "--planar", "--sites", sf, "--area", area, "--points", pf, "--out", out, "--no-maps")
	p = readPlan(t, out)
	if p.RangeM != nil || p.CoveredFraction != nil || p.Assignment.Served != nil || p.Assignment.Assignments[0].WithinRange != nil {
		t.Errorf("without a range: range %v covered %v served %v", p.RangeM, p.CoveredFraction, p.Assignment.Served)
	}
}

func TestAssignPolygons(t *testing.T) {
	// Buildings as polygons, placed at a point on them. Reference
	// (elementary geometry): a rectangle's centroid is its centre; the
	// U-shaped outline below (a 20×20 square less a 10×15 notch) has area
	// 250 and centroid x = 10, y = (400·10 − 150·12.5)/250 = 8.5, in the
	// notch, outside the polygon, so the point is the middle of the
	// longest interior run of the line y = 8.5: x ∈ [0, 5] or [15, 20],
	// equally long, the first kept, x = 2.5. A MultiPolygon is placed on
	// its largest part.
	dir := t.TempDir()
	sites := writeFile(t, dir, "s.csv", "name,x,y\nA,10,10\nB,90,90\n")
	area := writeFile(t, dir, "a.geojson", squareGeoJSON(0, 0, 100))
	pts := writeFile(t, dir, "b.geojson", `{"type":"FeatureCollection","features":[
	 {"type":"Feature","properties":{"name":"Hall","weight":40},"geometry":{"type":"Polygon","coordinates":[[[60,60],[80,60],[80,70],[60,70],[60,60]]]}},
	 {"type":"Feature","properties":{"name":"Works","weight":null},"geometry":{"type":"Polygon","coordinates":[[[0,0],[20,0],[20,20],[15,20],[15,5],[5,5],[5,20],[0,20],[0,0]]]}},
	 {"type":"Feature","properties":{"name":"Yards"},"geometry":{"type":"MultiPolygon","coordinates":[[[[40,40],[42,40],[42,42],[40,42],[40,40]]],[[[30,80],[50,80],[50,90],[30,90],[30,80]]]]}},
	 {"type":"Feature","properties":{"name":"Kiosk","weight":2.5},"geometry":{"type":"Point","coordinates":[95,95]}}]}`)
	out := filepath.Join(dir, "out")
	mustRun(t, "assign", "--planar", "--sites", sites, "--area", area, "--points", pts, "--range", "30", "--out", out)
	p := readPlan(t, out)
	a := p.Assignment
	if a.Points != 4 || a.Polygons != 3 || !a.Weighted {
		t.Fatalf("assignment: %+v", a)
	}
	want := []point{{70, 65}, {2.5, 8.5}, {40, 85}, {95, 95}}
	wantDev := []int{1, 0, 1, 1}
	wantW := []float64{40, 1, 1, 2.5}
	for i, e := range a.Assignments {
		if !near(e.Position[0], want[i][0], 1e-9) || !near(e.Position[1], want[i][1], 1e-9) || e.Device != wantDev[i] || e.Weight != wantW[i] {
			t.Errorf("item %d %s: at %v device %d weight %g, want %v, %d, %g", i, e.Name, e.Position, e.Device, e.Weight, want[i], wantDev[i], wantW[i])
		}
	}
}

func TestSuggestCandidates(t *testing.T) {
	const s = 10.0
	r := s / math.Sqrt2
	dir := t.TempDir()
	sites := writeFile(t, dir, "lattice.csv", cellLatticeCSV(6, s, [2]int{2, 3}))
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 60))
	// The missing spot among decoys: it alone closes the gap of
	// s²(2 − π/2) (see TestSuggestPutsMissingDeviceBack).
	cands := writeFile(t, dir, "spots.csv", "name,x,y\nfar pole,200,200\nlamp,25,35\nroof,5,5\n")
	out := filepath.Join(dir, "cand")
	res := mustRun(t, "suggest", "--planar", "--sites", sites, "--area", area, "--candidates", cands, "--range", rangeArg(r), "--out", out)
	checkFiles(t, out, report.MoveCandidates, true, true, false)
	p := readPlan(t, out)
	c := p.Candidates
	if c == nil || c.Count != 3 || len(c.Picked) != 1 || c.Picked[0].Candidate != 1 || c.Picked[0].Name != "lamp" || !c.Complete || len(c.Remaining) != 0 {
		t.Fatalf("candidates: %+v", c)
	}
	checkNear(t, "gain of the lamp", c.Picked[0].GainM2, s*s*(2-math.Pi/2), 1e-9)
	if !strings.Contains(res.stdout, "full cover: no gap remains") {
		t.Errorf("stdout:\n%s", res.stdout)
	}

	// Only decoys: full cover cannot be reached, and what stays uncovered
	// is listed (its area is the whole gap).
	decoys := writeFile(t, dir, "decoys.geojson", `{"type":"FeatureCollection","features":[
	 {"type":"Feature","properties":{"name":"far pole"},"geometry":{"type":"Point","coordinates":[200,200]}},
	 {"type":"Feature","properties":{"name":"roof"},"geometry":{"type":"MultiPoint","coordinates":[[5,5],[55,5]]}}]}`)
	out = filepath.Join(dir, "decoys")
	res = mustRun(t, "suggest", "--planar", "--sites", sites, "--area", area, "--candidates", decoys, "--range", rangeArg(r), "--out", out)
	p = readPlan(t, out)
	c = p.Candidates
	if c.Complete || !c.Exhausted || len(c.Picked) != 0 || len(c.Remaining) != 1 || c.Count != 3 {
		t.Fatalf("decoys: %+v", c)
	}
	checkNear(t, "remaining gap", c.Remaining[0].AreaM2, s*s*(2-math.Pi/2), 1e-9)
	checkNear(t, "uncovered after", c.UncoveredAfter, s*s*(2-math.Pi/2), 1e-9)
	txt, _ := os.ReadFile(filepath.Join(out, "report.txt"))
	for _, w := range []string{res.stdout, string(txt)} {
		if !strings.Contains(w, "FULL COVER CANNOT BE REACHED") {
			t.Errorf("no unreachable-cover message in:\n%s", w)
		}
	}

	// --add K picks K: at 6 m the lamp (its disk lies in its empty cell,
	// 36π m² less the neighbours' overlap), then the mast at a lattice
	// corner (the four corner gaps there); the far pole adds nothing.
	more := writeFile(t, dir, "more.csv", "name,x,y\nfar pole,200,200\nlamp,25,35\nmast,10,10\n")
	out = filepath.Join(dir, "k")
	mustRun(t, "suggest", "--planar", "--sites", sites, "--area", area, "--candidates", more, "--range", "6", "--add", "2", "--out", out, "--no-maps")
	p = readPlan(t, out)
	if c := p.Candidates; c.Requested != 2 || len(c.Picked) != 2 || c.Picked[0].Candidate != 1 || c.Picked[1].Candidate != 2 || c.Exhausted {
		t.Errorf("--add 2: requested %d, picked %+v, exhausted %v", c.Requested, c.Picked, c.Exhausted)
	}
}

// checkPointLayer checks that every Point and LineString position of a
// GeoJSON layer is [lon, lat] on the demo campus, and counts features.
func checkPointLayer(t *testing.T, path string, want int) {
	t.Helper()
	var fc geoLayer
	loadJSON(t, path, &fc)
	if len(fc.Features) != want {
		t.Errorf("%s: %d features, want %d", filepath.Base(path), len(fc.Features), want)
	}
	for i, f := range fc.Features {
		var pos [][]float64
		switch f.Geometry.Type {
		case "Point":
			var p []float64
			json.Unmarshal(f.Geometry.Coordinates, &p)
			pos = [][]float64{p}
		case "LineString":
			json.Unmarshal(f.Geometry.Coordinates, &pos)
		default:
			t.Fatalf("%s feature %d: geometry %s", filepath.Base(path), i, f.Geometry.Type)
		}
		for _, p := range pos {
			if len(p) != 2 || !(p[0] > -99.88 && p[0] < -99.84 && p[1] > 44.37 && p[1] < 44.39) {
				t.Fatalf("%s feature %d: position %v is not [lon, lat] on the campus", filepath.Base(path), i, p)
			}
		}
	}
}

func TestDemoWritesPlans(t *testing.T) {
	// The demo runs every planning move on the campus into sub-folders;
	// the GeoJSON layers are RFC 7946 ([lon, lat], §3.1.1; exteriors
	// counter-clockwise, §3.1.6).
	out := filepath.Join(t.TempDir(), "campus")
	res := mustRun(t, "demo", "--out", out)
	for _, dp := range demoPlans(examplesites.PlannedRange) {
		dir := filepath.Join(out, dp.dir)
		checkFiles(t, dir, dp.ps.move, false, true, true) // the demo writes the GeoPackage
		p := readPlan(t, dir)
		if p.Move != string(dp.ps.move) || p.Sites != 40 || p.RangeM == nil || *p.RangeM != examplesites.PlannedRange {
			t.Errorf("%s: move %q sites %d range %v", dp.dir, p.Move, p.Sites, p.RangeM)
		}
		if !strings.Contains(res.stdout, "Wrote") || !strings.Contains(res.stdout, dir) {
			t.Errorf("stdout does not list %s", dir)
		}
		txt, _ := os.ReadFile(filepath.Join(dir, "report.txt"))
		if !bytes.Contains(txt, []byte(report.Cautions())) {
			t.Errorf("%s/report.txt lacks the cautions", dp.dir)
		}
		checkPointLayer(t, filepath.Join(dir, report.FileSites), 40)
		switch dp.ps.move {
		case report.MoveAdd, report.MoveFewest:
			s := p.Suggestions
			checkPointLayer(t, filepath.Join(dir, report.FileProposed), len(s.Added))
			checkLayer(t, filepath.Join(dir, report.FileGapsBefore), len(s.GapsBefore))
			checkLayer(t, filepath.Join(dir, report.FileGapsAfter), len(s.GapsAfter))
			if len(s.GapsBefore) != 10 || s.FullCoverAfter >= s.FullCoverBefore {
				t.Errorf("%s: %d gaps before, full cover %g -> %g", dp.dir, len(s.GapsBefore), s.FullCoverBefore, s.FullCoverAfter)
			}
			if dp.ps.move == report.MoveAdd && len(s.Added) != demoAdd {
				t.Errorf("%s: %d added", dp.dir, len(s.Added))
			}
			if dp.ps.move == report.MoveFewest && (s.Reached == nil || !*s.Reached || len(s.GapsAfter) != 0) {
				t.Errorf("%s: not reached", dp.dir)
			}
		case report.MoveCandidates:
			c := p.Candidates
			checkPointLayer(t, filepath.Join(dir, report.FileCandidates), c.Count)
			checkLayer(t, filepath.Join(dir, report.FileGapsAfter), len(c.Remaining))
			// The invented spots cannot close the gap in the south-east
			// corner: the demo shows the unreachable case.
			if c.Count != 22 || c.Complete || !c.Exhausted || len(c.Remaining) == 0 {
				t.Errorf("candidates: %d spots, complete %v, %d left", c.Count, c.Complete, len(c.Remaining))
			}
		case report.MoveFailures:
			checkPointLayer(t, filepath.Join(dir, report.FileFailures), 40)
			if p.Survive == nil || *p.Survive <= p.FullCoverRangeM || len(p.Failures) != 40 {
				t.Errorf("failures: survive %v, full cover %g", p.Survive, p.FullCoverRangeM)
			}
		case report.MoveAssign:
			checkPointLayer(t, filepath.Join(dir, report.FileAssignment), 11)
			checkPointLayer(t, filepath.Join(dir, report.FileDeviceLoad), 40)
			if p.Assignment.Points != 11 {
				t.Errorf("assign: %d items", p.Assignment.Points)
			}
		}
	}
	// --no-plans writes the analysis only.
	out2 := filepath.Join(t.TempDir(), "only")
	mustRun(t, "demo", "--out", out2, "--no-plans", "--no-maps")
	if _, err := os.Stat(filepath.Join(out2, "failures")); err == nil {
		t.Error("--no-plans wrote the planning folders")
	}
}

func TestPlanJSONAndHelp(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "lattice.csv", cellLatticeCSV(4, 10))
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 40))
	out := filepath.Join(dir, "f")
	res := mustRun(t, "failures", "--planar", "--sites", sites, "--area", area, "--range", "8", "--out", out, "--json", "--no-maps")
	b, _ := os.ReadFile(filepath.Join(out, "summary.json"))
	if !bytes.Equal(b, []byte(res.stdout)) || !json.Valid(b) {
		t.Error("--json stdout differs from summary.json")
	}
	for _, cmd := range []string{"suggest", "failures", "assign"} {
		r := mustRun(t, cmd, "--help")
		if !strings.Contains(r.stdout, "Examples:") || !strings.Contains(r.stdout, "sitecover "+cmd+" ") || !strings.Contains(r.stdout, report.Cautions()) {
			t.Errorf("%s --help lacks examples or cautions:\n%s", cmd, r.stdout)
		}
		if !strings.Contains(r.stdout, filepath.Join("sitecover-report", cmd)) {
			t.Errorf("%s --help does not show its default folder", cmd)
		}
	}
}

func TestPlanBadInput(t *testing.T) {
	dir := t.TempDir()
	w := func(name, content string) string { return writeFile(t, dir, name, content) }
	sites := w("s.csv", cellLatticeCSV(3, 10))
	area := w("a.geojson", squareGeoJSON(0, 0, 30))
	out := filepath.Join(dir, "out")
	base := func(cmd string, extra ...string) []string {
		return append([]string{cmd, "--planar", "--sites", sites, "--area", area, "--out", out}, extra...)
	}
	negWeight := w("neg.csv", "x,y,weight\n1,1,3\n2,2,-2\n")
	wordWeight := w("word.csv", "x,y,weight\n1,1,heavy\n")
	emptyWeight := w("emptyw.csv", "x,y,weight\n1,1,2\n2,2,\n")
	strWeight := w("strw.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"weight":"3"},"geometry":{"type":"Point","coordinates":[1,1]}}]}`)
	negWeightJSON := w("negw.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[1,1]}},{"type":"Feature","properties":{"weight":-1},"geometry":{"type":"Point","coordinates":[2,1]}}]}`)
	lineDemand := w("line.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"LineString","coordinates":[[1,1],[2,2]]}}]}`)
	flatDemand := w("flat.geojson", `{"type":"Feature","properties":{"name":"wall"},"geometry":{"type":"Polygon","coordinates":[[[1,1],[2,2],[3,3],[1,1]]]}}`)
	polyCands := w("polys.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[1,1]}},{"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]]}}]}`)
	emptyCands := w("emptyc.geojson", `{"type":"FeatureCollection","features":[]}`)
	headerCands := w("headerc.csv", "x,y\n")
	latCands := w("latc.csv", "lat,lon\n44,-99\n95,-99\n")
	nanCands := w("nanc.csv", "x,y\n1,NaN\n")
	geoSites := w("geo.csv", "lat,lon\n44,-99\n44.001,-99\n44,-99.001\n")

	cases := []failureCase{
		// assign
		{"assign without --points", base("assign", "--range", "5"), 2, []string{"required flag --points is missing"}},
		{"assign missing points file", base("assign", "--points", filepath.Join(dir, "nope.csv")), 1, []string{"nope.csv: no such file (given to --points)"}},
		{"negative weight", base("assign", "--points", negWeight), 1, []string{"neg.csv line 3: weight -2 is negative"}},
		{"weight not a number", base("assign", "--points", wordWeight), 1, []string{`word.csv line 2: weight "heavy" is not a number`}},
		{"empty weight", base("assign", "--points", emptyWeight), 1, []string{"emptyw.csv line 3: weight is empty"}},
		{"weight as a string", base("assign", "--points", strWeight), 1, []string{`strw.geojson feature 0: property "weight" must be a number ≥ 0, got "3"`}},
		{"negative weight property", base("assign", "--points", negWeightJSON), 1, []string{`negw.geojson feature 1: property "weight": weight -1 is negative`}},
		{"line as demand", base("assign", "--points", lineDemand), 1, []string{"line.geojson feature 0: geometry type LineString, expected Point, MultiPoint, Polygon or MultiPolygon"}},
		{"zero-area building", base("assign", "--points", flatDemand), 1, []string{"flat.geojson feature 0", "zero area", "building outline"}},
		{"assign bad range", base("assign", "--points", negWeight, "--range", "far"), 1, []string{`--range "far": not a number`}},
		{"lat/lon demand with --planar", base("assign", "--points", latCands), 1, []string{"latc.csv line 1: --planar needs x and y columns", "drop --planar"}},
		// suggest
		{"suggest without a mode", base("suggest"), 2, []string{"suggest needs --add K", "--range", "--candidates"}},
		{"--add 0", base("suggest", "--add", "0"), 1, []string{"--add 0: must be a whole number of devices from 1"}},
		{"--add negative", base("suggest", "--add", "-3", "--range", "5"), 1, []string{"--add -3: must be a whole number"}},
		{"--add not a number", base("suggest", "--add", "two"), 2, []string{"--add", "suggest --help"}},
		{"--add too many", base("suggest", "--add", "2000000"), 1, []string{"--add 2000000"}},
		{"suggest bad range", base("suggest", "--range", "-1km"), 1, []string{`--range "-1km": must be greater than 0`}},
		{"suggest missing --sites", []string{"suggest", "--add", "1"}, 2, []string{"required flag --sites is missing"}},
		{"candidates without range", base("suggest", "--candidates", latCands), 2, []string{"--candidates needs --range"}},
		{"candidates file missing", base("suggest", "--candidates", filepath.Join(dir, "none.geojson"), "--range", "5"), 1, []string{"none.geojson: no such file (given to --candidates)"}},
		{"candidate polygon", base("suggest", "--candidates", polyCands, "--range", "5"), 1, []string{"polys.geojson feature 1: geometry type Polygon, expected Point or MultiPoint (candidate spots are points)"}},
		{"no candidates", base("suggest", "--candidates", emptyCands, "--range", "5"), 1, []string{"emptyc.geojson: no candidate spots"}},
		{"candidates header only", base("suggest", "--candidates", headerCands, "--range", "5"), 1, []string{"headerc.csv: no candidate spots (a header but no data lines)"}},
		{"candidate NaN", base("suggest", "--candidates", nanCands, "--range", "5"), 1, []string{"nanc.csv line 2: y is NaN"}},
		{"candidate latitude", []string{"suggest", "--sites", geoSites, "--candidates", latCands, "--range", "50", "--out", out}, 1, []string{"latc.csv line 3: latitude 95 is outside -90..90"}},
		{"suggest extra argument", base("suggest", "--add", "1", "more"), 2, []string{`unexpected argument "more"`}},
		// failures
		{"failures without --range", base("failures"), 2, []string{"required flag --range is missing"}},
		{"failures range zero", base("failures", "--range", "0"), 1, []string{`--range "0": must be greater than 0`}},
		{"failures range column zero", []string{"failures", "--planar", "--sites", w("rz.csv", "x,y,range\n1,1,5m\n20,1,0\n10,20,5\n"), "--area", area, "--out", out}, 1, []string{`rz.csv line 3: range "0": must be greater than 0`}},
		{"assign range column bad unit", []string{"assign", "--planar", "--sites", w("ru.csv", "x,y,range\n1,1,5m\n20,1,5 parsecs\n10,20,5\n"), "--points", negWeight, "--area", area, "--out", out}, 1, []string{"ru.csv line 3", "range"}},
		{"failures type without range", []string{"failures", "--planar", "--sites", w("tt.csv", "x,y,type\n1,1,a\n20,1,b\n10,20,a\n"), "--type-range", "a=5m", "--area", area, "--out", out}, 1, []string{"tt.csv line 3", `"b"`}},
		{"failures unknown flag", base("failures", "--range", "5", "--add", "1"), 2, []string{"unknown flag: --add"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			checkFailure(t, runCLI(t, c.args...), c.code, c.want)
		})
	}

	// The demand file is never overwritten, even when it bears an output
	// name in the output folder.
	odir := filepath.Join(dir, "same")
	demand := writeFile(t, odir, "assignment.csv", "x,y\n1,1\n")
	r := runCLI(t, "assign", "--planar", "--sites", sites, "--area", area, "--points", demand, "--out", odir)
	b, _ := os.ReadFile(demand)
	if r.code != 1 || !strings.Contains(r.stderr, "overwrite") || string(b) != "x,y\n1,1\n" {
		t.Errorf("overwrite: exit %d, %q, file %q", r.code, r.stderr, b)
	}
}

// planRangesJSON mirrors the summary.json members of the planning moves
// with per-device ranges.
type planRangesJSON struct {
	RangeM      *float64            `json:"range_m"`
	FullCoverM  *float64            `json:"full_cover_range_m"`
	Uncovered   *float64            `json:"uncovered_area_m2"`
	RangeGroups []report.RangeGroup `json:"range_groups"`
	FullCover   []report.RangeGroup `json:"full_cover_ranges"`
	Hidden      []int               `json:"hidden"`
	Survive     []report.RangeGroup `json:"survive_any_single_failure_ranges"`
	SurviveM    *float64            `json:"survive_any_single_failure_m"`
	Failures    []struct {
		Site    int      `json:"site"`
		Added   float64  `json:"added_uncovered_m2"`
		Hidden  bool     `json:"hidden"`
		RangeM  *float64 `json:"range_m"`
		Closing *float64 `json:"closing_range_m"`
		Backup  int      `json:"backup"`
	} `json:"failures"`
	Assignment *struct {
		Served      *int `json:"served"`
		Assignments []struct {
			Device int   `json:"device"`
			Within *bool `json:"within_range"`
		} `json:"assignments"`
		Load []struct {
			Device int      `json:"device"`
			Count  int      `json:"count"`
			RangeM *float64 `json:"range_m"`
			Hidden bool     `json:"hidden"`
		} `json:"load"`
	} `json:"assignment"`
}

// TestPlanRangesCLI: failures and assign with a range column and with a
// type column and --type-range (gateway g1 150 m; sensors s1, s2 40 m; s3
// inside g1's disk, hidden), and suggest refusing them.
func TestPlanRangesCLI(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	mixed := writeFile(t, dir, "mixed.csv", mixedCSV)
	typed := writeFile(t, dir, "typed.csv", "name,x,y,type\ng1,0,0,gateway\ns1,200,0,sensor\ns2,100,120,sensor\ns3,20,10,sensor\n")
	// Demand: (190, 0) lies in s1's power cell (power −1500 against g1's
	// 13600) and its disk; (100, 0) in g1's (−12500 against s1's 8400);
	// (30, 10), next to the hidden s3, goes to g1 (hidden devices serve
	// nothing); (100, 170) is reached by no device and lies in s2's power
	// cell (900 against g1's 16400).
	pts := writeFile(t, dir, "pts.csv", "name,x,y\na,190,0\nb,100,0\nc,30,10\nd,100,170\n")
	wantDev := []int{1, 0, 0, 2}
	wantIn := []bool{true, true, true, false}
	for _, c := range []struct {
		name  string
		sites []string
	}{
		{"range column", []string{"--sites", mixed}},
		{"type range", []string{"--sites", typed, "--type-range", "gateway=150m", "--type-range", "sensor=40m"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-"))
			r := mustRun(t, append(append([]string{"failures", "--planar", "--area", area}, c.sites...), "--out", out+"-f")...)
			for _, w := range []string{"survive any single failure", "gateway (150 m)", "sensor (40 m)", "redundant (hidden)         s3", "hidden: costs nothing"} {
				if !strings.Contains(r.stdout, w) {
					t.Errorf("failures stdout lacks %q:\n%s", w, r.stdout)
				}
			}
			var f planRangesJSON
			b, err := os.ReadFile(filepath.Join(out+"-f", "summary.json"))
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(b, &f); err != nil {
				t.Fatal(err)
			}
			if f.RangeM != nil || f.FullCoverM != nil || f.SurviveM != nil || !slices.Equal(f.Hidden, []int{3}) || len(f.Survive) != 2 || len(f.RangeGroups) != 2 {
				t.Fatalf("summary: range %v full cover %v survive %v hidden %v groups %v / %v", f.RangeM, f.FullCoverM, f.SurviveM, f.Hidden, f.RangeGroups, f.Survive)
			}
			// Uniform power growth: both groups grow r² by the same amount.
			g, s := f.Survive[0], f.Survive[1]
			if g.Type != "gateway" || s.Type != "sensor" || !near(g.RangeM*g.RangeM-150*150, s.RangeM*s.RangeM-40*40, 1e-9) || g.RangeM <= 150 {
				t.Errorf("survive ranges %+v", f.Survive)
			}
			for _, d := range f.Failures {
				if d.RangeM == nil || (d.Site == 0) != (*d.RangeM == 150) || d.Hidden != (d.Site == 3) || d.Hidden && d.Added != 0 {
					t.Errorf("failure %+v", d)
				}
			}
			text, _ := os.ReadFile(filepath.Join(out+"-f", "report.txt"))
			if !strings.Contains(string(text), "every device's r² grows by the same amount") {
				t.Errorf("report.txt lacks the meaning of the survive ranges")
			}
			rows := readCSV(t, filepath.Join(out+"-f", report.FileFailuresCSV))
			if rows[0][len(rows[0])-1] != "hidden" {
				t.Errorf("failures.csv head %v", rows[0])
			}

			r = mustRun(t, append(append([]string{"assign", "--planar", "--area", area, "--points", pts}, c.sites...), "--out", out+"-a")...)
			if !strings.Contains(r.stdout, "within reach               3 of 4") {
				t.Errorf("assign stdout:\n%s", r.stdout)
			}
			var a planRangesJSON
			b, _ = os.ReadFile(filepath.Join(out+"-a", "summary.json"))
			if err := json.Unmarshal(b, &a); err != nil {
				t.Fatal(err)
			}
			for i, e := range a.Assignment.Assignments {
				if e.Device != wantDev[i] || e.Within == nil || *e.Within != wantIn[i] {
					t.Errorf("item %d: device %d within %v, want %d %v", i, e.Device, e.Within, wantDev[i], wantIn[i])
				}
			}
			if ld := a.Assignment.Load[3]; !ld.Hidden || ld.Count != 0 || ld.RangeM == nil || *ld.RangeM != 40 {
				t.Errorf("hidden device load %+v", ld)
			}
			checkFiles(t, out+"-a", report.MoveAssign, true, true, false)
		})
	}
}

// TestSuggestRangesCLI: suggest with per-device ranges: --add, the fewest
// additions and candidate spots, the added devices' range from --range or
// from --new-type in the type table; and a common-range site with added
// devices of another type.
func TestSuggestRangesCLI(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	typed := writeFile(t, dir, "typed.csv", "name,x,y,type\ng1,0,0,gateway\ns1,200,0,sensor\ns2,100,120,sensor\ns3,20,10,sensor\n")
	sensors := writeFile(t, dir, "sensors.csv", "name,x,y,type\ns1,200,0,sensor\ns2,100,120,sensor\ns3,20,10,sensor\n")
	cands := writeFile(t, dir, "c.csv", "name,x,y\nc1,200,150\nc2,-30,150\nc3,230,-40\nc4,100,40\n")
	types := []string{"--type-range", "gateway=150m", "--type-range", "sensor=40m"}
	for _, c := range []struct {
		name string
		args []string
		want []string
	}{
		{"add with --range", append([]string{"--sites", typed, "--add", "2", "--range", "60m"}, types...), []string{"new devices 60.00 m", "2 new + 4 existing"}},
		{"fewest of a type", append([]string{"--sites", typed, "--new-type", "gateway"}, types...), []string{"new devices gateway 150.00 m", "for no gap at the planned ranges"}},
		{"candidates", append([]string{"--sites", typed, "--candidates", cands, "--new-type", "sensor", "--add", "2"}, types...), []string{"2 of 4, new devices sensor 40.00 m"}},
		{"gateways among sensors", append([]string{"--sites", sensors, "--new-type", "gateway", "--add", "1"}, types...), []string{"new devices gateway 150.00 m"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-"))
			r := mustRun(t, append(append([]string{"suggest", "--planar", "--area", area}, c.args...), "--out", out)...)
			for _, w := range c.want {
				if !strings.Contains(r.stdout, w) {
					t.Errorf("stdout lacks %q:\n%s", w, r.stdout)
				}
			}
			var doc struct {
				RangeM      *float64 `json:"range_m"`
				Suggestions *struct {
					NewRangeM float64 `json:"new_range_m"`
					Before    float64 `json:"uncovered_area_before_m2"`
					After     float64 `json:"uncovered_area_after_m2"`
				} `json:"suggestions"`
				Candidates *struct {
					NewRangeM float64 `json:"new_range_m"`
					Before    float64 `json:"uncovered_area_before_m2"`
					After     float64 `json:"uncovered_area_after_m2"`
				} `json:"candidates"`
			}
			b, err := os.ReadFile(filepath.Join(out, "summary.json"))
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(b, &doc); err != nil {
				t.Fatal(err)
			}
			newR, before, after := 0.0, 0.0, 0.0
			if s := doc.Suggestions; s != nil {
				newR, before, after = s.NewRangeM, s.Before, s.After
			} else if c := doc.Candidates; c != nil {
				newR, before, after = c.NewRangeM, c.Before, c.After
			}
			if doc.RangeM != nil || newR <= 0 || !(after < before) {
				t.Errorf("range %v, new range %v, uncovered %v -> %v", doc.RangeM, newR, before, after)
			}
		})
	}
	r := runCLI(t, "suggest", "--planar", "--area", area, "--sites", typed, "--new-type", "siren", "--add", "1", "--type-range", "gateway=150m", "--type-range", "sensor=40m", "--out", filepath.Join(dir, "x"))
	checkFailure(t, r, 1, []string{`--new-type "siren"`, "no range for this type"})
}

// TestPlanEqualRangeColumn: a range column with one value gives the
// figures of --range, to the last digit.
func TestPlanEqualRangeColumn(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 50))
	plain := writeFile(t, dir, "plain.csv", cellLatticeCSV(5, 10, [2]int{2, 2}))
	var b strings.Builder
	for k, line := range strings.Split(strings.TrimSpace(cellLatticeCSV(5, 10, [2]int{2, 2})), "\n") {
		if k == 0 {
			b.WriteString(line + ",range\n")
		} else {
			b.WriteString(line + ",7.5m\n")
		}
	}
	col := writeFile(t, dir, "col.csv", b.String())
	pts := writeFile(t, dir, "pts.csv", "x,y\n1,1\n25,25\n33,12\n49,2\n")
	for _, cmd := range [][]string{{"failures"}, {"assign", "--points", pts}} {
		t.Run(cmd[0], func(t *testing.T) {
			o1, o2 := filepath.Join(dir, cmd[0]+"-flag"), filepath.Join(dir, cmd[0]+"-col")
			mustRun(t, append(append([]string{}, cmd...), "--planar", "--sites", plain, "--area", area, "--range", "7.5", "--out", o1)...)
			mustRun(t, append(append([]string{}, cmd...), "--planar", "--sites", col, "--area", area, "--out", o2)...)
			p1, p2 := readPlan(t, o1), readPlan(t, o2)
			p1.Timings, p2.Timings = nil, nil // the one field that may differ
			j1, _ := json.Marshal(p1)
			j2, _ := json.Marshal(p2)
			if string(j1) != string(j2) {
				t.Errorf("figures differ:\n%s\n%s", j1, j2)
			}
		})
	}
}
