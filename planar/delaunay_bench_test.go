// Benchmarks of Triangulate and NearestMany on the shared test-point
// distributions (testpoints_test.go). B/point is the bytes allocated per
// input point by one Triangulate call (result plus working set).

package planar

import (
	"fmt"
	"math/rand/v2"
	"runtime"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

var benchDistributions = []struct {
	name string
	gen  func(n int) []orb.Point
}{
	{"uniform", func(n int) []orb.Point { return sitegen.Uniform(n, 1) }},
	{"grid", sitegen.Grid},
	{"clustered", func(n int) []orb.Point { return sitegen.Clustered(n, 1) }},
}

func BenchmarkTriangulate(b *testing.B) {
	for _, d := range benchDistributions {
		for _, n := range []int{10000, 100000, 1000000} {
			b.Run(fmt.Sprintf("%s-%d", d.name, n), func(b *testing.B) {
				pts := d.gen(n)
				runtime.GC()
				var before, after runtime.MemStats
				runtime.ReadMemStats(&before)
				b.ReportAllocs()
				b.ResetTimer()
				for i := 0; i < b.N; i++ {
					if _, err := Triangulate(pts); err != nil {
						b.Fatal(err)
					}
				}
				b.StopTimer()
				runtime.ReadMemStats(&after)
				perPoint := float64(after.TotalAlloc-before.TotalAlloc) / float64(b.N) / float64(len(pts))
				b.ReportMetric(perPoint, "B/point")
			})
		}
	}
}

func BenchmarkNearestMany(b *testing.B) {
	for _, order := range []string{"random", "sorted"} {
		for _, n := range []int{10000, 1000000} {
			b.Run(fmt.Sprintf("%s-%d", order, n), func(b *testing.B) {
				tr, err := Triangulate(sitegen.Uniform(n, 1))
				if err != nil {
					b.Fatal(err)
				}
				q := benchQueries(n, order)
				out := make([]int32, len(q)/2)
				b.ReportAllocs()
				b.ResetTimer()
				for i := 0; i < b.N; i++ {
					tr.NearestMany(q, out)
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(out)), "ns/query")
			})
		}
	}
}

// benchQueries returns n query points in the square of sitegen.Uniform(n, ·),
// either in random order or row by row (spatially sorted).
func benchQueries(n int, order string) []float64 {
	r := rand.New(rand.NewPCG(7, 7))
	pts := sitegen.Uniform(n, 99)
	if order == "sorted" {
		k := 1
		for k*k < n {
			k++
		}
		side := float64(k) * 10
		pts = pts[:0]
		for j := 0; j < k; j++ {
			for i := 0; i < k && len(pts) < n; i++ {
				x := (float64(i) + r.Float64()) * side / float64(k)
				if j%2 == 1 {
					x = side - x
				}
				pts = append(pts, orb.Point{x, (float64(j) + r.Float64()) * side / float64(k)})
			}
		}
	}
	q := make([]float64, 0, 2*len(pts))
	for _, p := range pts {
		q = append(q, p[0], p[1])
	}
	return q
}
