// Cross-checks of KCoverRanges against outside references, from
// testdata/kcover_ranges_ref.json written by testdata/ref_kcover_ranges.py:
//   - NumPy brute force: the k-th smallest power |x − p_i|² − r_i² over
//     every device at a fine sample of the area (its largest value), and
//     the share reached by at least k devices by Monte Carlo;
//   - GEOS (Debian python3-shapely): the area reached by at least k devices
//     as the union over k-subsets of the intersection of their disks of
//     their own radii, drawn inscribed and circumscribed (1024-gons), which
//     bracket the exact area.
//
// Scenes with mixed ranges and a duplicate, hidden devices among the k of
// smallest power, nested disks, equal ranges (also checked against KCover),
// collinear devices and three devices (k up to 3).
// TestKCoverRangesReference checks the committed data;
// TestKCoverRangesLive re-runs the script on a fresh seed under
// SITECOVER_LIVE=1, where a missing tool is a failure.
//
// Tolerances. Every point of the area is within 2h of a sample (spacing h,
// boundary points every h). The k-th smallest power is Lipschitz with
// constant at most 2·(√(t + r_max²) + 2h) within 2h of a point of power t
// (|∇π_i| = 2|x − p_i|, and the devices involved are within √(t + r_i²)),
// so the exact figure lies in [sampled, sampled + 2h·L]. The Monte Carlo
// share is within 4σ of the exact share; the GEOS areas bracket the exact
// one up to GEOS's rounding (relative 1e-12 allowed).

package coverage

import (
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"testing"
)

// kRangesRefDoc is testdata/kcover_ranges_ref.json.
type kRangesRefDoc struct {
	Generator string            `json:"generator"`
	Seed      int64             `json:"seed"`
	Scenes    []kRangesRefScene `json:"scenes"`
}

// kRangesRefScene is one scene: the sites with their ranges and the
// reference values per k (kRefLevel, powers in place of distances).
type kRangesRefScene struct {
	refScene
	Ranges []float64   `json:"ranges"`
	Levels []kRefLevel `json:"levels"`
}

func TestKCoverRangesReference(t *testing.T) {
	var d kRangesRefDoc
	kLoadJSON(t, filepath.Join("testdata", "kcover_ranges_ref.json"), &d)
	kRangesRefCheck(t, &d)
}

func TestKCoverRangesLive(t *testing.T) {
	var d kRangesRefDoc
	kLoadJSON(t, liveRefRun(t, "ref_kcover_ranges.py", "NumPy, GEOS via python3-shapely; python3-scipy for the shared helpers of ref_kcover.py"), &d)
	kRangesRefCheck(t, &d)
}

func kRangesRefCheck(t *testing.T, d *kRangesRefDoc) {
	if len(d.Scenes) == 0 {
		t.Fatal("no scenes")
	}
	for _, sc := range d.Scenes {
		t.Run(sc.Name, func(t *testing.T) {
			sites := planPoints(sc.Sites)
			l, err := NewLayoutRanges(sites, sc.Ranges, planPolyRegion(t, sc.Exterior, sc.Holes))
			if err != nil {
				t.Fatal(err)
			}
			if sc.Name == "hidden-among-k" && len(l.Hidden) != 2 {
				t.Fatalf("hidden %v, want two hidden devices", l.Hidden)
			}
			kc, err := KCoverRanges(l, KOptions{MaxK: len(sc.Levels), Gaps: true})
			if err != nil {
				t.Fatal(err)
			}
			rmax := slices.Max(sc.Ranges)
			for _, ref := range sc.Levels {
				lv := kc.Level(ref.K)
				t.Run(fmt.Sprintf("k%d", ref.K), func(t *testing.T) {
					// Reference: NumPy brute-force k-th smallest power over
					// the sample: the figure is at least every sampled value
					// and attained within the sample's resolution.
					h := sc.Spacing
					lip := 2 * (math.Sqrt(math.Max(0, lv.CoverPower+rmax*rmax)) + 2*h)
					if lv.CoverPower < ref.SampleMax-1e-9*rmax*rmax || lv.CoverPower > ref.SampleMax+2*h*lip {
						t.Errorf("k-cover power %.9f, NumPy sample max %.9f (h %v, slack %.3g)", lv.CoverPower, ref.SampleMax, h, 2*h*lip)
					}
					// Reference: NumPy Monte Carlo share, 4σ.
					sigma := math.Sqrt(lv.Share * (1 - lv.Share) / float64(ref.MCN))
					if math.Abs(ref.MCShare-lv.Share) > 4*sigma+1e-12 {
						t.Errorf("share %.6f, NumPy Monte Carlo %.6f (4σ %.2g)", lv.Share, ref.MCShare, 4*sigma)
					}
					// Reference: GEOS union over k-subsets of the
					// intersections of disks of their own radii,
					// inscribed ≤ exact ≤ circumscribed.
					tol := 1e-12 * l.AreaM2
					if lv.CoveredArea < ref.GEOSInscribed-tol || lv.CoveredArea > ref.GEOSCircum+tol {
						t.Errorf("k-covered area %.9f outside GEOS bracket [%.9f, %.9f]", lv.CoveredArea, ref.GEOSInscribed, ref.GEOSCircum)
					}
					kRangesGapsCheck(t, l, lv)
				})
			}
			if _, err := kc.Bands(l); err != nil {
				t.Errorf("bands: %v", err)
			}
			if sc.Name == "equal-ranges" {
				kRangesEqualCheck(t, l, kc, sc.Ranges[0])
			}
		})
	}
}

// kRangesGapsCheck: the k-gaps hold the area short of k devices, none
// closes above the k-cover power, and the first closes at it.
func kRangesGapsCheck(t *testing.T, l *Layout, lv *KLevel) {
	t.Helper()
	sum := 0.0
	for _, g := range lv.Gaps {
		sum += g.Area
	}
	if want := l.AreaM2 - lv.CoveredArea; math.Abs(sum-want) > 1e-9*l.AreaM2 {
		t.Errorf("gaps hold %.9f m², the area short of %d devices is %.9f m²", sum, lv.K, want)
	}
	if len(lv.Gaps) > 0 && lv.CoverPower > 0 {
		if g := lv.Gaps[0]; math.Abs(g.ClosingPower-lv.CoverPower) > 1e-9*math.Abs(lv.CoverPower) {
			t.Errorf("first gap closes at %v, the k-cover power is %v", g.ClosingPower, lv.CoverPower)
		}
	}
}

// kRangesEqualCheck: with equal ranges r the figures are KCover's at r.
func kRangesEqualCheck(t *testing.T, l *Layout, kc *KCoverage, r float64) {
	t.Helper()
	lc, err := NewLayout(l.Sites, l.Area)
	if err != nil {
		t.Fatal(err)
	}
	want, err := KCover(lc, r, KOptions{MaxK: len(kc.Levels), Gaps: true})
	if err != nil {
		t.Fatal(err)
	}
	for i, w := range want.Levels {
		g := kc.Levels[i]
		if g.CoveredArea != w.CoveredArea || g.CoverRange != w.CoverRange || len(g.Gaps) != len(w.Gaps) {
			t.Errorf("k = %d: %v m², %v m, %d gaps; KCover: %v m², %v m, %d gaps", w.K, g.CoveredArea, g.CoverRange, len(g.Gaps), w.CoveredArea, w.CoverRange, len(w.Gaps))
		}
	}
}
