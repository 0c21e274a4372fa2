// Benchmarks of ClipCells on uniform, grid and clustered sites, clipped to
// a non-convex site area with a hole and a detailed (wavy) boundary that
// covers most of the sites' extent. The triangulation is built outside the
// timer.

package planar

import (
	"fmt"
	"math"
	"sync"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

var clipBenchCache sync.Map // name -> *Triangulation

// clipBenchRegion returns a wavy, non-convex polygon with a wavy hole and a
// notch, inside [0, side]², with about n vertices in all.
func clipBenchRegion(tb testing.TB, side float64, n int) *Region {
	c := side / 2
	outer := make(orb.Ring, 0, n*3/4)
	no := n * 3 / 4
	for i := 0; i < no; i++ {
		a := 2 * math.Pi * float64(i) / float64(no)
		// Radius wobbles by ±6 %, with a deep notch around a = 0.
		r := 0.44 * side * (1 + 0.06*math.Sin(17*a) + 0.02*math.Sin(61*a))
		if d := math.Abs(math.Remainder(a, 2*math.Pi)); d < 0.25 {
			r *= 0.45 + 0.55*d/0.25
		}
		outer = append(outer, orb.Point{c + r*math.Cos(a), c + r*math.Sin(a)})
	}
	hole := make(orb.Ring, 0, n/4)
	nh := n - no
	for i := 0; i < nh; i++ {
		a := -2 * math.Pi * float64(i) / float64(nh)
		r := 0.12 * side * (1 + 0.1*math.Sin(7*a))
		hole = append(hole, orb.Point{c - 0.1*side + r*math.Cos(a), c + 0.05*side + r*math.Sin(a)})
	}
	reg, err := NewRegion(orb.MultiPolygon{{outer, hole}})
	if err != nil {
		tb.Fatal(err)
	}
	return reg
}

func clipBenchTriangulation(b *testing.B, name string, gen func() []orb.Point) *Triangulation {
	if t, ok := clipBenchCache.Load(name); ok {
		return t.(*Triangulation)
	}
	t, err := Triangulate(gen())
	if err != nil {
		b.Fatal(err)
	}
	clipBenchCache.Store(name, t)
	return t
}

func BenchmarkClipCells(b *testing.B) {
	type gen struct {
		name string
		n    int
		f    func(n int) []orb.Point
	}
	gens := []gen{
		{"uniform", 10000, func(n int) []orb.Point { return sitegen.Uniform(n, 1) }},
		{"uniform", 100000, func(n int) []orb.Point { return sitegen.Uniform(n, 1) }},
		{"uniform", 1000000, func(n int) []orb.Point { return sitegen.Uniform(n, 1) }},
		{"grid", 100000, sitegen.Grid},
		{"grid", 1000000, sitegen.Grid},
		{"clustered", 100000, func(n int) []orb.Point { return sitegen.Clustered(n, 1) }},
		{"clustered", 1000000, func(n int) []orb.Point { return sitegen.Clustered(n, 1) }},
	}
	for _, g := range gens {
		name := fmt.Sprintf("%s-%d", g.name, g.n)
		b.Run(name, func(b *testing.B) {
			tri := clipBenchTriangulation(b, name, func() []orb.Point { return g.f(g.n) })
			side := math.Sqrt(float64(g.n)) * 10
			reg := clipBenchRegion(b, side, 4000)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, err := ClipCells(tri, reg); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(tri.NumVertices()), "ns/site")
		})
	}
}

// BenchmarkClipPowerCells clips the power cells of devices at about one per
// 100 m × 100 m with ranges drawn from 40/60/120/150 m (weights = range²)
// to the same kind of area; the regular triangulation is built outside the
// timer.
func BenchmarkClipPowerCells(b *testing.B) {
	for _, n := range []int{100000, 1000000} {
		b.Run(fmt.Sprintf("uniform-%d", n), func(b *testing.B) {
			pts := scaled(sitegen.Uniform(n, 1), 10)
			rt, err := TriangulateRegular(pts, rangeWeights(n, 1))
			if err != nil {
				b.Fatal(err)
			}
			reg := clipBenchRegion(b, math.Sqrt(float64(n))*100, 4000)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, err := rt.PowerCells(reg); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(rt.NumVertices()), "ns/site")
		})
	}
}
