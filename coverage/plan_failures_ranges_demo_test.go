// The per-device failure with own ranges (RangesFailures.Device) against
// FailuresRanges on the demo campus with mixed ranges
// (examplesites.MixedSitesGeoJSON, loaded as the CLI loads it).

package coverage_test

import (
	"testing"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report/siteinput"
)

// TestRangesFailuresDeviceDemo: every device's failure computed alone
// equals its entry in FailuresRanges, field for field, the whole-layout
// figures (Uncovered, FullCoverPower) aside.
func TestRangesFailuresDeviceDemo(t *testing.T) {
	sc, err := siteinput.Load(siteinput.Inputs{
		Sites: siteinput.Source{Name: examplesites.MixedSitesFile, Data: examplesites.MixedSitesGeoJSON()},
		Area:  &siteinput.Source{Name: "campus-area.geojson", Data: examplesites.AreaGeoJSON()},
	})
	if err != nil {
		t.Fatal(err)
	}
	if sc.Ranges == nil {
		t.Fatal("the mixed demo has no per-device ranges")
	}
	l, err := coverage.NewLayoutRanges(sc.Sites, sc.Ranges, sc.Region)
	if err != nil {
		t.Fatal(err)
	}
	coverage.CheckDeviceEntries(t, l)
}
