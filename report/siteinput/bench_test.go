// Benchmark of reading sites: 100 000 random Point features over about
// 10 km × 10 km, the same file as the whole-run benchmarks of
// cmd/sitecover write.
//
//	go test -run '^$' -bench LoadSites -benchtime 3x -count 3 ./report/siteinput

package siteinput

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func BenchmarkLoadSites100kGeoJSON(b *testing.B) {
	const n = 100000
	rng := rand.New(rand.NewPCG(1, 2))
	var g strings.Builder
	g.WriteString(`{"type":"FeatureCollection","features":[`)
	for i := 0; i < n; i++ {
		if i > 0 {
			g.WriteByte(',')
		}
		fmt.Fprintf(&g, `{"type":"Feature","properties":{"name":"s%d"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
			i, -99.0+0.126*rng.Float64(), 44.0+0.09*rng.Float64())
		rng.Float64() // the planar CSV column of the whole-run benchmarks
		rng.Float64()
	}
	g.WriteString("]}")
	geo := filepath.Join(b.TempDir(), "sites.geojson")
	if err := os.WriteFile(geo, []byte(g.String()), 0o644); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		src, err := ReadFile(geo, "--sites")
		if err != nil {
			b.Fatal(err)
		}
		if _, err := loadSites(src, false); err != nil {
			b.Fatal(err)
		}
	}
}
