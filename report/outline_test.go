// Tests of the written-outline check and pinch splitting (outline.go): the
// contacts GEOS's IsValid accepts and refuses, on hand-made rings.

package report

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// closed returns the ring through pts, closed.
func closed(pts ...float64) orb.Ring {
	var r orb.Ring
	for i := 0; i+1 < len(pts); i += 2 {
		r = append(r, orb.Point{pts[i], pts[i+1]})
	}
	return append(r, r[0])
}

// bigSquare is a counter-clockwise ring with many vertices on its edges,
// so outlineValid takes its grid path.
func bigSquare(side float64, per int) orb.Ring {
	var pts []float64
	for k := range 4 * per {
		t := side * float64(k%per) / float64(per)
		switch k / per {
		case 0:
			pts = append(pts, t, 0)
		case 1:
			pts = append(pts, side, t)
		case 2:
			pts = append(pts, side-t, side)
		default:
			pts = append(pts, 0, side-t)
		}
	}
	return closed(pts...)
}

func TestOutlineValid(t *testing.T) {
	sq := closed(0, 0, 10, 0, 10, 10, 0, 10)
	hole := func(pts ...float64) orb.Ring { // clockwise
		r := closed(pts...)
		for i, j := 0, len(r)-1; i < j; i, j = i+1, j-1 {
			r[i], r[j] = r[j], r[i]
		}
		return r
	}
	big := bigSquare(100, 20)
	cases := []struct {
		name string
		mp   orb.MultiPolygon
		want bool
	}{
		// Valid in GEOS.
		{"square", orb.MultiPolygon{{sq}}, true},
		{"square with hole", orb.MultiPolygon{{sq, hole(2, 2, 4, 2, 4, 4, 2, 4)}}, true},
		{"hole touching the exterior at a shared vertex", orb.MultiPolygon{{closed(0, 0, 10, 0, 10, 10, 0, 10, 0, 5), hole(0, 5, 4, 4, 4, 6)}}, true},
		{"polygons touching at a corner", orb.MultiPolygon{{sq}, {closed(10, 10, 20, 10, 20, 20, 10, 20)}}, true},
		{"large ring with hole (grid path)", orb.MultiPolygon{{big, hole(40, 40, 60, 40, 60, 60, 40, 60)}}, true},
		// Invalid in GEOS.
		{"bow-tie", orb.MultiPolygon{{closed(0, 0, 10, 10, 10, 0, 0, 10)}}, false},
		{"spike", orb.MultiPolygon{{closed(0, 0, 10, 0, 20, 0, 15, 0, 10, 10)}}, false},
		{"ring touching itself at a vertex", orb.MultiPolygon{{closed(0, 0, 10, 0, 5, 5, 10, 10, 0, 10, 5, 5)}}, false},
		{"hole along the exterior edge", orb.MultiPolygon{{sq, hole(0, 2, 4, 2, 4, 4, 0, 4)}}, false},
		{"hole crossing the exterior", orb.MultiPolygon{{sq, hole(-1, 2, 4, 2, 4, 4, -1, 4)}}, false},
		{"polygons sharing an edge", orb.MultiPolygon{{sq}, {closed(10, 0, 20, 0, 20, 10, 10, 10)}}, false},
		{"large ring crossed by a hole (grid path)", orb.MultiPolygon{{big, hole(40, -1, 60, -1, 60, 60, 40, 60)}}, false},
		{"large ring with a hole vertex on its edge (grid path)", orb.MultiPolygon{{big, hole(42.5, 0, 60, 40, 40, 40)}}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := outlineValid(c.mp); got != c.want {
				t.Errorf("outlineValid = %v, want %v", got, c.want)
			}
		})
	}
}

func TestSplitPinches(t *testing.T) {
	cases := []struct {
		name        string
		mp          orb.MultiPolygon
		polys       int
		holes       int
		splitNeeded bool
	}{
		{"figure eight: two polygons touching at a point", orb.MultiPolygon{{closed(0, 0, 10, 0, 5, 5, 10, 10, 0, 10, 5, 5)}}, 2, 0, true},
		{"inverted hole: a hole touching its polygon's boundary", orb.MultiPolygon{{closed(0, 0, 10, 0, 10, 10, 0, 10, 0, 5, 4, 6, 4, 4, 0, 5)}}, 1, 1, true},
		{"no repeated position", orb.MultiPolygon{{closed(0, 0, 10, 0, 10, 10)}}, 1, 0, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out, ok := splitPinches(c.mp)
			if ok != c.splitNeeded {
				t.Fatalf("split %v, want %v", ok, c.splitNeeded)
			}
			holes := 0
			for _, p := range out {
				holes += len(p) - 1
			}
			if len(out) != c.polys || holes != c.holes {
				t.Errorf("%d polygons with %d holes, want %d with %d: %v", len(out), holes, c.polys, c.holes, out)
			}
			if ok && !outlineValid(out) {
				t.Errorf("split outline still invalid: %v", out)
			}
		})
	}
}

func TestConvexRing(t *testing.T) {
	for _, c := range []struct {
		name string
		r    orb.Ring
		want bool
	}{
		{"square", closed(0, 0, 1, 0, 1, 1, 0, 1), true},
		{"triangle", closed(0, 0, 2, 0, 1, 1e-3), true},
		{"clockwise", closed(0, 0, 0, 1, 1, 1, 1, 0), false},
		{"collinear vertex", closed(0, 0, 1, 0, 2, 0, 2, 2), false},
		{"pentagram: left turns, twice round", closed(0, 1, -0.951, -0.309, 0.588, -0.809, 0.588, 0.809, -0.951, 0.309), false},
		{"non-convex", closed(0, 0, 2, 0, 1, 0.5, 2, 2, 0, 2), false},
		{"vertical edges", closed(0, 0, 1, 0, 1, 1, 0, 1, 0, 0.5), false},
		{"hexagon with vertical sides", closed(0, 0, 1, -1, 2, 0, 2, 1, 1, 2, 0, 1), true},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := convexRing(c.r); got != c.want {
				t.Errorf("convexRing = %v, want %v", got, c.want)
			}
			if c.want && !outlineValid(orb.MultiPolygon{{c.r}}) {
				t.Error("a convex ring outlineValid refuses")
			}
		})
	}
}

func TestConvexRingAgreesWithPairs(t *testing.T) {
	// On rounded random rings (convex or not) the pre-filter never
	// accepts one the pairwise check refuses.
	rng := rand.New(rand.NewPCG(5, 6))
	accepted := 0
	for range 20000 {
		n := 3 + rng.IntN(6)
		var pts []float64
		for k := range n {
			a := 2 * math.Pi * (float64(k) + 0.8*rng.Float64()) / float64(n)
			if rng.IntN(4) == 0 {
				a = 2 * math.Pi * rng.Float64() // sometimes out of order
			}
			rad := 1e-3 * (1 + rng.Float64())
			pts = append(pts, round(rad*math.Cos(a), 3+rng.IntN(2)), round(rad*math.Sin(a), 3+rng.IntN(2)))
		}
		r := closed(pts...)
		if convexRing(r) {
			accepted++
			if !pairsValid(orb.MultiPolygon{{r}}) {
				t.Fatalf("convexRing accepts %v, the pairwise check refuses it", r)
			}
		}
	}
	if accepted < 1000 {
		t.Errorf("only %d rings accepted", accepted)
	}
}

func TestStarRing(t *testing.T) {
	// A five-pointed star outline (10 vertices, concave), as a gap
	// between disks is: star-shaped about its centre.
	var star []float64
	for k := range 10 {
		a, rad := math.Pi/2+2*math.Pi*float64(k)/10, 1.0
		if k%2 == 1 {
			rad = 0.4
		}
		star = append(star, rad*math.Cos(a), rad*math.Sin(a))
	}
	for _, c := range []struct {
		name string
		r    orb.Ring
		want bool
	}{
		{"square", closed(0, 0, 1, 0, 1, 1, 0, 1), true},
		{"star outline", closed(star...), true},
		{"concave triangle", closed(0, 0, 1, 0.3, 2, 0, 1.3, 1, 1, 2, 0.7, 1), true},
		{"clockwise", closed(0, 0, 0, 1, 1, 1, 1, 0), false},
		{"pentagram: left turns about the centre, twice round", closed(0, 1, -0.951, -0.309, 0.588, -0.809, 0.588, 0.809, -0.951, 0.309), false},
		{"spike back along an edge", closed(0, 0, 2, 0, 2, 2, 1, 2, 1.5, 2, 0, 2), false},
		{"vertex mean outside the kernel", closed(0, 0, 10, 0, 10, 1, 1, 1, 1, 10, 0, 10), false},
		{"repeated vertex", closed(0, 0, 1, 0, 1, 0, 1, 1, 0, 1), false},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := starRing(c.r); got != c.want {
				t.Errorf("starRing = %v, want %v", got, c.want)
			}
			if c.want && !pairsValid(orb.MultiPolygon{{c.r}}) {
				t.Error("a star-shaped ring pairsValid refuses")
			}
		})
	}
}

func TestStarRingAgreesWithPairs(t *testing.T) {
	// On rounded random radial rings (star-shaped or not, some with
	// vertices out of angular order, some with spikes and near contacts
	// that rounding makes) the pre-filter never accepts one the pairwise
	// check refuses, and it accepts most of the star-shaped ones.
	rng := rand.New(rand.NewPCG(7, 8))
	accepted, nonConvex := 0, 0
	for range 20000 {
		n := 3 + rng.IntN(40)
		var pts []float64
		for k := range n {
			a := 2 * math.Pi * (float64(k) + 0.9*rng.Float64()) / float64(n)
			if rng.IntN(30) == 0 {
				a = 2 * math.Pi * rng.Float64() // sometimes out of order
			}
			rad := 1e-3 * (0.05 + rng.Float64())
			pts = append(pts, round(rad*math.Cos(a), 3+rng.IntN(3)), round(rad*math.Sin(a), 3+rng.IntN(3)))
		}
		r := closed(pts...)
		if starRing(r) {
			accepted++
			if !convexRing(r) {
				nonConvex++
			}
			if !pairsValid(orb.MultiPolygon{{r}}) {
				t.Fatalf("starRing accepts %v, the pairwise check refuses it", r)
			}
		}
	}
	if accepted < 1000 || nonConvex < 500 {
		t.Errorf("only %d rings accepted, %d of them not convex", accepted, nonConvex)
	}
}

func TestMonotoneRing(t *testing.T) {
	// A crescent between two arcs bulging the same way (a gap between
	// two disks almost touching), seen by no single point.
	var crescent []float64
	for k := range 9 {
		a := math.Pi * float64(k) / 8
		crescent = append(crescent, -math.Cos(a), 0.5*math.Sin(a))
	}
	for k := 7; k >= 1; k-- {
		a := math.Pi * float64(k) / 8
		crescent = append(crescent, -0.98*math.Cos(a), 0.4*math.Sin(a))
	}
	for _, c := range []struct {
		name string
		r    orb.Ring
		want bool
	}{
		{"crescent", closed(crescent...), true},
		{"crescent along y", closed(swapXY(crescent)...), true},
		{"level end (a rounded cusp)", closed(0, 0, 1, -0.1, 2, 0, 2, 0.001, 1, -0.09), true},
		{"level ends on both chains: a spike", closed(0, 0, 1, -0.1, 2, -0.05, 2, 0.001, 2, -0.04, 1, -0.09), false},
		{"diamond", closed(0, 0, 1, 1, 2, 0, 1, -1), true},
		{"chains crossing", closed(0, 0, 1, 1, 2, 0, 3, 1, 4, 0, 3, 2, 2, -1, 1, 2), false},
		{"chains touching at a vertex", closed(0, 0, 1, 0.5, 2, 0, 1, 0.5), false},
		{"vertex of one chain on the other's edge", closed(0, 0, 1, 1, 2, 0, 1, 0.5, 1.5, 0.5), false},
		{"notched, monotone in y", closed(0, 0, 2, 0, 1, 1, 2, 2, 0, 2, 0.5, 1), true},
		{"not monotone", closed(0, 0, 3, 0, 3, 3, 0, 3, 0, 2, 2, 2, 2, 1, 0, 1), false},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := monotoneRing(c.r); got != c.want {
				t.Errorf("monotoneRing = %v, want %v", got, c.want)
			}
			if c.want && !pairsValid(orb.MultiPolygon{{c.r}}) {
				t.Error("a monotone ring pairsValid refuses")
			}
		})
	}
}

// swapXY swaps the coordinates of interleaved x, y values.
func swapXY(xy []float64) []float64 {
	out := make([]float64, len(xy))
	for i := 0; i+1 < len(xy); i += 2 {
		out[i], out[i+1] = xy[i+1], xy[i]
	}
	return out
}

func TestMonotoneRingAgreesWithPairs(t *testing.T) {
	// On rounded random two-chain rings (thin crescents whose chains come
	// within the rounding of each other, cross, or end in level edges)
	// the pre-filter never accepts one the pairwise check refuses (most
	// are invalid), and it accepts many that are neither convex nor
	// star-shaped.
	rng := rand.New(rand.NewPCG(9, 10))
	accepted, other, valid := 0, 0, 0
	for range 20000 {
		chain := func(m int, bulge float64) []orb.Point {
			xs := make([]float64, m)
			for i := range xs {
				xs[i] = rng.Float64()
			}
			slices.Sort(xs)
			pts := make([]orb.Point, m)
			for i, x := range xs {
				pts[i] = orb.Point{x, bulge*math.Sin(math.Pi*x) + 2e-4*(rng.Float64()-0.5)}
			}
			return pts
		}
		gap := 0.02 * rng.Float64() * rng.Float64()
		lower, upper := chain(1+rng.IntN(15), 0.2), chain(1+rng.IntN(15), 0.2+gap)
		pts := []float64{0, 0}
		for _, q := range lower {
			pts = append(pts, q[0], q[1])
		}
		end := orb.Point{1, 0}
		if rng.IntN(4) == 0 {
			pts = append(pts, 1, -1e-3) // a level edge at the end
		}
		pts = append(pts, end[0], end[1])
		if rng.IntN(8) == 0 {
			pts = append(pts, 1, -5e-4) // sometimes on both chains
		}
		for i := len(upper) - 1; i >= 0; i-- {
			pts = append(pts, upper[i][0], upper[i][1])
		}
		d := 3 + rng.IntN(2)
		for i := range pts {
			pts[i] = round(pts[i], d)
		}
		r := closed(pts...)
		r = orb.Ring(planar.DropRepeats(r[:len(r)-1]))
		if len(r) < 3 {
			continue
		}
		r = append(r, r[0])
		if pairsValid(orb.MultiPolygon{{r}}) {
			valid++
		}
		if monotoneRing(r) {
			accepted++
			if !convexRing(r) && !starRing(r) {
				other++
			}
			if !pairsValid(orb.MultiPolygon{{r}}) {
				t.Fatalf("monotoneRing accepts %v, the pairwise check refuses it", r)
			}
		}
	}
	if accepted < 1500 || other < 1000 || valid > 19000 {
		t.Errorf("%d rings accepted of %d valid, %d of them neither convex nor star-shaped", accepted, valid, other)
	}
}

// TestOutlineValidParallel checks outlines beyond parallelEdges, whose
// grid cells pairsValid compares in bands on all processors: a square with
// a lattice of square holes is valid, and a single bad contact anywhere
// (a hole crossing its neighbour, or the exterior) makes it invalid.
func TestOutlineValidParallel(t *testing.T) {
	// 150 holes per row: 4·150² = 90 000 hole edges.
	const per = 150
	hole := func(x, y, w float64) orb.Ring { // clockwise
		return closed(x, y, x, y+w, x+w, y+w, x+w, y)
	}
	lattice := func(bad func(i, j int) (float64, float64, float64)) orb.MultiPolygon {
		p := orb.Polygon{bigSquare(float64(per+1), 64)}
		for i := range per {
			for j := range per {
				x, y, w := float64(i)+0.5, float64(j)+0.5, 0.5
				if bad != nil {
					x, y, w = bad(i, j)
				}
				p = append(p, hole(x, y, w))
			}
		}
		return orb.MultiPolygon{p}
	}
	if !outlineValid(lattice(nil)) {
		t.Fatal("a lattice of separate holes is refused")
	}
	for _, at := range [][2]int{{0, 0}, {per / 2, per / 3}, {per - 1, per - 1}, {per - 1, 0}} {
		cross := func(i, j int) (float64, float64, float64) {
			if i == at[0] && j == at[1] {
				return float64(i) + 0.5, float64(j) + 0.5, 1.2 // reaches into its neighbours
			}
			return float64(i) + 0.5, float64(j) + 0.5, 0.5
		}
		if at[0] == per-1 && at[1] == per-1 {
			// The last hole reaches out of the exterior instead.
			cross = func(i, j int) (float64, float64, float64) {
				if i == at[0] && j == at[1] {
					return float64(i) + 0.5, float64(j) + 0.5, 1.6
				}
				return float64(i) + 0.5, float64(j) + 0.5, 0.4
			}
		}
		if outlineValid(lattice(cross)) {
			t.Errorf("a lattice with a bad hole at %v is accepted", at)
		}
	}
}

// TestPairsValidAgreesWithAllPairs compares the grid check with the
// comparison of every pair of edges on random outlines of a few rings on
// a coarse grid (so that contacts of every kind occur).
func TestPairsValidAgreesWithAllPairs(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	valid := 0
	for range 3000 {
		var mp orb.MultiPolygon
		for range 1 + rng.IntN(3) {
			var p orb.Polygon
			for range 1 + rng.IntN(3) {
				n := 4 + rng.IntN(20)
				cx, cy := float64(rng.IntN(20)), float64(rng.IntN(20))
				var pts []float64
				for k := range n {
					a := 2 * math.Pi * (float64(k) + 0.5*rng.Float64()) / float64(n)
					rad := 2 + 6*rng.Float64()
					pts = append(pts, math.Round(cx+rad*math.Cos(a)), math.Round(cy+rad*math.Sin(a)))
				}
				p = append(p, closed(pts...))
			}
			mp = append(mp, p)
		}
		var o outlineEdges
		total := 0
		for _, p := range mp {
			for _, r := range p {
				total += len(r) - 1
			}
		}
		o.fill(mp, total)
		want := true
		for i := range int32(len(o.ring)) {
			for j := i + 1; j < int32(len(o.ring)) && want; j++ {
				if i+1 == o.ringStart[o.ring[i]+1] || j+1 == o.ringStart[o.ring[j]+1] {
					continue // a ring's last position starts no edge
				}
				e, f := o.edge(i), o.edge(j)
				want = edgePairValid(&e, &f)
			}
		}
		if want {
			valid++
		}
		if got := pairsValid(mp); got != want {
			t.Fatalf("pairsValid = %v, every pair says %v, on %v", got, want, mp)
		}
	}
	if valid < 100 {
		t.Errorf("only %d valid outlines", valid)
	}
}
