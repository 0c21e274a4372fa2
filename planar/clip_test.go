// Tests of ClipCells against GEOS (shapely), against the partition identity
// (Voronoi cells tile the plane, so clipped areas sum to the area), and for
// internal consistency of the EdgeSource labels.

package planar

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"sync"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// clipRef is the JSON written by testdata/ref_cells.py.
type clipRef struct {
	Seed  int64 `json:"seed"`
	NPoly int   `json:"n_poly"`
	Cells []struct {
		Name       string           `json:"name"`
		Region     [][][][2]float64 `json:"region"`
		Sites      [][2]float64     `json:"sites"`
		Areas      []*float64       `json:"areas"`
		RegionArea float64          `json:"region_area"`
	} `json:"cells"`
	Contains []struct {
		Name   string           `json:"name"`
		Region [][][][2]float64 `json:"region"`
		Points [][2]float64     `json:"points"`
		Covers []bool           `json:"covers"`
	} `json:"contains"`
	Disk []struct {
		Name string    `json:"name"`
		Ring []float64 `json:"ring"`
		Cx   float64   `json:"cx"`
		Cy   float64   `json:"cy"`
		R    float64   `json:"r"`
		Lo   float64   `json:"lo"`
		Hi   float64   `json:"hi"`
	} `json:"disk"`
}

func clipLoadRef(t *testing.T, path string) *clipRef {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var ref clipRef
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	if len(ref.Cells) == 0 || len(ref.Disk) == 0 {
		t.Fatalf("%s: no cases", path)
	}
	return &ref
}

var (
	clipLiveOnce sync.Once
	clipLiveRef  *clipRef
	clipLiveErr  string
)

// clipRunRefScript runs ref_cells.py once per test binary with a fresh seed
// (SITECOVER_LIVE only) and shares the result between the live tests.
func clipRunRefScript(t *testing.T) *clipRef {
	t.Helper()
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skip("set SITECOVER_LIVE=1 to re-run testdata/ref_cells.py (GEOS via Debian python3-shapely) on a fresh seed")
	}
	clipLiveOnce.Do(func() {
		seed := time.Now().UnixNano() % 1000000007
		dir, err := os.MkdirTemp("", "sitecover-cells")
		if err != nil {
			clipLiveErr = err.Error()
			return
		}
		defer os.RemoveAll(dir)
		out := filepath.Join(dir, "cells.json")
		cmd := exec.Command("/usr/bin/python3", "testdata/ref_cells.py", "--seed", strconv.FormatInt(seed, 10), "--out", out)
		if msg, err := cmd.CombinedOutput(); err != nil {
			clipLiveErr = fmt.Sprintf("ref_cells.py --seed %d: %v\n%s", seed, err, msg)
			return
		}
		b, err := os.ReadFile(out)
		if err != nil {
			clipLiveErr = err.Error()
			return
		}
		var ref clipRef
		if err := json.Unmarshal(b, &ref); err != nil {
			clipLiveErr = err.Error()
			return
		}
		clipLiveRef = &ref
	})
	if clipLiveRef == nil {
		t.Fatal(clipLiveErr)
	}
	t.Logf("live reference seed %d", clipLiveRef.Seed)
	return clipLiveRef
}

func clipRefMultiPolygon(rg [][][][2]float64) orb.MultiPolygon {
	mp := make(orb.MultiPolygon, len(rg))
	for p, poly := range rg {
		for _, ring := range poly {
			r := make(orb.Ring, len(ring))
			for i, pt := range ring {
				r[i] = orb.Point{pt[0], pt[1]}
			}
			mp[p] = append(mp[p], r)
		}
	}
	return mp
}

func TestClipCellsGEOS(t *testing.T) {
	checkClipRef(t, clipLoadRef(t, "testdata/cells_ref.json"))
}

func TestClipCellsGEOSLive(t *testing.T) {
	checkClipRef(t, clipRunRefScript(t))
}

func checkClipRef(t *testing.T, ref *clipRef) {
	for _, cs := range ref.Cells {
		t.Run(cs.Name, func(t *testing.T) {
			reg, err := NewRegion(clipRefMultiPolygon(cs.Region))
			if err != nil {
				t.Fatal(err)
			}
			// Reference: GEOS area of the site area (shapely MultiPolygon.area).
			if d := math.Abs(reg.Area() - cs.RegionArea); d > 1e-12*cs.RegionArea {
				t.Errorf("Region.Area %.15g, GEOS %.15g", reg.Area(), cs.RegionArea)
			}
			pts := make([]orb.Point, len(cs.Sites))
			for i, s := range cs.Sites {
				pts[i] = orb.Point{s[0], s[1]}
			}
			tri, err := Triangulate(pts)
			if err != nil {
				t.Fatal(err)
			}
			cells, st, err := clipCells(tri, nil, reg, 2)
			if err != nil {
				t.Fatal(err)
			}
			if st.anomalies != 0 {
				t.Errorf("%d inconsistent boundary orders", st.anomalies)
			}
			// Reference: GEOS Voronoi diagram ∩ site area, per site
			// (GEOSVoronoiDiagram, GEOSIntersection, GEOSArea via shapely).
			// Tolerance 1e-9 relative to the cell area (or to the mean
			// cell area for tiny slivers), plus GEOS's own rounding: it
			// works in absolute coordinates, so its vertices are off by
			// up to an ulp of the coordinates' magnitude (1e-9 m at UTM
			// northings), which moves an area by about perimeter × ulp.
			mean := cs.RegionArea / float64(len(cs.Sites))
			b := reg.Bound()
			mag := math.Max(math.Max(math.Abs(b.Min[0]), math.Abs(b.Max[0])), math.Max(math.Abs(b.Min[1]), math.Abs(b.Max[1])))
			ulp := math.Nextafter(mag, math.Inf(1)) - mag
			for v := 0; v < tri.NumVertices(); v++ {
				want := cs.Areas[tri.Source[v]]
				if want == nil {
					t.Fatalf("site %d has no reference area", tri.Source[v])
				}
				got := cells.Area[v]
				a := math.Max(*want, mean)
				if d := math.Abs(got - *want); d > 1e-9*a+8*4*math.Sqrt(a)*ulp {
					t.Errorf("site %d (%g, %g): area %.12g, GEOS %.12g (diff %.3g)", tri.Source[v],
						pts[tri.Source[v]][0], pts[tri.Source[v]][1], got, *want, got-*want)
				}
			}
			clipCheckCells(t, tri, reg, cells)
		})
	}
}

// clipCheckCells checks the structure of a Cells value: ring orientation and
// size, areas equal to the rings' shoelace sums and summing to the area of
// the region (Voronoi cells partition the plane), labels valid and
// consistent between neighbours, and every point close to its own site no
// farther than to the labelled neighbour.
func clipCheckCells(t *testing.T, tri *Triangulation, reg *Region, c *Cells) {
	t.Helper()
	clipCheckPowerCells(t, tri, nil, reg, c)
}

// clipCheckPowerCells is clipCheckCells for power cells (weights per
// vertex; nil for Voronoi cells): a labelled edge's ends lie on the power
// line, at distance (π_v − π_j)/(2|p_j − p_v|) from it within the same
// tolerance.
func clipCheckPowerCells(t *testing.T, tri *Triangulation, wt []float64, reg *Region, c *Cells) {
	t.Helper()
	nv := tri.NumVertices()
	if c.NumSites() != nv || len(c.Area) != nv {
		t.Fatalf("cells for %d sites, want %d", c.NumSites(), nv)
	}
	b := reg.Bound()
	scale := math.Max(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1])
	mag := math.Max(math.Max(math.Abs(b.Min[0]), math.Abs(b.Max[0])), math.Max(math.Abs(b.Min[1]), math.Abs(b.Max[1])))
	tol := 1e-9*scale + 1e-12*mag
	sum := 0.0
	type key struct{ x0, y0, x1, y1 float64 }
	bis := map[[2]int32][]key{}
	for v := 0; v < nv; v++ {
		px, py := tri.Coords[2*v], tri.Coords[2*v+1]
		area := 0.0
		for p := c.SiteStart[v]; p < c.SiteStart[v+1]; p++ {
			for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
				xy, src := c.Ring(int(k))
				n := len(xy) / 2
				if n < 3 {
					t.Fatalf("site %d: ring with %d points", v, n)
				}
				a := RingAreaAbout(xy, px, py)
				if k == c.PolyStart[p] && !(a > 0) {
					t.Errorf("site %d: exterior ring area %g not positive", v, a)
				}
				if k > c.PolyStart[p] && !(a < 0) {
					t.Errorf("site %d: hole ring area %g not negative", v, a)
				}
				area += a
				for i := 0; i < n; i++ {
					j := (i + 1) % n
					x0, y0, x1, y1 := xy[2*i], xy[2*i+1], xy[2*j], xy[2*j+1]
					if x0 == x1 && y0 == y1 {
						t.Errorf("site %d: zero-length edge at (%g, %g)", v, x0, y0)
					}
					lab := src[i]
					if ring, ok := BoundaryRing(lab); ok {
						if ring >= reg.NumRings() {
							t.Fatalf("site %d: label %d names ring %d of %d", v, lab, ring, reg.NumRings())
						}
						continue
					}
					if lab < 0 || int(lab) >= nv || int(lab) == v {
						t.Fatalf("site %d: bad label %d", v, lab)
					}
					// Both ends equidistant from v and lab.
					qx, qy := tri.Coords[2*lab], tri.Coords[2*lab+1]
					for _, e := range [][2]float64{{x0, y0}, {x1, y1}} {
						dv := math.Hypot(e[0]-px, e[1]-py)
						dq := math.Hypot(e[0]-qx, e[1]-qy)
						if wt != nil {
							// Signed distance to the power line.
							pv := dv*dv - wt[v]
							pq := dq*dq - wt[lab]
							dv, dq = (pv-pq)/(2*math.Hypot(qx-px, qy-py)), 0
						}
						if math.Abs(dv-dq) > tol {
							t.Errorf("site %d: edge labelled %d has end (%g, %g) at distances %g and %g", v, lab, e[0], e[1], dv, dq)
						}
					}
					if math.Hypot(x1-x0, y1-y0) > tol {
						// Edges below the tolerance may be merged
						// away on one side only.
						bis[[2]int32{int32(v), lab}] = append(bis[[2]int32{int32(v), lab}], key{x0, y0, x1, y1})
					}
				}
			}
		}
		if d := math.Abs(area - c.Area[v]); d > 1e-12*math.Max(1, math.Abs(area)) {
			t.Errorf("site %d: Area %g, rings sum to %g", v, c.Area[v], area)
		}
		sum += c.Area[v]
	}
	// Reference: the Voronoi cells partition the plane, so their parts in
	// the region add up to the region's area (textbook identity).
	if d := math.Abs(sum - reg.Area()); d > 1e-9*reg.Area() {
		t.Errorf("cell areas sum to %.15g, region area %.15g (rel %.3g)", sum, reg.Area(), d/reg.Area())
	}
	// A bisector edge of v labelled j runs reversed in j's cell, labelled v:
	// the two edge sets cover the same segments (one side may subdivide
	// an edge where the area's boundary touches the bisector at a point).
	for kv, edges := range bis {
		back := bis[[2]int32{kv[1], kv[0]}]
		if wt != nil && len(back) == 0 && c.Area[kv[1]] == 0 {
			// A power cell of zero width (two of its power lines
			// coincide): its neighbours' edges on that line name it, but
			// it has no edge of its own.
			continue
		}
		la, lb := 0.0, 0.0
		for _, e := range edges {
			la += math.Hypot(e.x1-e.x0, e.y1-e.y0)
		}
		for _, f := range back {
			lb += math.Hypot(f.x1-f.x0, f.y1-f.y0)
		}
		if math.Abs(la-lb) > tol*float64(2+len(edges)+len(back)) {
			t.Errorf("sites %d and %d: bisector edges of total length %g and %g", kv[0], kv[1], la, lb)
			continue
		}
		for _, e := range edges {
			for _, p := range [][2]float64{{e.x0, e.y0}, {e.x1, e.y1}, {(e.x0 + e.x1) / 2, (e.y0 + e.y1) / 2}} {
				near := false
				for _, f := range back {
					if PointSegmentDistance(p[0], p[1], f.x0, f.y0, f.x1, f.y1) <= tol {
						near = true
						break
					}
				}
				if !near {
					t.Errorf("edge (%g, %g)-(%g, %g) of site %d labelled %d: point (%g, %g) is on no edge of site %d labelled %d",
						e.x0, e.y0, e.x1, e.y1, kv[0], kv[1], p[0], p[1], kv[1], kv[0])
				}
			}
		}
	}
}

// clipTestRegion is a non-convex polygon with a hole plus a second part,
// scaled to [0, side]² (the U shape of ref_cells.py).
func clipTestRegion(t testing.TB, side float64) *Region {
	s := side / 150
	ring := func(pts ...[2]float64) orb.Ring {
		r := make(orb.Ring, len(pts))
		for i, p := range pts {
			r[i] = orb.Point{p[0] * s, p[1] * s}
		}
		return r
	}
	mp := orb.MultiPolygon{
		{
			ring([2]float64{0, 0}, [2]float64{100, 0}, [2]float64{100, 150}, [2]float64{60, 150}, [2]float64{60, 40}, [2]float64{40, 40}, [2]float64{40, 150}, [2]float64{0, 150}),
			ring([2]float64{10, 10}, [2]float64{10, 30}, [2]float64{30, 30}, [2]float64{30, 10}),
		},
		{
			ring([2]float64{115, 0}, [2]float64{150, 0}, [2]float64{150, 90}, [2]float64{115, 90}),
			ring([2]float64{125, 20}, [2]float64{140, 20}, [2]float64{140, 70}, [2]float64{125, 70}),
		},
	}
	r, err := NewRegion(mp)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func TestClipCellsPartition(t *testing.T) {
	line := func(n int, x0, y0, dx, dy float64) []orb.Point {
		p := make([]orb.Point, n)
		for i := range p {
			p[i] = orb.Point{x0 + float64(i)*dx, y0 + float64(i)*dy}
		}
		return p
	}
	cases := []struct {
		name string
		pts  []orb.Point
	}{
		{"uniform-1000", sitegen.Uniform(1000, 11)},
		{"uniform-50", sitegen.Uniform(50, 12)},
		{"grid-900", sitegen.Grid(900)},
		{"grid-400", sitegen.Grid(400)},
		{"clustered-1500", sitegen.Clustered(1500, 13)},
		{"one", []orb.Point{{37, 41}}},
		{"one-outside", []orb.Point{{-1000, 5}}},
		{"two", []orb.Point{{37, 41}, {201, 12}}},
		{"collinear", line(12, -20, 5, 31, 27)},
		{"collinear-horizontal", line(8, -10, 150, 45, 0)},
		{"outside", []orb.Point{{-50, -50}, {-60, 600}, {900, 900}, {1000, -20}}},
		{"ring-of-sites", func() []orb.Point {
			var p []orb.Point
			for k := 0; k < 64; k++ {
				a := 2 * math.Pi * float64(k) / 64
				p = append(p, orb.Point{150 + 100*math.Cos(a), 150 + 100*math.Sin(a)})
			}
			return p
		}()},
	}
	for _, cs := range cases {
		t.Run(cs.name, func(t *testing.T) {
			// Region covering most of the points' extent.
			b := orb.MultiPoint(cs.pts).Bound()
			side := math.Max(300, math.Max(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]))
			reg := clipTestRegion(t, side)
			tri, err := Triangulate(cs.pts)
			if err != nil {
				t.Fatal(err)
			}
			for _, workers := range []int{1, 2} {
				cells, st, err := clipCells(tri, nil, reg, workers)
				if err != nil {
					t.Fatal(err)
				}
				if st.anomalies != 0 {
					t.Errorf("workers %d: %d inconsistent boundary orders", workers, st.anomalies)
				}
				clipCheckCells(t, tri, reg, cells)
			}
		})
	}
}

// TestClipCellsDeterministic checks that the output does not depend on the
// number of goroutines.
func TestClipCellsDeterministic(t *testing.T) {
	pts := sitegen.Uniform(30000, 5)
	tri, err := Triangulate(pts)
	if err != nil {
		t.Fatal(err)
	}
	reg := clipTestRegion(t, math.Sqrt(30000)*10)
	a, _, err := clipCells(tri, nil, reg, 1)
	if err != nil {
		t.Fatal(err)
	}
	b, _, err := clipCells(tri, nil, reg, 3)
	if err != nil {
		t.Fatal(err)
	}
	if fmt.Sprint(a.SiteStart, a.PolyStart, a.RingStart) != fmt.Sprint(b.SiteStart, b.PolyStart, b.RingStart) {
		t.Fatal("index arrays differ between 1 and 3 goroutines")
	}
	for i := range a.XY {
		if a.XY[i] != b.XY[i] {
			t.Fatalf("XY[%d] differs: %v vs %v", i, a.XY[i], b.XY[i])
		}
	}
	for i := range a.EdgeSource {
		if a.EdgeSource[i] != b.EdgeSource[i] {
			t.Fatalf("EdgeSource[%d] differs", i)
		}
	}
}

// TestClipCellsGridExact checks a square grid whose bisectors carry the
// region boundary: every cell inside is the whole grid square. Reference:
// the Voronoi cell of a point of a square lattice of spacing s is the
// square of side s centred on it (textbook geometry; Okabe et al. 2000).
func TestClipCellsGridExact(t *testing.T) {
	var pts []orb.Point
	for j := -2; j < 12; j++ {
		for i := -2; i < 12; i++ {
			pts = append(pts, orb.Point{10*float64(i) + 5, 10*float64(j) + 5})
		}
	}
	// L-shaped area with a square hole, all on grid lines.
	reg, err := NewRegion(orb.MultiPolygon{{
		{{0, 0}, {100, 0}, {100, 40}, {50, 40}, {50, 100}, {0, 100}, {0, 0}},
		{{10, 10}, {30, 10}, {30, 30}, {10, 30}, {10, 10}},
	}})
	if err != nil {
		t.Fatal(err)
	}
	tri, err := Triangulate(pts)
	if err != nil {
		t.Fatal(err)
	}
	cells, st, err := clipCells(tri, nil, reg, 2)
	if err != nil {
		t.Fatal(err)
	}
	if st.anomalies != 0 {
		t.Errorf("%d anomalies", st.anomalies)
	}
	for v := 0; v < tri.NumVertices(); v++ {
		x, y := tri.Coords[2*v], tri.Coords[2*v+1]
		want := 0.0
		if reg.Contains(x, y) {
			want = 100
		}
		if cells.Area[v] != want {
			t.Errorf("site (%g, %g): area %g, want %g", x, y, cells.Area[v], want)
		}
		if want > 0 {
			mp := cells.Polygons(int32(v))
			if len(mp) != 1 || len(mp[0]) != 1 || len(mp[0][0]) != 5 {
				t.Errorf("site (%g, %g): cell %v, want one square", x, y, mp)
			}
		}
	}
	clipCheckCells(t, tri, reg, cells)
}

// TestClipCellsSingleSite checks that one site's cell is the whole area,
// ring for ring, with every edge labelled by its ring.
func TestClipCellsSingleSite(t *testing.T) {
	reg := clipTestRegion(t, 300)
	tri, err := Triangulate([]orb.Point{{-40, 77}})
	if err != nil {
		t.Fatal(err)
	}
	cells, err := ClipCells(tri, reg)
	if err != nil {
		t.Fatal(err)
	}
	if cells.NumPolygons() != reg.NumPolygons() || cells.NumRings() != reg.NumRings() {
		t.Fatalf("%d polygons %d rings, want %d and %d", cells.NumPolygons(), cells.NumRings(), reg.NumPolygons(), reg.NumRings())
	}
	for k := 0; k < cells.NumRings(); k++ {
		xy, src := cells.Ring(k)
		found := false
		for q := 0; q < reg.NumRings(); q++ {
			if fmt.Sprint(xy) == fmt.Sprint(reg.Ring(q)) {
				found = true
				for _, l := range src {
					if l != BoundaryEdge(q) {
						t.Errorf("ring %d: label %d, want %d", k, l, BoundaryEdge(q))
					}
				}
			}
		}
		if !found {
			t.Errorf("ring %d is not a ring of the region", k)
		}
	}
	if cells.Area[0] != reg.Area() {
		t.Errorf("area %g, want %g", cells.Area[0], reg.Area())
	}
}

// TestClipCellsDegenerate covers layouts where region vertices fall
// exactly on bisectors and Voronoi vertices, and region edges run along
// bisectors, with the partition identity and GEOS-free exact values.
func TestClipCellsDegenerate(t *testing.T) {
	// Four sites around the origin: the Voronoi vertex is (0, 0) and the
	// bisectors are the axes. The region is a diamond with its vertices on
	// the axes, and a square with a corner at the Voronoi vertex.
	sites := []orb.Point{{1, 1}, {-1, 1}, {-1, -1}, {1, -1}}
	tri, err := Triangulate(sites)
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		mp   orb.MultiPolygon
		want []float64 // per input site
	}{
		// Reference for all: elementary areas of the quadrants of the shape.
		{"diamond", orb.MultiPolygon{{{{3, 0}, {0, 3}, {-3, 0}, {0, -3}}}}, []float64{4.5, 4.5, 4.5, 4.5}},
		{"square-at-vertex", orb.MultiPolygon{{{{0, 0}, {2, 0}, {2, 2}, {0, 2}}}}, []float64{4, 0, 0, 0}},
		{"square-centred", orb.MultiPolygon{{{{-2, -2}, {2, -2}, {2, 2}, {-2, 2}}}}, []float64{4, 4, 4, 4}},
		{"strip-on-axis", orb.MultiPolygon{{{{-2, 0}, {2, 0}, {2, 1}, {-2, 1}}}}, []float64{2, 2, 0, 0}},
		// Apex on the bisector x = 0, base below the bisector y = 0: the
		// part above y = 0 is a triangle of base 2 and height 1.
		{"triangle-vertex-on-axis", orb.MultiPolygon{{{{0, 1}, {-2, -1}, {2, -1}}}}, []float64{0.5, 0.5, 1.5, 1.5}},
		{"hole-at-vertex", orb.MultiPolygon{{{{-3, -3}, {3, -3}, {3, 3}, {-3, 3}}, {{0, 0}, {0, 1}, {1, 1}, {1, 0}}}}, []float64{8, 9, 9, 9}},
		{"two-parts-touching-axes", orb.MultiPolygon{{{{0, 0}, {1, 0}, {1, 1}, {0, 1}}}, {{{-1, -1}, {0, -1}, {0, 0}, {-1, 0}}}}, nil},
	}
	for _, cs := range cases {
		t.Run(cs.name, func(t *testing.T) {
			reg, err := NewRegion(cs.mp)
			if err != nil {
				if cs.want == nil {
					return // touching parts are rejected by NewRegion
				}
				t.Fatal(err)
			}
			cells, st, err := clipCells(tri, nil, reg, 1)
			if err != nil {
				t.Fatal(err)
			}
			if st.anomalies != 0 {
				t.Errorf("%d anomalies", st.anomalies)
			}
			for i, w := range cs.want {
				v := tri.Vertex[i]
				if math.Abs(cells.Area[v]-w) > 1e-14 {
					t.Errorf("site %v: area %.17g, want %g", sites[i], cells.Area[v], w)
				}
			}
			clipCheckCells(t, tri, reg, cells)
		})
	}
}

func TestClipCellsErrors(t *testing.T) {
	reg := clipTestRegion(t, 100)
	tri, err := Triangulate([]orb.Point{{1, 2}, {3, 4}, {5, 1}})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := ClipCells(nil, reg); err == nil {
		t.Error("nil triangulation accepted")
	}
	if _, err := ClipCells(tri, nil); err == nil {
		t.Error("nil region accepted")
	}
	if _, err := ClipCells(tri, &Region{}); err == nil {
		t.Error("empty region accepted")
	}
	bad := *tri
	bad.Inedge = bad.Inedge[:1]
	if _, err := ClipCells(&bad, reg); err == nil {
		t.Error("inconsistent triangulation accepted")
	}
	empty, err := Triangulate(nil)
	if err != nil {
		t.Fatal(err)
	}
	c, err := ClipCells(empty, reg)
	if err != nil || c.NumSites() != 0 {
		t.Errorf("no sites: %v, %v", c, err)
	}
}

// clipSHArea is the area of ring ∩ (Voronoi cell of site v), the cell taken
// as the intersection of the half-planes of v against every other site,
// by Sutherland–Hodgman clipping of the ring by each half-plane in turn
// (Sutherland & Hodgman, "Reentrant polygon clipping", CACM 17, 1974).
// The clipped ring may have zero-width bridges, but its signed area is
// exact for a convex clip region, so summed over the rings this is an
// independent reference for Cells.Area, O(n) half-planes per cell.
func clipSHArea(ring []float64, xy []float64, v int) float64 {
	px, py := xy[2*v], xy[2*v+1]
	poly := make([][2]float64, len(ring)/2)
	for i := range poly {
		poly[i] = [2]float64{ring[2*i] - px, ring[2*i+1] - py}
	}
	for j := 0; j < len(xy)/2 && len(poly) > 0; j++ {
		nx, ny := xy[2*j]-px, xy[2*j+1]-py
		if j == v || nx == 0 && ny == 0 {
			continue
		}
		h := (nx*nx + ny*ny) / 2
		var out [][2]float64
		for i := range poly {
			a, b := poly[i], poly[(i+1)%len(poly)]
			ga, gb := a[0]*nx+a[1]*ny-h, b[0]*nx+b[1]*ny-h
			if ga <= 0 {
				out = append(out, a)
			}
			if ga < 0 && gb > 0 || ga > 0 && gb < 0 {
				t := ga / (ga - gb)
				out = append(out, [2]float64{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1])})
			}
		}
		poly = out
	}
	s := 0.0
	for i := range poly {
		a, b := poly[i], poly[(i+1)%len(poly)]
		s += a[0]*b[1] - a[1]*b[0]
	}
	return s / 2
}

// TestClipCellsNearDegenerate compares every cell's area with the
// Sutherland–Hodgman reference on small random layouts built to be nearly
// or exactly degenerate: sites on a half-unit lattice (cocircular,
// collinear, on region vertices and edges), the same jittered by 1e-9 or
// by 1e-14 (near-duplicate sites, almost coincident bisectors), the same
// at UTM-sized offsets with a non-uniform scale, and uniform sites.
func TestClipCellsNearDegenerate(t *testing.T) {
	const cases = 2000
	for iter := 0; iter < cases; iter++ {
		rng := rand.New(rand.NewPCG(9, uint64(iter)))
		n := 1 + rng.IntN(50)
		mode := rng.IntN(5)
		tf := func(x, y float64) (float64, float64) { return x, y }
		if mode == 3 {
			tf = func(x, y float64) (float64, float64) { return x*1.1 + 300000.3, y*0.9 + 5700000.7 }
		}
		var pts []orb.Point
		for i := 0; i < n; i++ {
			x := float64(rng.IntN(45))/2 - 1
			y := float64(rng.IntN(45))/2 - 1
			switch mode {
			case 1:
				x += (rng.Float64() - 0.5) * 1e-9
				y += (rng.Float64() - 0.5) * 1e-9
			case 2:
				x += (rng.Float64() - 0.5) * 1e-14
				y += (rng.Float64() - 0.5) * 1e-14
			case 4:
				x, y = rng.Float64()*22-1, rng.Float64()*22-1
			}
			x, y = tf(x, y)
			pts = append(pts, orb.Point{x, y})
		}
		var mp orb.MultiPolygon
		for _, poly := range clipFuzzRegions[rng.IntN(len(clipFuzzRegions))] {
			var np orb.Polygon
			for _, ring := range poly {
				var nr orb.Ring
				for _, q := range ring {
					x, y := tf(q[0], q[1])
					nr = append(nr, orb.Point{x, y})
				}
				np = append(np, nr)
			}
			mp = append(mp, np)
		}
		reg, err := NewRegion(mp)
		if err != nil {
			t.Fatal(err)
		}
		tri, err := Triangulate(pts)
		if err != nil {
			t.Fatal(err)
		}
		cells, st, err := clipCells(tri, nil, reg, 1+iter%2)
		if err != nil {
			t.Fatal(err)
		}
		if mode == 0 && st.anomalies != 0 {
			t.Errorf("case %d (exact lattice): %d inconsistent boundary orders", iter, st.anomalies)
		}
		sum := 0.0
		for v := 0; v < tri.NumVertices(); v++ {
			ref := 0.0
			for k := 0; k < reg.NumRings(); k++ {
				ref += clipSHArea(reg.Ring(k), tri.Coords, v)
			}
			// Reference: Sutherland–Hodgman clipping (clipSHArea).
			if d := math.Abs(ref - cells.Area[v]); d > 1e-9*reg.Area() {
				t.Errorf("case %d mode %d site %d (%.17g, %.17g): area %.15g, Sutherland–Hodgman %.15g",
					iter, mode, v, tri.Coords[2*v], tri.Coords[2*v+1], cells.Area[v], ref)
			}
			sum += cells.Area[v]
		}
		if d := math.Abs(sum - reg.Area()); d > 1e-9*reg.Area() {
			t.Errorf("case %d mode %d: areas sum to %.15g, region %.15g", iter, mode, sum, reg.Area())
		}
	}
}
