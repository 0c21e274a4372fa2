// The review session: the device list and the range under review, the edit
// operations on them with an undo stack, and the figures recomputed exactly
// by package coverage after every edit.
//
// What is recomputed, and what is reused (the update path):
//
//   - A range edit keeps the layout (triangulation and clipped Voronoi
//     cells), the full-cover range, the coverage curve samples and the
//     persistence of holes: none of them depends on the range. Only the
//     uncovered area (Layout.UncoveredArea, O(n)) and the gaps
//     (Layout.Gaps, O(n)) are recomputed at the new range.
//   - A device edit (move, add, remove, switch off or on, undo) rebuilds
//     the layout of the devices in service from scratch (planar.Triangulate
//     and planar.ClipCells, O(n log n)), then the full-cover range, the
//     persistence and the gaps (O(n) each). These are NOT incremental: for
//     10 000 devices they cost some 40 ms of CPU together, inside the
//     100 ms budget (BenchmarkReviewUpdate10k), so a local re-clip of the
//     cells around the edited device (the star of a removed vertex,
//     Devillers, IJCGA 2002) is not worth its complexity here.
//   - The coverage curve IS incremental (curve.go): each cell's terms are
//     cached and only the cells whose rings changed are evaluated again.
//     Evaluating every cell at every sample range was the largest single
//     cost of a device edit.
//   - The per-device figures (served area, the loss if the device fails)
//     come from Layout.ServiceAreas and coverage.Failures, which are local
//     per device (each visits the device's cell and its Delaunay
//     neighbours); they are computed on the first request after an edit
//     and kept until the next edit. With own ranges the loss is computed
//     for the device asked about only (failures.go), kept until the next
//     edit or slider move.
//
// Every figure is the one coverage.Analyze reports for the same devices
// and range: the same functions are called with the same arguments. With
// own ranges (ranges.go) the layout is the power diagram, a slider move
// keeps it as a range edit does, and the figures are AnalyzeRanges's; the
// coverage curve is then Layout.CurveRanges, not the cache of curve.go.
//
// With own ranges a device edit is NOT incremental either (the power
// diagram, the full cover, the persistence and the gaps are rebuilt; the
// persistence on a second goroutine beside the others, buildRanged), but
// the coverage curve, the largest cost of such an edit (49 exact passes
// over every cell), is deferred: the answer of an edit the page sends
// with Edit.Later leaves it out, and the page fetches it (GET /api/curve)
// after painting the new plan. Deferred, not approximated: it is computed
// by the same calls on the same layout (rangedCurve), so its values are
// those an immediate computation gives (TestRangesCurveDeferred).

package review

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// Session limits. Edits beyond them are refused with a 4xx error and leave
// the session unchanged.
const (
	// MaxAddPerEdit is the largest number of devices one add edit places.
	MaxAddPerEdit = 100
	// MaxDevices is the largest number of devices a session holds.
	MaxDevices = 200000
	// MaxUndo is the depth of the undo stack; older states are dropped.
	MaxUndo = 200
	// curveSamples is the number of evenly spaced ranges of the coverage
	// curve drawn beside the range slider (plus the full-cover range).
	curveSamples = 49
	// maxHoles is the number of holes (longest-lived first) sent to the
	// page.
	maxHoles = 50
	// drawChordTolerance is the sagitta of the page's gap outline chords,
	// relative to the range: 1 % of the range is below a pixel whenever a
	// disk is drawn under 200 px across, and it halves the outline work
	// against coverage.DefaultChordTolerance. Gap areas, closing ranges
	// and deepest points are exact whatever the tolerance.
	drawChordTolerance = 0.01
	// maxLabel is the longest device label accepted, in bytes.
	maxLabel = 200
)

// device is one device of the session. R is its own range (m) when the
// devices have their own (ranges.go; 0 with one common range), Type its
// type ("" for none).
type device struct {
	X, Y  float64
	Label string
	On    bool
	R     float64
	Type  string
}

// snapshot is a session state kept for undo: the devices, the range or
// growth, and whether the devices had their own ranges (a device-range
// edit on a common-range plan switches to own ranges; its undo back).
type snapshot struct {
	devs   []device
	r, t   float64
	ranged bool
}

// geometry is what depends on the devices in service but not on the
// range.
type geometry struct {
	layout *coverage.Layout
	// active maps a layout input index to its device index.
	active []int32
	full   coverage.FullCover
	// cells caches each cell's curve terms; share is the covered share at
	// the curve's sample ranges (curve.go); fresh counts the cells
	// evaluated for this layout.
	cells curveCells
	share []float64
	fresh int
	pers  *coverage.Persistence
	// Per-device figures, computed on first request (see deviceInfo).
	services []coverage.ServiceArea
	failures *coverage.FailureReport
	failR    float64
	failAt   []int32 // layout input index -> position in failures.Devices
	// ranged holds the figures of a layout with own ranges (nil: one
	// common range; then full, cells, pers and the per-device figures
	// above are used).
	ranged *rangedGeo
}

// atRange is what depends on the range too.
type atRange struct {
	uncovered float64
	gaps      []coverage.Gap
}

// session is the state under review. It is not safe for concurrent use;
// Server holds a mutex around every call.
type session struct {
	devs []device
	r    float64
	// ranged is true when the devices have their own ranges; t is then the
	// growth of every device's power (ranges.go) and r is unused.
	ranged  bool
	t       float64
	undo    []snapshot
	version int
	// gesture is the Gesture of the last edit (0: none).
	gesture int
	geo     *geometry
	at      atRange
	// change is what the last edit did to the device list (nil: unknown,
	// as after an undo: send the whole list).
	change *devChange
}

// devChange is what one edit did to the device list, from the list of
// version base: the device removed (−1: none), then the devices set (new
// or changed), by index into the new list.
type devChange struct {
	base    int
	removed int
	set     []int
}

// editError is a refused edit: its status is the HTTP status to answer.
type editError struct {
	status int
	msg    string
}

func (e *editError) Error() string { return e.msg }

// refuse makes an editError.
func refuse(status int, format string, args ...any) error {
	return &editError{status: status, msg: fmt.Sprintf(format, args...)}
}

// newSession starts a session with every device in service.
func newSession(sites []orb.Point, names []string, r float64, cfg *Config) (*session, error) {
	devs := make([]device, len(sites))
	for i, p := range sites {
		devs[i] = device{X: p[0], Y: p[1], On: true}
		if i < len(names) {
			devs[i].Label = names[i]
		}
		if cfg.Ranges != nil {
			devs[i].R = cfg.Ranges[i]
		}
		if i < len(cfg.Types) {
			devs[i].Type = cfg.Types[i]
		}
	}
	s := &session{ranged: cfg.Ranges != nil}
	geo, at, err := compute(devs, s.ranged, r, 0, cfg, nil)
	if err != nil {
		return nil, err
	}
	s.devs, s.r, s.geo, s.at = devs, r, geo, at
	return s, nil
}

// buildGeometry lays out the devices in service (with their own ranges
// when ranged), reusing the curve terms of the cells prev (nil: none) has
// too. The first call, from New, also fixes the curve's sample ranges.
func buildGeometry(devs []device, ranged bool, cfg *Config, prev *geometry) (*geometry, error) {
	g := &geometry{}
	pts := make([]orb.Point, 0, len(devs))
	for i, d := range devs {
		if d.On {
			pts = append(pts, orb.Point{d.X, d.Y})
			g.active = append(g.active, int32(i))
		}
	}
	if len(pts) == 0 {
		return nil, refuse(409, "at least one device must stay in service")
	}
	if ranged {
		return g, buildRanged(g, pts, devs, cfg)
	}
	l, err := coverage.NewLayout(pts, cfg.Region)
	if err != nil {
		return nil, refuse(422, "the devices in service cannot be laid out: %v", err)
	}
	g.layout = l
	g.full = l.FullCover()
	if cfg.grid == nil {
		cfg.grid = curveGrid(curveTop(g.full.Range, cfg.Range, cfg.maxRange))
	}
	var prevCells curveCells
	if prev != nil {
		prevCells = prev.cells
	}
	g.cells, g.share, g.fresh = curveFor(l, cfg.grid, prevCells)
	g.pers = coverage.ComputePersistence(l.Tri, coverage.NewFiltration(l.Tri))
	return g, nil
}

// atRange computes the range-dependent figures: at range r, or with own
// ranges at growth t.
func (g *geometry) atRange(r, t float64) (atRange, error) {
	if g.ranged != nil {
		return atRange{
			uncovered: g.layout.UncoveredAreaGrown(t),
			gaps:      g.layout.GapsRanges(t, drawChordTolerance),
		}, nil
	}
	if !(r > 0) || math.IsInf(r, 0) {
		return atRange{}, refuse(400, "range %v m is not a positive finite number", r)
	}
	return atRange{
		uncovered: g.layout.UncoveredArea(r),
		gaps:      g.layout.Gaps(r, drawChordTolerance),
	}, nil
}

// Edit is one edit request. Op is "move", "add", "remove", "off", "on",
// "range", "undo", "device-range" (Device, Range) or "type-range" (Type,
// Range); the last two switch a plan with one common range to own ranges
// (ranges.go).
type Edit struct {
	// Op names the edit.
	Op string `json:"op"`
	// Device is the device index for move, remove, off and on.
	Device *int `json:"device,omitempty"`
	// X and Y are the new position of a moved device (local metres).
	X *float64 `json:"x,omitempty"`
	Y *float64 `json:"y,omitempty"`
	// Points are the devices an add edit places.
	Points []NewDevice `json:"points,omitempty"`
	// Range is the new range of a range edit (metres): with own ranges the
	// largest range (ranges.go); of a device-range edit the device's; of a
	// type-range edit every device's of Type.
	Range *float64 `json:"range,omitempty"`
	// Type is the device type of a type-range edit.
	Type string `json:"type,omitempty"`
	// Gesture, when positive, names one continuous gesture on the page
	// (a drag of a device or of the range slider): consecutive edits of
	// the same gesture make one undo step.
	Gesture int `json:"gesture,omitempty"`
	// Version, when given, must equal the session's version: an edit made
	// on a stale view is refused with 409.
	Version *int `json:"version,omitempty"`
	// Patch asks for the device list of the answer as a patch of the
	// previous one (stateDoc.DevicePatch) where the edit allows it: the
	// page sends it, so that moving one of 10 000 devices does not answer
	// all 10 000 again.
	Patch bool `json:"patch,omitempty"`
	// Later lets the answer leave out the coverage curve when it is not
	// computed yet (own ranges, after an edit of the devices:
	// figures.curvePending); the page sends it and fetches the curve from
	// GET /api/curve once the new plan is painted.
	Later bool `json:"later,omitempty"`
}

// NewDevice is a device placed by an add edit.
type NewDevice struct {
	X     *float64 `json:"x"`
	Y     *float64 `json:"y"`
	Label string   `json:"label,omitempty"`
	// Range (own ranges only) is the device's range (default: the largest
	// range in the plan); Type its type.
	Range *float64 `json:"range,omitempty"`
	Type  string   `json:"type,omitempty"`
}

// apply validates and applies e. On any error the session is unchanged.
func (s *session) apply(e *Edit, cfg *Config) error {
	if e.Version != nil && *e.Version != s.version {
		return refuse(409, "the plan changed since this view (version %d, now %d): reload", *e.Version, s.version)
	}
	if e.Op == "undo" {
		return s.undoLast(cfg)
	}
	if e.Op == "range" {
		if e.Range == nil {
			return refuse(400, "range edit needs \"range\" (metres)")
		}
		if err := cfg.checkRange(*e.Range); err != nil {
			return err
		}
		r, t := *e.Range, 0.0
		if rg := s.geo.ranged; rg != nil {
			var err error
			if t, err = rg.growthFor(r); err != nil {
				return err
			}
		}
		at, err := s.geo.atRange(r, t)
		if err != nil {
			return err
		}
		s.record(e.Gesture)
		s.r, s.t, s.at = r, t, at
		s.change = &devChange{base: s.version, removed: -1}
		s.version++
		return nil
	}
	devs, err := s.edited(e, cfg)
	if err != nil {
		return err
	}
	t, ranged := s.t, s.ranged
	if e.Op == "device-range" || e.Op == "type-range" || s.ranged && e.Op == "add" {
		// the grown ranges were fixed as the devices' own, or on a
		// common-range plan every device took the common range (ranges.go)
		t, ranged = 0, true
	}
	geo, at, err := compute(devs, ranged, s.r, t, cfg, s.geo)
	if err != nil {
		return err
	}
	s.record(e.Gesture)
	s.change = deviceChange(e, s.version, len(s.devs), len(devs))
	if t != s.t {
		s.change = nil // every device's own range changed
	}
	s.devs, s.geo, s.at, s.t, s.ranged = devs, geo, at, t, ranged
	s.version++
	return nil
}

// deviceChange is what the device edit e did to a list of n devices of
// version base, now m long.
func deviceChange(e *Edit, base, n, m int) *devChange {
	c := &devChange{base: base, removed: -1}
	switch e.Op {
	case "device-range", "type-range":
		return nil // ranges fixed for every device (ranges.go): the whole list
	case "remove":
		c.removed = *e.Device
	case "add":
		for i := n; i < m; i++ {
			c.set = append(c.set, i)
		}
	default:
		c.set = []int{*e.Device}
	}
	return c
}

// record pushes the current state for undo, unless the edit continues the
// gesture of the previous one.
func (s *session) record(gesture int) {
	if gesture <= 0 || gesture != s.gesture {
		s.push()
	}
	s.gesture = gesture
}

// edited returns a new device list with the device edit e applied.
func (s *session) edited(e *Edit, cfg *Config) ([]device, error) {
	switch e.Op {
	case "move", "remove", "off", "on":
	case "add":
		return s.added(e, cfg)
	case "device-range", "type-range":
		return s.rangeEdit(e, cfg)
	case "":
		return nil, refuse(400, "edit needs \"op\": move, add, remove, off, on, range, device-range, type-range or undo")
	default:
		return nil, refuse(400, "unknown edit %q: use move, add, remove, off, on, range, device-range, type-range or undo", e.Op)
	}
	if e.Device == nil {
		return nil, refuse(400, "%s edit needs \"device\" (a device index)", e.Op)
	}
	i := *e.Device
	if i < 0 || i >= len(s.devs) {
		return nil, refuse(404, "no device %d (the plan has %d)", i, len(s.devs))
	}
	devs := slices.Clone(s.devs)
	switch e.Op {
	case "move":
		if e.X == nil || e.Y == nil {
			return nil, refuse(400, "move edit needs \"x\" and \"y\" (local metres)")
		}
		if err := cfg.checkPoint(*e.X, *e.Y); err != nil {
			return nil, err
		}
		devs[i].X, devs[i].Y = *e.X, *e.Y
	case "remove":
		devs = slices.Delete(devs, i, i+1)
	case "off":
		devs[i].On = false
	case "on":
		devs[i].On = true
	}
	return devs, nil
}

// added returns a new device list with the devices of an add edit.
func (s *session) added(e *Edit, cfg *Config) ([]device, error) {
	n := len(e.Points)
	if n == 0 {
		return nil, refuse(400, "add edit needs \"points\": [{\"x\": …, \"y\": …}]")
	}
	if n > MaxAddPerEdit {
		return nil, refuse(413, "add edit places %d devices; at most %d per edit", n, MaxAddPerEdit)
	}
	if len(s.devs)+n > MaxDevices {
		return nil, refuse(413, "the plan would hold %d devices; at most %d", len(s.devs)+n, MaxDevices)
	}
	devs := slices.Grow(slices.Clone(s.devs), n)
	largest := 0.0
	if s.ranged {
		devs = baked(devs, s.t)
		for _, d := range devs {
			largest = max(largest, d.R)
		}
	}
	for k, p := range e.Points {
		if p.X == nil || p.Y == nil {
			return nil, refuse(400, "added point %d needs \"x\" and \"y\" (local metres)", k)
		}
		if err := cfg.checkPoint(*p.X, *p.Y); err != nil {
			return nil, refuse(err.(*editError).status, "added point %d: %v", k, err)
		}
		if len(p.Label) > maxLabel {
			return nil, refuse(400, "added point %d: label longer than %d bytes", k, maxLabel)
		}
		label := p.Label
		if label == "" {
			label = fmt.Sprintf("added %d", len(devs)+1)
		}
		d := device{X: *p.X, Y: *p.Y, Label: label, On: true, Type: p.Type}
		if p.Range != nil || p.Type != "" {
			if !s.ranged {
				return nil, refuse(409, "added point %d: this plan has one common range; a device's own range or type needs a plan with ranges per device", k)
			}
		}
		if s.ranged {
			d.R = largest
			if p.Range != nil {
				if err := cfg.checkRange(*p.Range); err != nil {
					return nil, refuse(err.(*editError).status, "added point %d: %v", k, err)
				}
				d.R = *p.Range
			}
		}
		devs = append(devs, d)
	}
	return devs, nil
}

// compute lays out devs and computes the figures at range r (own ranges,
// when ranged: at growth t), reusing what it can of prev (nil: nothing).
func compute(devs []device, ranged bool, r, t float64, cfg *Config, prev *geometry) (*geometry, atRange, error) {
	geo, err := buildGeometry(devs, ranged, cfg, prev)
	if err != nil {
		return nil, atRange{}, err
	}
	if rg := geo.ranged; rg != nil {
		defer rg.persWG.Wait() // the persistence runs beside (buildRanged)
		if !(rg.w2min+t > 0) {
			return nil, atRange{}, refuse(422, "the ranges grown by the slider would shrink a device to nothing: raise the range slider first")
		}
	}
	at, err := geo.atRange(r, t)
	return geo, at, err
}

// push records the current state for undo. The device slice is never
// modified in place (edits clone it), so it is shared, not copied.
func (s *session) push() {
	if len(s.undo) == MaxUndo {
		s.undo = slices.Delete(s.undo, 0, 1)
	}
	s.undo = append(s.undo, snapshot{devs: s.devs, r: s.r, t: s.t, ranged: s.ranged})
}

// undoLast restores the state before the last edit.
func (s *session) undoLast(cfg *Config) error {
	if len(s.undo) == 0 {
		return refuse(409, "nothing to undo")
	}
	last := s.undo[len(s.undo)-1]
	geo, at, err := compute(last.devs, last.ranged, last.r, last.t, cfg, s.geo)
	if err != nil {
		return err
	}
	s.devs, s.r, s.t, s.ranged, s.geo, s.at = last.devs, last.r, last.t, last.ranged, geo, at
	s.undo = s.undo[:len(s.undo)-1]
	s.gesture = 0
	s.change = nil
	s.version++
	return nil
}

// deviceFigures returns the per-device figures (served area and the loss
// if it fails) of device i, computing them for the whole layout on first
// use after an edit. ok is false for a device out of service.
func (s *session) deviceFigures(i int) (sa coverage.ServiceArea, f coverage.DeviceFailure, ok bool, err error) {
	g := s.geo
	if g.services == nil {
		g.services = g.layout.ServiceAreas()
	}
	if g.failures == nil || g.failR != s.r {
		fr, err := coverage.Failures(g.layout, s.r)
		if err != nil {
			return sa, f, false, err
		}
		g.failures, g.failR, g.failAt = fr, s.r, nil
	}
	k, found := slices.BinarySearch(g.active, int32(i))
	if !found {
		return sa, f, false, nil
	}
	// ServiceAreas lists one entry per distinct spot, by input index; a
	// device standing on another's spot serves nothing of its own.
	sa = coverage.ServiceArea{Site: k, Vertex: g.layout.Tri.Vertex[k]}
	if j, hit := slices.BinarySearchFunc(g.services, k, func(a coverage.ServiceArea, k int) int { return a.Site - k }); hit {
		sa = g.services[j]
	}
	if g.failAt == nil {
		g.failAt = make([]int32, len(g.active))
		for j, d := range g.failures.Devices {
			g.failAt[d.Site] = int32(j)
		}
	}
	if j := g.failAt[k]; int(j) < len(g.failures.Devices) && g.failures.Devices[j].Site == k {
		return sa, g.failures.Devices[j], true, nil
	}
	return sa, f, false, errors.New("review: device missing from the failure report")
}
