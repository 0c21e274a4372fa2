// Tests of the coverage-depth curve with own ranges (KCoverRanges with
// CurveSamples, SharesGrown): each share under growth t agrees with the
// k-coverage of a layout rebuilt with ranges √(r_i² + t) (pieces built
// anew), the curve starts at 0 and reaches every spot at its last sample,
// and hidden devices (inside their own k-th piece) are counted.

package coverage

import (
	"fmt"
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// kGrownShare is the share reached by k devices of a layout rebuilt with
// every r² grown by t (an independent construction of the pieces).
func kGrownShare(t *testing.T, l *Layout, sites []orb.Point, ranges []float64, k int, g float64) float64 {
	t.Helper()
	rs := make([]float64, len(ranges))
	for i, r := range ranges {
		rs[i] = math.Sqrt(r*r + g)
	}
	l2, err := NewLayoutRanges(sites, rs, l.Area)
	if err != nil {
		t.Fatal(err)
	}
	kc, err := KCoverRanges(l2, KOptions{Levels: []int{k}})
	if err != nil {
		t.Fatal(err)
	}
	return kc.Levels[0].Share
}

func TestKCoverRangesCurve(t *testing.T) {
	mixedL, mixedSites, mixedRanges := mixedLayout(t, 80, 5)
	hiddenL, hiddenSites, hiddenRanges := kHiddenScene(t)
	for _, c := range []struct {
		name   string
		l      *Layout
		sites  []orb.Point
		ranges []float64
		K      int
		grow   []float64 // growths (m²) keeping every range > 0
	}{
		{"mixed", mixedL, mixedSites, mixedRanges, 3, []float64{-50, 0, 300, 2000}},
		{"hidden", hiddenL, hiddenSites, hiddenRanges, 3, []float64{-300, 0, 500, 6000}},
	} {
		t.Run(c.name, func(t *testing.T) {
			const samples = 9
			kc, err := KCoverRanges(c.l, KOptions{MaxK: c.K, CurveSamples: samples})
			if err != nil {
				t.Fatal(err)
			}
			if len(kc.CurveRanges) != samples || kc.CurveRanges[0] != 0 {
				t.Fatalf("curve ranges %v", kc.CurveRanges)
			}
			for _, lv := range kc.Levels {
				t.Run(fmt.Sprintf("k=%d", lv.K), func(t *testing.T) {
					// Every level is reached everywhere at the last sample
					// (the largest k-cover growth is the top level's).
					if len(lv.Curve) != samples || lv.Curve[0] != 0 || !(math.Abs(lv.Curve[samples-1]-1) <= 1e-9) {
						t.Errorf("curve %v", lv.Curve)
					}
					for i := 1; i < samples; i++ {
						if !(lv.Curve[i] >= lv.Curve[i-1]-1e-12) {
							t.Errorf("curve falls at %d: %v", i, lv.Curve)
						}
					}
					got := kc.SharesGrown(c.l, lv.K, append([]float64{0}, c.grow...))
					if !(math.Abs(got[0]-lv.Share) <= 1e-12) {
						t.Errorf("at t = 0: %.15g, level share %.15g", got[0], lv.Share)
					}
					for i, g := range c.grow {
						// Independent: the pieces of the grown layout.
						if want := kGrownShare(t, c.l, c.sites, c.ranges, lv.K, g); !(math.Abs(got[i+1]-want) <= 1e-9) {
							t.Errorf("t = %v: %.12g, grown layout %.12g", g, got[i+1], want)
						}
					}
				})
			}
		})
	}
}
