// Assignment of demand points (buildings, assets) to their serving device.
//
// Each demand point is served by its nearest device (the device whose
// Voronoi cell holds it), found by planar's exact nearest-vertex search
// (greedy descent over Delaunay neighbours with exact distance comparisons,
// run in parallel over the queries, fed in a serpentine bucket order so
// that each descent starts next to its answer); equally near devices resolve to the
// smallest vertex, reported as its smallest input index, so exact duplicate
// devices take their load on the first of them. A point is within range
// when its distance to that device is at most the planned range r. The
// distance is the correctly rounded Euclidean distance (math.Hypot) of the
// coordinate differences.
//
// Polygons (buildings) are assigned by a representative point: the area
// centroid when the polygon holds it, otherwise the midpoint of the
// longest interior run of the horizontal line through the centroid (a
// point-on-surface construction in the manner of GEOS's InteriorPoint,
// common practice in GIS), so that the point always lies on the polygon.
// The centroid is the shoelace-weighted mean of the triangle centroids
// (planar.RingMoments), taken relative to the first vertex (relative error
// of order n·u of the polygon's extent); whether the polygon holds it is
// decided exactly, boundary included (planar.RingSet.Locate).

package coverage

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// DeviceLoad is the demand assigned to one device.
type DeviceLoad struct {
	// Count is the number of demand points the device serves.
	Count int
	// Weight is the summed weight of those points.
	Weight float64
	// InRange is the number of them within the planned range.
	InRange int
	// InRangeWeight is the summed weight of those within range.
	InRangeWeight float64
}

// Assignment maps every demand point to its serving device.
type Assignment struct {
	// Range is the planned range (metres); 0 from AssignRanges.
	Range float64
	// Ranges holds each device's own range by input index (AssignRanges);
	// nil for one common range.
	Ranges []float64
	// Device holds, per demand point, the input index of its serving
	// (nearest) device.
	Device []int
	// Distance holds, per demand point, the distance to that device (m).
	Distance []float64
	// Within holds, per demand point, whether Distance ≤ Range.
	Within []bool
	// Weight holds, per demand point, its weight (1 when none was given).
	Weight []float64
	// Load holds, per device input index, the demand it serves. Devices
	// at exactly the same spot as an earlier one serve nothing.
	Load []DeviceLoad
	// Served and Unserved count the demand points within and beyond range;
	// ServedWeight and UnservedWeight sum their weights.
	Served, Unserved             int
	ServedWeight, UnservedWeight float64
}

// Assign assigns each demand point to its nearest device at the planned
// range r. weights may be nil (every point weighs 1) or hold one finite,
// non-negative weight per point. A million points take well under a
// second (the nearest-device search runs on every core).
//
// Assignments are planning aids: they follow the disk model, not measured
// signal strength.
func Assign(l *Layout, points []orb.Point, weights []float64, r float64) (*Assignment, error) {
	const where = "coverage: Assign"
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if l.Tri.NumVertices() == 0 {
		return nil, fmt.Errorf("%s: the layout has no device to assign to", where)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r < 0 {
		return nil, fmt.Errorf("%s: range %v must be a finite number ≥ 0", where, r)
	}
	xy, w, err := planAssignInputs(where, points, weights)
	if err != nil {
		return nil, err
	}
	t := l.Tri
	near := planNearestSorted(t, xy)
	a := newAssignment(l, w)
	a.Range = r
	a.fill(t, near, xy, r, nil)
	return a, nil
}

// planAssignInputs checks the demand points and weights of an assignment
// and returns the points interleaved and each point's weight.
func planAssignInputs(where string, points []orb.Point, weights []float64) ([]float64, []float64, error) {
	xy := make([]float64, 2*len(points))
	for i, p := range points {
		if err := planCheckPoint(p); err != nil {
			return nil, nil, fmt.Errorf("%s: point %d: %w", where, i, err)
		}
		xy[2*i], xy[2*i+1] = p[0], p[1]
	}
	w, err := planAssignWeights(where, len(points), weights)
	return xy, w, err
}

// newAssignment returns an empty assignment of len(w) points with weights
// w to the devices of l.
func newAssignment(l *Layout, w []float64) *Assignment {
	return &Assignment{
		Device:   make([]int, len(w)),
		Distance: make([]float64, len(w)),
		Within:   make([]bool, len(w)),
		Weight:   w,
		Load:     make([]DeviceLoad, len(l.Sites)),
	}
}

// fill sets each point's device (the source of vertex near[i]), distance
// and whether it is within reach: within ranges[v] of vertex v, or r when
// ranges is nil; then tallies the loads.
func (a *Assignment) fill(t *planar.Triangulation, near []int32, xy []float64, r float64, ranges []float64) {
	planParallel(len(near), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			v := near[i]
			a.Device[i] = int(t.Source[v])
			d := math.Hypot(xy[2*i]-t.Coords[2*v], xy[2*i+1]-t.Coords[2*v+1])
			a.Distance[i] = d
			reach := r
			if ranges != nil {
				reach = ranges[v]
			}
			a.Within[i] = d <= reach
		}
	})
	a.tally()
}

// planAssignWeights returns the weight of each of n points: 1 when
// weights is nil, else weights checked (finite, ≥ 0; one per point).
func planAssignWeights(where string, n int, weights []float64) ([]float64, error) {
	if weights != nil && len(weights) != n {
		return nil, fmt.Errorf("%s: %d weights for %d points", where, len(weights), n)
	}
	w := make([]float64, n)
	for i := range w {
		w[i] = 1
		if weights != nil {
			if x := weights[i]; math.IsNaN(x) || math.IsInf(x, 0) || x < 0 {
				return nil, fmt.Errorf("%s: point %d: weight %v must be a finite number ≥ 0", where, i, x)
			}
			w[i] = weights[i]
		}
	}
	return w, nil
}

// tally sums the loads and the served and unserved counts from Device,
// Within and Weight.
func (a *Assignment) tally() {
	for i, dev := range a.Device {
		ld := &a.Load[dev]
		ld.Count++
		ld.Weight += a.Weight[i]
		if a.Within[i] {
			ld.InRange++
			ld.InRangeWeight += a.Weight[i]
			a.Served++
			a.ServedWeight += a.Weight[i]
		} else {
			a.Unserved++
			a.UnservedWeight += a.Weight[i]
		}
	}
}

// AssignPolygons assigns each polygon (a building, a yard) by its
// representative point (see RepresentativePoint), and returns those points
// alongside. weights are as for Assign.
func AssignPolygons(l *Layout, polys []orb.Polygon, weights []float64, r float64) (*Assignment, []orb.Point, error) {
	pts := make([]orb.Point, len(polys))
	for i, p := range polys {
		q, err := RepresentativePoint(p)
		if err != nil {
			return nil, nil, fmt.Errorf("coverage: AssignPolygons: polygon %d: %w", i, err)
		}
		pts[i] = q
	}
	a, err := Assign(l, pts, weights, r)
	if err != nil {
		return nil, nil, err
	}
	return a, pts, nil
}

// RepresentativePoint returns a point that lies on the polygon: its area
// centroid when the polygon (exterior minus holes) holds it, otherwise the
// midpoint of the longest run of the horizontal line through the centroid
// inside the polygon. The polygon needs an exterior ring of at least three
// distinct points and non-zero area; coordinates must be finite.
func RepresentativePoint(p orb.Polygon) (orb.Point, error) {
	if len(p) == 0 {
		return orb.Point{}, fmt.Errorf("no ring")
	}
	for k, ring := range p {
		for i, q := range ring {
			if err := planCheckPoint(q); err != nil {
				return orb.Point{}, fmt.Errorf("ring %d, vertex %d: %w", k, i, err)
			}
		}
	}
	ext := p[0]
	if len(ext) < 3 {
		return orb.Point{}, fmt.Errorf("ring 0: %d points, need at least 3", len(ext))
	}
	ox, oy := ext[0][0], ext[0][1]
	var a, sx, sy float64
	var rings planar.RingSet
	for k, ring := range p {
		xy := planar.FlatRing(ring)
		rings.AppendRing(xy)
		ra, rx, ry := planar.RingMoments(xy, ox, oy)
		// Holes count negative whatever their orientation.
		if (k == 0) != (ra >= 0) {
			ra, rx, ry = -ra, -rx, -ry
		}
		a += ra
		sx += rx
		sy += ry
	}
	if !(a != 0) {
		return orb.Point{}, fmt.Errorf("zero area")
	}
	// The polygon is closed (the module's boundary convention): a centroid
	// on its boundary is a point of it.
	c := orb.Point{ox + sx/a, oy + sy/a}
	if rings.Locate(c[0], c[1]) >= 0 {
		return c, nil
	}
	// Longest interior run of the line y = c.y (Sutherland-free even-odd
	// crossings); fall back to the bounding-box middle line.
	for _, y := range []float64{c[1], (ext.Bound().Min[1] + ext.Bound().Max[1]) / 2} {
		var xs []float64
		for _, ring := range p {
			n := len(ring)
			for i := 0; i < n; i++ {
				a, b := ring[i], ring[(i+1)%n]
				if (a[1] > y) != (b[1] > y) {
					xs = append(xs, a[0]+(y-a[1])*(b[0]-a[0])/(b[1]-a[1]))
				}
			}
		}
		slices.Sort(xs)
		best, bx := -1.0, 0.0
		for i := 0; i+1 < len(xs); i += 2 {
			if w := xs[i+1] - xs[i]; w > best {
				best, bx = w, (xs[i]+xs[i+1])/2
			}
		}
		if best >= 0 {
			return orb.Point{bx, y}, nil
		}
	}
	return orb.Point{ext[0][0], ext[0][1]}, nil
}

// planNearestSorted answers t.NearestMany for the queries xy, fed in a
// spatially coherent order: queries are bucketed on a grid of about one
// device per bucket and the buckets visited row by row, alternating
// direction (a serpentine order), so each search starts from the previous
// answer, a device next to the query (O(1) steps each instead of O(√n)
// from a distant hint). The answers do not depend on the order.
func planNearestSorted(t *planar.Triangulation, xy []float64) []int32 {
	return planSortedQueries(t.NumVertices(), xy, t.NearestMany)
}

// planSortedQueries feeds the queries xy to answer (which fills one vertex
// per query) in the serpentine bucket order of planNearestSorted, for a
// triangulation of nv vertices, and returns the answers in query order.
func planSortedQueries(nv int, xy []float64, answer func(xy []float64, out []int32)) []int32 {
	nq := len(xy) / 2
	out := make([]int32, nq)
	if nq < 4096 {
		answer(xy, out)
		return out
	}
	minX, minY, maxX, maxY := planar.BoundsXY(xy, nil)
	g := planar.NewBucketGrid(planar.GridOfCells(minX, minY, maxX, maxY, min(nq, nv)), xy, nil)
	perm := make([]int32, 0, nq)
	for j := 0; j < g.NY; j++ {
		for i := 0; i < g.NX; i++ {
			if j%2 == 1 {
				perm = append(perm, g.Bucket(j*g.NX+g.NX-1-i)...)
			} else {
				perm = append(perm, g.Bucket(j*g.NX+i)...)
			}
		}
	}
	sorted := make([]float64, 2*nq)
	for j, i := range perm {
		sorted[2*j], sorted[2*j+1] = xy[2*i], xy[2*i+1]
	}
	res := g.Items // reuse
	answer(sorted, res)
	for j, i := range perm {
		out[i] = res[j]
	}
	return out
}

// planCheckPoint reports a coordinate that is not finite.
func planCheckPoint(p orb.Point) error {
	for k, c := range p {
		axis := "x"
		if k == 1 {
			axis = "y"
		}
		if math.IsNaN(c) {
			return fmt.Errorf("%s coordinate is NaN", axis)
		}
		if math.IsInf(c, 0) {
			return fmt.Errorf("%s coordinate is infinite", axis)
		}
	}
	return nil
}
