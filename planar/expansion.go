// Floating-point expansion arithmetic (Shewchuk, "Adaptive precision
// floating-point arithmetic and fast robust geometric predicates", Discrete
// & Computational Geometry 18, 1997, sections 2.4–2.7).
//
// An expansion is a slice e[0..n) of float64 components, sorted by
// increasing magnitude and nonoverlapping, whose exact (unrounded) sum is the
// value represented. The routines below are error-free transformations:
//
//   - TwoSum(a, b) = (x, y) with x = fl(a+b) and a + b = x + y exactly
//     (Knuth's Two-Sum, Theorem 7 of the paper).
//   - fastTwoSum(a, b) = (x, y), the same when |a| >= |b| (Dekker,
//     Theorem 6).
//   - twoDiff(a, b) = (x, y) with a - b = x + y exactly.
//   - TwoProduct(a, b) = (x, y) with x = fl(a*b) and a*b = x + y exactly; y
//     is computed with one fused multiply-add, math.FMA(a, b, -x), which
//     replaces Dekker's splitting (Theorem 18) with the same result.
//   - expansionSum(e, f, h) writes the zero-eliminated sum of two
//     expansions (Fast-Expansion-Sum, Theorem 13; valid for
//     round-to-nearest-even arithmetic, which Go guarantees).
//   - scaleExpansion(e, b, h) writes the zero-eliminated product of an
//     expansion and a float64 (Scale-Expansion, Theorem 19).
//
// Every transformation is exact provided no intermediate product underflows
// or overflows. The predicates in predicates.go only call them on inputs
// whose magnitudes keep every intermediate within the normal float64 range
// (see safeOrient and safeInCircle there); other inputs go to math/big.
//
// All routines write into caller-provided slices (fixed-size arrays on the
// caller's stack) and never allocate. Products are wrapped in float64()
// conversions where a fused multiply-add would change the result: the Go
// specification permits fusing x*y+z unless an explicit conversion rounds
// the product first.
package planar

import "math"

// TwoSum returns x = fl(a+b) and the rounding error y, so a+b = x+y exactly
// (Knuth's Two-Sum; six floating-point additions, no branch).
func TwoSum(a, b float64) (x, y float64) {
	x = a + b
	bv := x - a
	av := x - bv
	br := b - bv
	ar := a - av
	y = ar + br
	return
}

// fastTwoSum is TwoSum for |a| >= |b| (or a == 0).
func fastTwoSum(a, b float64) (x, y float64) {
	x = a + b
	bv := x - a
	y = b - bv
	return
}

// twoDiff returns x = fl(a-b) and the rounding error y, so a-b = x+y exactly.
func twoDiff(a, b float64) (x, y float64) {
	x = a - b
	return x, twoDiffTail(a, b, x)
}

// twoDiffTail returns the rounding error of x = fl(a-b).
func twoDiffTail(a, b, x float64) float64 {
	bv := a - x
	av := x + bv
	br := bv - b
	ar := a - av
	return ar + br
}

// TwoProduct returns x = fl(a*b) and the rounding error y, so a*b = x+y
// exactly (no underflow assumed; one fused multiply-add).
func TwoProduct(a, b float64) (x, y float64) {
	x = float64(a * b)
	y = math.FMA(a, b, -x)
	return
}

// twoTwoDiff returns the four-component expansion (x3, x2, x1, x0) of
// (a1 + a0) - (b1 + b0), where a1+a0 and b1+b0 are two-component expansions
// (Shewchuk's Two-Two-Diff).
func twoTwoDiff(a1, a0, b1, b0 float64) (x3, x2, x1, x0 float64) {
	// Two-One-Diff(a1, a0, b0) -> (j, z, x0)
	i, x0 := twoDiff(a0, b0)
	j, z := TwoSum(a1, i)
	// Two-One-Diff(j, z, b1) -> (x3, x2, x1)
	i, x1 = twoDiff(z, b1)
	x3, x2 = TwoSum(j, i)
	return
}

// productDiff returns the exact four-component expansion of a*b - c*d,
// written into h (len(h) >= 4) in increasing order of magnitude.
func productDiff(h []float64, a, b, c, d float64) {
	s1, s0 := TwoProduct(a, b)
	t1, t0 := TwoProduct(c, d)
	h[3], h[2], h[1], h[0] = twoTwoDiff(s1, s0, t1, t0)
}

// expansionSum writes the zero-eliminated sum of expansions e and f into h
// and returns its length (>= 1). len(h) must be at least len(e)+len(f); h
// must not alias e or f. Both e and f must be non-empty.
func expansionSum(e, f, h []float64) int {
	elen, flen := len(e), len(f)
	enow, fnow := e[0], f[0]
	ei, fi := 0, 0
	var q float64
	if (fnow > enow) == (fnow > -enow) {
		q = enow
		ei++
		if ei < elen {
			enow = e[ei]
		}
	} else {
		q = fnow
		fi++
		if fi < flen {
			fnow = f[fi]
		}
	}
	hi := 0
	var hh float64
	if ei < elen && fi < flen {
		if (fnow > enow) == (fnow > -enow) {
			q, hh = fastTwoSum(enow, q)
			ei++
			if ei < elen {
				enow = e[ei]
			}
		} else {
			q, hh = fastTwoSum(fnow, q)
			fi++
			if fi < flen {
				fnow = f[fi]
			}
		}
		if hh != 0 {
			h[hi] = hh
			hi++
		}
		for ei < elen && fi < flen {
			if (fnow > enow) == (fnow > -enow) {
				q, hh = TwoSum(q, enow)
				ei++
				if ei < elen {
					enow = e[ei]
				}
			} else {
				q, hh = TwoSum(q, fnow)
				fi++
				if fi < flen {
					fnow = f[fi]
				}
			}
			if hh != 0 {
				h[hi] = hh
				hi++
			}
		}
	}
	for ei < elen {
		q, hh = TwoSum(q, enow)
		ei++
		if ei < elen {
			enow = e[ei]
		}
		if hh != 0 {
			h[hi] = hh
			hi++
		}
	}
	for fi < flen {
		q, hh = TwoSum(q, fnow)
		fi++
		if fi < flen {
			fnow = f[fi]
		}
		if hh != 0 {
			h[hi] = hh
			hi++
		}
	}
	if q != 0 || hi == 0 {
		h[hi] = q
		hi++
	}
	return hi
}

// scaleExpansion writes the zero-eliminated product of expansion e and b
// into h and returns its length (>= 1). len(h) must be at least 2*len(e);
// h must not alias e. e must be non-empty.
func scaleExpansion(e []float64, b float64, h []float64) int {
	q, hh := TwoProduct(e[0], b)
	hi := 0
	if hh != 0 {
		h[hi] = hh
		hi++
	}
	for _, enow := range e[1:] {
		p1, p0 := TwoProduct(enow, b)
		var sum float64
		sum, hh = TwoSum(q, p0)
		if hh != 0 {
			h[hi] = hh
			hi++
		}
		q, hh = fastTwoSum(p1, sum)
		if hh != 0 {
			h[hi] = hh
			hi++
		}
	}
	if q != 0 || hi == 0 {
		h[hi] = q
		hi++
	}
	return hi
}

// negateExpansion negates every component of e in place.
func negateExpansion(e []float64) {
	for i := range e {
		e[i] = -e[i]
	}
}

// estimate returns the float64 sum of an expansion's components, an
// approximation of its value with the correct sign when the expansion is
// nonoverlapping and zero-eliminated.
func estimate(e []float64) float64 {
	var s float64
	for _, c := range e {
		s += c
	}
	return s
}
