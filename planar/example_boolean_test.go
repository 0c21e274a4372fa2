// Runnable example of SiteArea: parcels merged, exclusions clipped.

package planar_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// Two adjacent 10 m parcels, a building on the shared boundary that
// sticks out of the site, and a pond touching the outer boundary along an
// edge: the site area is their union minus the exclusions.
func ExampleSiteArea() {
	area := orb.MultiPolygon{
		{{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}},
		{{{10, 0}, {20, 0}, {20, 10}, {10, 10}, {10, 0}}},
	}
	exclusions := orb.MultiPolygon{
		{{{8, 8}, {12, 8}, {12, 12}, {8, 12}, {8, 8}}},  // building
		{{{16, 0}, {20, 0}, {20, 3}, {16, 3}, {16, 0}}}, // pond
	}
	site, stats, err := planar.SiteArea(area, exclusions)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.0f m² in %d polygon(s)\n", site.Area(), site.NumPolygons())
	fmt.Println(stats)
	// Output:
	// 180 m² in 1 polygon(s)
	// 2 area polygons merged into 1; 1 exclusion clipped to the area
}
