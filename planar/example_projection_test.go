package planar_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// ExampleNewLocalPlane maps device sites given in WGS84 longitude and
// latitude to a local plane in metres centred on the data, and checks
// that the plane is accurate enough for the site's extent.
func ExampleNewLocalPlane() {
	sites := []orb.Point{ // invented sites, lon/lat in degrees
		{8.5400, 47.3700},
		{8.5520, 47.3745},
		{8.5460, 47.3650},
	}
	tm, err := planar.NewLocalPlane(sites)
	if err != nil {
		fmt.Println(err)
		return
	}
	bound, _ := planar.LonLatBound(sites)
	if err := tm.CheckExtent(bound); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("centre %.5f, %.5f\n", tm.CentralMeridian(), tm.OriginLatitude())
	for _, p := range sites {
		x, y := tm.Forward(p[0], p[1])
		fmt.Printf("x %8.2f m  y %8.2f m\n", x, y)
	}
	fmt.Printf("largest scale error %.1e\n", tm.MaxScaleError(bound))
	// The same coordinates come from PROJ: proj +proj=tmerc +ellps=WGS84
	// +lon_0=8.546 +lat_0=47.36975 +k_0=1.

	// Output:
	// centre 8.54600, 47.36975
	// x  -453.18 m  y    27.81 m
	// x   453.14 m  y   528.11 m
	// x     0.00 m  y  -528.10 m
	// largest scale error 2.5e-09
}
