// Tests of the devices-in-reach map (kcover_map.go): one legend entry per
// band on the map, in order, with the band's share; the numbered parts
// only where some spot is short; the bands beyond the palette merged.

package report

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

func TestReachMapLegend(t *testing.T) {
	var grid []orb.Point
	for i := range 4 {
		for j := range 4 {
			grid = append(grid, orb.Point{12.5 + 25*float64(i), 12.5 + 25*float64(j)})
		}
	}
	for _, c := range []struct {
		name  string
		sites []orb.Point
		r     float64
		K     int
		bands []string // legend prefixes of the bands, in order
		parts bool
	}{
		{"gaps", []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}, 30, 2,
			[]string{"0 devices in reach (", "1 device in reach (", "2 or more devices in reach ("}, true},
		{"all-reached", []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}, 80, 2,
			[]string{"2 or more devices in reach (100.00 %)"}, false},
		{"beyond-palette", grid, 200, 9, []string{"7 or more devices in reach (100.00 %)"}, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			an := analyze(t, c.sites, region(t, square(100)), c.r)
			kc, err := coverage.KCover(an.Layout, c.r, coverage.KOptions{MaxK: c.K, Gaps: true})
			if err != nil {
				t.Fatal(err)
			}
			cv, err := newScene(an.Layout, an, Meta{Planar: true}).drawReachMap(kc, 800, reachMarks{})
			if err != nil {
				t.Fatal(err)
			}
			var bands []string
			for _, l := range cv.legendLabels {
				if strings.Contains(l, " in reach (") {
					bands = append(bands, l)
				}
			}
			ok := len(bands) == len(c.bands)
			for i := 0; ok && i < len(bands); i++ {
				ok = strings.HasPrefix(bands[i], c.bands[i])
			}
			if !ok {
				t.Errorf("band legend %q, want prefixes %q", bands, c.bands)
			}
			part := fmt.Sprintf("Part reached by fewer than %d devices", c.K)
			if got := slices.ContainsFunc(cv.legendLabels, func(l string) bool { return strings.HasPrefix(l, part) }); got != c.parts {
				t.Errorf("legend %q: parts entry %v, want %v", cv.legendLabels, got, c.parts)
			}
		})
	}
}
