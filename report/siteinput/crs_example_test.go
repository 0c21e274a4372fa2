// Example of ParseCRS: a GeoJSON 2008 crs name to a grid and back to
// longitude/latitude (checked with PROJ: cs2cs +proj=utm +zone=32
// +ellps=WGS84 gives 11.56750 48.13956).

package siteinput_test

import (
	"fmt"

	"github.com/sitecover/sitecover/report/siteinput"
)

// ParseCRS reads the spellings of an EPSG code; TM converts between the
// grid and longitude/latitude.
func ExampleParseCRS() {
	c, err := siteinput.ParseCRS("urn:ogc:def:crs:EPSG::32632")
	if err != nil {
		panic(err)
	}
	lon, lat := c.TM.Inverse(691000, 5335000)
	fmt.Printf("%s: %.5f°E %.5f°N\n", c.Label(), lon, lat)
	_, err = siteinput.ParseCRS("EPSG:27700")
	fmt.Println(err != nil)
	// Output:
	// EPSG:32632 (WGS 84 / UTM zone 32N): 11.56750°E 48.13956°N
	// true
}

// FromLonLat converts longitude/latitude to the grid (what --out-crs
// writes): the position above comes back to the millimetre.
func ExampleCRS_FromLonLat() {
	c, err := siteinput.ParseCRS("EPSG:32632")
	if err != nil {
		panic(err)
	}
	lon, lat := c.TM.Inverse(691000, 5335000)
	e, n := c.FromLonLat(lon, lat)
	fmt.Printf("E %.3f N %.3f\n", e, n)
	// Output:
	// E 691000.000 N 5335000.000
}
