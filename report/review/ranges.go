// Devices with their own ranges in the review session.
//
// Model. Device i has its own range b_i (the range column or its type's
// range). The power π_i(x) = |x − p_i|² − b_i² replaces the distance and
// the layout is the power diagram (coverage.NewLayoutRanges; Aurenhammer,
// SIAM J. Comput. 16, 1987): a device whose power cell is empty is hidden,
// its disk inside the union of the others. The range slider scales all
// ranges by uniform power growth: every device's range becomes
// √(b_i² + t) with one growth t (m²), the slider showing the largest
// range √(max b_i² + t). Growing every power by the same t keeps the power
// diagram, so a slider move reuses the layout (UncoveredAreaGrown,
// GapsRanges at t), as a range edit does with one common range; and it is
// the growth coverage.AnalyzeRanges reports the full-cover figure and the
// gaps' closings in. The slider may not shrink any device to nothing:
// its least value is √(max b_i² − min b_i²).
//
// Setting one device's range (or every device's of a type) first fixes
// the grown ranges as the devices' own (b_i ← √(b_i² + t), t ← 0), then
// sets the new one and lays the devices out again. Added devices take the
// range given, else the largest range in the plan, the same way. On a plan
// with one common range r the same edit switches the session to own
// ranges: every device takes b_i = r, then the one (or the type) is set;
// undo returns to the common-range state (session.undoLast restores the
// snapshot's device list, range and mode, and lays it out the same way).
//
// Every figure is the one coverage.AnalyzeRanges reports for the devices
// in service at ranges √(b_i² + t): the same Layout methods it chains
// (FullCoverRanges, UncoveredAreaGrown, GapsRanges, PersistenceRanges and
// its Betti numbers) on the same layout, at the growth t instead of 0.

package review

import (
	"math"
	"slices"
	"strings"
	"sync"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// rangedGeo is what a layout with own ranges adds to geometry.
type rangedGeo struct {
	full coverage.RangesFullCover
	// curve is nil until asked for (rangedCurve), as is geometry.share.
	curve *coverage.Curve
	pers  *coverage.PowerPersistence
	// persWG is done when pers is set (buildRanged; compute waits).
	persWG sync.WaitGroup
	// w2max and w2min are the largest and smallest b_i² in service.
	w2max, w2min float64
	services     []coverage.RangesServiceArea // on first request
	// fails holds the failures asked about (failures.go) by layout input
	// index, at growth failT; dropped when the growth changes.
	fails map[int]coverage.DeviceFailure
	failT float64
	// failIx answers those failures one device at a time (on first use).
	failIx *coverage.RangesFailures
}

// buildRanged lays out the devices in service with their own ranges.
func buildRanged(g *geometry, pts []orb.Point, devs []device, cfg *Config) error {
	ranges := make([]float64, len(g.active))
	rg := &rangedGeo{w2min: math.Inf(1)}
	for k, i := range g.active {
		b := devs[i].R
		ranges[k] = b
		rg.w2max, rg.w2min = max(rg.w2max, b*b), min(rg.w2min, b*b)
	}
	l, err := coverage.NewLayoutRanges(pts, ranges, cfg.Region)
	if err != nil {
		return refuse(422, "the devices in service cannot be laid out: %v", err)
	}
	g.layout, g.ranged = l, rg
	// The persistence reads only the triangulation and the ranges (no
	// layout method writes to the layout): it runs beside the full cover
	// and the range-dependent figures (uncovered area, gaps) on the second
	// core, and compute waits for it before the layout is used.
	rg.persWG.Go(func() { rg.pers = l.PersistenceRanges() })
	rg.full = l.FullCoverRanges()
	if cfg.grid == nil {
		cfg.grid = curveGrid(curveTop(math.Sqrt(max(0, rg.w2max+rg.full.Power)), cfg.Range, cfg.maxRange))
	}
	return nil
}

// rangedCurve computes the coverage curve of a layout with own ranges and
// its covered shares at the sample ranges grid, on first use after the
// layout (the curve is deferred, not approximated): an edit answer the
// page asks to have "later" leaves it out, and the page fetches it
// (GET /api/curve) once the new plan is painted. The same calls on the
// same layout in the same order as when it was computed with the layout,
// so the values are identical; a slider move keeps the layout and the
// curve with it. Nothing to do with one common range (the curve is
// incremental there, curve.go) or when done.
func (g *geometry) rangedCurve(grid []float64) {
	rg := g.ranged
	if rg == nil || g.share != nil {
		return
	}
	rg.curve = g.layout.CurveRanges()
	share := make([]float64, len(grid))
	for k, r := range grid {
		share[k] = rg.curve.CoveredFraction(r*r - rg.w2max)
	}
	g.share = share
}

// growthFor is the growth t at which the largest range in service is r
// (the slider's value); it refuses an r that shrinks a device to nothing.
func (rg *rangedGeo) growthFor(r float64) (float64, error) {
	t := r*r - rg.w2max
	if !(rg.w2min+t > 0) {
		return 0, refuse(422, "largest range %.2f m would shrink the device of the smallest range to nothing: the least is %.2f m", r, rg.leastRange())
	}
	return t, nil
}

// leastRange is the least slider value: every device keeps a range.
func (rg *rangedGeo) leastRange() float64 { return math.Sqrt(rg.w2max - rg.w2min) }

// slider is the slider's value (the largest range in service) at growth t.
func (rg *rangedGeo) slider(t float64) float64 { return math.Sqrt(max(0, rg.w2max+t)) }

// grown is a device's range at growth t.
func grown(b, t float64) float64 { return math.Sqrt(max(0, b*b+t)) }

// baked returns devs with the grown ranges at growth t fixed as their own.
func baked(devs []device, t float64) []device {
	out := slices.Clone(devs)
	if t != 0 {
		for i := range out {
			out[i].R = grown(out[i].R, t)
		}
	}
	return out
}

// rangeEdit applies a "device-range" or "type-range" edit: the new device
// list, at growth 0.
func (s *session) rangeEdit(e *Edit, cfg *Config) ([]device, error) {
	if e.Range == nil {
		return nil, refuse(400, "%s edit needs \"range\" (metres)", e.Op)
	}
	v := *e.Range
	if err := cfg.checkRange(v); err != nil {
		return nil, err
	}
	devs := baked(s.devs, s.t)
	if !s.ranged {
		for i := range devs {
			devs[i].R = s.r // every device keeps the common range
		}
	}
	if e.Op == "device-range" {
		if e.Device == nil {
			return nil, refuse(400, "device-range edit needs \"device\" (a device index)")
		}
		i := *e.Device
		if i < 0 || i >= len(devs) {
			return nil, refuse(404, "no device %d (the plan has %d)", i, len(devs))
		}
		devs[i].R = v
		return devs, nil
	}
	typ := strings.ToLower(strings.TrimSpace(e.Type))
	n := 0
	for i := range devs {
		if strings.ToLower(strings.TrimSpace(devs[i].Type)) == typ {
			devs[i].R = v
			n++
		}
	}
	if n == 0 {
		return nil, refuse(404, "no device of type %q", e.Type)
	}
	return devs, nil
}

// rangedFigures fills the figures of a plan with own ranges at growth t.
func (sv *Server) rangedFigures(f *figuresDoc) {
	s, g := sv.s, sv.s.geo
	rg := g.ranged
	t := s.t
	f.RangeM = rg.slider(t)
	f.GrowthM2 = &t
	least := rg.leastRange()
	f.LeastRangeM = &least
	f.FullCoverRangeM = rg.slider(rg.full.Power)
	f.FullCoverPoints = make([][2]float64, len(rg.full.Worst))
	for i, p := range rg.full.Worst {
		f.FullCoverPoints[i] = p
	}
	f.FullCoverDevices = g.deviceIndex(rg.full.WorstSites)
	f.Hidden = g.deviceIndex(g.layout.Hidden)
	f.Pieces, f.OpenHoles = rg.pers.Betti(t)
	hs := rg.pers.Holes // by decreasing lifetime
	if len(hs) > maxHoles {
		hs = hs[:maxHoles]
	}
	f.Holes = make([]holeDoc, 0, len(hs))
	for _, h := range hs {
		f.Holes = append(f.Holes, holeDoc{
			BirthM: rg.slider(h.Birth), DeathM: rg.slider(h.Death), Point: round2(h.DeathPoint),
			Devices: [2]int{int(g.active[h.BirthSites[0]]), int(g.active[h.BirthSites[1]])},
			Open:    h.Birth <= t && t < h.Death,
		})
	}
}

// rangedGap adds the closing of a gap with own ranges: ClosingRangeM is
// the slider value (largest range) at which the gap vanishes under
// uniform power growth; a single device closing it alone, when found.
func rangedGap(d *gapDoc, gp coverage.Gap, g *geometry) {
	c := gp.Closing
	if c == nil {
		return
	}
	d.ClosingRangeM = g.ranged.slider(c.Power)
	if c.Device >= 0 {
		dev, r := int(g.active[c.Device]), c.DeviceRange
		d.AloneDevice, d.AloneRangeM = &dev, &r
	}
}

// rangedDevice adds the figures of device i (layout input k) with own
// ranges: its range, served area, whether it is hidden, and the loss if it
// fails at the ranges now (failures.go; a hidden device's costs nothing).
func (sv *Server) rangedDevice(d *deviceDoc, k int) error {
	s, g := sv.s, sv.s.geo
	rg := g.ranged
	cur := grown(s.devs[d.Device].R, s.t)
	d.RangeM = &cur
	if rg.services == nil {
		rg.services = g.layout.ServiceAreasRanges()
	}
	if _, hidden := slices.BinarySearch(g.layout.Hidden, k); hidden {
		d.Hidden = true
		zero := 0.0
		d.FailAddedUncoveredM2 = &zero
		return nil
	}
	j, hit := slices.BinarySearchFunc(rg.services, k, func(a coverage.RangesServiceArea, k int) int { return a.Site - k })
	if !hit {
		d.Shared = true // stands on another device's spot (its failure costs nothing)
	} else {
		sa := rg.services[j]
		d.ServedM2, d.ServedShare, d.FarthestM = &sa.Area, &sa.Share, &sa.Farthest
		if s.t == 0 {
			d.WithinRangeM2 = &sa.Served
		}
	}
	if rg.fails == nil || rg.failT != s.t {
		rg.fails, rg.failT = map[int]coverage.DeviceFailure{}, s.t
	}
	f, ok := rg.fails[k]
	if !ok {
		var err error
		if f, err = g.rangedFailure(k, s.t); err != nil {
			return err
		}
		rg.fails[k] = f
	}
	sv.failureFigures(d, f)
	if !math.IsInf(f.ClosingPower, 0) {
		// the largest range at which the others cover what it served, and
		// the range the backup then needs to reach the deepest point
		closing, backup := rg.slider(s.t+f.ClosingPower), f.ClosingRange
		d.FailClosingRangeM, d.FailBackupRangeM = &closing, &backup
	}
	return nil
}
