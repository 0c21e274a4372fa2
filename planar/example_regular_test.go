// Example of TriangulateRegular: devices with their own ranges.

package planar_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

func ExampleTriangulateRegular() {
	// Four gateways of range 150 m at the corners of a 200 m square, a
	// sensor of range 40 m in the middle (inside their union) and one of
	// range 60 m just outside the square.
	pts := []orb.Point{{0, 0}, {200, 0}, {200, 200}, {0, 200}, {100, 100}, {260, 100}}
	ranges := []float64{150, 150, 150, 150, 40, 60}
	w := make([]float64, len(ranges))
	for i, r := range ranges {
		w[i] = r * r // the weight is the squared range
	}
	tr, err := planar.TriangulateRegular(pts, w)
	if err != nil {
		panic(err)
	}
	fmt.Println("vertices:", tr.NumVertices(), "triangles:", tr.NumTriangles())
	fmt.Println("hidden devices:", tr.Hidden)
	// Output:
	// vertices: 5 triangles: 3
	// hidden devices: [4]
}
