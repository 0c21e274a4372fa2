// Benchmarks of the planners. Targets on the 2-core machine (issue 5):
// Failures for a million devices ≤ 5 s; Assign of a million points ≤ 1 s;
// SuggestAdditions of 100 devices to 10 000 ≤ 10 s; ChooseCandidates of
// 1 000 among 10 000 candidates ≤ 10 s. The layout is built before the
// timed loop (its cost is BenchmarkAnalyze's); sub-benchmarks follow the
// uniform-N / clustered-N / grid-N naming of DEVELOPERS.md.
//
//	go test -run '^$' -bench 'Failures|Assign|Suggest|ChooseCandidates' -benchtime 1x ./coverage

package coverage

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// planBenchLayout builds a layout of pts inside the square enclosing them
// (side √n·10 m, the generators' square).
func planBenchLayout(b *testing.B, pts []orb.Point) *Layout {
	b.Helper()
	side := math.Sqrt(float64(len(pts))) * 10
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {side, 0}, {side, side}, {0, side}, {0, 0}}}})
	if err != nil {
		b.Fatal(err)
	}
	l, err := NewLayout(pts, reg)
	if err != nil {
		b.Fatal(err)
	}
	return l
}

func planBenchScenes(n int) []struct {
	name string
	gen  func() []orb.Point
} {
	return []struct {
		name string
		gen  func() []orb.Point
	}{
		{fmt.Sprintf("uniform-%d", n), func() []orb.Point { return sitegen.Uniform(n, 1) }},
		{fmt.Sprintf("clustered-%d", n), func() []orb.Point { return sitegen.Clustered(n, 2) }},
		{fmt.Sprintf("grid-%d", n), func() []orb.Point { return sitegen.Grid(n) }},
	}
}

func BenchmarkFailures(b *testing.B) {
	for _, n := range []int{10000, 100000, 1000000} {
		for _, sc := range planBenchScenes(n) {
			b.Run(sc.name, func(b *testing.B) {
				l := planBenchLayout(b, sc.gen())
				for b.Loop() {
					if _, err := Failures(l, 12); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/device")
			})
		}
	}
}

func BenchmarkAssign(b *testing.B) {
	const np = 1000000
	for _, n := range []int{10000, 100000} {
		b.Run(fmt.Sprintf("uniform-%d/points-%d", n, np), func(b *testing.B) {
			l := planBenchLayout(b, sitegen.Uniform(n, 3))
			side := math.Sqrt(float64(n)) * 10
			rng := rand.New(rand.NewPCG(5, 6))
			pts := make([]orb.Point, np)
			w := make([]float64, np)
			for i := range pts {
				pts[i] = orb.Point{rng.Float64() * side, rng.Float64() * side}
				w[i] = rng.Float64()
			}
			for b.Loop() {
				if _, err := Assign(l, pts, w, 12); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkSuggest(b *testing.B) {
	for _, sc := range planBenchScenes(10000) {
		b.Run(sc.name+"/add-100", func(b *testing.B) {
			l := planBenchLayout(b, sc.gen())
			for b.Loop() {
				if _, err := SuggestAdditions(l, 100, SuggestOptions{Range: 10}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkChooseCandidates(b *testing.B) {
	const nc, k = 10000, 1000
	for _, sc := range planBenchScenes(1000) {
		b.Run(fmt.Sprintf("%s/candidates-%d/pick-%d", sc.name, nc, k), func(b *testing.B) {
			l := planBenchLayout(b, sc.gen())
			side := math.Sqrt(1000) * 10
			rng := rand.New(rand.NewPCG(7, 8))
			cands := make([]orb.Point, nc)
			for i := range cands {
				cands[i] = orb.Point{rng.Float64() * side, rng.Float64() * side}
			}
			for b.Loop() {
				if _, err := ChooseCandidates(l, cands, 6, k); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkFailuresRanges: FailuresRanges on the mixed 40/60/120/150 m
// layouts of the ranges benchmarks (mixedLayout, one device per
// 100 m × 100 m, many hidden sensors inside gateways' disks).
func BenchmarkFailuresRanges(b *testing.B) {
	for _, n := range []int{10_000, 100_000} {
		l, _, _ := mixedLayout(b, n, 3)
		b.Run(fmt.Sprintf("mixed-%d", n), func(b *testing.B) {
			for b.Loop() {
				if _, err := FailuresRanges(l); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkAssignPowerCells: a million demand points on the mixed layout
// of 100 000 devices.
func BenchmarkAssignPowerCells(b *testing.B) {
	l, _, _ := mixedLayout(b, 100_000, 3)
	rng := rand.New(rand.NewPCG(1, 2))
	side := 100 * math.Sqrt(100_000)
	pts := make([]orb.Point, 1_000_000)
	for i := range pts {
		pts[i] = orb.Point{rng.Float64() * side, rng.Float64() * side}
	}
	b.ResetTimer()
	for b.Loop() {
		if _, err := AssignPowerCells(l, pts, nil); err != nil {
			b.Fatal(err)
		}
	}
}
