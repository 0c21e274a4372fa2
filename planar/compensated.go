// Double-double arithmetic: a value carried as an unevaluated sum hi + lo
// of two float64 with |lo| ≤ ½ ulp(hi), about 106 bits of precision
// (Dekker, "A floating-point technique for extending the available
// precision", Numerische Mathematik 18, 1971; Hida, Li & Bailey,
// "Algorithms for quad-double precision floating point arithmetic", ARITH
// 2001, the "sloppy" addition).
//
// DDAdd adds a float64 exactly with TwoSum, folds in the old low part and
// renormalises with Fast-Two-Sum: the result is within about 2u² (u = 2⁻⁵³)
// relative of the exact sum of the double-double and b, as long as the low
// parts do not cancel catastrophically. Long sums of terms of one sign, or
// sums whose partial values stay the size of the terms, keep that relative
// accuracy throughout; compensated summation in this form is what the gap
// tracer's chained angles and the coverage curve's constants use.
//
// DDReduceTwoPi reduces an angle to [0, 2π) against the double-double value
// of 2π (TwoPiHi + TwoPiLo, 2π to about 2⁻¹⁰⁶ relative), so angles a few
// turns from the range keep their double-double accuracy.

package planar

import "math"

// TwoPiHi and TwoPiLo are 2π as a double-double: TwoPiHi is 2π rounded to
// float64 and TwoPiLo the float64 nearest to 2π − TwoPiHi.
const (
	TwoPiHi = 6.283185307179586
	TwoPiLo = 2.4492935982947064e-16
)

// DDAdd returns the double-double (hi, lo) + b, renormalised.
func DDAdd(hi, lo, b float64) (float64, float64) {
	s, e := TwoSum(hi, b)
	return fastTwoSum(s, e+lo)
}

// DDAddDD returns the double-double sum (ah, al) + (bh, bl), renormalised.
func DDAddDD(ah, al, bh, bl float64) (float64, float64) {
	h, l := DDAdd(ah, al, bh)
	return DDAdd(h, l, bl)
}

// DDReduceTwoPi reduces the double-double angle (hi, lo), in radians, to
// [0, 2π) by subtracting the multiple ⌊hi/2π⌋ of the double-double 2π (and
// adding one turn when rounding leaves it just below 0).
func DDReduceTwoPi(hi, lo float64) (float64, float64) {
	k := math.Floor(hi / TwoPiHi)
	if k != 0 {
		p, pe := TwoProduct(k, TwoPiHi)
		hi, lo = DDAddDD(hi, lo, -p, -pe)
		hi, lo = DDAdd(hi, lo, -k*TwoPiLo)
	}
	if hi < 0 {
		hi, lo = DDAddDD(hi, lo, TwoPiHi, TwoPiLo)
	}
	return hi, lo
}
