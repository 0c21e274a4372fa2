package siteinput

import (
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// TestSiteWarningsManyParts checks the warnings on sites outside the area
// and on repeated positions for a layout tested in several parallel
// parts: the count, and the first five named in input order.
func TestSiteWarningsManyParts(t *testing.T) {
	region, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}, {0, 0}}}})
	if err != nil {
		t.Fatal(err)
	}
	n := 200_000
	sites := make([]orb.Point, n)
	for i := range sites {
		sites[i] = orb.Point{float64(i%1000) / 10, float64(i/1000) / 2.5}
	}
	outside := []int{3, 70000, 70001, 150000, 150001, 150002, 199999}
	for _, i := range outside {
		sites[i] = orb.Point{150 + float64(i)/1e6, 50}
	}
	sites[123456] = sites[17] // a repeat
	names := make([]string, n)
	names[70000] = "mast"
	got := siteWarnings(sites, names, region, startRepeats(sites, names))
	want := []string{
		"7 of 200000 sites lie outside the area (their disks still count where they reach in): #4, mast, #70002, #150001, #150002 and 2 more",
		"1 site repeats the exact position of an earlier site and shares its service area: #123457 = #18",
	}
	if len(got) != len(want) {
		t.Fatalf("warnings %q, want %q", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("warning %d:\n got %s\nwant %s", i, got[i], want[i])
		}
	}
}
