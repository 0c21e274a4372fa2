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
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
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
				gapsRefComponent
				FarCirc []float64 `json:"far_circumscribed"`
				FarInsc []float64 `json:"far_inscribed"`
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
					found := gapsMatch(gs, p)
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
	var doc rangesRefDoc
	loadRef(t, "testdata/weighted_gaps_ref.json", &doc)
	checkRangesRef(t, doc)
}

func TestRangesGEOSLive(t *testing.T) {
	var doc rangesRefDoc
	liveRef(t, "ref_weighted_gaps.py", "GEOS via Debian python3-shapely", &doc)
	checkRangesRef(t, doc)
}

// loadRef decodes the JSON file at path into doc.
func loadRef(t *testing.T, path string, doc any) {
	t.Helper()
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, doc); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
}

// liveRef runs testdata/script (which needs tool) with a fresh --seed
// (SITECOVER_SEED repeats one) and extra args, and decodes its output into
// doc. It skips unless SITECOVER_LIVE=1 and fails when the tool is missing.
func liveRef(t *testing.T, script, tool string, doc any, args ...string) {
	t.Helper()
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skipf("set SITECOVER_LIVE=1 to re-run testdata/%s (%s) on a fresh seed", script, tool)
	}
	seed := time.Now().UnixNano() % 1000000007
	if s := os.Getenv("SITECOVER_SEED"); s != "" {
		fmt.Sscan(s, &seed)
	}
	out := filepath.Join(t.TempDir(), "ref.json")
	args = append([]string{filepath.Join("testdata", script), "--seed", fmt.Sprint(seed), "--out", out}, args...)
	if b, err := exec.Command("/usr/bin/python3", args...).CombinedOutput(); err != nil {
		t.Fatalf("%s --seed %d (needs %s): %v\n%s", script, seed, tool, err, b)
	}
	t.Logf("seed %d", seed)
	loadRef(t, out, doc)
}

// mixedLayout is a reproducible layout of devices with the 40/60/120/150 m
// mix at about one per 100 m × 100 m over a square area with a hole.
func mixedLayout(t testing.TB, n int, seed uint64) (*Layout, []orb.Point, []float64) {
	t.Helper()
	r := rand.New(rand.NewPCG(seed, 7))
	side := 100 * math.Sqrt(float64(n))
	sites := make([]orb.Point, n)
	ranges := make([]float64, n)
	mix := [4]float64{40, 60, 120, 150}
	for i := range sites {
		sites[i] = orb.Point{r.Float64() * side, r.Float64() * side}
		ranges[i] = mix[r.IntN(4)]
	}
	reg, err := planar.NewRegion(orb.MultiPolygon{{
		{{0, 0}, {side, 0}, {side, side}, {0, side}},
		{{0.3 * side, 0.3 * side}, {0.3 * side, 0.45 * side}, {0.45 * side, 0.45 * side}, {0.45 * side, 0.3 * side}},
	}})
	if err != nil {
		t.Fatal(err)
	}
	l, err := NewLayoutRanges(sites, ranges, reg)
	if err != nil {
		t.Fatal(err)
	}
	return l, sites, ranges
}

// TestRangesMonteCarlo: the uncovered fraction at several growths against
// random points tested against every disk (brute force), within 5 standard
// errors; every uncovered point lies in a gap whose closing power is at
// least its own, and none beats the full-cover power.
func TestRangesMonteCarlo(t *testing.T) {
	l, sites, ranges := mixedLayout(t, 300, 3)
	b := l.Area.Bound()
	r := rand.New(rand.NewPCG(11, 12))
	const n = 60000
	fc := l.FullCoverRanges()
	for _, growth := range []float64{0, 2000, -1000} {
		t.Run(fmt.Sprintf("t=%g", growth), func(t *testing.T) {
			gs := l.GapsRanges(growth, DefaultChordTolerance)
			in, out := 0, 0
			for k := 0; k < n; k++ {
				x := b.Min[0] + r.Float64()*(b.Max[0]-b.Min[0])
				y := b.Min[1] + r.Float64()*(b.Max[1]-b.Min[1])
				if !l.Area.Contains(x, y) {
					continue
				}
				in++
				best := math.Inf(1)
				for i, s := range sites {
					best = math.Min(best, (x-s[0])*(x-s[0])+(y-s[1])*(y-s[1])-ranges[i]*ranges[i])
				}
				if best > growth {
					out++
					// The point lies in a gap (the outline holds the
					// true gap) whose closing power is at least its own.
					if g := gapsMatch(gs, orb.Point{x, y}); g < 0 {
						t.Fatalf("uncovered (%g, %g) is in no gap outline", x, y)
					} else if best > gs[g].Closing.Power+1e-9*math.Abs(gs[g].Closing.Power) {
						t.Fatalf("(%g, %g) in gap %d has power %g above its closing power %g", x, y, gs[g].ID, best, gs[g].Closing.Power)
					}
				}
				if best > fc.Power*(1+1e-9) {
					t.Fatalf("(%g, %g) has power %g above the full-cover power %g", x, y, best, fc.Power)
				}
			}
			p := float64(out) / float64(in)
			want := l.UncoveredAreaGrown(growth) / l.AreaM2
			if se := math.Sqrt(want * (1 - want) / float64(in)); math.Abs(p-want) > 5*se+1e-12 {
				t.Errorf("Monte Carlo uncovered fraction %.5f, exact %.5f (5σ = %.5f)", p, want, 5*se)
			}
		})
	}
}

// TestRangesTwoDisksLens: closed form. Two overlapping disks of radii a, b
// at distance d inside a box: uncovered = box − (πa² + πb² − lens), lens
// = a² acos((d² + a² − b²)/(2da)) + b² acos((d² + b² − a²)/(2db)) −
// ½√((−d + a + b)(d + a − b)(d − a + b)(d + a + b)) (textbook).
func TestRangesTwoDisksLens(t *testing.T) {
	for _, cs := range []struct {
		name    string
		a, b, d float64
	}{
		{"unequal", 150, 40, 170},
		{"deep", 150, 60, 100},
		{"equal", 60, 60, 100},
	} {
		t.Run(cs.name, func(t *testing.T) {
			reg, err := planar.NewRegion(orb.MultiPolygon{{{{-300, -300}, {500, -300}, {500, 300}, {-300, 300}}}})
			if err != nil {
				t.Fatal(err)
			}
			l, err := NewLayoutRanges([]orb.Point{{0, 0}, {cs.d, 0}}, []float64{cs.a, cs.b}, reg)
			if err != nil {
				t.Fatal(err)
			}
			a, b, d := cs.a, cs.b, cs.d
			lens := a*a*math.Acos((d*d+a*a-b*b)/(2*d*a)) + b*b*math.Acos((d*d+b*b-a*a)/(2*d*b)) -
				0.5*math.Sqrt((-d+a+b)*(d+a-b)*(d-a+b)*(d+a+b))
			want := 800*600 - (math.Pi*a*a + math.Pi*b*b - lens)
			if got := l.UncoveredAreaGrown(0); math.Abs(got-want) > 1e-9*want {
				t.Errorf("uncovered %.12g, closed form %.12g", got, want)
			}
			gs := l.GapsRanges(0, DefaultChordTolerance)
			if len(gs) != 1 || !gs[0].TouchesBoundary {
				t.Fatalf("%d gaps, want one touching the boundary", len(gs))
			}
			// The deepest point is a box corner; its power with respect to
			// the device of its cell is the full-cover power.
			if fc := l.FullCoverRanges(); math.Abs(gs[0].Closing.Power-fc.Power) > 1e-9*fc.Power {
				t.Errorf("gap closing power %g, full-cover power %g", gs[0].Closing.Power, fc.Power)
			}
		})
	}
}

// TestRangesLatticeKnown: closed form. A checkerboard square lattice of
// spacing 100 m with radii 60 m and 35 m (neighbours 95 m < 100 m apart in
// reach, same-radius diagonals 141 m > 120 m): no two disks meet, so in a
// box holding every disk the uncovered area is the box minus all disks,
// there is one gap (touching the boundary), no device is hidden, the union
// has one piece per disk and no hole, and no two devices link.
func TestRangesLatticeKnown(t *testing.T) {
	const k, s = 9, 100.0
	var sites []orb.Point
	var ranges []float64
	disks := 0.0
	for j := 0; j < k; j++ {
		for i := 0; i < k; i++ {
			r := 35.0
			if (i+j)%2 == 0 {
				r = 60
			}
			sites = append(sites, orb.Point{float64(i) * s, float64(j) * s})
			ranges = append(ranges, r)
			disks += math.Pi * r * r
		}
	}
	lo, hi := -70.0, float64(k-1)*s+70
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{lo, lo}, {hi, lo}, {hi, hi}, {lo, hi}}}})
	if err != nil {
		t.Fatal(err)
	}
	a, err := AnalyzeRanges(sites, ranges, reg, Options{})
	if err != nil {
		t.Fatal(err)
	}
	box := (hi - lo) * (hi - lo)
	if want := box - disks; math.Abs(a.UncoveredArea-want) > 1e-9*box {
		t.Errorf("uncovered %.12g, closed form %.12g", a.UncoveredArea, want)
	}
	if len(a.Gaps) != 1 || !a.Gaps[0].TouchesBoundary || len(a.Hidden) != 0 {
		t.Errorf("%d gaps, hidden %v; want one gap touching the boundary, none hidden", len(a.Gaps), a.Hidden)
	}
	if a.Pieces != k*k || a.EnclosedHoles != 0 || a.Links.Components != k*k {
		t.Errorf("pieces %d, holes %d, link groups %d; want %d, 0, %d", a.Pieces, a.EnclosedHoles, a.Links.Components, k*k, k*k)
	}
}

// TestRangesHiddenRedundant: a small disk inside a large one is hidden and
// listed as redundant; removing it changes no uncovered area.
func TestRangesHiddenRedundant(t *testing.T) {
	reg, err := planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {600, 0}, {600, 400}, {0, 400}}}})
	if err != nil {
		t.Fatal(err)
	}
	// Device 1 (40 m) lies in the middle of four 150 m devices.
	sites := []orb.Point{{100, 200}, {210, 205}, {300, 200}, {200, 100}, {200, 300}}
	ranges := []float64{150, 40, 150, 150, 150}
	l, err := NewLayoutRanges(sites, ranges, reg)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(l.Hidden, []int{1}) {
		t.Fatalf("hidden %v, want [1]", l.Hidden)
	}
	l2, err := NewLayoutRanges(slices.Delete(slices.Clone(sites), 1, 2), slices.Delete(slices.Clone(ranges), 1, 2), reg)
	if err != nil {
		t.Fatal(err)
	}
	for _, growth := range []float64{0, 5000} {
		if a, b := l.UncoveredAreaGrown(growth), l2.UncoveredAreaGrown(growth); math.Abs(a-b) > 1e-9*a {
			t.Errorf("t=%g: uncovered %v with the hidden device, %v without", growth, a, b)
		}
	}
	sa := l.ServiceAreasRanges()
	if len(sa) != 4 || sa[0].Site != 0 || sa[1].Site != 2 {
		t.Fatalf("service areas %+v", sa)
	}
	for _, s := range sa {
		if s.Served > s.Area || s.Served <= 0 {
			t.Errorf("device %d serves %v of its %v m²", s.Site, s.Served, s.Area)
		}
	}
}

// TestRangesCurve: the curve under uniform power growth agrees with the
// direct sum at every growth, reaches 1 at the full-cover power, and its
// inverse meets the requested fractions.
func TestRangesCurve(t *testing.T) {
	l, _, _ := mixedLayout(t, 400, 5)
	cv := l.CurveRanges()
	fc := l.FullCoverRanges()
	if math.Abs(cv.FullCoverRange()-fc.Power) > 1e-9*math.Abs(fc.Power) {
		t.Errorf("curve full-cover power %v, FullCoverRanges %v", cv.FullCoverRange(), fc.Power)
	}
	for _, growth := range []float64{-20000, -1000, 0, 3000, 10000, fc.Power} {
		a, b := cv.UncoveredArea(growth), l.UncoveredAreaGrown(growth)
		if math.Abs(a-b) > 1e-9*l.AreaM2 {
			t.Errorf("t=%g: curve %v, direct %v", growth, a, b)
		}
	}
	if u := l.UncoveredAreaGrown(fc.Power); u > 1e-9*l.AreaM2 {
		t.Errorf("uncovered %v at the full-cover power", u)
	}
	fr := []float64{0.2, 0.5, 0.9, 0.99}
	for i, p := range cv.RangesFor(fr) {
		if got := l.CoveredFractionGrown(p); math.Abs(got-fr[i]) > 1e-7 {
			t.Errorf("fraction %v: growth %v gives %v", fr[i], p, got)
		}
	}
}

// TestRangesLinksBruteForce compares the link groups with all pairs.
func TestRangesLinksBruteForce(t *testing.T) {
	sites := sitegen.Uniform(600, 9)
	for i := range sites {
		sites[i] = orb.Point{sites[i][0] * 6, sites[i][1] * 6}
	}
	ranges := make([]float64, len(sites))
	r := rand.New(rand.NewPCG(4, 4))
	for i := range ranges {
		ranges[i] = [4]float64{40, 60, 120, 150}[r.IntN(4)]
	}
	ls := LinksRanges(sites, ranges)
	uf := planar.NewUnionFind(len(sites))
	for i := range sites {
		for j := i + 1; j < len(sites); j++ {
			m := math.Min(ranges[i], ranges[j])
			if dx, dy := sites[i][0]-sites[j][0], sites[i][1]-sites[j][1]; dx*dx+dy*dy <= m*m {
				uf.UnionMin(int32(i), int32(j))
			}
		}
	}
	groups := 0
	for i := range sites {
		g := int(uf.Find(int32(i)))
		if g == i {
			groups++
		}
		if ls.Group[i] != g {
			t.Fatalf("device %d in group %d, brute force %d", i, ls.Group[i], g)
		}
	}
	if ls.Components != groups {
		t.Errorf("%d groups, brute force %d", ls.Components, groups)
	}
}
