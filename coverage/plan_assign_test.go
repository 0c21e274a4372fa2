// Tests of Assign and RepresentativePoint (plan_assign.go).
//
// References: brute-force nearest device (every device's distance, the
// smallest input index among equally near ones), SciPy's k-d tree
// (plan_ref_test.go), and elementary geometry for representative points
// (centroid of a rectangle; a point inside a U shape whose centroid lies in
// the notch).

package coverage

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

func TestPlanAssignBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	reg := planTestRegion(t, 100)
	scenes := map[string][]orb.Point{
		"uniform": sitegen.Uniform(100, 31),
		"grid":    sitegen.Grid(100), // many exact ties between devices
	}
	dup := sitegen.Uniform(50, 32)
	scenes["duplicates"] = append(dup, dup[0], dup[9], dup[9])
	for name, sites := range scenes {
		l, err := NewLayout(sites, reg)
		if err != nil {
			t.Fatal(err)
		}
		n := 5000
		pts := make([]orb.Point, n)
		w := make([]float64, n)
		for i := range pts {
			pts[i] = orb.Point{rng.Float64()*140 - 20, rng.Float64()*140 - 20}
			if i%7 == 0 { // on a lattice point: ties
				pts[i] = orb.Point{float64(rng.IntN(10)*10 + 5), float64(rng.IntN(10) * 10)}
			}
			w[i] = rng.Float64() * 3
		}
		const r = 6
		a, err := Assign(l, pts, w, r)
		if err != nil {
			t.Fatal(err)
		}
		var load = make([]DeviceLoad, len(sites))
		served := 0
		for i, p := range pts {
			best, bd := -1, math.Inf(1)
			for j, s := range sites {
				d := math.Hypot(s[0]-p[0], s[1]-p[1])
				if d < bd {
					best, bd = j, d
				}
			}
			if a.Device[i] != best || a.Distance[i] != bd || a.Within[i] != (bd <= r) {
				t.Fatalf("%s point %d %v: device %d at %.15g, brute force %d at %.15g", name, i, p, a.Device[i], a.Distance[i], best, bd)
			}
			load[best].Count++
			load[best].Weight += w[i]
			if bd <= r {
				served++
				load[best].InRange++
				load[best].InRangeWeight += w[i]
			}
		}
		for j := range load {
			g := a.Load[j]
			if g.Count != load[j].Count || g.InRange != load[j].InRange ||
				math.Abs(g.Weight-load[j].Weight) > 1e-9 || math.Abs(g.InRangeWeight-load[j].InRangeWeight) > 1e-9 {
				t.Errorf("%s device %d: load %+v, brute force %+v", name, j, g, load[j])
			}
		}
		if a.Served != served || a.Served+a.Unserved != n {
			t.Errorf("%s: served %d unserved %d, brute force %d served", name, a.Served, a.Unserved, served)
		}
	}
}

func TestPlanAssignErrors(t *testing.T) {
	reg := planTestRegion(t, 100)
	l, err := NewLayout(sitegen.Uniform(20, 1), reg)
	if err != nil {
		t.Fatal(err)
	}
	pts := []orb.Point{{1, 2}, {3, 4}}
	for _, c := range []struct {
		name string
		pts  []orb.Point
		w    []float64
		r    float64
		want string
	}{
		{"NaN point", []orb.Point{{1, 2}, {math.NaN(), 0}}, nil, 5, "point 1: x coordinate is NaN"},
		{"Inf point", []orb.Point{{1, math.Inf(-1)}}, nil, 5, "point 0: y coordinate is infinite"},
		{"weights length", pts, []float64{1}, 5, "1 weights for 2 points"},
		{"negative weight", pts, []float64{1, -2}, 5, "point 1: weight -2"},
		{"NaN weight", pts, []float64{math.NaN(), 1}, 5, "point 0: weight NaN"},
		{"negative range", pts, nil, -1, "range -1"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Assign(l, c.pts, c.w, c.r)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: error %v, want %q", c.name, err, c.want)
			}
		})
	}
	if a, err := Assign(l, nil, nil, 5); err != nil || len(a.Device) != 0 || len(a.Load) != 20 {
		t.Errorf("no points: %v %v", a, err)
	}
}

func TestPlanRepresentativePoint(t *testing.T) {
	// Rectangle: the centroid (elementary geometry).
	rect := orb.Polygon{{{0, 0}, {4, 0}, {4, 2}, {0, 2}, {0, 0}}}
	if p, err := RepresentativePoint(rect); err != nil || p != (orb.Point{2, 1}) {
		t.Errorf("rectangle: %v %v", p, err)
	}
	// Clockwise ring, far offset: same centroid.
	cw := orb.Polygon{{{5e6, 5e6}, {5e6, 5e6 + 2}, {5e6 + 4, 5e6 + 2}, {5e6 + 4, 5e6}, {5e6, 5e6}}}
	if p, err := RepresentativePoint(cw); err != nil || math.Abs(p[0]-5e6-2) > 1e-6 || math.Abs(p[1]-5e6-1) > 1e-6 {
		t.Errorf("clockwise offset rectangle: %v %v", p, err)
	}
	// A U shape: the centroid (5, 212/52) lies in the notch x ∈ (2, 8), y > 2.
	u := orb.Polygon{{{0, 0}, {10, 0}, {10, 10}, {8, 10}, {8, 2}, {2, 2}, {2, 10}, {0, 10}, {0, 0}}}
	// Annulus: the centroid is in the hole.
	ann := orb.Polygon{{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}, {{2, 2}, {2, 8}, {8, 8}, {8, 2}, {2, 2}}}
	for name, poly := range map[string]orb.Polygon{"U": u, "annulus": ann} {
		t.Run(name, func(t *testing.T) {
			p, err := RepresentativePoint(poly)
			if err != nil {
				t.Fatal(err)
			}
			reg, err := planar.NewRegion(orb.MultiPolygon{poly})
			if err != nil {
				t.Fatal(err)
			}
			if !reg.Contains(p[0], p[1]) {
				t.Errorf("%s: representative point %v not on the polygon", name, p)
			}
		})
	}
	for _, c := range []struct {
		name string
		p    orb.Polygon
		want string
	}{
		{"empty", orb.Polygon{}, "no ring"},
		{"short", orb.Polygon{{{0, 0}, {1, 1}}}, "need at least 3"},
		{"flat", orb.Polygon{{{0, 0}, {1, 1}, {2, 2}, {0, 0}}}, "zero area"},
		{"NaN", orb.Polygon{{{0, 0}, {1, math.NaN()}, {2, 0}}}, "ring 0, vertex 1: y coordinate is NaN"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := RepresentativePoint(c.p); err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: error %v, want %q", c.name, err, c.want)
			}
		})
	}
	// AssignPolygons uses those points.
	reg := planTestRegion(t, 100)
	l, err := NewLayout([]orb.Point{{1, 1}, {9, 9}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	a, pts, err := AssignPolygons(l, []orb.Polygon{rect, u}, []float64{2, 3}, 3)
	if err != nil {
		t.Fatal(err)
	}
	if pts[0] != (orb.Point{2, 1}) || a.Device[0] != 0 || a.Load[0].Count != 2 || a.Load[0].Weight != 5 || a.Load[0].InRangeWeight != 2 {
		t.Errorf("AssignPolygons: %v %+v", pts, a)
	}
	if _, _, err := AssignPolygons(l, []orb.Polygon{rect, {}}, nil, 3); err == nil || !strings.Contains(err.Error(), "polygon 1: no ring") {
		t.Errorf("bad polygon: %v", err)
	}
}

// RepresentativePoint returns the centroid whenever the polygon holds it,
// and a polygon holds its boundary (the module's closed convention, as
// planar.Region.Contains). The polygon is 0..6 × 0..6 with the holes
// H1 = 3..4 × 1..5 and H2 = 1.5..2.5 × 2..4 (or the mirror image): the
// holes' combined centroid is at x = 3 (4·3.5 + 2·2 = 6·3), so the
// polygon's centroid is (3, 3), on H1's edge x = 3. The former half-open
// crossing rule rejected it when the edge was H1's left edge and accepted
// it when it was the right edge, so mirroring the polygon moved the
// representative point from (5, 3) to the centroid; now both give the
// centroid.
func TestPlanRepresentativePointOnBoundary(t *testing.T) {
	rect := func(x0, y0, x1, y1 float64) orb.Ring {
		return orb.Ring{{x0, y0}, {x0, y1}, {x1, y1}, {x1, y0}, {x0, y0}} // clockwise
	}
	ext := orb.Ring{{0, 0}, {6, 0}, {6, 6}, {0, 6}, {0, 0}}
	cases := []struct {
		name string
		p    orb.Polygon
	}{
		{"centroid on a hole's left edge", orb.Polygon{ext, rect(3, 1, 4, 5), rect(1.5, 2, 2.5, 4)}},
		{"centroid on a hole's right edge", orb.Polygon{ext, rect(2, 1, 3, 5), rect(3.5, 2, 4.5, 4)}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, err := RepresentativePoint(c.p)
			if err != nil {
				t.Fatal(err)
			}
			if p != (orb.Point{3, 3}) {
				t.Errorf("representative point %v, want the centroid (3, 3)", p)
			}
			reg, err := planar.NewRegion(orb.MultiPolygon{c.p})
			if err != nil {
				t.Fatal(err)
			}
			if !reg.Contains(p[0], p[1]) {
				t.Errorf("%v is not on the polygon by Region.Contains", p)
			}
		})
	}
}
