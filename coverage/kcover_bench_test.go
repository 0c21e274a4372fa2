// Benchmarks of KCover (kcover.go): k = 2 up to 1 000 000 devices, k = 3
// and 4 up to 100 000, on uniform and grid layouts (the layout, i.e. the
// triangulation and the clipped order-1 cells, is built before the timer
// starts; BenchmarkAnalyze times it). Only level k is reported; the levels
// below it are enumerated.

package coverage

import (
	"fmt"
	"runtime"
	"sync/atomic"
	"syscall"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

func BenchmarkKCover(b *testing.B) {
	type gen struct {
		name string
		make func(n int) []orb.Point
	}
	gens := []gen{
		{"uniform", func(n int) []orb.Point { return sitegen.Uniform(n, 1) }},
		{"grid", sitegen.Grid},
	}
	for _, k := range []int{2, 3, 4} {
		sizes := []int{10_000, 100_000}
		if k == 2 {
			sizes = append(sizes, 1_000_000)
		}
		for _, g := range gens {
			for _, n := range sizes {
				b.Run(fmt.Sprintf("k%d/%s-%d", k, g.name, n), func(b *testing.B) {
					sites := g.make(n)
					l := planBenchLayout(b, sites)
					var kc *KCoverage
					cpu0 := kBenchCPU()
					benchMemory(b, n, func() {
						var err error
						if kc, err = KCover(l, 12, KOptions{Levels: []int{k}}); err != nil {
							b.Fatal(err)
						}
					})
					b.ReportMetric((kBenchCPU()-cpu0)/float64(b.N), "cpu-s/op")
					b.ReportMetric(float64(kc.Levels[0].Cells)/float64(n), "cells/site")
				})
			}
		}
	}
}

// kBenchCPU returns the user plus system CPU seconds of the process: on a
// shared machine a steadier figure than the wall time (the wall time on an
// idle machine is about the CPU time divided by the cores in use).
func kBenchCPU() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return float64(ru.Utime.Nano()+ru.Stime.Nano()) / 1e9
}

// benchMemory runs run b.N times with the timer on and reports the bytes
// allocated per run and the peak heap growth, both per site (n sites).
func benchMemory(b *testing.B, n int, run func()) {
	runtime.GC()
	var ms0, ms1 runtime.MemStats
	runtime.ReadMemStats(&ms0)
	var peak atomic.Uint64
	base := ms0.HeapAlloc
	stop := make(chan struct{})
	done := make(chan struct{})
	go func() { benchPeak(stop, &peak); close(done) }()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		run()
	}
	b.StopTimer()
	close(stop)
	<-done
	runtime.ReadMemStats(&ms1)
	b.ReportMetric(float64(ms1.TotalAlloc-ms0.TotalAlloc)/float64(b.N)/float64(n), "alloc-B/site")
	if p := peak.Load(); p > base {
		b.ReportMetric(float64(p-base)/float64(n), "peak-B/site")
	}
}
