package report

import (
	"fmt"
	"strconv"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// TestPlanTextLongTables checks the row limit of report.txt for the
// planning moves: with more devices than textTableMax, the failures
// ranking prints its textTableMax first ranks and the device-load table
// the textTableMax devices serving the largest weight, largest first,
// each followed by one line naming how many were left out and the files
// holding all. Reference: the move's own result (coverage.Failures'
// ranking, coverage.Assign's loads sorted by weight).
func TestPlanTextLongTables(t *testing.T) {
	n := textTableMax + 300
	sites := sitegen.Uniform(n, 11)
	an := analyze(t, sites, region(t, square(1000)), 6)
	l := an.Layout
	t.Run("failures", func(t *testing.T) {
		fr, err := coverage.Failures(l, 6)
		if err != nil {
			t.Fatal(err)
		}
		s := newPlanScene(&Plan{Move: MoveFailures, Layout: l, Range: 6, Failures: fr}, Meta{Planar: true})
		txt := string(s.planText())
		rows, after := tableRows(t, txt, "DEVICES RANKED BY WHAT THEIR FAILURE UNCOVERS")
		if len(rows) != textTableMax {
			t.Fatalf("%d rows, want %d", len(rows), textTableMax)
		}
		if last := strings.Fields(rows[len(rows)-1])[0]; last != strconv.Itoa(textTableMax) {
			t.Errorf("last row ranked %s, want %d", last, textTableMax)
		}
		want := fmt.Sprintf("  ... and %d lower-ranked devices left out here; %s holds all %d.",
			len(fr.Devices)-textTableMax, LayerFile(FileFailures, true), len(fr.Devices))
		if after != want {
			t.Errorf("line after the table %q, want %q", after, want)
		}
	})
	t.Run("device load", func(t *testing.T) {
		pts := sitegen.Uniform(n, 12) // in the same square as the sites
		as, err := coverage.Assign(l, pts, nil, 6)
		if err != nil {
			t.Fatal(err)
		}
		s := newPlanScene(&Plan{Move: MoveAssign, Layout: l, Range: 6, Assignment: as, Demand: pts}, Meta{Planar: true})
		txt := string(s.planText())
		i := strings.Index(txt, "devices with the largest weight served are printed")
		if i < 0 {
			t.Fatal("no note of the cut device-load table")
		}
		lines := strings.Split(txt[i:], "\n")
		var got []float64
		for _, ln := range lines[1:] {
			f := strings.Fields(ln)
			if len(f) < 3 || strings.HasPrefix(ln, "  ...") {
				if strings.HasPrefix(ln, "  ...") {
					want := fmt.Sprintf("  ... and %d devices left out here; %s and %s hold all %d.", len(as.Load)-textTableMax,
						FileDeviceLoadCSV, LayerFile(FileDeviceLoad, true), len(as.Load))
					if ln != want {
						t.Errorf("line after the table %q, want %q", ln, want)
					}
					break
				}
				continue
			}
			if w, err := strconv.ParseFloat(f[1], 64); err == nil {
				got = append(got, w)
			}
		}
		if len(got) != textTableMax {
			t.Fatalf("%d rows, want %d", len(got), textTableMax)
		}
		for k := 1; k < len(got); k++ {
			if got[k] > got[k-1] {
				t.Fatalf("row %d: weight %v after %v: not largest first", k, got[k], got[k-1])
			}
		}
	})
}
