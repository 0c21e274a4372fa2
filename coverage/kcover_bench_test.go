// Benchmarks of KCover (kcover.go): k = 2 up to 1 000 000 devices, k = 3
// and 4 up to 100 000, on uniform and grid layouts (the layout, i.e. the
// triangulation and the clipped order-1 cells, is built before the timer
// starts; BenchmarkAnalyze times it). Only level k is reported; the levels
// below it are enumerated. And of KCoverRanges (kcover_power.go), k = 2
// and 3 up to 100 000 devices of their own ranges.

package coverage

import (
	"fmt"
	"math"
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
					benchMemory(b, n, "device", func() {
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

// BenchmarkKCoverRanges times KCoverRanges (kcover_power.go) on devices of
// four ranges (benchDevices: some hidden), k = 2 and 3, levels below built
// in full; the layout is built before the timer starts.
func BenchmarkKCoverRanges(b *testing.B) {
	for _, k := range []int{2, 3} {
		for _, n := range []int{10_000, 100_000} {
			b.Run(fmt.Sprintf("k%d/uniform-%d", k, n), func(b *testing.B) {
				sites, ranges := benchDevices(n)
				l, err := NewLayoutRanges(sites, ranges, benchArea(b, sites, 50))
				if err != nil {
					b.Fatal(err)
				}
				var kc *KCoverage
				cpu0 := kBenchCPU()
				benchMemory(b, n, "device", func() {
					if kc, err = KCoverRanges(l, KOptions{Levels: []int{k}}); err != nil {
						b.Fatal(err)
					}
				})
				b.ReportMetric((kBenchCPU()-cpu0)/float64(b.N), "cpu-s/op")
				b.ReportMetric(float64(kc.Levels[0].Cells)/float64(n), "cells/site")
				b.ReportMetric(float64(len(l.Hidden)), "hidden")
			})
		}
	}
}

// BenchmarkKCoverReach times what analyze --reach 3 computes in coverage:
// KCover with levels 1 … 3, the curve and the gaps (their outlines
// merged), then the bands, on 20 000 uniform devices at a range covering
// about 95 % of the area (the layout is built before the timer starts).
func BenchmarkKCoverReach(b *testing.B) {
	const n = 20_000
	sites := sitegen.Uniform(n, 1)
	l := planBenchLayout(b, sites)
	// λπr² = 3 devices in a disk on average: 1 − e^−3 ≈ 95 % covered.
	r := math.Sqrt(3 * l.AreaM2 / (float64(n) * math.Pi))
	cpu0 := kBenchCPU()
	for b.Loop() {
		kc, err := KCover(l, r, KOptions{MaxK: 3, CurveSamples: 65, Gaps: true})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := kc.Bands(l); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric((kBenchCPU()-cpu0)/float64(b.N), "cpu-s/op")
}
