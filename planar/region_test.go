// Tests of NewRegion validation and normalisation, point location (against
// GEOS covers), Subtract and the accessors.

package planar

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"

	"github.com/paulmach/orb"
)

func regionTestRing(pts ...[2]float64) orb.Ring {
	r := make(orb.Ring, len(pts))
	for i, p := range pts {
		r[i] = orb.Point{p[0], p[1]}
	}
	return r
}

func TestNewRegionNormalises(t *testing.T) {
	// Exterior given clockwise and closed, with a repeated vertex; hole
	// given counter-clockwise and open.
	mp := orb.MultiPolygon{{
		regionTestRing([2]float64{0, 0}, [2]float64{0, 10}, [2]float64{0, 10}, [2]float64{10, 10}, [2]float64{10, 0}, [2]float64{0, 0}),
		regionTestRing([2]float64{2, 2}, [2]float64{4, 2}, [2]float64{4, 4}, [2]float64{2, 4}),
	}}
	r, err := NewRegion(mp)
	if err != nil {
		t.Fatal(err)
	}
	if r.NumPolygons() != 1 || r.NumRings() != 2 || len(r.XY) != 16 {
		t.Fatalf("got %d polygons, %d rings, %d coordinates", r.NumPolygons(), r.NumRings(), len(r.XY))
	}
	// Reference: shoelace areas, 100 − 4.
	if r.Area() != 96 {
		t.Errorf("area %g, want 96", r.Area())
	}
	if a := RingAreaAbout(r.Ring(0), 0, 0); a != 100 {
		t.Errorf("exterior area %g, want +100 (counter-clockwise)", a)
	}
	if a := RingAreaAbout(r.Ring(1), 0, 0); a != -4 {
		t.Errorf("hole area %g, want -4 (clockwise)", a)
	}
	if b := r.Bound(); b.Min != (orb.Point{0, 0}) || b.Max != (orb.Point{10, 10}) {
		t.Errorf("bound %v", b)
	}
	// MultiPolygon round trip: closed rings, same region again.
	back := r.MultiPolygon()
	if len(back[0][0]) != 5 || back[0][0][0] != back[0][0][4] {
		t.Errorf("rings are not closed: %v", back)
	}
	r2, err := NewRegion(back)
	if err != nil {
		t.Fatal(err)
	}
	for i := range r.XY {
		if r.XY[i] != r2.XY[i] {
			t.Fatalf("round trip changed coordinate %d", i)
		}
	}
}

func TestNewRegionErrors(t *testing.T) {
	sq := func(x0, y0, x1, y1 float64) orb.Ring {
		return regionTestRing([2]float64{x0, y0}, [2]float64{x1, y0}, [2]float64{x1, y1}, [2]float64{x0, y1})
	}
	big := sq(0, 0, 100, 100)
	// A 12-vertex ring whose edge at vertex 5 crosses the edge at vertex 11:
	// a comb-like outline with one vertex pulled across.
	twelve := regionTestRing(
		[2]float64{0, 0}, [2]float64{10, 0}, [2]float64{20, 0}, [2]float64{30, 0}, [2]float64{30, 10}, [2]float64{30, 20},
		[2]float64{-5, 5}, // edge 5→6 runs far left, crossing edge 11→0
		[2]float64{20, 30}, [2]float64{10, 30}, [2]float64{0, 30}, [2]float64{0, 20}, [2]float64{0, 10},
	)
	for i := range twelve {
		twelve[i][0] += 240
		twelve[i][1] += 40
	}
	tests := []struct {
		name string
		mp   orb.MultiPolygon
		want string
	}{
		{"empty", orb.MultiPolygon{}, "no polygon"},
		{"no-ring", orb.MultiPolygon{{}}, "polygon 0: no ring"},
		{"nan", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{1, 0}, [2]float64{math.NaN(), 1})}}, "polygon 0, ring 0, vertex 2: x coordinate is NaN"},
		{"inf", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{1, math.Inf(1)}, [2]float64{0, 1})}}, "polygon 0, ring 0, vertex 1: y coordinate is infinite"},
		{"two-points", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{1, 0}, [2]float64{1, 0}, [2]float64{0, 0})}}, "polygon 0, ring 0: fewer than 3 distinct points"},
		{"collinear", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{1, 1}, [2]float64{3, 3})}}, "polygon 0, ring 0: zero area"},
		{"bowtie", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{10, 10}, [2]float64{10, 0}, [2]float64{0, 10})}}, "polygon 0, ring 0: edge at vertex 0 crosses edge at vertex 2"},
		{"twelve", orb.MultiPolygon{{big}, {sq(200, 0, 300, 100), sq(210, 10, 220, 20), twelve}}, ""},
		{"spike", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 10}, [2]float64{10, 5})}}, "overlap (the ring doubles back"},
		{"vertex-touch", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{5, 5}, [2]float64{10, 10}, [2]float64{0, 10}, [2]float64{5, 0})}}, "touches"},
		{"repeated-vertex", orb.MultiPolygon{{regionTestRing([2]float64{0, 0}, [2]float64{4, 0}, [2]float64{2, 2}, [2]float64{4, 4}, [2]float64{0, 4}, [2]float64{2, 2})}}, "touches"},
		{"hole-crosses", orb.MultiPolygon{{big, sq(90, 10, 110, 20)}}, "polygon 0, ring 0: edge at vertex 1 crosses polygon 0, ring 1"},
		{"hole-touches", orb.MultiPolygon{{big, sq(90, 10, 100, 20)}}, "touches polygon 0, ring 1"},
		{"hole-outside", orb.MultiPolygon{{big, sq(110, 10, 120, 20)}}, "polygon 0, ring 1: hole is not inside its exterior ring"},
		{"nested-holes", orb.MultiPolygon{{big, sq(10, 10, 50, 50), sq(20, 20, 30, 30)}}, "hole lies inside another hole of the same polygon"},
		{"polygon-inside", orb.MultiPolygon{{big}, {sq(10, 10, 20, 20)}}, "polygon 1 lies inside polygon 0"},
		{"polygon-around", orb.MultiPolygon{{sq(10, 10, 20, 20)}, {big}}, "polygon 0 lies inside polygon 1"},
		{"polygons-cross", orb.MultiPolygon{{big}, {sq(50, 50, 150, 150)}}, "crosses polygon 1, ring 0"},
		{"polygons-share-edge", orb.MultiPolygon{{big}, {sq(100, 0, 200, 100)}}, "touches polygon 1, ring 0"},
		{"hole-in-other-polygon", orb.MultiPolygon{{big, sq(10, 10, 90, 90)}, {sq(20, 20, 80, 80), sq(30, 30, 70, 70)}, {sq(40, 40, 60, 60), sq(45, 45, 55, 55)}}, ""},
		{"hole-inside-island", orb.MultiPolygon{{big, sq(10, 10, 90, 90), sq(40, 40, 60, 60)}, {sq(20, 20, 80, 80)}}, "polygon 0, ring 2: hole lies inside"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := NewRegion(tc.mp)
			if tc.name == "twelve" {
				// The message format of the package documentation.
				want := "polygon 1, ring 2: edge at vertex 5 crosses edge at vertex 11"
				if err == nil || !strings.Contains(err.Error(), want) {
					t.Fatalf("error %v, want %q", err, want)
				}
				return
			}
			if tc.want == "" {
				if err != nil {
					t.Fatalf("valid region rejected: %v", err)
				}
				return
			}
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want it to contain %q", err, tc.want)
			}
		})
	}
}

func TestRegionContainsGEOS(t *testing.T) {
	checkContainsRef(t, clipLoadRef(t, "testdata/cells_ref.json"))
}

func TestRegionContainsGEOSLive(t *testing.T) {
	checkContainsRef(t, clipRunRefScript(t))
}

func checkContainsRef(t *testing.T, ref *clipRef) {
	if len(ref.Contains) == 0 {
		t.Fatal("no contains cases")
	}
	// Reference: GEOS covers (shapely, Debian python3-shapely), which
	// counts boundary points as covered, as Contains does.
	for _, cs := range ref.Contains {
		reg, err := NewRegion(clipRefMultiPolygon(cs.Region))
		if err != nil {
			t.Fatal(err)
		}
		ix := reg.Index()
		for i, p := range cs.Points {
			if got := reg.Contains(p[0], p[1]); got != cs.Covers[i] {
				t.Errorf("%s: Contains(%g, %g) = %v, GEOS covers %v", cs.Name, p[0], p[1], got, cs.Covers[i])
			}
			if got := ix.Contains(p[0], p[1]); got != cs.Covers[i] {
				t.Errorf("%s: Index().Contains(%g, %g) = %v, GEOS covers %v", cs.Name, p[0], p[1], got, cs.Covers[i])
			}
		}
	}
}

func TestRegionIndexAgrees(t *testing.T) {
	// The grid index and the plain scan agree everywhere, including on a
	// fine lattice through vertices and along edges.
	reg := clipBenchRegion(t, 1000, 3000)
	ix := reg.Index()
	rng := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 20000; i++ {
		x, y := rng.Float64()*1100-50, rng.Float64()*1100-50
		if a, b := reg.Contains(x, y), ix.Contains(x, y); a != b {
			t.Fatalf("(%g, %g): scan %v, index %v", x, y, a, b)
		}
	}
	for k := 0; k < reg.NumRings(); k++ {
		ring := reg.Ring(k)
		for i := 0; i+1 < len(ring); i += 2 {
			if !ix.Contains(ring[i], ring[i+1]) || !reg.Contains(ring[i], ring[i+1]) {
				t.Fatalf("vertex (%g, %g) not contained", ring[i], ring[i+1])
			}
		}
	}
}

func TestRegionSubtract(t *testing.T) {
	sq := func(x0, y0, x1, y1 float64) orb.Ring {
		return regionTestRing([2]float64{x0, y0}, [2]float64{x1, y0}, [2]float64{x1, y1}, [2]float64{x0, y1})
	}
	reg, err := NewRegion(orb.MultiPolygon{{sq(0, 0, 100, 100), sq(10, 10, 20, 20)}, {sq(200, 0, 300, 100)}})
	if err != nil {
		t.Fatal(err)
	}
	out, err := reg.Subtract(orb.MultiPolygon{{sq(50, 50, 60, 70)}, {sq(250, 10, 260, 20)}})
	if err != nil {
		t.Fatal(err)
	}
	// Reference: elementary areas, 10000 − 100 + 10000 − 200 − 100.
	if out.Area() != 19600 {
		t.Errorf("area %g, want 19600", out.Area())
	}
	if out.NumRings() != 5 || out.PolyStart[1] != 3 {
		t.Errorf("rings %d, PolyStart %v", out.NumRings(), out.PolyStart)
	}
	if out.Contains(55, 60) || !out.Contains(55, 80) || out.Contains(255, 15) {
		t.Error("exclusions not cut out")
	}
	bad := []struct {
		name string
		ex   orb.MultiPolygon
		want string
	}{
		{"outside", orb.MultiPolygon{{sq(150, 10, 160, 20)}}, "exclusion 0, vertex 0 lies outside the site area"},
		{"crossing", orb.MultiPolygon{{sq(90, 10, 120, 20)}}, "exclusion 0"},
		{"on-boundary", orb.MultiPolygon{{sq(100, 10, 120, 20)}}, "lies on the site boundary"},
		{"in-hole", orb.MultiPolygon{{sq(12, 12, 14, 14)}}, "outside the site area"},
		{"around-hole", orb.MultiPolygon{{sq(5, 5, 30, 30)}}, "hole lies inside"},
		{"overlapping", orb.MultiPolygon{{sq(50, 50, 60, 60)}, {sq(55, 55, 65, 65)}}, "exclusion 0: edge at vertex 1 crosses exclusion 1"},
		{"with-hole", orb.MultiPolygon{{sq(50, 50, 60, 60), sq(52, 52, 54, 54)}}, "exclusion 0: has 1 holes"},
		{"degenerate", orb.MultiPolygon{{regionTestRing([2]float64{50, 50}, [2]float64{60, 60})}}, "exclusion 0: fewer than 3 distinct points"},
	}
	for _, tc := range bad {
		_, err := reg.Subtract(tc.ex)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want it to contain %q", tc.name, err, tc.want)
		}
	}
}

// TestNewRegionLarge checks that validation of a ring with 10⁵ vertices is
// fast and that a single crossing in it is found and located.
func TestNewRegionLarge(t *testing.T) {
	const n = 100000
	ring := make(orb.Ring, n)
	for i := range ring {
		a := 2 * math.Pi * float64(i) / n
		r := 1000 * (1 + 0.1*math.Sin(37*a))
		ring[i] = orb.Point{r * math.Cos(a), r * math.Sin(a)}
	}
	start := time.Now()
	if _, err := NewRegion(orb.MultiPolygon{{ring}}); err != nil {
		t.Fatal(err)
	}
	if d := time.Since(start); d > 5*time.Second {
		t.Errorf("validating %d vertices took %v", n, d)
	}
	// Swap two vertices: the edges around them now cross.
	ring[5000], ring[5001] = ring[5001], ring[5000]
	_, err := NewRegion(orb.MultiPolygon{{ring}})
	if err == nil || !strings.Contains(err.Error(), "polygon 0, ring 0: edge at vertex 4999 crosses edge at vertex 5001") {
		t.Fatalf("error %v", err)
	}
}
