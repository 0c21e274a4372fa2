package coverage_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// The four devices of ExampleAnalyze (a square lattice of spacing 50 m in
// the square of its cells), asked how much of the site two, three and four
// devices reach at 60 m. A corner of the site is 25√2 ≈ 35.36 m from its
// device and 25√10 ≈ 79.06 m from the next two (the s·√10/2 of a square
// lattice), and 75√2 ≈ 106.07 m from the fourth: those are the k-cover
// ranges.
func ExampleKCover() {
	area, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}, {0, 0}}}})
	if err != nil {
		fmt.Println(err)
		return
	}
	l, err := coverage.NewLayout([]orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}, area)
	if err != nil {
		fmt.Println(err)
		return
	}
	kc, err := coverage.KCover(l, 60, coverage.KOptions{MaxK: 4, Gaps: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, lv := range kc.Levels {
		fmt.Printf("k=%d: %.2f %% reached, all at %.2f m (needed at (%.0f, %.0f)), %d parts short\n",
			lv.K, 100*lv.Share, lv.CoverRange, lv.CoverPoint[0], lv.CoverPoint[1], len(lv.Gaps))
	}
	// Output:
	// k=1: 100.00 % reached, all at 35.36 m (needed at (0, 0)), 0 parts short
	// k=2: 87.63 % reached, all at 79.06 m (needed at (0, 0)), 4 parts short
	// k=3: 45.23 % reached, all at 79.06 m (needed at (0, 0)), 1 parts short
	// k=4: 21.67 % reached, all at 106.07 m (needed at (0, 0)), 1 parts short
}
