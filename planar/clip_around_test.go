// Tests of the batched neighbour lists against clipper.around.

package planar

import (
	"math"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// TestAroundBatchMatchesAround checks that aroundBatch gives around's
// lists for every wanted bounded vertex of degree up to aroundLaneCap and
// leaves out the others (unwanted, hull, higher degree), on uniform, grid
// and star layouts (a centre of degree 100 on a circle of 100 sites, and
// one of degree 40), over chunks that cut the vertices anywhere.
func TestAroundBatchMatchesAround(t *testing.T) {
	star := func(deg int, cx float64) []orb.Point {
		pts := []orb.Point{{cx, 0}}
		for k := range deg {
			a := 2 * math.Pi * float64(k) / float64(deg)
			pts = append(pts, orb.Point{cx + 10*math.Cos(a), 10 * math.Sin(a)})
		}
		return pts
	}
	cases := map[string][]orb.Point{
		"uniform": sitegen.Uniform(5000, 3),
		"grid":    sitegen.Grid(2500),
		"stars":   append(append(star(100, 0), star(40, 50)...), orb.Point{25, 40}, orb.Point{25, -40}, orb.Point{-30, 0}, orb.Point{80, 0}),
	}
	for name, pts := range cases {
		tri, err := Triangulate(pts)
		if err != nil {
			t.Fatal(err)
		}
		nv := tri.NumVertices()
		c := &clipper{t: tri, nv: nv, xy: tri.Coords, state: make([]uint8, nv)}
		c.circumcentres()
		for v := range c.state {
			c.state[v] = clipInside
			if v%7 == 3 {
				c.state[v] = clipCrossed
			}
		}
		var b aroundBuf
		var nb, tr []int32
		kept, left := 0, 0
		for _, chunk := range []int32{1, 5, 17, 1000, int32(nv)} {
			for lo := int32(0); lo < int32(nv); lo += chunk {
				hi := min(lo+chunk, int32(nv))
				c.aroundBatch(lo, hi, &b)
				for v := lo; v < hi; v++ {
					var bounded bool
					nb, tr, bounded = c.around(v, nb, tr)
					gnb, gtr, gcc, ok := b.lists(v)
					want := c.state[v] == clipInside && bounded && len(tr) <= aroundLaneCap
					if ok != want {
						t.Fatalf("%s: vertex %d (chunk %d): batched %v, want %v (bounded %v, degree %d)", name, v, chunk, ok, want, bounded, len(tr))
					}
					if !ok {
						left++
						continue
					}
					kept++
					if !slices.Equal(gnb, nb) || !slices.Equal(gtr, tr) {
						t.Fatalf("%s: vertex %d: batched %v %v, around %v %v", name, v, gnb, gtr, nb, tr)
					}
					for k, q := range tr {
						if gcc[2*k] != c.cc[2*q] || gcc[2*k+1] != c.cc[2*q+1] {
							t.Fatalf("%s: vertex %d: corner %d is (%v, %v), want (%v, %v)", name, v, k, gcc[2*k], gcc[2*k+1], c.cc[2*q], c.cc[2*q+1])
						}
					}
				}
			}
		}
		if kept == 0 || left == 0 {
			t.Fatalf("%s: %d lists batched, %d left to around: both kinds must occur", name, kept, left)
		}
	}
}
