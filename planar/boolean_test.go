// Tests of Union, Intersection, Difference and SiteArea: named geometric
// cases with hand-computed areas, refusal of invalid rings, and the result
// checked exactly by NewRegion (booleanCheckValid).

package planar

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// bRect returns the axis-parallel rectangle [x0, x1] × [y0, y1] as a
// polygon, counter-clockwise, closed.
func bRect(x0, y0, x1, y1 float64) orb.Polygon {
	return orb.Polygon{{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}}
}

// bPoly builds a one-ring polygon from coordinate pairs.
func bPoly(c ...float64) orb.Polygon {
	r := make(orb.Ring, 0, len(c)/2+1)
	for i := 0; i+1 < len(c); i += 2 {
		r = append(r, orb.Point{c[i], c[i+1]})
	}
	return orb.Polygon{append(r, r[0])}
}

// booleanArea returns the signed-sum area of a polygon set (exteriors
// positive, holes negative as oriented).
func booleanArea(mp orb.MultiPolygon) float64 {
	s := 0.0
	for _, p := range mp {
		for _, r := range p {
			s += RingArea(FlatRing(r))
		}
	}
	return s
}

// booleanAbsArea returns the sum of the absolute areas of the exteriors
// of mp (polygons without holes, either orientation).
func booleanAbsArea(mp orb.MultiPolygon) float64 {
	s := 0.0
	for _, p := range mp {
		s += math.Abs(RingArea(FlatRing(p[0])))
	}
	return s
}

// booleanCheckValid fails unless every vertex of mp is finite, mp is
// accepted by NewRegion and its rings are oriented (exteriors counter-clockwise, holes clockwise): the exact
// validity check used for every result in these tests.
func booleanCheckValid(t testing.TB, mp orb.MultiPolygon) {
	t.Helper()
	if len(mp) == 0 {
		return
	}
	for p, poly := range mp {
		for k, r := range poly {
			for i, q := range r {
				if math.IsNaN(q[0]) || math.IsNaN(q[1]) || math.IsInf(q[0], 0) || math.IsInf(q[1], 0) {
					t.Fatalf("polygon %d ring %d vertex %d: non-finite (%v, %v)", p, k, i, q[0], q[1])
				}
			}
		}
	}
	if _, err := NewRegion(mp); err != nil {
		t.Fatalf("result not valid: %v", err)
	}
	for p, poly := range mp {
		for k, r := range poly {
			xy := FlatRing(r[:len(r)-1])
			if regionRingCCW(xy) != (k == 0) {
				t.Fatalf("polygon %d ring %d: wrong orientation", p, k)
			}
		}
	}
}

// booleanChecker returns the black squares of an n×n checkerboard: they
// touch only at corners, (n−1)² pinch points.
func booleanChecker(n int) orb.MultiPolygon {
	var mp orb.MultiPolygon
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			if (i+j)%2 == 0 {
				mp = append(mp, bRect(float64(i), float64(j), float64(i+1), float64(j+1)))
			}
		}
	}
	return mp
}

func TestSiteArea(t *testing.T) {
	// Opened pinch points remove at most ½(|vp| + |vq|)·64 ulp per passage
	// (boolean_pinch.go): below 1e-13 here.
	const pinchTol = 1e-12
	cases := []struct {
		name       string
		area, excl orb.MultiPolygon
		want       float64
		polys      int
		stats      func(SiteAreaStats) bool
	}{
		{"parcels touching at an edge", orb.MultiPolygon{bRect(0, 0, 1, 1), bRect(1, 0, 2, 1)}, nil, 2, 1,
			func(s SiteAreaStats) bool { return s.AreaParts == 1 && s.Pinches == 0 }},
		{"parcels sharing part of an edge (collinear overlap)", orb.MultiPolygon{bRect(0, 0, 2, 1), bRect(1, 1, 3, 2)}, nil, 4, 1,
			func(s SiteAreaStats) bool { return s.AreaParts == 1 }},
		{"parcels touching at a point", orb.MultiPolygon{bRect(0, 0, 1, 1), bRect(1, 1, 2, 2)}, nil, 2, 2,
			func(s SiteAreaStats) bool { return s.AreaParts == 2 && s.Pinches == 1 }},
		{"parcels overlapping", orb.MultiPolygon{bRect(0, 0, 2, 2), bRect(1, 1, 3, 3)}, nil, 7, 1,
			func(s SiteAreaStats) bool { return s.AreaParts == 1 }},
		{"identical parcels", orb.MultiPolygon{bRect(0, 0, 1, 1), bRect(0, 0, 1, 1)}, nil, 1, 1,
			func(s SiteAreaStats) bool { return s.AreaParts == 1 }},
		{"parcels 1e-9 apart", orb.MultiPolygon{bRect(0, 0, 1, 1), bRect(1+1e-9, 0, 2, 1)}, nil, 2 - 1e-9, 2,
			func(s SiteAreaStats) bool { return s.AreaParts == 2 && s.Pinches == 0 }},
		{"exclusion on the boundary along an edge", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bRect(0, 1, 1, 2)}, 15, 1,
			func(s SiteAreaStats) bool { return s.ExclusionsClipped == 0 && s.ExclusionsOutside == 0 }},
		{"exclusion touching the boundary at a point", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bPoly(0, 2, 1, 1, 1, 3)}, 15, 1,
			func(s SiteAreaStats) bool { return s.Pinches == 1 }},
		{"exclusions sharing an edge", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bRect(1, 1, 2, 2), bRect(2, 1, 3, 2)}, 14, 1,
			func(s SiteAreaStats) bool { return s.ExclusionParts == 1 }},
		{"exclusions touching at a corner", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bRect(1, 1, 2, 2), bRect(2, 2, 3, 3)}, 14, 1,
			func(s SiteAreaStats) bool { return s.ExclusionParts == 2 && s.Pinches == 1 }},
		{"exclusions overlapping and sticking out", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bRect(3, 1, 5, 2), bRect(2.5, 1.5, 3.5, 3)}, 16 - 1 - 1.5 + 0.25, 1,
			func(s SiteAreaStats) bool { return s.ExclusionParts == 1 && s.ExclusionsClipped == 1 }},
		{"exclusion outside", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bRect(5, 5, 6, 6), bRect(4, 0, 5, 1)}, 16, 1,
			func(s SiteAreaStats) bool { return s.ExclusionsOutside == 2 }},
		{"exclusion cutting the area in two", orb.MultiPolygon{bRect(0, 0, 4, 4)}, orb.MultiPolygon{bRect(-1, 1, 5, 2)}, 12, 2,
			func(s SiteAreaStats) bool { return s.ExclusionsClipped == 1 }},
		{"holes in the input", orb.MultiPolygon{{bRect(0, 0, 4, 4)[0], bPoly(1, 1, 1, 3, 3, 3, 3, 1)[0]}},
			orb.MultiPolygon{{bRect(2, 0, 5, 4)[0], bPoly(3, 3.5, 4.5, 3.5, 4.5, 0.5, 3, 0.5)[0]}}, 8 - 2 + 3, 2,
			func(s SiteAreaStats) bool { return s.ExclusionsClipped == 1 }},
		{"parcel inside another's hole", orb.MultiPolygon{{bRect(0, 0, 4, 4)[0], bPoly(1, 1, 1, 3, 3, 3, 3, 1)[0]}, bRect(1.5, 1.5, 2.5, 2.5)}, nil, 13, 2,
			func(s SiteAreaStats) bool { return s.AreaParts == 2 }},
		{"UTM-sized coordinates, exclusion across a shared edge",
			orb.MultiPolygon{bRect(500000, 5000000, 500100, 5000100), bRect(500100, 5000000, 500200, 5000100)},
			orb.MultiPolygon{bPoly(500090.3, 5000040.7, 500110.1, 5000050.9, 500089.7, 5000060.2)},
			20000 - math.Abs(RingArea([]float64{500090.3, 5000040.7, 500110.1, 5000050.9, 500089.7, 5000060.2})), 1,
			func(s SiteAreaStats) bool { return s.AreaParts == 1 && s.ExclusionsClipped == 0 }},
		{"checkerboard parcels touching at corners", booleanChecker(10), nil, 50, 50,
			func(s SiteAreaStats) bool { return s.AreaParts == 50 && s.Pinches == 81 }},
		// The 32 inner white squares meet the rest only at corners: with
		// the pinch points opened they are polygons of their own.
		{"checkerboard exclusions in a square", orb.MultiPolygon{bRect(-1, -1, 11, 11)}, booleanChecker(10), 144 - 50, 33,
			func(s SiteAreaStats) bool { return s.ExclusionParts == 50 && s.Pinches == 81 }},
		{"hole touching the exterior at a point", orb.MultiPolygon{{bRect(0, 0, 4, 4)[0], bPoly(0, 2, 2, 3, 2, 1)[0]}}, nil, 14, 1,
			func(s SiteAreaStats) bool { return s.Pinches == 1 }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			reg, st, err := SiteArea(c.area, c.excl)
			if err != nil {
				t.Fatal(err)
			}
			res := reg.MultiPolygon()
			booleanCheckValid(t, res)
			// Relative to the area: shoelace sums of n terms err by ~n·ε.
			if got := booleanArea(res); math.Abs(got-c.want) > pinchTol*math.Max(1, c.want) {
				t.Errorf("area %.17g, want %.17g", got, c.want)
			}
			if len(res) != c.polys {
				t.Errorf("%d polygons, want %d", len(res), c.polys)
			}
			if !c.stats(st) {
				t.Errorf("stats %+v (%q)", st, st.String())
			}
		})
	}
}

func TestSiteAreaRefusals(t *testing.T) {
	cases := []struct {
		name       string
		area, excl orb.MultiPolygon
		want       []string
		is         error
	}{
		{"exclusion equal to the area", orb.MultiPolygon{bRect(0, 0, 1, 1)}, orb.MultiPolygon{bRect(0, 0, 1, 1)},
			[]string{"cover the whole site area"}, ErrEmptySite},
		{"bow-tie", orb.MultiPolygon{bPoly(0, 0, 2, 2, 2, 0, 0, 2)}, nil,
			[]string{"area polygon 0, ring 0", "crosses", "vertex 0 (0, 0)", "vertex 2 (2, 0)"}, nil},
		{"self-intersecting exclusion", orb.MultiPolygon{bRect(0, 0, 9, 9)}, orb.MultiPolygon{bRect(5, 5, 6, 6), bPoly(1, 1, 4, 1, 4, 4, 2, 0, 1, 4)},
			[]string{"exclusion 1, ring 0", "crosses", "vertex"}, nil},
		{"spike", orb.MultiPolygon{bPoly(0, 0, 2, 0, 2, 2, 3, 3, 2.5, 2.5, 0, 2)}, nil,
			[]string{"area polygon 0, ring 0", "spike", "vertex 3 (3, 3)"}, nil},
		{"ring touching itself", orb.MultiPolygon{bPoly(0, 0, 4, 0, 2, 2, 3, 4, 1, 4, 2, 2)}, nil,
			[]string{"area polygon 0, ring 0", "touches", "(2, 2)"}, nil},
		{"hole outside its exterior", orb.MultiPolygon{{bRect(0, 0, 2, 2)[0], bPoly(3, 0, 3, 1, 4, 1, 4, 0)[0]}}, nil,
			[]string{"area polygon 0, ring 1", "hole lies outside"}, nil},
		{"overlapping holes", orb.MultiPolygon{{bRect(0, 0, 9, 9)[0], bPoly(1, 1, 1, 3, 3, 3, 3, 1)[0], bPoly(2, 2, 2, 4, 4, 4, 4, 2)[0]}}, nil,
			[]string{"area polygon 0, ring", "overlaps another hole"}, nil},
		{"zero-width ring", orb.MultiPolygon{bPoly(0, 0, 1, 1, 2, 2)}, nil,
			[]string{"area polygon 0, ring 0", "collinear", "(0, 0)"}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, _, err := SiteArea(c.area, c.excl)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			if c.is != nil && !errors.Is(err, c.is) {
				t.Errorf("error %q is not %v", err, c.is)
			}
		})
	}
}

// booleanOpAreas runs Union on a and on b, Intersection, Difference and
// Union on both, checks every result with booleanCheckValid and returns
// the areas of A, B, A∩B, A−B and A∪B.
func booleanOpAreas(t testing.TB, a, b orb.MultiPolygon) (aa, ab, ai, ad, au float64) {
	t.Helper()
	aa, ab, ai, ad, au, _ = booleanOpAreasNear(t, a, b, false)
	return aa, ab, ai, ad, au
}

// booleanNearRel is the radius, relative to the larger coordinate
// magnitude, within which two distinct operand vertices make a refusal
// as near-degenerate (NearDegenerateError) acceptable in the fuzz target:
// about 1e-9, far above the ulp scale the overlay cannot resolve and far
// below any feature of a real site.
const booleanNearRel = 0x1p-30

// booleanOpAreasNear is booleanOpAreas; with allowNear, an operation
// refused with a *NearDegenerateError whose point has two distinct
// operand vertices within booleanNearRel of it ends the check with
// ok = false instead of failing (any other error, and any result, is
// checked as before).
func booleanOpAreasNear(t testing.TB, a, b orb.MultiPolygon, allowNear bool) (aa, ab, ai, ad, au float64, ok bool) {
	t.Helper()
	ops := []func() (orb.MultiPolygon, error){
		func() (orb.MultiPolygon, error) { return Union(a) },
		func() (orb.MultiPolygon, error) { return Union(b) },
		func() (orb.MultiPolygon, error) { return Intersection(a, b) },
		func() (orb.MultiPolygon, error) { return Difference(a, b) },
		func() (orb.MultiPolygon, error) { return Union(append(append(orb.MultiPolygon{}, a...), b...)) },
	}
	var areas [5]float64
	for k, op := range ops {
		mp, err := op()
		var nd *NearDegenerateError
		if err != nil && allowNear && errors.As(err, &nd) && booleanNearPair(a, b, nd.X, nd.Y) {
			t.Logf("refused as near-degenerate: %v", err)
			return 0, 0, 0, 0, 0, false
		}
		if err != nil {
			t.Fatal(err)
		}
		booleanCheckValid(t, mp)
		areas[k] = booleanArea(mp)
	}
	return areas[0], areas[1], areas[2], areas[3], areas[4], true
}

// booleanNearCollinear is the largest angle, in radians, between two
// operand edges passing within booleanNearRel of a refusal's point that
// makes them near-collinear: edges that close and that nearly parallel
// cross at rounded points that land across each other again.
const booleanNearCollinear = 0x1p-20

// booleanNearPair reports whether two distinct vertices of a and b lie
// within booleanNearRel of (x, y), or two near-collinear operand edges
// (booleanNearCollinear) pass that close to it (relative to the larger of
// the point's and the edge's endpoints' magnitudes: a long edge reaching
// far out is cut at crossings rounded at its own scale).
func booleanNearPair(a, b orb.MultiPolygon, x, y float64) bool {
	eps := booleanNearRel * math.Max(1, math.Max(math.Abs(x), math.Abs(y)))
	var dirs []float64
	for _, mp := range []orb.MultiPolygon{a, b} {
		for _, p := range mp {
			for _, r := range p {
				for i := 0; i+1 < len(r); i++ {
					ax, ay, bx, by := r[i][0], r[i][1], r[i+1][0], r[i+1][1]
					dx, dy := bx-ax, by-ay
					l2 := dx*dx + dy*dy
					if l2 == 0 {
						continue
					}
					// A crossing on this edge is rounded at the ulps of its
					// endpoints' magnitude, however small the point's own.
					edgeEps := max(eps, booleanNearRel*max(math.Abs(ax), math.Abs(ay), math.Abs(bx), math.Abs(by)))
					if PointSegmentDistance(x, y, ax, ay, bx, by) <= edgeEps {
						dirs = append(dirs, math.Atan2(dy, dx))
					}
				}
			}
		}
	}
	for i := range dirs {
		for j := i + 1; j < len(dirs); j++ {
			d := math.Mod(math.Abs(dirs[i]-dirs[j]), math.Pi)
			if math.Min(d, math.Pi-d) <= booleanNearCollinear {
				return true
			}
		}
	}
	var near []orb.Point
	for _, mp := range []orb.MultiPolygon{a, b} {
		for _, p := range mp {
			for _, r := range p {
				for _, v := range r {
					if math.Abs(v[0]-x) <= eps && math.Abs(v[1]-y) <= eps && !slices.Contains(near, v) {
						near = append(near, v)
					}
				}
			}
		}
	}
	return len(near) >= 2
}

// booleanKGapParts are four parts of a k = 4 coverage gap (the
// "duplicates" scene at r = 20, from coverage's TestKGapMergeNearVertices)
// whose shared edges end at points one or two ulps apart: the rounded
// crossings of different edge pairs at one true point. Traced as they are,
// the union's boundary ran v → a → b → v with a and b an ulp from v, and
// merging them left a zero-length edge that pinch opening divided by (NaN
// vertices).
var booleanKGapParts = orb.MultiPolygon{
	{{{46.237926882792756, 13.666420565500378}, {44.01911294364769, 14.333885158752004}, {46.17315575361574, 3.3190202757984357}, {46.17315575361574, 3.3190202757984357}, {46.237926882792756, 13.666420565500378}}},
	{{{44.01911294364769, 14.333885158752008}, {44.01911294364769, 14.333885158752004}, {46.23792688279276, 13.666420565500374}, {56.34107512875944, 28.388415220118528}, {57.8948101000794, 34.46934519299851}, {57.8948101000794, 34.469345192998546}, {53.539602925789225, 34.60311897660256}, {44.01911294364769, 14.333885158752008}}},
	{{{42.89586485718421, 11.942476928431024}, {44.0191129436477, 14.333885158752}, {44.0191129436477, 14.333885158752}, {31.350232896422263, 18.14494327340094}, {31.150002779539985, 17.840484686075857}, {42.89586485718421, 11.942476928431024}}},
	{{{42.89586485718421, 11.942476928431022}, {43.66009911187321, 2.8940816340286326}, {46.17315575361574, 3.319020275798437}, {46.17315575361574, 3.3190202757984566}, {44.0191129436477, 14.333885158752}, {44.0191129436477, 14.333885158752002}, {42.89586485718421, 11.942476928431022}}},
}

// booleanKGapRefArea is the area of the union of booleanKGapParts from
// GEOS (shapely 1.8.5 unary_union). GEOS refuses the parts as they are (a
// TopologyException), so the reference is the union of the parts snapped
// to a grid of step 2⁻³⁴ (2⁻⁴⁰ times 64, the power of two above the
// largest coordinate, as coverage's KGapSnapBits), which moves each vertex
// by at most booleanKGapSnapMove.
const booleanKGapRefArea = 142.48757360553788

// booleanKGapSnapMove is half the snapping step behind booleanKGapRefArea.
const booleanKGapSnapMove = 0x1p-35

// booleanKGapUlp is the ulp of the parts' coordinates (all below 64).
const booleanKGapUlp = 64 * 0x1p-52

// booleanPerimeter returns the summed length of the rings of mp.
func booleanPerimeter(mp orb.MultiPolygon) float64 {
	s := 0.0
	for _, p := range mp {
		for _, r := range p {
			for i := 0; i+1 < len(r); i++ {
				s += math.Hypot(r[i+1][0]-r[i][0], r[i+1][1]-r[i][1])
			}
		}
	}
	return s
}

// booleanFarPinch is the input of corpus cb5585488b1077ed (see
// TestBooleanOperations).
var booleanFarPinch = orb.MultiPolygon{
	bPoly(6.340800752941176e+06, 1.060912188235294e+06, 44.01911294364769, 14.333885158752004, 46.17285730698529, 8.172242647058823, 1.126448188235294e+06, 16.188235294117646),
	bPoly(44.0191129436477, 14.33388515875194, 16.188235294117646, 16.188235294117646, 16.188235294117646, 17.188235294117646),
	bPoly(42.37647058823529, 8.094117647058823, 16.188235294117646, 16.188235294117646, 16.086428653492646, 16.188235294117646, 46.37647058823529, 3.273529411764706, 44.0191129436468, 14.333885158752011),
}

func TestBooleanOperations(t *testing.T) {
	// Small integer-ish shapes: the areas are shoelace sums of a few terms
	// of size ≤ 16, exact to well below 1e-12.
	const tol = 1e-12
	// The k-gap parts: their union against GEOS within the snapping of
	// the reference (each vertex moved by booleanKGapSnapMove) plus what
	// the overlay moves (vertices merged within 2·booleanNearUlps ulps,
	// slivers and opened pinches within booleanPinchSep ulps), each times
	// the perimeter; the parts' perimeter bounds the union's and the
	// slivers'. About 4e-9 here (the result is 2e-13 off).
	kgapTol := booleanPerimeter(booleanKGapParts) * (booleanKGapSnapMove + (2*booleanNearUlps+booleanPinchSep)*booleanKGapUlp)
	// The far-pinch polygons: the overlay moves vertices within
	// 2·booleanNearUlps ulps (merging) and booleanPinchSep ulps (slivers,
	// pinches) of the largest coordinate, 6.3e6, times the perimeter:
	// about 1.3 here.
	farTol := booleanPerimeter(booleanFarPinch) * (2*booleanNearUlps + booleanPinchSep) * 0x1p-52 * 6.340800752941176e+06
	cases := []struct {
		name string
		a, b orb.MultiPolygon
		// When refTol > 0: A∪B is refPolys polygons without holes of area
		// refArea ± refTol.
		refArea, refTol float64
		refPolys        int
	}{
		{name: "triangle across two squares", a: orb.MultiPolygon{bRect(0, 0, 2, 2), bRect(3, 0, 4, 1)}, b: orb.MultiPolygon{bPoly(1, -1, 3.5, 0.5, 1, 3)}},
		{name: "b inside a", a: orb.MultiPolygon{bRect(0, 0, 4, 4)}, b: orb.MultiPolygon{bRect(1, 1, 2, 2)}},
		{name: "disjoint", a: orb.MultiPolygon{bRect(0, 0, 1, 1)}, b: orb.MultiPolygon{bRect(2, 2, 3, 3)}},
		{name: "equal", a: orb.MultiPolygon{bRect(0, 0, 1, 1)}, b: orb.MultiPolygon{bRect(0, 0, 1, 1)}},
		{name: "k-gap parts meeting at ulp-apart vertices", a: booleanKGapParts,
			refArea: booleanKGapRefArea, refTol: kgapTol, refPolys: 1},
		// Found by FuzzPolygonUnion (corpus 8be00c41a4b1dff9): near the
		// needle's tip the crossings of the other triangle's edge with its
		// two sides round past each other, folding it into a face of
		// winding −1 and area 3e-29, once refused as a misplaced hole.
		{name: "needle folded by rounded crossings", a: orb.MultiPolygon{bPoly(3.25, 3.25, 3.250000001, 3.25, 0, 12), bPoly(0.25, 0.25, 1e-9, 12, 12, 12)}, b: orb.MultiPolygon{bRect(0, 11, 1, 12)}},
		// Found by FuzzPolygonUnion (corpus 2f17ec41a72242fb): the
		// quadrilateral has a spike a few ulps wide ending at the point
		// where the triangle touches it; pulling the quadrilateral's
		// passage back from that point swept its edge across the spike's
		// other side, so only the triangle's passage is pulled back.
		{name: "sliver spike at a pinch point", a: orb.MultiPolygon{
			bPoly(46.37647058823529, 8.094117647058823, 44.01831629136029, 14.333885158752004, 16.008547794117646, 14.333885158752011, 44.01911294364769, 14.333885158752011),
			bPoly(16.188235294117646, 16.188235294117646, 44.0191129436477, 14.33388515875197, 44.0191129436477, 1.0923389955279424e+06),
		}},
		{name: "k-gap parts split between operands", a: booleanKGapParts[:2], b: booleanKGapParts[2:],
			refArea: booleanKGapRefArea, refTol: kgapTol, refPolys: 1},
		// Found by FuzzPolygonUnion (corpus cb5585488b1077ed): three
		// polygons meeting within 1e-12 of one point, one reaching 6e6
		// away. Its long edge passes 1e-12 from the pinch point; the
		// float64 distance to it, measured from its far end, came out 0,
		// so neither touching passage could be pulled back. The polygons
		// only touch: the union's area is the sum of theirs (shoelace
		// sums of a 6e6-long polygon agree to about 1e-4).
		{name: "pinch point beside a far-reaching polygon", a: booleanFarPinch,
			refArea: booleanAbsArea(booleanFarPinch), refTol: farTol, refPolys: 3},
		// Found by FuzzPolygonUnion (corpus 6beec66662044369): two wedges
		// 6e6 long overlapping along a line; their rounded crossings
		// zigzag within ulps of it and the union's boundary closed a loop
		// a few ulps wide at a pinch point, whose two passages could not
		// be pulled apart. The loop is dropped as a sliver.
		{name: "sliver loop at a pinch point on a long overlap", a: orb.MultiPolygon{
			bPoly(6.340800752941176e+06, 1.060912188235294e+06, 44.01911294327353, 14.332359279753895, 46.17315575352985, 3.319020275798394, 6.340803870926663e+06, 1.060912188235294e+06),
			bPoly(6.34108939049979e+06, 1.060912188235294e+06, 44.01911294364769, 14.333885158752011, 46.1731557535083, 3.319020272705887, 44.01911294364643, 14.333885158752),
		}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			aa, ab, ai, ad, au := booleanOpAreas(t, c.a, c.b)
			idTol := math.Max(tol, c.refTol)
			if math.Abs(ad+ai-aa) > idTol || math.Abs(au-(aa+ab-ai)) > idTol {
				t.Errorf("A=%v B=%v A∩B=%v A−B=%v A∪B=%v", aa, ab, ai, ad, au)
			}
			if c.refTol == 0 {
				return
			}
			if math.Abs(au-c.refArea) > c.refTol {
				t.Errorf("area(A∪B) = %.17g, reference %.17g (tolerance %.2g)", au, c.refArea, c.refTol)
			}
			u, err := Union(append(append(orb.MultiPolygon{}, c.a...), c.b...))
			if err != nil {
				t.Fatal(err)
			}
			for _, p := range u {
				if len(p) != 1 {
					t.Errorf("A∪B has a polygon with %d holes", len(p)-1)
				}
			}
			if len(u) != c.refPolys {
				t.Errorf("A∪B is %d polygons, want %d", len(u), c.refPolys)
			}
		})
	}
}

func TestSiteAreaDropsStraightVertices(t *testing.T) {
	var area orb.MultiPolygon
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			area = append(area, bRect(float64(i), float64(j), float64(i+1), float64(j+1)))
		}
	}
	reg, st, err := SiteArea(area, nil)
	if err != nil {
		t.Fatal(err)
	}
	mp := reg.MultiPolygon()
	if len(mp) != 1 || len(mp[0]) != 1 || len(mp[0][0]) != 5 || st.AreaParts != 1 {
		t.Errorf("3×3 parcels gave %v (%+v), want one square of 4 corners", mp, st)
	}
}
