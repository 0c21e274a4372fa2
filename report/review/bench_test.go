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

// newBenchServer is benchServer's server.
func newBenchServer(b testing.TB, n int) *Server {
	rng := rand.New(rand.NewPCG(1, 2))
	sites := make([]orb.Point, n)
	for i := range sites {
		sites[i] = orb.Point{rng.Float64() * benchSide, rng.Float64() * benchSide}
	}
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {benchSide, 0}, {benchSide, benchSide}, {0, benchSide}, {0, 0}}}})
	if err != nil {
		b.Fatal(err)
	}
	sv, err := New(Config{Sites: sites, Region: reg, Range: benchRange})
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

// BenchmarkReviewUpdate10k times one edit on 10 000 devices: "move" (a
// device edit: the layout is rebuilt) and "range" (the layout is kept).
func BenchmarkReviewUpdate10k(b *testing.B) {
	h := benchServer(b, benchDevices)
	rng := rand.New(rand.NewPCG(3, 4))
	b.Run("move", func(b *testing.B) {
		for b.Loop() {
			benchEdit(b, h, fmt.Sprintf(`{"op":"move","device":%d,"x":%v,"y":%v}`,
				rng.IntN(benchDevices), rng.Float64()*benchSide, rng.Float64()*benchSide))
		}
	})
	b.Run("range", func(b *testing.B) {
		k := 0
		for b.Loop() {
			k++
			benchEdit(b, h, fmt.Sprintf(`{"op":"range","range":%v}`, benchRange+float64(k%8)))
		}
	})
}
