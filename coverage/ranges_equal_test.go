// Equal ranges: every figure of the per-device-range analysis equals the
// common-range one on the existing reference scenes (testdata/gaps_ref.json,
// the GEOS scenes of gaps_test.go), and the per-vertex-radius gap path with
// all radii equal gives the common-range gaps bit for bit.

package coverage

import (
	"fmt"
	"math"
	"path/filepath"
	"reflect"
	"testing"
)

// withoutClosing returns gs with Closing cleared (the common-range Gaps
// has none).
func withoutClosing(gs []Gap) []Gap {
	out := make([]Gap, len(gs))
	for i, g := range gs {
		g.Closing = nil
		out[i] = g
	}
	return out
}

func TestRangesEqualIsCommon(t *testing.T) {
	doc := gapsLoadRef(t, filepath.Join("testdata", "gaps_ref.json"))
	for _, sc := range doc.Scenes {
		l0, sites := gapsSceneLayout(t, sc)
		for _, c := range sc.Cases {
			r := c.R
			t.Run(fmt.Sprintf("%s/r=%g", sc.Name, r), func(t *testing.T) {
				ranges := make([]float64, len(sites))
				for i := range ranges {
					ranges[i] = r
				}
				l, err := NewLayoutRanges(sites, ranges, l0.Area)
				if err != nil {
					t.Fatal(err)
				}
				if !reflect.DeepEqual(l.Cells, l0.Cells) || !reflect.DeepEqual(l.Tri, l0.Tri) {
					t.Fatal("equal ranges: triangulation or cells differ from NewLayout's")
				}
				if got, want := l.UncoveredAreaGrown(0), l0.UncoveredArea(r); got != want {
					t.Errorf("uncovered %v, common range %v", got, want)
				}
				want := l0.Gaps(r, DefaultChordTolerance)
				got := l.GapsRanges(0, DefaultChordTolerance)
				if !reflect.DeepEqual(withoutClosing(got), want) {
					t.Errorf("GapsRanges differs from Gaps")
				}
				// The per-vertex-radius path with every radius r.
				radii := make([]float64, l.numVertices())
				for v := range radii {
					radii[v] = r
				}
				viaRadii, _ := l0.gapsAt(gapParams{r: r, radii: radii}, DefaultChordTolerance, false)
				if !reflect.DeepEqual(viaRadii, want) {
					t.Errorf("per-vertex radii path differs from Gaps")
				}
				fc, fr := l0.FullCover(), l.FullCoverRanges()
				if !reflect.DeepEqual(fr.Worst, fc.Worst) || !reflect.DeepEqual(fr.WorstSites, fc.WorstSites) {
					t.Errorf("full-cover points differ")
				}
				for i, n := range fr.Needed {
					if n != fc.Range {
						t.Fatalf("device %d needs %v, full-cover range %v", i, n, fc.Range)
					}
				}
				a0, err := Analyze(sites, l0.Area, r, Options{})
				if err != nil {
					t.Fatal(err)
				}
				a, err := AnalyzeRanges(sites, ranges, l0.Area, Options{})
				if err != nil {
					t.Fatal(err)
				}
				if a.UncoveredArea != a0.UncoveredArea || a.CoveredFraction != a0.CoveredFraction ||
					!reflect.DeepEqual(withoutClosing(a.Gaps), a0.Gaps) || len(a.Hidden) != 0 {
					t.Errorf("AnalyzeRanges figures differ from Analyze")
				}
				if a.Pieces != a0.Pieces || a.EnclosedHoles != a0.EnclosedHoles {
					t.Errorf("Betti numbers %d, %d; common range %d, %d", a.Pieces, a.EnclosedHoles, a0.Pieces, a0.EnclosedHoles)
				}
				for i, p := range a.Percentiles {
					if q := a0.Percentiles[i].Range; p.Power != q*q-r*r {
						t.Errorf("percentile %v: power %v, common range %v", p.Fraction, p.Power, q)
					}
				}
				// The weighted filtration on equal weights: merges at
				// ρ² − r² for the common deaths ρ, holes likewise.
				pw := a.Persistence
				var d0 []float64
				for _, m := range pw.Merges {
					d0 = append(d0, m.Death)
				}
				if len(d0) != len(a0.Persistence.Merges) {
					t.Fatalf("%d merges, common range %d", len(d0), len(a0.Persistence.Merges))
				}
				for i, m := range a0.Persistence.Merges {
					if w := m.Death*m.Death - r*r; math.Abs(d0[i]-w) > 1e-9*(r*r+m.Death*m.Death) {
						t.Errorf("merge %d at power %v, common range %v gives %v", i, d0[i], m.Death, w)
					}
				}
				if len(pw.Holes) != len(a0.Persistence.Holes) {
					t.Errorf("%d holes, common range %d", len(pw.Holes), len(a0.Persistence.Holes))
				}
				if a.Links.Components != 1 != (r < a0.Persistence.LinkRange) {
					t.Errorf("links: %d groups at range %v, link range %v", a.Links.Components, r, a0.Persistence.LinkRange)
				}
			})
		}
	}
}

// TestRangesCommonMethodsKeepTheirRange: on a layout with ranges the
// common-range methods still answer for the range they are given.
func TestRangesCommonMethodsKeepTheirRange(t *testing.T) {
	l, sites, _ := mixedLayout(t, 200, 8)
	equal := make([]float64, len(sites))
	for i := range equal {
		equal[i] = 80
	}
	le, err := NewLayoutRanges(sites, equal, l.Area)
	if err != nil {
		t.Fatal(err)
	}
	l0, err := NewLayout(sites, l.Area)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range []float64{30, 80, 200} {
		if a, b := le.UncoveredArea(r), l0.UncoveredArea(r); a != b {
			t.Errorf("r=%g: UncoveredArea %v on the layout with ranges, %v without", r, a, b)
		}
		if a, b := len(le.Gaps(r, 0)), len(l0.Gaps(r, 0)); a != b {
			t.Errorf("r=%g: %d gaps on the layout with ranges, %d without", r, a, b)
		}
	}
}
