// Benchmarks of the report outputs on 100 000 sites (issue 4: both PNG
// maps for 100 000 sites within 5 s). The analysis is computed once,
// outside the timer.

package report

import (
	"math"
	"math/rand/v2"
	"sync"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

var (
	bigOnce sync.Once
	bigAn   *coverage.Analysis
)

// bigScene is 100 000 sites uniform in a square of side √n·10 m (mean
// spacing 10 m) at range 6 m, which leaves tens of thousands of gaps.
func bigScene(b *testing.B) *coverage.Analysis {
	bigOnce.Do(func() {
		const n = 100_000
		r := rand.New(rand.NewPCG(7, 0x5eed))
		side := math.Sqrt(n) * 10
		sites := make([]orb.Point, n)
		for i := range sites {
			sites[i] = orb.Point{r.Float64() * side, r.Float64() * side}
		}
		bigAn = analyze(b, sites, region(b, square(side)), 6)
	})
	return bigAn
}

// BenchmarkMaps draws and encodes both PNG maps for 100 000 sites.
func BenchmarkMaps(b *testing.B) {
	an := bigScene(b)
	s := newScene(an.Layout, an, Meta{Planar: true, Title: "100 000 sites"})
	b.ResetTimer()
	for range b.N {
		if _, err := s.serviceAreaMap(DefaultMapWidth); err != nil {
			b.Fatal(err)
		}
		if _, err := s.coverageMap(DefaultMapWidth); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkWriteNoPNG writes report.txt, summary.json and the GeoJSON
// layers for 100 000 sites (the part of `analyze` after the analysis).
func BenchmarkWriteNoPNG(b *testing.B) {
	an := bigScene(b)
	dir := b.TempDir()
	b.ResetTimer()
	for range b.N {
		if _, err := WriteAnalysis(dir, an, Meta{Planar: true}, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCharts draws both charts for 100 000 sites.
func BenchmarkCharts(b *testing.B) {
	an := bigScene(b)
	s := newScene(an.Layout, an, Meta{Planar: true})
	b.ResetTimer()
	for range b.N {
		if _, err := s.curveChart(DefaultMapWidth); err != nil {
			b.Fatal(err)
		}
		if _, err := s.holeChart(DefaultMapWidth); err != nil {
			b.Fatal(err)
		}
	}
}
