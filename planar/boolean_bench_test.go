// Benchmarks of SiteArea on inputs of about 1e5 vertices:
//
//	go test -run '^$' -bench SiteArea -benchtime 1x ./planar

package planar

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
)

// booleanBenchParcels returns an n×n grid of adjacent unit parcels (4n²
// vertices, every inner edge shared) and n²/4 exclusions: squares
// straddling parcel corners and overlapping their neighbours.
func booleanBenchParcels(n int) (area, excl orb.MultiPolygon) {
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			area = append(area, bRect(float64(i), float64(j), float64(i+1), float64(j+1)))
		}
	}
	for i := 1; i < n; i += 2 {
		for j := 1; j < n; j += 2 {
			x, y := float64(i), float64(j)
			excl = append(excl, bRect(x-0.3, y-0.3, x+0.4, y+0.35))
		}
	}
	return area, excl
}

// booleanBenchStar returns one wavy star-shaped area polygon with n vertices
// and m random small triangles as exclusions (many crossing its boundary).
func booleanBenchStar(n, m int) (area, excl orb.MultiPolygon) {
	rng := rand.New(rand.NewPCG(1, 2))
	ring := make(orb.Ring, 0, n+1)
	for i := 0; i < n; i++ {
		// A wavy outline with short edges, as a surveyed boundary has.
		a := 2 * math.Pi * float64(i) / float64(n)
		r := 1000 * (0.85 + 0.1*math.Sin(7*a) + 0.04*math.Sin(60*a) + 0.001*rng.Float64())
		ring = append(ring, orb.Point{5000 + r*math.Cos(a), 3000 + r*math.Sin(a)})
	}
	area = orb.MultiPolygon{{append(ring, ring[0])}}
	for k := 0; k < m; k++ {
		a := 2 * math.Pi * rng.Float64()
		r := 1000 * rng.Float64()
		x, y := 5000+r*math.Cos(a), 3000+r*math.Sin(a)
		s := 5 + 10*rng.Float64()
		excl = append(excl, bPoly(x, y, x+s, y+s*rng.Float64(), x+s*rng.Float64(), y+s))
	}
	return area, excl
}

func BenchmarkSiteArea(b *testing.B) {
	pa, pe := booleanBenchParcels(150)
	sa, se := booleanBenchStar(70000, 10000)
	for _, c := range []struct {
		name       string
		area, excl orb.MultiPolygon
	}{
		{fmt.Sprintf("parcels-%d", 4*len(pa)+4*len(pe)), pa, pe},
		{fmt.Sprintf("star-%d", 70000+3*len(se)), sa, se},
	} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				if _, _, err := SiteArea(c.area, c.excl); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
