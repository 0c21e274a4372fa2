// The loss if one device fails, with own ranges, computed for the one
// device asked about.
//
// The page asks after every edit and slider move for the selected device
// only, so the review computes that one device's failure
// (coverage.RangesFailures.Device) directly on the whole layout: the
// failing device's power cell, its neighbours in the regular triangulation
// and the hidden devices near the cell, O(neighbourhood) per device (some
// 30 µs at 10 000 devices, where coverage.FailuresRanges, every device at
// once, takes some 110 ms). The layout is built at the planned ranges b_i;
// the failure is asked at the ranges now, √(b_i² + t): growing every power
// by t keeps the power diagram, so the same layout serves (the method and
// its error bounds are those of coverage/plan_failures_ranges.go).

package review

import "github.com/sitecover/sitecover/coverage"

// rangedFailure returns the failure of the device of layout input index k
// at growth t, its Site and Backup given as layout input indices; the
// per-device failures of the layout are prepared on first use.
func (g *geometry) rangedFailure(k int, t float64) (coverage.DeviceFailure, error) {
	rg := g.ranged
	if rg.failIx == nil {
		ix, err := coverage.NewRangesFailures(g.layout)
		if err != nil {
			return coverage.DeviceFailure{}, err
		}
		rg.failIx = ix
	}
	return rg.failIx.Device(k, t)
}
