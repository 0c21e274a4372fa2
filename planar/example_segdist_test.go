// Runnable example of PointSegmentDistance: foot inside the segment, and
// beyond either end.

package planar_test

import (
	"fmt"

	"github.com/sitecover/sitecover/planar"
)

// The distance from a point to the segment from (0, 0) to (10, 0): to the
// foot of the perpendicular when it falls inside, else to the nearer end.
func ExamplePointSegmentDistance() {
	fmt.Println(planar.PointSegmentDistance(4, 3, 0, 0, 10, 0))  // foot (4, 0)
	fmt.Println(planar.PointSegmentDistance(-3, 4, 0, 0, 10, 0)) // nearest (0, 0)
	fmt.Println(planar.PointSegmentDistance(13, 4, 0, 0, 10, 0)) // nearest (10, 0)
	// Output:
	// 3
	// 5
	// 5
}
