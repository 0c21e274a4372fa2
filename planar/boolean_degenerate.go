// Polygon overlay: the inputs it refuses as near-degenerate.
//
// Crossing points are rounded to float64 (boolean_node.go), so features of
// the operands that lie within a few ulps of one point — vertices of
// different rings 1e-12 apart, a long edge passing an ulp from a pinch
// point — can leave result rings that touch or cross at that point after
// every repair (merging ulp-close vertices, dropping slivers, opening
// pinches). The overlay then refuses the input with a *NearDegenerateError
// naming the point, rather than return rings NewRegion would refuse. GEOS
// behaves alike on such inputs (shapely 1.8.5 raises a TopologyException on
// the k-gap parts of boolean_test.go). Snapping the operands to a grid a
// few hundred ulps coarse first (as coverage does for k-gap parts) removes
// the cause.
//
// The error is given only when the result fails NewRegion's exact check
// and two distinct result vertices lie within nearDegenerateUlps ulps of
// each other (the evidence: an ordinary overlay never puts distinct
// vertices that close), or when pinch opening cannot separate the rings at
// a point, or when noding does not settle (rounded crossings of
// near-collinear edges that keep landing across each other: the published
// cure is snap rounding, not done here); any other invalid result is an
// internal error.

package planar

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// NearDegenerateError is the refusal of an overlay whose operands have
// features within a few ulps of the point (X, Y).
type NearDegenerateError struct {
	X, Y   float64 // the point
	Detail string  // what could not be separated there
}

// Error implements error.
func (e *NearDegenerateError) Error() string {
	return fmt.Sprintf("features within a few ulps of (%v, %v): %s; snap the coordinates to a coarser grid (e.g. 1 mm)", e.X, e.Y, e.Detail)
}

// nearDegenerateUlps is the distance, in ulps of the larger coordinate
// magnitude, below which two distinct result vertices are taken as
// evidence of a near-degenerate input: the merging pass of
// boolean_extract.go joins consecutive vertices closer than a few ulps,
// and pinch opening separates passages by booleanPinchSep ulps, so closer
// pairs left in a result are ones the repairs could not reach.
const nearDegenerateUlps = 4 * booleanPinchSep

// checkResult runs NewRegion's exact validity check on an overlay result,
// and checks that every exterior runs counter-clockwise and every hole
// clockwise (exact turn, regionRingCCW; NewRegion itself would silently
// reorient a ring traced the wrong way round, which only a rounding fault
// produces), and turns a failure into a *NearDegenerateError when two
// distinct vertices of res lie within nearDegenerateUlps ulps of scale
// (the largest coordinate magnitude of the operands, which bounds the
// rounding of every crossing point), else into an internal error.
// O(n log n).
func checkResult(res orb.MultiPolygon, scale float64) error {
	if len(res) == 0 {
		return nil
	}
	_, err := NewRegion(res)
	if err == nil {
		err = checkOrientation(res)
	}
	if err == nil {
		return nil
	}
	if x, y, ok := closeVertexPair(res, scale); ok {
		return &NearDegenerateError{X: x, Y: y, Detail: fmt.Sprintf("the result's rings touch or cross after rounding (%v)", err)}
	}
	return fmt.Errorf("internal error: result not accepted by NewRegion: %w", err)
}

// checkOrientation reports the first ring of res that runs the wrong way:
// an exterior clockwise or a hole counter-clockwise. O(n).
func checkOrientation(res orb.MultiPolygon) error {
	for p, poly := range res {
		for k, r := range poly {
			if len(r) > 1 && r[0] == r[len(r)-1] {
				r = r[:len(r)-1]
			}
			if regionRingCCW(FlatRing(r)) != (k == 0) {
				return fmt.Errorf("polygon %d, ring %d: runs the wrong way round", p, k)
			}
		}
	}
	return nil
}

// booleanScale is the largest coordinate magnitude of the operands (at
// least 1).
func booleanScale(ops ...orb.MultiPolygon) float64 {
	m := 1.0
	for _, mp := range ops {
		for _, p := range mp {
			for _, r := range p {
				for _, q := range r {
					m = max(m, math.Abs(q[0]), math.Abs(q[1]))
				}
			}
		}
	}
	return m
}

// closeVertexPair returns a vertex of res that has a distinct vertex of
// res within nearDegenerateUlps ulps in both coordinates, ulps of the
// larger of the vertex's magnitude and scale. O(n log n).
func closeVertexPair(res orb.MultiPolygon, scale float64) (float64, float64, bool) {
	var pts []orb.Point
	for _, p := range res {
		for _, r := range p {
			pts = append(pts, r...)
		}
	}
	slices.SortFunc(pts, func(a, b orb.Point) int {
		if a[0] != b[0] {
			if a[0] < b[0] {
				return -1
			}
			return 1
		}
		switch {
		case a[1] < b[1]:
			return -1
		case a[1] > b[1]:
			return 1
		}
		return 0
	})
	for i := range pts {
		eps := nearDegenerateUlps * 0x1p-52 * max(scale, math.Abs(pts[i][0]), math.Abs(pts[i][1]))
		for j := i + 1; j < len(pts) && pts[j][0]-pts[i][0] <= eps; j++ {
			if pts[j] != pts[i] && math.Abs(pts[j][1]-pts[i][1]) <= eps {
				return pts[i][0], pts[i][1], true
			}
		}
	}
	return 0, 0, false
}
