// Tests of the two-worker insertion of the regular triangulation
// (regular_parallel.go): the same vertices, hidden points and triangles as
// the sequential construction, and the same arrays whatever the number of
// CPUs.

package planar

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"runtime"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// splitCases are inputs for the split construction: uniform, clustered,
// lattices (many cocircular quadruples of equal weights, decided by the
// perturbation), duplicate-heavy and heavily hidden sets, with mixed
// weights.
func splitCases(n int) []struct {
	name string
	pts  []orb.Point
	w    []float64
} {
	type c = struct {
		name string
		pts  []orb.Point
		w    []float64
	}
	var cases []c
	add := func(name string, pts []orb.Point, w []float64) { cases = append(cases, c{name, pts, w}) }
	u := scaled(sitegen.Uniform(n, 11), 10)
	add("uniform", u, rangeWeights(n, 1))
	add("clustered", scaled(sitegen.Clustered(n, 12), 10), rangeWeights(n, 2))
	g := scaled(sitegen.Grid(n), 10)
	add("grid", g, rangeWeights(len(g), 3))
	// Two weights only on the grid: many exact power ties.
	gw := make([]float64, len(g))
	for i := range gw {
		gw[i] = float64(1+i%7/6) * 2500
	}
	add("grid-two-weights", g, gw)
	k := 1
	for k*k < n {
		k++
	}
	tl := sitegen.TriangularLattice(k, k, 100)
	add("triangular-lattice", tl, rangeWeights(len(tl), 4))
	// Each position three times with different weights: most duplicates
	// meet a vertex (deferred, and the restart without the losers).
	d := slices.Concat(u[:n/3], u[:n/3], u[:n/3])
	add("duplicates", d, rangeWeights(len(d), 5))
	// Weights spread over [0, 400²] at ~100 m spacing: many hidden points
	// and removed vertices.
	r := rand.New(rand.NewPCG(6, 7))
	hw := make([]float64, n)
	for i := range hw {
		x := r.Float64() * 400
		hw[i] = x * x
	}
	add("hidden-heavy", u, hw)
	// Off-origin coordinates (the exact stages of the power test).
	add("utm", offset(u, 500000, 5300000), rangeWeights(n, 8))
	// Few positions, each repeated many times.
	few := make([]orb.Point, n)
	for i := range few {
		few[i] = orb.Point{float64(r.IntN(12)) * 100, float64(r.IntN(12)) * 100}
	}
	add("few-positions", few, rangeWeights(n, 9))
	// Three columns: most points on the lines of edges, the split
	// abscissa on a column.
	cols := make([]orb.Point, n)
	for i := range cols {
		cols[i] = orb.Point{float64(r.IntN(3)) * 1000, r.Float64() * 10000}
	}
	add("three-columns", cols, rangeWeights(n, 10))
	// Two distant clusters, the split between them.
	two := slices.Concat(scaled(sitegen.Clustered(n/2, 13), 10), offset(scaled(sitegen.Clustered(n-n/2, 14), 10), 1e6, 0))
	add("two-clusters", two, rangeWeights(n, 11))
	return cases
}

// sameRegular reports why the split result a differs from the sequential
// result b, or "" when they have the same vertices, weights, hidden
// points, triangles and hull (the triangle numbering may differ).
func sameRegular(a, b *RegularTriangulation) string {
	switch {
	case !reflect.DeepEqual(a.Vertex, b.Vertex):
		return "Vertex"
	case !reflect.DeepEqual(a.Source, b.Source):
		return "Source"
	case !reflect.DeepEqual(a.Coords, b.Coords):
		return "Coords"
	case !reflect.DeepEqual(a.Weights, b.Weights):
		return "Weights"
	case !reflect.DeepEqual(a.Hidden, b.Hidden):
		return "Hidden"
	case !reflect.DeepEqual(regularTriangleSet(a, nil), regularTriangleSet(b, nil)):
		return "triangles"
	case !reflect.DeepEqual(rotateMin(a.Hull), rotateMin(b.Hull)):
		return "Hull"
	}
	return ""
}

// rotateMin returns the cycle c starting at its smallest entry.
func rotateMin(c []int32) []int32 {
	if len(c) == 0 {
		return c
	}
	k := slices.Index(c, slices.Min(c))
	return slices.Concat(c[k:], c[:k])
}

func TestRegularSplitMatchesSequential(t *testing.T) {
	n := 20000
	if testing.Short() {
		n = 5000
	}
	for _, c := range splitCases(n) {
		t.Run(c.name, func(t *testing.T) {
			seq, err := triangulateRegularSplit(c.pts, c.w, false)
			if err != nil {
				t.Fatal(err)
			}
			par, err := triangulateRegularSplit(c.pts, c.w, true)
			if err != nil {
				t.Fatal(err)
			}
			if len(seq.Hidden) == 0 && c.name == "hidden-heavy" {
				t.Fatalf("no hidden point")
			}
			if why := sameRegular(par, seq); why != "" {
				t.Fatalf("split and sequential constructions differ in %s (%d vs %d triangles, %d vs %d hidden)",
					why, par.NumTriangles(), seq.NumTriangles(), len(par.Hidden), len(seq.Hidden))
			}
			if err := checkLinks(par); err != nil {
				t.Fatalf("split result: %v", err)
			}
			// One CPU runs the workers one after the other: the same
			// arrays.
			prev := runtime.GOMAXPROCS(1)
			one, err := triangulateRegularSplit(c.pts, c.w, true)
			runtime.GOMAXPROCS(prev)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(one, par) {
				t.Fatalf("split result differs between 1 and %d CPUs", prev)
			}
		})
	}
}

// TestRegularSplitExact checks split results of a size the brute-force
// checks of regular_test.go can afford: every triangle against every
// vertex, every hidden point.
func TestRegularSplitExact(t *testing.T) {
	for _, c := range splitCases(1500) {
		t.Run(c.name, func(t *testing.T) {
			tr, err := triangulateRegularSplit(c.pts, c.w, true)
			if err != nil {
				t.Fatal(err)
			}
			checkRegular(t, c.name, c.pts, c.w, tr)
		})
	}
}

// TestRegularLargeUsesSplit checks TriangulateRegular at a size where it
// splits, and numbers vertices in several chunks, against the sequential
// construction and the inputs.
func TestRegularLargeUsesSplit(t *testing.T) {
	n := 5*parallelMin/2 + 1000
	pts := scaled(sitegen.Uniform(n, 21), 10)
	w := rangeWeights(n, 22)
	got, err := TriangulateRegular(pts, w)
	if err != nil {
		t.Fatal(err)
	}
	seq, err := triangulateRegularSplit(pts, w, false)
	if err != nil {
		t.Fatal(err)
	}
	if why := sameRegular(got, seq); why != "" {
		t.Fatalf("TriangulateRegular and the sequential construction differ in %s", why)
	}
	if err := checkVertexArrays(pts, w, got); err != nil {
		t.Fatal(err)
	}
	if err := checkLinks(got); err != nil {
		t.Fatal(err)
	}
}

// checkVertexArrays checks Vertex, Source, Coords, Weights and Hidden of
// tr against the inputs: vertices numbered in input order, each hidden
// input listed once, in increasing order.
func checkVertexArrays(pts []orb.Point, w []float64, tr *RegularTriangulation) error {
	m := int32(len(tr.Source))
	if len(tr.Vertex) != len(pts) || len(tr.Coords) != 2*int(m) || len(tr.Weights) != int(m) || len(tr.Hidden)+int(m) != len(pts) {
		return fmt.Errorf("array lengths: %d inputs, %d vertices, %d hidden", len(tr.Vertex), m, len(tr.Hidden))
	}
	next, h := int32(0), 0
	for i, v := range tr.Vertex {
		if v < 0 {
			if h >= len(tr.Hidden) || tr.Hidden[h] != int32(i) {
				return fmt.Errorf("input %d hidden but not listed in order", i)
			}
			h++
			continue
		}
		if v != next || tr.Source[v] != int32(i) || tr.Coords[2*v] != pts[i][0] || tr.Coords[2*v+1] != pts[i][1] || tr.Weights[v] != w[i] {
			return fmt.Errorf("input %d: vertex %d does not match", i, v)
		}
		next++
	}
	return nil
}

// checkLinks checks the arrays that depend on the triangle numbering:
// Halfedges pairs each half-edge with its reverse, the half-edges without
// a twin are as many as the hull vertices, and Inedge ends at its vertex
// (on the hull for hull vertices).
func checkLinks(tr *RegularTriangulation) error {
	tri, half := tr.Triangles, tr.Halfedges
	nb := 0
	for e := int32(0); e < int32(len(tri)); e++ {
		h := half[e]
		if h < 0 {
			nb++
			continue
		}
		if half[h] != e || tri[h] != tri[NextHalfedge(e)] || tri[NextHalfedge(h)] != tri[e] {
			return fmt.Errorf("half-edge %d: twin %d not paired", e, h)
		}
	}
	if nb != len(tr.Hull) {
		return fmt.Errorf("%d half-edges without twin, %d hull vertices", nb, len(tr.Hull))
	}
	onHull := make([]bool, tr.NumVertices())
	for _, v := range tr.Hull {
		onHull[v] = true
	}
	for v, e := range tr.Inedge {
		if e < 0 || tri[NextHalfedge(e)] != int32(v) || onHull[v] != (half[e] < 0) {
			return fmt.Errorf("vertex %d: Inedge %d", v, e)
		}
	}
	return nil
}
