// Benchmarks of the report outputs on 100 000 sites (issue 4: both PNG
// maps for 100 000 sites within 5 s). The analysis is computed once,
// outside the timer.

package report

import (
	"io"
	"math"
	"math/rand/v2"
	"runtime"
	"runtime/metrics"
	"sync"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
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

// BenchmarkWriteNoPNG writes report.txt, summary.json, the GeoJSON
// layers and the GeoPackage for 100 000 sites (the part of `analyze` after the analysis).
func BenchmarkWriteNoPNG(b *testing.B) {
	an := bigScene(b)
	dir := b.TempDir()
	peak := startPeakHeap()
	b.ResetTimer()
	for range b.N {
		if _, err := WriteAnalysis(dir, an, Meta{Planar: true}, Options{}); err != nil {
			b.Fatal(err)
		}
	}
	reportPerSite(b, peak, len(an.Layout.Sites))
}

// peakHeap samples the live heap (runtime/metrics, cheap enough to read
// every millisecond) from its start until stop, keeping the largest value
// above the heap at the start: the memory the measured code held at once.
type peakHeap struct {
	base, peak uint64
	before     runtime.MemStats
	done       chan struct{}
	wg         sync.WaitGroup
}

// heapSampleEvery is how often peakHeap reads the heap size; an allocation
// freed within one interval can be missed, which matters little for the
// megabyte buffers this measures.
const heapSampleEvery = time.Millisecond

func startPeakHeap() *peakHeap {
	runtime.GC()
	p := &peakHeap{done: make(chan struct{})}
	sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	metrics.Read(sample)
	p.base = sample[0].Value.Uint64()
	runtime.ReadMemStats(&p.before)
	p.wg.Go(func() {
		t := time.NewTicker(heapSampleEvery)
		defer t.Stop()
		for {
			select {
			case <-p.done:
				return
			case <-t.C:
				metrics.Read(sample)
				p.peak = max(p.peak, sample[0].Value.Uint64())
			}
		}
	})
	return p
}

// reportPerSite stops p and reports the bytes allocated per site and per
// run (B/site) and the peak live heap above the start per site
// (peak-B/site).
func reportPerSite(b *testing.B, p *peakHeap, sites int) {
	close(p.done)
	p.wg.Wait()
	var after runtime.MemStats
	runtime.ReadMemStats(&after)
	n := float64(sites) * float64(b.N)
	b.ReportMetric(float64(after.TotalAlloc-p.before.TotalAlloc)/n, "B/site")
	if p.peak > p.base {
		b.ReportMetric(float64(p.peak-p.base)/float64(sites), "peak-B/site")
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

// BenchmarkFiles streams each text and GeoJSON output for 100 000 sites
// to io.Discard (no file system, no GeoPackage), for geographic output (lon/lat through the
// inverse projection) and planar output.
func BenchmarkFiles(b *testing.B) {
	an := bigScene(b)
	tm := planar.NewTransverseMercator(planar.WGS84, -99, 44, 1, 0, 0)
	for _, mode := range []struct {
		name string
		m    Meta
	}{
		{"geographic", Meta{ToLonLat: tm.Inverse}},
		{"planar", Meta{Planar: true}},
	} {
		s := newScene(an.Layout, an, mode.m)
		s.listMax = SummaryListMax
		for _, f := range []struct {
			name string
			make func() error
		}{
			{"report.txt", func() error { return s.writeTextTo(io.Discard) }},
			{"summary.json", func() error { return writeDoc(io.Discard, s.summary()) }},
			{"sites", func() error { return s.writeLayer(io.Discard, s.sitesLayer(), nil) }},
			{"service-areas", func() error { return s.writeLayer(io.Discard, s.serviceAreasLayer(), nil) }},
			{"gaps", func() error { return s.writeLayer(io.Discard, s.gapsLayer(), nil) }},
			{"hole-closings", func() error { return s.writeLayer(io.Discard, s.holesLayer(), nil) }},
			{"covered", func() error { return s.writeLayer(io.Discard, s.coveredLayer(), nil) }},
		} {
			b.Run(mode.name+"/"+f.name, func(b *testing.B) {
				peak := startPeakHeap()
				for range b.N {
					if err := f.make(); err != nil {
						b.Fatal(err)
					}
				}
				reportPerSite(b, peak, len(an.Layout.Sites))
			})
		}
	}
}
