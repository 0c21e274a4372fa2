// Tests of FailuresRanges (plan_failures_ranges.go).
//
// References: a from-scratch rebuild of the layout without each device
// (NewLayoutRanges, UncoveredAreaGrown, FullCoverRanges: the definitions
// evaluated by independent code, the whole power diagram recomputed), on
// scenes with hidden devices that appear when the device covering them
// fails; equal ranges against Failures; GEOS in plan_ref_test.go.

package coverage

import (
	"fmt"
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
				checkTakeOver(t, l, l2, d)
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

// checkTakeOver checks d.TakeOver against the rebuild l2 of l without
// d.Site: every listed device is hidden in l and a vertex of l2, and every
// device hidden in l that serves area in l2 is listed.
func checkTakeOver(t *testing.T, l, l2 *Layout, d DeviceFailure) {
	t.Helper()
	in2 := func(u int) int { // input index in l2
		if u > d.Site {
			return u - 1
		}
		return u
	}
	for _, u := range d.TakeOver {
		if _, hidden := slices.BinarySearch(l.Hidden, u); !hidden || l2.Tri.Vertex[in2(u)] < 0 {
			t.Errorf("device %d: takes over %d, hidden before %v, vertex after %d", d.Site, u, hidden, l2.Tri.Vertex[in2(u)])
		}
	}
	for _, u := range l.Hidden {
		if u == d.Site {
			continue
		}
		v := l2.Tri.Vertex[in2(u)]
		if v >= 0 && l2.Cells.Area[v] > 1e-9*l.AreaM2 && !slices.Contains(d.TakeOver, u) {
			t.Errorf("device %d: hidden %d serves %v m² without it but is not listed (%v)", d.Site, u, l2.Cells.Area[v], d.TakeOver)
		}
	}
}

// hiddenScene is a random layout with many hidden devices: n devices of
// ranges 35–75 m on a square of side side.
func hiddenScene(t testing.TB, n int, side float64, seed uint64) *Layout {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 6))
	sites := make([]orb.Point, n)
	ranges := make([]float64, n)
	for i := range sites {
		sites[i] = orb.Point{rng.Float64() * side, rng.Float64() * side}
		ranges[i] = 35 + 40*rng.Float64()
	}
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {side, 0}, {side, side}, {0, side}, {0, 0}}}})
	if err != nil {
		t.Fatal(err)
	}
	l, err := NewLayoutRanges(sites, ranges, reg)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

// CheckDeviceEntries is checkDeviceEntries for the tests of package
// coverage_test (the demo, loaded through report/siteinput).
var CheckDeviceEntries = checkDeviceEntries

// checkDeviceEntries checks that RangesFailures.Device at growth 0 gives
// FailuresRanges' entry of every device, field for field (the whole-layout
// figures Uncovered and FullCoverPower NaN), and returns the number of
// failures some hidden device takes over.
func checkDeviceEntries(t *testing.T, l *Layout) (takeOvers int) {
	t.Helper()
	rep, err := FailuresRanges(l)
	if err != nil {
		t.Fatal(err)
	}
	rf, err := NewRangesFailures(l)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range rep.Devices {
		got, err := rf.Device(want.Site, 0)
		if err != nil {
			t.Fatal(err)
		}
		if !math.IsNaN(got.Uncovered) || !math.IsNaN(got.FullCoverPower) {
			t.Errorf("device %d: whole-layout figures %v, %v; want NaN", want.Site, got.Uncovered, got.FullCoverPower)
		}
		got.Uncovered, got.FullCoverPower = want.Uncovered, want.FullCoverPower
		if l.inputRangesEqual() {
			got.FullCover = want.FullCover // a whole-layout figure of Failures
		}
		w := want
		if math.IsNaN(got.FullCover) && math.IsNaN(w.FullCover) {
			got.FullCover, w.FullCover = 0, 0 // NaN: reflect.DeepEqual says unequal
		}
		if !reflect.DeepEqual(got, w) {
			t.Errorf("device %d:\n got %+v\nwant %+v", want.Site, got, want)
		}
		if len(want.TakeOver) > 0 {
			takeOvers++
		}
	}
	return takeOvers
}

// TestRangesFailuresDevice: one device's failure computed alone equals its
// entry in FailuresRanges, on the mixed scenes, on random scenes with
// hidden devices that take over, with equal ranges (Failures' method,
// devices sharing a spot) and at a growth t against FailuresRanges on the
// layout of the grown ranges.
func TestRangesFailuresDevice(t *testing.T) {
	for name, l := range planMixedScenes(t) {
		t.Run(name, func(t *testing.T) { checkDeviceEntries(t, l) })
	}
	t.Run("mixed-300", func(t *testing.T) {
		l, _, _ := mixedLayout(t, 300, 3)
		checkDeviceEntries(t, l)
	})
	for _, seed := range []uint64{5, 6, 7} {
		t.Run(fmt.Sprintf("hidden-seed-%d", seed), func(t *testing.T) {
			if k := checkDeviceEntries(t, hiddenScene(t, 300, 600, seed)); k == 0 {
				t.Error("no failure taken over by a hidden device: the case is not exercised")
			}
		})
	}
	t.Run("equal-ranges", func(t *testing.T) {
		for name, l0 := range planFailureScenes(t) {
			sites := append(slices.Clone(l0.Sites), l0.Sites[len(l0.Sites)-1], l0.Sites[0])
			ranges := make([]float64, len(sites))
			for i := range ranges {
				ranges[i] = 9
			}
			l, err := NewLayoutRanges(sites, ranges, l0.Area)
			if err != nil {
				t.Fatal(err)
			}
			t.Run(name, func(t *testing.T) { checkDeviceEntries(t, l) })
		}
	})
	t.Run("growth", func(t *testing.T) {
		const g = 900.0 // m²
		l := hiddenScene(t, 300, 600, 5)
		grown := make([]float64, len(l.InputRanges))
		for i, b := range l.InputRanges {
			grown[i] = math.Sqrt(b*b + g)
		}
		lg, err := NewLayoutRanges(l.Sites, grown, l.Area)
		if err != nil {
			t.Fatal(err)
		}
		rep, err := FailuresRanges(lg)
		if err != nil {
			t.Fatal(err)
		}
		rf, err := NewRangesFailures(l)
		if err != nil {
			t.Fatal(err)
		}
		// tolerance: the weights (√(b² + g))² differ from b² + g in the
		// last bits, which moves cell vertices by ulps (1e-12 relative)
		const tol = 1e-9
		for _, want := range rep.Devices {
			got, err := rf.Device(want.Site, g)
			if err != nil {
				t.Fatal(err)
			}
			if got.Hidden != want.Hidden || math.Abs(got.AddedUncovered-want.AddedUncovered) > tol*l.AreaM2 ||
				math.Abs(got.ClosingPower-want.ClosingPower) > tol*(grown[0]*grown[0]+math.Abs(want.ClosingPower)) ||
				!slices.Equal(got.TakeOver, want.TakeOver) {
				t.Errorf("device %d at growth %v:\n got %+v\nwant %+v", want.Site, g, got, want)
			}
		}
	})
	t.Run("bad", func(t *testing.T) {
		l := hiddenScene(t, 20, 200, 1)
		rf, err := NewRangesFailures(l)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			i int
			g float64
		}{{-1, 0}, {20, 0}, {0, math.NaN()}, {0, math.Inf(1)}} {
			if _, err := rf.Device(c.i, c.g); err == nil {
				t.Errorf("Device(%d, %v): no error", c.i, c.g)
			}
		}
		if _, err := NewRangesFailures(planFailureScenes(t)["uniform"]); err == nil {
			t.Error("a common-range layout is accepted")
		}
	})
}

// BenchmarkRangesFailuresDevice: one device's failure (RangesFailures.Device)
// on the mixed 40/60/120/150 m layout of 10 000 devices of the ranges
// benchmarks, cycling over the devices; compare BenchmarkFailuresRanges,
// every device at once.
func BenchmarkRangesFailuresDevice(b *testing.B) {
	l, _, _ := mixedLayout(b, 10_000, 3)
	rf, err := NewRangesFailures(l)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("mixed-10000", func(b *testing.B) {
		i := 0
		for b.Loop() {
			if _, err := rf.Device(i, 0); err != nil {
				b.Fatal(err)
			}
			i = (i + 7919) % len(l.Sites)
		}
	})
}
