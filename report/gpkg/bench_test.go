// Benchmark of writing a GeoPackage: 100 000 point features with three
// attributes (TEXT, INTEGER, REAL), without and with the R-tree index.
// Reported per feature: ns/feature, B/feature (Go heap allocated; SQLite's
// own page cache lives outside the Go heap and is bounded by its
// cache_size, 2 MiB by default) and file-B/feature (size of the file).
//
//	go test -run '^$' -bench WriteGPKG -benchtime 1x -count 5 ./report/gpkg

package gpkg

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"testing"

	"github.com/paulmach/orb"
)

func BenchmarkWriteGPKG(b *testing.B) {
	const n = 100000
	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([]orb.Point, n)
	for i := range pts {
		pts[i] = orb.Point{-99.0 + 0.126*rng.Float64(), 44.0 + 0.09*rng.Float64()}
	}
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("s%d", i)
	}
	for _, index := range []bool{false, true} {
		name := fmt.Sprintf("points-%d", n)
		if index {
			name += "-rtree"
		}
		b.Run(name, func(b *testing.B) {
			dir := b.TempDir()
			var size int64
			runtime.GC()
			var before, after runtime.MemStats
			runtime.ReadMemStats(&before)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				path := filepath.Join(dir, fmt.Sprintf("%d.gpkg", i))
				w, err := Create(path, Options{})
				if err != nil {
					b.Fatal(err)
				}
				l, err := w.AddLayer(LayerSpec{Name: "sites", Geometry: Point, SRS: WGS84, SpatialIndex: index,
					Fields: []Field{{"name", Text}, {"index", Integer}, {"range_m", Real}}})
				if err != nil {
					b.Fatal(err)
				}
				for j, p := range pts {
					if err := l.Insert(p, names[j], j, 25.0); err != nil {
						b.Fatal(err)
					}
				}
				if err := w.Close(); err != nil {
					b.Fatal(err)
				}
				b.StopTimer()
				st, err := os.Stat(path)
				if err != nil {
					b.Fatal(err)
				}
				size = st.Size()
				os.Remove(path)
				b.StartTimer()
			}
			b.StopTimer()
			runtime.ReadMemStats(&after)
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/feature")
			b.ReportMetric(float64(after.TotalAlloc-before.TotalAlloc)/float64(b.N)/n, "B/feature")
			b.ReportMetric(float64(size)/n, "file-B/feature")
		})
	}
}
