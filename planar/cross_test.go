// Tests of Cross and DotSign (cross.go) against exact rational arithmetic.

package planar

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// exactRat returns the exact value of x as a big.Rat.
func exactRat(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }

// crossRelClose reports whether a and b agree to rel relative.
func crossRelClose(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}

// TestDotSignExact compares the sign of (p−r)·(q−r) with exact
// rational arithmetic (math/big) on near-degenerate inputs: points near the
// diametral circle of pq, perturbed by a few units in the last place, and
// exact right angles. Reference: exact rational arithmetic.
func TestDotSignExact(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for i := 0; i < 20000; i++ {
		scale := math.Pow(10, float64(rng.IntN(8)))
		px, py := rng.Float64()*scale, rng.Float64()*scale
		qx, qy := rng.Float64()*scale, rng.Float64()*scale
		// r on the diametral circle, then nudged.
		a := rng.Float64() * 2 * math.Pi
		cx, cy := (px+qx)/2, (py+qy)/2
		rad := math.Hypot(qx-px, qy-py) / 2
		rx, ry := cx+rad*math.Cos(a), cy+rad*math.Sin(a)
		for k := rng.IntN(4); k > 0; k-- {
			rx = math.Nextafter(rx, math.Inf(rng.IntN(2)*2-1))
		}
		if i%4 == 0 { // exact right angle on integer coordinates
			px, py, qx, qy = 0, 0, float64(rng.IntN(1000)+1), 0
			rx, ry = qx, float64(rng.IntN(1000))
		}
		xy := []float64{px, py, qx, qy, rx, ry}
		got := DotSign(px, py, qx, qy, rx, ry)
		ax := new(big.Rat).Sub(exactRat(px), exactRat(rx))
		ay := new(big.Rat).Sub(exactRat(py), exactRat(ry))
		bx := new(big.Rat).Sub(exactRat(qx), exactRat(rx))
		by := new(big.Rat).Sub(exactRat(qy), exactRat(ry))
		dot := new(big.Rat).Add(new(big.Rat).Mul(ax, bx), new(big.Rat).Mul(ay, by))
		if want := dot.Sign(); got != want {
			t.Fatalf("DotSign(%v) = %d, exact %d", xy, got, want)
		}
	}
}

// TestCrossAccuracy compares the doubled area with exact rational
// arithmetic on nearly flat triangles: relative error below 2^-48 (plus
// the final rounding) as documented. Reference: exact rational arithmetic.
func TestCrossAccuracy(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	for i := 0; i < 20000; i++ {
		scale := math.Pow(10, float64(rng.IntN(7)))
		off := rng.Float64() * 1e6
		ax, ay := off+rng.Float64()*scale, off+rng.Float64()*scale
		bx, by := off+rng.Float64()*scale, off+rng.Float64()*scale
		u := rng.Float64()
		cx := ax + u*(bx-ax) + (rng.Float64()-0.5)*scale*math.Pow(10, -float64(rng.IntN(14)))
		cy := ay + u*(by-ay)
		xy := []float64{ax, ay, bx, by, cx, cy}
		got := Cross(ax, ay, bx, by, cx, cy)
		ux := new(big.Rat).Sub(exactRat(bx), exactRat(ax))
		uy := new(big.Rat).Sub(exactRat(by), exactRat(ay))
		wx := new(big.Rat).Sub(exactRat(cx), exactRat(ax))
		wy := new(big.Rat).Sub(exactRat(cy), exactRat(ay))
		exact := new(big.Rat).Sub(new(big.Rat).Mul(ux, wy), new(big.Rat).Mul(uy, wx))
		want, _ := exact.Float64()
		if want == 0 {
			if got != 0 {
				t.Fatalf("Cross(%v) = %g, exact 0", xy, got)
			}
			continue
		}
		if !crossRelClose(got, want, 0x1p-48+0x1p-51) {
			t.Fatalf("Cross(%v) = %.17g, exact %.17g", xy, got, want)
		}
	}
}
