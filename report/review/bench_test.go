// Benchmark of the server's update path: one edit through the HTTP handler
// (decode, validate, recompute with package coverage, encode the new state)
// on a session of 10 000 devices. Target: ≤ 100 ms per edit.

package review

import (
	"fmt"
	"math/rand/v2"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// benchSide is the side of the benchmark's square site (m); benchSpacing
// the mean device spacing, benchRange the range (about 97 % covered, with
// hundreds of gaps to outline).
const (
	benchDevices = 10000
	benchSide    = 5000.0
	benchRange   = 55.0
)

// benchServer is a session of n uniform random devices in a square.
func benchServer(b *testing.B, n int) http.Handler {
	b.Helper()
	return newBenchServer(b, n).Handler()
}

// newBenchServer is benchServer's server; with a spread (m) the devices
// have their own ranges, uniform in [benchRange − spread, benchRange].
func newBenchServer(b testing.TB, n int, spread ...float64) *Server {
	rng := rand.New(rand.NewPCG(1, 2))
	sites := make([]orb.Point, n)
	for i := range sites {
		sites[i] = orb.Point{rng.Float64() * benchSide, rng.Float64() * benchSide}
	}
	var ranges []float64
	if len(spread) > 0 {
		ranges = make([]float64, n)
		for i := range ranges {
			ranges[i] = benchRange - spread[0]*rng.Float64()
		}
	}
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {benchSide, 0}, {benchSide, benchSide}, {0, benchSide}, {0, 0}}}})
	if err != nil {
		b.Fatal(err)
	}
	sv, err := New(Config{Sites: sites, Region: reg, Range: benchRange, Ranges: ranges})
	if err != nil {
		b.Fatal(err)
	}
	return sv
}

// benchEdit sends one edit and fails on an error status.
func benchEdit(b *testing.B, h http.Handler, body string) {
	req := httptest.NewRequest(http.MethodPost, "/api/edit", strings.NewReader(body))
	req.Host = testHost
	req.Header.Set("Content-Type", "application/json")
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != http.StatusOK {
		b.Fatalf("%s: status %d: %s", body, rec.Code, rec.Body.Bytes())
	}
}

// benchRangeSpread is the spread of the own ranges of the benchmark with
// own ranges: benchRange − benchRangeSpread to benchRange (about a
// quarter of the devices hidden).
const benchRangeSpread = 25.0

// BenchmarkReviewUpdate10k times one edit on 10 000 devices: "move" (a
// device edit: the layout is rebuilt) and "range" (the layout is kept);
// "ranges-" the same with own ranges, and "ranges-device" the selected
// device's figures on the first request after a move (untimed): the page
// asks for them after every edit (served area and the loss if it fails,
// failures.go). The edits are sent with "patch" and "later" as the page
// sends them: the device list answered as a patch, and with own ranges
// the coverage curve of a move left out; "ranges-curve" times the page's
// follow-up request for it after a move (untimed).
func BenchmarkReviewUpdate10k(b *testing.B) {
	h := benchServer(b, benchDevices)
	rng := rand.New(rand.NewPCG(3, 4))
	benchUpdates(b, h, rng, "")
	sv := newBenchServer(b, benchDevices, benchRangeSpread)
	benchUpdates(b, sv.Handler(), rng, "ranges-")
	hr := sv.Handler()
	b.Run("ranges-device", func(b *testing.B) {
		for b.Loop() {
			i := rng.IntN(benchDevices)
			benchAfterMove(b, hr, rng, fmt.Sprintf("/api/device/%d", i))
		}
	})
	b.Run("ranges-curve", func(b *testing.B) {
		for b.Loop() {
			benchAfterMove(b, hr, rng, "/api/curve")
		}
	})
}

// benchAfterMove moves a random device (untimed), then times GET path.
func benchAfterMove(b *testing.B, h http.Handler, rng *rand.Rand, path string) {
	b.StopTimer()
	benchEdit(b, h, fmt.Sprintf(`{"op":"move","device":%d,"x":%v,"y":%v,"patch":true,"later":true}`,
		rng.IntN(benchDevices), rng.Float64()*benchSide, rng.Float64()*benchSide))
	b.StartTimer()
	req := httptest.NewRequest(http.MethodGet, path, nil)
	req.Host = testHost
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != http.StatusOK {
		b.Fatalf("%s: status %d: %s", path, rec.Code, rec.Body.Bytes())
	}
}

// benchUpdates runs the "move" and "range" cases on h, named with prefix.
func benchUpdates(b *testing.B, h http.Handler, rng *rand.Rand, prefix string) {
	b.Run(prefix+"move", func(b *testing.B) {
		for b.Loop() {
			benchEdit(b, h, fmt.Sprintf(`{"op":"move","device":%d,"x":%v,"y":%v,"patch":true,"later":true}`,
				rng.IntN(benchDevices), rng.Float64()*benchSide, rng.Float64()*benchSide))
		}
	})
	b.Run(prefix+"range", func(b *testing.B) {
		k := 0
		for b.Loop() {
			k++
			benchEdit(b, h, fmt.Sprintf(`{"op":"range","range":%v,"patch":true,"later":true}`, benchRange+float64(k%8)))
		}
	})
}
