// Map legends list only the classes present on the map (issue 16): no
// exclusion zone, gap or context entry where there is none.

package report

import (
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"golang.org/x/image/font"
)

// hasLegend reports whether some legend label starts with prefix.
func hasLegend(labels []string, prefix string) bool {
	return slices.ContainsFunc(labels, func(l string) bool { return strings.HasPrefix(l, prefix) })
}

func TestLegendsListOnlyPresentClasses(t *testing.T) {
	sites := []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}
	hole := []float64{45, 45, 45, 55, 55, 55, 55, 45} // an exclusion zone, clockwise
	for _, c := range []struct {
		name                 string
		zones, gaps, context bool
		r                    float64
	}{
		{"no-zones-no-gaps", false, false, false, 40},
		{"no-zones-gaps", false, true, false, 30},
		{"zones-gaps", true, true, false, 30},
		{"zones-no-gaps-context", true, false, true, 40},
	} {
		t.Run(c.name, func(t *testing.T) {
			rings := [][]float64{square(100)}
			if c.zones {
				rings = append(rings, hole)
			}
			an := analyze(t, sites, region(t, rings...), c.r)
			if (len(an.Gaps) > 0) != c.gaps {
				t.Fatalf("%d gaps at %v m, scene expects gaps %v", len(an.Gaps), c.r, c.gaps)
			}
			m := Meta{Planar: true}
			if c.context {
				m.Context = orb.MultiPolygon{{{{10, 10}, {20, 10}, {20, 20}, {10, 20}, {10, 10}}}}
			}
			s := newScene(an.Layout, an, m)
			for _, mp := range []struct {
				name string
				draw func(int) (*canvas, error)
			}{{"coverage", s.drawCoverageMap}, {"service-areas", s.drawServiceAreaMap}} {
				cv, err := mp.draw(800)
				if err != nil {
					t.Fatal(err)
				}
				got := cv.legendLabels
				if hasLegend(got, "Exclusion zone") != c.zones {
					t.Errorf("%s map legend %q: exclusion entry, want %v", mp.name, got, c.zones)
				}
				if mp.name != "coverage" {
					continue
				}
				if hasLegend(got, "Gap") != c.gaps || hasLegend(got, "Deepest point") != c.gaps {
					t.Errorf("coverage map legend %q: gap entries, want %v", got, c.gaps)
				}
				if hasLegend(got, "Building or other context") != c.context {
					t.Errorf("coverage map legend %q: context entry, want %v", got, c.context)
				}
			}
		})
	}
}

func TestSegmentMeetsBox(t *testing.T) {
	b := labelBox{0, 0, 10, 5}
	for _, c := range []struct {
		name           string
		x0, y0, x1, y1 float64
		want           bool
	}{
		{"through", -5, 2, 15, 2, true},
		{"inside", 2, 2, 3, 3, true},
		{"one-end-in", 5, 2, 20, 20, true},
		{"touches-corner", -5, -5, 0, 0, true},
		{"outside", -5, -1, 15, -1, false},
		{"diagonal-miss", 11, -1, 20, 4, false},
		{"diagonal-cut", 8, -2, 12, 2, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := segmentMeetsBox(c.x0, c.y0, c.x1, c.y1, b); got != c.want {
				t.Errorf("segmentMeetsBox = %v, want %v", got, c.want)
			}
		})
	}
}

func TestMapTextReadableAt800(t *testing.T) {
	// At --map-width 800 labels, legend and notes are drawn at minLabelPx
	// or more, and every note line fits the frame.
	an := analyze(t, []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}, region(t, square(100)), 30)
	c, err := newScene(an.Layout, an, Meta{Planar: true}).drawCoverageMap(800)
	if err != nil {
		t.Fatal(err)
	}
	for _, pt := range []float64{14, 15, 17, 18} {
		if px := c.labelPt(pt) * c.u; px < minLabelPx {
			t.Errorf("%v-unit text drawn at %.1f px, want ≥ %v", pt, px, minLabelPx)
		}
	}
	face := c.face(c.notePt(), false)
	for _, l := range c.notes {
		if w := float64(font.MeasureString(face, l)) / 64; w > c.fw {
			t.Errorf("note line %.0f px wide, frame %.0f px: %q", w, c.fw, l)
		}
	}
	long := c.wrapNotes([]string{strings.Repeat("a long note word ", 40)})
	if len(long) < 2 {
		t.Errorf("a note three frames wide was not wrapped: %q", long)
	}
	for _, l := range long {
		if w := float64(font.MeasureString(face, l)) / 64; w > c.fw {
			t.Errorf("wrapped line %.0f px wide, frame %.0f px", w, c.fw)
		}
	}
}
