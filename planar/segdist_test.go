// Tests of PointSegmentDistance (segdist.go): hand-computed cases, and the
// documented error bound against exact rational arithmetic.

package planar

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// TestPointSegmentDistance checks cases whose distances follow by hand;
// each is run with the segment given both ways round, which must not
// change the result.
func TestPointSegmentDistance(t *testing.T) {
	cases := []struct {
		name           string
		px, py         float64
		ax, ay, bx, by float64
		want, tol      float64
	}{
		// Foot (1, 0) inside the segment, p 2 above it.
		{"foot inside", 1, 2, 0, 0, 4, 0, 2, 0},
		// Foot (2, 2) at the middle of the diagonal: |(0,4) − (2,2)| = 2√2.
		{"foot inside diagonal", 0, 4, 0, 0, 4, 4, 2 * math.Sqrt2, 1e-15},
		// p on the segment.
		{"on segment", 2, 2, 0, 0, 4, 4, 0, 0},
		// Projection before a: the distance is |p − a| = |(−3, 4)| = 5.
		{"beyond a", -3, 4, 0, 0, 10, 0, 5, 0},
		// Projection past b: |p − b| = |(3, −4)| = 5.
		{"beyond b", 13, -4, 0, 0, 10, 0, 5, 0},
		// On the line through ab, 5 past b.
		{"collinear past b", 15, 0, 0, 0, 10, 0, 5, 0},
		// a = b: the distance to the point (1, 1) is |(3, 4)| = 5.
		{"degenerate segment", 4, 5, 1, 1, 1, 1, 5, 0},
		// The case the nearer-endpoint form exists for: a segment 5·10¹²
		// long along (3, 4)/5 from the origin, p = (3, 4) + 10⁻⁶·(4, −3),
		// so 5 from the near end and 5·10⁻⁶ off the line (the cross product
		// 4·px − 3·py = 25·10⁻⁶, over |(3, 4)| = 5). Measured from the far
		// end the rounding is ulps of 5·10¹² (about 10⁻³), far above the
		// distance; tol is the documented 12u·|p − a| = 6.7·10⁻¹⁵ plus the
		// representation error of p (under 10⁻¹⁶).
		{"long edge passing close", 3 + 4e-6, 4 - 3e-6, 0, 0, 3e12, 4e12, 5e-6, 7e-15},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			for _, got := range []float64{
				PointSegmentDistance(c.px, c.py, c.ax, c.ay, c.bx, c.by),
				PointSegmentDistance(c.px, c.py, c.bx, c.by, c.ax, c.ay),
			} {
				if math.Abs(got-c.want) > c.tol {
					t.Errorf("distance from (%g, %g) to (%g, %g)-(%g, %g) = %.17g, want %.17g ± %g",
						c.px, c.py, c.ax, c.ay, c.bx, c.by, got, c.want, c.tol)
				}
			}
		})
	}
}

// TestPointSegmentDistanceBound compares PointSegmentDistance with the
// exact distance (rational arithmetic, square root to 200 bits) on random
// segments from 10⁻³ to 10¹³ long, placed up to 10⁶ from the origin, with
// points from 10⁻⁹ to 10³ off the segment's line, before a, along it, and
// past b: the error stays within the documented 12u·min(|p − a|, |p − b|).
// Reference: exact rational arithmetic.
func TestPointSegmentDistanceBound(t *testing.T) {
	const u = 0x1p-53
	rng := rand.New(rand.NewPCG(31, 32))
	rat := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	for i := 0; i < 20000; i++ {
		off := math.Pow(10, 6*rng.Float64())
		ox, oy := off*(rng.Float64()-0.5), off*(rng.Float64()-0.5)
		l := math.Pow(10, -3+16*rng.Float64())
		th := 2 * math.Pi * rng.Float64()
		ux, uy := math.Cos(th), math.Sin(th)
		ax, ay := ox, oy
		bx, by := ox+l*ux, oy+l*uy
		s := l * (2*rng.Float64() - 0.5)
		h := math.Pow(10, -9+12*rng.Float64())
		px, py := ox+s*ux-h*uy, oy+s*uy+h*ux
		if i%2 == 1 {
			ax, ay, bx, by = bx, by, ax, ay
		}
		got := PointSegmentDistance(px, py, ax, ay, bx, by)

		wx, wy := new(big.Rat).Sub(rat(px), rat(ax)), new(big.Rat).Sub(rat(py), rat(ay))
		vx, vy := new(big.Rat).Sub(rat(bx), rat(ax)), new(big.Rat).Sub(rat(by), rat(ay))
		dot := new(big.Rat).Add(new(big.Rat).Mul(wx, vx), new(big.Rat).Mul(wy, vy))
		l2 := new(big.Rat).Add(new(big.Rat).Mul(vx, vx), new(big.Rat).Mul(vy, vy))
		tt := new(big.Rat)
		if l2.Sign() > 0 {
			tt.Quo(dot, l2)
		}
		if tt.Sign() < 0 {
			tt.SetInt64(0)
		} else if tt.Cmp(big.NewRat(1, 1)) > 0 {
			tt.SetInt64(1)
		}
		rx := new(big.Rat).Sub(wx, new(big.Rat).Mul(tt, vx))
		ry := new(big.Rat).Sub(wy, new(big.Rat).Mul(tt, vy))
		d2 := new(big.Rat).Add(new(big.Rat).Mul(rx, rx), new(big.Rat).Mul(ry, ry))
		want, _ := new(big.Float).SetPrec(200).Sqrt(new(big.Float).SetPrec(200).SetRat(d2)).Float64()

		near := math.Min(math.Hypot(px-ax, py-ay), math.Hypot(px-bx, py-by))
		if err := math.Abs(got - want); err > 12*u*near*(1+1e-9) {
			t.Fatalf("distance from (%v, %v) to (%v, %v)-(%v, %v) = %.17g, exact %.17g: error %.3g is %.2f u·|p − a| (bound 12)",
				px, py, ax, ay, bx, by, got, want, err, err/(u*near))
		}
	}
}
