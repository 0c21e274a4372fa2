package planar_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// Five sites: the corners of a 100 m square (cocircular, so either
// diagonal would be Delaunay) and one off-centre site, plus a duplicate.
func ExampleTriangulate() {
	sites := []orb.Point{{0, 0}, {100, 0}, {100, 100}, {0, 100}, {30, 60}, {100, 0}}
	tri, err := planar.Triangulate(sites)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := tri.Validate(); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("vertices:", tri.NumVertices(), "triangles:", tri.NumTriangles())
	fmt.Println("hull vertices:", len(tri.Hull))
	fmt.Println("duplicates:", tri.Duplicates())
	fmt.Println("neighbours of the inner site:", len(tri.Neighbors(4, nil)))
	fmt.Println("nearest site to (90, 20):", tri.Source[tri.Nearest(90, 20, -1)])
	fmt.Println("(50, 50) inside the hull:", tri.Locate(50, 50, -1) >= 0)
	fmt.Println("(150, 50) inside the hull:", tri.Locate(150, 50, -1) >= 0)
	// Output:
	// vertices: 5 triangles: 4
	// hull vertices: 4
	// duplicates: [[1 5]]
	// neighbours of the inner site: 4
	// nearest site to (90, 20): 1
	// (50, 50) inside the hull: true
	// (150, 50) inside the hull: false
}
