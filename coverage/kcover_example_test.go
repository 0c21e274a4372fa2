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

// The lattice of ExampleKCover with its devices at 60 m and a fifth of
// 10 m in the middle, hidden (its disk lies inside the others' union) yet
// a device in reach there. The k-cover figure is a power growth t: every
// range becomes √(r² + t), here printed for a 60 m and the 10 m device (0
// when t < −r²: no range needed). The shares are ExampleKCover's up to
// k = 4 (the small disk lies where four already reach), but the 4-cover
// figure drops: at a corner the fourth smallest power is the middle
// device's, 70.71² − 10² = 4900 m², so 60 m devices need √(60² + 4900) =
// 92.20 m, not the fourth lattice device's 106.07 m.
func ExampleKCoverRanges() {
	area, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}, {0, 0}}}})
	if err != nil {
		fmt.Println(err)
		return
	}
	sites := []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}, {50, 50}}
	l, err := coverage.NewLayoutRanges(sites, []float64{60, 60, 60, 60, 10}, area)
	if err != nil {
		fmt.Println(err)
		return
	}
	kc, err := coverage.KCoverRanges(l, coverage.KOptions{MaxK: 5})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("hidden:", l.Hidden)
	for _, lv := range kc.Levels {
		fmt.Printf("k=%d: %.2f %% reached; all of it when 60 m → %.2f m and 10 m → %.2f m\n",
			lv.K, 100*lv.Share, lv.CoverRanges[0], lv.CoverRanges[4])
	}
	// Output:
	// hidden: [4]
	// k=1: 100.00 % reached; all of it when 60 m → 35.36 m and 10 m → 0.00 m
	// k=2: 87.63 % reached; all of it when 60 m → 79.06 m and 10 m → 52.44 m
	// k=3: 45.23 % reached; all of it when 60 m → 79.06 m and 10 m → 52.44 m
	// k=4: 21.67 % reached; all of it when 60 m → 92.20 m and 10 m → 70.71 m
	// k=5: 3.14 % reached; all of it when 60 m → 106.07 m and 10 m → 88.03 m
}
