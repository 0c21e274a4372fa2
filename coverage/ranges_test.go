// Tests of coverage with per-device ranges (ranges*.go).
//
// References outside the project:
//   - GEOS (Debian python3-shapely): uncovered area, gap count, gap areas
//     and boundary contact, bracketed by inscribed and circumscribed
//     1024-gons of each device's own disk, and each gap's farthest
//     distance from every device (the single-device closing), via
//     testdata/ref_weighted_gaps.py, whose output
//     testdata/weighted_gaps_ref.json is committed; TestRangesGEOSLive
//     re-runs it on a fresh seed under SITECOVER_LIVE=1.
//   - Monte Carlo: the uncovered fraction from random points tested
//     against every disk (brute force).
//   - Closed forms: two overlapping disks (lens area, textbook), a
//     checkerboard lattice of disks of two radii that do not meet (the
//     uncovered area is the box minus the disks).
//   - The common-range results of this package (Analyze, Gaps, FullCover,
//     UncoveredArea, Persistence) on the existing reference scenes: equal
//     ranges must give them figure for figure.

package coverage

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

type rangesRefDoc struct {
	Seed   int64 `json:"seed"`
	Scenes []struct {
		Name   string           `json:"name"`
		Area   [][][][2]float64 `json:"area"`
		Sites  [][2]float64     `json:"sites"`
		Ranges []float64        `json:"device_ranges"`
		AreaM2 float64          `json:"area_m2"`
		Cases  []struct {
			T          float64 `json:"t"`
			UInsc      float64 `json:"uncovered_inscribed"`
			UCirc      float64 `json:"uncovered_circumscribed"`
			CountInsc  int     `json:"count_inscribed"`
			CountCirc  int     `json:"count_circumscribed"`
			Components []struct {
				Rep       [2]float64 `json:"rep"`
				AreaCirc  float64    `json:"area_circumscribed"`
				AreaInsc  float64    `json:"area_inscribed"`
				TouchCirc bool       `json:"touches_circumscribed"`
				TouchInsc bool       `json:"touches_inscribed"`
				FarCirc   []float64  `json:"far_circumscribed"`
				FarInsc   []float64  `json:"far_inscribed"`
			} `json:"components"`
		} `json:"cases"`
	} `json:"scenes"`
}

func rangesRegion(t testing.TB, area [][][][2]float64) *planar.Region {
	t.Helper()
	var mp orb.MultiPolygon
	for _, p := range area {
		var pg orb.Polygon
		for _, r := range p {
			var ring orb.Ring
			for _, q := range r {
				ring = append(ring, orb.Point{q[0], q[1]})
			}
			pg = append(pg, ring)
		}
		mp = append(mp, pg)
	}
	reg, err := planar.NewRegion(mp)
	if err != nil {
		t.Fatal(err)
	}
	return reg
}

func checkRangesRef(t *testing.T, doc rangesRefDoc) {
	for _, sc := range doc.Scenes {
		sites := make([]orb.Point, len(sc.Sites))
		for i, s := range sc.Sites {
			sites[i] = orb.Point{s[0], s[1]}
		}
		l, err := NewLayoutRanges(sites, sc.Ranges, rangesRegion(t, sc.Area))
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range sc.Cases {
			t.Run(fmt.Sprintf("%s/t=%g", sc.Name, c.T), func(t *testing.T) {
				eps := 1e-9 * sc.AreaM2
				u := l.UncoveredAreaGrown(c.T)
				// Reference: GEOS, circumscribed and inscribed 1024-gons of
				// each device's own disk bracket the uncovered area.
				if u < c.UCirc-eps || u > c.UInsc+eps {
					t.Errorf("uncovered %.10g outside the GEOS bracket [%.10g, %.10g]", u, c.UCirc, c.UInsc)
				}
				// Each inscribed 1024-gon misses R²(π − 512 sin(2π/1024)).
				miss := 0.0
				for _, r := range sc.Ranges {
					miss += (r*r + c.T) * (math.Pi - 512*math.Sin(2*math.Pi/1024))
				}
				if d := c.UInsc - u; d < -eps || d > miss+eps {
					t.Errorf("GEOS inscribed − exact = %v, bound [0, %v]", d, miss)
				}
				gs := l.GapsRanges(c.T, DefaultChordTolerance)
				if len(gs) != c.CountInsc || c.CountInsc != c.CountCirc {
					t.Fatalf("%d gaps, GEOS %d (inscribed) %d (circumscribed)", len(gs), c.CountInsc, c.CountCirc)
				}
				sum := 0.0
				for _, g := range gs {
					sum += g.Area
				}
				if math.Abs(sum-u) > eps {
					t.Errorf("gap areas sum to %.10g, uncovered %.10g", sum, u)
				}
				used := make([]bool, len(gs))
				for k, comp := range c.Components {
					p := orb.Point{comp.Rep[0], comp.Rep[1]}
					found := -1
					for i, g := range gs {
						if gapsOutlineContains(g.Outline, p) {
							found = i
							break
						}
					}
					if found < 0 || used[found] {
						t.Errorf("GEOS component %d (point %v) matches no distinct gap", k, p)
						continue
					}
					used[found] = true
					g := gs[found]
					// Reference: GEOS gap area bracket and boundary contact.
					if g.Area < comp.AreaCirc-eps || g.Area > comp.AreaInsc+eps {
						t.Errorf("gap %d area %.10g outside the GEOS bracket [%.10g, %.10g]", g.ID, g.Area, comp.AreaCirc, comp.AreaInsc)
					}
					if comp.TouchCirc == comp.TouchInsc && g.TouchesBoundary != comp.TouchCirc {
						t.Errorf("gap %d touches boundary %v, GEOS %v", g.ID, g.TouchesBoundary, comp.TouchCirc)
					}
					checkClosing(t, l, g, c.T, comp.FarCirc, comp.FarInsc)
				}
			})
		}
	}
}

// checkClosing checks a gap's Closing: the needed ranges follow from its
// power, and the single device's range lies in GEOS's farthest-distance
// bracket and is the smallest increase among the bordering devices.
func checkClosing(t *testing.T, l *Layout, g Gap, growth float64, farCirc, farInsc []float64) {
	t.Helper()
	cl := g.Closing
	if cl == nil || len(cl.Needed) != len(g.Sites) {
		t.Fatalf("gap %d: closing %+v for %d sites", g.ID, cl, len(g.Sites))
	}
	for k, s := range g.Sites {
		r := l.InputRanges[s]
		if want := math.Sqrt(r*r + cl.Power); math.Abs(cl.Needed[k]-want) > 1e-12*want {
			t.Errorf("gap %d: device %d needs %g, √(r² + t) = %g", g.ID, s, cl.Needed[k], want)
		}
	}
	if cl.Power+1e-9*cl.Power < growth {
		t.Errorf("gap %d: closing power %g below the growth %g at which it exists", g.ID, cl.Power, growth)
	}
	if cl.Device < 0 || !slices.Contains(g.Sites, cl.Device) {
		t.Fatalf("gap %d: single device %d not among %v", g.ID, cl.Device, g.Sites)
	}
	tol := 1e-9 * (1 + cl.DeviceRange)
	// Reference: GEOS farthest distance from the device to the gap.
	if cl.DeviceRange < farCirc[cl.Device]-tol || cl.DeviceRange > farInsc[cl.Device]+tol {
		t.Errorf("gap %d: device %d needs %.10g, GEOS bracket [%.10g, %.10g]", g.ID, cl.Device, cl.DeviceRange, farCirc[cl.Device], farInsc[cl.Device])
	}
	cur := func(s int) float64 { r := l.InputRanges[s]; return math.Sqrt(r*r + growth) }
	inc := cl.DeviceRange - cur(cl.Device)
	for _, s := range g.Sites {
		if other := farInsc[s] - cur(s); other < inc-tol {
			t.Errorf("gap %d: device %d closes it with increase %g (GEOS), smaller than device %d's %g", g.ID, s, other, cl.Device, inc)
		}
	}
}

func TestRangesGEOSReference(t *testing.T) {
	raw, err := os.ReadFile("testdata/weighted_gaps_ref.json")
	if err != nil {
		t.Fatal(err)
	}
	var doc rangesRefDoc
	if err := json.Unmarshal(raw, &doc); err != nil {
		t.Fatal(err)
	}
	checkRangesRef(t, doc)
}

func TestRangesGEOSLive(t *testing.T) {
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skip("set SITECOVER_LIVE=1 to re-run testdata/ref_weighted_gaps.py (GEOS via Debian python3-shapely) on a fresh seed")
	}
	seed := time.Now().UnixNano() % 1000000007
	if s := os.Getenv("SITECOVER_SEED"); s != "" {
		fmt.Sscan(s, &seed)
	}
	out := filepath.Join(t.TempDir(), "ref.json")
	cmd := exec.Command("/usr/bin/python3", "testdata/ref_weighted_gaps.py", "--seed", fmt.Sprint(seed), "--out", out)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("ref_weighted_gaps.py (needs python3-shapely): %v\n%s", err, b)
	}
	t.Logf("seed %d", seed)
	raw, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var doc rangesRefDoc
	if err := json.Unmarshal(raw, &doc); err != nil {
		t.Fatal(err)
	}
	checkRangesRef(t, doc)
}
