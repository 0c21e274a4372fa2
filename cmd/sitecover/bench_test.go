// Benchmarks of whole command runs (input parsing, projection, analysis
// and the report files) on 100 000 random sites (the reading alone is
// BenchmarkLoadSites100kGeoJSON in report/siteinput):
//
//	go test -run XXX -bench . -benchtime 3x ./cmd/sitecover

package main

import (
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime/metrics"
	"runtime/pprof"
	"slices"
	"strings"
	"testing"
	"time"
)

// benchInputs writes n random sites over about 10 km × 10 km as a
// geographic GeoJSON file and a planar CSV file.
func benchInputs(b *testing.B, n int) (geo, xy string) {
	b.Helper()
	rng := rand.New(rand.NewPCG(1, 2))
	var g, c strings.Builder
	g.WriteString(`{"type":"FeatureCollection","features":[`)
	c.WriteString("name,x,y\n")
	for i := 0; i < n; i++ {
		if i > 0 {
			g.WriteByte(',')
		}
		fmt.Fprintf(&g, `{"type":"Feature","properties":{"name":"s%d"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
			i, -99.0+0.126*rng.Float64(), 44.0+0.09*rng.Float64())
		fmt.Fprintf(&c, "s%d,%.3f,%.3f\n", i, 1e4*rng.Float64(), 1e4*rng.Float64())
	}
	g.WriteString("]}")
	dir := b.TempDir()
	geo = filepath.Join(dir, "sites.geojson")
	xy = filepath.Join(dir, "sites.csv")
	writeBench(b, geo, g.String())
	writeBench(b, xy, c.String())
	return geo, xy
}

func writeBench(b *testing.B, path, s string) {
	b.Helper()
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		b.Fatal(err)
	}
}

func benchRun(b *testing.B, args ...string) {
	b.Helper()
	for i := 0; i < b.N; i++ {
		if code := run(args, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}

func BenchmarkAnalyze100kGeoJSONNoMaps(b *testing.B) {
	geo, _ := benchInputs(b, 100000)
	out := filepath.Join(b.TempDir(), "out")
	b.ResetTimer()
	benchRun(b, "analyze", "--sites", geo, "--range", "30m", "--out", out, "--no-maps")
}

func BenchmarkAnalyze100kCSVPlanarNoMaps(b *testing.B) {
	_, xy := benchInputs(b, 100000)
	out := filepath.Join(b.TempDir(), "out")
	b.ResetTimer()
	benchRun(b, "analyze", "--planar", "--sites", xy, "--range", "30", "--out", out, "--no-maps")
}

// BenchmarkAnalyzeFilePlanarNoMaps runs analyze --planar --no-maps on the
// CSV file named by SITECOVER_BENCH_SITES at the range SITECOVER_BENCH_RANGE
// (default 100), for profiling whole runs on large generated layouts (with
// SITECOVER_BENCH_LONLAT set, the file holds longitude/latitude and the run
// projects it), e.g.
//
//	SITECOVER_BENCH_SITES=/tmp/s1e6.csv go test -run XXX -bench AnalyzeFile -benchtime 1x -cpuprofile cpu.out ./cmd/sitecover
func BenchmarkAnalyzeFilePlanarNoMaps(b *testing.B) {
	sites := os.Getenv("SITECOVER_BENCH_SITES")
	if sites == "" {
		b.Skip("SITECOVER_BENCH_SITES is not set")
	}
	rng := os.Getenv("SITECOVER_BENCH_RANGE")
	if rng == "" {
		rng = "100"
	}
	out := filepath.Join(b.TempDir(), "out")
	if path := os.Getenv("SITECOVER_BENCH_PEAKHEAP"); path != "" {
		stop := peakHeapProfiles(b, path)
		defer stop()
	}
	args := []string{"analyze", "--planar", "--sites", sites, "--range", rng, "--out", out, "--no-maps"}
	if os.Getenv("SITECOVER_BENCH_LONLAT") != "" {
		args = slices.Delete(args, 1, 2) // longitude/latitude sites: projected
	}
	b.ResetTimer()
	benchRun(b, args...)
}

// peakHeapProfiles writes a heap profile to path whenever the live heap
// after a collection (runtime/metrics /gc/heap/live:bytes) reaches a new
// high, checked every 100 ms, so that path ends up describing the heap at
// about its peak; the returned function stops the checks.
func peakHeapProfiles(b *testing.B, path string) (stop func()) {
	b.Helper()
	done := make(chan struct{})
	finished := make(chan struct{})
	go func() {
		defer close(finished)
		sample := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
		var high uint64
		tick := time.NewTicker(100 * time.Millisecond)
		defer tick.Stop()
		for {
			select {
			case <-done:
				return
			case <-tick.C:
			}
			metrics.Read(sample)
			if v := sample[0].Value.Uint64(); v > high {
				high = v
				if f, err := os.Create(path); err == nil {
					pprof.Lookup("heap").WriteTo(f, 0)
					f.Close()
				}
			}
		}
	}()
	return func() { close(done); <-finished }
}
