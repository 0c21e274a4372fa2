// Runnable examples of the planners with per-device ranges on an invented
// strip 400 m × 100 m: a 150 m gateway at one end, a 40 m sensor at the
// other and a 20 m sensor next to the gateway, inside its disk: redundant
// (its failure costs nothing) though not hidden, its power cell being the
// half-plane beyond the power line with the gateway, 994 m away
// ((d² + 150² − 20²)/2d for d = |(10, 5)|), outside the strip.

package coverage_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

func rangesExampleLayout() *coverage.Layout {
	area, err := planar.NewRegion(orb.MultiPolygon{{{{-50, -50}, {350, -50}, {350, 50}, {-50, 50}, {-50, -50}}}})
	if err != nil {
		panic(err)
	}
	sites := []orb.Point{{0, 0}, {300, 0}, {10, 5}}
	l, err := coverage.NewLayoutRanges(sites, []float64{150, 40, 20}, area)
	if err != nil {
		panic(err)
	}
	return l
}

// ExampleFailuresRanges ranks the failures at each device's own range and
// gives the ranges that survive any single failure when every r² grows by
// the same amount.
func ExampleFailuresRanges() {
	l := rangesExampleLayout()
	rep, err := coverage.FailuresRanges(l)
	if err != nil {
		panic(err)
	}
	for _, d := range rep.Devices {
		fmt.Printf("device %d: loss %.0f m², hidden %v\n", d.Site, d.AddedUncovered, d.Hidden)
	}
	fmt.Printf("survive any single failure: %.1f m, %.1f m, %.1f m\n", rep.SurviveRanges[0], rep.SurviveRanges[1], rep.SurviveRanges[2])
	// Output:
	// device 0: loss 18461 m², hidden false
	// device 1: loss 5027 m², hidden false
	// device 2: loss 0 m², hidden false
	// survive any single failure: 353.6 m, 322.6 m, 320.8 m
}

// ExampleAssignPowerCells assigns demand points to the device whose power
// cell holds them; within reach means inside that device's own range.
func ExampleAssignPowerCells() {
	l := rangesExampleLayout()
	a, err := coverage.AssignPowerCells(l, []orb.Point{{12, 4}, {290, 10}, {220, 0}}, nil)
	if err != nil {
		panic(err)
	}
	for i := range a.Device {
		fmt.Printf("point %d: device %d, %.1f m, within reach %v\n", i, a.Device[i], a.Distance[i], a.Within[i])
	}
	// Output:
	// point 0: device 0, 12.6 m, within reach true
	// point 1: device 1, 14.1 m, within reach true
	// point 2: device 1, 80.0 m, within reach false
}
