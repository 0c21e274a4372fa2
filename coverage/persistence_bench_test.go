// Benchmarks of the alpha filtration and its persistence (NewFiltration +
// ComputePersistence) on uniform, clustered and grid layouts of 10^4, 10^5
// and 10^6 sites. The Delaunay triangulation is built outside the timer.
// Reference point: GUDHI AlphaComplex persistence of 10^6 uniform sites
// took 47.6 s on this machine (figure given with the task, not measured
// here).

package coverage

import (
	"fmt"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

func BenchmarkPersistence(b *testing.B) {
	gens := []struct {
		name string
		gen  func(n int) []orb.Point
	}{
		{"uniform", func(n int) []orb.Point { return sitegen.Uniform(n, 1) }},
		{"clustered", func(n int) []orb.Point { return sitegen.Clustered(n, 1) }},
		{"grid", sitegen.Grid},
	}
	for _, g := range gens {
		for _, n := range []int{10_000, 100_000, 1_000_000} {
			b.Run(fmt.Sprintf("%s-%d", g.name, n), func(b *testing.B) {
				tri, err := planar.Triangulate(g.gen(n))
				if err != nil {
					b.Fatal(err)
				}
				b.ReportAllocs()
				var holes int
				for b.Loop() {
					p := ComputePersistence(tri, NewFiltration(tri))
					holes = len(p.Holes)
				}
				b.ReportMetric(float64(holes), "holes")
			})
		}
	}
}
