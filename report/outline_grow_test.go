// Tests of the conservative rounding of outlines (outline_grow.go): the
// written gap polygons (gaps, own-range gaps, k-gaps) contain the exact
// gaps and the written covered parts claim no uncovered point, in planar
// and geographic output, away from the area's boundary (what the file
// comment leaves out there).

package report

import (
	"math"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report/siteinput"
)

// growScene is a layout to check: sites with their ranges, the area, and
// the conversion of a local point to unrounded output coordinates.
type growScene struct {
	sites  []orb.Point
	ranges []float64
	area   *planar.Region
	out    func(orb.Point) orb.Point
	back   func(orb.Point) orb.Point // output coordinates to the local plane
	reach  float64                   // the scene's rounding reach ε
}

// collect returns every multipolygon a layer emits.
func collect(t *testing.T, def *layerDef) []orb.MultiPolygon {
	t.Helper()
	var out []orb.MultiPolygon
	err := def.each(func(g orb.Geometry, _ ...value) error {
		out = append(out, plainGeometry(g).(orb.MultiPolygon).Clone())
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// inside reports whether p lies in mp or on its boundary (strict: not on
// the boundary).
func inside(mp orb.MultiPolygon, p orb.Point, strict bool) bool {
	for _, poly := range mp {
		w := planar.PointInRing(planar.FlatRing(poly[0]), p[0], p[1])
		if w < 0 || (strict && w == 0) {
			continue
		}
		in := true
		for _, h := range poly[1:] {
			if v := planar.PointInRing(planar.FlatRing(h), p[0], p[1]); v > 0 || (strict && v == 0) {
				in = false
				break
			}
		}
		if in {
			return true
		}
	}
	return false
}

// nearBoundary reports whether p lies within d of an edge of the area.
func (g *growScene) nearBoundary(p orb.Point, d float64) bool {
	near := false
	regionEdges(g.area, func(ax, ay, bx, by float64) {
		near = near || segDist(p, orb.Point{ax, ay}, orb.Point{bx, by}) <= d
	})
	return near
}

// segDist is the distance from p to the segment ab.
func segDist(p, a, b orb.Point) float64 {
	return planar.PointSegmentDistance(p[0], p[1], a[0], a[1], b[0], b[1])
}

// reachedBy counts the disks containing p.
func (g *growScene) reachedBy(p orb.Point) int {
	n := 0
	for i, s := range g.sites {
		if math.Hypot(p[0]-s[0], p[1]-s[1]) <= g.ranges[i] {
			n++
		}
	}
	return n
}

// gapSamples returns points of the exact k-gaps close to the circles:
// around every site at its range plus each of the offsets, reached by
// fewer than k disks, in the area and farther than 2ε from its boundary.
func (g *growScene) gapSamples(k int, offsets ...float64) []orb.Point {
	var pts []orb.Point
	for i, s := range g.sites {
		for a := range 720 {
			phi := 2 * math.Pi * (float64(a) + 0.5) / 720
			for _, off := range offsets {
				rr := g.ranges[i] + off
				p := orb.Point{s[0] + rr*math.Cos(phi), s[1] + rr*math.Sin(phi)}
				if g.area.Contains(p[0], p[1]) && g.reachedBy(p) < k && !g.nearBoundary(p, 2*g.reach) {
					pts = append(pts, p)
				}
			}
		}
	}
	return pts
}

// checkContain checks that each sample lies in one of the written
// polygons, and that each written polygon's area is at least its exact
// area.
func (g *growScene) checkContain(t *testing.T, what string, written []orb.MultiPolygon, exact []float64, samples []orb.Point) {
	t.Helper()
	if len(samples) == 0 {
		t.Fatalf("%s: no samples", what)
	}
	missed := 0
	for _, p := range samples {
		q := g.out(p)
		found := false
		for _, mp := range written {
			if mp.Bound().Pad(1e-12).Contains(q) && inside(mp, q, false) {
				found = true
				break
			}
		}
		if !found {
			if missed < 3 {
				t.Errorf("%s: exact gap point %v (output %v) outside every written polygon", what, p, q)
			}
			missed++
		}
	}
	if missed > 0 {
		t.Errorf("%s: %d of %d samples missed", what, missed, len(samples))
	}
	for i, mp := range written {
		a := 0.0
		for _, poly := range mp {
			for _, r := range poly {
				loc := make(orb.Ring, len(r))
				for k, q := range r {
					loc[k] = g.back(q)
				}
				a += planar.RingArea(planar.FlatRing(loc))
			}
		}
		if i < len(exact) && a < exact[i] {
			t.Errorf("%s %d: written area %.9g m² below the exact %.9g m²", what, i, a, exact[i])
		}
	}
}

// checkCovered checks that no sample (a point of the exact gaps) lies
// strictly inside a written covered part, and that every vertex of a
// covered part is in a disk or is a vertex of the area.
func (g *growScene) checkCovered(t *testing.T, written []orb.MultiPolygon, samples []orb.Point) {
	t.Helper()
	corners := map[orb.Point]bool{}
	for i := 0; i+1 < len(g.area.XY); i += 2 {
		corners[g.out(orb.Point{g.area.XY[i], g.area.XY[i+1]})] = true
	}
	for _, p := range samples {
		q := g.out(p)
		for _, mp := range written {
			if inside(mp, q, true) {
				t.Fatalf("covered part claims the uncovered point %v", p)
			}
		}
	}
	bad := 0
	for _, mp := range written {
		for _, poly := range mp {
			for _, r := range poly {
				for _, q := range r {
					p := g.back(q)
					if g.reachedBy(p) == 0 && !corners[q] && !g.nearBoundary(p, 2*g.reach) {
						if bad < 3 {
							t.Errorf("covered vertex %v (local %v) in no disk", q, p)
						}
						bad++
					}
				}
			}
		}
	}
}

// growScenes are a planar and a geographic version of random sites in a
// 200 m square with an exclusion, each range 17 m.
func growScenes(t *testing.T, ranges bool) map[string]*growScene {
	t.Helper()
	rng := rand.New(rand.NewPCG(11, 12))
	var sites []orb.Point
	var rs []float64
	for range 60 {
		sites = append(sites, orb.Point{200 * rng.Float64(), 200 * rng.Float64()})
		r := 17.0
		if ranges {
			r = 12 + 10*rng.Float64()
		}
		rs = append(rs, r)
	}
	area := region(t, square(200), []float64{80, 80, 80, 120, 120, 120, 120, 80})
	tm, err := planar.NewLocalPlane([]orb.Point{{8, 47}})
	if err != nil {
		t.Fatal(err)
	}
	id := func(p orb.Point) orb.Point { return p }
	return map[string]*growScene{
		"planar": {sites: sites, ranges: rs, area: area, out: id, back: id},
		"geographic": {sites: sites, ranges: rs, area: area,
			out:  func(p orb.Point) orb.Point { lon, lat := tm.Inverse(p[0], p[1]); return orb.Point{lon, lat} },
			back: func(q orb.Point) orb.Point { x, y := tm.Forward(q[0], q[1]); return orb.Point{x, y} }},
	}
}

// meta returns the Meta of a scene's output.
func (g *growScene) meta(name string) Meta {
	if name == "planar" {
		return Meta{Planar: true}
	}
	return Meta{ToLonLat: func(x, y float64) (float64, float64) { q := g.out(orb.Point{x, y}); return q[0], q[1] }}
}

// sampleOffsets are the distances beyond the circles at which the gaps
// are sampled: far below the rounding (where rounding unmoved outlines
// loses gap) and about it.
var sampleOffsets = []float64{1e-7, 1e-5, 3e-4, 2e-3}

func TestWrittenGapsContainExactGaps(t *testing.T) {
	for name, g := range growScenes(t, false) {
		t.Run(name, func(t *testing.T) {
			an := analyze(t, g.sites, g.area, g.ranges[0])
			if len(an.Gaps) < 3 {
				t.Fatalf("only %d gaps", len(an.Gaps))
			}
			s := newScene(an.Layout, an, g.meta(name))
			g.reach = s.roundingReach()
			samples := g.gapSamples(1, sampleOffsets...)
			exact := make([]float64, len(an.Gaps))
			for i, gp := range an.Gaps {
				exact[i] = gp.Area
			}
			g.checkContain(t, "gaps", collect(t, s.gapsLayer()), exact, samples)
			g.checkCovered(t, collect(t, s.coveredLayer()), samples)

			kc, err := coverage.KCover(an.Layout, g.ranges[0], coverage.KOptions{MaxK: 2, Gaps: true})
			if err != nil {
				t.Fatal(err)
			}
			written := collect(t, s.reachGapsLayer(kc))
			var kexact []float64
			for _, lv := range kc.Levels {
				for _, gp := range lv.Gaps {
					kexact = append(kexact, gp.Area)
				}
			}
			g.checkContain(t, "k-gaps", written[len(kc.Levels[0].Gaps):], kexact[len(kc.Levels[0].Gaps):], g.gapSamples(2, sampleOffsets...))
		})
	}
}

func TestWrittenRangesGapsContainExactGaps(t *testing.T) {
	for name, g := range growScenes(t, true) {
		t.Run(name, func(t *testing.T) {
			ra, err := coverage.AnalyzeRanges(g.sites, g.ranges, g.area, coverage.Options{})
			if err != nil {
				t.Fatal(err)
			}
			rs := newRangesScene(ra, g.meta(name))
			g.reach = rs.roundingReach()
			exact := make([]float64, len(ra.Gaps))
			for i, gp := range ra.Gaps {
				exact[i] = gp.Area
			}
			g.checkContain(t, "own-range gaps", collect(t, rs.gapsLayer()), exact, g.gapSamples(1, sampleOffsets...))
		})
	}
}

func TestRoundingReach(t *testing.T) {
	// The reach covers the largest move of rounding: a point at the
	// centre of a rounding cell, in each output.
	tm, err := planar.NewLocalPlane([]orb.Point{{8, 47}})
	if err != nil {
		t.Fatal(err)
	}
	crs, err := siteinput.ParseCRS("EPSG:32632")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		m    Meta
		grid bool
	}{
		{"planar", Meta{Planar: true}, false},
		{"geographic", Meta{ToLonLat: tm.Inverse}, false},
		{"projected copy", Meta{ToLonLat: tm.Inverse, OutCRS: crs}, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			s := newScene(nil, nil, c.m)
			if c.grid {
				s.grid = &gridOutput{crs: crs, toLonLat: tm.Inverse}
			}
			worst := 0.0
			for i := range 400 {
				p := orb.Point{1234.5678 + 0.0137*float64(i), -876.54321 + 0.0071*float64(i)}
				q := s.point(p)
				back := orb.Point{q[0], q[1]}
				if c.grid {
					back[0], back[1] = crs.TM.Inverse(q[0], q[1])
				}
				if !c.m.Planar {
					back[0], back[1] = tm.Forward(back[0], back[1])
				}
				worst = max(worst, math.Hypot(back[0]-p[0], back[1]-p[1]))
			}
			if r := s.roundingReach(); worst > r || worst < r/2 {
				t.Errorf("largest rounding move %.4g m against the reach %.4g m", worst, r)
			}
			if f := s.finer(); math.Abs(f.roundingReach()-s.roundingReach()/100) > 1e-12*s.roundingReach() {
				t.Errorf("finer reach %g, want %g", f.roundingReach(), s.roundingReach()/100)
			}
		})
	}
}

func TestTinyGapsWritten(t *testing.T) {
	// A gap of about 1e-12 m² (three disks all but meeting at the
	// circumcentre of their sites) is smaller than a rounding cell; grown
	// by the rounding reach it is written, holding its deepest point,
	// instead of vanishing from the layer while summary.json lists it.
	side := 10.0
	R := side / math.Sqrt(3)
	sites := []orb.Point{{0, 0}, {side, 0}, {side / 2, side * math.Sqrt(3) / 2}}
	area := region(t, []float64{-1, -1, side + 1, -1, side + 1, side, -1, side})
	for name, m := range map[string]Meta{
		"planar":     {Planar: true},
		"geographic": {ToLonLat: func(x, y float64) (float64, float64) { return 8 + x/76000, 47 + y/111000 }},
	} {
		t.Run(name, func(t *testing.T) {
			an := analyze(t, sites, area, R-1e-6)
			var tiny *coverage.Gap
			for i := range an.Gaps {
				if g := &an.Gaps[i]; !g.TouchesBoundary {
					tiny = g
				}
			}
			if tiny == nil || tiny.Area > 1e-9 {
				t.Fatalf("no tiny inner gap: %+v", an.Gaps)
			}
			s := newScene(an.Layout, an, m)
			written := collect(t, s.gapsLayer())
			if len(written) != len(an.Gaps) {
				t.Fatalf("%d gaps written, %d found", len(written), len(an.Gaps))
			}
			lon, lat := tiny.Deepest[0], tiny.Deepest[1]
			if m.ToLonLat != nil {
				lon, lat = m.ToLonLat(lon, lat)
			}
			ok := false
			for _, mp := range written {
				ok = ok || inside(mp, orb.Point{lon, lat}, true)
			}
			if !ok {
				t.Errorf("the tiny gap's deepest point %v is in no written gap", tiny.Deepest)
			}
		})
	}
}

func TestOffsetRing(t *testing.T) {
	// Hand-made rings: a square grows and shrinks by d on every side
	// (mitres at right angles), a thin triangle gets square caps at its
	// sharp corners, edges on the area's boundary stay, and a ring too
	// small to shrink is refused.
	area := region(t, square(10))
	ae := newAreaEdges(area)
	var sc offsetScratch
	ringArea := func(r orb.Ring) float64 { return planar.RingArea(planar.FlatRing(r)) }
	for _, c := range []struct {
		name     string
		r        orb.Ring
		d, want  float64 // want: the moved ring's area (NaN: refused)
		tol      float64
		distFrom float64 // every vertex at least this far from r (0: unchecked)
	}{
		{"square grows", closed(2, 2, 4, 2, 4, 4, 2, 4), 0.1, 2.2 * 2.2, 1e-12, 0.1},
		{"square shrinks", closed(2, 2, 4, 2, 4, 4, 2, 4), -0.1, 1.8 * 1.8, 1e-12, 0},
		{"on the area's edge", closed(0, 0, 4, 0, 4, 2, 0, 2), 0.1, 4.1 * 2.1, 1e-12, 0},
		{"area corner", closed(0, 0, 4, 0, 4, 2, 0, 2), -0.1, 3.9 * 1.9, 1e-12, 0},
		{"thin triangle capped", closed(2, 2, 6, 2.5, 2, 3), 0.01, math.NaN(), 0, 0.01},
		{"too small to shrink", closed(2, 2, 2.1, 2, 2.1, 2.1, 2, 2.1), -0.1, math.NaN(), 0, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			sc.out = sc.out[:0]
			g, ok := sc.offsetRing(c.r, c.d, ae)
			if c.name == "too small to shrink" {
				if ok {
					t.Errorf("moved to %v", g)
				}
				return
			}
			if !ok {
				t.Fatal("refused")
			}
			if g[0] != g[len(g)-1] {
				t.Error("not closed")
			}
			if a := ringArea(g); !math.IsNaN(c.want) && math.Abs(a-c.want) > c.tol {
				t.Errorf("area %.12g, want %.12g", a, c.want)
			}
			if c.distFrom > 0 {
				for _, v := range g[:len(g)-1] {
					dmin := math.Inf(1)
					for i := 0; i+1 < len(c.r); i++ {
						dmin = min(dmin, segDist(v, c.r[i], c.r[i+1]))
					}
					if dmin < c.distFrom*(1-1e-9) {
						t.Errorf("vertex %v only %g from the ring", v, dmin)
					}
				}
				if c.name == "thin triangle capped" && len(g) != 2*3+1 {
					t.Errorf("%d vertices, want a cap (2) at each sharp corner", len(g)-1)
				}
			}
		})
	}
}

func TestAreaEdgesFindEveryEdge(t *testing.T) {
	// Two points on an edge of a many-sided area (with a hole) find that
	// edge; a segment off the boundary finds none.
	var outer, hole []float64
	for k := range 37 {
		a := 2 * math.Pi * float64(k) / 37
		rr := 100 + 30*math.Sin(5*a)
		outer = append(outer, rr*math.Cos(a), rr*math.Sin(a))
		hole = append(hole, 10*math.Cos(-a), 10*math.Sin(-a))
	}
	area := region(t, outer, hole)
	ae := newAreaEdges(area)
	rng := rand.New(rand.NewPCG(3, 4))
	found := 0
	regionEdges(area, func(ax, ay, bx, by float64) {
		for range 20 {
			s, u := rng.Float64(), rng.Float64()
			e := ae.edgeOf(ax+s*(bx-ax), ay+s*(by-ay), ax+u*(bx-ax), ay+u*(by-ay))
			if e < 0 {
				t.Fatalf("no edge found for points on (%g, %g)-(%g, %g)", ax, ay, bx, by)
			}
			found++
		}
	})
	if e := ae.edgeOf(20, 20, 30, 25); e >= 0 {
		t.Errorf("a segment inside the area lies on edge %d", e)
	}
	if !ae.nearBox(orb.Bound{Min: orb.Point{95, -1}, Max: orb.Point{101, 1}}) || ae.nearBox(orb.Bound{Min: orb.Point{40, 40}, Max: orb.Point{41, 41}}) {
		t.Error("nearBox wrong beside the boundary or far from it")
	}
	if found != 74*20 {
		t.Errorf("%d segments checked", found)
	}
}

// TestOffsetRoundChunksAgree checks that moving and converting the rings
// of a feature in parallel chunks (offsetRoundChunks, used beyond
// parallelPoints) gives exactly what the ring-by-ring loop
// (offsetRoundRings) gives: on the covered part of 3000 sites (a hole per
// gap) with the gap outlines and two polygons whose exterior degenerates,
// grown and shrunk, planar and geographic.
func TestOffsetRoundChunksAgree(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	side := 2000.0
	var sites []orb.Point
	for range 3000 {
		sites = append(sites, orb.Point{side * rng.Float64(), side * rng.Float64()})
	}
	an := analyze(t, sites, region(t, square(side), []float64{900, 900, 900, 1100, 1100, 1100, 1100, 900}), 19)
	var in orb.MultiPolygon
	for _, p := range an.Layout.Covered(an.Gaps) {
		in = append(in, p)
	}
	for _, g := range an.Gaps {
		in = append(in, g.Outline...)
	}
	flat := orb.Ring{{5, 5}, {6, 5}, {5, 5}} // two distinct positions
	in = append(in, orb.Polygon{flat, in[len(in)-1][0]}, orb.Polygon{in[0][0], flat})
	if n := outlinePoints(in); n < 20000 {
		t.Fatalf("%d positions: not a test of both paths", n)
	}
	for name, m := range map[string]Meta{
		"planar":     {Planar: true},
		"geographic": {ToLonLat: func(x, y float64) (float64, float64) { return 8 + x/76000, 47 + y/111000 }},
	} {
		s := newScene(an.Layout, an, m)
		for _, d := range []float64{s.roundingReach(), -s.roundingReach()} {
			var serial, chunks polyBuf
			want, ok1 := s.offsetRoundRings(&serial, in, d, s.areaIndex())
			got, ok2 := s.offsetRoundChunks(&chunks, in, d, s.areaIndex())
			if ok1 != ok2 || !reflect.DeepEqual(want, got) {
				t.Errorf("%s, d %g: chunks give %d polygons (%v), ring by ring %d (%v)", name, d, len(got), ok2, len(want), ok1)
			}
			if !ok1 || len(want) < 100 {
				t.Errorf("%s, d %g: %d polygons (%v)", name, d, len(want), ok1)
			}
		}
	}
}
