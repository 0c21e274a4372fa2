package report

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/planar/sitegen"
)

// tableRows returns the body rows of the table following the section
// titled title in report.txt txt (the lines after the rule of dashes up
// to the first blank line), and the first line after them.
func tableRows(t *testing.T, txt, title string) (rows []string, after string) {
	t.Helper()
	i := strings.Index(txt, "\n"+title)
	if i < 0 {
		t.Fatalf("no section %q", title)
	}
	lines := strings.Split(txt[i+1:], "\n")
	k := slices.IndexFunc(lines, func(l string) bool { return strings.HasPrefix(l, "  --") })
	if k < 0 {
		t.Fatalf("section %q has no table", title)
	}
	for _, l := range lines[k+1:] {
		if !strings.HasPrefix(l, "  ") || strings.HasPrefix(l, "  ...") {
			return rows, l
		}
		rows = append(rows, l)
	}
	return rows, ""
}

// TestTextLongTables checks the row limit of report.txt: with more service
// areas and holes than textTableMax, the service-area table prints the
// textTableMax largest areas, largest first, and the hole table the
// textTableMax longest-lived holes, each followed by one line naming how
// many were left out and the layer holding all; the gaps table stays
// complete. Reference: the analysis itself (the cells sorted by area, the
// holes as persistence lists them).
func TestTextLongTables(t *testing.T) {
	sites := sitegen.Uniform(2*textTableMax+500, 7)
	an := analyze(t, sites, region(t, square(1400)), 6)
	s := newScene(an.Layout, an, Meta{Planar: true})
	if len(s.cells) <= textTableMax || len(an.Persistence.Holes) <= textTableMax || len(an.Gaps) == 0 {
		t.Fatalf("%d cells, %d holes, %d gaps: the layout does not exercise the limit", len(s.cells), len(an.Persistence.Holes), len(an.Gaps))
	}
	s.files = Files(false, s.m, Options{})
	txt := string(s.text())

	t.Run("service areas", func(t *testing.T) {
		rows, after := tableRows(t, txt, "SERVICE AREAS")
		if len(rows) != textTableMax {
			t.Fatalf("%d rows, want %d", len(rows), textTableMax)
		}
		areas := make([]float64, len(s.cells))
		for i, c := range s.cells {
			areas[i] = c.Area
		}
		slices.Sort(areas)
		slices.Reverse(areas)
		for k, row := range rows {
			got := strings.Fields(row)[0]
			if want := strconv.FormatFloat(areas[k], 'f', 1, 64); got != want {
				t.Fatalf("row %d: area %s, want the %d-th largest %s", k, got, k+1, want)
			}
		}
		want := fmt.Sprintf("  ... and %d smaller service areas left out here; %s holds all %d.",
			len(s.cells)-textTableMax, LayerFile(FileServiceAreas, true), len(s.cells))
		if after != want {
			t.Errorf("line after the table %q, want %q", after, want)
		}
	})
	t.Run("holes", func(t *testing.T) {
		rows, after := tableRows(t, txt, "HOLES OF THE UNION")
		if len(rows) != textTableMax {
			t.Fatalf("%d rows, want %d", len(rows), textTableMax)
		}
		holes := an.Persistence.Holes
		for _, k := range []int{0, textTableMax - 1} {
			f := strings.Fields(rows[k])
			if f[0] != strconv.Itoa(k+1) || f[3] != strconv.FormatFloat(holes[k].Death-holes[k].Birth, 'f', 2, 64) {
				t.Errorf("row %q, want hole %d of lifetime %.2f", rows[k], k+1, holes[k].Death-holes[k].Birth)
			}
		}
		want := fmt.Sprintf("  ... and %d shorter-lived holes left out here; %s holds all %d.",
			len(holes)-textTableMax, LayerFile(FileHoleClosings, true), len(holes))
		if after != want {
			t.Errorf("line after the table %q, want %q", after, want)
		}
	})
	t.Run("gaps complete", func(t *testing.T) {
		if rows, _ := tableRows(t, txt, "GAPS AT"); len(rows) != len(an.Gaps) {
			t.Errorf("%d gap rows, want all %d", len(rows), len(an.Gaps))
		}
	})
	t.Run("files note", func(t *testing.T) {
		if !strings.Contains(txt, "  report.txt") || !strings.Contains(txt, reportNote) {
			t.Errorf("the FILES section does not state the row limit")
		}
	})
}
