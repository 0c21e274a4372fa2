// Tests of ring sets and half-plane clipping (ringset.go, halfplane.go).
// Expected values are elementary geometry worked out by hand in the
// comments beside them.

package planar

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// The even–odd rule with the closed convention over a square with a hole.
func TestRingSetLocate(t *testing.T) {
	var s RingSet
	s.AppendRing([]float64{0, 0, 10, 0, 10, 10, 0, 10}) // exterior, ccw
	s.AppendRing([]float64{4, 4, 4, 6, 6, 6, 6, 4})     // hole, cw
	if got := s.Area(); got != 96 {
		t.Errorf("area %g, want 100 − 4", got)
	}
	cases := []struct {
		name string
		x, y float64
		want int
	}{
		{"interior", 2, 2, 1},
		{"in the hole", 5, 5, -1},
		{"on the hole's edge", 6, 5, 0},
		{"on the hole's corner", 4, 4, 0},
		{"on the right edge", 10, 5, 0},
		{"on the top edge", 5, 10, 0},
		{"outside", 11, 5, -1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := s.Locate(c.x, c.y); got != c.want {
				t.Errorf("Locate(%g, %g) = %d, want %d", c.x, c.y, got, c.want)
			}
		})
	}
	// A view onto the same storage answers alike.
	view := RingSet{XY: s.XY, RingStart: s.RingStart[1:3]}
	if view.NumRings() != 1 || view.Locate(5, 5) != 1 {
		t.Errorf("view of the hole: %d rings, Locate(5, 5) = %d", view.NumRings(), view.Locate(5, 5))
	}
}

func TestRingSetDropsDegenerate(t *testing.T) {
	var s RingSet
	if s.AppendRing([]float64{0, 0, 1, 1}) {
		t.Error("a two-point ring was kept")
	}
	if !s.AppendRing([]float64{0, 0, 1, 0, 0, 1}) || s.NumRings() != 1 || len(s.XY) != 6 {
		t.Errorf("got %d rings, %d coordinates", s.NumRings(), len(s.XY))
	}
	var c RingSet
	c.CopyFrom(&s)
	if c.NumRings() != 1 || c.Area() != 0.5 {
		t.Errorf("copy: %d rings, area %g", c.NumRings(), c.Area())
	}
}

func TestHalfPlaneClip(t *testing.T) {
	square := []float64{0, 0, 10, 0, 10, 10, 0, 10}
	cases := []struct {
		name     string
		hp       HalfPlane
		cut      bool
		kept     bool
		wantArea float64
	}{
		// Points at least as close to (0, 0) as to (10, 0): x ≤ 5.
		{"bisector halves", Bisector(0, 0, 10, 0), true, true, 50},
		// x ≤ 20 holds the whole square.
		{"nothing cut", Bisector(0, 0, 40, 0), false, true, 100},
		// x ≤ −5 holds nothing.
		{"everything cut", HalfPlane{NX: 1, H: -5}, true, false, 0},
		// The line x = 10 through the right edge: on the line is inside.
		{"line through an edge", Bisector(0, 0, 20, 0), false, true, 100},
		// Diagonal x + y ≤ 10 keeps the lower-left triangle.
		{"diagonal", HalfPlane{NX: 1, NY: 1, H: 10}, true, true, 50},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var out ClipRings
			cut, kept := c.hp.ClipRing(square, nil, 7, &out)
			if cut != c.cut || kept != c.kept {
				t.Fatalf("cut, kept = %v, %v; want %v, %v", cut, kept, c.cut, c.kept)
			}
			if c.hp.SomeOutside(square) != c.cut {
				t.Errorf("SomeOutside disagrees with the clip")
			}
			if got := out.Area(); got != c.wantArea {
				t.Errorf("area %g, want %g", got, c.wantArea)
			}
			if kept && (out.Label[0] != 7 || len(out.Prov) != len(out.XY)/2) {
				t.Errorf("label %v, %d provenance entries for %d vertices", out.Label, len(out.Prov), len(out.XY)/2)
			}
		})
	}
	half := Bisector(0, 0, 10, 0) // x ≤ 5
	if !half.AllOutside(square[2:6]) || half.AllOutside(square) {
		t.Error("AllOutside: (10, 0), (10, 10) are outside x ≤ 5, (0, 0) is not")
	}
}

// Two clips of a U-shaped ring: the second line crosses the bridge the
// first one left across the notch, at a candidate vertex that lies in the
// notch, outside the ring; PointInRing on the unclipped ring rejects it.
func TestHalfPlaneClipCandidate(t *testing.T) {
	// U: 0..9 × 0..6 with the notch 3..6 × 2..6 open at the top.
	u := []float64{0, 0, 9, 0, 9, 6, 6, 6, 6, 2, 3, 2, 3, 6, 0, 6}
	var in, a, b ClipRings
	in.AppendRing(u, 0)
	// y ≥ 4 keeps the tops of the arms, joined by edges back and forth
	// along y = 4 across the notch; x ≤ 4.5 then crosses that bridge at
	// (4.5, 4), once each way.
	HalfPlane{NY: -1, H: -4}.ClipSet(&in, &a)
	if got := a.Area(); got != 12 {
		t.Errorf("after one clip: area %g, want 2 × 3·2", got)
	}
	HalfPlane{NX: 1, H: 4.5}.ClipSet(&a, &b)
	// True piece: the left arm's top 0..3 × 4..6.
	if got := b.Area(); got != 6 {
		t.Errorf("area %g, want 6", got)
	}
	var cands [][2]float64
	for i, f := range b.Prov {
		if f&ProvCandidate != 0 {
			cands = append(cands, [2]float64{b.XY[2*i], b.XY[2*i+1]})
		}
	}
	if len(cands) != 2 || cands[0] != [2]float64{4.5, 4} || cands[1] != cands[0] {
		t.Fatalf("candidates %v, want (4.5, 4) twice", cands)
	}
	if PointInRing(u, 4.5, 4) != -1 {
		t.Error("(4.5, 4) lies in the notch, outside the ring")
	}
}

// The side value's rounding stays within HalfPlaneSideRelErr·(|q − w|·|n| +
// h) of the exact value for the given n and h (exact: math/big).
func TestHalfPlaneSideErrorBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	worst := 0.0
	for i := 0; i < 20000; i++ {
		off := 1e6 * rng.Float64()
		w := [2]float64{off + rng.NormFloat64()*1e3, off + rng.NormFloat64()*1e3}
		u := [2]float64{w[0] + rng.NormFloat64()*1e3, w[1] + rng.NormFloat64()*1e3}
		hp := Bisector(w[0], w[1], u[0], u[1])
		// Points near the bisector, where the sign is at stake.
		m := [2]float64{(w[0] + u[0]) / 2, (w[1] + u[1]) / 2}
		q := [2]float64{m[0] + hp.NY*rng.NormFloat64(), m[1] - hp.NX*rng.NormFloat64()}
		got := hp.side(q[0], q[1])
		r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
		ex := new(big.Rat).Mul(new(big.Rat).Sub(r(q[0]), r(w[0])), r(hp.NX))
		ex.Add(ex, new(big.Rat).Mul(new(big.Rat).Sub(r(q[1]), r(w[1])), r(hp.NY)))
		ex.Sub(ex, r(hp.H))
		exact, _ := ex.Float64()
		scale := math.Hypot(q[0]-w[0], q[1]-w[1])*math.Hypot(hp.NX, hp.NY) + hp.H
		if e := math.Abs(got-exact) / scale; e > worst {
			worst = e
		}
	}
	if worst > HalfPlaneSideRelErr {
		t.Errorf("largest relative error %g exceeds the bound %g", worst, HalfPlaneSideRelErr)
	}
}

func TestRingConvex(t *testing.T) {
	cases := []struct {
		name string
		ring []float64
		want bool
	}{
		{"ccw square", []float64{0, 0, 1, 0, 1, 1, 0, 1}, true},
		{"cw square", []float64{0, 0, 0, 1, 1, 1, 1, 0}, false},
		{"straight vertex", []float64{0, 0, 1, 0, 2, 0, 2, 2}, true},
		{"notch", []float64{0, 0, 4, 0, 4, 4, 2, 1, 0, 4}, false},
		// A reflex turn of one ulp is still a right turn.
		{"one-ulp notch", []float64{0, 0, 2, 0, 2, 2, 1, math.Nextafter(2, 0), 0, 2}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := RingConvex(c.ring); got != c.want {
				t.Errorf("RingConvex = %v, want %v", got, c.want)
			}
		})
	}
}
