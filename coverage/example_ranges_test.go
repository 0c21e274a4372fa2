// Runnable example of the analysis with per-device ranges.

package coverage_test

import (
	"fmt"
	"log"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// ExampleAnalyzeRanges analyses a 400 m × 300 m yard served by a 150 m
// gateway, two 60 m sensors and a 40 m sensor that lies inside the
// gateway's disk and the sensors' (hidden: redundant for coverage).
func ExampleAnalyzeRanges() {
	area, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {400, 0}, {400, 300}, {0, 300}}}})
	if err != nil {
		log.Fatal(err)
	}
	sites := []orb.Point{{150, 150}, {330, 80}, {330, 220}, {200, 150}}
	ranges := []float64{150, 60, 60, 40}
	a, err := coverage.AnalyzeRanges(sites, ranges, area, coverage.Options{})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("covered %.1f%%, %d gaps, hidden devices %v\n", 100*a.CoveredFraction, len(a.Gaps), a.Hidden)
	g := a.Gaps[0]
	fmt.Printf("largest gap closes at power %.0f m²: device #%d alone needs %.1f m\n",
		g.Closing.Power, g.Closing.Device, g.Closing.DeviceRange)
	fmt.Printf("full cover: gateway %.1f m, sensors %.1f m\n", a.FullCover.Needed[0], a.FullCover.Needed[1])
	fmt.Printf("link groups %d (a link needs both devices in range)\n", a.Links.Components)
	// Output:
	// covered 76.4%, 3 gaps, hidden devices [3]
	// largest gap closes at power 22500 m²: device #0 alone needs 212.1 m
	// full cover: gateway 212.1 m, sensors 161.6 m
	// link groups 4 (a link needs both devices in range)
}
