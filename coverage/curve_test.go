// Tests of the coverage curve and its inverse.
//
// References: the closed-form uncovered area of planar.RingDiskArea summed
// over cells (Layout.UncoveredArea, itself checked against closed forms and
// GEOS), closed forms for one site in a square (disk area and circular
// segments, CRC Standard Mathematical Tables), and the definition of the
// inverse (smallest r whose covered fraction reaches the target).

package coverage

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// cvTestScenes are layouts with holes, several parts, sites outside the
// area, duplicates and a fence.
func cvTestScenes(t testing.TB) []struct {
	name string
	l    *Layout
} {
	rng := rand.New(rand.NewPCG(3, 4))
	var out []struct {
		name string
		l    *Layout
	}
	add := func(name string, sites []orb.Point, polys ...[][]orb.Point) {
		out = append(out, struct {
			name string
			l    *Layout
		}{name, cvLayout(t, sites, cvRegion(t, polys...))})
	}
	var s1 []orb.Point
	for i := 0; i < 60; i++ {
		s1 = append(s1, orb.Point{rng.Float64()*440 - 20, rng.Float64()*440 - 20})
	}
	lshape := []orb.Point{{0, 0}, {400, 0}, {400, 250}, {250, 250}, {250, 400}, {0, 400}}
	hole := []orb.Point{{80, 80}, {80, 160}, {160, 160}, {160, 80}}
	add("lshape-hole", s1, [][]orb.Point{lshape, hole})
	var s2 []orb.Point
	for i := 0; i < 40; i++ {
		s2 = append(s2, orb.Point{rng.Float64() * 430, rng.Float64() * 210})
	}
	s2 = append(s2, s2[3], s2[7])
	add("two-parts", s2, [][]orb.Point{{{0, 0}, {180, 0}, {220, 90}, {150, 200}, {20, 170}}, {{70, 60}, {60, 110}, {110, 120}, {120, 70}}},
		[][]orb.Point{cvRect(260, 20, 420, 160)})
	var s3 []orb.Point
	for x := 10.0; x < 300; x += 35 {
		s3 = append(s3, orb.Point{x, 40})
	}
	add("fence", s3, [][]orb.Point{{{0, 0}, {300, 0}, {300, 120}, {180, 120}, {180, 70}, {120, 70}, {120, 120}, {0, 120}}})
	add("grid", sitegen.Grid(144), [][]orb.Point{cvRect(-3, -4, 113, 112), {{30, 30}, {30, 70}, {70, 70}, {70, 30}}})
	return out
}

func TestCurveMatchesUncoveredArea(t *testing.T) {
	for _, sc := range cvTestScenes(t) {
		cv := sc.l.Curve()
		full := sc.l.FullCover().Range
		// Reference: the full-cover range is where the curve reaches 1.
		if math.Abs(cv.FullCoverRange()-full) > 1e-15*full {
			t.Errorf("%s: curve full cover %v, layout %v", sc.name, cv.FullCoverRange(), full)
		}
		for k := 0; k <= 40; k++ {
			r := full * float64(k) / 37 // beyond full too
			// Reference: Σ cells [area − RingDiskArea] (planar closed form).
			want := sc.l.UncoveredArea(r)
			got := cv.UncoveredArea(r)
			if math.Abs(got-want) > 1e-11*sc.l.AreaM2 {
				t.Errorf("%s r=%v: curve uncovered %.12g, closed form %.12g", sc.name, r, got, want)
			}
		}
		if cv.CoveredFraction(full) != 1 || sc.l.CoveredFraction(full) != 1 {
			t.Errorf("%s: covered fraction at the full-cover range is %v / %v, want exactly 1",
				sc.name, cv.CoveredFraction(full), sc.l.CoveredFraction(full))
		}
		if cv.CoveredFraction(full*(1-1e-6)) >= 1 {
			t.Errorf("%s: covered fraction reaches 1 before the full-cover range", sc.name)
		}
	}
}

func TestCurveInverse(t *testing.T) {
	for _, sc := range cvTestScenes(t) {
		cv := sc.l.Curve()
		full := cv.FullCoverRange()
		if got := cv.RangeFor(1); got != full {
			t.Errorf("%s: RangeFor(1) = %v, want the full-cover range %v", sc.name, got, full)
		}
		if got := cv.RangeFor(0); got != 0 {
			t.Errorf("%s: RangeFor(0) = %v, want 0", sc.name, got)
		}
		if got := cv.RangeFor(math.NaN()); !math.IsNaN(got) {
			t.Errorf("%s: RangeFor(NaN) = %v", sc.name, got)
		}
		fr := []float64{0.01, 0.2, 0.5, 0.9, 0.95, 0.99, 0.999, 0.999999}
		rs := cv.RangesFor(fr)
		for i, f := range fr {
			r := rs[i]
			if one := cv.RangeFor(f); math.Abs(one-r) > 2e-9*full {
				t.Errorf("%s f=%v: RangeFor %v, RangesFor %v", sc.name, f, one, r)
			}
			// Reference: definition of the inverse, checked with the exact
			// closed form on both sides of the returned range.
			lo, hi := r-1e-9*full, r+1e-9*full
			if sc.l.CoveredFraction(hi) < f || sc.l.CoveredFraction(lo) > f {
				t.Errorf("%s f=%v: r=%v does not bracket the fraction: %v at r−, %v at r+",
					sc.name, f, r, sc.l.CoveredFraction(lo), sc.l.CoveredFraction(hi))
			}
		}
	}
	// Closed form: one site at the centre of a square of side a covers
	// πr²/a² for r <= a/2, so RangeFor(f) = a·sqrt(f/π).
	const a = 10.0
	l := cvLayout(t, []orb.Point{{a / 2, a / 2}}, cvRegion(t, [][]orb.Point{cvRect(0, 0, a, a)}))
	cv := l.Curve()
	for _, f := range []float64{0.1, 0.5, math.Pi / 4} {
		want := a * math.Sqrt(f/math.Pi)
		if got := cv.RangeFor(f); math.Abs(got-want) > 1e-9*a/math.Sqrt2 {
			t.Errorf("square f=%v: RangeFor %.15g, want a√(f/π) = %.15g", f, got, want)
		}
	}
}

// A layout whose covered fraction is flat between two ranges: the inverse
// returns the left end of the flat part.
func TestCurveFlatPart(t *testing.T) {
	// Site A covers the unit square [0,1]² fully at r = √0.5; site B far
	// away is the nearest site of the strip [10, 11] × [0, 1] from distance
	// 2 on. Between √0.5 and 2 nothing changes.
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 1, 1)}, [][]orb.Point{cvRect(10, 0, 11, 1)})
	l := cvLayout(t, []orb.Point{{0.5, 0.5}, {13, 0.5}}, reg)
	cv := l.Curve()
	f := cv.CoveredFraction(1.5)
	// Reference: half the area (the unit square) is covered on [√0.5, 2].
	if math.Abs(f-0.5) > 1e-15 {
		t.Fatalf("covered fraction on the flat part %v, want 0.5", f)
	}
	// The uncovered area vanishes quadratically at the left end (corner
	// areas ≈ δ²), so rounding of the areas (≈ 1e-16) leaves δ ≈ 1e-8.
	if r := cv.RangeFor(0.5); math.Abs(r-math.Sqrt(0.5)) > 2e-8 {
		t.Errorf("RangeFor(0.5) = %v, want √0.5 (left end of the flat part)", r)
	}
	if r := cv.RangeFor(0.5000001); r < 2 {
		t.Errorf("RangeFor(0.5000001) = %v, want > 2", r)
	}
}

func TestCurveSamples(t *testing.T) {
	for _, sc := range cvTestScenes(t) {
		cv := sc.l.Curve()
		s := cv.Samples(50)
		if len(s) < 50 || s[0].Range != 0 || s[len(s)-1].Range != cv.FullCoverRange() || s[len(s)-1].Fraction != 1 {
			t.Fatalf("%s: samples %v ... %v", sc.name, s[0], s[len(s)-1])
		}
		for i := 1; i < len(s); i++ {
			if s[i].Range <= s[i-1].Range || s[i].Fraction < s[i-1].Fraction {
				t.Errorf("%s: samples not increasing at %d: %v, %v", sc.name, i, s[i-1], s[i])
			}
			if want := sc.l.CoveredFraction(s[i].Range); math.Abs(s[i].Fraction-want) > 1e-11 {
				t.Errorf("%s: sample %v, closed form %v", sc.name, s[i], want)
			}
		}
	}
}

// TestCrvCoarseAtan2 checks the coarse angle against math.Atan2: within
// 0.005 rad on a grid of directions around the circle (both octants of
// each quadrant, the axes and the diagonals, at scales from 1e-300 to 1),
// and exactly equal, signed zeros included, on the axes.
func TestCrvCoarseAtan2(t *testing.T) {
	for _, s := range []float64{1e-300, 1e-9, 1} {
		for k := 0; k < 4096; k++ {
			th := 2*math.Pi*float64(k)/4096 - math.Pi
			y, x := s*math.Sin(th), s*math.Cos(th)
			if got, want := crvCoarseAtan2(y, x), math.Atan2(y, x); math.Abs(got-want) > 0.005 && math.Abs(math.Abs(got-want)-2*math.Pi) > 0.005 {
				t.Fatalf("crvCoarseAtan2(%v, %v) = %v, atan2 %v", y, x, got, want)
			}
		}
	}
	z := math.Copysign(0, -1)
	for _, c := range [][2]float64{{0, 0}, {z, 0}, {0, z}, {z, z}, {0, 1}, {z, 1}, {0, -1}, {z, -1}, {1, 0}, {-1, 0}, {1, z}, {-1, z}, {1, 1}, {-1, -1}} {
		got, want := crvCoarseAtan2(c[0], c[1]), math.Atan2(c[0], c[1])
		if c[0] == 0 || c[1] == 0 {
			if got != want || math.Signbit(got) != math.Signbit(want) {
				t.Fatalf("crvCoarseAtan2(%v, %v) = %v, want %v", c[0], c[1], got, want)
			}
		} else if math.Abs(got-want) > 0.005 {
			t.Fatalf("crvCoarseAtan2(%v, %v) = %v, atan2 %v", c[0], c[1], got, want)
		}
	}
}
