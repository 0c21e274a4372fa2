// Tests of ClipPowerCells: equal weights give ClipCells's output bit for
// bit; on unequal weights the clipped power cells partition the area, their
// edges lie on the power lines, every sample point lies in the cell of the
// vertex of smallest power (brute force), and the two-disk closed form.

package planar

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// cellsEqual reports whether two Cells values are identical array for array.
func cellsEqual(a, b *Cells) bool {
	return slices.Equal(a.SiteStart, b.SiteStart) && slices.Equal(a.PolyStart, b.PolyStart) &&
		slices.Equal(a.RingStart, b.RingStart) && slices.Equal(a.XY, b.XY) &&
		slices.Equal(a.EdgeSource, b.EdgeSource) && slices.Equal(a.Area, b.Area)
}

// TestClipPowerCellsEqualWeights: on the GEOS reference scenes and the
// partition scenes, equal weights (zero and a common range squared) give
// exactly ClipCells's arrays.
func TestClipPowerCellsEqualWeights(t *testing.T) {
	ref := clipLoadRef(t, "testdata/cells_ref.json")
	type scene struct {
		name string
		pts  []orb.Point
		reg  *Region
	}
	var scenes []scene
	for _, cs := range ref.Cells {
		reg, err := NewRegion(clipRefMultiPolygon(cs.Region))
		if err != nil {
			t.Fatal(err)
		}
		pts := make([]orb.Point, len(cs.Sites))
		for i, s := range cs.Sites {
			pts[i] = orb.Point{s[0], s[1]}
		}
		scenes = append(scenes, scene{"geos-" + cs.Name, pts, reg})
	}
	scenes = append(scenes,
		scene{"grid-900", sitegen.Grid(900), clipTestRegion(t, 300)},
		scene{"clustered-1500", sitegen.Clustered(1500, 13), clipTestRegion(t, 300)})
	for _, sc := range scenes {
		t.Run(sc.name, func(t *testing.T) {
			rt, err := TriangulateRegular(sc.pts, equalWeights(len(sc.pts), 150*150))
			if err != nil {
				t.Fatal(err)
			}
			want, err := ClipCells(&rt.Triangulation, sc.reg)
			if err != nil {
				t.Fatal(err)
			}
			for _, w := range [][]float64{nil, equalWeights(rt.NumVertices(), 0), rt.Weights} {
				got, err := ClipPowerCells(&rt.Triangulation, w, sc.reg)
				if err != nil {
					t.Fatal(err)
				}
				if !cellsEqual(got, want) {
					t.Fatalf("weights %v...: cells differ from ClipCells", w[:min(len(w), 1)])
				}
			}
			got, err := rt.PowerCells(sc.reg)
			if err != nil {
				t.Fatal(err)
			}
			if !cellsEqual(got, want) {
				t.Fatal("PowerCells differs from ClipCells")
			}
		})
	}
}

func equalWeights(n int, w float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = w
	}
	return out
}

// bruteSmallestPower returns the vertex of smallest power at (x, y) and the
// gap to the second smallest (for skipping near ties).
func bruteSmallestPower(tri *Triangulation, w []float64, x, y float64) (int32, float64) {
	best, b1, b2 := int32(-1), math.Inf(1), math.Inf(1)
	for v := 0; v < tri.NumVertices(); v++ {
		p := dist2(tri.Coords[2*v], tri.Coords[2*v+1], x, y) - w[v]
		switch {
		case p < b1:
			best, b1, b2 = int32(v), p, b1
		case p < b2:
			b2 = p
		}
	}
	return best, b2 - b1
}

// cellHolds reports whether the clipped cell of v contains (x, y) (even-odd
// over its rings).
func cellHolds(c *Cells, v int32, x, y float64) bool {
	in := false
	for p := c.SiteStart[v]; p < c.SiteStart[v+1]; p++ {
		for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
			xy, _ := c.Ring(int(k))
			if PointInRing(xy, x, y) > 0 {
				in = !in
			}
		}
	}
	return in
}

// TestClipPowerCellsWeighted checks clipped power cells on mixed ranges
// (the 40/60/120/150 m device mix): partition of the area, edges on power
// lines and label symmetry (clipCheckPowerCells), no anomalies, hidden
// inputs without a cell, and brute-force smallest power at sample points.
func TestClipPowerCellsWeighted(t *testing.T) {
	cases := []struct {
		name  string
		pts   []orb.Point
		scale float64 // spacing factor: 1 gives ~10 m (many hidden), 10 gives ~100 m
	}{
		{"uniform-800-dense", sitegen.Uniform(800, 21), 1},
		{"uniform-800", sitegen.Uniform(800, 22), 10},
		{"grid-400", sitegen.Grid(400), 10},
		{"grid-400-dense", sitegen.Grid(400), 1},
		{"clustered-1000", sitegen.Clustered(1000, 23), 10},
		{"lattice-20x20", sitegen.TriangularLattice(20, 20, 100), 1},
		{"collinear", []orb.Point{{0, 0}, {100, 10}, {200, 20}, {300, 30}, {400, 40}}, 1},
		{"one", []orb.Point{{37, 41}}, 1},
	}
	for ci, cs := range cases {
		t.Run(cs.name, func(t *testing.T) {
			pts := scaled(cs.pts, cs.scale)
			w := rangeWeights(len(pts), uint64(ci)+7)
			rt := mustRegular(t, pts, w)
			b := orb.MultiPoint(pts).Bound()
			side := math.Max(300, math.Max(b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]))
			reg := clipTestRegion(t, side)
			t.Logf("%d points, %d hidden", len(pts), len(rt.Hidden))
			for _, workers := range []int{1, 2} {
				cells, st, err := clipCells(&rt.Triangulation, rt.Weights, reg, workers)
				if err != nil {
					t.Fatal(err)
				}
				if st.anomalies != 0 {
					t.Errorf("workers %d: %d anomalies", workers, st.anomalies)
				}
				clipCheckPowerCells(t, &rt.Triangulation, rt.Weights, reg, cells)
				if workers == 2 {
					continue
				}
				r := rand.New(rand.NewPCG(uint64(ci), 99))
				bb := reg.Bound()
				for q := 0; q < 400; q++ {
					x := bb.Min[0] + r.Float64()*(bb.Max[0]-bb.Min[0])
					y := bb.Min[1] + r.Float64()*(bb.Max[1]-bb.Min[1])
					if !reg.Contains(x, y) {
						continue
					}
					v, gap := bruteSmallestPower(&rt.Triangulation, rt.Weights, x, y)
					if gap < 1e-6*side*side {
						continue
					}
					if !cellHolds(cells, v, x, y) {
						t.Errorf("(%g, %g): smallest power at vertex %d, not in its clipped cell", x, y, v)
					}
				}
			}
		})
	}
}

// TestClipPowerCellsTwoDisks: closed form. Disks of radii a and b at
// distance d have their power line at (d² + a² − b²)/(2d) from the first
// centre (radical axis; Aurenhammer, SIAM J. Comput. 16, 1987), so in a
// square area the two cells are rectangles of known area.
func TestClipPowerCellsTwoDisks(t *testing.T) {
	for _, cs := range []struct {
		name    string
		a, b, d float64
	}{
		{"equal", 50, 50, 100},
		{"unequal", 150, 40, 120},
		{"line-beyond-second", 150, 40, 60},
	} {
		t.Run(cs.name, func(t *testing.T) {
			reg, err := NewRegion(orb.MultiPolygon{{{{-500, -200}, {500, -200}, {500, 200}, {-500, 200}}}})
			if err != nil {
				t.Fatal(err)
			}
			rt := mustRegular(t, []orb.Point{{0, 0}, {cs.d, 0}}, []float64{cs.a * cs.a, cs.b * cs.b})
			cells, err := rt.PowerCells(reg)
			if err != nil {
				t.Fatal(err)
			}
			x := (cs.d*cs.d + cs.a*cs.a - cs.b*cs.b) / (2 * cs.d)
			want := []float64{(x + 500) * 400, (500 - x) * 400}
			for v := 0; v < 2; v++ {
				if got := cells.Area[rt.Vertex[v]]; math.Abs(got-want[v]) > 1e-9*want[v] {
					t.Errorf("cell %d area %.12g, closed form %.12g", v, got, want[v])
				}
			}
		})
	}
}

// TestNearestPower compares NearestPower with the brute-force smallest
// power at random points, on random, lattice and collinear layouts.
func TestNearestPower(t *testing.T) {
	cases := []struct {
		name string
		pts  []orb.Point
	}{
		{"uniform-2000", scaled(sitegen.Uniform(2000, 31), 10)},
		{"lattice-15x15", sitegen.TriangularLattice(15, 15, 100)},
		{"collinear", []orb.Point{{0, 0}, {100, 10}, {200, 20}, {300, 30}, {400, 40}}},
	}
	for ci, cs := range cases {
		t.Run(cs.name, func(t *testing.T) {
			rt := mustRegular(t, cs.pts, rangeWeights(len(cs.pts), uint64(ci)+40))
			b := orb.MultiPoint(cs.pts).Bound()
			r := rand.New(rand.NewPCG(uint64(ci), 5))
			hint := int32(-1)
			for q := 0; q < 2000; q++ {
				x := b.Min[0] - 50 + r.Float64()*(b.Max[0]-b.Min[0]+100)
				y := b.Min[1] - 50 + r.Float64()*(b.Max[1]-b.Min[1]+100)
				want, gap := bruteSmallestPower(&rt.Triangulation, rt.Weights, x, y)
				got := rt.NearestPower(x, y, hint)
				hint = got
				if got != want && gap > 1e-6 {
					t.Fatalf("(%g, %g): vertex %d, brute force %d", x, y, got, want)
				}
			}
		})
	}
}
