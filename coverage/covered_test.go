// Tests of Covered: the covered polygons and the gap outlines tile the
// area (closed-form bookkeeping), Monte Carlo points against the distance
// to the nearest site, and (live) GEOS validity via Debian python3-shapely.

package coverage

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
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
// coveredRanges are the ranges of the covered-area tests: from scattered
// small disks (gaps merge into one that reaches the boundary, covered
// islands inside it) to nearly full cover.
var coveredRanges = []float64{3, 6, 9, 14, 30}

// coveredScene is 60 random sites in a 100 m × 80 m rectangle with an
// exclusion zone inside it.
func coveredScene(t *testing.T) (*Layout, []orb.Point) {
	rng := rand.New(rand.NewPCG(11, 5))
	var sites []orb.Point
	for range 60 {
		sites = append(sites, orb.Point{rng.Float64() * 100, rng.Float64() * 80})
	}
	area := cvRegion(t, [][]orb.Point{cvRect(0, 0, 100, 80), cvRect(40, 30, 55, 45)})
	return cvLayout(t, sites, area), sites
}

func TestCovered(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 9))
	l, grid := coveredScene(t)
	area := l.Area
	for _, r := range coveredRanges {
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

// TestCoveredValidLive checks the covered polygons of the scene of
// TestCovered with GEOS (Debian python3-shapely: is_valid, area) under
// SITECOVER_LIVE=1.
func TestCoveredValidLive(t *testing.T) {
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skip("set SITECOVER_LIVE=1 to check the covered polygons with GEOS (Debian python3-shapely)")
	}
	l, _ := coveredScene(t)
	var doc []orb.MultiPolygon
	for _, r := range coveredRanges {
		doc = append(doc, l.Covered(l.Gaps(r, 0)))
	}
	b, _ := json.Marshal(doc)
	in := filepath.Join(t.TempDir(), "covered.json")
	if err := os.WriteFile(in, b, 0o644); err != nil {
		t.Fatal(err)
	}
	// GEOS through shapely: validity (with the reason) and area of each
	// multipolygon.
	const script = `
import json, sys
from shapely.geometry import MultiPolygon, Polygon
from shapely.validation import explain_validity
for mp in json.load(open(sys.argv[1])):
    g = MultiPolygon([Polygon(p[0], p[1:]) for p in mp])
    print(json.dumps({"valid": g.is_valid, "why": explain_validity(g), "area": g.area}))
`
	out, err := exec.Command("/usr/bin/python3", "-c", script, in).CombinedOutput()
	if err != nil {
		t.Fatalf("python3 shapely: %v\n%s", err, out)
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(lines) != len(doc) {
		t.Fatalf("shapely printed %d lines for %d ranges:\n%s", len(lines), len(doc), out)
	}
	for i, line := range lines {
		var res struct {
			Valid bool
			Why   string
			Area  float64
		}
		json.Unmarshal([]byte(line), &res)
		if !res.Valid || math.Abs(res.Area-coveredPolyArea(doc[i])) > 1e-9*l.AreaM2 {
			t.Errorf("r=%v: GEOS says valid=%v (%s), area %v; ours %v", coveredRanges[i], res.Valid, res.Why, res.Area, coveredPolyArea(doc[i]))
		}
	}
}
