// Tests of the double-double helpers (compensated.go) against math/big.

package planar

import (
	"math"
	"math/big"
	"testing"
)

// TestDoubleDouble checks DDAdd and DDReduceTwoPi against big.Float sums
// (512-bit, exact for these inputs). Reference: math/big.
func TestDoubleDouble(t *testing.T) {
	for _, tc := range []struct {
		name  string
		terms []float64
	}{
		{"cancelling", []float64{1, 1e-17, -1, 3e-33}},
		{"many-small", func() []float64 {
			v := []float64{1e8}
			for i := 0; i < 1000; i++ {
				v = append(v, 1e-9*float64(i%7+1))
			}
			return v
		}()},
		{"angles", []float64{3, 3, 3, 0.1234567890123, -1e-13}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var hi, lo float64
			exact := new(big.Float).SetPrec(512)
			for _, x := range tc.terms {
				hi, lo = DDAdd(hi, lo, x)
				exact.Add(exact, big.NewFloat(x).SetPrec(512))
			}
			got := new(big.Float).SetPrec(512).Add(big.NewFloat(hi).SetPrec(512), big.NewFloat(lo).SetPrec(512))
			diff, _ := new(big.Float).Sub(got, exact).Float64()
			ref, _ := exact.Float64()
			if math.Abs(diff) > 0x1p-100*math.Max(math.Abs(ref), 1) {
				t.Errorf("sum %g%+g, exact %g: error %g", hi, lo, ref, diff)
			}
			// Reduction modulo the double-double 2π stays in [0, 2π) and
			// keeps the value modulo 2π to double-double accuracy.
			rh, rl := DDReduceTwoPi(hi, lo)
			if !(rh >= 0 && rh < TwoPiHi) {
				t.Errorf("reduced %g outside [0, 2π)", rh)
			}
			k := math.Round((hi - rh) / TwoPiHi)
			back := new(big.Float).SetPrec(512).Add(big.NewFloat(rh).SetPrec(512), big.NewFloat(rl).SetPrec(512))
			twoPi := new(big.Float).SetPrec(512).Add(big.NewFloat(TwoPiHi).SetPrec(512), big.NewFloat(TwoPiLo).SetPrec(512))
			back.Add(back, new(big.Float).SetPrec(512).Mul(big.NewFloat(k).SetPrec(512), twoPi))
			d, _ := new(big.Float).Sub(back, got).Float64()
			if math.Abs(d) > 0x1p-95*math.Max(math.Abs(ref), 1) {
				t.Errorf("reduction of %g lost %g", hi, d)
			}
		})
	}
}
