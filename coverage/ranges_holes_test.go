// Tests of the metres figures of ranges_gaps.go and ranges_holes.go
// against closed forms (elementary geometry, derived in each test's
// comment) and a brute-force check of the hole boundaries.

package coverage

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// metresTol is the agreement asked of a closed-form length: the figures
// are a few roundings of coordinates and square roots of hundreds of
// metres.
const metresTol = 1e-9

func closeMetres(got, want float64) bool {
	return math.Abs(got-want) <= metresTol*math.Max(1, math.Abs(want))
}

// TestRangesGapClosingTwoDisks: closed form. Devices A at (0, 0) with
// range a and B at (d, 0) with range b, in the strip [0, d] × [−h, h]
// (h < b < a, a + b < d): one gap between the disks. Its deepest point is
// where the power line x = (d² + a² − b²)/(2d) meets the strip's edge, so
// it closes at the growth t = x² + h² − a², where A would need
// √(x² + h²) and B √((d − x)² + h²) (each its distance to that point). A
// alone must reach the gap's far corners (d − √(b² − h²), ±h), where
// circle B meets the edges: √((d − √(b² − h²))² + h²); B alone likewise
// √((d − √(a² − h²))² + h²); the fix is the smaller increase.
func TestRangesGapClosingTwoDisks(t *testing.T) {
	for _, cs := range []struct {
		name       string
		a, b, d, h float64
	}{
		{"long-and-short", 150, 40, 300, 30},
		{"near-equal", 60, 50, 150, 20},
	} {
		t.Run(cs.name, func(t *testing.T) {
			a, b, d, h := cs.a, cs.b, cs.d, cs.h
			reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, -h}, {d, -h}, {d, h}, {0, h}}}})
			if err != nil {
				t.Fatal(err)
			}
			l, err := NewLayoutRanges([]orb.Point{{0, 0}, {d, 0}}, []float64{a, b}, reg)
			if err != nil {
				t.Fatal(err)
			}
			gs := l.GapsRanges(0, DefaultChordTolerance)
			if len(gs) != 1 || gs[0].Closing == nil {
				t.Fatalf("%d gaps, want one with its closing", len(gs))
			}
			x := (d*d + a*a - b*b) / (2 * d)
			cl := gs[0].Closing
			if want := x*x + h*h - a*a; !closeMetres(cl.Power, want) {
				t.Errorf("closing power %.12g m², closed form %.12g", cl.Power, want)
			}
			need := []float64{math.Hypot(x, h), math.Hypot(d-x, h)}
			for k, s := range gs[0].Sites {
				if !closeMetres(cl.Needed[k], need[s]) {
					t.Errorf("device %d needs %.12g m, closed form %.12g", s, cl.Needed[k], need[s])
				}
			}
			alone := []float64{math.Hypot(d-math.Sqrt(b*b-h*h), h), math.Hypot(d-math.Sqrt(a*a-h*h), h)}
			fix := 0
			if alone[1]-b < alone[0]-a {
				fix = 1
			}
			if cl.Device != fix || !closeMetres(cl.DeviceRange, alone[fix]) {
				t.Errorf("fix: device %d to %.12g m; closed form device %d to %.12g m", cl.Device, cl.DeviceRange, fix, alone[fix])
			}
		})
	}
}

// TestRangesHoleClosingLattice: closed form. A 4 × 4 square lattice of
// spacing s whose rows alternate ranges a and b (s/2 < b < a, a + b > s):
// each of the 9 inner squares rings one hole, open at the planned ranges.
// By symmetry it closes on the square's vertical mid-line, on the power
// line of an a-device and the b-device above or below it, at y = (s² + a²
// − b²)/(2s) from the a-row, at growth t = (s/2)² + y² − a²; each corner
// then needs its distance to that point. The hole's corners are where
// neighbouring circles meet: (s/2, ±√(a² − s²/4)) from the a-row,
// (s/2, ±√(b² − s²/4)) from the b-row, and (±√(a² − y²), y) from each
// a-device's column. From a b-device the farthest is the corner across the
// square at height y, distance √((s − √(a² − y²))² + (s − y)²); from an
// a-device the b-row corner, √((s/2)² + (s − √(b² − s²/4))²). The arcs
// face the hole's inside, so no arc point is farther. With a = 60, b = 55
// and s = 100 the b-devices need less increase: the fix is the first
// b-corner by input index.
func TestRangesHoleClosingLattice(t *testing.T) {
	const k, s, a, b = 4, 100.0, 60.0, 55.0
	var sites []orb.Point
	var ranges []float64
	for j := range k {
		for i := range k {
			sites = append(sites, orb.Point{float64(i) * s, float64(j) * s})
			ranges = append(ranges, [2]float64{a, b}[j%2])
		}
	}
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{-100, -100}, {400, -100}, {400, 400}, {-100, 400}}}})
	if err != nil {
		t.Fatal(err)
	}
	an, err := AnalyzeRanges(sites, ranges, reg, Options{})
	if err != nil {
		t.Fatal(err)
	}
	y := (s*s + a*a - b*b) / (2 * s)
	death := s*s/4 + y*y - a*a
	fromB := math.Hypot(s-math.Sqrt(a*a-y*y), s-y)
	fromA := math.Hypot(s/2, s-math.Sqrt(b*b-s*s/4))
	if !(fromB-b < fromA-a) {
		t.Fatalf("closed form: b-devices should need less increase (%g vs %g)", fromB-b, fromA-a)
	}
	open := 0
	for hk, h := range an.Persistence.Holes {
		hc := an.HoleClosings[hk]
		if hc == nil {
			continue
		}
		open++
		if !closeMetres(h.Death, death) {
			t.Errorf("hole %d closes at %.12g m², closed form %.12g", hk, h.Death, death)
		}
		// The square is the one holding the closing point.
		i0, j0 := math.Floor(h.DeathPoint[0]/s), math.Floor(h.DeathPoint[1]/s)
		yc := j0*s + y
		if int(j0)%2 == 1 { // a-row on top
			yc = (j0+1)*s - y
		}
		if !closeMetres(h.DeathPoint[0], i0*s+s/2) || !closeMetres(h.DeathPoint[1], yc) {
			t.Errorf("hole %d closes at %v, closed form (%g, %g)", hk, h.DeathPoint, i0*s+s/2, yc)
		}
		if len(hc.Sites) != 4 {
			t.Fatalf("hole %d bordered by %v, want the 4 corners", hk, hc.Sites)
		}
		for m, site := range hc.Sites {
			want := math.Hypot(sites[site][0]-h.DeathPoint[0], sites[site][1]-h.DeathPoint[1])
			if !closeMetres(hc.Needed[m], want) {
				t.Errorf("hole %d: device %d needs %.12g m, its distance to the closing point is %.12g", hk, site, hc.Needed[m], want)
			}
		}
		firstB := -1
		for _, site := range hc.Sites {
			if ranges[site] == b {
				firstB = site
				break
			}
		}
		if hc.Device != firstB || !closeMetres(hc.DeviceRange, fromB) {
			t.Errorf("hole %d: fix device %d to %.12g m; closed form device %d to %.12g m", hk, hc.Device, hc.DeviceRange, firstB, fromB)
		}
	}
	if open != (k-1)*(k-1) {
		t.Errorf("%d holes open, want %d", open, (k-1)*(k-1))
	}
}

// TestRangesHoleClosingBruteForce: on random layouts of mixed ranges,
// every open hole's boundary vertices lie on the circles of the two
// devices of their edge and inside no other disk (brute force over all
// devices), each bordering device's closing range is √(r² + Death), and
// the single-device fix reaches the hole's closing point and every
// boundary vertex (the hole lies within its range).
func TestRangesHoleClosingBruteForce(t *testing.T) {
	for seed := range uint64(4) {
		t.Run(fmt.Sprintf("seed-%d", seed), func(t *testing.T) {
			r := rand.New(rand.NewPCG(seed, 0x401e))
			n := 300
			sites := make([]orb.Point, n)
			ranges := make([]float64, n)
			for i := range sites {
				sites[i] = orb.Point{1000 * r.Float64(), 1000 * r.Float64()}
				ranges[i] = [4]float64{40, 60, 70, 90}[r.IntN(4)]
			}
			reg, err := planar.NewRegion(orb.MultiPolygon{{{{-100, -100}, {1100, -100}, {1100, 1100}, {-100, 1100}}}})
			if err != nil {
				t.Fatal(err)
			}
			l, err := NewLayoutRanges(sites, ranges, reg)
			if err != nil {
				t.Fatal(err)
			}
			p, f := l.persistenceRanges()
			hcs := l.holeClosings(p, f)
			open := 0
			for k, hc := range hcs {
				h := p.Holes[k]
				if isOpen := h.Birth <= 0 && 0 < h.Death; (hc != nil) != isOpen {
					t.Fatalf("hole %d: closing %v, open %v", k, hc != nil, isOpen)
				}
				if hc == nil {
					continue
				}
				open++
				for m, s := range hc.Sites {
					if want := math.Sqrt(ranges[s]*ranges[s] + h.Death); !closeMetres(hc.Needed[m], want) {
						t.Errorf("hole %d: device %d needs %g m, want %g", k, s, hc.Needed[m], want)
					}
				}
				fix := sites[hc.Device]
				if d := math.Hypot(fix[0]-h.DeathPoint[0], fix[1]-h.DeathPoint[1]); hc.DeviceRange < d-1e-9*d {
					t.Errorf("hole %d: fix %d reaches %g m, the closing point is %g m away", k, hc.Device, hc.DeviceRange, d)
				}
			}
			// The vertices, from the boundary the closings were made of.
			comp := holeComponents(l.Tri, f, 0)
			tr := l.Tri.Triangles
			gp := gapParams{radii: l.Ranges}
			for e := range tr {
				T := e / 3
				if comp[T] < 0 || f.Edge[e] > 0 {
					continue
				}
				x, y := l.holeVertex(f, int32(e), &gp)
				a, b := tr[e], tr[planar.NextHalfedge(int32(e))]
				for _, v := range [2]int32{a, b} {
					cx, cy := l.site(v)
					if d := math.Hypot(x-cx, y-cy); math.Abs(d-l.Ranges[v]) > 1e-9*l.Ranges[v] {
						t.Errorf("vertex (%g, %g) of edge %d–%d is %g m from device %d of range %g", x, y, a, b, d, v, l.Ranges[v])
					}
				}
				for i, s := range sites {
					if d := math.Hypot(x-s[0], y-s[1]); d < ranges[i]*(1-1e-9) {
						t.Errorf("vertex (%g, %g) of edge %d–%d lies inside device %d's disk (%g < %g)", x, y, a, b, i, d, ranges[i])
					}
				}
			}
			if open == 0 {
				t.Errorf("no open hole: the layout tests nothing")
			}
		})
	}
}
