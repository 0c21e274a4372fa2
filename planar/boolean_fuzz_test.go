// Fuzz target for the polygon overlay: every result must pass the exact
// validity check (NewRegion, orientation) and the areas must satisfy
// area(A−B) + area(A∩B) = area(A) and area(A∪B) = area(A) + area(B) −
// area(A∩B).
//
//	go test -run '^$' -fuzz FuzzPolygonUnion -fuzztime 30s ./planar

package planar

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// booleanFuzzTol is the relative tolerance of the area identities: each
// area is a float64 shoelace sum (relative error ~n·ε) over vertices that
// include rounded crossing points (a few ulps off), and each opened pinch
// point removes at most ½(|vp| + |vq|)·64 ulp per passage (boolean_pinch.go).
const booleanFuzzTol = 1e-9

// booleanFuzzShapes decodes data into two polygon sets. Each 7-byte group
// is one polygon: byte 0 picks the operand (bit 0), the shape (bit 1:
// triangle or rectangle) and a 1e-9 nudge (bit 2, for near-touching);
// bytes 1–6 are coordinates on a grid of step 1/4 (many shared edges,
// collinear overlaps and touching corners).
func booleanFuzzShapes(data []byte) (a, b orb.MultiPolygon) {
	for len(data) >= 7 && len(a)+len(b) < 12 {
		g := data[:7]
		data = data[7:]
		c := func(i int) float64 { return float64(g[i]%64) / 4 }
		nudge := 0.0
		if g[0]&4 != 0 {
			nudge = 1e-9
		}
		var p orb.Polygon
		if g[0]&2 != 0 {
			x0, y0, x1, y1 := c(1), c(2), c(3)+nudge, c(4)
			if x0 == x1 || y0 == y1 {
				continue
			}
			p = bRect(min(x0, x1), min(y0, y1), max(x0, x1), max(y0, y1))
		} else {
			x0, y0, x1, y1, x2, y2 := c(1), c(2), c(3)+nudge, c(4), c(5), c(6)
			if Orient2D(x0, y0, x1, y1, x2, y2) == 0 {
				continue
			}
			p = bPoly(x0, y0, x1, y1, x2, y2)
		}
		if g[0]&1 == 0 {
			a = append(a, p)
		} else {
			b = append(b, p)
		}
	}
	return a, b
}

func FuzzPolygonUnion(f *testing.F) {
	f.Add([]byte{2, 0, 0, 8, 8, 0, 0, 3, 4, 4, 12, 12, 0, 0})
	f.Add([]byte{2, 0, 0, 8, 8, 0, 0, 2, 8, 0, 16, 8, 0, 0, 3, 8, 8, 16, 16, 0, 0})
	f.Add([]byte{0, 0, 0, 16, 0, 8, 16, 1, 0, 8, 16, 8, 8, 0, 5, 4, 4, 12, 4, 8, 12})
	f.Add([]byte{2, 0, 0, 8, 8, 0, 0, 6, 8, 0, 16, 8, 0, 0, 3, 0, 0, 8, 8, 0, 0})
	f.Fuzz(func(t *testing.T, data []byte) {
		a, b := booleanFuzzShapes(data)
		aa, ab, ai, ad, au := booleanOpAreas(t, a, b)
		scale := math.Max(1, aa+ab)
		if math.Abs(ad+ai-aa) > booleanFuzzTol*scale {
			t.Errorf("area(A−B) + area(A∩B) = %v + %v ≠ area(A) = %v", ad, ai, aa)
		}
		if math.Abs(au-(aa+ab-ai)) > booleanFuzzTol*scale {
			t.Errorf("area(A∪B) = %v ≠ %v + %v − %v", au, aa, ab, ai)
		}
		if ai > math.Min(aa, ab)+booleanFuzzTol*scale || au < math.Max(aa, ab)-booleanFuzzTol*scale {
			t.Errorf("A=%v B=%v A∩B=%v A∪B=%v out of order", aa, ab, ai, au)
		}
	})
}
