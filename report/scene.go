// The scene: one analysis (or layout) with its metadata, and the small
// conversions every output shares — site labels, output coordinates and
// range percentiles.
//
// Output coordinates are rounded once, here: WGS84 degrees to 7 decimals
// (1e-7° of latitude is 1.1 cm, of longitude at most that), local metres
// and projected output grids (outcrs.go) to 3 decimals (1 mm); an outline
// that rounding would make invalid gets more (outline.go). A percentile absent from Analysis.Percentiles is
// found by bisection on the coverage curve, which is monotone in the
// range, to 1e-9 relative.

package report

import (
	"math"
	"runtime"
	"strconv"
	"sync"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/siteinput"
)

// scene bundles what every output needs.
type scene struct {
	l     *coverage.Layout
	a     *coverage.Analysis // nil for the cells command
	m     Meta
	cells []coverage.ServiceArea
	// capped marks a scene for a capped summary document only
	// (newCappedScene): cells holds the first listMax service areas of
	// cellsTotal, and only the listed entries' key points and notes are
	// computed (kept).
	capped     bool
	cellsTotal int
	files      []string // output files, for the FILES section of report.txt
	// listMax caps each long list of summary.json (0: no cap); see
	// SummaryListMax.
	listMax int

	// The output points that several files print (report.txt,
	// summary.json and a GeoJSON layer each), converted once on first use:
	// the farthest point of each service area, the deepest point of each
	// gap and the closing point of each hole, in the orders of s.cells,
	// s.a.Gaps and s.a.Persistence.Holes.
	keyOnce                   sync.Once
	farOut, deepOut, closeOut []Point

	// holeNotes marks each hole of s.a.Persistence.Holes (holeNote),
	// computed once.
	notesOnce sync.Once
	holeNotes []string

	// grid, when set, makes point convert to a projected output system
	// (outcrs.go); extraDigits and unrounded refine point's rounding for
	// an outline that rounding would make invalid (outline.go).
	grid        *gridOutput
	extraDigits int
	unrounded   bool

	// area indexes the site area's edges for the conservative outlines
	// (outline_grow.go), shared with the scenes finer makes.
	area *areaEdgesOnce
}

func newScene(l *coverage.Layout, a *coverage.Analysis, m Meta) *scene {
	s := &scene{l: l, a: a, m: m, area: new(areaEdgesOnce)}
	if l != nil {
		s.cells = l.ServiceAreas()
	}
	return s
}

// newCappedScene is a scene for a capped summary document alone (the
// summary printed beside a report): it gathers only the first
// SummaryListMax service areas, not all (at 10⁷ sites the whole list, its
// farthest points and their conversion cost seconds), and converts only
// the key points listed.
func newCappedScene(l *coverage.Layout, a *coverage.Analysis, m Meta) *scene {
	s := &scene{l: l, a: a, m: m, area: new(areaEdgesOnce), listMax: SummaryListMax, capped: true}
	if l != nil {
		s.cells, s.cellsTotal = l.FirstServiceAreas(SummaryListMax)
	}
	return s
}

// numCells returns the number of service areas (of which a capped scene
// holds only the first).
func (s *scene) numCells() int {
	if s.capped {
		return s.cellsTotal
	}
	return len(s.cells)
}

// kept returns how many of n list entries the scene uses: those listed
// when it is capped, else all.
func (s *scene) kept(n int) int {
	if s.capped {
		return s.listed(n)
	}
	return n
}

// listed returns how many of n list entries summary.json holds.
func (s *scene) listed(n int) int {
	if s.listMax > 0 {
		return min(n, s.listMax)
	}
	return n
}

// geographic reports whether points are written as WGS84 lon/lat (not for
// a projected copy, outcrs.go).
func (s *scene) geographic() bool { return !s.m.Planar && s.m.ToLonLat != nil && s.grid == nil }

// point converts a local-plane point to an output point, rounded.
func (s *scene) point(p orb.Point) Point {
	if s.grid != nil {
		x, y := s.grid.forward(p[0], p[1])
		return Point{s.roundOut(x, 3), s.roundOut(y, 3)}
	}
	if s.geographic() {
		lon, lat := s.m.ToLonLat(p[0], p[1])
		return Point{s.roundOut(lon, 7), s.roundOut(lat, 7)}
	}
	return Point{s.roundOut(p[0], 3), s.roundOut(p[1], 3)}
}

// convertKeyPoints fills farOut, deepOut and closeOut (in parallel: with
// geographic output each is an inverse projection), for the entries the
// scene uses (kept).
func (s *scene) convertKeyPoints() {
	s.keyOnce.Do(func() {
		s.farOut = s.points(len(s.cells), func(i int) orb.Point { return s.cells[i].FarthestPoint })
		if s.a == nil {
			return
		}
		s.deepOut = s.points(s.kept(len(s.a.Gaps)), func(i int) orb.Point { return s.a.Gaps[i].Deepest })
		if p := s.a.Persistence; p != nil {
			s.closeOut = s.points(s.kept(len(p.Holes)), func(i int) orb.Point { return p.Holes[i].DeathPoint })
		}
	})
}

// points converts at(0), ..., at(n−1), one contiguous share per
// GOMAXPROCS goroutine.
func (s *scene) points(n int, at func(int) orb.Point) []Point {
	out := make([]Point, n)
	w := max(1, min(runtime.GOMAXPROCS(0), n/1024))
	var wg sync.WaitGroup
	for k := range w {
		wg.Go(func() {
			for i := k * n / w; i < (k+1)*n/w; i++ {
				out[i] = s.point(at(i))
			}
		})
	}
	wg.Wait()
	return out
}

// farthestOut, deepestOut and closingOut return the converted farthest
// point of service area i (index into s.cells), deepest point of gap i
// and closing point of hole i.
func (s *scene) farthestOut(i int) Point { s.convertKeyPoints(); return s.farOut[i] }
func (s *scene) deepestOut(i int) Point  { s.convertKeyPoints(); return s.deepOut[i] }
func (s *scene) closingOut(i int) Point  { s.convertKeyPoints(); return s.closeOut[i] }

// round rounds v to d decimals (half away from zero). Values too large to
// scale are returned unchanged.
func round(v float64, d int) float64 {
	p := math.Pow10(d)
	if math.Abs(v) > 1e300/p {
		return v
	}
	r := math.Round(v*p) / p
	if r == 0 {
		return 0 // no negative zero in the outputs
	}
	return r
}

// name returns the name of input site i, or "".
func (s *scene) name(i int) string {
	if i >= 0 && i < len(s.m.SiteNames) {
		return s.m.SiteNames[i]
	}
	return ""
}

// DeviceLabel returns how every text output and map names input site i
// (0-based): its own label names[i] or, when it has none, "#n" with n =
// i+1, its position in the input (the first site is #1). The 0-based
// index itself appears only in summary.json and the GeoJSON layers
// ("site"), next to the label.
func DeviceLabel(names []string, i int) string { return siteinput.DeviceLabel(names, i) }

// ItemLabel names an input item of another kind (a candidate spot, a
// demand item) as DeviceLabel names a device: its own name or, when it has
// none, the noun and its 1-based position in its file ("candidate 3").
func ItemLabel(name, noun string, i int) string {
	if name != "" {
		return name
	}
	return noun + " " + strconv.Itoa(i+1)
}

// label returns the label of input site i (DeviceLabel).
func (s *scene) label(i int) string { return DeviceLabel(s.m.SiteNames, i) }

// appendLabel appends the label of input site i to b.
func (s *scene) appendLabel(b []byte, i int) []byte {
	if n := s.name(i); n != "" {
		return append(b, n...)
	}
	b = append(b, '#')
	return strconv.AppendInt(b, int64(i+1), 10)
}

// numberingNote is the line that opens every report.txt on how devices
// are named.
const numberingNote = "Devices are named by their own label; one without a label by its position in\n" +
	"the input (#1 is the first). summary.json and the GeoJSON layers add the\n" +
	"0-based input index (\"site\").\n"

// duplicates counts input sites merged into an earlier identical one.
func (s *scene) duplicates() int {
	if s.l == nil || s.l.Tri == nil {
		return 0
	}
	// Hidden devices (per-device ranges) have no vertex but are not
	// duplicates.
	return len(s.l.Sites) - s.l.Tri.NumVertices() - len(s.l.Hidden)
}

// warnings returns Meta.Warnings plus the report's own, never nil.
func (s *scene) warnings() []string {
	w := append([]string{}, s.m.Warnings...)
	if s.m.AreaFromHull {
		w = append(w, "no site area given: the convex hull of the sites was used")
	}
	return w
}

// percentileFractions are the covered shares reported as range percentiles.
var percentileFractions = [4]float64{0.50, 0.90, 0.95, 0.99}

// percentiles returns the ranges covering 50/90/95/99 % of the area.
func (s *scene) percentiles() Percentiles {
	var v [4]float64
	for k, f := range percentileFractions {
		v[k] = s.rangeAt(f)
	}
	return Percentiles{P50: v[0], P90: v[1], P95: v[2], P99: v[3]}
}

// rangeAt returns the smallest range covering fraction f of the area.
func (s *scene) rangeAt(f float64) float64 {
	if s.a == nil {
		return 0
	}
	for _, p := range s.a.Percentiles {
		if math.Abs(p.Fraction-f) < 1e-9 {
			return p.Range
		}
	}
	hi := s.a.FullCover.Range
	if hi <= 0 || s.l.AreaM2 <= 0 {
		return 0
	}
	c := s.l.Curve()
	lo := 0.0
	for i := 0; i < 200 && hi-lo > 1e-9*hi; i++ {
		mid := (lo + hi) / 2
		if c.CoveredFraction(mid) >= f {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// siteBound returns the bounding box of the sites.
func (s *scene) siteBound() orb.Bound {
	if len(s.l.Sites) == 0 {
		return orb.Bound{}
	}
	b := orb.Bound{Min: s.l.Sites[0], Max: s.l.Sites[0]}
	for _, p := range s.l.Sites {
		b = b.Extend(p)
	}
	return b
}

// extent returns the box the maps show: the area, or the sites when the
// area is empty.
func (s *scene) extent() orb.Bound {
	var b orb.Bound
	ok := false
	if s.l.Area != nil && len(s.l.Area.XY) >= 2 {
		xy := s.l.Area.XY
		b = orb.Bound{Min: orb.Point{xy[0], xy[1]}, Max: orb.Point{xy[0], xy[1]}}
		for i := 0; i+1 < len(xy); i += 2 {
			b = b.Extend(orb.Point{xy[i], xy[i+1]})
		}
		ok = true
	}
	if !ok {
		b = s.siteBound()
	}
	return b
}
