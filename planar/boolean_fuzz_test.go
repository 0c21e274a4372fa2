// Fuzz target for the polygon overlay: every result must pass the exact
// validity check (NewRegion, orientation) and the areas must satisfy
// area(A−B) + area(A∩B) = area(A) and area(A∪B) = area(A) + area(B) −
// area(A∩B).
//
//	go test -run '^$' -fuzz FuzzPolygonUnion -fuzztime 30s ./planar
//
// The corpus files testdata/fuzz/FuzzPolygonUnion/kgap-parts-ulp-apart*
// hold booleanKGapParts (boolean_test.go) as raw groups, all in operand A
// and split two and two between the operands.

package planar

import (
	"encoding/binary"
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// booleanFuzzTol is the relative tolerance of the area identities: each
// area is a float64 shoelace sum (relative error ~n·ε) over vertices that
// include rounded crossing points (a few ulps off), and each opened pinch
// point removes at most ½(|vp| + |vq|)·64 ulp per passage (boolean_pinch.go).
const booleanFuzzTol = 1e-9

// booleanFuzzUlps bounds, in ulps of the largest coordinate per unit of
// input perimeter, how far an overlay's area may be from the exact one:
// the result's boundary lies on the input edges (its length is at most
// the input perimeter P), and along it vertices move by rounded crossings
// (≤ 2 ulps), merging of ulp-close vertices (≤ 2·booleanNearUlps), dropped
// slivers (≤ booleanPinchSep·ulp·their perimeter) and opened pinches
// (≤ booleanPinchSep·ulp·the passages' edges); each of the four areas in an
// identity contributes once. Used for the free-form (raw) polygons only,
// whose vertices need not lie on a coarse grid.
const booleanFuzzUlps = 4 * (2 + 2*booleanNearUlps + 2*booleanPinchSep)

// booleanFuzzRawMin and booleanFuzzRawMax bound the magnitude of nonzero
// raw coordinates (others, and non-finite ones, make the polygon be
// skipped): sites are metres in a local plane, far inside this range.
// Beyond it Orient2D leaves its expansion arithmetic for big.Rat
// (predicates.go: 2⁻⁴⁰⁰ to 2⁴⁰⁰ for all operands, which rounded crossing
// points of tiny coordinates can leave): exact still, but so slow that the
// fuzzer took a 4-vertex ring at 1e-297 (corpus 689bc3e39b87d036) for a
// hang.
const (
	booleanFuzzRawMin = 0x1p-60
	booleanFuzzRawMax = 0x1p40
)

// booleanFuzzShapes decodes data into two polygon sets. Each group is one
// polygon; byte 0 picks the operand (bit 0) and the kind. When bit 3 is
// clear the group is 7 bytes: bit 1 picks triangle or rectangle, bit 2 a
// 1e-9 nudge (for near-touching), and bytes 1–6 are coordinates on a grid
// of step 1/4 (many shared edges, collinear overlaps and touching
// corners). When bit 3 is set the polygon is raw: byte 1 gives n = 3 +
// byte%8 vertices, followed by n little-endian float64 (x, y) pairs (16n
// bytes), for vertices an ulp apart as rounded geometry leaves them; a raw
// ring that is not simple (NewRegion refuses it) or has a coordinate
// outside booleanFuzzRawMin to booleanFuzzRawMax is skipped. It also
// returns the extra area tolerance for the raw polygons (booleanFuzzUlps
// ulps of their largest coordinate times the input perimeter; 0 without
// raw polygons).
func booleanFuzzShapes(data []byte) (a, b orb.MultiPolygon, rawTol float64) {
	rawMax, per, raw := 0.0, 0.0, false
	for len(data) >= 7 && len(a)+len(b) < 12 {
		var p orb.Polygon
		if data[0]&8 != 0 {
			n := 3 + int(data[1]%8)
			if len(data) < 2+16*n {
				break
			}
			p = booleanFuzzRaw(data[2 : 2+16*n])
			g0 := data[0]
			data = data[2+16*n:]
			if p == nil {
				continue
			}
			if g0&1 == 0 {
				a = append(a, p)
			} else {
				b = append(b, p)
			}
			raw = true
			for i, q := range p[0][:n] {
				rawMax = math.Max(rawMax, math.Max(math.Abs(q[0]), math.Abs(q[1])))
				per += math.Hypot(p[0][i+1][0]-q[0], p[0][i+1][1]-q[1])
			}
			continue
		}
		g := data[:7]
		data = data[7:]
		c := func(i int) float64 { return float64(g[i]%64) / 4 }
		nudge := 0.0
		if g[0]&4 != 0 {
			nudge = 1e-9
		}
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
		per += booleanPerimeter(orb.MultiPolygon{p})
		rawMax = math.Max(rawMax, 16) // grid coordinates are below 16
	}
	if !raw {
		return a, b, 0
	}
	return a, b, booleanFuzzUlps * rawMax * 0x1p-52 * per
}

// booleanFuzzRaw decodes little-endian float64 (x, y) pairs into a
// one-ring polygon; nil when a coordinate is not finite or outside
// booleanFuzzRawMin to booleanFuzzRawMax, or when NewRegion refuses the
// ring.
func booleanFuzzRaw(data []byte) orb.Polygon {
	var c []float64
	for i := 0; i+8 <= len(data); i += 8 {
		v := math.Float64frombits(binary.LittleEndian.Uint64(data[i:]))
		if a := math.Abs(v); !(a <= booleanFuzzRawMax) || a != 0 && a < booleanFuzzRawMin {
			return nil
		}
		c = append(c, v)
	}
	p := bPoly(c...)
	if _, err := NewRegion(orb.MultiPolygon{p}); err != nil {
		return nil
	}
	return p
}

func FuzzPolygonUnion(f *testing.F) {
	f.Add([]byte{2, 0, 0, 8, 8, 0, 0, 3, 4, 4, 12, 12, 0, 0})
	f.Add([]byte{2, 0, 0, 8, 8, 0, 0, 2, 8, 0, 16, 8, 0, 0, 3, 8, 8, 16, 16, 0, 0})
	f.Add([]byte{0, 0, 0, 16, 0, 8, 16, 1, 0, 8, 16, 8, 8, 0, 5, 4, 4, 12, 4, 8, 12})
	f.Add([]byte{2, 0, 0, 8, 8, 0, 0, 6, 8, 0, 16, 8, 0, 0, 3, 0, 0, 8, 8, 0, 0})
	f.Fuzz(func(t *testing.T, data []byte) {
		a, b, rawTol := booleanFuzzShapes(data)
		// every vertex finite, every result valid; a refusal only as
		// near-degenerate, with operand vertices 1e-9 apart at its point
		aa, ab, ai, ad, au, ok := booleanOpAreasNear(t, a, b, true)
		if !ok {
			return
		}
		scale := math.Max(1, aa+ab)
		tol := booleanFuzzTol*scale + rawTol
		if math.Abs(ad+ai-aa) > tol {
			t.Errorf("area(A−B) + area(A∩B) = %v + %v ≠ area(A) = %v", ad, ai, aa)
		}
		if math.Abs(au-(aa+ab-ai)) > tol {
			t.Errorf("area(A∪B) = %v ≠ %v + %v − %v", au, aa, ab, ai)
		}
		if ai > math.Min(aa, ab)+tol || au < math.Max(aa, ab)-tol {
			t.Errorf("A=%v B=%v A∩B=%v A∪B=%v out of order", aa, ab, ai, au)
		}
	})
}
