// Tests of layout construction, service areas and the uncovered area.
//
// References: closed forms of elementary geometry (disk area πr², circular
// segment area r²·acos(h/r) − h·sqrt(r² − h²) for a chord at distance h from
// the centre, CRC Standard Mathematical Tables, "circular segment"; value
// recalled from memory), and Monte Carlo sampling (binomial standard error).

package coverage

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// cvRegion builds a region from polygons given as rings (each ring a list
// of points, not closed); the test fails on error.
func cvRegion(t testing.TB, polys ...[][]orb.Point) *planar.Region {
	t.Helper()
	var mp orb.MultiPolygon
	for _, p := range polys {
		var pg orb.Polygon
		for _, r := range p {
			ring := append(orb.Ring(nil), r...)
			ring = append(ring, r[0])
			pg = append(pg, ring)
		}
		mp = append(mp, pg)
	}
	reg, err := planar.NewRegion(mp)
	if err != nil {
		t.Fatalf("NewRegion: %v", err)
	}
	return reg
}

// cvRect returns the counter-clockwise ring of a rectangle.
func cvRect(x0, y0, x1, y1 float64) []orb.Point {
	return []orb.Point{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}}
}

// cvNgon returns a regular n-gon of circumradius R centred at (cx, cy).
func cvNgon(n int, R, cx, cy float64) []orb.Point {
	pts := make([]orb.Point, n)
	for k := range pts {
		a := 2 * math.Pi * float64(k) / float64(n)
		pts[k] = orb.Point{cx + R*math.Cos(a), cy + R*math.Sin(a)}
	}
	return pts
}

// cvLayout builds a layout; the test fails on error.
func cvLayout(t testing.TB, sites []orb.Point, reg *planar.Region) *Layout {
	t.Helper()
	l, err := NewLayout(sites, reg)
	if err != nil {
		t.Fatalf("NewLayout: %v", err)
	}
	return l
}

// cvSegment is the area of the circular segment cut from a disk of radius r
// by a chord at distance h from the centre (0 when h >= r).
func cvSegment(r, h float64) float64 {
	if h >= r {
		return 0
	}
	return r*r*math.Acos(h/r) - h*math.Sqrt(r*r-h*h)
}

// cvNearest returns the distance from (x, y) to the nearest site, by brute
// force.
func cvNearest(sites []orb.Point, x, y float64) float64 {
	best := math.Inf(1)
	for _, s := range sites {
		if d := math.Hypot(x-s[0], y-s[1]); d < best {
			best = d
		}
	}
	return best
}

// cvMonteCarlo estimates the uncovered area at r from n points uniform in
// the region's bounding box (fixed seed) and returns it with its binomial
// standard error.
func cvMonteCarlo(reg *planar.Region, sites []orb.Point, r float64, n int, seed uint64) (est, sigma float64) {
	b := reg.Bound()
	w, h := b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]
	rng := rand.New(rand.NewPCG(seed, 0x3c3c))
	hit := 0
	for i := 0; i < n; i++ {
		x, y := b.Min[0]+rng.Float64()*w, b.Min[1]+rng.Float64()*h
		if !reg.Contains(x, y) {
			continue
		}
		if cvNearest(sites, x, y) > r {
			hit++
		}
	}
	p := float64(hit) / float64(n)
	return p * w * h, w * h * math.Sqrt(math.Max(p*(1-p), 1/float64(n))/float64(n))
}

func TestNewLayoutErrors(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 10, 10)})
	cases := []struct {
		name  string
		sites []orb.Point
		reg   *planar.Region
		want  string
	}{
		{"no sites", nil, reg, "no sites"},
		{"nil area", []orb.Point{{1, 1}}, nil, "nil region"},
		{"NaN site", []orb.Point{{1, 1}, {math.NaN(), 2}}, reg, "site 1"},
		{"Inf site", []orb.Point{{math.Inf(1), 2}}, reg, "site 0"},
	}
	for _, c := range cases {
		_, err := NewLayout(c.sites, c.reg)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
	}
}

// One site at the centre of a square of side a: uncovered area a² − πr² for
// r <= a/2 (disk inside), a² − πr² + 4·segment(r, a/2) for a/2 < r < a/√2.
func TestUncoveredAreaOneSiteSquare(t *testing.T) {
	const a = 10.0
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, a, a)})
	l := cvLayout(t, []orb.Point{{a / 2, a / 2}}, reg)
	for _, r := range []float64{0, 0.1, 1, 3, 4.999, 5, 5.5, 6.5, 7.07, a / math.Sqrt2, 8, 100} {
		// Reference: disk area πr² and circular segment area (CRC tables).
		want := a*a - math.Pi*r*r + 4*cvSegment(r, a/2)
		if r >= a/math.Sqrt2 {
			want = 0
		}
		got := l.UncoveredArea(r)
		if math.Abs(got-want) > 1e-12*a*a {
			t.Errorf("r=%v: uncovered %.15g, want %.15g", r, got, want)
		}
		if cf := l.CoveredFraction(r); math.Abs(cf-(1-want/(a*a))) > 1e-12 {
			t.Errorf("r=%v: covered fraction %v, want %v", r, cf, 1-want/(a*a))
		}
	}
}

// A site on the corner of its square: a quarter disk is covered.
func TestUncoveredAreaSiteOnCorner(t *testing.T) {
	const a = 10.0
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, a, a)})
	l := cvLayout(t, []orb.Point{{0, 0}}, reg)
	for _, r := range []float64{1, 5, 9.99} {
		// Reference: quarter of the disk area πr²/4.
		want := a*a - math.Pi*r*r/4
		if got := l.UncoveredArea(r); math.Abs(got-want) > 1e-12*a*a {
			t.Errorf("r=%v: uncovered %.15g, want %.15g", r, got, want)
		}
	}
	if fc := l.FullCover(); math.Abs(fc.Range-a*math.Sqrt2) > 1e-12*a || len(fc.Worst) != 1 || fc.Worst[0] != (orb.Point{a, a}) {
		t.Errorf("full cover %+v, want %v at (10, 10)", fc, a*math.Sqrt2)
	}
}

// Collinear sites (a fence): cells are the slabs between bisectors.
func TestUncoveredAreaCollinear(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(-0.5, -1, 4.5, 1)})
	var sites []orb.Point
	for i := 0; i < 5; i++ {
		sites = append(sites, orb.Point{float64(i), 0})
	}
	l := cvLayout(t, sites, reg)
	for _, r := range []float64{0.3, 0.5, 0.7, 0.95} {
		// Reference: each 1×2 slab minus the disk, which is cut by the two
		// slab sides at distance 0.5 (circular segments, CRC tables).
		want := 10 - 5*(math.Pi*r*r-2*cvSegment(r, 0.5))
		if got := l.UncoveredArea(r); math.Abs(got-want) > 1e-12*10 {
			t.Errorf("r=%v: uncovered %.15g, want %.15g", r, got, want)
		}
	}
	if fc := l.FullCover(); math.Abs(fc.Range-math.Sqrt(1.25)) > 1e-12 || len(fc.Worst) != 12 {
		t.Errorf("full cover %v with %d worst points, want %v with 12 (slab corners)", fc.Range, len(fc.Worst), math.Sqrt(1.25))
	}
}

// Two sites splitting a 2×1 rectangle into unit squares.
func TestUncoveredAreaTwoSites(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 2, 1)})
	l := cvLayout(t, []orb.Point{{0.5, 0.5}, {1.5, 0.5}}, reg)
	for _, r := range []float64{0.2, 0.5, 0.6, 0.7} {
		// Reference: per unit square 1 − πr² + 4·segment(r, 1/2).
		want := 2 * (1 - math.Pi*r*r + 4*cvSegment(r, 0.5))
		if got := l.UncoveredArea(r); math.Abs(got-want) > 1e-13 {
			t.Errorf("r=%v: uncovered %.15g, want %.15g", r, got, want)
		}
	}
	fc := l.FullCover()
	if math.Abs(fc.Range-math.Sqrt(0.5)) > 1e-14 || len(fc.Worst) != 6 {
		t.Errorf("full cover %v with %d worst points, want √0.5 at 6 corners", fc.Range, len(fc.Worst))
	}
}

// Duplicate sites change nothing but the service-area bookkeeping.
func TestDuplicatesAndServiceAreas(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 2, 1)})
	sites := []orb.Point{{1.5, 0.5}, {0.5, 0.5}, {1.5, 0.5}, {0.5, 0.5}, {1.5, 0.5}}
	l := cvLayout(t, sites, reg)
	ref := cvLayout(t, []orb.Point{{0.5, 0.5}, {1.5, 0.5}}, reg)
	for _, r := range []float64{0.3, 0.6} {
		if a, b := l.UncoveredArea(r), ref.UncoveredArea(r); math.Abs(a-b) > 1e-14 {
			t.Errorf("r=%v: uncovered %v with duplicates, %v without", r, a, b)
		}
	}
	sa := l.ServiceAreas()
	if len(sa) != 2 {
		t.Fatalf("%d service areas, want 2", len(sa))
	}
	// Reference: each site serves its unit square; farthest corner at √0.5.
	want := []struct {
		site   int
		merged []int
	}{{0, []int{2, 4}}, {1, []int{3}}}
	for i, w := range want {
		s := sa[i]
		if s.Site != w.site || !equalInts(s.Merged, w.merged) || math.Abs(s.Area-1) > 1e-14 ||
			math.Abs(s.Share-0.5) > 1e-14 || math.Abs(s.Farthest-math.Sqrt(0.5)) > 1e-14 {
			t.Errorf("service area %d = %+v, want site %d merged %v area 1 share 0.5 farthest √0.5", i, s, w.site, w.merged)
		}
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// Sites outside the area: the uncovered area against Monte Carlo sampling.
func TestUncoveredAreaSitesOutside(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 10, 10), {{4, 4}, {4, 6}, {6, 6}, {6, 4}}})
	sites := []orb.Point{{-5, 5}, {5, 5}, {12, -3}, {5, 5.0001}}
	l := cvLayout(t, sites, reg)
	for _, r := range []float64{3, 6, 9} {
		// Reference: Monte Carlo, 10^6 points, 4 binomial standard errors.
		est, sig := cvMonteCarlo(reg, sites, r, 1_000_000, 7)
		if got := l.UncoveredArea(r); math.Abs(got-est) > 4*sig {
			t.Errorf("r=%v: uncovered %v, Monte Carlo %v ± %v", r, got, est, sig)
		}
	}
	// A single site outside the area covers nothing until its disk reaches
	// the area (distance 5).
	one := cvLayout(t, []orb.Point{{-5, 5}}, reg)
	if u := one.UncoveredArea(4.9); math.Abs(u-96) > 1e-12 {
		t.Errorf("site outside, r=4.9: uncovered %v, want 96", u)
	}
	// Reference: the farthest corners (10, 0), (10, 10) at √(15² + 5²).
	if fc := one.FullCover(); math.Abs(fc.Range-math.Hypot(15, 5)) > 1e-12 || len(fc.Worst) != 2 {
		t.Errorf("full cover %+v, want √250 at two corners", fc)
	}
}

// TestFirstServiceAreas checks the capped list against the whole one: the
// same first n entries (duplicates merged likewise) and the same count,
// on a layout with repeated positions in shuffled input order.
func TestFirstServiceAreas(t *testing.T) {
	reg := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 100)})
	var sites []orb.Point
	for i := range 400 {
		sites = append(sites, orb.Point{float64((i*37)%97) + 0.5*float64(i%3), float64((i*53)%89) + 0.25})
	}
	sites = append(sites, sites[5], sites[300], sites[5], sites[0]) // repeats, late in the input
	l := cvLayout(t, sites, reg)
	all := l.ServiceAreas()
	for _, n := range []int{0, 1, 7, 300, len(all), len(all) + 10} {
		t.Run(fmt.Sprint(n), func(t *testing.T) {
			first, total := l.FirstServiceAreas(n)
			if total != len(all) {
				t.Fatalf("total %d, want %d", total, len(all))
			}
			want := all[:min(n, len(all))]
			if len(first) != len(want) {
				t.Fatalf("%d entries, want %d", len(first), len(want))
			}
			for i := range want {
				if !reflect.DeepEqual(first[i], want[i]) {
					t.Fatalf("entry %d = %+v, want %+v", i, first[i], want[i])
				}
			}
		})
	}
	first, _ := l.FirstServiceAreas(10)
	for _, sa := range first {
		if sa.Site == 5 && !equalInts(sa.Merged, []int{400, 402}) {
			t.Errorf("site 5's merged duplicates %v, want [400 402]", sa.Merged)
		}
	}
}
