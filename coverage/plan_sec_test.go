// Tests of the smallest enclosing circle (plan_sec.go).
//
// References: the definition, by brute force — the smallest enclosing
// circle of a finite set is the smallest among the circles on two of its
// points as diameter and the circles through three of them that enclose
// every point (Welzl, LNCS 555, 1991, Lemma 1; elementary geometry) — and
// closed forms: an acute triangle's circle is its circumcircle
// (equilateral: side/√3), an obtuse triangle's has its longest side as
// diameter, a regular polygon's is its circumcircle.

package coverage

import (
	"math"
	"math/rand/v2"
	"testing"
)

// planBruteSEC returns the smallest enclosing radius by the definition.
func planBruteSEC(xy []float64) float64 {
	n := len(xy) / 2
	if n == 1 {
		return 0
	}
	best := math.Inf(1)
	encl := func(cx, cy, r float64) bool {
		for i := 0; i < n; i++ {
			if math.Hypot(xy[2*i]-cx, xy[2*i+1]-cy) > r*(1+1e-10)+1e-12 {
				return false
			}
		}
		return true
	}
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			cx, cy := (xy[2*i]+xy[2*j])/2, (xy[2*i+1]+xy[2*j+1])/2
			r := math.Hypot(xy[2*i]-cx, xy[2*i+1]-cy)
			if r < best && encl(cx, cy, r) {
				best = r
			}
			for k := j + 1; k < n; k++ {
				ax, ay := xy[2*i], xy[2*i+1]
				bx, by := xy[2*j]-ax, xy[2*j+1]-ay
				qx, qy := xy[2*k]-ax, xy[2*k+1]-ay
				d := 2 * (bx*qy - by*qx)
				if d == 0 {
					continue
				}
				b2, q2 := bx*bx+by*by, qx*qx+qy*qy
				ux, uy := (qy*b2-by*q2)/d, (bx*q2-qx*b2)/d
				r := math.Hypot(ux, uy)
				if r < best && encl(ax+ux, ay+uy, r) {
					best = r
				}
			}
		}
	}
	return best
}

func TestPlanSECClosedForms(t *testing.T) {
	s3 := math.Sqrt(3)
	cases := []struct {
		name   string
		xy     []float64
		cx, cy float64
		r      float64
	}{
		// Equilateral triangle of side 2: circumradius 2/√3, centroid.
		{"equilateral", []float64{0, 0, 2, 0, 1, s3}, 1, s3 / 3, 2 / s3},
		// Obtuse triangle: longest side as diameter.
		{"obtuse", []float64{0, 0, 10, 0, 5, 1}, 5, 0, 5},
		// Square of side 2 (cocircular): circumcircle.
		{"square", []float64{0, 0, 2, 0, 2, 2, 0, 2}, 1, 1, math.Sqrt2},
		// Collinear points: the outer pair as diameter.
		{"collinear", []float64{0, 0, 3, 0, 1, 0, 7, 0, 2, 0}, 3.5, 0, 3.5},
		{"one point", []float64{5e6, -3e6}, 5e6, -3e6, 0},
		{"duplicates", []float64{1, 1, 1, 1, 3, 1, 3, 1}, 2, 1, 1},
		// Far from the origin: offsets must not cost precision.
		{"offset square", []float64{5e6, 5e6, 5e6 + 2, 5e6, 5e6 + 2, 5e6 + 2, 5e6, 5e6 + 2}, 5e6 + 1, 5e6 + 1, math.Sqrt2},
	}
	for _, c := range cases {
		x, y, r, _ := planSEC(c.xy, nil)
		if math.Abs(x-c.cx) > 1e-9 || math.Abs(y-c.cy) > 1e-9 || math.Abs(r-c.r) > 1e-9 {
			t.Errorf("%s: circle (%.12g, %.12g) r %.12g, want (%.12g, %.12g) r %.12g", c.name, x, y, r, c.cx, c.cy, c.r)
		}
	}
	// Regular 12-gon of circumradius 7 around (3, 4).
	var xy []float64
	for k := 0; k < 12; k++ {
		a := 2 * math.Pi * float64(k) / 12
		xy = append(xy, 3+7*math.Cos(a), 4+7*math.Sin(a))
	}
	if x, y, r, _ := planSEC(xy, nil); math.Abs(x-3) > 1e-9 || math.Abs(y-4) > 1e-9 || math.Abs(r-7) > 1e-9 {
		t.Errorf("12-gon: (%.12g, %.12g) r %.12g", x, y, r)
	}
	if x, _, _, _ := planSEC(nil, nil); !math.IsNaN(x) {
		t.Errorf("empty set: %v, want NaN", x)
	}
}

func TestPlanSECBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	var perm []int32
	for trial := 0; trial < 300; trial++ {
		n := 1 + rng.IntN(25)
		xy := make([]float64, 2*n)
		for i := range xy {
			xy[i] = rng.NormFloat64() * 50
		}
		if trial%5 == 0 { // points on a circle plus interior ones
			for i := 0; i < n/2; i++ {
				a := rng.Float64() * 2 * math.Pi
				xy[2*i], xy[2*i+1] = 20*math.Cos(a), 20*math.Sin(a)
			}
		}
		var cx, cy, r float64
		cx, cy, r, perm = planSEC(xy, perm)
		want := planBruteSEC(xy)
		if math.Abs(r-want) > 1e-9*math.Max(1, want) {
			t.Fatalf("trial %d (n=%d): radius %.15g, brute force %.15g", trial, n, r, want)
		}
		for i := 0; i < n; i++ {
			if d := math.Hypot(xy[2*i]-cx, xy[2*i+1]-cy); d > r*(1+1e-12) {
				t.Fatalf("trial %d: point %d at %.15g outside radius %.15g", trial, i, d, r)
			}
		}
	}
}
