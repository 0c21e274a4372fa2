// Tests of Analyze: input errors, consistency of the parts, extreme ranges.
//
// References: the definitions (pieces of the union of disks = components
// of the graph joining sites closer than 2r, by brute force; covered
// fraction 0 at r = 0 and 1 from the full-cover range on), and closed forms
// for four sites in a square (disk area and circular segments, CRC tables).

package coverage

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func TestAnalyzeErrors(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 10, 10)})
	sites := []orb.Point{{5, 5}}
	cases := []struct {
		name string
		r    float64
		opt  Options
		want string
	}{
		{"NaN range", math.NaN(), Options{}, "not a finite"},
		{"infinite range", math.Inf(1), Options{}, "not a finite"},
		{"negative range", -1, Options{}, "negative"},
		{"bad percentile", 5, Options{Percentiles: []float64{0.5, 1.5}}, "percentile 1"},
		{"NaN percentile", 5, Options{Percentiles: []float64{math.NaN()}}, "percentile 0"},
		{"NaN chord tolerance", 5, Options{ChordTolerance: math.NaN()}, "chord tolerance"},
	}
	for _, c := range cases {
		_, err := Analyze(sites, reg, c.r, c.opt)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
	}
	if _, err := Analyze(nil, reg, 5, Options{}); err == nil {
		t.Error("no sites: no error")
	}
	if _, err := Analyze(sites, nil, 5, Options{}); err == nil {
		t.Error("nil area: no error")
	}
}

// cvPiecesBrute counts the components of the union of disks of radius r:
// sites closer than 2r are joined (brute force, from the definition).
func cvPiecesBrute(sites []orb.Point, r float64) int {
	par := make([]int, len(sites))
	for i := range par {
		par[i] = i
	}
	var find func(int) int
	find = func(x int) int {
		if par[x] != x {
			par[x] = find(par[x])
		}
		return par[x]
	}
	for i := range sites {
		for j := i + 1; j < len(sites); j++ {
			if math.Hypot(sites[i][0]-sites[j][0], sites[i][1]-sites[j][1]) <= 2*r {
				par[find(i)] = find(j)
			}
		}
	}
	n := 0
	for i := range par {
		if find(i) == i {
			n++
		}
	}
	return n
}

func TestAnalyzeConsistency(t *testing.T) {
	for _, sc := range cvTestScenes(t) {
		l := sc.l
		full := l.FullCover().Range
		for _, r := range []float64{0, full / 4, full / 2, 0.9 * full, full, 2 * full} {
			a, err := Analyze(l.Sites, l.Area, r, Options{Percentiles: []float64{0.99, 0.5}})
			if err != nil {
				t.Fatal(err)
			}
			if a.FullCover.Range != full || a.UncoveredArea != l.UncoveredArea(r) || a.CoveredFraction != l.CoveredFraction(r) {
				t.Errorf("%s r=%v: analysis %v/%v/%v, direct %v/%v/%v", sc.name, r,
					a.FullCover.Range, a.UncoveredArea, a.CoveredFraction, full, l.UncoveredArea(r), l.CoveredFraction(r))
			}
			if len(a.Percentiles) != 2 || a.Percentiles[0].Fraction != 0.99 || a.Percentiles[1].Fraction != 0.5 ||
				a.Percentiles[0].Range < a.Percentiles[1].Range {
				t.Errorf("%s: percentiles %v", sc.name, a.Percentiles)
			}
			sum := 0.0
			for _, g := range a.Gaps {
				sum += g.Area
			}
			if math.Abs(sum-a.UncoveredArea) > 1e-9*math.Max(a.UncoveredArea, 1) {
				t.Errorf("%s r=%v: gaps %v, uncovered %v", sc.name, r, sum, a.UncoveredArea)
			}
			switch {
			case r == 0:
				if a.CoveredFraction != 0 || len(a.Gaps) == 0 {
					t.Errorf("%s r=0: covered %v with %d gaps", sc.name, a.CoveredFraction, len(a.Gaps))
				}
			case r >= full:
				if a.CoveredFraction != 1 || len(a.Gaps) != 0 {
					t.Errorf("%s r=%v >= full cover: covered %v with %d gaps", sc.name, r, a.CoveredFraction, len(a.Gaps))
				}
			}
			// Reference: components of the union of disks by brute force
			// over site pairs (duplicates merged by the triangulation count
			// once, so compare on distinct sites).
			if r > 0 {
				var distinct []orb.Point
				seen := map[orb.Point]bool{}
				for _, p := range l.Sites {
					if !seen[p] {
						seen[p] = true
						distinct = append(distinct, p)
					}
				}
				if want := cvPiecesBrute(distinct, r); a.Pieces != want {
					t.Errorf("%s r=%v: %d pieces, brute force %d", sc.name, r, a.Pieces, want)
				}
			}
			phases := []string{"triangulate", "clip", "fullcover", "curve", "gaps", "persistence"}
			if len(a.Timings) != len(phases) {
				t.Fatalf("timings %v", a.Timings)
			}
			for i, p := range phases {
				if a.Timings[i].Phase != p || a.Timings[i].Seconds < 0 {
					t.Errorf("timing %d = %v, want phase %s", i, a.Timings[i], p)
				}
			}
		}
	}
}

func TestAnalyzeNoOutlines(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 100)})
	sites := []orb.Point{{25, 25}, {75, 25}, {25, 75}, {75, 75}}
	a, err := Analyze(sites, reg, 30, Options{ChordTolerance: -1})
	if err != nil {
		t.Fatal(err)
	}
	// Reference: per quarter 2500 − π·900 + 4·segment(30, 25) (CRC tables).
	want := 4 * (2500 - math.Pi*900 + 4*cvSegment(30, 25))
	if len(a.Gaps) != 9 || math.Abs(a.UncoveredArea-want) > 1e-9*want {
		t.Errorf("%d gaps, uncovered %v; want 9, %v", len(a.Gaps), a.UncoveredArea, want)
	}
	for _, g := range a.Gaps {
		if g.Outline != nil {
			t.Errorf("gap %d has an outline with a negative chord tolerance", g.ID)
		}
	}
	if a.Pieces != 1 || a.EnclosedHoles != 1 {
		t.Errorf("union at 30 m: %d pieces, %d holes; want 1, 1", a.Pieces, a.EnclosedHoles)
	}
}
