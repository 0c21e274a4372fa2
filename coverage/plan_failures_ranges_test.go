// Tests of FailuresRanges (plan_failures_ranges.go).
//
// References: a from-scratch rebuild of the layout without each device
// (NewLayoutRanges, UncoveredAreaGrown, FullCoverRanges: the definitions
// evaluated by independent code, the whole power diagram recomputed), on
// scenes with hidden devices that appear when the device covering them
// fails; equal ranges against Failures; GEOS in plan_ref_test.go.

package coverage

import (
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// planMixedScenes are small layouts with mixed ranges: random positions
// and ranges, devices hidden inside larger disks (some at the very spot of
// a larger one), a non-convex area with a zone, and two devices.
func planMixedScenes(t *testing.T) map[string]*Layout {
	t.Helper()
	reg := planTestRegion(t, 100)
	lreg := planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 30}, {30, 30}, {30, 100}, {0, 100}}, nil)
	rng := rand.New(rand.NewPCG(12, 34))
	mix := []float64{6, 9, 15, 22}
	type sc struct {
		reg    *planar.Region
		sites  []orb.Point
		ranges []float64
	}
	scenes := map[string]sc{}
	uni := sitegen.Uniform(80, 9)
	ur := make([]float64, len(uni))
	for i := range ur {
		ur[i] = mix[rng.IntN(len(mix))]
	}
	scenes["uniform"] = sc{reg, uni, ur}
	// Small devices near big ones: hidden until the big one fails.
	big := []orb.Point{{20, 20}, {60, 25}, {85, 70}, {30, 75}, {55, 55}}
	var hs []orb.Point
	var hr []float64
	for _, b := range big {
		hs = append(hs, b, orb.Point{b[0] + 3, b[1] - 2}, orb.Point{b[0] - 4, b[1] + 1}, b)
		hr = append(hr, 30, 5, 8, 12)
	}
	scenes["hidden"] = sc{reg, hs, hr}
	scenes["two"] = sc{reg, []orb.Point{{30, 30}, {70, 80}}, []float64{20, 50}}
	scenes["one-and-hidden"] = sc{reg, []orb.Point{{50, 50}, {52, 50}}, []float64{60, 5}}
	scenes["L-notch"] = sc{lreg, []orb.Point{{60, 60}, {10, 10}, {90, 5}, {5, 90}, {70, 45}, {12, 12}}, []float64{30, 25, 40, 20, 10, 4}}
	out := map[string]*Layout{}
	for name, s := range scenes {
		l, err := NewLayoutRanges(s.sites, s.ranges, s.reg)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		out[name] = l
	}
	return out
}

func TestPlanFailuresRangesMatchRebuild(t *testing.T) {
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) {
			rep, err := FailuresRanges(l)
			if err != nil {
				t.Fatal(err)
			}
			if name == "hidden" && len(l.Hidden) == 0 {
				t.Fatal("the scene has no hidden device")
			}
			unc := l.UncoveredAreaGrown(0)
			if math.Abs(rep.Uncovered-unc) > 1e-9*l.AreaM2 {
				t.Errorf("uncovered %v, layout says %v", rep.Uncovered, unc)
			}
			survive := math.Inf(-1)
			for _, d := range rep.Devices {
				sites := slices.Delete(slices.Clone(l.Sites), d.Site, d.Site+1)
				ranges := slices.Delete(slices.Clone(l.InputRanges), d.Site, d.Site+1)
				if len(sites) == 0 {
					continue
				}
				l2, err := NewLayoutRanges(sites, ranges, l.Area)
				if err != nil {
					t.Fatal(err)
				}
				want := l2.UncoveredAreaGrown(0)
				if math.Abs(d.Uncovered-want) > 1e-9*l.AreaM2 {
					t.Errorf("device %d (hidden %v): uncovered without it %v, rebuild %v", d.Site, d.Hidden, d.Uncovered, want)
				}
				if d.Hidden && d.AddedUncovered != 0 {
					t.Errorf("hidden device %d adds %v", d.Site, d.AddedUncovered)
				}
				fc := l2.FullCoverRanges().Power
				if math.Abs(d.FullCoverPower-fc) > 1e-9*(l.AreaM2+math.Abs(fc)) {
					t.Errorf("device %d: full-cover power without it %v, rebuild %v", d.Site, d.FullCoverPower, fc)
				}
				if d.Backup >= 0 {
					b := l.Sites[d.Backup]
					if got := math.Hypot(d.Deepest[0]-b[0], d.Deepest[1]-b[1]); math.Abs(got-d.ClosingRange) > 1e-9*(1+got) {
						t.Errorf("device %d: closing range %v, distance deepest-backup %v", d.Site, d.ClosingRange, got)
					}
				}
				survive = math.Max(survive, d.ClosingPower)
			}
			if survive != rep.SurvivePower {
				t.Errorf("survive power %v, largest closing %v", rep.SurvivePower, survive)
			}
			for i, r := range rep.SurviveRanges {
				want := l.InputRanges[i]
				if rep.SurvivePower > 0 {
					want = math.Sqrt(want*want + rep.SurvivePower)
				}
				if r != want {
					t.Errorf("survive range of %d: %v, want %v", i, r, want)
				}
			}
		})
	}
}

// TestPlanFailuresRangesEqual: with all ranges equal FailuresRanges is
// Failures at that range, figure for figure, on every failure scene.
func TestPlanFailuresRangesEqual(t *testing.T) {
	for name, l0 := range planFailureScenes(t) {
		t.Run(name, func(t *testing.T) {
			r := 9.0
			ranges := make([]float64, len(l0.Sites))
			for i := range ranges {
				ranges[i] = r
			}
			l, err := NewLayoutRanges(l0.Sites, ranges, l0.Area)
			if err != nil {
				t.Fatal(err)
			}
			want, err := Failures(l0, r)
			if err != nil {
				t.Fatal(err)
			}
			got, err := FailuresRanges(l)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(got.Devices[0].Deepest, want.Devices[0].Deepest) || got.SurviveRange != want.SurviveRange ||
				got.Uncovered != want.Uncovered || got.FullCover != want.FullCover || got.SurviveSite != want.SurviveSite {
				t.Errorf("report differs: %+v vs %+v", got, want)
			}
			for k, d := range got.Devices {
				w := want.Devices[k]
				d.ClosingPower, d.FullCoverPower = 0, 0
				if !reflect.DeepEqual(d, w) {
					t.Errorf("device rank %d: %+v, want %+v", k, d, w)
				}
			}
			for _, s := range got.SurviveRanges {
				if s != math.Max(r, want.SurviveRange) {
					t.Fatalf("survive ranges %v, survive range %v", got.SurviveRanges, want.SurviveRange)
				}
			}
		})
	}
}
