package report

import (
	"testing"

	"github.com/paulmach/orb"
)

func TestDropFolds(t *testing.T) {
	sq := orb.Ring{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}
	cases := []struct {
		name    string
		in      orb.Ring
		want    orb.Ring
		changed bool
	}{
		{"square unchanged", sq, sq, false},
		// a spike along the bottom edge, out to x = 7 and back to x = 3,
		// its return 1e-12 above the way out
		{"spike along an edge", orb.Ring{{0, 0}, {7, 0}, {3, 1e-12}, {10, 0}, {10, 10}, {0, 10}, {0, 0}},
			orb.Ring{{0, 0}, {3, 1e-12}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}, true},
		{"spike at the ring's start", orb.Ring{{5, 0}, {5, -4}, {5, 1e-13}, {10, 0}, {10, 10}, {0, 10}, {0, 0}, {5, 0}},
			orb.Ring{{5, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}, {5, 0}}, true},
		// a narrow wedge 1 µm wide is an outline, not a fold
		{"wedge kept", orb.Ring{{0, 0}, {10, 0}, {3, 1e-6}, {10, 10}, {0, 10}, {0, 0}},
			orb.Ring{{0, 0}, {10, 0}, {3, 1e-6}, {10, 10}, {0, 10}, {0, 0}}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, ch := ringDropFolds(c.in, foldWidth)
			if ch != c.changed || !got.Equal(c.want) {
				t.Errorf("ringDropFolds = %v, %v; want %v, %v", got, ch, c.want, c.changed)
			}
		})
	}
	t.Run("ring reduced to nothing drops its polygon", func(t *testing.T) {
		mp := orb.MultiPolygon{{{{0, 0}, {5, 0}, {1, 1e-12}, {0, 0}}}, {sq}}
		got, ch := dropFolds(mp, foldWidth)
		if !ch || len(got) != 1 || !got[0][0].Equal(sq) {
			t.Errorf("dropFolds = %v, %v; want the square alone", got, ch)
		}
	})
}

func TestSnapOutline(t *testing.T) {
	cases := []struct {
		name string
		in   orb.Ring
		want orb.Ring
	}{
		{"on the grid", orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0, 0}}, orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0, 0}}},
		// two vertices an ulp apart (a pinch point the conversion split)
		// become one; the repeat it makes is dropped
		{"twins merged", orb.Ring{{0, 0}, {1, 0}, {1, 1e-17}, {1, 1}, {0, 0}}, orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0, 0}}},
		{"rounded to the grid", orb.Ring{{0.3e-8, 0}, {1, 0.7e-8}, {0.3e-8, 1}, {0.3e-8, 0}}, orb.Ring{{0, 0}, {1, 1e-8}, {0, 1}, {0, 0}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := snapOutline(orb.MultiPolygon{{c.in}}, 1e-8)[0][0]
			if !got.Equal(c.want) {
				t.Errorf("snapOutline = %v, want %v", got, c.want)
			}
		})
	}
}
