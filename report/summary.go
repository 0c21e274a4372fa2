// summary.json: the machine-readable record of a run.
//
// Values are copied from the analysis without further computation, except
// unit-free conversions: points are mapped back to WGS84 [lon, lat] with
// Meta.ToLonLat and rounded to 7 decimals (1e-7° is at most 1.1 cm), or
// kept as local [x, y] metres rounded to 3 decimals with Meta.Planar.
// Lengths and areas keep full float64 precision. A range percentile missing
// from Analysis.Percentiles is found by bisection on the exact coverage
// curve to 1e-9 relative.

package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/sitecover/sitecover/coverage"
)

// SummaryDoc is the summary.json document of an analysis. The field names
// of issue 4 are kept exactly; the others are plain extras.
type SummaryDoc struct {
	// Command is the CLI command of the run.
	Command string `json:"command"`
	// Version is the program version.
	Version string `json:"version"`
	// RunInputs names the run's title and input files.
	RunInputs
	// Sites is the number of input sites.
	Sites int `json:"sites"`
	// Duplicates is the number of input sites at exactly the position of
	// an earlier one (merged into it).
	Duplicates int `json:"duplicates"`
	// AreaM2 is the site area (exclusion zones removed), m².
	AreaM2 float64 `json:"area_m2"`
	// AreaFromHull is true when the area is the sites' convex hull.
	AreaFromHull bool `json:"area_from_hull"`
	// RangeM is the planned range, m.
	RangeM float64 `json:"range_m"`
	// FullCoverRangeM is the smallest common range with no gap, m.
	FullCoverRangeM float64 `json:"full_cover_range_m"`
	// FullCoverWorstPoint is a point where FullCoverRangeM is needed.
	FullCoverWorstPoint Point `json:"full_cover_worst_point"`
	// FullCoverWorstPoints lists every such point (ties).
	FullCoverWorstPoints []Point `json:"full_cover_worst_points"`
	// FullCoverNearestSites gives, per worst point, the input index of a
	// nearest site.
	FullCoverNearestSites []int `json:"full_cover_nearest_sites"`
	// CoveredFraction is the covered share of the area at RangeM (0..1).
	CoveredFraction float64 `json:"covered_fraction"`
	// UncoveredAreaM2 is the uncovered area at RangeM, m².
	UncoveredAreaM2 float64 `json:"uncovered_area_m2"`
	// Gaps are the uncovered components at RangeM, by decreasing closing
	// range (in summary.json the first SummaryListMax; GapsTotal counts
	// them all and the gaps layer holds every one).
	Gaps      []SummaryGap `json:"gaps"`
	GapsTotal int          `json:"gaps_total"`
	// Holes are the holes of the union of disks (persistence pairs; in
	// summary.json the first SummaryListMax, HolesTotal counts them all and
	// the hole-closings layer holds every one).
	Holes      []SummaryHole `json:"holes"`
	HolesTotal int           `json:"holes_total"`
	// RangePercentiles are the ranges covering 50, 90, 95 and 99 % of the
	// area.
	RangePercentiles Percentiles `json:"range_percentiles"`
	// LinkRangeM is the longest edge of the Euclidean minimum spanning
	// tree of the sites, m.
	LinkRangeM float64 `json:"link_range_m"`
	// ConnectRangeM is the range at which all disks form one piece, m.
	ConnectRangeM float64 `json:"connect_range_m"`
	// Pieces is the number of separate pieces of coverage at RangeM.
	Pieces int `json:"pieces"`
	// OpenHoles is the number of holes of the union of disks open at
	// RangeM (holes, not gaps: see report.txt TERMS).
	OpenHoles int `json:"open_holes"`
	// Cells are the service areas, one per distinct site position (in
	// summary.json the first SummaryListMax; CellsTotal counts them all and
	// the service-areas layer holds every one).
	Cells      []SummaryCell `json:"cells"`
	CellsTotal int           `json:"cells_total"`
	// Projection describes the local plane.
	Projection string `json:"projection"`
	// MaxScaleError is the largest |k − 1| of the projection.
	MaxScaleError float64 `json:"max_scale_error"`
	// Coordinates is "lon_lat" (WGS84 degrees) or "x_y" (local metres):
	// the order and meaning of every point in the document.
	Coordinates string `json:"coordinates"`
	// Warnings are the input and analysis warnings.
	Warnings []string `json:"warnings"`
	// Timings are the seconds spent per phase.
	Timings Timings `json:"timings"`
	// Reach is the k-coverage (analyze --reach; absent otherwise).
	Reach *ReachDoc `json:"reach,omitempty"`
}

// CellsDoc is the summary.json document of the cells command: the layout
// fields of SummaryDoc without coverage figures.
type CellsDoc struct {
	Command string `json:"command"`
	Version string `json:"version"`
	RunInputs
	Sites         int           `json:"sites"`
	Duplicates    int           `json:"duplicates"`
	AreaM2        float64       `json:"area_m2"`
	AreaFromHull  bool          `json:"area_from_hull"`
	Cells         []SummaryCell `json:"cells"`
	CellsTotal    int           `json:"cells_total"`
	Projection    string        `json:"projection"`
	MaxScaleError float64       `json:"max_scale_error"`
	Coordinates   string        `json:"coordinates"`
	Warnings      []string      `json:"warnings"`
	Timings       Timings       `json:"timings"`
}

// RunInputs identifies a run in every summary.json: the title of its
// report and maps and the input files as given ("" when not given; the
// demo's built-in files are named with "(built in)").
type RunInputs struct {
	Title       string `json:"title"`
	SitesFile   string `json:"sites_file"`
	AreaFile    string `json:"area_file"`
	ExcludeFile string `json:"exclude_file"`
	// CandidatesFile and PointsFile are the planning moves' inputs.
	CandidatesFile string `json:"candidates_file,omitempty"`
	PointsFile     string `json:"points_file,omitempty"`
}

// runInputs returns the RunInputs of the scene's run.
func (s *scene) runInputs() RunInputs {
	return RunInputs{Title: s.m.Title, SitesFile: s.m.SitesFile, AreaFile: s.m.AreaFile, ExcludeFile: s.m.ExcludeFile,
		CandidatesFile: s.m.CandidatesFile, PointsFile: s.m.PointsFile}
}

// summaryGap is gap g in summary.json, with its deepest point out.
func (s *scene) summaryGap(g *coverage.Gap, deepest Point) SummaryGap {
	labels := make([]string, len(g.Sites))
	for k, i := range g.Sites {
		labels[k] = s.label(i)
	}
	return SummaryGap{
		ID:              g.ID,
		AreaM2:          g.Area,
		ClosingRangeM:   g.ClosingRange,
		DeepestPoint:    deepest,
		TouchesBoundary: g.TouchesBoundary,
		Sites:           append(make([]int, 0, len(g.Sites)), g.Sites...),
		SiteLabels:      labels,
	}
}

// Point is a point of summary.json: [lon, lat] or [x, y] (see
// SummaryDoc.Coordinates).
type Point [2]float64

// SummaryGap is one gap of summary.json.
type SummaryGap struct {
	ID              int     `json:"id"`
	AreaM2          float64 `json:"area_m2"`
	ClosingRangeM   float64 `json:"closing_range_m"`
	DeepestPoint    Point   `json:"deepest_point"`
	TouchesBoundary bool    `json:"touches_boundary"`
	// Sites are the input indices (0-based) of the devices bordering the
	// gap: those whose service areas it meets. SiteLabels names the same
	// devices as the text outputs do (DeviceLabel), in the same order.
	Sites      []int    `json:"sites"`
	SiteLabels []string `json:"site_labels"`
}

// SummaryHole is one hole of the union of disks in summary.json.
type SummaryHole struct {
	BirthM     float64 `json:"birth_m"`
	DeathM     float64 `json:"death_m"`
	DeathPoint Point   `json:"death_point"`
	// Note marks the hole as report.txt does: "outside site" (it closes
	// outside the site area), "brief" (it lives less than 1 % of the
	// planned range), both, or "".
	Note string `json:"note"`
}

// Percentiles are the ranges at which the given share of the area is
// covered, m.
type Percentiles struct {
	P50 float64 `json:"p50"`
	P90 float64 `json:"p90"`
	P95 float64 `json:"p95"`
	P99 float64 `json:"p99"`
}

// SummaryCell is one service area of summary.json.
type SummaryCell struct {
	// Site is the 0-based input index of the site.
	Site int    `json:"site"`
	Name string `json:"name"`
	// AreaM2 is the area of the service area, m².
	AreaM2 float64 `json:"area_m2"`
	// Share is AreaM2 over the whole area (0..1).
	Share float64 `json:"share"`
	// FarthestM is the largest distance from the site to its service
	// area, m; FarthestPoint is where.
	FarthestM     float64 `json:"farthest_m"`
	FarthestPoint Point   `json:"farthest_point"`
	// Merged lists the input indices of duplicate sites merged into Site.
	Merged []int `json:"merged"`
}

// Timings lists seconds per phase; it is written to JSON as an object
// {"phase": seconds, ...} in phase order (a repeated phase is summed).
type Timings []coverage.Timing

// MarshalJSON writes the timings as an ordered object.
func (t Timings) MarshalJSON() ([]byte, error) {
	var order []string
	sum := map[string]float64{}
	for _, p := range t {
		if _, ok := sum[p.Phase]; !ok {
			order = append(order, p.Phase)
		}
		sum[p.Phase] += p.Seconds
	}
	var b bytes.Buffer
	b.WriteByte('{')
	for i, name := range order {
		if i > 0 {
			b.WriteByte(',')
		}
		k, _ := json.Marshal(name)
		b.Write(k)
		b.WriteByte(':')
		s := sum[name]
		if math.IsNaN(s) || math.IsInf(s, 0) {
			return nil, fmt.Errorf("timing of phase %q is not finite", name)
		}
		b.WriteString(strconv.FormatFloat(s, 'g', 6, 64))
	}
	b.WriteByte('}')
	return b.Bytes(), nil
}

// SummaryListMax is the most entries a long list of summary.json holds
// (gaps, holes, service areas; in planning reports gaps, failures and
// device loads): the first ones in the list's order, beside a *_total
// count. The GeoJSON layers, the GeoPackage and the CSV tables hold every
// entry, so summary.json stays small whatever the number of devices. The
// documents returned by Summary, CellsSummary and PlanSummary are not
// capped.
const SummaryListMax = 1000

// Summary builds the summary.json document of a.
func Summary(a *coverage.Analysis, m Meta) *SummaryDoc {
	s := newScene(a.Layout, a, m)
	return s.summary()
}

// SummaryCapped builds the summary.json document of a as WriteAnalysis
// writes it: each long list holds its first SummaryListMax entries beside
// its *_total count. Its size does not grow with the number of devices
// (Summary's document of 10⁷ devices takes gigabytes), so a caller that
// only prints or checks the summary after writing a report should use it.
func SummaryCapped(a *coverage.Analysis, m Meta) *SummaryDoc {
	return newCappedScene(a.Layout, a, m).summary()
}

// CellsSummary builds the summary.json document of the cells command.
func CellsSummary(l *coverage.Layout, m Meta) *CellsDoc {
	return newScene(l, nil, m).cellsSummary()
}

// MarshalIndent encodes the document as indented JSON ending in a newline.
func (d *SummaryDoc) MarshalIndent() ([]byte, error) { return marshalDoc(d) }

// MarshalIndent encodes the document as indented JSON ending in a newline.
func (d *CellsDoc) MarshalIndent() ([]byte, error) { return marshalDoc(d) }

// writeDoc writes a summary document (capped, so small) to w.
func writeDoc(w io.Writer, v any) error {
	b, err := marshalDoc(v)
	if err == nil {
		_, err = w.Write(b)
	}
	return err
}

func marshalDoc(v any) ([]byte, error) {
	b, err := json.Marshal(v)
	if err != nil {
		return nil, fmt.Errorf("report: encoding summary.json: %v", err)
	}
	return indentJSON(b), nil
}

// indentJSON indents compact JSON by two spaces per level, keeping arrays
// that hold no object or array (points, site lists) on one line.
func indentJSON(src []byte) []byte {
	out := make([]byte, 0, len(src)+len(src)/2)
	depth := 0
	newline := func() {
		out = append(out, '\n')
		for range depth {
			out = append(out, ' ', ' ')
		}
	}
	for i := 0; i < len(src); i++ {
		c := src[i]
		switch c {
		case '"':
			j := i + 1
			for ; j < len(src) && src[j] != '"'; j++ {
				if src[j] == '\\' {
					j++
				}
			}
			out = append(out, src[i:j+1]...)
			i = j
		case '{', '[':
			if c == '[' {
				if j, flat := flatArray(src, i); flat {
					for k := i; k <= j; k++ {
						out = append(out, src[k])
						if src[k] == ',' {
							out = append(out, ' ')
						}
					}
					i = j
					continue
				}
			}
			out = append(out, c)
			if i+1 < len(src) && (src[i+1] == '}' || src[i+1] == ']') {
				out = append(out, src[i+1])
				i++
				continue
			}
			depth++
			newline()
		case '}', ']':
			depth--
			newline()
			out = append(out, c)
		case ',':
			out = append(out, c)
			newline()
		case ':':
			out = append(out, ':', ' ')
		default:
			out = append(out, c)
		}
	}
	return append(out, '\n')
}

// flatArray reports whether the array opening at src[i] holds only
// numbers, booleans or null, and where it closes.
func flatArray(src []byte, i int) (int, bool) {
	for j := i + 1; j < len(src); j++ {
		switch src[j] {
		case ']':
			return j, true
		case '[', '{', '"':
			return 0, false
		}
	}
	return 0, false
}

func (s *scene) summary() *SummaryDoc {
	a := s.a
	d := &SummaryDoc{
		Command:          s.m.Command,
		Version:          s.m.Version,
		RunInputs:        s.runInputs(),
		Sites:            len(s.l.Sites),
		Duplicates:       s.duplicates(),
		AreaM2:           s.l.AreaM2,
		AreaFromHull:     s.m.AreaFromHull,
		RangeM:           a.Range,
		FullCoverRangeM:  a.FullCover.Range,
		CoveredFraction:  a.CoveredFraction,
		UncoveredAreaM2:  a.UncoveredArea,
		Gaps:             make([]SummaryGap, 0, s.listed(len(a.Gaps))),
		GapsTotal:        len(a.Gaps),
		Holes:            make([]SummaryHole, 0),
		RangePercentiles: s.percentiles(),
		Pieces:           a.Pieces,
		OpenHoles:        a.EnclosedHoles,
		Cells:            s.summaryCells(),
		CellsTotal:       s.numCells(),
		Projection:       s.projection(),
		MaxScaleError:    s.m.MaxScaleError,
		Coordinates:      s.coordKind(),
		Warnings:         s.warnings(),
		Timings:          s.timings(),
	}
	d.FullCoverWorstPoints = make([]Point, 0, len(a.FullCover.Worst))
	for _, p := range a.FullCover.Worst {
		d.FullCoverWorstPoints = append(d.FullCoverWorstPoints, s.point(p))
	}
	if len(d.FullCoverWorstPoints) > 0 {
		d.FullCoverWorstPoint = d.FullCoverWorstPoints[0]
	}
	d.FullCoverNearestSites = append(make([]int, 0, len(a.FullCover.WorstSites)), a.FullCover.WorstSites...)
	for gi := range s.listed(len(a.Gaps)) {
		d.Gaps = append(d.Gaps, s.summaryGap(&a.Gaps[gi], s.deepestOut(gi)))
	}
	if p := a.Persistence; p != nil {
		d.LinkRangeM = p.LinkRange
		d.ConnectRangeM = p.ConnectRange
		d.HolesTotal = len(p.Holes)
		for i, h := range p.Holes[:s.listed(len(p.Holes))] {
			d.Holes = append(d.Holes, SummaryHole{BirthM: h.Birth, DeathM: h.Death, DeathPoint: s.closingOut(i), Note: s.holeNote(i)})
		}
	}
	return d
}

func (s *scene) cellsSummary() *CellsDoc {
	return &CellsDoc{
		Command:       s.m.Command,
		Version:       s.m.Version,
		RunInputs:     s.runInputs(),
		Sites:         len(s.l.Sites),
		Duplicates:    s.duplicates(),
		AreaM2:        s.l.AreaM2,
		AreaFromHull:  s.m.AreaFromHull,
		Cells:         s.summaryCells(),
		CellsTotal:    s.numCells(),
		Projection:    s.projection(),
		MaxScaleError: s.m.MaxScaleError,
		Coordinates:   s.coordKind(),
		Warnings:      s.warnings(),
		Timings:       s.timings(),
	}
}

func (s *scene) summaryCells() []SummaryCell {
	cells := make([]SummaryCell, 0, s.listed(len(s.cells)))
	for i, c := range s.cells[:s.listed(len(s.cells))] {
		cells = append(cells, SummaryCell{
			Site:          c.Site,
			Name:          s.name(c.Site),
			AreaM2:        c.Area,
			Share:         c.Share,
			FarthestM:     c.Farthest,
			FarthestPoint: s.farthestOut(i),
			Merged:        append(make([]int, 0, len(c.Merged)), c.Merged...),
		})
	}
	return cells
}

func (s *scene) timings() Timings {
	t := Timings{}
	t = append(t, s.m.Timings...)
	if s.a != nil {
		t = append(t, s.a.Timings...)
	}
	return t
}

func (s *scene) coordKind() string {
	if s.geographic() {
		return "lon_lat"
	}
	return "x_y"
}

func (s *scene) projection() string {
	if s.m.Projection != "" {
		return s.m.Projection
	}
	if s.m.Planar {
		return "none: input coordinates are local plane metres"
	}
	return ""
}
