package examplesites_test

import (
	"fmt"

	"github.com/sitecover/sitecover/examplesites"
)

// Campus hands over the embedded files as bytes, ready for a GeoJSON
// reader, with the planned range in metres.
func ExampleCampus() {
	sites, area, rangeM, title := examplesites.Campus()
	fmt.Println(title)
	fmt.Println(len(sites) > 0, len(area) > 0, rangeM)
	// Output:
	// Quillmere Science Park (invented demo campus)
	// true true 120
}
