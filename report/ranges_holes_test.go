// Tests of the holes and the coverage curve chart in the report of devices
// with their own ranges (ranges_holes.go, ranges_charts.go).

package report

import (
	"bytes"
	"encoding/json"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// rangesLattice analyses a 4 × 4 lattice of spacing 100 m whose rows
// alternate ranges 60 m ("gateway") and 55 m ("sensor") in a box around
// it: 9 holes, open at the planned ranges, one per inner square
// (coverage's TestRangesHoleClosingLattice derives their figures).
func rangesLattice(t *testing.T) (*coverage.RangesAnalysis, Meta) {
	t.Helper()
	var sites []orb.Point
	var ranges []float64
	var types []string
	for j := range 4 {
		for i := range 4 {
			sites = append(sites, orb.Point{float64(i) * 100, float64(j) * 100})
			ranges = append(ranges, [2]float64{60, 55}[j%2])
			types = append(types, [2]string{"gateway", "sensor"}[j%2])
		}
	}
	a, err := coverage.AnalyzeRanges(sites, ranges, region(t, []float64{-100, -100, 400, -100, 400, 400, -100, 400}), coverage.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return a, Meta{Planar: true, Ranges: ranges, Types: types, Command: "analyze"}
}

// TestRangesHolesReport: closed form, as coverage's lattice test. With
// a = 60, b = 55, s = 100: each hole closes where the corners need
// √((s/2)² + y²) and √((s/2)² + (s − y)²), y = (s² + a² − b²)/(2s) =
// 52.875 m: 72.32 m for the gateways (the reference devices, so also
// the closing reference range) and 68.84 m for the sensors; the fix is a
// sensor raised to √((s − √(a² − y²))² + (s − y)²) = 85.75 m.
func TestRangesHolesReport(t *testing.T) {
	a, m := rangesLattice(t)
	const s, ra, rb = 100.0, 60.0, 55.0
	y := (s*s + ra*ra - rb*rb) / (2 * s)
	needA, needB := math.Hypot(s/2, y), math.Hypot(s/2, s-y)
	fix := math.Hypot(s-math.Sqrt(ra*ra-y*y), s-y)

	d := RangesSummary(a, m)
	if d.ReferenceType != "gateway" || d.ReferenceRangeM != ra {
		t.Errorf("reference %q %g m, want gateway 60 m", d.ReferenceType, d.ReferenceRangeM)
	}
	open := 0
	for k, h := range d.Holes {
		if !h.Open {
			continue
		}
		open++
		if math.Abs(h.ClosesRefM-needA) > 1e-9*needA || math.Abs(h.FixRangeM-fix) > 1e-9*fix {
			t.Errorf("hole %d closes at reference %.12g m, fix %.12g m; want %.12g, %.12g", k, h.ClosesRefM, h.FixRangeM, needA, fix)
		}
		if m.Types[h.FixSite] != "sensor" {
			t.Errorf("hole %d fixed by %s device %d, want a sensor", k, m.Types[h.FixSite], h.FixSite)
		}
		for j, site := range h.Sites {
			want := map[string]float64{"gateway": needA, "sensor": needB}[m.Types[site]]
			if math.Abs(h.NeededM[j]-want) > 1e-9*want {
				t.Errorf("hole %d: device %d needs %.12g m, want %.12g", k, site, h.NeededM[j], want)
			}
		}
	}
	if open != 9 || d.HolesTotal != len(d.Holes) {
		t.Errorf("%d open holes of %d listed (%d in all), want 9", open, len(d.Holes), d.HolesTotal)
	}

	dir := filepath.Join(t.TempDir(), "out")
	opt := Options{Charts: true, MapWidth: MinMapWidth}
	files, err := WriteRangesAnalysis(dir, a, m, opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != len(RangesFiles(m, opt)) {
		t.Errorf("wrote %v, want %v", files, RangesFiles(m, opt))
	}
	txt, err := os.ReadFile(filepath.Join(dir, FileReport))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"HOLES OF THE UNION OF DISKS", "the gateway devices (60 m)", "to " + metresNum(fix) + " m",
		metresNum(needB) + " m", "9 of 9 holes listed are open"} {
		if !bytes.Contains(txt, []byte(want)) {
			t.Errorf("report.txt lacks %q", want)
		}
	}
	var layer struct {
		Features []struct {
			Properties map[string]any `json:"properties"`
		} `json:"features"`
	}
	raw, err := os.ReadFile(filepath.Join(dir, LayerFile(FileHoleClosings, true)))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, &layer); err != nil || len(layer.Features) != len(d.Holes) {
		t.Fatalf("hole-closings layer: %v, %d features, want %d", err, len(layer.Features), len(d.Holes))
	}
	if got := layer.Features[0].Properties["fix_range_m"].(float64); math.Abs(got-fix) > 1e-3 {
		t.Errorf("hole-closings layer fix_range_m %g, want %g", got, fix)
	}
	f, err := os.Open(filepath.Join(dir, FileChartCurve))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if img, err := png.Decode(f); err != nil || img.Bounds().Dx() != MinMapWidth {
		t.Errorf("coverage curve chart: %v", err)
	}
}

// TestRangesCurveChartAxis: the chart's x-axis is the reference range
// √(r_ref² + t): at the planned ranges it is the reference's planned
// range, and the legend names the other type's range at each marker.
func TestRangesCurveChartAxis(t *testing.T) {
	a, m := rangesLattice(t)
	rs := newRangesScene(a, m)
	if got := rs.refRange(0); got != 60 {
		t.Errorf("reference range at the plan %g, want 60", got)
	}
	if got := rs.othersAt(60*60 - 55*55); !strings.Contains(got, "sensor 60 m") {
		t.Errorf("others at growth 60² − 55²: %q, want sensor 60 m", got)
	}
}
