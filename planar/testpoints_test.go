// Shared test-point generators for the planar package tests and benchmarks.
//
// No geometry is computed here: the generators produce reproducible point
// sets (math/rand/v2 PCG seeded by the caller) with known statistical shape:
//   - uniformPoints: n points uniform in a square of side sqrt(n)*10 m, so
//     the mean spacing is about 10 m whatever n is;
//   - gridPoints: a square grid of spacing 10 m (every unit square has four
//     cocircular corners, the classic degenerate case for Delaunay code);
//   - clusteredPoints: isotropic gaussian clusters of varied size and
//     spread, the shape of real device layouts (dense buildings, sparse
//     fields).
// Coordinates are exact multiples of 10 m for the grid and arbitrary float64
// values for the others.

package planar

import (
	"math"
	"math/rand/v2"

	"github.com/paulmach/orb"
)

// uniformPoints returns n points uniform in the square [0, sqrt(n)*10)^2
// metres, reproducible from seed.
func uniformPoints(n int, seed uint64) []orb.Point {
	r := rand.New(rand.NewPCG(seed, 0x5eed0001))
	side := math.Sqrt(float64(n)) * 10
	pts := make([]orb.Point, n)
	for i := range pts {
		pts[i] = orb.Point{r.Float64() * side, r.Float64() * side}
	}
	return pts
}

// gridPoints returns a square grid of spacing 10 m with about n points
// (k*k points, k = round(sqrt(n)), at least 1 when n > 0), in row order.
func gridPoints(n int) []orb.Point {
	if n <= 0 {
		return nil
	}
	k := int(math.Round(math.Sqrt(float64(n))))
	if k < 1 {
		k = 1
	}
	pts := make([]orb.Point, 0, k*k)
	for j := 0; j < k; j++ {
		for i := 0; i < k; i++ {
			pts = append(pts, orb.Point{float64(i) * 10, float64(j) * 10})
		}
	}
	return pts
}

// clusteredPoints returns n points drawn from gaussian clusters of varied
// size and spread inside a square of side sqrt(n)*10 m, reproducible from
// seed. Cluster weights vary over two orders of magnitude and standard
// deviations from 2 m to a tenth of the square's side.
func clusteredPoints(n int, seed uint64) []orb.Point {
	r := rand.New(rand.NewPCG(seed, 0x5eed0002))
	side := math.Sqrt(float64(n)) * 10
	nc := 1 + int(math.Sqrt(float64(n))/4)
	if nc > 200 {
		nc = 200
	}
	cx := make([]float64, nc)
	cy := make([]float64, nc)
	sd := make([]float64, nc)
	cum := make([]float64, nc)
	total := 0.0
	for c := 0; c < nc; c++ {
		cx[c] = r.Float64() * side
		cy[c] = r.Float64() * side
		// Log-uniform spread between 2 m and side/10.
		lo, hi := math.Log(2), math.Log(math.Max(2.5, side/10))
		sd[c] = math.Exp(lo + r.Float64()*(hi-lo))
		total += math.Exp(r.Float64() * math.Log(100)) // weights 1..100
		cum[c] = total
	}
	pts := make([]orb.Point, n)
	for i := range pts {
		u := r.Float64() * total
		lo, hi := 0, nc-1
		for lo < hi {
			mid := (lo + hi) / 2
			if cum[mid] < u {
				lo = mid + 1
			} else {
				hi = mid
			}
		}
		c := lo
		pts[i] = orb.Point{cx[c] + r.NormFloat64()*sd[c], cy[c] + r.NormFloat64()*sd[c]}
	}
	return pts
}
