// Tests of the hole-lifetimes chart with own ranges (ranges_charts.go):
// the points in reference metres, open holes in the planned quadrant, and
// the chart among the written files and in the FILES section.

package report

import (
	"bytes"
	"image/png"
	"os"
	"path/filepath"
	"testing"
)

// TestRangesHoleChart: on the lattice of rangesLattice every hole is drawn
// at (√(r_ref² + birth), √(r_ref² + death)) and lies left of and above the
// planned reference range exactly when the HOLES section calls it open;
// the chart is written at the asked width and listed in FILES.
func TestRangesHoleChart(t *testing.T) {
	a, m := rangesLattice(t)
	rs := newRangesScene(a, m)
	lt := rs.lifetimes()
	if len(lt) != len(a.Persistence.Holes) || len(lt) == 0 {
		t.Fatalf("%d points for %d holes", len(lt), len(a.Persistence.Holes))
	}
	for k, h := range lt {
		ph := a.Persistence.Holes[k]
		if h.b != rs.refRange(ph.Birth) || h.d != rs.refRange(ph.Death) {
			t.Errorf("hole %d drawn at (%g, %g), reference ranges (%g, %g)", k, h.b, h.d, rs.refRange(ph.Birth), rs.refRange(ph.Death))
		}
		if quad := h.b <= rs.refM && rs.refM < h.d; quad != rs.holeOpen(k) {
			t.Errorf("hole %d: in the planned quadrant %v, open %v", k, quad, rs.holeOpen(k))
		}
	}
	dir := filepath.Join(t.TempDir(), "out")
	opt := Options{Charts: true, MapWidth: MinMapWidth}
	if _, err := WriteRangesAnalysis(dir, a, m, opt); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(filepath.Join(dir, FileChartHoles))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if img, err := png.Decode(f); err != nil || img.Bounds().Dx() != MinMapWidth {
		t.Errorf("hole-lifetimes chart: %v", err)
	}
	txt, err := os.ReadFile(filepath.Join(dir, FileReport))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(txt, []byte(FileChartHoles+"    chart: hole appearance against closing, reference range")) {
		t.Errorf("FILES does not list %s with its note", FileChartHoles)
	}
}
