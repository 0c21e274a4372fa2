// Tests of KCoverRanges (kcover_power.go) that need no outside tool: equal
// ranges against KCover, brute force over every device at sample points,
// hidden devices among the k of smallest power, duplicates, fewer devices
// than k, and order 2 against the single-failure analysis.

package coverage

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// kthPower returns the k-th smallest power of (x, y) over the devices
// (every input, duplicates at one spot counted once with the largest range),
// by brute force.
func kthPower(sites []orb.Point, ranges []float64, x, y float64, k int) float64 {
	best := map[orb.Point]float64{}
	for i, s := range sites {
		if r, ok := best[s]; !ok || ranges[i] > r {
			best[s] = ranges[i]
		}
	}
	p := make([]float64, 0, len(best))
	for s, r := range best {
		p = append(p, (x-s[0])*(x-s[0])+(y-s[1])*(y-s[1])-r*r)
	}
	slices.Sort(p)
	if k > len(p) {
		return math.Inf(1)
	}
	return p[k-1]
}

// checkKPowerSample checks a level against brute force at sample points of
// the area: no sampled k-th power above CoverPower, CoverPower attained at
// CoverPoint, and the k-covered share within 5 standard errors of the
// sampled one.
func checkKPowerSample(t *testing.T, l *Layout, sites []orb.Point, ranges []float64, lv *KLevel, n int, seed uint64) {
	t.Helper()
	b := l.Area.Bound()
	rng := rand.New(rand.NewPCG(seed, 5))
	scale := 0.0
	for _, r := range ranges {
		scale = math.Max(scale, r*r)
	}
	scale += math.Abs(lv.CoverPower)
	in, cov := 0, 0
	for range n {
		x := b.Min[0] + rng.Float64()*(b.Max[0]-b.Min[0])
		y := b.Min[1] + rng.Float64()*(b.Max[1]-b.Min[1])
		if !l.Area.Contains(x, y) {
			continue
		}
		in++
		p := kthPower(sites, ranges, x, y, lv.K)
		if p <= 0 {
			cov++
		}
		if p > lv.CoverPower+1e-9*scale {
			t.Fatalf("k = %d: (%g, %g) has k-th power %g above the k-cover power %g", lv.K, x, y, p, lv.CoverPower)
		}
	}
	if got := kthPower(sites, ranges, lv.CoverPoint[0], lv.CoverPoint[1], lv.K); math.Abs(got-lv.CoverPower) > 1e-9*scale {
		t.Errorf("k = %d: k-th power %g at the cover point %v, reported %g", lv.K, got, lv.CoverPoint, lv.CoverPower)
	}
	p := float64(cov) / float64(in)
	if se := math.Sqrt(lv.Share * (1 - lv.Share) / float64(in)); math.Abs(p-lv.Share) > 5*se+1e-12 {
		t.Errorf("k = %d: sampled share %.5f, exact %.5f (5σ = %.5f)", lv.K, p, lv.Share, 5*se)
	}
}

// TestKCoverRangesBruteForce: mixed ranges on a square with a hole, k = 1 … 4.
func TestKCoverRangesBruteForce(t *testing.T) {
	l, sites, ranges := mixedLayout(t, 150, 21)
	kc, err := KCoverRanges(l, KOptions{MaxK: 4, Gaps: true})
	if err != nil {
		t.Fatal(err)
	}
	for i := range kc.Levels {
		lv := &kc.Levels[i]
		t.Run(fmt.Sprintf("k=%d", lv.K), func(t *testing.T) {
			checkKPowerSample(t, l, sites, ranges, lv, 20000, uint64(lv.K))
			if math.Abs(lv.PieceArea-l.AreaM2) > 1e-9*l.AreaM2 {
				t.Errorf("pieces tile %v of %v m²", lv.PieceArea, l.AreaM2)
			}
			gapArea := 0.0
			for _, g := range lv.Gaps {
				gapArea += g.Area
				if g.ClosingPower > lv.CoverPower*(1+1e-12)+1e-9 {
					t.Errorf("gap %d closes at %g above the k-cover power %g", g.ID, g.ClosingPower, lv.CoverPower)
				}
			}
			if want := l.AreaM2 - lv.CoveredArea; math.Abs(gapArea-want) > 1e-6*l.AreaM2 {
				t.Errorf("gaps hold %v m², the area short of k devices is %v m²", gapArea, want)
			}
			for j, r := range lv.CoverRanges {
				if want := math.Sqrt(math.Max(0, ranges[j]*ranges[j]+lv.CoverPower)); math.Abs(r-want) > 1e-9*want {
					t.Fatalf("device %d needs %v m, want %v m", j, r, want)
				}
			}
		})
	}
	if _, err := kc.Bands(l); err != nil {
		t.Errorf("bands: %v", err)
	}
}

// TestKCoverRangesSkewed: many short ranges and two very long ones (the
// long ones' class searched with its own reach), k = 1 … 3 against brute
// force.
func TestKCoverRangesSkewed(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 3))
	var sites []orb.Point
	var ranges []float64
	for range 120 {
		sites = append(sites, orb.Point{rng.Float64() * 300, rng.Float64() * 300})
		ranges = append(ranges, 12+6*rng.Float64())
	}
	sites = append(sites, orb.Point{60, 240}, orb.Point{250, 80})
	ranges = append(ranges, 400, 260)
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {300, 0}, {300, 300}, {0, 300}}}})
	if err != nil {
		t.Fatal(err)
	}
	l, err := NewLayoutRanges(sites, ranges, reg)
	if err != nil {
		t.Fatal(err)
	}
	kc, err := KCoverRanges(l, KOptions{MaxK: 3, Gaps: true})
	if err != nil {
		t.Fatal(err)
	}
	for i := range kc.Levels {
		lv := &kc.Levels[i]
		t.Run(fmt.Sprintf("k=%d", lv.K), func(t *testing.T) {
			checkKPowerSample(t, l, sites, ranges, lv, 20000, 90+uint64(lv.K))
			if len(lv.Gaps) > 0 && lv.CoverPower > 0 && math.Abs(lv.Gaps[0].ClosingPower-lv.CoverPower) > 1e-9*lv.CoverPower {
				t.Errorf("first gap closes at %v, k-cover power %v", lv.Gaps[0].ClosingPower, lv.CoverPower)
			}
		})
	}
}

// TestKCoverRangesEqualIsCommon: equal ranges give KCover's figures to the
// last digit, the powers restated.
func TestKCoverRangesEqualIsCommon(t *testing.T) {
	l0, sites, _ := mixedLayout(t, 120, 4)
	ranges := make([]float64, len(sites))
	for i := range ranges {
		ranges[i] = 90
	}
	l, err := NewLayoutRanges(sites, ranges, l0.Area)
	if err != nil {
		t.Fatal(err)
	}
	got, err := KCoverRanges(l, KOptions{MaxK: 3, Gaps: true})
	if err != nil {
		t.Fatal(err)
	}
	lc, err := NewLayout(sites, l0.Area)
	if err != nil {
		t.Fatal(err)
	}
	want, err := KCover(lc, 90, KOptions{MaxK: 3, Gaps: true})
	if err != nil {
		t.Fatal(err)
	}
	for i := range want.Levels {
		g, w := got.Levels[i], want.Levels[i]
		if g.CoveredArea != w.CoveredArea || g.CoverRange != w.CoverRange || g.CoverPoint != w.CoverPoint || len(g.Gaps) != len(w.Gaps) {
			t.Errorf("k = %d: %v m², %v m at %v, %d gaps; common range: %v m², %v m at %v, %d gaps",
				w.K, g.CoveredArea, g.CoverRange, g.CoverPoint, len(g.Gaps), w.CoveredArea, w.CoverRange, w.CoverPoint, len(w.Gaps))
		}
		if g.CoverPower != w.CoverRange*w.CoverRange-90*90 || g.CoverRanges[0] != w.CoverRange {
			t.Errorf("k = %d: power %v, ranges %v; want %v, %v", w.K, g.CoverPower, g.CoverRanges[0], w.CoverRange*w.CoverRange-90*90, w.CoverRange)
		}
		for j := range w.Gaps {
			if g.Gaps[j].Area != w.Gaps[j].Area || g.Gaps[j].ClosingRange != w.Gaps[j].ClosingRange {
				t.Errorf("k = %d gap %d: %v m² closing %v m; common %v m², %v m", w.K, j+1, g.Gaps[j].Area, g.Gaps[j].ClosingRange, w.Gaps[j].Area, w.Gaps[j].ClosingRange)
			}
		}
	}
}

// kHiddenScene is four 150 m devices around two small ones that are hidden
// (their disks lie inside the union of the others), one of them at a spot
// no regular-triangulation edge reaches.
func kHiddenScene(t *testing.T) (*Layout, []orb.Point, []float64) {
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {400, 0}, {400, 400}, {0, 400}}}})
	if err != nil {
		t.Fatal(err)
	}
	sites := []orb.Point{{100, 200}, {205, 210}, {300, 200}, {200, 100}, {200, 300}, {190, 185}}
	ranges := []float64{150, 30, 150, 150, 150, 20}
	l, err := NewLayoutRanges(sites, ranges, reg)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(l.Hidden, []int{1, 5}) {
		t.Fatalf("hidden %v, want [1 5]", l.Hidden)
	}
	return l, sites, ranges
}

// TestKCoverRangesHidden: hidden devices count among the k of smallest
// power (brute force), and leaving them out changes the answer.
func TestKCoverRangesHidden(t *testing.T) {
	l, sites, ranges := kHiddenScene(t)
	kc, err := KCoverRanges(l, KOptions{MaxK: 5, Gaps: true})
	if err != nil {
		t.Fatal(err)
	}
	if kc.Devices != 6 {
		t.Errorf("%d devices, want 6", kc.Devices)
	}
	for i := range kc.Levels {
		lv := &kc.Levels[i]
		t.Run(fmt.Sprintf("k=%d", lv.K), func(t *testing.T) {
			checkKPowerSample(t, l, sites, ranges, lv, 20000, 40+uint64(lv.K))
		})
	}
	l2, err := NewLayoutRanges(sites[:5:5], ranges[:5:5], l.Area)
	if err != nil {
		t.Fatal(err)
	}
	kc2, err := KCoverRanges(l2, KOptions{MaxK: 5})
	if err != nil {
		t.Fatal(err)
	}
	// Reached by 5: the four large disks and one of the small ones.
	if a, b := kc.Level(5).CoveredArea, kc2.Level(5).CoveredArea; !(a > b) {
		t.Errorf("k = 5: %v m² with both hidden devices, %v m² with one: the other must add", a, b)
	}
}

// TestKCoverRangesDuplicatesAndTooFew: devices at one spot count once (the
// largest range), with a warning; k above the distinct devices is refused.
func TestKCoverRangesDuplicatesAndTooFew(t *testing.T) {
	l0, sites, ranges := mixedLayout(t, 40, 9)
	sites = append(sites, sites[3], sites[7])
	ranges = append(ranges, ranges[3]+25, ranges[7]/2)
	l, err := NewLayoutRanges(sites, ranges, l0.Area)
	if err != nil {
		t.Fatal(err)
	}
	kc, err := KCoverRanges(l, KOptions{MaxK: 3})
	if err != nil {
		t.Fatal(err)
	}
	if kc.Devices != 40 || len(kc.Warnings) != 1 {
		t.Errorf("%d devices, warnings %q; want 40 and one", kc.Devices, kc.Warnings)
	}
	for i := range kc.Levels {
		checkKPowerSample(t, l, sites, ranges, &kc.Levels[i], 10000, 70+uint64(i))
	}
	if _, err := KCoverRanges(l, KOptions{MaxK: 41}); !errors.Is(err, ErrKTooLarge) {
		t.Errorf("k = 41 of 40 devices: %v, want ErrKTooLarge", err)
	}
	lh, sh, rh := kHiddenScene(t)
	kc, err = KCoverRanges(lh, KOptions{Levels: []int{6}})
	if err != nil {
		t.Fatal(err)
	}
	checkKPowerSample(t, lh, sh, rh, &kc.Levels[0], 5000, 80)
}

// TestKCoverRangesFailures: the 2-cover power is the power at which the
// plan survives any single failure (FailuresRanges, a separate
// computation).
func TestKCoverRangesFailures(t *testing.T) {
	l, _, _ := mixedLayout(t, 200, 5)
	kc, err := KCoverRanges(l, KOptions{Levels: []int{2}})
	if err != nil {
		t.Fatal(err)
	}
	rep, err := FailuresRanges(l)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := kc.Levels[0].CoverPower, rep.SurvivePower; math.Abs(got-want) > 1e-9*math.Abs(want) {
		t.Errorf("2-cover power %v, survive power %v", got, want)
	}
}
