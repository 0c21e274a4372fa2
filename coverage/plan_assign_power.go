// Assignment of demand points by power cell, for devices with their own
// ranges.
//
// The rule, applied exactly to the rounded coordinates up to the power
// comparison stated below: a demand point q is served by the device whose
// power cell holds it, the device i of smallest power π_i(q) = |q − p_i|² −
// r_i² (Aurenhammer, SIAM J. Comput. 16, 1987), and it is within reach when
// it lies in that device's own disk, |q − p_i| ≤ r_i. Because U ∩ P_i = D_i
// ∩ P_i (the union of the disks meets the power cell only in the cell's own
// disk), "within reach" is exactly "covered": an item is out of reach of
// its device only when no device reaches it. The serving device is the
// one whose service area (the power cell shown by analyze, cells and the
// maps) holds the item, so the loads add up to the service areas; it is
// not always the nearest device: a point inside a near sensor's small disk
// and deep inside a far gateway's large one belongs to the gateway when its
// power there is smaller. Hidden devices (empty power cell: their disk is
// covered by the others) serve nothing. With all ranges equal the power
// cells are the Voronoi cells and the rule is Assign's (nearest device),
// computed by Assign itself.
//
// Method. Greedy descent over the regular triangulation
// (planar.RegularTriangulation.NearestPower: each step strictly lowers the
// power, and a vertex without a neighbour of smaller power owns the point),
// the queries fed in the serpentine bucket order of planNearestSorted so
// that each descent starts from the previous answer. Power differences are
// compared in floating point (planar/regular_nearest.go): a point within a
// few ulps of a power line may go to either device of the tie. Distances
// are the correctly rounded math.Hypot of the coordinate differences,
// compared with the device's range as given.

package coverage

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// AssignPowerCells assigns each demand point of a layout with per-device
// ranges (NewLayoutRanges) to the device whose power cell holds it, within
// reach when inside that device's own disk (the file comment states the
// rule). weights are as for Assign. The result's Ranges holds every
// device's range by input index; hidden devices get no load. With all
// ranges equal the result is Assign's at that range (Range set, Ranges as
// well).
func AssignPowerCells(l *Layout, points []orb.Point, weights []float64) (*Assignment, error) {
	const where = "coverage: AssignPowerCells"
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if !l.weighted() {
		return nil, fmt.Errorf("%s: the layout has one common range (use Assign)", where)
	}
	if l.inputRangesEqual() {
		a, err := Assign(l, points, weights, l.InputRanges[0])
		if a != nil {
			a.Ranges = append([]float64(nil), l.InputRanges...)
		}
		return a, err
	}
	if l.Tri.NumVertices() == 0 {
		return nil, fmt.Errorf("%s: the layout has no device to assign to", where)
	}
	xy, w, err := planAssignInputs(where, points, weights)
	if err != nil {
		return nil, err
	}
	rt := l.regular()
	near := planSortedQueries(rt.NumVertices(), xy, func(q []float64, out []int32) {
		planParallel(len(q)/2, func(lo, hi int) {
			hint := int32(-1)
			for i := lo; i < hi; i++ {
				out[i] = rt.NearestPower(q[2*i], q[2*i+1], hint)
				hint = out[i]
			}
		})
	})
	a := newAssignment(l, w)
	a.Ranges = append([]float64(nil), l.InputRanges...)
	a.fill(l.Tri, near, xy, 0, l.Ranges)
	return a, nil
}

// regular returns the regular triangulation of a layout with per-device
// ranges as planar.RegularTriangulation (a view: the arrays are shared),
// each vertex weighted by its range squared.
func (l *Layout) regular() *planar.RegularTriangulation {
	w := make([]float64, len(l.Ranges))
	for v, r := range l.Ranges {
		w[v] = r * r
	}
	return &planar.RegularTriangulation{Triangulation: *l.Tri, Weights: w}
}

// inputRangesEqual reports whether every input device has the same range
// (hidden devices included): the layout is then NewLayout's, with Voronoi
// cells and no hidden device.
func (l *Layout) inputRangesEqual() bool {
	for _, r := range l.InputRanges {
		if r != l.InputRanges[0] {
			return false
		}
	}
	return true
}
