// Package sitegen generates reproducible device layouts for tests and
// benchmarks across the module.
//
// No geometry is computed here: the generators produce reproducible site
// sets (math/rand/v2 PCG seeded by the caller) of known statistical shape:
//   - Uniform: n sites uniform in a square of side sqrt(n)*10 m, so the
//     mean spacing is about 10 m whatever n is;
//   - Grid: a square grid of spacing 10 m (every unit square has four
//     cocircular corners: equal alpha values and Delaunay ties everywhere);
//   - Clustered: isotropic gaussian clusters of varied size and spread,
//     the shape of real device layouts (dense buildings, sparse fields);
//   - TriangularLattice: rows x cols sites of a triangular (hexagonal
//     packing) lattice of spacing s, the thinnest covering of the plane by
//     equal disks (Kershner, Amer. J. Math. 61, 1939).
//
// Grid coordinates are exact multiples of 10 m; the triangular lattice has
// x exact and y = row*s*sqrt(3)/2 rounded once; the random sets are
// arbitrary float64 values. Each generator is O(n).
package sitegen

import (
	"math"
	"math/rand/v2"

	"github.com/paulmach/orb"
)

// Uniform returns n sites uniform in the square [0, sqrt(n)*10)^2
// metres, reproducible from seed.
func Uniform(n int, seed uint64) []orb.Point {
	r := rand.New(rand.NewPCG(seed, 0xc0fe0001))
	side := math.Sqrt(float64(n)) * 10
	pts := make([]orb.Point, n)
	for i := range pts {
		pts[i] = orb.Point{r.Float64() * side, r.Float64() * side}
	}
	return pts
}

// Grid returns a square grid of spacing 10 m with about n sites (k*k
// sites, k = round(sqrt(n)), at least 1 when n > 0), in row order starting
// at the origin.
func Grid(n int) []orb.Point {
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

// Clustered returns n sites drawn from gaussian clusters of varied size
// and spread inside a square of side sqrt(n)*10 m, reproducible from seed.
// Cluster weights vary over two orders of magnitude and standard deviations
// from 2 m to a tenth of the square's side.
func Clustered(n int, seed uint64) []orb.Point {
	r := rand.New(rand.NewPCG(seed, 0xc0fe0002))
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

// TriangularLattice returns rows*cols sites of a triangular lattice of
// spacing s (metres) in row order: site (i, j) is at
// (i*s + (j mod 2)*s/2, j*s*sqrt(3)/2). Every lattice triangle is
// equilateral with circumradius s/sqrt(3).
func TriangularLattice(rows, cols int, s float64) []orb.Point {
	if rows <= 0 || cols <= 0 {
		return nil
	}
	h := s * math.Sqrt(3) / 2
	pts := make([]orb.Point, 0, rows*cols)
	for j := 0; j < rows; j++ {
		off := 0.0
		if j%2 == 1 {
			off = s / 2
		}
		for i := 0; i < cols; i++ {
			pts = append(pts, orb.Point{float64(i)*s + off, float64(j) * h})
		}
	}
	return pts
}
