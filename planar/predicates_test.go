package planar

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// The reference for every sign below is exact rational arithmetic
// (math/big.Rat from the Go standard library), written independently of
// the production code: orientation from the untranslated cross-product
// form and in-circle from the lifted 4×4 determinant expanded by minors.

func ratOf(v float64) *big.Rat { return new(big.Rat).SetFloat64(v) }

// refOrient returns sign((bx-ax)(cy-ay) - (by-ay)(cx-ax)) exactly.
func refOrient(ax, ay, bx, by, cx, cy float64) int {
	a := []*big.Rat{ratOf(ax), ratOf(ay)}
	b := []*big.Rat{ratOf(bx), ratOf(by)}
	c := []*big.Rat{ratOf(cx), ratOf(cy)}
	u := new(big.Rat).Sub(b[0], a[0])
	v := new(big.Rat).Sub(c[1], a[1])
	w := new(big.Rat).Sub(b[1], a[1])
	z := new(big.Rat).Sub(c[0], a[0])
	l := new(big.Rat).Mul(u, v)
	r := new(big.Rat).Mul(w, z)
	return l.Cmp(r)
}

// refInCircle returns the sign of the 4×4 determinant with rows
// (x, y, x²+y², 1) for a, b, c, d, by cofactor expansion along the lift
// column.
func refInCircle(ax, ay, bx, by, cx, cy, dx, dy float64) int {
	pts := [4][2]*big.Rat{
		{ratOf(ax), ratOf(ay)}, {ratOf(bx), ratOf(by)},
		{ratOf(cx), ratOf(cy)}, {ratOf(dx), ratOf(dy)},
	}
	// orient3 of the three points other than i, in cyclic order.
	or := func(p, q, r [2]*big.Rat) *big.Rat {
		t := new(big.Rat)
		acc := new(big.Rat)
		acc.Add(acc, t.Mul(p[0], q[1]))
		acc.Sub(acc, t.Mul(q[0], p[1]))
		acc.Add(acc, t.Mul(q[0], r[1]))
		acc.Sub(acc, t.Mul(r[0], q[1]))
		acc.Add(acc, t.Mul(r[0], p[1]))
		acc.Sub(acc, t.Mul(p[0], r[1]))
		return acc
	}
	lift := func(p [2]*big.Rat) *big.Rat {
		x := new(big.Rat).Mul(p[0], p[0])
		return x.Add(x, new(big.Rat).Mul(p[1], p[1]))
	}
	a, b, c, d := pts[0], pts[1], pts[2], pts[3]
	det := new(big.Rat)
	det.Add(det, new(big.Rat).Mul(lift(a), or(b, c, d)))
	det.Sub(det, new(big.Rat).Mul(lift(b), or(a, c, d)))
	det.Add(det, new(big.Rat).Mul(lift(c), or(a, b, d)))
	det.Sub(det, new(big.Rat).Mul(lift(d), or(a, b, c)))
	return det.Sign()
}

func sign(v float64) int {
	switch {
	case v > 0:
		return 1
	case v < 0:
		return -1
	}
	return 0
}

func TestOrient2DTable(t *testing.T) {
	// Reference: elementary geometry (signed area of a triangle), and the
	// exact rational evaluation refOrient for each row.
	tests := []struct {
		name                   string
		ax, ay, bx, by, cx, cy float64
		want                   int
	}{
		{"ccw unit", 0, 0, 1, 0, 0, 1, 1},
		{"cw unit", 0, 0, 0, 1, 1, 0, -1},
		{"collinear", 0, 0, 1, 1, 2, 2, 0},
		{"collinear horizontal", -3, 5, 7, 5, 100, 5, 0},
		{"coincident", 1, 1, 1, 1, 1, 1, 0},
		{"two equal", 1, 2, 1, 2, 5, 6, 0},
		{"collinear 0.1 steps", 0.1, 0.1, 0.2, 0.2, 0.3, 0.3, refOrient(0.1, 0.1, 0.2, 0.2, 0.3, 0.3)},
		{"1e-12 apart ccw", 0, 0, 1e-12, 0, 0, 1e-12, 1},
		{"offset 5e6", 5e6, 5e6, 5e6 + 1, 5e6, 5e6, 5e6 + 1, 1},
		{"offset 5e6 tiny", 5e6, 5e6, 5e6 + 1e-9, 5e6 + 1e-9, 5e6 + 2e-9, 5e6 + 2e-9 + 1e-9, refOrient(5e6, 5e6, 5e6+1e-9, 5e6+1e-9, 5e6+2e-9, 5e6+2e-9+1e-9)},
		{"huge", 1e300, 0, 0, 1e300, -1e300, -1e300, 1},
		{"subnormal", 5e-324, 0, 0, 5e-324, 0, 0, 1},
		{"tiny collinear", 1e-310, 1e-310, 2e-310, 2e-310, 3e-310, 3e-310, refOrient(1e-310, 1e-310, 2e-310, 2e-310, 3e-310, 3e-310)},
	}
	for _, tc := range tests {
		if ref := refOrient(tc.ax, tc.ay, tc.bx, tc.by, tc.cx, tc.cy); ref != tc.want {
			t.Fatalf("%s: table sign %d disagrees with big.Rat %d", tc.name, tc.want, ref)
		}
		got := sign(Orient2D(tc.ax, tc.ay, tc.bx, tc.by, tc.cx, tc.cy))
		if got != tc.want {
			t.Errorf("%s: Orient2D sign = %d, want %d", tc.name, got, tc.want)
		}
	}
}

func TestInCircleTable(t *testing.T) {
	// Reference: elementary geometry (unit circle through (1,0), (0,1),
	// (-1,0)), and the exact rational evaluation refInCircle for each row.
	tests := []struct {
		name                           string
		ax, ay, bx, by, cx, cy, dx, dy float64
		want                           int
	}{
		{"centre inside", 1, 0, 0, 1, -1, 0, 0, 0, 1},
		{"far outside", 1, 0, 0, 1, -1, 0, 3, 3, -1},
		{"on circle", 1, 0, 0, 1, -1, 0, 0, -1, 0},
		{"cw triangle flips", 1, 0, -1, 0, 0, 1, 0, 0, -1},
		{"unit square cocircular", 0, 0, 1, 0, 1, 1, 0, 1, 0},
		{"grid square offset", 1e6, 1e6, 1e6 + 1, 1e6, 1e6 + 1, 1e6 + 1, 1e6, 1e6 + 1, 0},
		{"0.1 grid square", 0.1, 0.1, 0.2, 0.1, 0.2, 0.2, 0.1, 0.2, refInCircle(0.1, 0.1, 0.2, 0.1, 0.2, 0.2, 0.1, 0.2)},
		{"1e-12 square", 0, 0, 1e-12, 0, 1e-12, 1e-12, 0, 1e-12, 0},
		{"1e-12 inside", 0, 0, 1e-12, 0, 1e-12, 1e-12, 0.5e-12, 0.5e-12, 1},
		{"offset 5e6 just inside", 5e6, 5e6, 5e6 + 1, 5e6, 5e6 + 1, 5e6 + 1, 5e6 + 1e-9, 5e6 + 1, 1},
		{"huge", 1e300, 0, 0, 1e300, -1e300, 0, 0, 0, 1},
		{"tiny", 1e-300, 0, 0, 1e-300, -1e-300, 0, 0, -1e-300, 0},
	}
	for _, tc := range tests {
		if ref := refInCircle(tc.ax, tc.ay, tc.bx, tc.by, tc.cx, tc.cy, tc.dx, tc.dy); ref != tc.want {
			t.Fatalf("%s: table sign %d disagrees with big.Rat %d", tc.name, tc.want, ref)
		}
		got := sign(InCircle(tc.ax, tc.ay, tc.bx, tc.by, tc.cx, tc.cy, tc.dx, tc.dy))
		if got != tc.want {
			t.Errorf("%s: InCircle sign = %d, want %d", tc.name, got, tc.want)
		}
	}
}

func TestNonFinite(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	if v := Orient2D(nan, 0, 1, 0, 0, 1); !math.IsNaN(v) {
		t.Errorf("Orient2D(NaN...) = %v, want NaN", v)
	}
	if v := Orient2D(inf, 0, 1, 0, 0, 1); !math.IsNaN(v) {
		t.Errorf("Orient2D(Inf...) = %v, want NaN", v)
	}
	if v := InCircle(1, 0, 0, 1, -1, 0, nan, 0); !math.IsNaN(v) {
		t.Errorf("InCircle(...NaN) = %v, want NaN", v)
	}
	if v := InCircle(1, 0, 0, 1, -1, 0, 0, inf); !math.IsNaN(v) {
		t.Errorf("InCircle(...Inf) = %v, want NaN", v)
	}
}

// TestOrient2DShewchukGrid repeats the experiment of Shewchuk (1997),
// figure 1 (recalled from memory): the orientation of
// (0.5 + k·2⁻⁵³, 0.5 + l·2⁻⁵³), 0 <= k, l < 256, relative to the line
// through (12, 12) and (24, 24). Naive float evaluation gives a scattered
// mess of wrong signs; the exact signs form a clean staircase.
// Reference: exact big.Rat evaluation of every point.
func TestOrient2DShewchukGrid(t *testing.T) {
	const ulp = 0x1p-53
	naiveWrong, wrong := 0, 0
	for k := 0; k < 256; k++ {
		for l := 0; l < 256; l++ {
			px, py := 0.5+float64(k)*ulp, 0.5+float64(l)*ulp
			want := refOrient(px, py, 12, 12, 24, 24)
			if got := sign(Orient2D(px, py, 12, 12, 24, 24)); got != want {
				wrong++
				if wrong < 5 {
					t.Errorf("k=%d l=%d: sign %d, want %d", k, l, got, want)
				}
			}
			naive := float64((12-px)*(24-py)) - float64((12-py)*(24-px))
			if sign(naive) != want {
				naiveWrong++
			}
		}
	}
	if wrong > 0 {
		t.Errorf("%d of 65536 signs wrong", wrong)
	}
	// The experiment is only meaningful if naive evaluation fails on it.
	if naiveWrong == 0 {
		t.Errorf("naive evaluation made no mistakes: the test inputs are not degenerate")
	}
	t.Logf("naive float evaluation: %d of 65536 signs wrong", naiveWrong)
}

// randCoord returns a coordinate drawn from one of several scales,
// including values that are not exactly representable decimals.
func randCoord(r *rand.Rand) float64 {
	switch r.IntN(4) {
	case 0:
		return float64(r.IntN(21) - 10)
	case 1:
		return 5e6 + r.Float64()*100
	case 2:
		return (r.Float64() - 0.5) * 1e-12
	default:
		return (r.Float64() - 0.5) * 1000
	}
}

func TestOrient2DRandom(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 20000; i++ {
		var ax, ay, bx, by, cx, cy float64
		switch i % 3 {
		case 0: // general position at mixed scales
			ax, ay, bx, by, cx, cy = randCoord(r), randCoord(r), randCoord(r), randCoord(r), randCoord(r), randCoord(r)
		case 1: // c on the line ab rounded to float: near-collinear
			ax, ay = 5e6+r.Float64(), 5e6+r.Float64()
			bx, by = 5e6+r.Float64(), 5e6+r.Float64()
			s := r.Float64()*3 - 1
			cx, cy = ax+s*(bx-ax), ay+s*(by-ay)
		default: // near-collinear at tiny scale with a nudge of a few ulps
			ax, ay = r.Float64()*1e-12, r.Float64()*1e-12
			bx, by = ax+1e-12, ay+2e-12
			cx = ax + 0.5e-12
			cy = math.Nextafter(ay+1e-12, math.Inf(int(r.IntN(2)*2-1)))
		}
		want := refOrient(ax, ay, bx, by, cx, cy)
		if got := sign(Orient2D(ax, ay, bx, by, cx, cy)); got != want {
			t.Fatalf("Orient2D(%v,%v, %v,%v, %v,%v) sign %d, want %d", ax, ay, bx, by, cx, cy, got, want)
		}
		// Direct check of the adaptive stages, bypassing the filter.
		if safe6(ax, ay, bx, by, cx, cy, orientLo, orientHi) {
			detsum := math.Abs((ax-cx)*(by-cy)) + math.Abs((ay-cy)*(bx-cx))
			if got := sign(orient2dAdapt(ax, ay, bx, by, cx, cy, detsum)); got != want {
				t.Fatalf("orient2dAdapt sign %d, want %d", got, want)
			}
			if got := sign(orient2dAdapt(ax, ay, bx, by, cx, cy, math.Inf(1))); got != want {
				t.Fatalf("orient2dAdapt (forced exact) sign %d, want %d", got, want)
			}
		}
	}
}

func TestInCircleRandom(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 6000; i++ {
		var p [8]float64
		switch i % 3 {
		case 0:
			for j := range p {
				p[j] = randCoord(r)
			}
		case 1: // four points on a circle, rounded: near-cocircular
			cx, cy, rad := 5e6+r.Float64()*10, 5e6+r.Float64()*10, 0.5+r.Float64()*100
			for j := 0; j < 4; j++ {
				th := r.Float64() * 2 * math.Pi
				p[2*j], p[2*j+1] = cx+rad*math.Cos(th), cy+rad*math.Sin(th)
			}
		default: // lattice points of a square grid with a 0.1 spacing
			for j := 0; j < 4; j++ {
				p[2*j] = 0.1 * float64(r.IntN(4))
				p[2*j+1] = 0.1 * float64(r.IntN(4))
			}
		}
		want := refInCircle(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7])
		if got := sign(InCircle(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7])); got != want {
			t.Fatalf("InCircle(%v) sign %d, want %d", p, got, want)
		}
		// Direct checks of the adaptive and exact stages.
		if got := sign(inCircleAdapt(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7], math.Inf(1))); got != want {
			t.Fatalf("inCircleAdapt (forced) %v sign %d, want %d", p, got, want)
		}
		if got := sign(inCircleExact(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7])); got != want {
			t.Fatalf("inCircleExact %v sign %d, want %d", p, got, want)
		}
	}
}

func TestExtremeMagnitudes(t *testing.T) {
	// Inputs outside the expansion range go to math/big; check a spread of
	// magnitudes from subnormal to near overflow.
	// Reference: exact big.Rat evaluation.
	r := rand.New(rand.NewPCG(5, 6))
	mags := []float64{5e-324, 1e-310, 1e-200, 1e-70, 1, 1e70, 1e150, 1e200, 1e300}
	for i := 0; i < 3000; i++ {
		var p [8]float64
		for j := range p {
			m := mags[r.IntN(len(mags))]
			p[j] = m * float64(r.IntN(5)-2) * (1 + float64(r.IntN(3))*0x1p-52)
		}
		if want, got := refOrient(p[0], p[1], p[2], p[3], p[4], p[5]), sign(Orient2D(p[0], p[1], p[2], p[3], p[4], p[5])); got != want {
			t.Fatalf("Orient2D(%v) sign %d, want %d", p[:6], got, want)
		}
		if want, got := refInCircle(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7]), sign(InCircle(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7])); got != want {
			t.Fatalf("InCircle(%v) sign %d, want %d", p, got, want)
		}
	}
}

func TestPredicatesNoAlloc(t *testing.T) {
	// The degenerate (exact) paths must not allocate.
	var sink float64
	a := testing.AllocsPerRun(100, func() {
		sink += Orient2D(0.1, 0.1, 0.2, 0.2, 0.3, 0.3)
		sink += Orient2D(0.5+0x1p-53, 0.5, 12, 12, 24, 24)
		sink += InCircle(0.1, 0.1, 0.2, 0.1, 0.2, 0.2, 0.1, 0.2)
		sink += inCircleExact(0.1, 0.1, 0.2, 0.1, 0.2, 0.2, 0.1, 0.2)
	})
	if a != 0 {
		t.Errorf("exact predicate paths allocate %v times per run", a)
	}
	_ = sink
}

var benchSink float64

func BenchmarkOrient2D(b *testing.B) {
	b.Run("fast", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			benchSink += Orient2D(0, 0, 1, 0.5, float64(i&7), 1)
		}
	})
	b.Run("collinear_grid", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			benchSink += Orient2D(0, 0, 1, 1, float64(i&7), float64(i&7))
		}
	})
	b.Run("near_collinear", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			benchSink += Orient2D(0.5+float64(i&255)*0x1p-53, 0.5, 12, 12, 24, 24)
		}
	})
}

func BenchmarkInCircle(b *testing.B) {
	b.Run("fast", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			benchSink += InCircle(1, 0, 0, 1, -1, 0, float64(i&7)*0.1, 0)
		}
	})
	b.Run("cocircular_grid", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			o := float64(i & 7)
			benchSink += InCircle(o, 0, o+1, 0, o+1, 1, o, 1)
		}
	})
	b.Run("cocircular_0.1_grid", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			benchSink += InCircle(0.1, 0.1, 0.2, 0.1, 0.2, 0.2, 0.1, 0.2)
		}
	})
}
