// Benchmark of TriangulateRegular on device layouts: uniform positions at
// about one device per 100 m × 100 m with ranges drawn from 40/60/120/150 m
// (weights = range²). B/point is the bytes allocated per input point by one
// call (result plus working set).

package planar

import (
	"fmt"
	"runtime"
	"testing"

	"github.com/sitecover/sitecover/planar/sitegen"
)

func BenchmarkRegularTriangulate(b *testing.B) {
	for _, n := range []int{100000, 1000000} {
		b.Run(fmt.Sprintf("uniform-%d", n), func(b *testing.B) {
			pts := scaled(sitegen.Uniform(n, 1), 10)
			w := rangeWeights(n, 1)
			runtime.GC()
			var before, after runtime.MemStats
			runtime.ReadMemStats(&before)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, err := TriangulateRegular(pts, w); err != nil {
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
