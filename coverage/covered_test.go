package coverage

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// coveredPolyArea is the shoelace area of a multipolygon (holes negative).
func coveredPolyArea(mp orb.MultiPolygon) float64 {
	a := 0.0
	for _, p := range mp {
		for _, r := range p {
			a += planar.RingArea(planar.FlatRing(r))
		}
	}
	return a
}

// The covered polygons and the gap outlines tile the area: their areas add
// up to the area's; every polygon has a counter-clockwise exterior and
// clockwise holes; a point inside the polygons is within range of a site;
// and a point well inside a disk (closer than r·(1 − chordTol), the chords'
// reach) is inside the polygons.
func TestCovered(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 5))
	var sites []orb.Point
	for range 60 {
		sites = append(sites, orb.Point{rng.Float64() * 100, rng.Float64() * 80})
	}
	// A rectangle with an exclusion zone inside it and one touching no edge.
	area := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80), cvRect(40, 30, 55, 45)})
	l := cvLayout(t, sites, area)
	grid := append([]orb.Point(nil), sites...)
	for _, r := range []float64{3, 6, 9, 14, 30} {
		t.Run(fmt.Sprintf("r=%v", r), func(t *testing.T) {
			gaps := l.Gaps(r, 0)
			c := l.Covered(gaps)
			outlines := 0.0
			for _, g := range gaps {
				outlines += coveredPolyArea(g.Outline)
			}
			if got := coveredPolyArea(c) + outlines; math.Abs(got-l.AreaM2) > 1e-9*l.AreaM2 {
				t.Errorf("covered %v + gap outlines %v = %v, area %v", coveredPolyArea(c), outlines, got, l.AreaM2)
			}
			exact := l.AreaM2 - l.UncoveredArea(r)
			if a := coveredPolyArea(c); a > exact*(1+1e-12) || a < exact-DefaultChordTolerance*r*l.AreaM2 {
				t.Errorf("covered outline area %v, exact covered area %v", a, exact)
			}
			for _, p := range c {
				for k, ring := range p {
					if a := planar.RingArea(planar.FlatRing(ring)); (a > 0) != (k == 0) {
						t.Errorf("ring %d of a polygon has signed area %v", k, a)
					}
				}
			}
			for range 4000 {
				q := orb.Point{rng.Float64() * 100, rng.Float64() * 80}
				if !area.Contains(q[0], q[1]) {
					continue
				}
				d := math.Inf(1)
				for _, s := range grid {
					d = math.Min(d, math.Hypot(q[0]-s[0], q[1]-s[1]))
				}
				in := gapsOutlineContains(c, q)
				if in && d > r*(1+1e-9) {
					t.Fatalf("point %v at %v from the nearest site is inside the covered polygons at range %v", q, d, r)
				}
				if !in && d < r*(1-DefaultChordTolerance)*(1-1e-9) {
					t.Fatalf("point %v at %v from the nearest site is outside the covered polygons at range %v", q, d, r)
				}
			}
		})
	}
	t.Run("no gaps", func(t *testing.T) {
		c := l.Covered(nil)
		if math.Abs(coveredPolyArea(c)-l.AreaM2) > 1e-9*l.AreaM2 {
			t.Errorf("covered area %v without gaps, area %v", coveredPolyArea(c), l.AreaM2)
		}
	})
}
