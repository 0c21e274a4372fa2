// Tests of the full-cover range.
//
// References: Kershner, "The number of circles covering a set", Amer. J.
// Math. 61 (1939): the covering radius of the square lattice of spacing s is
// s/√2 and of the triangular lattice s/√3, whose covering density
// 2π/√27 ≈ 1.2092 is the thinnest possible; brute force over a fine sample
// of the area; closed forms for one site in a square and in a regular
// polygon (the farthest points are the corners).

package coverage

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

func TestFullCoverSquareLattice(t *testing.T) {
	const s = 10.0
	sites := sitegen.Grid(40 * 40) // spacing 10 m, 0..390
	// A sub-rectangle well inside the lattice.
	reg := cvRegion(t, [][]orb.Point{cvRect(103.3, 101.7, 297.1, 288.9)})
	fc := cvLayout(t, sites, reg).FullCover()
	// Reference: Kershner (1939), square lattice covering radius s/√2.
	if want := s / math.Sqrt2; math.Abs(fc.Range-want) > 1e-12*s {
		t.Errorf("square lattice: full cover %.15g, want s/√2 = %.15g", fc.Range, want)
	}
	// Every lattice-cell centre inside the rectangle attains it.
	if len(fc.Worst) != 20*19 {
		t.Errorf("square lattice: %d worst points, want %d cell centres", len(fc.Worst), 20*19)
	}
	for _, p := range fc.Worst {
		if math.Abs(math.Mod(p[0], s)-s/2) > 1e-9 || math.Abs(math.Mod(p[1], s)-s/2) > 1e-9 {
			t.Errorf("worst point %v is not a lattice-cell centre", p)
			break
		}
	}
}

func TestFullCoverTriangularLattice(t *testing.T) {
	const s = 10.0
	sites := sitegen.TriangularLattice(50, 44, s)
	reg := cvRegion(t, [][]orb.Point{cvRect(101.1, 98.2, 301.7, 303.4)})
	l := cvLayout(t, sites, reg)
	fc := l.FullCover()
	// Reference: Kershner (1939), triangular lattice covering radius s/√3.
	want := s / math.Sqrt(3)
	if math.Abs(fc.Range-want) > 1e-12*s {
		t.Errorf("triangular lattice: full cover %.15g, want s/√3 = %.15g", fc.Range, want)
	}
	// Covering density π R*² / (area of a Voronoi cell), the cell area being
	// measured as the median service area of the lattice.
	var areas []float64
	for _, sa := range l.ServiceAreas() {
		if sa.Area > 0 {
			areas = append(areas, sa.Area)
		}
	}
	sort.Float64s(areas)
	cell := areas[len(areas)/2]
	density := math.Pi * fc.Range * fc.Range / cell
	// Reference: Kershner (1939), thinnest covering density 2π/√27 ≈ 1.2092.
	if math.Abs(density-2*math.Pi/math.Sqrt(27)) > 1e-9 || math.Abs(density-1.2092) > 1e-4 {
		t.Errorf("triangular lattice covering density %.10f, want 2π/√27 = %.10f", density, 2*math.Pi/math.Sqrt(27))
	}
}

// The full-cover range bounds every sampled nearest-site distance and is
// attained: the nearest-site distance at each worst point equals it.
func TestFullCoverBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	scenes := []struct {
		name  string
		polys [][][]orb.Point
		sites []orb.Point
	}{
		{"square-random", [][][]orb.Point{{cvRect(0, 0, 100, 100)}}, nil},
		{"hole-outside-sites", [][][]orb.Point{{cvRect(0, 0, 100, 60), {{30, 20}, {30, 40}, {60, 40}, {60, 20}}}}, nil},
		{"two-parts", [][][]orb.Point{{cvNgon(7, 30, 35, 35)}, {cvRect(80, 0, 120, 70)}}, nil},
	}
	for i := range scenes {
		for k := 0; k < 25; k++ {
			scenes[i].sites = append(scenes[i].sites, orb.Point{rng.Float64()*140 - 20, rng.Float64()*100 - 20})
		}
	}
	for _, sc := range scenes {
		reg := cvRegion(t, sc.polys...)
		l := cvLayout(t, sc.sites, reg)
		fc := l.FullCover()
		// Reference: brute force over a 600×600 sample of the bounding box.
		b := reg.Bound()
		maxD := 0.0
		const n = 600
		for i := 0; i <= n; i++ {
			for j := 0; j <= n; j++ {
				x := b.Min[0] + (b.Max[0]-b.Min[0])*float64(i)/n
				y := b.Min[1] + (b.Max[1]-b.Min[1])*float64(j)/n
				if !reg.Contains(x, y) {
					continue
				}
				maxD = math.Max(maxD, cvNearest(sc.sites, x, y))
			}
		}
		step := math.Hypot(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]) / n
		if maxD > fc.Range*(1+1e-12) || maxD < fc.Range-step {
			t.Errorf("%s: sampled max nearest distance %v, full cover %v (sample step %v)", sc.name, maxD, fc.Range, step)
		}
		if len(fc.Worst) == 0 || len(fc.Worst) != len(fc.WorstSites) {
			t.Fatalf("%s: %d worst points, %d sites", sc.name, len(fc.Worst), len(fc.WorstSites))
		}
		for k, p := range fc.Worst {
			d := cvNearest(sc.sites, p[0], p[1])
			if math.Abs(d-fc.Range) > 1e-9*fc.Range {
				t.Errorf("%s: nearest distance at worst point %v is %v, want %v", sc.name, p, d, fc.Range)
			}
			s := sc.sites[fc.WorstSites[k]]
			if math.Abs(math.Hypot(p[0]-s[0], p[1]-s[1])-d) > 1e-9*fc.Range {
				t.Errorf("%s: worst site %d is not a nearest site of %v", sc.name, fc.WorstSites[k], p)
			}
		}
	}
}

// Closed forms: one site at the centre of a regular polygon (the corners at
// the circumradius are the worst points) and of a square (a/√2).
func TestFullCoverClosedForms(t *testing.T) {
	const R = 100.0
	reg := cvRegion(t, [][]orb.Point{cvNgon(64, R, 0, 0)})
	fc := cvLayout(t, []orb.Point{{0, 0}}, reg).FullCover()
	if math.Abs(fc.Range-R) > 1e-12*R || len(fc.Worst) != 64 {
		t.Errorf("64-gon: full cover %v at %d points, want %v at 64 corners", fc.Range, len(fc.Worst), R)
	}
	const a = 7.0
	sq := cvRegion(t, [][]orb.Point{cvRect(0, 0, a, a)})
	fc = cvLayout(t, []orb.Point{{a / 2, a / 2}}, sq).FullCover()
	if math.Abs(fc.Range-a/math.Sqrt2) > 1e-15*a || len(fc.Worst) != 4 {
		t.Errorf("square: full cover %v at %d points, want a/√2 = %v at 4 corners", fc.Range, len(fc.Worst), a/math.Sqrt2)
	}
}
