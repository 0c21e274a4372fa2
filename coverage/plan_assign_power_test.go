// Tests of AssignPowerCells (plan_assign_power.go) against the rule
// applied by brute force (every device's power; the owner's own disk), and
// with equal ranges against Assign.

package coverage

import (
	"math"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/paulmach/orb"
)

func TestAssignPowerCells(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) {
			pts := make([]orb.Point, 3000)
			for i := range pts {
				pts[i] = orb.Point{rng.Float64()*160 - 30, rng.Float64()*160 - 30}
			}
			a, err := AssignPowerCells(l, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			hidden := map[int]bool{}
			for _, i := range l.Hidden {
				hidden[i] = true
			}
			for k, q := range pts {
				best, bp := -1, math.Inf(1)
				for i, s := range l.Sites {
					if hidden[i] {
						continue
					}
					r := l.InputRanges[i]
					if p := (q[0]-s[0])*(q[0]-s[0]) + (q[1]-s[1])*(q[1]-s[1]) - r*r; p < bp {
						best, bp = i, p
					}
				}
				got := a.Device[k]
				s := l.Sites[got]
				gp := (q[0]-s[0])*(q[0]-s[0]) + (q[1]-s[1])*(q[1]-s[1]) - l.InputRanges[got]*l.InputRanges[got]
				// A tie within rounding may go either way (plan_assign_power.go).
				if got != best && gp-bp > 1e-9*(1+math.Abs(bp)) {
					t.Fatalf("point %v: device %d (power %v), brute force %d (%v)", q, got, gp, best, bp)
				}
				if hidden[got] {
					t.Fatalf("point %v served by hidden device %d", q, got)
				}
				covered := false
				for i, s := range l.Sites {
					covered = covered || math.Hypot(q[0]-s[0], q[1]-s[1]) <= l.InputRanges[i]
				}
				if a.Within[k] != covered && math.Abs(a.Distance[k]-l.InputRanges[got]) > 1e-9 {
					t.Fatalf("point %v: within %v, covered %v", q, a.Within[k], covered)
				}
			}
			for _, i := range l.Hidden {
				if a.Load[i].Count != 0 {
					t.Errorf("hidden device %d serves %d", i, a.Load[i].Count)
				}
			}
		})
	}
}

// TestAssignPowerCellsEqual: with equal ranges the assignment is Assign's.
func TestAssignPowerCellsEqual(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for name, l0 := range planFailureScenes(t) {
		t.Run(name, func(t *testing.T) {
			ranges := make([]float64, len(l0.Sites))
			for i := range ranges {
				ranges[i] = 11
			}
			l, err := NewLayoutRanges(l0.Sites, ranges, l0.Area)
			if err != nil {
				t.Fatal(err)
			}
			pts := make([]orb.Point, 500)
			for i := range pts {
				pts[i] = orb.Point{rng.Float64() * 100, rng.Float64() * 100}
			}
			want, err := Assign(l0, pts, nil, 11)
			if err != nil {
				t.Fatal(err)
			}
			got, err := AssignPowerCells(l, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			got.Ranges = nil
			if !reflect.DeepEqual(got, want) {
				t.Errorf("assignment differs from Assign")
			}
		})
	}
}
