// Runnable example of the alpha-filtration persistence of four sites on a
// square of side 100 m: the disks first touch along the sides at r = 50 m
// (half the side), which closes a loop around the centre; the hole is
// filled at r = 100/√2 ≈ 70.71 m, the circumradius, at the centre of the
// square (elementary geometry).

package coverage_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

func ExampleComputePersistence() {
	sites := []orb.Point{{0, 0}, {100, 0}, {100, 100}, {0, 100}}
	tri, err := planar.Triangulate(sites)
	if err != nil {
		fmt.Println(err)
		return
	}
	p := coverage.ComputePersistence(tri, coverage.NewFiltration(tri))
	for _, m := range p.Merges {
		fmt.Printf("merge at %.2f m\n", m.Death)
	}
	for _, h := range p.Holes {
		fmt.Printf("hole from %.2f m to %.2f m, closes at (%.2f, %.2f)\n",
			h.Birth, h.Death, h.DeathPoint[0], h.DeathPoint[1])
	}
	fmt.Printf("connected from %.2f m, mesh link %.2f m\n", p.ConnectRange, p.LinkRange)
	pieces, holes := p.Betti(60)
	fmt.Printf("at 60 m: %d piece, %d hole\n", pieces, holes)
	// Output:
	// merge at 50.00 m
	// merge at 50.00 m
	// merge at 50.00 m
	// hole from 50.00 m to 70.71 m, closes at (50.00, 50.00)
	// connected from 50.00 m, mesh link 100.00 m
	// at 60 m: 1 piece, 1 hole
}
