// Tests of AssignRanges against the rule applied by brute force: every
// device's distance, the nearest among those whose own range reaches the
// point (smallest input index among equally near ones), else the nearest.

package coverage

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// bruteServe applies the rule of plan_assign_ranges.go to q directly.
func bruteServe(sites []orb.Point, ranges []float64, q orb.Point) (int, float64, bool) {
	best, bd, reached := -1, math.Inf(1), false
	for i, s := range sites {
		d := math.Hypot(q[0]-s[0], q[1]-s[1])
		in := d <= ranges[i]
		if in && !reached || in == reached && (d < bd || d == bd && i < best) {
			best, bd, reached = i, d, in
		}
	}
	return best, bd, reached
}

func TestAssignRanges(t *testing.T) {
	rng := rand.New(rand.NewPCG(41, 42))
	mix := []float64{4, 6, 12, 15}
	scenes := map[string][]orb.Point{
		"uniform": sitegen.Uniform(200, 51),
		"grid":    sitegen.Grid(100), // exact ties between devices
	}
	dup := sitegen.Uniform(60, 52)
	scenes["duplicates"] = append(dup, dup[0], dup[7])
	for name, sites := range scenes {
		t.Run(name, func(t *testing.T) {
			ranges := make([]float64, len(sites))
			for i := range ranges {
				ranges[i] = mix[rng.IntN(len(mix))]
			}
			n := 4000
			pts := make([]orb.Point, n)
			for i := range pts {
				pts[i] = orb.Point{rng.Float64()*200 - 50, rng.Float64()*200 - 50} // some far outside
				if i%5 == 0 {
					pts[i] = orb.Point{float64(rng.IntN(10)*10 + 5), float64(rng.IntN(10) * 10)}
				}
			}
			pts = append(pts, orb.Point{1e5, -3e4}) // far away: the ring search skips empty rings
			a, err := AssignRanges(sites, ranges, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			served := 0
			for i, q := range pts {
				dev, d, in := bruteServe(sites, ranges, q)
				if a.Device[i] != dev || a.Distance[i] != d || a.Within[i] != in {
					t.Fatalf("point %d %v: device %d at %g within %v, want %d at %g within %v",
						i, q, a.Device[i], a.Distance[i], a.Within[i], dev, d, in)
				}
				if in {
					served++
				}
			}
			if a.Served != served || a.Served+a.Unserved != len(pts) || !slices.Equal(a.Ranges, ranges) || a.Range != 0 {
				t.Errorf("served %d (want %d), unserved %d, ranges copied %v", a.Served, served, a.Unserved, slices.Equal(a.Ranges, ranges))
			}
		})
	}
	t.Run("nearest reaching, not the power-cell owner", func(t *testing.T) {
		// A gateway at 0 reaching 100 m and a sensor at 50 reaching 10 m:
		// the point at 45 has the smaller power towards the gateway
		// (45² − 100² < 5² − 10²) but the sensor reaches it and is nearer.
		a, err := AssignRanges([]orb.Point{{0, 0}, {50, 0}}, []float64{100, 10}, []orb.Point{{45, 0}, {70, 0}}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(a.Device, []int{1, 0}) || !slices.Equal(a.Within, []bool{true, true}) {
			t.Errorf("devices %v within %v, want [1 0] [true true]", a.Device, a.Within)
		}
	})
	t.Run("bad input", func(t *testing.T) {
		for _, c := range []struct {
			name   string
			ranges []float64
		}{{"zero range", []float64{0}}, {"NaN range", []float64{math.NaN()}}, {"missing range", nil}} {
			if _, err := AssignRanges([]orb.Point{{0, 0}}, c.ranges, []orb.Point{{1, 1}}, nil); err == nil {
				t.Errorf("%s: no error", c.name)
			}
		}
	})
}
