// Fuzz test of Triangulate: arbitrary bytes decoded into point sets that
// stress the degenerate cases (small-integer grids full of collinear,
// cocircular and duplicate points; near-duplicates far from the origin;
// raw float64 bit patterns including NaN, infinities, subnormals and huge
// magnitudes). The result must be an error exactly when a coordinate is not
// finite, and otherwise pass Validate (exact empty-circle check).

package planar

import (
	"encoding/binary"
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// decodeFuzzPoints turns data into at most 400 points. The first byte
// selects the encoding.
func decodeFuzzPoints(data []byte) []orb.Point {
	if len(data) == 0 {
		return nil
	}
	mode, data := data[0]%4, data[1:]
	var pts []orb.Point
	switch mode {
	case 0: // int8 grid: heavy degeneracy
		for i := 0; i+1 < len(data) && len(pts) < 400; i += 2 {
			pts = append(pts, orb.Point{float64(int8(data[i])), float64(int8(data[i+1]))})
		}
	case 1: // near-duplicates 1e-9 m apart, 5e6 m from the origin
		for i := 0; i+1 < len(data) && len(pts) < 400; i += 2 {
			pts = append(pts, orb.Point{5e6 + float64(int8(data[i]))*1e-9, 5e6 + float64(int8(data[i+1]))*1e-9})
		}
	case 2: // raw float64 bits
		for i := 0; i+15 < len(data) && len(pts) < 400; i += 16 {
			x := math.Float64frombits(binary.LittleEndian.Uint64(data[i:]))
			y := math.Float64frombits(binary.LittleEndian.Uint64(data[i+8:]))
			pts = append(pts, orb.Point{x, y})
		}
	case 3: // int16 half-metres at a 5e6 m false origin
		for i := 0; i+3 < len(data) && len(pts) < 400; i += 4 {
			x := float64(int16(binary.LittleEndian.Uint16(data[i:])))
			y := float64(int16(binary.LittleEndian.Uint16(data[i+2:])))
			pts = append(pts, orb.Point{5e6 + x/2, -5e6 + y/2})
		}
	}
	return pts
}

func FuzzTriangulate(f *testing.F) {
	f.Add([]byte{0, 0, 0, 1, 0, 0, 1, 1, 1, 2, 2, 0, 2, 1, 2, 2, 2, 1, 1})
	f.Add([]byte{1, 0, 0, 1, 0, 0, 1, 2, 2, 3, 3, 255, 255})
	f.Add([]byte{3, 1, 0, 2, 0, 3, 0, 4, 0, 5, 0, 6, 0})
	f.Fuzz(func(t *testing.T, data []byte) {
		pts := decodeFuzzPoints(data)
		nonFinite := false
		distinct := map[orb.Point]bool{}
		for _, p := range pts {
			if !finite(p[0], p[1]) {
				nonFinite = true
			}
			distinct[orb.Point{p[0] + 0, p[1] + 0}] = true // -0 == +0
		}
		tr, err := Triangulate(pts)
		if nonFinite {
			if err == nil {
				t.Fatal("non-finite input accepted")
			}
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		if err := tr.Validate(); err != nil {
			t.Fatal(err)
		}
		if tr.NumVertices() != len(distinct) {
			t.Fatalf("%d vertices for %d distinct points", tr.NumVertices(), len(distinct))
		}
		for i, p := range pts {
			v := tr.Vertex[i]
			if tr.Coords[2*v] != p[0] || tr.Coords[2*v+1] != p[1] {
				t.Fatalf("input %d mapped to vertex %d elsewhere", i, v)
			}
			if got := tr.Nearest(p[0], p[1], -1); tr.Coords[2*got] != p[0] || tr.Coords[2*got+1] != p[1] {
				t.Fatalf("Nearest of input %d is vertex %d", i, got)
			}
		}
	})
}
