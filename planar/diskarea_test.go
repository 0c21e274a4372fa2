// Tests of RingDiskArea and Region.DiskArea against closed forms of plane
// geometry and against GEOS (shapely) polygon ∩ polygonal-disk areas.

package planar

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// diskPolygon returns the regular n-gon inscribed in (scale = 1) or
// circumscribed about (scale = 1/cos(π/n)) the circle, counter-clockwise.
func diskPolygon(cx, cy, r float64, n int, scale float64) []float64 {
	ring := make([]float64, 0, 2*n)
	for i := 0; i < n; i++ {
		a := 2 * math.Pi * float64(i) / float64(n)
		ring = append(ring, cx+scale*r*math.Cos(a), cy+scale*r*math.Sin(a))
	}
	return ring
}

func diskSquareRing(x0, y0, x1, y1 float64) []float64 {
	return []float64{x0, y0, x1, y0, x1, y1, x0, y1}
}

func TestRingDiskAreaGEOS(t *testing.T) {
	checkDiskRef(t, clipLoadRef(t, "testdata/cells_ref.json"))
}

func TestRingDiskAreaGEOSLive(t *testing.T) {
	checkDiskRef(t, clipRunRefScript(t))
}

func checkDiskRef(t *testing.T, ref *clipRef) {
	// Reference: GEOS (shapely 1.8, Debian python3-shapely) area of the
	// polygon intersected with a 4096-gon inscribed in the circle and with
	// the 4096-gon circumscribing it; the exact area lies in between.
	for _, d := range ref.Disk {
		got := RingDiskArea(d.Ring, d.Cx, d.Cy, d.R)
		slack := 1e-12 * math.Max(1, d.Hi)
		if got < d.Lo-slack || got > d.Hi+slack {
			t.Errorf("%s: area %.15g outside GEOS bracket [%.15g, %.15g]", d.Name, got, d.Lo, d.Hi)
		}
		// The bracket is as tight as the polygon approximation implies:
		// the circumscribed minus inscribed 4096-gon area is
		// n r² (tan(π/n) − sin(2π/n)/2) ≈ 2π³r²/n² ≈ 3.7e-6 r².
		n := float64(ref.NPoly)
		gap := n * d.R * d.R * (math.Tan(math.Pi/n) - math.Sin(2*math.Pi/n)/2)
		if d.Hi-d.Lo > gap*(1+1e-6)+slack {
			t.Errorf("%s: GEOS bracket width %g exceeds the polygon gap %g", d.Name, d.Hi-d.Lo, gap)
		}
	}
}

// diskLensArea is the area of intersection of two disks of radii r1, r2 whose
// centres are d apart. Reference: the circle–circle intersection formula
// (e.g. Weisstein, "Circle-Circle Intersection", MathWorld; any geometry
// handbook): r1² acos((d²+r1²−r2²)/(2dr1)) + r2² acos((d²+r2²−r1²)/(2dr2))
// − ½ √((−d+r1+r2)(d+r1−r2)(d−r1+r2)(d+r1+r2)).
func diskLensArea(r1, r2, d float64) float64 {
	if d >= r1+r2 {
		return 0
	}
	if d <= math.Abs(r1-r2) {
		m := math.Min(r1, r2)
		return math.Pi * m * m
	}
	return r1*r1*math.Acos((d*d+r1*r1-r2*r2)/(2*d*r1)) +
		r2*r2*math.Acos((d*d+r2*r2-r1*r1)/(2*d*r2)) -
		0.5*math.Sqrt((-d+r1+r2)*(d+r1-r2)*(d-r1+r2)*(d+r1+r2))
}

func TestRingDiskAreaLens(t *testing.T) {
	const n = 4096
	cases := []struct{ r1, r2, d float64 }{
		{1, 1, 1}, {1, 1, 0.1}, {1, 1, 1.999}, {2, 1, 1.5}, {1, 2, 2.5},
		{3, 1, 1}, {1, 3, 1.5}, {5, 5, 0}, {1, 1, 2}, {1, 1, 2.5}, {10, 0.01, 9.995},
	}
	for _, c := range cases {
		// Disk 2 centred at (d, 0) approximated from inside and outside.
		in := RingDiskArea(diskPolygon(c.d, 0, c.r2, n, 1), 0, 0, c.r1)
		out := RingDiskArea(diskPolygon(c.d, 0, c.r2, n, 1/math.Cos(math.Pi/n)), 0, 0, c.r1)
		want := diskLensArea(c.r1, c.r2, c.d)
		slack := 1e-13 * math.Max(1, want)
		if !(in-slack <= want && want <= out+slack) {
			t.Errorf("r1=%g r2=%g d=%g: lens %.15g not in [%.15g, %.15g]", c.r1, c.r2, c.d, want, in, out)
		}
	}
}

// diskSquareArea is the area of the disk of radius r centred in the square of
// half-side a. Reference (textbook geometry): for a < r < a√2 each side cuts
// off a circular segment of half-angle φ = acos(a/r), area r²(φ − sin φ cos φ),
// and the four segments are disjoint, so the area is πr² − 4r²(φ − sin φ cos φ).
func diskSquareArea(a, r float64) float64 {
	switch {
	case r <= a:
		return math.Pi * r * r
	case r >= a*math.Sqrt2:
		return 4 * a * a
	}
	phi := math.Acos(a / r)
	return math.Pi*r*r - 4*r*r*(phi-math.Sin(phi)*math.Cos(phi))
}

func TestRingDiskAreaSquare(t *testing.T) {
	a := 3.0
	ring := diskSquareRing(-a, -a, a, a)
	for _, r := range []float64{0.5, 2.9, 3, 3 + 1e-9, 3.5, 4, 4.2, 3 * math.Sqrt2, 3*math.Sqrt2 + 1e-9, 5, 100} {
		got := RingDiskArea(ring, 0, 0, r)
		want := diskSquareArea(a, r)
		if math.Abs(got-want) > 1e-13*want {
			t.Errorf("r=%.17g: area %.17g, closed form %.17g (rel %.3g)", r, got, want, (got-want)/want)
		}
	}
}

func TestRingDiskAreaSegment(t *testing.T) {
	// Reference: a circular segment of central angle θ has area
	// r²(θ − sin θ)/2 (textbook geometry); the part of the disk above the
	// line y = h has θ = 2 acos(h/r). The line is the bottom edge of a
	// large square.
	r := 2.5
	for _, h := range []float64{0, 0.5, 1.25, 2.4, 2.4999999, -0.7, -2.3, 2.5, 3} {
		ring := diskSquareRing(-100, h, 100, 200)
		got := RingDiskArea(ring, 0, 0, r)
		want := 0.0
		if h < r {
			th := 2 * math.Acos(h/r)
			want = r * r * (th - math.Sin(th)) / 2
		}
		// The error bound of RingDiskArea is absolute, of order u·r²
		// (see diskarea.go), so a tiny segment is checked to that.
		if math.Abs(got-want) > 1e-13*math.Max(want, r*r) {
			t.Errorf("h=%g: area %.17g, closed form %.17g", h, got, want)
		}
	}
}

func TestRingDiskAreaSpecial(t *testing.T) {
	sq := diskSquareRing(0, 0, 10, 10)
	cw := []float64{0, 0, 0, 10, 10, 10, 10, 0}
	tests := []struct {
		name           string
		ring           []float64
		cx, cy, r, out float64
	}{
		// Elementary areas.
		{"inside", sq, 5, 5, 2, math.Pi * 4},
		{"outside-bbox", sq, 30, 5, 2, 0},
		{"outside-near-corner", sq, 12, 12, 2.8, 0},
		{"clockwise", cw, 5, 5, 2, -math.Pi * 4},
		{"radius-0", sq, 5, 5, 0, 0},
		{"radius-negative", sq, 5, 5, -1, 0},
		{"radius-NaN", sq, 5, 5, math.NaN(), 0},
		{"huge-radius", sq, 5, 5, 1e200, 100},
		{"quarter-at-corner", sq, 0, 0, 3, math.Pi * 9 / 4},
		{"half-on-edge", sq, 5, 0, 3, math.Pi * 9 / 2},
		{"tangent-inside", sq, 5, 3, 3, math.Pi * 9},
		{"tangent-outside", sq, 5, -3, 3, 0},
		// Back-and-forth spike and a repeated vertex add nothing.
		{"spike", []float64{0, 0, 10, 0, 10, 5, 20, 5, 10, 5, 10, 10, 0, 10, 0, 10}, 5, 5, 2, math.Pi * 4},
		{"spike-through-disk", []float64{0, 0, 10, 0, 10, 5, 3, 5, 10, 5, 10, 10, 0, 10}, 5, 5, 2, math.Pi * 4},
		{"too-short", []float64{0, 0, 1, 1}, 0, 0, 5, 0},
	}
	for _, tc := range tests {
		got := RingDiskArea(tc.ring, tc.cx, tc.cy, tc.r)
		if math.Abs(got-tc.out) > 1e-13*math.Max(1, math.Abs(tc.out)) {
			t.Errorf("%s: area %.17g, want %.17g", tc.name, got, tc.out)
		}
	}
}

func TestRingDiskAreaTranslation(t *testing.T) {
	// Far from the origin (UTM-sized coordinates) the result is the same
	// as near it, to the precision the coordinates carry.
	ring := []float64{0, 0, 20, 0, 20, 8, 8, 8, 8, 20, 0, 20}
	near := RingDiskArea(ring, 8.5, 7.25, 6.5)
	x0, y0 := 512345.0, 5712345.0
	far := make([]float64, len(ring))
	for i := 0; i < len(ring); i += 2 {
		far[i], far[i+1] = ring[i]+x0, ring[i+1]+y0
	}
	got := RingDiskArea(far, 8.5+x0, 7.25+y0, 6.5)
	if math.Abs(got-near) > 1e-9*near {
		t.Errorf("translated: %.15g vs %.15g", got, near)
	}
}

func TestRingDiskAreaContinuity(t *testing.T) {
	// Through tangency and through a vertex the area changes continuously.
	ring := []float64{0, 0, 10, 0, 10, 10, 0, 10}
	for _, c := range []struct{ cx, cy, r float64 }{
		{5, 13, 3}, {5, -3, 3}, {13, 14, 5}, {5, 5, 5 * math.Sqrt2}, {0, 0, 1},
	} {
		a0 := RingDiskArea(ring, c.cx, c.cy, c.r)
		for _, eps := range []float64{1e-9, -1e-9} {
			a1 := RingDiskArea(ring, c.cx, c.cy, c.r+eps)
			// d(area)/dr is at most the circumference 2πr.
			if math.Abs(a1-a0) > 2*math.Pi*c.r*math.Abs(eps)*1.01+1e-12 {
				t.Errorf("%+v: area jumps from %.17g to %.17g at r%+g", c, a0, a1, eps)
			}
		}
	}
}

func TestRegionDiskArea(t *testing.T) {
	// A 10×10 square with a 4×4 hole at (3..7, 3..7) and a second square.
	reg, err := NewRegion(orb.MultiPolygon{
		{
			{{0, 0}, {10, 0}, {10, 10}, {0, 10}},
			{{3, 3}, {7, 3}, {7, 7}, {3, 7}},
		},
		{{{20, 0}, {30, 0}, {30, 10}, {20, 10}}},
	})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name            string
		cx, cy, r, want float64
	}{
		// Elementary areas.
		{"in-hole", 5, 5, 1.5, 0},
		{"around-hole", 5, 5, 5, 25*math.Pi - 16},
		{"covers-all", 15, 5, 100, 200 - 16},
		{"in-second-part", 25, 5, 2, math.Pi * 4},
		{"ring-band", 1.5, 5, 1.5, math.Pi * 2.25},
		// A disk centred in the hole, radius between the hole's half-side
		// and its half-diagonal, cut by the hole: disk minus (square ∩
		// disk), with the square closed form of TestRingDiskAreaSquare.
		{"straddles-hole", 5, 5, 2.5, math.Pi*6.25 - diskSquareArea(2, 2.5)},
	}
	for _, tc := range tests {
		got := reg.DiskArea(tc.cx, tc.cy, tc.r)
		if math.Abs(got-tc.want) > 1e-12*math.Max(1, tc.want) {
			t.Errorf("%s: %.15g, want %.15g", tc.name, got, tc.want)
		}
	}
}

func BenchmarkRingDiskArea(b *testing.B) {
	ring := diskPolygon(0, 0, 10, 8, 1)
	for i := 0; i < b.N; i++ {
		RingDiskArea(ring, 3, 1, 9)
	}
}
