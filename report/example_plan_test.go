// Example of a planning report: the failures of four masts on a yard.

package report_test

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report"
)

// Four masts at the centres of the quarters of a 100 m square yard, range
// 36 m: which failure hurts most, and which range survives any one.
func ExampleWritePlan() {
	yard, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}}}})
	if err != nil {
		panic(err)
	}
	masts := []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}
	l, err := coverage.NewLayout(masts, yard)
	if err != nil {
		panic(err)
	}
	fr, err := coverage.Failures(l, 36)
	if err != nil {
		panic(err)
	}
	p := &report.Plan{Move: report.MoveFailures, Layout: l, Range: 36, RangeGiven: true,
		FullCover: l.FullCover(), Uncovered: l.UncoveredArea(36), Failures: fr}
	m := report.Meta{Planar: true, Title: "Yard", Command: "failures"}
	dir, err := os.MkdirTemp("", "sitecover-example-")
	if err != nil {
		panic(err)
	}
	defer os.RemoveAll(dir)
	written, err := report.WritePlan(dir, p, m, report.Options{})
	if err != nil {
		panic(err)
	}
	for _, f := range written {
		fmt.Println(filepath.Base(f))
	}
	d, _ := report.PlanSummary(p, m)
	// A yard corner is √(75² + 25²) m from the second-nearest mast.
	fmt.Printf("survives any single failure at %.2f m\n", *d.SurviveAnySingleFailureM)
	// Output:
	// report.txt
	// summary.json
	// sites-xy.geojson
	// failures-xy.geojson
	// failures.csv
	// manifest.json
	// survives any single failure at 79.06 m
}
