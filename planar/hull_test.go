package planar

import (
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
