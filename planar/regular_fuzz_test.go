// Fuzz test of TriangulateRegular: the point encodings of FuzzTriangulate
// (degenerate small-integer grids, near-duplicates far from the origin, raw
// float64 bit patterns, half-metre grids at a false origin) with weights
// from a few bytes: equal, small integers (ties, duplicates with different
// weights) or the device range mix. The result must be an error exactly
// when an input is not finite, and otherwise pass checkRegular (structure,
// exact empty power circles, hidden points).

package planar

import (
	"math"
	"testing"
)

func FuzzRegularTriangulate(f *testing.F) {
	f.Add([]byte{0, 0, 0, 1, 0, 0, 1, 1, 1, 2, 2, 0, 2, 1, 2, 2, 2, 1, 1}, []byte{1, 3, 0, 2})
	f.Add([]byte{1, 0, 0, 1, 0, 0, 1, 2, 2, 3, 3, 255, 255}, []byte{0})
	f.Add([]byte{3, 1, 0, 2, 0, 3, 0, 4, 0, 5, 0, 6, 0}, []byte{2, 9, 200, 17})
	f.Add([]byte{0, 0, 0, 0, 0, 0, 0, 4, 0, 0, 4, 4, 4, 2, 2}, []byte{1, 0, 5, 1, 1, 9})
	f.Fuzz(func(t *testing.T, data, wdata []byte) {
		pts := decodeFuzzPoints(data)
		if len(data) > 0 && data[0]%4 == 2 && len(pts) > 12 {
			// Raw bit patterns mostly take the math/big paths; keep the
			// brute-force check quick.
			pts = pts[:12]
		}
		w := decodeFuzzWeights(len(pts), wdata)
		nonFinite := false
		for _, p := range pts {
			if !finite(p[0], p[1]) {
				nonFinite = true
			}
		}
		tr, err := TriangulateRegular(pts, w)
		if nonFinite {
			if err == nil {
				t.Fatal("non-finite input accepted")
			}
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		if err := checkRegularErr(pts, w, tr); err != nil {
			t.Fatal(err)
		}
		// Equal weights are answered by Triangulate; check the weighted
		// construction on them too.
		g, err := triangulateRegular(pts, w)
		if err != nil {
			t.Fatal(err)
		}
		if err := checkRegularErr(pts, w, g); err != nil {
			t.Fatalf("weighted construction: %v", err)
		}
		for _, v := range tr.Weights {
			if math.IsNaN(v) {
				t.Fatal("NaN weight")
			}
		}
	})
}

// decodeFuzzWeights returns n weights from wdata: its first byte selects
// equal (zero) weights, small integers or squared device ranges.
func decodeFuzzWeights(n int, wdata []byte) []float64 {
	w := make([]float64, n)
	mode := byte(0)
	if len(wdata) > 0 {
		mode, wdata = wdata[0]%3, wdata[1:]
	}
	mix := [4]float64{40, 60, 120, 150}
	for i := range w {
		var b byte
		if len(wdata) > 0 {
			b = wdata[i%len(wdata)]
		}
		switch mode {
		case 1:
			w[i] = float64(b % 8)
		case 2:
			w[i] = mix[b%4] * mix[b%4]
		}
	}
	return w
}
