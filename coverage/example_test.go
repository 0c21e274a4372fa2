package coverage_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// Four devices in a 100 m square, one at the centre of each quarter, with a
// planned range of 30 m. Each quarter's corners are 25√2 ≈ 35.36 m from its
// device, so the full-cover range is 35.36 m; at 30 m nine gaps remain: the
// centre (where four quarters meet, enclosed by coverage), the four edge
// midpoints and the four corners (against the boundary).
func ExampleAnalyze() {
	area, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}, {0, 0}}}})
	if err != nil {
		fmt.Println(err)
		return
	}
	sites := []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}
	a, err := coverage.Analyze(sites, area, 30, coverage.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("full cover %.2f m at %d points\n", a.FullCover.Range, len(a.FullCover.Worst))
	fmt.Printf("covered %.4f, uncovered %.2f m²\n", a.CoveredFraction, a.UncoveredArea)
	for _, p := range a.Percentiles {
		fmt.Printf("%.0f%% covered from %.2f m\n", 100*p.Fraction, p.Range)
	}
	for _, g := range a.Gaps[:3] {
		fmt.Printf("gap %d: %.2f m² at (%.1f, %.1f), closes at %.2f m, boundary %v, sites %v\n",
			g.ID, g.Area, g.Centroid[0], g.Centroid[1], g.ClosingRange, g.TouchesBoundary, g.Sites)
	}
	fmt.Printf("%d gaps; union of disks: %d piece, %d enclosed hole\n", len(a.Gaps), a.Pieces, a.EnclosedHoles)
	// Output:
	// full cover 35.36 m at 9 points
	// covered 0.9509, uncovered 490.89 m²
	// 50% covered from 19.95 m
	// 90% covered from 27.88 m
	// 95% covered from 29.95 m
	// 99% covered from 32.89 m
	// gap 1: 122.72 m² at (50.0, 50.0), closes at 35.36 m, boundary false, sites [0 1 2 3]
	// gap 2: 61.36 m² at (2.6, 50.0), closes at 35.36 m, boundary true, sites [0 2]
	// gap 3: 61.36 m² at (50.0, 2.6), closes at 35.36 m, boundary true, sites [0 1]
	// 9 gaps; union of disks: 1 piece, 1 enclosed hole
}

// The coverage curve of a single device at the centre of a 10 m square:
// the covered fraction is πr²/100 until the disk reaches the sides.
func ExampleCurve() {
	area, _ := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}}})
	l, err := coverage.NewLayout([]orb.Point{{5, 5}}, area)
	if err != nil {
		fmt.Println(err)
		return
	}
	c := l.Curve()
	fmt.Printf("at 4 m: %.6f (π·16/100 = %.6f)\n", c.CoveredFraction(4), 3.14159265358979*16/100)
	fmt.Printf("half covered from %.6f m\n", c.RangeFor(0.5))
	fmt.Printf("fully covered from %.6f m\n", c.RangeFor(1))
	// Output:
	// at 4 m: 0.502655 (π·16/100 = 0.502655)
	// half covered from 3.989423 m
	// fully covered from 7.071068 m
}
