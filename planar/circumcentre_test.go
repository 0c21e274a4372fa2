// Tests of Circumcentre and its error bound (circumcentre.go) against exact
// rational arithmetic.

package planar

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// TestCircumcentreErrBound checks that CircumcentreErr's bound holds against
// the exact circumcentre (math/big rationals) on random and needle
// triangles far from the origin, with the largest angle first. Reference:
// exact rational arithmetic.
func TestCircumcentreErrBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	rat := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	for _, tc := range []struct {
		name   string
		needle bool
	}{{"random", false}, {"needle", true}} {
		t.Run(tc.name, func(t *testing.T) {
			for i := 0; i < 2000; i++ {
				off := 5e5 + rng.Float64()*1e6
				ax, ay := off+rng.Float64()*100, off+rng.Float64()*100
				bx, by := ax+rng.Float64()*100, ay+rng.Float64()*100
				cx, cy := ax+rng.Float64()*100, ay-rng.Float64()*100
				if tc.needle {
					cx, cy = bx+(rng.Float64()-0.5)*1e-6, by+(rng.Float64()-0.5)*1e-6
				}
				// Largest angle first: the vertex opposite the longest edge.
				lab, lbc, lca := dist2(ax, ay, bx, by), dist2(bx, by, cx, cy), dist2(cx, cy, ax, ay)
				switch {
				case lab >= lbc && lab >= lca:
					ax, ay, bx, by, cx, cy = cx, cy, ax, ay, bx, by
				case lca >= lab && lca >= lbc:
					ax, ay, bx, by, cx, cy = bx, by, cx, cy, ax, ay
				}
				x, y, eb := CircumcentreErr(ax, ay, bx, by, cx, cy)
				if eb < 0 {
					continue
				}
				if px, py := Circumcentre(ax, ay, bx, by, cx, cy); px != x || py != y {
					t.Fatalf("Circumcentre %v, %v differs from CircumcentreErr %v, %v", px, py, x, y)
				}
				// Exact: solve |p−a|² = |p−b|² = |p−c|² with rationals.
				bdx, bdy := new(big.Rat).Sub(rat(bx), rat(ax)), new(big.Rat).Sub(rat(by), rat(ay))
				cdx, cdy := new(big.Rat).Sub(rat(cx), rat(ax)), new(big.Rat).Sub(rat(cy), rat(ay))
				b2 := new(big.Rat).Add(new(big.Rat).Mul(bdx, bdx), new(big.Rat).Mul(bdy, bdy))
				c2 := new(big.Rat).Add(new(big.Rat).Mul(cdx, cdx), new(big.Rat).Mul(cdy, cdy))
				d := new(big.Rat).Sub(new(big.Rat).Mul(bdx, cdy), new(big.Rat).Mul(bdy, cdx))
				d.Mul(d, big.NewRat(2, 1))
				ex := new(big.Rat).Sub(new(big.Rat).Mul(cdy, b2), new(big.Rat).Mul(bdy, c2))
				ex.Quo(ex, d).Add(ex, rat(ax))
				ey := new(big.Rat).Sub(new(big.Rat).Mul(bdx, c2), new(big.Rat).Mul(cdx, b2))
				ey.Quo(ey, d).Add(ey, rat(ay))
				wx, _ := ex.Float64()
				wy, _ := ey.Float64()
				if math.Abs(x-wx) > eb || math.Abs(y-wy) > eb {
					t.Fatalf("triangle %d: centre (%v, %v), exact (%v, %v), bound %g", i, x, y, wx, wy, eb)
				}
			}
		})
	}
}
