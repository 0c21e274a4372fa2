package planar

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// Expected hulls are elementary geometry, worked by hand.
func TestConvexHull(t *testing.T) {
	cases := []struct {
		name string
		pts  []orb.Point
		want orb.Ring // nil: no area
	}{
		{"square with interior, edge and repeated points",
			[]orb.Point{{0, 0}, {2, 0}, {1, 1}, {2, 2}, {0, 2}, {1, 0}, {0, 0}, {1, 2}},
			orb.Ring{{0, 0}, {2, 0}, {2, 2}, {0, 2}}},
		{"triangle, clockwise input", []orb.Point{{0, 0}, {0, 3}, {4, 0}}, orb.Ring{{0, 0}, {4, 0}, {0, 3}}},
		{"collinear points on every edge",
			[]orb.Point{{0, 0}, {1, 0}, {2, 0}, {3, 0}, {3, 1}, {3, 2}, {3, 3}, {2, 3}, {1, 3}, {0, 3}, {0, 2}, {0, 1}},
			orb.Ring{{0, 0}, {3, 0}, {3, 3}, {0, 3}}},
		{"every point repeated", []orb.Point{{1, 1}, {0, 0}, {1, 0}, {1, 1}, {0, 0}, {1, 0}}, orb.Ring{{0, 0}, {1, 0}, {1, 1}}},
		{"vertical ties sorted by y", []orb.Point{{0, 2}, {0, 0}, {0, 1}, {1, 1}}, orb.Ring{{0, 0}, {1, 1}, {0, 2}}},
		{"all on one line", []orb.Point{{0, 0}, {1, 1}, {2, 2}, {3, 3}}, nil},
		{"one vertical line", []orb.Point{{5, 0}, {5, 2}, {5, 1}}, nil},
		{"two distinct points", []orb.Point{{0, 0}, {1, 0}, {0, 0}}, nil},
		{"one point", []orb.Point{{7, 7}}, nil},
		{"none", nil, nil},
		// (0.5, 0.5 + 1 ulp) lies one unit in the last place left of the
		// diagonal, so it is a hull vertex; (1e-300, 1e-300) lies on the
		// diagonal and inside the hull.
		{"vertex one ulp off the diagonal",
			[]orb.Point{{0, 0}, {1e-300, 1e-300}, {1, 1}, {0.5, 0.5000000000000001}, {1, 0}},
			orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0.5, 0.5000000000000001}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := slices.Clone(c.pts)
			got := ConvexHull(c.pts)
			if !slices.Equal(got, c.want) {
				t.Errorf("ConvexHull = %v, want %v", got, c.want)
			}
			if !slices.Equal(in, c.pts) {
				t.Errorf("input modified: %v", c.pts)
			}
			if got != nil && RingArea(FlatRing(got)) <= 0 {
				t.Errorf("hull %v is not counter-clockwise", got)
			}
		})
	}
}

// TestConvexHullFilter: the octagon filter of ConvexHull (Akl and
// Toussaint 1978) changes nothing: the hull equals the monotone chain over
// every point, on random, clustered, gridded (collinear runs and repeats),
// circular and near-degenerate sets.
func TestConvexHullFilter(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	sets := map[string][]orb.Point{}
	var uni, grid, circ, thin, dup []orb.Point
	for i := 0; i < 5000; i++ {
		uni = append(uni, orb.Point{rng.Float64() * 1e4, rng.Float64() * 1e4})
		a := rng.Float64() * 2 * math.Pi
		circ = append(circ, orb.Point{1e3 * math.Cos(a), 1e3 * math.Sin(a)})
		thin = append(thin, orb.Point{rng.Float64() * 1e6, 1e-9 * rng.Float64()})
		dup = append(dup, orb.Point{float64(rng.IntN(3)), float64(rng.IntN(3))})
	}
	for x := 0; x < 40; x++ {
		for y := 0; y < 40; y++ {
			grid = append(grid, orb.Point{float64(x), float64(y)}, orb.Point{float64(x), float64(y)})
		}
	}
	sets["uniform"], sets["grid"], sets["circle"], sets["thin"], sets["repeats"] = uni, grid, circ, thin, dup
	sets["diamond"] = nil
	for i := 0; i <= 100; i++ { // points on the edges of a diamond: the octagon is it
		f := float64(i) / 100
		sets["diamond"] = append(sets["diamond"], orb.Point{f, 1 - f}, orb.Point{-f, 1 - f}, orb.Point{f, f - 1}, orb.Point{-f, f - 1})
	}
	for name, pts := range sets {
		t.Run(name, func(t *testing.T) {
			got, want := ConvexHull(pts), hullChain(slices.Clone(pts))
			if !slices.Equal(got, want) {
				t.Fatalf("filtered hull %d vertices, unfiltered %d:\n%v\n%v", len(got), len(want), got, want)
			}
			if kept := hullCandidates(pts); name == "uniform" && len(kept) > len(pts)/10 {
				t.Errorf("the filter kept %d of %d uniform points", len(kept), len(pts))
			}
		})
	}
}
