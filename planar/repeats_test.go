package planar

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// TestRepeats compares Repeats with a Go map keyed by points (the
// reference: Go's map equality on float64 keys, −0 equal to +0, NaN equal
// to nothing) on lists with many repeats, signed zeros and NaNs.
func TestRepeats(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	cases := []struct {
		name string
		pts  []orb.Point
	}{
		{"empty", nil},
		{"one", []orb.Point{{1, 2}}},
		{"signed zeros", []orb.Point{{0, 0}, {math.Copysign(0, -1), 0}, {0, math.Copysign(0, -1)}, {1, 0}}},
		{"nan", []orb.Point{{math.NaN(), 1}, {math.NaN(), 1}, {2, 2}, {2, 2}}},
	}
	grid := make([]orb.Point, 20000)
	for i := range grid {
		grid[i] = orb.Point{float64(r.IntN(100)), float64(r.IntN(150)) * 0.5}
	}
	cases = append(cases, struct {
		name string
		pts  []orb.Point
	}{"grid with repeats", grid})
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var got, want [][2]int
			Repeats(c.pts, func(i, j int) { got = append(got, [2]int{i, j}) })
			first := map[orb.Point]int{}
			for i, p := range c.pts {
				if j, ok := first[p]; ok {
					want = append(want, [2]int{i, j})
					continue
				}
				first[p] = i
			}
			if !slices.Equal(got, want) {
				t.Errorf("%d repeats %v..., want %d %v...", len(got), got[:min(5, len(got))], len(want), want[:min(5, len(want))])
			}
		})
	}
}
