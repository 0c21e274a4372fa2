// Tests of Failures (plan_failures.go).
//
// References: closed forms for lattices with one device out of service
// (derived below from elementary geometry), a from-scratch rebuild of the
// layout without each device (NewLayout, FullCover, UncoveredArea: the
// definitions of full-cover range and uncovered area evaluated by
// independent code), brute-force second-nearest distances, and
// (plan_ref_test.go) GEOS and SciPy's k-d tree.

package coverage

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// planSquareLoss is the area newly uncovered at range r when one interior
// device of a square lattice of spacing s fails, for s/√2 ≤ r ≤ s.
//
// Derivation. The failed device at the origin served the square
// [−s/2, s/2]². Its points go to the nearest of the four axial neighbours
// (±s, 0), (0, ±s): for q in the square, |q − (s,s)|² − |q − (s,0)|² =
// s² − 2s·q_y ≥ 0, so no diagonal neighbour is nearer. The neighbour (s, 0)
// takes the triangle {|y| ≤ x} of the square, with apex at the origin
// (distance s) and far corners (s/2, ±s/2) (distance s/√2 ≤ r). In
// coordinates u = s − x from that neighbour, the half-triangle y ≥ 0 is
// s/2 ≤ u ≤ s − y; its points beyond the circle u² + y² = r² are those with
// u > √(r² − y²), for 0 ≤ y ≤ y*, where the slanted edge u = s − y meets the
// circle: y* = (s − √(2r² − s²))/2. So
//
//	half = ∫₀^{y*} (s − y − √(r² − y²)) dy
//	     = s·y* − y*²/2 − [ (y*/2)·√(r² − y*²) + (r²/2)·asin(y*/r) ],
//
// and the loss is 8·half (four triangles, two halves each). Checks: r = s
// gives 0; r = s/√2 gives (2 − π/2)·s², the square minus four disjoint
// circular segments of area (π/8 − 1/4)·s² each. The deepest point of the
// new gap is the failed device's spot, at distance s from the neighbours:
// the closing range is s.
func planSquareLoss(s, r float64) float64 {
	y := (s - math.Sqrt(2*r*r-s*s)) / 2
	half := s*y - y*y/2 - (y/2*math.Sqrt(r*r-y*y) + r*r/2*math.Asin(y/r))
	return 8 * half
}

// planTriangularLoss is the same for a triangular lattice of spacing s,
// s/√3 ≤ r ≤ s.
//
// Derivation. The failed device's cell is the regular hexagon with
// vertices at distance s/√3 in directions 30° + k·60°. The bisector of two
// adjacent neighbours (directions 0° and 60°, at distance s) passes through
// the origin at 30°, so the neighbour (s, 0) takes the triangle with apex
// at the origin (distance s) and the hexagon vertices (s/2, ±s/(2√3))
// (distance s/√3 ≤ r). With u = s − x, its half y ≥ 0 is
// s/2 ≤ u ≤ s − √3·y; the slanted edge meets the circle u² + y² = r² at
// y* = (√3·s − √(4r² − s²))/4, and
//
//	half = ∫₀^{y*} (s − √3·y − √(r² − y²)) dy
//	     = s·y* − (√3/2)·y*² − [ (y*/2)·√(r² − y*²) + (r²/2)·asin(y*/r) ],
//
// the loss 12·half. Checks: r = s gives 0; r = s/√3 gives √3·s² − π·s²/3,
// the hexagon (√3/2)·s² minus six circular segments of area
// π·s²/18 − s²/(4√3). The closing range is s, at the failed device's spot.
func planTriangularLoss(s, r float64) float64 {
	y := (math.Sqrt(3)*s - math.Sqrt(4*r*r-s*s)) / 4
	half := s*y - math.Sqrt(3)/2*y*y - (y/2*math.Sqrt(r*r-y*y) + r*r/2*math.Asin(y/r))
	return 12 * half
}

func TestPlanLossFormulasEndpoints(t *testing.T) {
	// Reference: the elementary-geometry checks in the derivations.
	s := 10.0
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"square r=s", planSquareLoss(s, s), 0},
		{"square r=s/√2", planSquareLoss(s, s/math.Sqrt2), (2 - math.Pi/2) * s * s},
		{"triangular r=s", planTriangularLoss(s, s), 0},
		{"triangular r=s/√3", planTriangularLoss(s, s/math.Sqrt(3)), math.Sqrt(3)*s*s - math.Pi*s*s/3},
	} {
		t.Run(c.name, func(t *testing.T) {
			if math.Abs(c.got-c.want) > 1e-12*s*s {
				t.Errorf("%s: %.15g, want %.15g", c.name, c.got, c.want)
			}
		})
	}
}

func TestPlanFailuresLatticeClosedForm(t *testing.T) {
	const s = 10.0
	type lattice struct {
		name   string
		sites  []orb.Point
		area   orb.Ring
		failed orb.Point
		rmin   float64
		loss   func(s, r float64) float64
	}
	tri := sitegen.TriangularLattice(9, 10, s)
	lats := []lattice{
		{"square", sitegen.Grid(100), orb.Ring{{-5, -5}, {95, -5}, {95, 95}, {-5, 95}, {-5, -5}},
			orb.Point{40, 50}, s / math.Sqrt2, planSquareLoss},
		{"triangular", tri, orb.Ring{{-4, -4}, {99, -4}, {99, 73}, {-4, 73}, {-4, -4}},
			tri[4*10+4], s / math.Sqrt(3), planTriangularLoss},
	}
	for _, lt := range lats {
		t.Run(lt.name, func(t *testing.T) {
			reg, err := planar.NewRegion(orb.MultiPolygon{{lt.area}})
			if err != nil {
				t.Fatal(err)
			}
			l, err := NewLayout(lt.sites, reg)
			if err != nil {
				t.Fatal(err)
			}
			idx := slices.Index(lt.sites, lt.failed)
			for _, f := range []float64{0, 0.1, 0.37, 0.5, 0.81, 0.999, 1} {
				r := lt.rmin + f*(s-lt.rmin)
				rep, err := Failures(l, r)
				if err != nil {
					t.Fatal(err)
				}
				var d DeviceFailure
				for _, x := range rep.Devices {
					if x.Site == idx {
						d = x
					}
				}
				// Reference: closed forms derived above.
				if want := lt.loss(s, r); math.Abs(d.AddedUncovered-want) > 1e-9*s*s {
					t.Errorf("%s r=%.6g: added uncovered %.12g, closed form %.12g", lt.name, r, d.AddedUncovered, want)
				}
				if math.Abs(d.Uncovered-(rep.Uncovered+d.AddedUncovered)) > 1e-9*s*s {
					t.Errorf("%s r=%.6g: uncovered %.12g ≠ intact %.12g + added %.12g", lt.name, r, d.Uncovered, rep.Uncovered, d.AddedUncovered)
				}
				if math.Abs(d.ClosingRange-s) > 1e-9*s || math.Hypot(d.Deepest[0]-lt.failed[0], d.Deepest[1]-lt.failed[1]) > 1e-9*s {
					t.Errorf("%s r=%.6g: closing range %.12g at %v, want %g at %v", lt.name, r, d.ClosingRange, d.Deepest, s, lt.failed)
				}
				if d.Backup < 0 || math.Abs(math.Hypot(lt.sites[d.Backup][0]-lt.failed[0], lt.sites[d.Backup][1]-lt.failed[1])-s) > 1e-9 {
					t.Errorf("%s: backup %d is not a lattice neighbour", lt.name, d.Backup)
				}
				// Reference: Kershner (1939) covering radii s/√2 and s/√3 of
				// the intact lattices in the interior.
				if math.Abs(d.ServiceArea-l.Cells.Area[l.Tri.Vertex[idx]]) > 0 {
					t.Errorf("%s: service area %.12g", lt.name, d.ServiceArea)
				}
			}
		})
	}
}

// planFailureScenes are layouts of the kinds met in practice: random,
// clustered, grid, with duplicates, sites outside the area, a fence of
// collinear sites, two sites.
func planFailureScenes(t *testing.T) map[string]*Layout {
	reg := planTestRegion(t, 100)
	scenes := map[string][]orb.Point{
		"uniform":   sitegen.Uniform(100, 5),
		"clustered": sitegen.Clustered(100, 6),
		"grid":      sitegen.Grid(100),
		"fence":     {{5, 50}, {25, 50}, {45, 50}, {65, 50}, {85, 50}},
		"two":       {{30, 30}, {70, 80}},
	}
	dup := sitegen.Uniform(60, 8)
	dup = append(dup, dup[3], dup[17], dup[17], orb.Point{-30, 50}, orb.Point{130, 130})
	scenes["duplicates-outside"] = dup
	// A device in the exclusion zone [30,50]×[50,70] whose cell holds the
	// whole zone; its neighbours' Voronoi vertex (40, 60) lies inside the
	// zone, so it is not a point of the area.
	scenes["zone-vertex"] = []orb.Point{{0, 20}, {80, 20}, {80, 100}, {0, 100}, {40, 62}}
	out := make(map[string]*Layout)
	for name, pts := range scenes {
		l, err := NewLayout(pts, reg)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		out[name] = l
	}
	// A non-convex (L-shaped) area with few devices: cells with notches.
	lreg := planPolyRegion(t, [][2]float64{{0, 0}, {100, 0}, {100, 30}, {30, 30}, {30, 100}, {0, 100}}, nil)
	l, err := NewLayout([]orb.Point{{60, 60}, {10, 10}, {90, 5}, {5, 90}, {70, 45}}, lreg)
	if err != nil {
		t.Fatal(err)
	}
	out["L-notch"] = l
	return out
}

func TestPlanFailuresMatchRebuild(t *testing.T) {
	for name, l := range planFailureScenes(t) {
		t.Run(name, func(t *testing.T) {
			for _, r := range []float64{0, 7, 13} {
				rep, err := Failures(l, r)
				if err != nil {
					t.Fatal(err)
				}
				if len(rep.Devices) != len(l.Sites) {
					t.Fatalf("%s: %d failures for %d devices", name, len(rep.Devices), len(l.Sites))
				}
				if fc := l.FullCover().Range; math.Abs(rep.Uncovered-l.UncoveredArea(r)) > 1e-9*l.AreaM2 || math.Abs(rep.FullCover-fc) > 1e-12*fc {
					t.Errorf("%s r=%g: intact figures %.12g %.12g vs layout %.12g %.12g", name, r,
						rep.Uncovered, rep.FullCover, l.UncoveredArea(r), l.FullCover().Range)
				}
				seen := make([]bool, len(l.Sites))
				for k, d := range rep.Devices {
					if seen[d.Site] {
						t.Fatalf("%s: device %d listed twice", name, d.Site)
					}
					seen[d.Site] = true
					if k > 0 {
						p := rep.Devices[k-1]
						if p.AddedUncovered < d.AddedUncovered || p.AddedUncovered == d.AddedUncovered && p.ClosingRange < d.ClosingRange {
							t.Fatalf("%s: ranking out of order at %d", name, k)
						}
					}
					rest := slices.Delete(slices.Clone(l.Sites), d.Site, d.Site+1)
					lw, err := NewLayout(rest, l.Area)
					if err != nil {
						t.Fatal(err)
					}
					if u := lw.UncoveredArea(r); math.Abs(d.Uncovered-u) > 1e-9*l.AreaM2 {
						t.Errorf("%s r=%g device %d: uncovered %.12g, rebuilt %.12g", name, r, d.Site, d.Uncovered, u)
					}
					if fc := lw.FullCover().Range; math.Abs(d.FullCover-fc) > 1e-9*fc {
						t.Errorf("%s r=%g device %d: full cover %.12g, rebuilt %.12g", name, r, d.Site, d.FullCover, fc)
					}
					// The deepest point is in the device's service area and at
					// ClosingRange from the nearest remaining device (Backup).
					v := lw.Tri.Nearest(d.Deepest[0], d.Deepest[1], -1)
					dist := math.Hypot(d.Deepest[0]-lw.Tri.Coords[2*v], d.Deepest[1]-lw.Tri.Coords[2*v+1])
					if d.ServiceArea > 0 && math.Abs(dist-d.ClosingRange) > 1e-9*math.Max(1, dist) {
						t.Errorf("%s device %d: deepest %v at %.12g from the rest, closing %.12g", name, d.Site, d.Deepest, dist, d.ClosingRange)
					}
					if d.Backup >= 0 && d.ServiceArea > 0 {
						b := l.Sites[d.Backup]
						if bd := math.Hypot(d.Deepest[0]-b[0], d.Deepest[1]-b[1]); math.Abs(bd-dist) > 1e-9*math.Max(1, dist) {
							t.Errorf("%s device %d: backup %d at %.12g, nearest remaining at %.12g", name, d.Site, d.Backup, bd, dist)
						}
					}
				}
			}
		})
	}
}

func TestPlanSurviveRangeBruteForce(t *testing.T) {
	// Reference: the definition — the largest distance from a point of the
	// area to its second-nearest device — by brute force over a sample of
	// spacing h (every point within h of a sample; the distance is
	// 1-Lipschitz), and exactly at the reported point.
	for name, l := range planFailureScenes(t) {
		t.Run(name, func(t *testing.T) {
			rep, err := Failures(l, 5)
			if err != nil {
				t.Fatal(err)
			}
			second := func(x, y float64) float64 {
				a, b := math.Inf(1), math.Inf(1)
				for _, s := range l.Sites {
					d := math.Hypot(s[0]-x, s[1]-y)
					if d < a {
						a, b = d, a
					} else if d < b {
						b = d
					}
				}
				return b
			}
			const h = 1.0
			ix := l.Area.Index()
			best := 0.0
			for x := 0.0; x <= 100; x += h / 2 {
				for y := 0.0; y <= 100; y += h / 2 {
					if ix.Contains(x, y) {
						best = math.Max(best, second(x, y))
					}
				}
			}
			if rep.SurviveRange < best-1e-9 || rep.SurviveRange > best+h {
				t.Errorf("%s: survive range %.9f, sampled %.9f", name, rep.SurviveRange, best)
			}
			if p := rep.SurvivePoint; math.Abs(second(p[0], p[1])-rep.SurviveRange) > 1e-9*rep.SurviveRange {
				t.Errorf("%s: at the survive point %v the second-nearest distance is %.12g, not %.12g", name, p, second(p[0], p[1]), rep.SurviveRange)
			}
			if !ix.Contains(rep.SurvivePoint[0], rep.SurvivePoint[1]) {
				// Cell vertices on the boundary may round a hair outside.
				x, y := rep.SurvivePoint[0], rep.SurvivePoint[1]
				if !ix.Contains(x+1e-9, y) && !ix.Contains(x-1e-9, y) && !ix.Contains(x, y+1e-9) && !ix.Contains(x, y-1e-9) {
					t.Errorf("%s: survive point %v outside the area", name, rep.SurvivePoint)
				}
			}
		})
	}
}

func TestPlanFailuresDegenerate(t *testing.T) {
	reg := planTestRegion(t, 100)
	// One device: its failure leaves nothing.
	l, err := NewLayout([]orb.Point{{50, 20}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := Failures(l, 30)
	if err != nil {
		t.Fatal(err)
	}
	d := rep.Devices[0]
	if !math.IsInf(d.ClosingRange, 1) || !math.IsInf(rep.SurviveRange, 1) || d.Backup != -1 ||
		math.Abs(d.Uncovered-l.AreaM2) > 1e-9*l.AreaM2 || math.Abs(d.AddedUncovered-(l.AreaM2-l.UncoveredArea(30))) > 1e-9*l.AreaM2 {
		t.Errorf("single device: %+v, survive %v", d, rep.SurviveRange)
	}
	// Two devices at one spot: either failing changes nothing; the survive
	// range is the full-cover range (the twin is the second-nearest).
	l, err = NewLayout([]orb.Point{{50, 20}, {50, 20}}, reg)
	if err != nil {
		t.Fatal(err)
	}
	rep, err = Failures(l, 30)
	if err != nil {
		t.Fatal(err)
	}
	fc := l.FullCover().Range
	for _, d := range rep.Devices {
		if !d.Shared || d.AddedUncovered != 0 || d.Backup != 1-d.Site || math.Abs(d.ClosingRange-fc) > 1e-12*fc {
			t.Errorf("twin devices: %+v (full cover %v)", d, fc)
		}
	}
	if math.Abs(rep.SurviveRange-fc) > 1e-12*fc {
		t.Errorf("twin devices: survive %v, full cover %v", rep.SurviveRange, fc)
	}
	// Bad input.
	if _, err := Failures(nil, 1); err == nil {
		t.Error("nil layout accepted")
	}
	for _, r := range []float64{-1, math.NaN(), math.Inf(1)} {
		if _, err := Failures(l, r); err == nil || !strings.Contains(err.Error(), "range") {
			t.Errorf("range %v: error %v", r, err)
		}
	}
}

func TestPlanFailuresLargeRandom(t *testing.T) {
	// Many devices: totals stay consistent (Σ added ≥ 0, survive ≥ full
	// cover) and a random sample matches the rebuild.
	pts := sitegen.Clustered(3000, 9)
	side := math.Sqrt(3000) * 10
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {side, 0}, {side, side}, {0, side}, {0, 0}}}})
	if err != nil {
		t.Fatal(err)
	}
	l, err := NewLayout(pts, reg)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := Failures(l, 15)
	if err != nil {
		t.Fatal(err)
	}
	if rep.SurviveRange < rep.FullCover {
		t.Errorf("survive %v < full cover %v", rep.SurviveRange, rep.FullCover)
	}
	rng := rand.New(rand.NewPCG(4, 4))
	for k := 0; k < 5; k++ {
		d := rep.Devices[rng.IntN(len(rep.Devices))]
		if k == 0 {
			d = rep.Devices[0]
		}
		rest := slices.Delete(slices.Clone(pts), d.Site, d.Site+1)
		lw, err := NewLayout(rest, reg)
		if err != nil {
			t.Fatal(err)
		}
		if u := lw.UncoveredArea(15); math.Abs(d.Uncovered-u) > 1e-9*l.AreaM2 {
			t.Errorf("device %d: uncovered %.12g, rebuilt %.12g", d.Site, d.Uncovered, u)
		}
	}
}
