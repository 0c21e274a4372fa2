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

// One mast in the middle of a 100 m square yard, planned range 30 m, on a
// site plan already in metres.
func ExampleWriteAnalysis() {
	yard, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}}}})
	if err != nil {
		panic(err)
	}
	a, err := coverage.Analyze([]orb.Point{{50, 50}}, yard, 30, coverage.Options{})
	if err != nil {
		panic(err)
	}
	dir, err := os.MkdirTemp("", "sitecover-example-")
	if err != nil {
		panic(err)
	}
	defer os.RemoveAll(dir)

	m := report.Meta{Title: "Yard", Command: "analyze", Planar: true, SiteNames: []string{"Mast"}}
	files, err := report.WriteAnalysis(dir, a, m, report.Options{})
	if err != nil {
		panic(err)
	}
	for _, f := range files {
		fmt.Println(filepath.Base(f))
	}
	s := report.Summary(a, m)
	fmt.Printf("covered %.2f %%, full cover at %.2f m, %d gap\n", 100*s.CoveredFraction, s.FullCoverRangeM, len(s.Gaps))
	// Output:
	// report.txt
	// summary.json
	// sites-xy.geojson
	// service-areas-xy.geojson
	// gaps-xy.geojson
	// hole-closings-xy.geojson
	// covered-xy.geojson
	// manifest.json
	// covered 28.27 %, full cover at 70.71 m, 1 gap
}

// The cautions printed at the end of every report.
func ExampleCautions() {
	fmt.Println(report.Cautions()[:46])
	// Output:
	// - Coverage is modelled as straight-line disks
}
