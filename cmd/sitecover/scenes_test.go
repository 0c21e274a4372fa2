// End-to-end runs on scenes whose answers are known in closed form, in
// --planar metres, checked through summary.json.

package main

import (
	"fmt"
	"math"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// squareDiskArea is the area of a square of half-side h intersected with a
// disk of radius r at its centre, for h ≤ r ≤ h√2: the disk minus the four
// circular segments beyond the sides, each r²·acos(h/r) − h·√(r² − h²)
// (elementary geometry).
func squareDiskArea(h, r float64) float64 {
	seg := r*r*math.Acos(h/r) - h*math.Sqrt(r*r-h*h)
	return math.Pi*r*r - 4*seg
}

// lensArea is the area of the intersection of two disks of radius r whose
// centres are d apart (d ≤ 2r): 2r²·acos(d/2r) − (d/2)·√(4r² − d²).
func lensArea(r, d float64) float64 {
	return 2*r*r*math.Acos(d/(2*r)) - d/2*math.Sqrt(4*r*r-d*d)
}

func TestSingleSiteInSquare(t *testing.T) {
	// One site at the centre of a square of side a = 100 m. Closed form:
	// full-cover range a/√2 (the corners), uncovered area a² − πr² while
	// r ≤ a/2 (one gap around the disk), and four corner gaps of
	// (a² − squareDiskArea)/4 each for a/2 < r < a/√2.
	const a = 100.0
	dir := t.TempDir()
	sites := writeFile(t, dir, "site.csv", "name,x,y\ncentre,50,50\n")
	area := writeFile(t, dir, "square.geojson", squareGeoJSON(0, 0, a))

	out := filepath.Join(dir, "r40")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "40m", "--out", out, "--no-maps")
	s := readSummary(t, out)
	if s.Sites != 1 || len(s.Cells) != 1 {
		t.Fatalf("sites %d cells %d", s.Sites, len(s.Cells))
	}
	checkNear(t, "area_m2", s.AreaM2, a*a, 1e-9)
	checkNear(t, "range_m", s.RangeM, 40, 0)
	checkNear(t, "full_cover_range_m", s.FullCoverRangeM, a/math.Sqrt2, 1e-9)
	w := s.FullCoverWorstPoint
	if !(near(w[0], 0, 1e-6) || near(w[0], a, 1e-6)) || !(near(w[1], 0, 1e-6) || near(w[1], a, 1e-6)) {
		t.Errorf("full-cover worst point %v is not a corner", w)
	}
	unc := a*a - math.Pi*40*40
	checkNear(t, "uncovered_area_m2", s.UncoveredAreaM2, unc, 1e-6)
	checkNear(t, "covered_fraction", s.CoveredFraction, math.Pi*1600/(a*a), 1e-12)
	if len(s.Gaps) != 1 {
		t.Fatalf("%d gaps at 40 m, want 1", len(s.Gaps))
	}
	g := s.Gaps[0]
	checkNear(t, "gap area", g.AreaM2, unc, 1e-6)
	checkNear(t, "gap closing range", g.ClosingRangeM, a/math.Sqrt2, 1e-9)
	if !g.TouchesBoundary || g.ID != 1 {
		t.Errorf("gap %+v: want id 1 touching the boundary", g)
	}
	// Covered share πr²/a² for r ≤ a/2: p50 at r = a·√(0.5/π).
	checkNear(t, "p50", s.RangePercentiles.P50, a*math.Sqrt(0.5/math.Pi), 1e-6)
	// p90 and p95 lie in a/2 < r < a/√2: solve squareDiskArea(a/2, r) = f·a².
	for _, c := range []struct {
		f   float64
		got float64
	}{{0.90, s.RangePercentiles.P90}, {0.95, s.RangePercentiles.P95}, {0.99, s.RangePercentiles.P99}} {
		name := fmt.Sprintf("p%.0f", 100*c.f)
		t.Run(name, func(t *testing.T) {
			lo, hi := a/2, a/math.Sqrt2
			for i := 0; i < 200; i++ {
				mid := (lo + hi) / 2
				if squareDiskArea(a/2, mid) >= c.f*a*a {
					hi = mid
				} else {
					lo = mid
				}
			}
			checkNear(t, name, c.got, hi, 1e-6)
		})
	}
	checkNear(t, "cell area", s.Cells[0].AreaM2, a*a, 1e-9)
	checkNear(t, "cell farthest", s.Cells[0].FarthestM, a/math.Sqrt2, 1e-9)
	if s.Cells[0].Name != "centre" || s.Cells[0].Site != 0 {
		t.Errorf("cell %+v", s.Cells[0])
	}
	if len(s.Holes) != 0 || s.LinkRangeM != 0 {
		t.Errorf("one site: holes %v, link range %g", s.Holes, s.LinkRangeM)
	}

	out = filepath.Join(dir, "r60")
	mustRun(t, "gaps", "--planar", "--sites", sites, "--area", area, "--range", "60", "--out", out, "--no-maps")
	s = readSummary(t, out)
	corner := (a*a - squareDiskArea(a/2, 60)) / 4
	if len(s.Gaps) != 4 {
		t.Fatalf("%d gaps at 60 m, want 4 corners", len(s.Gaps))
	}
	for _, g := range s.Gaps {
		checkNear(t, fmt.Sprintf("corner gap %d area", g.ID), g.AreaM2, corner, 1e-6)
		checkNear(t, fmt.Sprintf("corner gap %d closing", g.ID), g.ClosingRangeM, a/math.Sqrt2, 1e-9)
		if !g.TouchesBoundary {
			t.Errorf("corner gap %d should touch the boundary", g.ID)
		}
	}
	checkNear(t, "uncovered at 60 m", s.UncoveredAreaM2, 4*corner, 1e-6)
}

// latticeCSV writes an n×n square lattice of spacing s from the origin.
func latticeCSV(n int, s float64) string {
	var b strings.Builder
	b.WriteString("id,x,y\n")
	for j := 0; j < n; j++ {
		for i := 0; i < n; i++ {
			fmt.Fprintf(&b, "g%d-%d,%g,%g\n", i, j, float64(i)*s, float64(j)*s)
		}
	}
	return b.String()
}

func TestSquareLattice(t *testing.T) {
	// A 5×5 square lattice of spacing s = 10 m covering the square [0, 40]².
	// Reference: Kershner, "The number of circles covering a set", Amer. J.
	// Math. 61 (1939): the square lattice of spacing s has covering radius
	// s/√2 (the cell centres). At s/2 < r < s/√2 each of the 16 lattice
	// squares keeps one enclosed gap of area s² − πr² + 2·lens(r, s), the
	// four quarter disks at its corners overlapping pairwise along its
	// sides and never three at once; boundary points are within s/2 of a
	// site, so no gap touches the boundary. Service areas: 100 m² inside,
	// 50 m² on the edges, 25 m² at the corners.
	const s, n = 10.0, 5
	dir := t.TempDir()
	sites := writeFile(t, dir, "grid.csv", latticeCSV(n, s))
	area := writeFile(t, dir, "square.geojson", squareGeoJSON(0, 0, s*(n-1)))
	out := filepath.Join(dir, "out")
	const r = 6.0
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "6m", "--out", out, "--no-maps")
	sum := readSummary(t, out)
	checkNear(t, "full_cover_range_m", sum.FullCoverRangeM, s/math.Sqrt2, 1e-9)
	perSquare := s*s - math.Pi*r*r + 2*lensArea(r, s)
	checkNear(t, "uncovered_area_m2", sum.UncoveredAreaM2, 16*perSquare, 1e-6)
	if len(sum.Gaps) != 16 {
		t.Fatalf("%d gaps, want 16", len(sum.Gaps))
	}
	for _, g := range sum.Gaps {
		checkNear(t, fmt.Sprintf("gap %d area", g.ID), g.AreaM2, perSquare, 1e-6)
		checkNear(t, fmt.Sprintf("gap %d closing", g.ID), g.ClosingRangeM, s/math.Sqrt2, 1e-9)
		if g.TouchesBoundary {
			t.Errorf("gap %d touches the boundary", g.ID)
		}
		// The deepest point is the centre of a lattice square.
		fx, fy := math.Mod(g.DeepestPoint[0], s), math.Mod(g.DeepestPoint[1], s)
		if !near(fx, s/2, 1e-6) || !near(fy, s/2, 1e-6) {
			t.Errorf("gap %d deepest point %v is not a square centre", g.ID, g.DeepestPoint)
		}
		if len(g.Sites) != 4 {
			t.Errorf("gap %d meets %d service areas, want 4", g.ID, len(g.Sites))
		}
	}
	// Holes of the union: each square's loop closes when neighbouring disks
	// touch (r = s/2) and fills at its circumradius s/√2.
	if len(sum.Holes) != 16 {
		t.Fatalf("%d holes, want 16", len(sum.Holes))
	}
	for _, h := range sum.Holes {
		checkNear(t, "hole birth", h.BirthM, s/2, 1e-9)
		checkNear(t, "hole death", h.DeathM, s/math.Sqrt2, 1e-9)
	}
	checkNear(t, "link_range_m", sum.LinkRangeM, s, 1e-12)
	if len(sum.Cells) != n*n {
		t.Fatalf("%d cells", len(sum.Cells))
	}
	var areas []float64
	total := 0.0
	for _, c := range sum.Cells {
		areas = append(areas, c.AreaM2)
		total += c.AreaM2
	}
	sort.Float64s(areas)
	want := func(i int) float64 {
		switch {
		case i < 4:
			return s * s / 4
		case i < 16:
			return s * s / 2
		}
		return s * s
	}
	for i, a := range areas {
		checkNear(t, fmt.Sprintf("cell area %d", i), a, want(i), 1e-9)
	}
	checkNear(t, "sum of cell areas", total, sum.AreaM2, 1e-9)

	// Below s/2 the uncovered part is one piece against the boundary:
	// the square minus 9 whole, 12 half and 4 quarter disks = 16πr².
	out = filepath.Join(dir, "r4")
	mustRun(t, "gaps", "--planar", "--sites", sites, "--area", area, "--range", "4", "--out", out, "--no-maps")
	sum = readSummary(t, out)
	if len(sum.Gaps) != 1 || !sum.Gaps[0].TouchesBoundary {
		t.Fatalf("at 4 m: %d gaps", len(sum.Gaps))
	}
	checkNear(t, "uncovered at 4 m", sum.UncoveredAreaM2, 1600-16*math.Pi*16, 1e-6)
}

func TestTriangularLatticeHexagon(t *testing.T) {
	// A triangular lattice of spacing s filling a regular hexagon of side
	// 3s whose corners are sites: the area is tiled by equilateral
	// triangles with sites at their corners, so the full-cover range is the
	// circumradius s/√3 (Kershner 1939: the thinnest covering, density
	// 2π/√27). Area (3√3/2)(3s)²; 1 + 3k(k+1) = 37 sites for k = 3.
	const s, k = 10.0, 3
	var b strings.Builder
	b.WriteString("x,y\n")
	count := 0
	for j := -k; j <= k; j++ {
		for i := -k; i <= k; i++ {
			if abs(i) > k || abs(j) > k || abs(i+j) > k {
				continue
			}
			fmt.Fprintf(&b, "%.17g,%.17g\n", s*(float64(i)+float64(j)/2), s*float64(j)*math.Sqrt(3)/2)
			count++
		}
	}
	hex := "{\"type\":\"Polygon\",\"coordinates\":[["
	for c := 0; c <= 6; c++ {
		ang := float64(c%6) * math.Pi / 3
		// Corners of the hexagon of side 3s are the lattice points 3s·e_c.
		x, y := 3*s*math.Cos(ang), 3*s*math.Sin(ang)
		if c > 0 {
			hex += ","
		}
		hex += fmt.Sprintf("[%.17g,%.17g]", x, y)
	}
	hex += "]]}"
	dir := t.TempDir()
	sites := writeFile(t, dir, "tri.csv", b.String())
	area := writeFile(t, dir, "hex.geojson", hex)
	out := filepath.Join(dir, "out")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--area", area, "--range", "5", "--out", out, "--no-maps")
	sum := readSummary(t, out)
	if sum.Sites != count || count != 37 {
		t.Fatalf("%d sites (%d written)", sum.Sites, count)
	}
	checkNear(t, "area_m2", sum.AreaM2, 1.5*math.Sqrt(3)*9*s*s, 1e-9)
	checkNear(t, "full_cover_range_m", sum.FullCoverRangeM, s/math.Sqrt(3), 1e-9)
	checkNear(t, "link_range_m", sum.LinkRangeM, s, 1e-9)
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}
