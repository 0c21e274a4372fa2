// Devices with their own ranges: the power-diagram layout, the uncovered
// area at the planned ranges and under uniform power growth, service areas
// and the devices that are redundant for coverage.
//
// Math. Device i at p_i with range r_i serves the disk D_i = D(p_i, r_i).
// The power of x with respect to i is π_i(x) = |x − p_i|² − r_i², and the
// power (Laguerre–Voronoi) cell P_i holds the points where π_i is smallest
// (Aurenhammer, SIAM J. Comput. 16, 1987). x is covered exactly when
// min_i π_i(x) ≤ 0, and inside P_i that minimum is π_i, so
//
//	U ∩ P_i = D_i ∩ P_i,  uncovered = Σ_i [area(P_i ∩ A) − area(P_i ∩ A ∩ D_i)],
//
// each term the closed-form polygon–disk area (planar.RingDiskArea) with
// the cell's own radius, as for Voronoi cells and a common range. Growing
// every device's power by the same t (r_i' = √(r_i² + t)) keeps the power
// diagram, so the same cells answer every t: the coverage curve under
// uniform power growth and the full-cover figure (the largest min_i π_i over
// A, at a vertex of a clipped power cell since π_i is convex on P_i). With
// all ranges equal to r, t = ρ² − r² is the common range ρ.
//
// A device whose power cell is empty is hidden: its disk lies inside the
// union of the others (every point of D_i has a smaller or equal power with
// respect to some other device, so it is covered by it), so for coverage it
// is redundant. Its input index is listed in Layout.Hidden. The converse
// does not hold: a disk inside another's has a non-empty power cell (the
// half-plane beyond their power line) unless other devices take it, so a
// device may be redundant without being hidden.
//
// Error bounds: as layout.go (each term within about 1e-16 of the cell
// area; fixed chunk order), the radius √(r_i² + t) rounding once more.

package coverage

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// NewLayoutRanges is NewLayout for devices with their own ranges (metres,
// one per site, finite and positive): it builds the regular triangulation
// of the sites weighted by r_i² and clips the power cells to the area.
// When all ranges are equal the layout is NewLayout's (the same
// triangulation and cells, Voronoi cells being the power cells then) with
// Ranges set, so every figure equals the common-range one. Hidden devices
// (empty power cell) are listed in Hidden and have Tri.Vertex −1.
func NewLayoutRanges(sites []orb.Point, ranges []float64, area *planar.Region) (*Layout, error) {
	l, _, _, err := newLayoutRangesTimed(sites, ranges, area, nil)
	return l, err
}

// checkRanges returns an error naming the first site whose range is not a
// positive finite number, or a count mismatch.
func checkRanges(sites []orb.Point, ranges []float64) error {
	if len(ranges) != len(sites) {
		return fmt.Errorf("coverage: %d sites but %d ranges", len(sites), len(ranges))
	}
	for i, r := range ranges {
		if math.IsNaN(r) || math.IsInf(r, 0) || !(r > 0) {
			return fmt.Errorf("coverage: site %d has range %v m; a range must be a positive finite number", i, r)
		}
	}
	return nil
}

// newLayoutRangesTimed is NewLayoutRanges returning the seconds spent
// triangulating and clipping. When afterTri is not nil it is called once
// the triangulation is built, with the layout complete but for Cells (set
// once clipped; afterTri may start work that reads everything else while
// the cells are clipped). With equal ranges it is called with the whole
// layout.
func newLayoutRangesTimed(sites []orb.Point, ranges []float64, area *planar.Region, afterTri func(*Layout)) (*Layout, float64, float64, error) {
	if err := checkRanges(sites, ranges); err != nil {
		return nil, 0, 0, err
	}
	if rangesEqual(ranges) {
		l, t1, t2, err := newLayoutTimed(sites, area)
		if err != nil {
			return nil, 0, 0, err
		}
		l.Ranges = make([]float64, l.numVertices())
		for v := range l.Ranges {
			l.Ranges[v] = ranges[0]
		}
		l.Hidden = []int{}
		l.InputRanges = append([]float64(nil), ranges...)
		if afterTri != nil {
			afterTri(l)
		}
		return l, t1, t2, nil
	}
	if len(sites) == 0 {
		return nil, 0, 0, errors.New("coverage: no sites")
	}
	if area == nil {
		return nil, 0, 0, errors.New("coverage: no site area (nil region)")
	}
	am := area.Area()
	if !(am > 0) || math.IsInf(am, 0) {
		return nil, 0, 0, fmt.Errorf("coverage: site area has no positive finite area (%v m²)", am)
	}
	t0 := time.Now()
	rt, vr, err := triangulateRanges(sites, ranges)
	if err != nil {
		return nil, 0, 0, err
	}
	t1 := time.Now()
	l := &Layout{Sites: sites, Area: area, Tri: &rt.Triangulation, AreaM2: am, Ranges: vr}
	l.InputRanges = append([]float64(nil), ranges...)
	l.Hidden = make([]int, len(rt.Hidden))
	for k, i := range rt.Hidden {
		l.Hidden[k] = int(i)
	}
	if afterTri != nil {
		afterTri(l)
	}
	t1c := time.Now()
	cells, err := rt.PowerCells(area)
	if err != nil {
		return nil, 0, 0, fmt.Errorf("coverage: clipping power cells to the site area: %w", err)
	}
	l.Cells = cells
	return l, t1.Sub(t0).Seconds(), time.Since(t1c).Seconds(), nil
}

// weighted reports whether the layout has per-device ranges.
func (l *Layout) weighted() bool { return l.Ranges != nil }

// grownRadius returns the radius √(r_v² + t) of vertex v's disk after a
// uniform power growth t (0 when r_v² + t ≤ 0: the disk has vanished).
func (l *Layout) grownRadius(v int32, t float64) float64 {
	r := l.Ranges[v]
	if t == 0 {
		return r
	}
	return math.Sqrt(math.Max(0, r*r+t))
}

// GrownRanges returns each device's range after a uniform power growth t
// (m²): √(r_i² + t), 0 where that is not positive; indexed by input, hidden
// devices included. Nil for a common-range layout.
func (l *Layout) GrownRanges(t float64) []float64 {
	if !l.weighted() {
		return nil
	}
	out := make([]float64, len(l.Sites))
	for i, r := range l.InputRanges {
		out[i] = math.Sqrt(math.Max(0, r*r+t))
		if t == 0 {
			out[i] = r
		}
	}
	return out
}

// UncoveredAreaGrown returns the uncovered area (m²) when every device's
// range is √(r_i² + t) (t = 0: the planned ranges), by the exact closed
// form summed over the power cells. For a common-range layout it is
// UncoveredArea(√t). NaN gives NaN.
func (l *Layout) UncoveredAreaGrown(t float64) float64 {
	if math.IsNaN(t) {
		return math.NaN()
	}
	if !l.weighted() {
		return l.UncoveredArea(math.Sqrt(math.Max(0, t)))
	}
	return l.uncovered(0, t, true)
}

// CoveredFractionGrown is UncoveredAreaGrown as a covered fraction of the
// site area, in [0, 1].
func (l *Layout) CoveredFractionGrown(t float64) float64 {
	return coveredFromUncovered(l.UncoveredAreaGrown(t), l.AreaM2)
}

// RangesServiceArea is one device's share of the site area when devices
// have their own ranges: its power cell clipped to the area.
type RangesServiceArea struct {
	ServiceArea
	// Range is the device's planned range (m).
	Range float64
	// Served is the part of the share within the device's range (m²):
	// area(P_i ∩ A ∩ D_i), what the device actually covers of its share.
	Served float64
}

// ServiceAreasRanges returns, for a layout with per-device ranges, one
// entry per distinct, not hidden device ordered by input index (ServiceArea
// with the power cell, Farthest the range this device needs to serve its
// whole share alone) with its range and served area. Nil for a
// common-range layout.
func (l *Layout) ServiceAreasRanges() []RangesServiceArea {
	if !l.weighted() {
		return nil
	}
	nv := l.numVertices()
	out := make([]RangesServiceArea, nv)
	c := l.Cells
	planar.ParallelChunks(nv, 4096, 0, func(_, lo, hi int) {
		for v := int32(lo); v < int32(hi); v++ {
			d, x, y := l.vertexFarthest(v)
			if d < 0 {
				d = 0
			}
			cx, cy := l.site(v)
			served := 0.0
			k0, k1 := c.PolyStart[c.SiteStart[v]], c.PolyStart[c.SiteStart[v+1]]
			for k := k0; k < k1; k++ {
				served += planar.RingDiskArea(c.XY[2*c.RingStart[k]:2*c.RingStart[k+1]], cx, cy, l.Ranges[v])
			}
			out[v] = RangesServiceArea{
				ServiceArea: ServiceArea{
					Site: int(l.Tri.Source[v]), Vertex: v, Area: c.Area[v], Share: c.Area[v] / l.AreaM2,
					Farthest: d, FarthestPoint: orb.Point{x, y},
				},
				Range:  l.Ranges[v],
				Served: math.Min(math.Max(served, 0), c.Area[v]),
			}
		}
	})
	for i, v := range l.Tri.Vertex {
		if v >= 0 && int32(i) != l.Tri.Source[v] {
			out[v].Merged = append(out[v].Merged, i)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Site < out[j].Site })
	return out
}

// RangesFullCover is the full-cover figure for devices with their own
// ranges: the uncovered point that needs the most, max over A of
// min_i π_i(x), attained at a vertex of a clipped power cell (π_i is convex
// on P_i), and the ranges that cover the whole area under uniform power
// growth.
type RangesFullCover struct {
	// Power is t* = max over A of min_i π_i(x) (m²). Growing every
	// device's power by t* (r_i' = √(r_i² + t*)) covers the whole area, and
	// no smaller uniform growth does; t* ≤ 0 when the planned ranges
	// already cover it.
	Power float64
	// Worst lists the points attaining Power (ties within 1e-9 of the
	// squared distance to their device), WorstSites the input index of the
	// device whose power cell holds each.
	Worst      []orb.Point
	WorstSites []int
	// Needed is each device's range after that growth, √(r_i² + t*), by
	// input index (hidden devices included; 0 where not positive).
	Needed []float64
	// Covered is true when the planned ranges cover the whole area.
	Covered bool
}

// FullCoverRanges returns the full-cover figure of a layout with
// per-device ranges (a common-range layout is treated as ranges all equal
// to 0, so Needed is the full-cover range for each device).
func (l *Layout) FullCoverRanges() RangesFullCover {
	if !l.weighted() || l.equalRanges() {
		// Voronoi cells: the common-range figure, to the last digit.
		fc := l.FullCover()
		r0 := 0.0
		if l.weighted() {
			r0 = l.Ranges[0]
		}
		out := RangesFullCover{Power: fc.Range*fc.Range - r0*r0, Worst: fc.Worst, WorstSites: fc.WorstSites, Covered: fc.Range <= r0}
		out.Needed = make([]float64, len(l.Sites))
		for i := range out.Needed {
			out.Needed[i] = fc.Range
		}
		return out
	}
	fc := l.fullCover(true)
	out := RangesFullCover{Power: fc.Range, Worst: fc.Worst, WorstSites: fc.WorstSites, Covered: fc.Range <= 0}
	out.Needed = l.GrownRanges(fc.Range)
	return out
}

// CurveRanges returns the coverage curve of a layout with per-device
// ranges under uniform power growth: its argument is the growth t (m²),
// every device's range being √(r_i² + t) (t = 0: the planned ranges). The
// Curve methods then take and return powers: UncoveredArea(t),
// CoveredFraction(t), RangeFor(fraction) (the smallest t reaching it; the
// ranges are GrownRanges(t)), FullCoverRange (the full-cover power) and
// Samples (from the smallest −r_i² to the full-cover power). Nil for a
// common-range layout (use Curve).
func (l *Layout) CurveRanges() *Curve {
	if !l.weighted() {
		return nil
	}
	cv := l.Curve()
	nv := l.numVertices()
	cv.w = make([]float64, nv)
	wmax := 0.0
	cv.lo = math.Inf(1)
	for v, r := range l.Ranges {
		cv.w[v] = r * r
		wmax = math.Max(wmax, cv.w[v])
		cv.lo = math.Min(cv.lo, -cv.w[v])
	}
	cv.full, cv.contact = math.Inf(-1), math.Inf(1)
	for p := range cv.pieceArea {
		w := cv.w[cv.pieceV[p]]
		cv.full = math.Max(cv.full, cv.pieceMax[p]*cv.pieceMax[p]-w)
		ct := cv.pieceMin[p]*cv.pieceMin[p] - w
		if cv.pieceIn[p] {
			ct = -w
		}
		cv.contact = math.Min(cv.contact, ct)
	}
	if len(cv.pieceArea) == 0 {
		cv.full, cv.contact = cv.lo, cv.lo
	}
	cv.tol = crvTol * (math.Abs(cv.full) + wmax)
	return cv
}

// triangulateRanges returns the regular triangulation of the devices at
// sites with weights ranges² and the range of each of its vertices.
func triangulateRanges(sites []orb.Point, ranges []float64) (*planar.RegularTriangulation, []float64, error) {
	w := make([]float64, len(ranges))
	for i, r := range ranges {
		w[i] = r * r
	}
	rt, err := planar.TriangulateRegular(sites, w)
	if err != nil {
		return nil, nil, fmt.Errorf("coverage: triangulating %d devices with their ranges: %w", len(sites), err)
	}
	vr := make([]float64, rt.NumVertices())
	for v, i := range rt.Source {
		vr[v] = ranges[i]
	}
	return rt, vr, nil
}
