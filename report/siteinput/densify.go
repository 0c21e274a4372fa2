// Edges of the area as the file means them.
//
// RFC 7946 §3.1.1: a GeoJSON edge is the straight line between its
// vertices in longitude/latitude. On the local transverse Mercator plane
// that line is a curve: along a parallel at latitude φ its curvature is
// about κ = tan φ / R (the geodesic curvature of the parallel; plus the
// projection's scale gradient, under |k − 1|/(distance from the central
// meridian)), so a chord of length s drawn between the projected vertices
// misses the curve by the sagitta
//
//	h = s² κ / 8   (a 100 km edge along 44.55°N: about 190 m).
//
// Each edge is therefore densified before it is used: it is cut at the
// parameter midpoint t = 1/2 (in longitude/latitude, or in grid metres for
// an input in a projected CRS, whose edges are straight in the grid) until
// the projected chord of every piece deviates from the projected curve by at
// most δ at t = 1/4, 1/2 and 3/4. Halving a piece divides its sagitta by 4,
// so δ is reached after about log₄(h₀/δ) halvings, and the spacing that
// results is s = √(8δ/κ). The three samples catch an S-shaped piece (an
// edge crossing the equator, where κ changes sign) that the midpoint alone
// would miss.
//
//	δ = densifyMaxDeviation = 1 cm,
//
// the resolution of the written longitude/latitude outputs (1e-7°, 1.1 cm
// along a meridian): a bulge below it cannot show in them. The spacing that
// results is about 710 m along a parallel at 45° (420 pieces for a 300 km
// edge) and 11 m near the pole at 89.9°; edges shorter than about 700 m at
// mid-latitudes stay single chords, as short edges are in most GIS (there
// the straight line in lon/lat, the geodesic and the plane chord differ by
// less than δ). What the chords leave out is bounded below and stated.
//
// Area. Between a chord of length s and a curve of sagitta h lies a
// parabolic segment of area (2/3)·s·h. For each final piece h is taken as
// max(d(1/2), (4/3)·max(d(1/4), d(3/4))) (for a circular arc d(1/4) =
// 3h/4), times densifyAreaSafety = 2 for curvature that varies along the
// piece. The sum over all pieces bounds the area between the chord polygon
// and the polygon the file means; divided by the area it is
// Scene.EdgeAreaError, which Scene.AreaRelError adds to the scale term.
//
// Vertex numbers. Messages about area rings name input vertices: every
// densified ring keeps, per vertex, the index of the input vertex that
// starts its edge (areaPoly.Orig), and regionError translates planar's
// vertex numbers back.

package siteinput

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// densifyMaxDeviation is δ, the largest deviation in metres between a
// projected edge piece and its chord (file comment).
const densifyMaxDeviation = 0.01

// densifyAreaSafety multiplies the sampled sagitta in the area bound.
const densifyAreaSafety = 2.0

// densifyMaxDepth bounds the halvings of one edge (2²⁰ pieces).
const densifyMaxDepth = 20

// edgeMap maps a point of an edge, given in input coordinates, to the
// plane.
type edgeMap func(x, y float64) (float64, float64)

// densifier cuts edges for one tolerance and accumulates the area bound.
type densifier struct {
	delta float64
	m     edgeMap
	// lonLat is true when the input coordinates are longitude/latitude
	// (the cheap curvature bound applies; see shortEdge).
	lonLat bool
	area   float64 // Σ (2/3)·s·h·densifyAreaSafety over the pieces
}

// minCurvatureRadius is below every radius of curvature of the WGS84 and
// GRS80 ellipsoids (the least, meridional at the equator, is 6 335 439 m),
// for the curvature bound of shortEdge.
const minCurvatureRadius = 6.335e6

// shortEdge reports whether the lon/lat-straight edge between input points
// p and q (plane chord length s) surely stays within δ/4 of its chord, and
// then returns its sagitta bound. The curvature of a lon/lat line in the
// plane is at most that of the parallel through its farthest-from-the-
// equator point, tan φ/N, plus the scale gradient of the local plane, which
// is below 1/N; twice their sum bounds it with room to spare, so
// h ≤ s²·2(|tan φ| + 1)/(8·minCurvatureRadius). Most edges of a detailed
// outline pass this test and cost no extra projection.
func (d *densifier) shortEdge(p, q orb.Point, s float64) (float64, bool) {
	if !d.lonLat {
		return 0, false
	}
	lat := math.Max(math.Abs(p[1]), math.Abs(q[1]))
	if lat >= 89.9 {
		return 0, false
	}
	h := s * s * 2 * (math.Tan(lat*math.Pi/180) + 1) / (8 * minCurvatureRadius)
	return h, h <= d.delta/4
}

// ring densifies an input ring (closed or open, input coordinates) and
// returns the projected ring and, per vertex, the input vertex index that
// starts its edge.
func (d *densifier) ring(r orb.Ring) (orb.Ring, []int32) {
	n := len(r)
	proj := make(orb.Ring, n)
	for i, p := range r {
		proj[i][0], proj[i][1] = d.m(p[0], p[1])
	}
	out := make(orb.Ring, 0, n+8)
	orig := make([]int32, 0, n+8)
	for i := 0; i < n; i++ {
		out = append(out, proj[i])
		orig = append(orig, int32(i))
		if i == n-1 && r[0] == r[n-1] {
			break // the closing repeat ends the ring
		}
		j := (i + 1) % n
		if r[i] == r[j] {
			continue
		}
		k := len(out)
		d.edge(r[i], r[j], proj[i], proj[j], &out)
		for range len(out) - k {
			orig = append(orig, int32(i))
		}
	}
	return out, orig
}

// edge appends the projected interior points of the edge p→q (P, Q their
// projections) to out. The points are computed from the edge in a
// canonical direction (the lesser endpoint first), so the two copies of a
// shared edge get identical points.
func (d *densifier) edge(p, q, P, Q orb.Point, out *orb.Ring) {
	s := math.Hypot(Q[0]-P[0], Q[1]-P[1])
	if h, ok := d.shortEdge(p, q, s); ok {
		d.area += 2.0 / 3 * s * h * densifyAreaSafety
		return
	}
	rev := q[0] < p[0] || q[0] == p[0] && q[1] < p[1]
	if rev {
		p, q, P, Q = q, p, Q, P
	}
	var pts orb.Ring
	d.piece(p, q, P, Q, 0, &pts)
	if rev {
		slices.Reverse(pts)
	}
	*out = append(*out, pts...)
}

// piece appends the interior points of the piece a→b (input coordinates;
// A, B their projections), halving it until it is within δ of its chord.
func (d *densifier) piece(a, b, A, B orb.Point, depth int, out *orb.Ring) {
	at := func(t float64) (orb.Point, orb.Point) {
		in := orb.Point{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1])}
		x, y := d.m(in[0], in[1])
		return in, orb.Point{x, y}
	}
	mid, M := at(0.5)
	_, Q1 := at(0.25)
	_, Q3 := at(0.75)
	h := math.Max(chordDistance(A, B, M), 4.0/3*math.Max(chordDistance(A, B, Q1), chordDistance(A, B, Q3)))
	if h <= d.delta || depth >= densifyMaxDepth {
		d.area += 2.0 / 3 * math.Hypot(B[0]-A[0], B[1]-A[1]) * h * densifyAreaSafety
		return
	}
	d.piece(a, mid, A, M, depth+1, out)
	*out = append(*out, M)
	d.piece(mid, b, M, B, depth+1, out)
}

// chordDistance is the distance from p to the line through a and b.
func chordDistance(a, b, p orb.Point) float64 {
	dx, dy := b[0]-a[0], b[1]-a[1]
	l := math.Hypot(dx, dy)
	if l == 0 {
		return math.Hypot(p[0]-a[0], p[1]-a[1])
	}
	return math.Abs(dx*(p[1]-a[1])-dy*(p[0]-a[0])) / l
}

// densifyPolys densifies and projects the rings of the area polygons in
// place (frame f; see the file comment) and returns the area bound
// Σ (2/3)·s·h·densifyAreaSafety in m².
func densifyPolys(polys []areaPoly, f lonFrame) float64 {
	if len(polys) == 0 {
		return 0
	}
	lonlat := func(x, y float64) (float64, float64) { return f.tm.Forward(x, y) }
	d := &densifier{delta: densifyMaxDeviation}
	for i := range polys {
		p := &polys[i]
		p.Orig = make([][]int32, len(p.Rings))
		p.Input = p.Rings // the file's rings; Rings gets the projected ones
		if p.CRS != nil {
			p.Input = p.Grid
		}
		p.Rings = slices.Clone(p.Rings)
		for k := range p.Rings {
			var in orb.Ring
			if p.CRS != nil {
				in = p.Grid[k]
				tm := p.CRS.TM
				d.m = func(x, y float64) (float64, float64) {
					lon, lat := tm.Inverse(x, y)
					return f.forward(lon, lat)
				}
			} else {
				in = make(orb.Ring, len(p.Rings[k]))
				for v, q := range p.Rings[k] {
					in[v] = orb.Point{f.lon(q[0]), q[1]}
				}
				d.m = lonlat
			}
			d.lonLat = p.CRS == nil
			p.Rings[k], p.Orig[k] = d.ring(in)
		}
	}
	return d.area
}

// ringOrigins returns, per polygon and ring of mp, the input vertex index
// of each vertex (nil where a ring was not densified). Rings are found by
// identity: buildArea moves them between polygons without copying.
func ringOrigins(mp orb.MultiPolygon, polys []areaPoly) [][][]int32 {
	byRing := map[*orb.Point][]int32{}
	for _, p := range polys {
		for k, r := range p.Rings {
			if k < len(p.Orig) && len(r) > 0 {
				byRing[&r[0]] = p.Orig[k]
			}
		}
	}
	out := make([][][]int32, len(mp))
	for i, poly := range mp {
		out[i] = make([][]int32, len(poly))
		for k, r := range poly {
			if len(r) > 0 {
				out[i][k] = byRing[&r[0]]
			}
		}
	}
	return out
}
