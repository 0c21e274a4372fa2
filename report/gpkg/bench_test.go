// Benchmarks of writing and reading a GeoPackage: 100 000 point features
// with three attributes (TEXT, INTEGER, REAL), written without and with
// the R-tree index, and read back. Reported per feature: ns/feature,
// B/feature (Go heap allocated; SQLite's own page cache lives outside the
// Go heap and is bounded by its cache_size, 2 MiB by default) and
// file-B/feature (size of the file).
//
//	go test -run '^$' -bench 'WriteGPKG|ReadGPKG' -benchtime 1x -count 5 ./report/gpkg

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

// benchFeatures is the number of features of the benchmarks.
const benchFeatures = 100000

// benchPoints returns the benchmark's points (random over about 10 km ×
// 10 km, as the site-loading benchmark of report/siteinput) and names.
func benchPoints() ([]orb.Point, []string) {
	const n = benchFeatures
	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([]orb.Point, n)
	for i := range pts {
		pts[i] = orb.Point{-99.0 + 0.126*rng.Float64(), 44.0 + 0.09*rng.Float64()}
	}
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("s%d", i)
	}
	return pts, names
}

// writeBench writes the benchmark's layer to path.
func writeBench(b *testing.B, path string, pts []orb.Point, names []string, index bool) {
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
}

func BenchmarkWriteGPKG(b *testing.B) {
	const n = benchFeatures
	pts, names := benchPoints()
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
				writeBench(b, path, pts, names, index)
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

func BenchmarkReadGPKG(b *testing.B) {
	const n = benchFeatures
	pts, names := benchPoints()
	b.Run(fmt.Sprintf("points-%d", n), func(b *testing.B) {
		path := filepath.Join(b.TempDir(), "read.gpkg")
		writeBench(b, path, pts, names, false)
		runtime.GC()
		var before, after runtime.MemStats
		runtime.ReadMemStats(&before)
		b.ResetTimer()
		for i := 0; i < b.N; i++ {
			r, err := Open(path)
			if err != nil {
				b.Fatal(err)
			}
			count := 0
			if err := r.ReadLayer("sites", func(Feature) error { count++; return nil }); err != nil {
				b.Fatal(err)
			}
			r.Close()
			if count != n {
				b.Fatalf("read %d features", count)
			}
		}
		b.StopTimer()
		runtime.ReadMemStats(&after)
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/feature")
		b.ReportMetric(float64(after.TotalAlloc-before.TotalAlloc)/float64(b.N)/n, "B/feature")
	})
}
