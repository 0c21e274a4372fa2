// Tests of Triangulate and the triangulation queries.
//
// External references:
//   - Qhull (scipy.spatial.Delaunay, Debian python3-scipy): triangle sets of
//     random general-position inputs, written by testdata/ref_delaunay.py
//     into testdata/delaunay_ref.json and verified there with exact rational
//     arithmetic; re-run live when SITECOVER_LIVE=1.
//   - Euler's formula for a triangulated disk: 2n − 2 − h triangles for n
//     vertices of which h on the convex hull (common practice).
//   - The empty-circle definition of the Delaunay triangulation, checked
//     exactly by Validate (Delaunay 1934; Lawson's local criterion).
//   - Brute force over all vertices or triangles for Nearest, Locate and
//     Neighbors.

package planar

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

type refDelaunay struct {
	Source string `json:"source"`
	Seed   int64  `json:"seed"`
	Cases  []struct {
		Name      string       `json:"name"`
		Points    [][2]float64 `json:"points"`
		Triangles [][3]int32   `json:"triangles"`
	} `json:"cases"`
}

// inputTriangles returns the triangles of t as sorted input-index triples,
// sorted.
func inputTriangles(t *Triangulation) [][3]int32 {
	out := make([][3]int32, 0, t.NumTriangles())
	for k := 0; k < len(t.Triangles); k += 3 {
		tr := [3]int32{t.Source[t.Triangles[k]], t.Source[t.Triangles[k+1]], t.Source[t.Triangles[k+2]]}
		slices.Sort(tr[:])
		out = append(out, tr)
	}
	slices.SortFunc(out, cmpTriple)
	return out
}

func cmpTriple(a, b [3]int32) int {
	for i := range a {
		if a[i] != b[i] {
			return int(a[i]) - int(b[i])
		}
	}
	return 0
}

func checkAgainstQhull(t *testing.T, path string) {
	t.Helper()
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var ref refDelaunay
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	if len(ref.Cases) == 0 {
		t.Fatalf("%s: no cases", path)
	}
	for _, c := range ref.Cases {
		pts := make([]orb.Point, len(c.Points))
		for i, p := range c.Points {
			pts[i] = orb.Point{p[0], p[1]}
		}
		tr, err := Triangulate(pts)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		if err := tr.Validate(); err != nil {
			t.Errorf("%s: %v", c.Name, err)
		}
		want := make([][3]int32, len(c.Triangles))
		for k, tri := range c.Triangles {
			want[k] = tri
			slices.Sort(want[k][:])
		}
		slices.SortFunc(want, cmpTriple)
		got := inputTriangles(tr)
		// Reference: Qhull via scipy.spatial.Delaunay (Debian python3-scipy).
		if !reflect.DeepEqual(got, want) {
			missing, extra := 0, 0
			for _, w := range want {
				if _, ok := slices.BinarySearchFunc(got, w, cmpTriple); !ok {
					missing++
				}
			}
			for _, g := range got {
				if _, ok := slices.BinarySearchFunc(want, g, cmpTriple); !ok {
					extra++
				}
			}
			t.Errorf("%s: %d triangles, Qhull %d; %d of Qhull's missing, %d extra", c.Name, len(got), len(want), missing, extra)
		}
	}
}

func TestTriangulateQhullReference(t *testing.T) {
	checkAgainstQhull(t, filepath.Join("testdata", "delaunay_ref.json"))
}

func TestTriangulateQhullLive(t *testing.T) {
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skip("set SITECOVER_LIVE=1 to re-run testdata/ref_delaunay.py (Qhull via /usr/bin/python3 scipy) on fresh inputs")
	}
	out := filepath.Join(t.TempDir(), "delaunay_live.json")
	seed := fmt.Sprint(rand.Int64N(1 << 40))
	cmd := exec.Command("/usr/bin/python3", filepath.Join("testdata", "ref_delaunay.py"), "--small", "--seed", seed, "--out", out)
	if msg, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("ref_delaunay.py --seed %s: %v\n%s", seed, err, msg)
	}
	t.Logf("seed %s", seed)
	checkAgainstQhull(t, out)
}

// checkTriangulation validates t and checks the triangle count against
// Euler's formula.
func checkTriangulation(t *testing.T, name string, tr *Triangulation) {
	t.Helper()
	if err := tr.Validate(); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	n, h := tr.NumVertices(), len(tr.Hull)
	// Reference: Euler's formula for a triangulated disk, 2n-2-h triangles
	// with every hull point counted (common practice).
	if tr.NumTriangles() > 0 && tr.NumTriangles() != 2*n-2-h {
		t.Errorf("%s: %d triangles, Euler 2n-2-h = %d", name, tr.NumTriangles(), 2*n-2-h)
	}
}

func ring(n int, r, cx, cy float64) []orb.Point {
	pts := make([]orb.Point, n)
	for i := range pts {
		a := 2 * math.Pi * float64(i) / float64(n)
		pts[i] = orb.Point{cx + r*math.Cos(a), cy + r*math.Sin(a)}
	}
	return pts
}

// exactRing returns the 12 integer points at distance 5 from the origin:
// (±3, ±4), (±4, ±3), (0, ±5), (±5, 0), exactly cocircular.
func exactRing() []orb.Point {
	var pts []orb.Point
	for _, p := range [][2]float64{{3, 4}, {4, 3}, {5, 0}, {4, -3}, {3, -4}, {0, -5}, {-3, -4}, {-4, -3}, {-5, 0}, {-4, 3}, {-3, 4}, {0, 5}} {
		pts = append(pts, orb.Point{p[0], p[1]})
	}
	return pts
}

func offset(pts []orb.Point, dx, dy float64) []orb.Point {
	out := make([]orb.Point, len(pts))
	for i, p := range pts {
		out[i] = orb.Point{p[0] + dx, p[1] + dy}
	}
	return out
}

func shuffled(pts []orb.Point, seed uint64) []orb.Point {
	out := slices.Clone(pts)
	r := rand.New(rand.NewPCG(seed, 3))
	r.Shuffle(len(out), func(i, j int) { out[i], out[j] = out[j], out[i] })
	return out
}

func degenerateCases() []struct {
	name string
	pts  []orb.Point
} {
	rect := []orb.Point{}
	for j := 0; j < 7; j++ {
		for i := 0; i < 31; i++ {
			rect = append(rect, orb.Point{float64(i) * 2.5, float64(j) * 2.5})
		}
	}
	nearDup := sitegen.Uniform(300, 5)
	for i := 0; i < 100; i++ {
		p := nearDup[i]
		nearDup = append(nearDup, orb.Point{p[0] + 1e-12, p[1]}, orb.Point{p[0], p[1] - 1e-12})
	}
	withCentre := append(exactRing(), orb.Point{0, 0}, orb.Point{0, 10}, orb.Point{10, 0})
	concentric := append(ring(64, 100, 0, 0), ring(64, 50, 0, 0)...)
	concentric = append(concentric, ring(16, 10, 0, 0)...)
	return []struct {
		name string
		pts  []orb.Point
	}{
		{"grid-4", sitegen.Grid(4)},
		{"grid-9", sitegen.Grid(9)},
		{"grid-100", sitegen.Grid(100)},
		{"grid-2500", sitegen.Grid(2500)},
		{"grid-2500-shuffled", shuffled(sitegen.Grid(2500), 1)},
		{"grid-rect-31x7", rect},
		{"grid-offset-5e6", offset(sitegen.Grid(2500), 5e6, 5e6)},
		{"lattice-30x30", sitegen.TriangularLattice(30, 30, 10)},
		{"lattice-offset", offset(sitegen.TriangularLattice(20, 40, 10), 5e6, -5e6)},
		{"ring-8", ring(8, 10, 0, 0)},
		{"ring-1000", ring(1000, 500, 0, 0)},
		{"ring-offset", ring(500, 300, 5e6, 5e6)},
		{"rings-concentric", concentric},
		{"ring-exact-12", exactRing()},
		{"ring-exact-centre", withCentre},
		{"near-duplicates-1e-12", nearDup},
		{"uniform-offset-5e6", offset(sitegen.Uniform(3000, 8), 5e6, 5e6)},
		{"clustered-2000", sitegen.Clustered(2000, 4)},
	}
}

func TestTriangulateDegenerate(t *testing.T) {
	for _, c := range degenerateCases() {
		tr, err := Triangulate(c.pts)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		// Reference: the exact empty-circle property (Validate) and Euler's
		// formula.
		checkTriangulation(t, c.name, tr)
		if tr.NumVertices() != len(c.pts) {
			t.Errorf("%s: %d vertices for %d distinct points", c.name, tr.NumVertices(), len(c.pts))
		}
		// Determinism: a second run gives the identical structure.
		tr2, _ := Triangulate(c.pts)
		if !reflect.DeepEqual(tr, tr2) {
			t.Errorf("%s: two runs differ", c.name)
		}
	}
}

func TestTriangulateGridCounts(t *testing.T) {
	// A k×k grid has 4(k−1) hull points (all boundary points, collinear
	// ones included) and, by Euler's formula, 2(k−1)² triangles: two per
	// unit square (common practice).
	for _, k := range []int{2, 3, 5, 10, 37} {
		tr, err := Triangulate(sitegen.Grid(k * k))
		if err != nil {
			t.Fatal(err)
		}
		if len(tr.Hull) != 4*(k-1) || tr.NumTriangles() != 2*(k-1)*(k-1) {
			t.Errorf("grid %dx%d: hull %d, triangles %d; want %d, %d", k, k, len(tr.Hull), tr.NumTriangles(), 4*(k-1), 2*(k-1)*(k-1))
		}
	}
}

func TestTriangulateTranslationInvariant(t *testing.T) {
	// Offsetting a grid by 5e6 m is exact in float64, and exact predicates
	// are translation invariant, so the triangulation must be identical.
	a, _ := Triangulate(sitegen.Grid(900))
	b, _ := Triangulate(offset(sitegen.Grid(900), 5e6, 5e6))
	if !slices.Equal(a.Triangles, b.Triangles) || !slices.Equal(a.Hull, b.Hull) {
		t.Error("grid offset by 5e6 m triangulates differently")
	}
}

func TestTriangulateDuplicates(t *testing.T) {
	base := sitegen.Uniform(500, 11)
	pts := slices.Clone(base)
	r := rand.New(rand.NewPCG(12, 12))
	for k := 0; k < 300; k++ {
		pts = append(pts, base[r.IntN(len(base))])
	}
	pts = shuffled(pts, 13)
	tr, err := Triangulate(pts)
	if err != nil {
		t.Fatal(err)
	}
	checkTriangulation(t, "duplicates", tr)
	if tr.NumVertices() != 500 {
		t.Fatalf("%d vertices, want 500 distinct", tr.NumVertices())
	}
	// Vertex/Source agree with a brute-force grouping by equal coordinates.
	first := map[orb.Point]int32{}
	for i, p := range pts {
		if _, ok := first[p]; !ok {
			first[p] = int32(i)
		}
	}
	for i, p := range pts {
		v := tr.Vertex[i]
		if tr.Source[v] != first[p] {
			t.Fatalf("input %d: source %d, want first occurrence %d", i, tr.Source[v], first[p])
		}
		if tr.Coords[2*v] != p[0] || tr.Coords[2*v+1] != p[1] {
			t.Fatalf("input %d: vertex %d has other coordinates", i, v)
		}
	}
	for v := 1; v < len(tr.Source); v++ {
		if tr.Source[v] <= tr.Source[v-1] {
			t.Fatal("vertices not numbered in order of first appearance")
		}
	}
	groups := tr.Duplicates()
	count := map[orb.Point]int{}
	for _, p := range pts {
		count[p]++
	}
	wantGroups := 0
	for _, c := range count {
		if c > 1 {
			wantGroups++
		}
	}
	if len(groups) != wantGroups {
		t.Fatalf("%d duplicate groups, want %d", len(groups), wantGroups)
	}
	for _, g := range groups {
		if len(g) != count[pts[g[0]]] || !slices.IsSorted(g) {
			t.Fatalf("group %v wrong", g)
		}
		for _, i := range g {
			if pts[i] != pts[g[0]] {
				t.Fatalf("group %v mixes points", g)
			}
		}
	}
	if d := mustTriangulate(t, base).Duplicates(); len(d) != 0 {
		t.Errorf("distinct points report duplicates %v", d)
	}
}

func mustTriangulate(t *testing.T, pts []orb.Point) *Triangulation {
	t.Helper()
	tr, err := Triangulate(pts)
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

func TestTriangulateSmallAndCollinear(t *testing.T) {
	cases := []struct {
		name string
		pts  []orb.Point
		hull []int32 // expected Hull (vertex numbers), nil to skip
		nv   int
	}{
		{"empty", nil, []int32{}, 0},
		{"one", []orb.Point{{1, 2}}, []int32{0}, 1},
		{"two", []orb.Point{{3, 0}, {1, 0}}, []int32{1, 0}, 2},
		{"two-equal", []orb.Point{{3, 0}, {3, 0}}, []int32{0}, 1},
		{"all-equal", []orb.Point{{3, 1}, {3, 1}, {3, 1}, {3, 1}}, []int32{0}, 1},
		{"three-collinear", []orb.Point{{2, 2}, {0, 0}, {1, 1}}, []int32{1, 2, 0}, 3},
		{"horizontal", []orb.Point{{5, 1}, {-2, 1}, {0, 1}, {9, 1}, {0, 1}}, []int32{1, 2, 0, 3}, 4},
		{"vertical", []orb.Point{{0, 5}, {0, -1}, {0, 3}}, []int32{1, 2, 0}, 3},
		{"three", []orb.Point{{0, 0}, {0, 1}, {1, 0}}, nil, 3},
		{"three-plus-dup", []orb.Point{{0, 0}, {0, 1}, {1, 0}, {0, 1}}, nil, 3},
	}
	// Long exactly collinear sets: horizontal, diagonal and a random
	// integer direction, offset far from the origin.
	for _, dir := range [][2]float64{{1, 0}, {1, 1}, {3, -7}, {0, 1}} {
		var pts []orb.Point
		for _, k := range rand.New(rand.NewPCG(1, 2)).Perm(200) {
			pts = append(pts, orb.Point{5e6 + dir[0]*float64(k), 5e6 + dir[1]*float64(k)})
		}
		cases = append(cases, struct {
			name string
			pts  []orb.Point
			hull []int32
			nv   int
		}{fmt.Sprintf("line-%v", dir), pts, nil, 200})
	}
	for _, c := range cases {
		tr, err := Triangulate(c.pts)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		checkTriangulation(t, c.name, tr)
		if tr.NumVertices() != c.nv {
			t.Errorf("%s: %d vertices, want %d", c.name, tr.NumVertices(), c.nv)
		}
		if c.hull != nil && !slices.Equal(tr.Hull, c.hull) {
			t.Errorf("%s: hull %v, want %v", c.name, tr.Hull, c.hull)
		}
		if c.nv >= 3 && c.hull == nil && strings.HasPrefix(c.name, "line") {
			if tr.NumTriangles() != 0 || len(tr.Hull) != c.nv {
				t.Errorf("%s: collinear input gave %d triangles, hull %d", c.name, tr.NumTriangles(), len(tr.Hull))
			}
		}
		for _, e := range tr.Inedge {
			if tr.NumTriangles() == 0 && e != -1 {
				t.Errorf("%s: Inedge %d without triangles", c.name, e)
			}
		}
	}
}

func TestTriangulateNonFinite(t *testing.T) {
	cases := []struct {
		pts  []orb.Point
		want string
	}{
		{[]orb.Point{{0, 0}, {1, math.NaN()}}, "point 1: y coordinate is NaN"},
		{[]orb.Point{{0, 0}, {1, 1}, {2, 0}, {math.Inf(1), 0}}, "point 3: x coordinate is infinite"},
		{[]orb.Point{{math.Inf(-1), math.NaN()}}, "point 0: x coordinate is infinite"},
	}
	for _, c := range cases {
		_, err := Triangulate(c.pts)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("error %v, want %q", err, c.want)
		}
	}
}

func TestHilbertCurve(t *testing.T) {
	// The curve of order 16 restricted to the top 4 bits of each axis
	// visits every cell of a 16×16 grid once, each step to an edge
	// neighbour (the defining property of the Hilbert curve; Hilbert 1891).
	const k = 4
	cell := make(map[uint32][2]int)
	for x := 0; x < 1<<k; x++ {
		for y := 0; y < 1<<k; y++ {
			h := hilbert16(uint32(x)<<(16-k), uint32(y)<<(16-k)) >> (32 - 2*k)
			if _, dup := cell[h]; dup {
				t.Fatalf("index %d repeated", h)
			}
			cell[h] = [2]int{x, y}
		}
	}
	if got := cell[0]; got != [2]int{0, 0} {
		t.Errorf("curve starts at %v, want (0, 0)", got)
	}
	for h := uint32(1); h < 1<<(2*k); h++ {
		a, b := cell[h-1], cell[h]
		if d := abs(a[0]-b[0]) + abs(a[1]-b[1]); d != 1 {
			t.Fatalf("step %d: %v to %v is not to a neighbour", h, a, b)
		}
	}
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

// bruteNearest returns the smallest vertex index at minimum exact distance:
// a float scan, then exact rational comparison among the candidates within
// a relative 1e-9 of the float minimum.
func bruteNearest(tr *Triangulation, x, y float64) int32 {
	m := tr.NumVertices()
	if m == 0 {
		return -1
	}
	d := make([]float64, m)
	dmin := math.Inf(1)
	for v := 0; v < m; v++ {
		d[v] = math.Hypot(tr.Coords[2*v]-x, tr.Coords[2*v+1]-y)
		dmin = math.Min(dmin, d[v])
	}
	best := int32(-1)
	for v := int32(0); v < int32(m); v++ {
		if d[v] > dmin*(1+1e-9) {
			continue
		}
		if best < 0 || cmpDistExact(x, y, tr.Coords[2*v], tr.Coords[2*v+1], tr.Coords[2*best], tr.Coords[2*best+1]) < 0 {
			best = v
		}
	}
	return best
}

func containsExact(tr *Triangulation, k int32, x, y float64) bool {
	for e := 3 * k; e < 3*k+3; e++ {
		a, b := tr.Triangles[e], tr.Triangles[NextHalfedge(e)]
		if Orient2D(tr.Coords[2*a], tr.Coords[2*a+1], tr.Coords[2*b], tr.Coords[2*b+1], x, y) < 0 {
			return false
		}
	}
	return true
}

func queryPoints(tr *Triangulation, n int, seed uint64) [][2]float64 {
	r := rand.New(rand.NewPCG(seed, 9))
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for v := 0; v < tr.NumVertices(); v++ {
		minX, maxX = math.Min(minX, tr.Coords[2*v]), math.Max(maxX, tr.Coords[2*v])
		minY, maxY = math.Min(minY, tr.Coords[2*v+1]), math.Max(maxY, tr.Coords[2*v+1])
	}
	w, h := maxX-minX, maxY-minY
	var q [][2]float64
	for i := 0; i < n; i++ {
		// 20% beyond the bounding box on each side: some queries outside.
		q = append(q, [2]float64{minX - 0.2*w + 1.4*w*r.Float64(), minY - 0.2*h + 1.4*h*r.Float64()})
	}
	// Vertices, edge midpoints and centroids: ties and boundary cases.
	for k := 0; k < 60 && 3*k < len(tr.Triangles); k++ {
		e := int32(r.IntN(len(tr.Triangles)))
		a, b, c := tr.Triangles[e], tr.Triangles[NextHalfedge(e)], tr.Triangles[PrevHalfedge(e)]
		ax, ay := tr.Coords[2*a], tr.Coords[2*a+1]
		bx, by := tr.Coords[2*b], tr.Coords[2*b+1]
		cx, cy := tr.Coords[2*c], tr.Coords[2*c+1]
		q = append(q, [2]float64{ax, ay}, [2]float64{(ax + bx) / 2, (ay + by) / 2}, [2]float64{(ax + bx + cx) / 3, (ay + by + cy) / 3})
	}
	return q
}

func TestLocateNearestBruteForce(t *testing.T) {
	cases := []struct {
		name string
		pts  []orb.Point
	}{
		{"uniform-2000", sitegen.Uniform(2000, 21)},
		{"grid-900", sitegen.Grid(900)},
		{"clustered-1500", sitegen.Clustered(1500, 22)},
		{"ring-exact", exactRing()},
		{"lattice-offset", offset(sitegen.TriangularLattice(15, 15, 10), 5e6, 5e6)},
		{"line", []orb.Point{{0, 0}, {10, 5}, {4, 2}, {-6, -3}, {2, 1}}},
		{"two", []orb.Point{{0, 0}, {1, 0}}},
		{"one", []orb.Point{{3, 3}}},
	}
	for _, c := range cases {
		tr := mustTriangulate(t, c.pts)
		qs := queryPoints(tr, 400, 23)
		if c.name == "grid-900" {
			// Cell centres are equidistant from four vertices.
			for j := 0; j < 10; j++ {
				qs = append(qs, [2]float64{float64(j)*10 + 5, float64(j)*10 + 5})
			}
		}
		prev := int32(-1)
		for _, q := range qs {
			x, y := q[0], q[1]
			// Reference: brute force over all vertices, exact distances.
			want := bruteNearest(tr, x, y)
			for _, hint := range []int32{-1, 0, prev, int32(tr.NumVertices() - 1)} {
				if got := tr.Nearest(x, y, hint); got != want {
					t.Fatalf("%s: Nearest(%v, %v, hint %d) = %d, brute force %d", c.name, x, y, hint, got, want)
				}
			}
			prev = want
			// Reference: brute force over all triangles, exact Orient2D.
			inside := false
			for k := int32(0); k < int32(tr.NumTriangles()); k++ {
				if containsExact(tr, k, x, y) {
					inside = true
					break
				}
			}
			for _, hint := range []int32{-1, 0, int32(tr.NumTriangles() - 1)} {
				got := tr.Locate(x, y, hint)
				if !inside && got != -1 {
					t.Fatalf("%s: Locate(%v, %v) = %d for a point outside the hull", c.name, x, y, got)
				}
				if inside && (got < 0 || !containsExact(tr, got, x, y)) {
					t.Fatalf("%s: Locate(%v, %v) = %d, which does not contain it", c.name, x, y, got)
				}
			}
		}
		// NearestMany agrees with Nearest, in any chunking.
		xy := make([]float64, 0, 2*len(qs))
		for _, q := range qs {
			xy = append(xy, q[0], q[1])
		}
		for len(xy) < 2*10000 {
			xy = append(xy, xy...)
		}
		out := make([]int32, len(xy)/2)
		tr.NearestMany(xy, out)
		for k := range out {
			if want := tr.Nearest(xy[2*k], xy[2*k+1], -1); out[k] != want {
				t.Fatalf("%s: NearestMany[%d] = %d, Nearest %d", c.name, k, out[k], want)
			}
		}
	}
	var empty Triangulation
	if empty.Nearest(0, 0, -1) != -1 || empty.Locate(0, 0, -1) != -1 {
		t.Error("empty triangulation answers a query")
	}
	tr := mustTriangulate(t, sitegen.Uniform(50, 1))
	if tr.Nearest(math.NaN(), 0, -1) != -1 || tr.Locate(0, math.Inf(1), -1) != -1 {
		t.Error("non-finite query answered")
	}
}

func TestNeighborsBruteForce(t *testing.T) {
	for _, pts := range [][]orb.Point{sitegen.Uniform(700, 31), sitegen.Grid(400), exactRing()} {
		tr := mustTriangulate(t, pts)
		// Reference: brute force, every pair of vertices of a triangle.
		adj := make([]map[int32]bool, tr.NumVertices())
		for v := range adj {
			adj[v] = map[int32]bool{}
		}
		for e := 0; e < len(tr.Triangles); e++ {
			a, b := tr.Triangles[e], tr.Triangles[NextHalfedge(int32(e))]
			adj[a][b], adj[b][a] = true, true
		}
		onHull := map[int32]int{}
		for k, v := range tr.Hull {
			onHull[v] = k
		}
		var buf []int32
		for v := int32(0); v < int32(tr.NumVertices()); v++ {
			buf = tr.Neighbors(v, buf)
			if len(buf) != len(adj[v]) {
				t.Fatalf("vertex %d: %d neighbours, brute force %d", v, len(buf), len(adj[v]))
			}
			for _, u := range buf {
				if !adj[v][u] {
					t.Fatalf("vertex %d: %d is not a neighbour", v, u)
				}
			}
			// Counter-clockwise: consecutive neighbours turn left around v
			// (for a hull vertex, from the next hull vertex to the previous).
			vx, vy := tr.Coords[2*v], tr.Coords[2*v+1]
			for k := 0; k+1 < len(buf); k++ {
				a, b := buf[k], buf[k+1]
				if Orient2D(vx, vy, tr.Coords[2*a], tr.Coords[2*a+1], tr.Coords[2*b], tr.Coords[2*b+1]) <= 0 {
					t.Fatalf("vertex %d: neighbours %v not counter-clockwise", v, buf)
				}
			}
			if k, ok := onHull[v]; ok {
				h := tr.Hull
				if buf[0] != h[(k+1)%len(h)] || buf[len(buf)-1] != h[(k+len(h)-1)%len(h)] {
					t.Fatalf("hull vertex %d: neighbours %v do not run from next to previous hull vertex", v, buf)
				}
			}
		}
	}
	line := mustTriangulate(t, []orb.Point{{0, 0}, {2, 0}, {1, 0}})
	if got := line.Neighbors(2, nil); !slices.Equal(got, []int32{0, 1}) {
		t.Errorf("collinear middle neighbours %v", got)
	}
	if got := line.Neighbors(1, nil); !slices.Equal(got, []int32{2}) {
		t.Errorf("collinear end neighbours %v", got)
	}
}

func TestCircumcenters(t *testing.T) {
	tr := mustTriangulate(t, offset(sitegen.Uniform(1000, 41), 5e6, 5e6))
	cc := tr.Circumcenters()
	if len(cc) != 2*tr.NumTriangles() {
		t.Fatalf("%d values for %d triangles", len(cc), tr.NumTriangles())
	}
	// Reference: the circumcentre is equidistant from the three vertices
	// (definition); distances compared in exact arithmetic to a relative
	// 1e-6 (the float circumcentre carries rounding of the offset
	// coordinates).
	for k := 0; k < tr.NumTriangles(); k++ {
		x, y := cc[2*k], cc[2*k+1]
		var d [3]float64
		for j := 0; j < 3; j++ {
			v := tr.Triangles[3*k+j]
			d[j] = math.Hypot(tr.Coords[2*v]-x, tr.Coords[2*v+1]-y)
		}
		if math.Abs(d[0]-d[1]) > 1e-6*d[0] || math.Abs(d[0]-d[2]) > 1e-6*d[0] {
			t.Fatalf("triangle %d: distances %v", k, d)
		}
	}
	// A right triangle's circumcentre is the midpoint of its hypotenuse
	// (Thales).
	right := mustTriangulate(t, []orb.Point{{0, 0}, {4, 0}, {0, 3}})
	if c := right.Circumcenters(); c[0] != 2 || c[1] != 1.5 {
		t.Errorf("right triangle circumcentre %v, want (2, 1.5)", c)
	}
}

func TestValidateRejects(t *testing.T) {
	// A square split along the wrong diagonal of a non-cocircular
	// quadrilateral is not Delaunay: Validate must say so.
	pts := []orb.Point{{0, 0}, {10, 0}, {11, 9}, {0, 10}}
	tr := mustTriangulate(t, pts)
	if err := tr.Validate(); err != nil {
		t.Fatal(err)
	}
	bad := *tr
	bad.Triangles = slices.Clone(tr.Triangles)
	bad.Halfedges = slices.Clone(tr.Halfedges)
	// Flip the interior edge by hand.
	var e int32 = -1
	for k, h := range bad.Halfedges {
		if h >= 0 {
			e = int32(k)
			break
		}
	}
	h := bad.Halfedges[e]
	flipForTest(&bad, e, h)
	if err := bad.Validate(); err == nil || !strings.Contains(err.Error(), "circumcircle") {
		t.Errorf("flipped quadrilateral: Validate = %v", err)
	}
	broken := *tr
	broken.Halfedges = slices.Clone(tr.Halfedges)
	broken.Halfedges[e] = -1
	if broken.Validate() == nil {
		t.Error("Validate accepts a broken twin")
	}
	for _, c := range degenerateCases()[:3] {
		tr := mustTriangulate(t, c.pts)
		if tr.NumTriangles() < 2 {
			continue
		}
		b := *tr
		b.Hull = slices.Clone(tr.Hull)
		b.Hull[0], b.Hull[1] = b.Hull[1], b.Hull[0]
		if b.Validate() == nil {
			t.Errorf("%s: Validate accepts a permuted hull", c.name)
		}
	}
}

// flipForTest flips the edge shared by half-edges e and h (a valid convex
// quadrilateral), updating Inedge.
func flipForTest(t *Triangulation, e, h int32) {
	tri, half := t.Triangles, t.Halfedges
	en, ep := NextHalfedge(e), PrevHalfedge(e)
	hn, hp := NextHalfedge(h), PrevHalfedge(h)
	a, b, c, d := tri[e], tri[en], tri[ep], tri[hp]
	// Triangles (a, b, c) and (b, a, d) become (c, a, d) and (d, b, c).
	tri[e], tri[en], tri[ep] = c, a, d
	tri[h], tri[hn], tri[hp] = d, b, c
	hEp, hEn, hHn, hHp := half[ep], half[en], half[hn], half[hp]
	set := func(x, y int32) {
		half[x] = y
		if y >= 0 {
			half[y] = x
		}
	}
	set(e, hEp)  // c→a
	set(en, hHn) // a→d
	set(ep, hp)  // d→c with c→d
	set(h, hHp)  // d→b
	set(hn, hEn) // b→c
	for v := range t.Inedge {
		t.Inedge[v] = -1
	}
	for k := range tri {
		t.Inedge[tri[NextHalfedge(int32(k))]] = int32(k)
	}
	for k := range tri {
		if half[k] < 0 {
			t.Inedge[tri[NextHalfedge(int32(k))]] = int32(k)
		}
	}
}

func TestCmpDistExact(t *testing.T) {
	// Points 1e-12 m apart at 5e6 m: the float distances tie, the exact
	// comparison does not.
	qx, qy := 5e6, 5e6
	ax, bx := 5e6+1, 5e6+1+0x1p-30
	if got := cmpDist(qx, qy, ax, qy, bx, qy); got != -1 {
		t.Errorf("cmpDist = %d, want -1", got)
	}
	if got := cmpDist(0, 0, 3, 4, 5, 0); got != 0 {
		t.Errorf("cmpDist equal distances = %d", got)
	}
}

func TestTriangulateLargeSplit(t *testing.T) {
	// From parallelMin points on, the last rounds are inserted by two
	// workers; the result must not depend on how many CPUs run them.
	dup := sitegen.Uniform(parallelMin, 51)
	dup = append(dup, dup[:parallelMin/3]...)
	dup = shuffled(dup, 52)
	cases := []struct {
		name string
		pts  []orb.Point
	}{
		{"uniform", sitegen.Uniform(parallelMin+1000, 53)},
		{"grid", sitegen.Grid(2 * parallelMin)},
		{"clustered", sitegen.Clustered(parallelMin+5000, 54)},
		{"duplicates", dup},
		{"lattice-offset", offset(sitegen.TriangularLattice(200, 200, 10), 5e6, 5e6)},
	}
	for _, c := range cases {
		tr := mustTriangulate(t, c.pts)
		// Reference: exact empty-circle property and Euler's formula.
		checkTriangulation(t, c.name, tr)
		prev := runtime.GOMAXPROCS(1)
		one := mustTriangulate(t, c.pts)
		runtime.GOMAXPROCS(prev)
		if !reflect.DeepEqual(tr, one) {
			t.Errorf("%s: result differs between 1 and %d CPUs", c.name, prev)
		}
	}
}
