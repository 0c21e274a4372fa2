// The JSON documents of the review API: the scene (fixed), the state
// (devices and figures), one device's figures and the service areas. All
// coordinates are local metres; drawing-only outlines are rounded (to the
// millimetre in the scene, the centimetre in gaps and cells), device
// positions and figures are not.

package review

import (
	"encoding/json"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
)

// outlineScale rounds drawing-only coordinates of the scene to 1 mm, and
// outlineDecimals writes gap and cell outlines with centimetre decimals:
// far below a screen pixel at any useful zoom, and it keeps the answers
// small.
const (
	outlineScale    = 1000
	outlineDecimals = 2
)

// sceneDoc is the /api/scene answer.
type sceneDoc struct {
	Title      string           `json:"title"`
	Planar     bool             `json:"planar"`
	Projection string           `json:"projection,omitempty"`
	LifeSafety bool             `json:"lifeSafety"`
	Cautions   []string         `json:"cautions"`
	AreaM2     float64          `json:"areaM2"`
	Bound      [4]float64       `json:"bound"` // min x, min y, max x, max y
	Area       [][][][2]float64 `json:"area"`  // polygons, rings (first outer, then exclusions)
	Context    [][][][2]float64 `json:"context"`
	ContextPts [][2]float64     `json:"contextPoints"`
	CurveTopM  float64          `json:"curveTopM"`
	CanReport  bool             `json:"canReport"`
	OutDir     string           `json:"outDir,omitempty"`
	Limits     limitsDoc        `json:"limits"`
}

// limitsDoc tells the page the validation bounds.
type limitsDoc struct {
	MaxRange      float64 `json:"maxRange"`
	MaxAddPerEdit int     `json:"maxAddPerEdit"`
}

func (sv *Server) sceneDoc() sceneDoc {
	c := &sv.cfg
	d := sceneDoc{
		Title:      c.Meta.Title,
		Planar:     c.Meta.ToLonLat == nil,
		Projection: c.Meta.Projection,
		LifeSafety: c.Meta.LifeSafety,
		Cautions:   cautionParagraphs(),
		AreaM2:     c.Region.Area(),
		Bound:      [4]float64{c.bound.Min[0], c.bound.Min[1], c.bound.Max[0], c.bound.Max[1]},
		Area:       multiPolygonDoc(c.Region.MultiPolygon()),
		ContextPts: [][2]float64{},
		CurveTopM:  c.grid[len(c.grid)-1],
		CanReport:  c.OutDir != "",
		OutDir:     c.OutDir,
		Limits:     limitsDoc{MaxRange: c.maxRange, MaxAddPerEdit: MaxAddPerEdit},
	}
	d.Context = [][][][2]float64{}
	for _, mp := range c.Context {
		d.Context = append(d.Context, multiPolygonDoc(mp)...)
	}
	for _, p := range c.ContextPoints {
		d.ContextPts = append(d.ContextPts, round2(p))
	}
	return d
}

// cautionParagraphs joins report.Cautions' wrapped lines into one
// paragraph per caution.
func cautionParagraphs() []string {
	var out []string
	for _, line := range strings.Split(report.Cautions(), "\n") {
		if len(line) > 2 && line[:2] == "- " {
			out = append(out, line[2:])
		} else if len(out) > 0 {
			out[len(out)-1] += " " + strings.TrimSpace(line)
		}
	}
	return out
}

// stateDoc is the /api/state and /api/edit answer.
type stateDoc struct {
	Version int  `json:"version"`
	CanUndo bool `json:"canUndo"`
	// Devices is left out (null) from the answer to a range edit: the
	// device list did not change; and from an answer with DevicePatch.
	Devices []deviceRow `json:"devices"`
	// DevicePatch, when the edit asked for it (Edit.Patch) and could give
	// it, replaces Devices: the change from the list of version Base.
	DevicePatch *patchDoc  `json:"devicePatch,omitempty"`
	Figures     figuresDoc `json:"figures"`
	// ComputeMs is the server time of the edit (recompute), milliseconds.
	ComputeMs float64 `json:"computeMs"`
	// outlines holds the gap outlines, by gap, as JSON (see encode).
	outlines [][]byte
}

// encode writes the state as JSON, with the gap outlines as a last member
// "outlines" (one per gap, in the order of figures.gaps), appended by hand:
// encoding/json would re-scan them as raw messages, which cost as much as
// tracing the gaps for 10 000 devices.
func (d *stateDoc) encode() ([]byte, error) {
	b, err := json.Marshal(d)
	if err != nil {
		return nil, err
	}
	b = append(b[:len(b)-1], `,"outlines":[`...)
	for i, o := range d.outlines {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, o...)
	}
	return append(b, "]}"...), nil
}

// patchDoc is a change of the device list: from the list of version Base,
// remove device Removed (−1: none), then set each Set[k] to Rows[k] (an
// index equal to the list's length appends); the list then has Count
// devices.
type patchDoc struct {
	Base    int         `json:"base"`
	Removed int         `json:"removed"`
	Set     []int       `json:"set"`
	Rows    []deviceRow `json:"rows"`
	Count   int         `json:"count"`
}

// patch replaces the device list of d by a patch of the previous one when
// the last edit of s allows it.
func (d *stateDoc) patch(s *session) {
	c := s.change
	if c == nil {
		return
	}
	p := &patchDoc{Base: c.base, Removed: c.removed, Set: c.set, Count: len(s.devs), Rows: make([]deviceRow, len(c.set))}
	if p.Set == nil {
		p.Set = []int{}
	}
	for k, i := range c.set {
		p.Rows[k] = rowOf(s.devs[i])
	}
	d.Devices, d.DevicePatch = nil, p
}

// rowOf is a device's row.
func rowOf(v device) deviceRow {
	return deviceRow{X: v.X, Y: v.Y, Label: v.Label, On: v.On, Range: v.R, Type: v.Type}
}

// deviceRow is one device in the state; with own ranges Range is its own
// range b (m; at growth t it reaches √(b² + t)) and Type its type.
type deviceRow struct {
	X     float64 `json:"x"`
	Y     float64 `json:"y"`
	Label string  `json:"label"`
	On    bool    `json:"on"`
	Range float64 `json:"range,omitempty"`
	Type  string  `json:"type,omitempty"`
}

// figuresDoc holds the figures of the plan at the range.
type figuresDoc struct {
	RangeM           float64      `json:"rangeM"`
	AreaM2           float64      `json:"areaM2"`
	CoveredFraction  float64      `json:"coveredFraction"`
	UncoveredM2      float64      `json:"uncoveredM2"`
	FullCoverRangeM  float64      `json:"fullCoverRangeM"`
	FullCoverPoints  [][2]float64 `json:"fullCoverPoints"`
	FullCoverDevices []int        `json:"fullCoverDevices"`
	DevicesOn        int          `json:"devicesOn"`
	Gaps             []gapDoc     `json:"gaps"`
	EnclosedGaps     int          `json:"enclosedGaps"`
	Pieces           int          `json:"pieces"`
	OpenHoles        int          `json:"openHoles"`
	Holes            []holeDoc    `json:"holes"`
	Curve            [][2]float64 `json:"curve"` // (range m, covered fraction), see curve.go
	// CurvePending is true when Curve was left out of an edit's answer
	// (Edit.Later): the page fetches it from GET /api/curve.
	CurvePending bool `json:"curvePending,omitempty"`
	// With own ranges (ranges.go): RangeM, FullCoverRangeM, the gaps'
	// ClosingRangeM, the holes' and the curve's ranges are the largest
	// range (the slider's value); GrowthM2 is the growth t of every
	// device's power (its range √(b² + t), b its row's range), LeastRangeM
	// the slider's least value, Hidden the devices with no power cell.
	GrowthM2    *float64 `json:"growthM2,omitempty"`
	LeastRangeM *float64 `json:"leastRangeM,omitempty"`
	Hidden      []int    `json:"hidden,omitempty"`
	// Types lists the device types of the plan (own ranges with a type
	// column), for the per-type range control.
	Types []string `json:"types,omitempty"`
}

// gapDoc is one gap.
type gapDoc struct {
	ID              int             `json:"id"`
	AreaM2          float64         `json:"areaM2"`
	ClosingRangeM   float64         `json:"closingRangeM"`
	Deepest         [2]float64      `json:"deepest"`
	Centroid        [2]float64      `json:"centroid"`
	TouchesBoundary bool            `json:"touchesBoundary"`
	Devices         []int           `json:"devices"`
	Outline         json.RawMessage `json:"outline"`
	// With own ranges: the device that closes the gap alone with the
	// least increase, and the range it needs.
	AloneDevice *int     `json:"aloneDevice,omitempty"`
	AloneRangeM *float64 `json:"aloneRangeM,omitempty"`
}

// holeDoc is one hole of the union of disks (persistence).
type holeDoc struct {
	BirthM  float64    `json:"birthM"`
	DeathM  float64    `json:"deathM"`
	Point   [2]float64 `json:"point"`
	Devices [2]int     `json:"devices"`
	Open    bool       `json:"open"`
}

// stateDoc builds the state answer, with the device list when
// withDevices; with later, a coverage curve not yet computed (own ranges,
// after an edit of the devices) is left out and marked pending. The
// caller holds the lock.
func (sv *Server) stateDoc(took time.Duration, withDevices, later bool) stateDoc {
	s := sv.s
	g := s.geo
	d := stateDoc{Version: s.version, CanUndo: len(s.undo) > 0, ComputeMs: took.Seconds() * 1000}
	if withDevices {
		d.Devices = make([]deviceRow, len(s.devs))
		for i, v := range s.devs {
			d.Devices[i] = rowOf(v)
		}
	}
	f := &d.Figures
	f.AreaM2 = g.layout.AreaM2
	f.UncoveredM2 = s.at.uncovered
	f.CoveredFraction = coveredFraction(s.at.uncovered, g.layout.AreaM2)
	f.DevicesOn = len(g.active)
	if g.ranged != nil {
		sv.rangedFigures(f)
	} else {
		f.RangeM = s.r
		f.FullCoverRangeM = g.full.Range
		f.FullCoverPoints = make([][2]float64, len(g.full.Worst))
		for i, p := range g.full.Worst {
			f.FullCoverPoints[i] = p
		}
		f.FullCoverDevices = g.deviceIndex(g.full.WorstSites)
		f.Pieces, f.OpenHoles = g.pers.Betti(s.r)
		f.Holes = holesDoc(g, s.r)
	}
	if g.ranged != nil {
		f.Types = sv.cfg.typeList
	}
	f.Gaps = make([]gapDoc, len(s.at.gaps))
	d.outlines = make([][]byte, len(s.at.gaps))
	for i, gp := range s.at.gaps {
		f.Gaps[i] = gapDoc{
			ID: gp.ID, AreaM2: gp.Area, ClosingRangeM: gp.ClosingRange,
			Deepest: gp.Deepest, Centroid: gp.Centroid, TouchesBoundary: gp.TouchesBoundary,
			Devices: g.deviceIndex(gp.Sites),
		}
		if g.ranged != nil {
			rangedGap(&f.Gaps[i], gp, g)
		}
		d.outlines[i] = appendMultiPolygon(nil, gp.Outline)
		if !gp.TouchesBoundary {
			f.EnclosedGaps++
		}
	}
	if later && g.ranged != nil && g.share == nil {
		f.CurvePending = true // deferred: GET /api/curve (rangedCurve)
	} else {
		f.Curve = sv.curveNow()
	}
	return d
}

// curveNow is the coverage curve of the layout now (curveDoc), computing
// a deferred one (rangedCurve); the caller holds the lock.
func (sv *Server) curveNow() [][2]float64 {
	g := sv.s.geo
	full := g.full.Range
	if rg := g.ranged; rg != nil {
		g.rangedCurve(sv.cfg.grid)
		full = rg.slider(rg.full.Power)
	}
	return curveDoc(g, sv.cfg.grid, full)
}

// curveAnswer is the answer of GET /api/curve: the coverage curve of the
// plan of the given version (stateDoc's figures.curve, which an edit asked
// to have "later" left out).
type curveAnswer struct {
	Version int          `json:"version"`
	Curve   [][2]float64 `json:"curve"`
}

// curveDoc is the coverage curve at the sample ranges grid, with the
// full-cover range full inserted. With own ranges it starts at the
// slider's least value (ranges.go): below it some device would have no
// range, so the samples there are left out and the curve opens with its
// exact value at the least range.
func curveDoc(g *geometry, grid []float64, full float64) [][2]float64 {
	out := make([][2]float64, 0, len(g.share)+2)
	lo := 0.0
	if rg := g.ranged; rg != nil {
		lo = rg.leastRange()
		out = append(out, [2]float64{lo, rg.curve.CoveredFraction(-rg.w2min)})
	}
	for k, sh := range g.share {
		if grid[k] <= lo && g.ranged != nil {
			continue
		}
		if k > 0 && max(grid[k-1], lo) < full && full < grid[k] {
			out = append(out, [2]float64{full, 1})
		}
		out = append(out, [2]float64{grid[k], sh})
	}
	return out
}

// holesDoc lists the longest-lived holes (at most maxHoles).
func holesDoc(g *geometry, r float64) []holeDoc {
	hs := slices.Clone(g.pers.Holes)
	slices.SortStableFunc(hs, func(a, b coverage.Hole) int {
		la, lb := a.Death-a.Birth, b.Death-b.Birth
		switch {
		case la > lb:
			return -1
		case la < lb:
			return 1
		}
		return 0
	})
	if len(hs) > maxHoles {
		hs = hs[:maxHoles]
	}
	out := make([]holeDoc, 0, len(hs))
	for _, h := range hs {
		if !(h.Death > h.Birth) {
			continue
		}
		out = append(out, holeDoc{
			BirthM: h.Birth, DeathM: h.Death, Point: round2(h.DeathPoint),
			Devices: [2]int{int(g.active[h.BirthSites[0]]), int(g.active[h.BirthSites[1]])},
			Open:    h.Birth <= r && r < h.Death,
		})
	}
	return out
}

// deviceDoc is the /api/device/{i} answer.
type deviceDoc struct {
	Device int     `json:"device"`
	Label  string  `json:"label"`
	X      float64 `json:"x"`
	Y      float64 `json:"y"`
	On     bool    `json:"on"`
	// With own ranges: the device's range now (m), its type, whether it is
	// hidden (no power cell: its disk lies inside the others' union), and
	// the part of its service area within its range (at the ranges as
	// given, growth 0).
	RangeM        *float64 `json:"rangeM,omitempty"`
	Type          string   `json:"type,omitempty"`
	Hidden        bool     `json:"hidden,omitempty"`
	WithinRangeM2 *float64 `json:"withinRangeM2,omitempty"`
	// The figures below are present for a device in service. The loss if
	// it fails: the uncovered area it adds, the range at which the others
	// close that loss (with own ranges the largest range, the slider's
	// value, under uniform power growth; absent when no device remains or,
	// with own ranges, when it serves nothing), the deepest point of the new
	// gap and the device that takes it over, with own ranges with the range
	// that device alone needs to reach it (FailBackupRangeM). A hidden
	// device's failure adds 0.
	ServedM2             *float64    `json:"servedM2,omitempty"`
	ServedShare          *float64    `json:"servedShare,omitempty"`
	FarthestM            *float64    `json:"farthestM,omitempty"`
	Shared               bool        `json:"shared,omitempty"`
	FailAddedUncoveredM2 *float64    `json:"failAddedUncoveredM2,omitempty"`
	FailClosingRangeM    *float64    `json:"failClosingRangeM,omitempty"`
	FailDeepest          *[2]float64 `json:"failDeepest,omitempty"`
	FailBackup           *int        `json:"failBackup,omitempty"`
	FailBackupRangeM     *float64    `json:"failBackupRangeM,omitempty"`
}

// deviceDoc builds one device's answer; the caller holds the lock.
func (sv *Server) deviceDoc(i int) (deviceDoc, error) {
	s := sv.s
	if i < 0 || i >= len(s.devs) {
		return deviceDoc{}, refuse(404, "no device %d (the plan has %d)", i, len(s.devs))
	}
	v := s.devs[i]
	d := deviceDoc{Device: i, Label: v.Label, X: v.X, Y: v.Y, On: v.On, Type: v.Type}
	if s.geo.ranged != nil {
		if k, on := slices.BinarySearch(s.geo.active, int32(i)); on {
			return d, sv.rangedDevice(&d, k)
		}
		cur := grown(v.R, s.t)
		d.RangeM = &cur
		return d, nil
	}
	sa, f, ok, err := s.deviceFigures(i)
	if err != nil || !ok {
		return d, err
	}
	share := sa.Share
	d.ServedM2, d.ServedShare, d.FarthestM = &sa.Area, &share, &sa.Farthest
	d.Shared = f.Shared
	sv.failureFigures(&d, f)
	d.FailClosingRangeM = &f.ClosingRange
	if math.IsInf(f.ClosingRange, 0) {
		d.FailClosingRangeM = nil
	}
	return d, nil
}

// failureFigures adds the loss if a device fails, common to both kinds of
// plan: the added uncovered area, the deepest point of the new gap and the
// device that takes it over.
func (sv *Server) failureFigures(d *deviceDoc, f coverage.DeviceFailure) {
	dp := [2]float64(f.Deepest)
	d.FailAddedUncoveredM2, d.FailDeepest = &f.AddedUncovered, &dp
	if f.Backup >= 0 {
		b := int(sv.s.geo.active[f.Backup])
		d.FailBackup = &b
	}
}

// cellDoc is one device's service area.
type cellDoc struct {
	Device  int             `json:"device"`
	Outline json.RawMessage `json:"outline"`
}

// cellsDoc lists the service areas; the caller holds the lock.
func (sv *Server) cellsDoc() []cellDoc {
	g := sv.s.geo
	c := g.layout.Cells
	nv := len(c.SiteStart) - 1
	out := make([]cellDoc, 0, nv)
	var pts []orb.Point
	for v := 0; v < nv; v++ {
		p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
		if p0 == p1 {
			continue
		}
		b := []byte{'['}
		for p := p0; p < p1; p++ {
			if p > p0 {
				b = append(b, ',')
			}
			b = append(b, '[')
			for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
				if k > c.PolyStart[p] {
					b = append(b, ',')
				}
				xy := c.XY[2*c.RingStart[k] : 2*c.RingStart[k+1]]
				pts = pts[:0]
				for j := 0; j < len(xy); j += 2 {
					pts = append(pts, orb.Point{xy[j], xy[j+1]})
				}
				b = appendRing(b, pts)
			}
			b = append(b, ']')
		}
		b = append(b, ']')
		out = append(out, cellDoc{Device: int(g.active[g.layout.Tri.Source[v]]), Outline: b})
	}
	return out
}

// multiPolygonDoc rounds a multipolygon for drawing.
func multiPolygonDoc(mp orb.MultiPolygon) [][][][2]float64 {
	out := make([][][][2]float64, len(mp))
	for i, poly := range mp {
		out[i] = make([][][2]float64, len(poly))
		for j, ring := range poly {
			r := make([][2]float64, len(ring))
			for k, p := range ring {
				r[k] = round2(p)
			}
			out[i][j] = r
		}
	}
	return out
}

// appendMultiPolygon appends mp as JSON arrays of flat rings with
// centimetre decimals: drawing-only outlines, written by hand because
// they are the bulk of an edit's answer (encoding/json's shortest float
// formatting cost more than the gap tracing for 10 000 devices).
func appendMultiPolygon(b []byte, mp orb.MultiPolygon) []byte {
	b = append(b, '[')
	for i, poly := range mp {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, '[')
		for j, ring := range poly {
			if j > 0 {
				b = append(b, ',')
			}
			b = appendRing(b, ring)
		}
		b = append(b, ']')
	}
	return append(b, ']')
}

// appendRing appends one ring as a flat array [x0,y0,x1,y1,...] with
// centimetre decimals: the page reads it straight into a path, and a flat
// array parses several times faster than one small array per point.
func appendRing(b []byte, ring []orb.Point) []byte {
	b = append(b, '[')
	for k, p := range ring {
		if k > 0 {
			b = append(b, ',')
		}
		b = strconv.AppendFloat(b, p[0], 'f', outlineDecimals, 64)
		b = append(b, ',')
		b = strconv.AppendFloat(b, p[1], 'f', outlineDecimals, 64)
	}
	return append(b, ']')
}

// round2 rounds a drawing-only point to outlineScale.
func round2(p orb.Point) [2]float64 {
	return [2]float64{math.Round(p[0]*outlineScale) / outlineScale, math.Round(p[1]*outlineScale) / outlineScale}
}
