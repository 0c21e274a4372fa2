// Tests of SuggestAdditions and FewestAdditions (plan_suggest.go).
//
// References: Kershner (Amer. J. Math. 61, 1939) — a square lattice of
// spacing s has covering radius s/√2, a triangular one s/√3, so a lattice
// with one device missing is restored exactly by putting it back; the
// 1-centre of a square is its centre, at half the diagonal (elementary
// geometry); every n disks of radius r cover at most n·πr² (so covering an
// area A needs at least A/(πr²) of them); and the figures of each step
// against a from-scratch rebuild (NewLayout, FullCover, UncoveredArea).

package coverage

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

func planRectRegion(t testing.TB, x0, y0, x1, y1 float64, holes ...orb.Ring) *planar.Region {
	t.Helper()
	poly := orb.Polygon{{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}}
	poly = append(poly, holes...)
	reg, err := planar.NewRegion(orb.MultiPolygon{poly})
	if err != nil {
		t.Fatal(err)
	}
	return reg
}

func planWithout(pts []orb.Point, drop ...orb.Point) []orb.Point {
	var out []orb.Point
	for _, p := range pts {
		if !slices.Contains(drop, p) {
			out = append(out, p)
		}
	}
	return out
}

func TestPlanSuggestRestoresLattice(t *testing.T) {
	const s = 10.0
	tri := sitegen.TriangularLattice(11, 12, s)
	cases := []struct {
		name    string
		sites   []orb.Point
		reg     *planar.Region
		missing []orb.Point
		cover   float64 // covering radius of the intact lattice (Kershner 1939)
	}{
		{"square-1", sitegen.Grid(100), planRectRegion(t, -5, -5, 95, 95), []orb.Point{{40, 50}}, s / math.Sqrt2},
		{"square-2", sitegen.Grid(144), planRectRegion(t, -5, -5, 115, 115), []orb.Point{{20, 30}, {80, 90}}, s / math.Sqrt2},
		{"triangular-1", tri, planRectRegion(t, 2.5, 0, 107.5, 10*s*math.Sqrt(3)/2), []orb.Point{tri[5*12+5]}, s / math.Sqrt(3)},
		{"triangular-2", tri, planRectRegion(t, 2.5, 0, 107.5, 10*s*math.Sqrt(3)/2), []orb.Point{tri[3*12+3], tri[7*12+8]}, s / math.Sqrt(3)},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			l, err := NewLayout(planWithout(c.sites, c.missing...), c.reg)
			if err != nil {
				t.Fatal(err)
			}
			intact, err := NewLayout(c.sites, c.reg)
			if err != nil {
				t.Fatal(err)
			}
			for _, refine := range []int{0, -1} {
				sg, err := SuggestAdditions(l, len(c.missing), SuggestOptions{Range: c.cover, Refine: refine})
				if err != nil {
					t.Fatal(err)
				}
				// Reference: the missing lattice points, to 1e-6 of the spacing.
				for _, m := range c.missing {
					ok := false
					for _, p := range sg.Added {
						ok = ok || math.Hypot(p[0]-m[0], p[1]-m[1]) <= 1e-6*s
					}
					if !ok {
						t.Errorf("%s refine=%d: %v not restored; added %v", c.name, refine, m, sg.Added)
					}
				}
				if want := intact.FullCover().Range; math.Abs(sg.FullCoverAfter-want) > 1e-9*s {
					t.Errorf("%s: full cover after %.12g, intact lattice %.12g", c.name, sg.FullCoverAfter, want)
				}
				if c.name[:6] == "square" && math.Abs(sg.FullCoverAfter-c.cover) > 1e-9*s {
					t.Errorf("%s: full cover after %.12g, Kershner s/√2 = %.12g", c.name, sg.FullCoverAfter, c.cover)
				}
				if sg.UncoveredAfter > 1e-9*l.AreaM2 || sg.CoveredAfter < 1-1e-12 {
					t.Errorf("%s: uncovered after %.3g, covered %.15g", c.name, sg.UncoveredAfter, sg.CoveredAfter)
				}
			}
		})
	}
}

func TestPlanSuggestOneCentre(t *testing.T) {
	// A device far away serves nothing useful; one addition must go to the
	// 1-centre of the square, its centre, at range 50√2 (elementary
	// geometry); farthest-point insertion alone stops at a corner
	// (range 100√2).
	reg := planRectRegion(t, 0, 0, 100, 100)
	l, err := NewLayout([]orb.Point{{-900, -700}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	sg, err := SuggestAdditions(l, 1, SuggestOptions{Range: 60})
	if err != nil {
		t.Fatal(err)
	}
	if p := sg.Added[0]; math.Hypot(p[0]-50, p[1]-50) > 1e-9 || math.Abs(sg.FullCoverAfter-50*math.Sqrt2) > 1e-9 {
		t.Errorf("1-centre: %v at range %.12g, want (50, 50) at %.12g", p, sg.FullCoverAfter, 50*math.Sqrt2)
	}
	plain, err := SuggestAdditions(l, 1, SuggestOptions{Range: 60, Refine: -1})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(plain.FullCoverAfter-100*math.Sqrt2) > 1e-9 {
		t.Errorf("plain farthest-point insertion: range %.12g, want %.12g", plain.FullCoverAfter, 100*math.Sqrt2)
	}
}

func TestPlanSuggestStepsMatchRebuild(t *testing.T) {
	// Figures per step against from-scratch layouts; additions always in
	// the area and outside the exclusion zone; the full-cover range never
	// rises with an addition.
	reg := planTestRegion(t, 100)
	hole := orb.Ring{{30, 50}, {30, 70}, {50, 70}, {50, 50}, {30, 50}}
	for name, sites := range map[string][]orb.Point{
		"uniform":   sitegen.Uniform(30, 41),
		"clustered": sitegen.Clustered(80, 42),
		"corner":    {{2, 2}, {5, 3}},
	} {
		t.Run(name, func(t *testing.T) {
			l, err := NewLayout(sites, reg)
			if err != nil {
				t.Fatal(err)
			}
			const r = 12
			sg, err := SuggestAdditions(l, 12, SuggestOptions{Range: r})
			if err != nil {
				t.Fatal(err)
			}
			if len(sg.Added) != 12 || len(sg.Steps) != 12 || sg.Existing != len(sites) || sg.TotalDevices != len(sites)+12 {
				t.Fatalf("%s: %d added, %d steps", name, len(sg.Added), len(sg.Steps))
			}
			if math.Abs(sg.FullCoverBefore-l.FullCover().Range) > 1e-12*sg.FullCoverBefore ||
				math.Abs(sg.UncoveredBefore-l.UncoveredArea(r)) > 1e-9*l.AreaM2 {
				t.Errorf("%s: before figures %v %v vs layout %v %v", name, sg.FullCoverBefore, sg.UncoveredBefore, l.FullCover().Range, l.UncoveredArea(r))
			}
			for j, st := range sg.Steps {
				p := st.Added
				if !reg.Contains(p[0], p[1]) || planar.PointInRing(planar.FlatRing(hole), p[0], p[1]) > 0 && !reg.Contains(p[0], p[1]) {
					t.Errorf("%s step %d: %v outside the area or in the exclusion zone", name, j, p)
				}
				lr := planRebuild(t, sites, sg.Added[:j+1], reg)
				if fc := lr.FullCover().Range; math.Abs(st.FullCoverAfter-fc) > 1e-9*fc {
					t.Errorf("%s step %d: full cover %.12g, rebuilt %.12g", name, j, st.FullCoverAfter, fc)
				}
				if u := lr.UncoveredArea(r); math.Abs(st.UncoveredAfter-u) > 1e-9*l.AreaM2 {
					t.Errorf("%s step %d: uncovered %.12g, rebuilt %.12g", name, j, st.UncoveredAfter, u)
				}
				if cf := lr.CoveredFraction(r); math.Abs(st.CoveredAfter-cf) > 1e-9 {
					t.Errorf("%s step %d: covered %.12g, rebuilt %.12g", name, j, st.CoveredAfter, cf)
				}
				if st.FullCoverAfter > st.FullCoverBefore*(1+1e-12) || st.UncoveredAfter > st.UncoveredBefore+1e-9*l.AreaM2 {
					t.Errorf("%s step %d: figures rose: %+v", name, j, st)
				}
				if j > 0 && st.FullCoverBefore != sg.Steps[j-1].FullCoverAfter {
					t.Errorf("%s step %d: before %v ≠ previous after %v", name, j, st.FullCoverBefore, sg.Steps[j-1].FullCoverAfter)
				}
			}
			// Twelve more devices can only help compared with the layout.
			if sg.FullCoverAfter >= sg.FullCoverBefore {
				t.Errorf("%s: range %v → %v", name, sg.FullCoverBefore, sg.FullCoverAfter)
			}
		})
	}
}

func TestPlanSuggestExclusionZone(t *testing.T) {
	// The best spot for one device in a square with a central exclusion
	// zone is inside the zone; the suggestion must stay on the area (the
	// zone's edge counts as area: closed set).
	hole := orb.Ring{{40, 40}, {40, 60}, {60, 60}, {60, 40}, {40, 40}}
	reg := planRectRegion(t, 0, 0, 100, 100, hole)
	l, err := NewLayout([]orb.Point{{-900, -700}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	sg, err := SuggestAdditions(l, 3, SuggestOptions{Range: 40})
	if err != nil {
		t.Fatal(err)
	}
	ix := reg.Index()
	for _, p := range sg.Added {
		if !ix.Contains(p[0], p[1]) || (p[0] > 40 && p[0] < 60 && p[1] > 40 && p[1] < 60) {
			t.Errorf("addition %v in the exclusion zone or outside", p)
		}
	}
	if sg.FullCoverAfter >= sg.FullCoverBefore {
		t.Errorf("range %v → %v", sg.FullCoverBefore, sg.FullCoverAfter)
	}
}

func TestPlanFewestLattice(t *testing.T) {
	// A square lattice missing one device needs exactly one addition, at
	// the missing spot, to reach its covering radius s/√2 (Kershner 1939).
	const s = 10.0
	reg := planRectRegion(t, -5, -5, 95, 95)
	l, err := NewLayout(planWithout(sitegen.Grid(100), orb.Point{40, 50}), reg)
	if err != nil {
		t.Fatal(err)
	}
	r := s / math.Sqrt2 * (1 + 1e-9)
	sg, err := FewestAdditions(l, r, SuggestOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(sg.Added) != 1 || math.Hypot(sg.Added[0][0]-40, sg.Added[0][1]-50) > 1e-6*s || !sg.Reached {
		t.Errorf("added %v, reached %v", sg.Added, sg.Reached)
	}
	// Reference: HexEstimate = area / ((3√3/2)·r²) (Kershner 1939).
	if want := 100 * 100 / (1.5 * math.Sqrt(3) * r * r); math.Abs(sg.HexEstimate-want) > 1e-9*want ||
		sg.HexDevices != int(math.Ceil(want)) || math.Abs(sg.HexRatio-100/want) > 1e-12 {
		t.Errorf("hex estimate %v (%d devices, ratio %v), want %v", sg.HexEstimate, sg.HexDevices, sg.HexRatio, want)
	}
}

func TestPlanFewestFromOneDevice(t *testing.T) {
	reg := planTestRegion(t, 200)
	l, err := NewLayout([]orb.Point{{100, 100}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	const r = 25
	sg, err := FewestAdditions(l, r, SuggestOptions{})
	if err != nil {
		t.Fatal(err)
	}
	lr := planRebuild(t, l.Sites, sg.Added, reg)
	if fc := lr.FullCover().Range; fc > r*(1+1e-12) || !sg.Reached || sg.UncoveredAfter > 1e-9*l.AreaM2 {
		t.Errorf("rebuilt full cover %.12g > %g (reached %v, uncovered %v)", fc, float64(r), sg.Reached, sg.UncoveredAfter)
	}
	// Reference: n disks cover at most n·πr²; the hexagonal estimate is a
	// lower bound in the limit of large areas (Kershner 1939).
	if lb := int(math.Ceil(l.AreaM2 / (math.Pi * r * r))); sg.TotalDevices < lb {
		t.Errorf("%d devices cover %.0f m² at r=%v: fewer than the bound %d", sg.TotalDevices, l.AreaM2, float64(r), lb)
	}
	if sg.HexRatio < 1 || sg.HexRatio > 3 {
		t.Errorf("%d devices, hexagonal estimate %.2f: ratio %.3f", sg.TotalDevices, sg.HexEstimate, sg.HexRatio)
	}
	t.Logf("%d additions, total %d, hexagonal estimate %.2f (ratio %.3f)", len(sg.Added), sg.TotalDevices, sg.HexEstimate, sg.HexRatio)
	// Every addition is needed: dropping any one reopens a gap.
	for k := range sg.Added {
		rest := slices.Delete(slices.Clone(sg.Added), k, k+1)
		if fc := planRebuild(t, l.Sites, rest, reg).FullCover().Range; fc <= r*(1+1e-12) {
			t.Errorf("addition %d at %v is redundant", k, sg.Added[k])
		}
	}
	// The cap: partial result and ErrAdditionCap.
	capped, err := FewestAdditions(l, r, SuggestOptions{MaxAdditions: 3})
	if !errors.Is(err, ErrAdditionCap) || capped == nil || len(capped.Added) != 3 || capped.Reached {
		t.Errorf("cap 3: %v, %v", capped, err)
	}
}

func TestPlanSuggestErrors(t *testing.T) {
	reg := planTestRegion(t, 100)
	l, err := NewLayout(sitegen.Uniform(10, 1), reg)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		err  error
		want string
	}{
		{"negative k", func() error { _, e := SuggestAdditions(l, -1, SuggestOptions{}); return e }(), "need k ≥ 0"},
		{"NaN range", func() error { _, e := SuggestAdditions(l, 1, SuggestOptions{Range: math.NaN()}); return e }(), "range NaN"},
		{"nil layout", func() error { _, e := SuggestAdditions(nil, 1, SuggestOptions{}); return e }(), "no layout"},
		{"zero range", func() error { _, e := FewestAdditions(l, 0, SuggestOptions{}); return e }(), "must be a finite number > 0"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if c.err == nil || !strings.Contains(c.err.Error(), c.want) {
				t.Errorf("%s: error %v, want %q", c.name, c.err, c.want)
			}
		})
	}
	sg, err := SuggestAdditions(l, 0, SuggestOptions{Range: 5})
	if err != nil || len(sg.Added) != 0 || sg.FullCoverAfter != sg.FullCoverBefore {
		t.Errorf("k=0: %+v %v", sg, err)
	}
}
