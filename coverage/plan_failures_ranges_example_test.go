// Runnable example of one device's failure with own ranges
// (RangesFailures.Device) on the invented strip of
// example_plan_ranges_test.go.

package coverage_test

import (
	"fmt"

	"github.com/sitecover/sitecover/coverage"
)

// ExampleRangesFailures_Device asks for one device's failure at a time, at
// the planned ranges and with every r² grown by 2000 m², without computing
// every device's.
func ExampleRangesFailures_Device() {
	l := rangesExampleLayout()
	rf, err := coverage.NewRangesFailures(l)
	if err != nil {
		panic(err)
	}
	for _, t := range []float64{0, 2000} {
		d, err := rf.Device(1, t)
		if err != nil {
			panic(err)
		}
		fmt.Printf("growth %.0f m²: device 1's failure loses %.0f m²; device %d takes over, %.1f m from the deepest point\n",
			t, d.AddedUncovered, d.Backup, d.ClosingRange)
	}
	// Output:
	// growth 0 m²: device 1's failure loses 5027 m²; device 0 takes over, 353.6 m from the deepest point
	// growth 2000 m²: device 1's failure loses 9959 m²; device 0 takes over, 353.6 m from the deepest point
}
