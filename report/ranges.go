// The report of devices with their own ranges (coverage.AnalyzeRanges):
// report.txt, summary.json, the sites, service-area, gaps and hole-closings
// layers, the coverage map and the coverage curve chart, every figure in
// metres a planner can act on (holes: ranges_holes.go; chart:
// ranges_charts.go).
//
// Nothing is computed here beyond grouping: each device's planned range
// and its full-cover range (coverage.RangesFullCover.Needed, the range it
// needs when every device's power r² grows by the same amount), each gap's
// closing (coverage.GapClosing: the range each bordering device needs
// under that uniform growth, and the single device whose smallest increase
// closes the gap, with its range) and the hidden devices (empty power
// cell: the others cover their whole disk) are copied from package
// coverage. Devices are grouped by (type, planned range) for the short
// tables; every device is listed in summary.json and the sites layer.
//
// When all ranges are equal coverage.RangesAnalysis.Common holds Analyze's
// result and the common-range report is written instead (WriteAnalysis),
// with each device's range and type in the sites layer.

package report

import (
	"cmp"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/gpkg"
)

// rangesMeaning is the one sentence report.txt gives on what the figures
// mean when devices have different ranges.
const rangesMeaning = "With different ranges every figure grows all ranges together (each device's\n" +
	"r² by the same amount): a gap's closing ranges are what each bordering device\n" +
	"would need for it to vanish that way, and its single-device fix is the one\n" +
	"device whose range alone, raised least, closes it.\n"

// RangeGroup is the devices of one type and planned range.
type RangeGroup struct {
	// Type is the device type ("" for devices without one).
	Type string `json:"type"`
	// RangeM is the devices' planned range (m), or in the full-cover list
	// the range they need to cover the whole area under uniform growth.
	RangeM float64 `json:"range_m"`
	// Devices is the number of devices in the group.
	Devices int `json:"devices"`
}

// RangesDevice is one device in summary.json.
type RangesDevice struct {
	// Site is the input index, Name the device's own label ("" for none)
	// and Type its type ("" for none).
	Site int    `json:"site"`
	Name string `json:"name"`
	Type string `json:"type"`
	// RangeM is the planned range; FullCoverRangeM the range the device
	// needs when all ranges grow together until the area is covered (its
	// planned range when the area is covered already).
	RangeM          float64 `json:"range_m"`
	FullCoverRangeM float64 `json:"full_cover_range_m"`
	// Hidden is true when the other disks cover this device's whole disk
	// (empty power cell): redundant for coverage.
	Hidden bool `json:"hidden"`
}

// RangesGap is one gap in summary.json: its area and place, the range
// each bordering device would need under uniform growth (Needed, in the
// order of Sites), and the single-device fix (FixSite −1 when the gap is
// too large to search).
type RangesGap struct {
	ID              int       `json:"id"`
	AreaM2          float64   `json:"area_m2"`
	TouchesBoundary bool      `json:"touches_boundary"`
	DeepestPoint    Point     `json:"deepest_point"`
	Sites           []int     `json:"sites"`
	SiteLabels      []string  `json:"site_labels"`
	NeededM         []float64 `json:"needed_range_m"`
	FixSite         int       `json:"fix_site"`
	FixLabel        string    `json:"fix_label"`
	FixRangeM       float64   `json:"fix_range_m"`
}

// RangesDoc is the summary.json document of an analysis with per-device
// ranges.
type RangesDoc struct {
	Command string `json:"command"`
	Version string `json:"version"`
	RunInputs
	Sites        int     `json:"sites"`
	AreaM2       float64 `json:"area_m2"`
	AreaFromHull bool    `json:"area_from_hull"`
	// RangeGroups are the planned ranges by type, FullCover the ranges
	// the same groups need for full cover under uniform growth.
	RangeGroups []RangeGroup   `json:"range_groups"`
	FullCover   []RangeGroup   `json:"full_cover"`
	Devices     []RangesDevice `json:"devices"`
	// Hidden lists the input indices of the devices redundant for
	// coverage.
	Hidden          []int       `json:"hidden"`
	CoveredFraction float64     `json:"covered_fraction"`
	UncoveredAreaM2 float64     `json:"uncovered_area_m2"`
	Gaps            []RangesGap `json:"gaps"`
	// Pieces and OpenHoles are the Betti numbers of the union of the
	// disks at the planned ranges (pieces of coverage, holes open);
	// LinkGroups the groups of devices linked two-way (each within the
	// other's range).
	// ReferenceType and ReferenceRangeM name the reference devices (the
	// longest planned range) whose range states a uniform growth in metres;
	// Holes are the holes of the union of disks (the first SummaryListMax,
	// HolesTotal counts them all), longest-lived first.
	ReferenceType   string       `json:"reference_type"`
	ReferenceRangeM float64      `json:"reference_range_m"`
	Holes           []RangesHole `json:"holes"`
	HolesTotal      int          `json:"holes_total"`
	Pieces          int          `json:"pieces"`
	OpenHoles       int          `json:"open_holes"`
	LinkGroups      int          `json:"link_groups"`
	Coordinates     string       `json:"coordinates"`
	Warnings        []string     `json:"warnings"`
	Timings         Timings      `json:"timings"`
	// Reach is the k-coverage (analyze --reach; absent otherwise).
	Reach *ReachDoc `json:"reach,omitempty"`
}

// MarshalIndent returns the document as indented JSON.
func (d *RangesDoc) MarshalIndent() ([]byte, error) { return marshalDoc(d) }

// rangesScene is a scene with the per-device analysis.
type rangesScene struct {
	*scene
	ra *coverage.RangesAnalysis
	// refType and refM are the reference devices' type and planned range
	// (ranges_holes.go).
	refType string
	refM    float64
}

// RangesFiles returns the names of the files WriteRangesAnalysis writes
// for different ranges, in order.
func RangesFiles(m Meta, opt Options) []string {
	f := []string{FileReport, FileSummary, LayerFile(FileSites, m.Planar), LayerFile(FileServiceAreas, m.Planar), LayerFile(FileGaps, m.Planar),
		LayerFile(FileHoleClosings, m.Planar)}
	if opt.GeoPackage {
		f = append(f, FileGeoPackage)
	}
	if opt.Maps {
		f = append(f, FileMapCoverage)
	}
	if opt.Charts {
		f = append(f, FileChartCurve, FileChartHoles)
	}
	f = append(f, reachFiles(m, opt)...)
	f = append(f, gridLayerFiles(m, FileSites, FileServiceAreas, FileGaps)...)
	return append(f, FileManifest)
}

// WriteRangesAnalysis writes the report of an analysis with per-device
// ranges into dir: with all ranges equal the common-range report
// (WriteAnalysis of a.Common), else the files of RangesFiles. Errors as
// for WriteAnalysis.
func WriteRangesAnalysis(dir string, a *coverage.RangesAnalysis, m Meta, opt Options) ([]string, error) {
	if a == nil || a.Layout == nil {
		return nil, fmt.Errorf("report: no analysis to write")
	}
	if a.Common != nil {
		return WriteAnalysis(dir, a.Common, m, opt)
	}
	files := RangesFiles(m, opt)
	w, err := newWriter(dir, files, m, opt.Progress)
	if err != nil {
		return nil, err
	}
	rs := newRangesScene(a, m)
	rs.files = files
	steps := []step{
		{name: FileReport, write: fromBytes(func() ([]byte, error) { return append(rs.text(), rs.reachText(opt.Reach)...), nil })},
		{name: FileSummary, write: func(out io.Writer) error {
			d := rs.summary()
			d.Reach = rs.reachDoc(opt.Reach)
			return writeDoc(out, d)
		}},
		rs.layerStep(FileSites, rs.sitesLayer()),
		rs.layerStep(FileServiceAreas, rs.serviceAreasLayer()),
		rs.layerStep(FileGaps, rs.gapsLayer()),
		rs.layerStep(FileHoleClosings, rs.holesLayerRanges()),
	}
	if opt.GeoPackage {
		steps = append(steps, step{name: FileGeoPackage, gpkg: true})
	}
	if opt.Maps {
		width := mapWidth(opt)
		steps = append(steps, step{name: FileMapCoverage, write: fromBytes(func() ([]byte, error) { return rs.coverageMap(width) })})
	}
	if opt.Charts {
		width := mapWidth(opt)
		steps = append(steps, step{name: FileChartCurve, write: fromBytes(func() ([]byte, error) { return rs.curveChartRanges(width) })},
			step{name: FileChartHoles, write: fromBytes(func() ([]byte, error) { return rs.holeChartRanges(width) })})
	}
	steps = append(steps, rs.reachSteps(opt)...)
	steps = append(steps, rs.gridCopies(func(g *scene) []step {
		rg := &rangesScene{scene: g, ra: a}
		return []step{rg.layerStep(FileSites, rg.sitesLayer()), rg.layerStep(FileServiceAreas, rg.serviceAreasLayer()), rg.layerStep(FileGaps, rg.gapsLayer())}
	})...)
	err = w.writeAll(rs.scene, steps)
	return w.done, err
}

// newRangesScene is the scene of a: its layout's service areas (power
// cells) and the device ranges in the metadata.
func newRangesScene(a *coverage.RangesAnalysis, m Meta) *rangesScene {
	m.Ranges = a.Layout.InputRanges
	s := newScene(a.Layout, nil, m)
	rs := &rangesScene{scene: s, ra: a}
	for _, g := range rs.groups(nil) {
		if g.RangeM > rs.refM {
			rs.refType, rs.refM = g.Type, g.RangeM
		}
	}
	return rs
}

// RangesSummary returns the summary.json document of a (for a.Common set,
// use Summary(a.Common, m) for the common-range document).
func RangesSummary(a *coverage.RangesAnalysis, m Meta) *RangesDoc {
	return newRangesScene(a, m).summary()
}

// typeOf returns the type of input device i ("" for none).
func (s *scene) typeOf(i int) string {
	if i >= 0 && i < len(s.m.Types) {
		return s.m.Types[i]
	}
	return ""
}

// rangeOf returns the planned range of input device i: its own with
// Meta.Ranges, else the analysis's common range, else 0 (cells).
func (s *scene) rangeOf(i int) float64 {
	if i >= 0 && i < len(s.m.Ranges) {
		return s.m.Ranges[i]
	}
	if s.a != nil {
		return s.a.Range
	}
	return 0
}

// appendRangeProps appends the range_m and type properties of input
// device i to a sites feature: range_m when a range is known, type when
// the sites have types.
func (s *scene) appendRangeProps(b []byte, i int) []byte {
	if r := s.rangeOf(i); r > 0 {
		b = appendNum(kv(b, "range_m", false), r)
	}
	if s.m.Types != nil {
		b = appendStr(kv(b, "type", false), s.typeOf(i))
	}
	return b
}

// groups returns the devices grouped by (type, planned range), by type
// then range; value gives each group's reported range from a member.
func (rs *rangesScene) groups(value func(i int) float64) []RangeGroup {
	var out []RangeGroup
	for i := range rs.l.Sites {
		t, r := rs.typeOf(i), rs.rangeOf(i)
		k := slices.IndexFunc(out, func(g RangeGroup) bool { return g.Type == t && g.RangeM == r })
		if k < 0 {
			out = append(out, RangeGroup{Type: t, RangeM: r})
			k = len(out) - 1
		}
		out[k].Devices++
	}
	slices.SortFunc(out, func(a, b RangeGroup) int {
		return cmp.Or(cmp.Compare(a.Type, b.Type), cmp.Compare(a.RangeM, b.RangeM))
	})
	if value != nil {
		for k := range out {
			for i := range rs.l.Sites {
				if rs.typeOf(i) == out[k].Type && rs.rangeOf(i) == out[k].RangeM {
					out[k].RangeM = value(i)
					break
				}
			}
		}
	}
	return out
}

// needed returns the full-cover range of input device i (0 when the area
// is covered at the planned ranges: no growth needed).
func (rs *rangesScene) needed(i int) float64 {
	fc := rs.ra.FullCover
	if fc.Covered || i >= len(fc.Needed) {
		return rs.rangeOf(i)
	}
	return fc.Needed[i]
}

func (rs *rangesScene) summary() *RangesDoc {
	a, l := rs.ra, rs.l
	d := &RangesDoc{
		Command: rs.m.Command, Version: rs.m.Version, RunInputs: rs.runInputs(),
		Sites: len(l.Sites), AreaM2: l.AreaM2, AreaFromHull: rs.m.AreaFromHull,
		RangeGroups: rs.groups(nil), FullCover: rs.groups(rs.needed),
		Hidden:          append([]int{}, a.Hidden...),
		CoveredFraction: a.CoveredFraction, UncoveredAreaM2: a.UncoveredArea,
		Gaps:   make([]RangesGap, 0, len(a.Gaps)),
		Pieces: a.Pieces, OpenHoles: a.EnclosedHoles, LinkGroups: a.Links.Components,
		Coordinates: rs.coordKind(), Warnings: append([]string{}, rs.m.Warnings...),
	}
	hidden := make(map[int]bool, len(a.Hidden))
	for _, i := range a.Hidden {
		hidden[i] = true
	}
	for i := range l.Sites {
		d.Devices = append(d.Devices, RangesDevice{Site: i, Name: rs.name(i), Type: rs.typeOf(i),
			RangeM: rs.rangeOf(i), FullCoverRangeM: rs.needed(i), Hidden: hidden[i]})
	}
	for gi := range a.Gaps {
		d.Gaps = append(d.Gaps, rs.summaryGap(&a.Gaps[gi]))
	}
	d.ReferenceType, d.ReferenceRangeM = rs.refType, rs.refM
	d.Holes, d.HolesTotal = rs.summaryHoles()
	d.Timings = append(Timings{}, rs.m.Timings...)
	d.Timings = append(d.Timings, a.Timings...)
	return d
}

// summaryGap is gap g with its closing in metres.
func (rs *rangesScene) summaryGap(g *coverage.Gap) RangesGap {
	out := RangesGap{ID: g.ID, AreaM2: g.Area, TouchesBoundary: g.TouchesBoundary, DeepestPoint: rs.point(g.Deepest),
		Sites: append([]int{}, g.Sites...), FixSite: -1}
	for _, i := range g.Sites {
		out.SiteLabels = append(out.SiteLabels, rs.label(i))
	}
	if c := g.Closing; c != nil {
		out.NeededM = append([]float64{}, c.Needed...)
		out.FixSite, out.FixRangeM = c.Device, c.DeviceRange
		if c.Device >= 0 {
			out.FixLabel = rs.label(c.Device)
		}
	}
	return out
}

// typeName is how the text outputs name a device type.
func typeName(t string) string {
	if t == "" {
		return "(no type)"
	}
	return t
}

func (rs *rangesScene) text() []byte {
	var b textBuf
	d := rs.summary()
	rs.textTitle(&b, "Site coverage report, devices with their own ranges")
	b.WriteString(numberingNote)
	if rs.m.LifeSafety {
		section(&b, "CAUTIONS (LIFE-SAFETY DEVICES)")
		b.WriteString(Cautions() + "\n")
	}
	rs.textInputs(&b)
	rs.textTerms(&b)
	section(&b, "DEVICES WITH THEIR OWN RANGES")
	b.WriteString(rangesMeaning)
	var t table
	t.head("type", "devices", "planned range m", "full-cover range m")
	t.left(0)
	for k, g := range d.RangeGroups {
		t.row(typeName(g.Type), strconv.Itoa(g.Devices), metresNum(g.RangeM), metresNum(d.FullCover[k].RangeM))
	}
	b.WriteString("\n")
	t.write(&b)
	section(&b, "SUMMARY")
	var kv kvList
	kv.add("covered at the planned ranges", CoveredPercent(d.CoveredFraction, d.UncoveredAreaM2, 2)+" %")
	kv.add("uncovered", m2(d.UncoveredAreaM2)+" in "+Plural(len(d.Gaps), "gap"))
	kv.add("pieces of coverage", strconv.Itoa(d.Pieces))
	kv.add("holes open", strconv.Itoa(d.OpenHoles)+" (see HOLES)")
	kv.add("groups of linked devices", strconv.Itoa(d.LinkGroups)+" (a link: each device within the other's range)")
	kv.add("redundant (hidden) devices", rs.labels(d.Hidden, "none"))
	kv.write(&b)
	rs.textGapsRanges(&b, d)
	rs.textHolesRanges(&b)
	rs.textDevices(&b, d)
	rs.textClosing(&b, rangesFileNote)
	return b.Bytes()
}

// rangesFileNote is the FILES note of an output file with own ranges:
// analysisFileNote's, the hole-lifetimes chart's axes in reference metres.
func rangesFileNote(f string) string {
	if f == FileChartHoles {
		return "chart: hole appearance against closing, reference range"
	}
	return analysisFileNote(f)
}

// labels joins the labels of input devices, or none when there are none.
func (rs *rangesScene) labels(sites []int, none string) string {
	if len(sites) == 0 {
		return none
	}
	out := make([]string, len(sites))
	for k, i := range sites {
		out[k] = rs.label(i)
	}
	return strings.Join(out, ", ")
}

// textGapsRanges writes the gaps with their closing ranges and fixes.
func (rs *rangesScene) textGapsRanges(b *textBuf, d *RangesDoc) {
	section(b, "GAPS AT THE PLANNED RANGES")
	if len(d.Gaps) == 0 {
		b.WriteString("None: every point of the area is covered.\n")
		return
	}
	var t table
	t.head("gap", "area m²", "kind", "deepest point", "single-device fix", "closing ranges (all grow together)")
	t.left(2, 3, 4, 5)
	for gi, g := range d.Gaps {
		fix := "-"
		if g.FixSite >= 0 {
			fix = fmt.Sprintf("%s to %s m", g.FixLabel, metresNum(g.FixRangeM))
		}
		t.row(strconv.Itoa(g.ID), AreaNumber(g.AreaM2, 1), gapKind(rs.ra.Gaps[gi]), FormatPoint(g.DeepestPoint, d.Coordinates), fix, rs.neededText(g.Sites, g.NeededM))
	}
	t.write(b)
}

// textDevices writes every device with its type, range, full-cover range
// and whether it is redundant.
func (rs *rangesScene) textDevices(b *textBuf, d *RangesDoc) {
	section(b, "DEVICES")
	var t table
	t.head("device", "type", "range m", "full-cover range m", "redundant")
	t.left(0, 1, 4)
	for _, v := range d.Devices {
		red := ""
		if v.Hidden {
			red = "yes (hidden: the others cover its disk)"
		}
		t.row(rs.label(v.Site), typeName(v.Type), metresNum(v.RangeM), metresNum(v.FullCoverRangeM), red)
	}
	t.write(b)
}

// metresNum formats a length in metres to 2 decimals.
func metresNum(v float64) string { return strconv.FormatFloat(v, 'f', 2, 64) }

// sitesLayer is every device with its range, type, the range it would need
// for full cover, and whether it is hidden.
func (rs *rangesScene) sitesLayer() *layerDef {
	return rs.withAttributes(&layerDef{geom: gpkg.Point,
		fields: fieldList("site", gpkg.Integer, "name", gpkg.Text, "range_m", gpkg.Real, "type", gpkg.Text, "full_cover_range_m", gpkg.Real, "hidden", gpkg.Boolean),
		each: func(emit emitFunc) error {
			hidden := make(map[int]bool, len(rs.ra.Hidden))
			for _, i := range rs.ra.Hidden {
				hidden[i] = true
			}
			for i, p := range rs.l.Sites {
				if err := emit(orb.Point(rs.point(p)), vInt(i), vText(rs.name(i)), vReal(rs.rangeOf(i)), vText(rs.typeOf(i)), vReal(rs.needed(i)), vBool(hidden[i])); err != nil {
					return err
				}
			}
			return nil
		}}, 0)
}

// serviceAreasLayer is each device's power cell clipped to the area (its
// share when ranges differ) with its range and the part of the share
// within that range (coverage.ServiceAreasRanges); hidden devices have
// none.
func (rs *rangesScene) serviceAreasLayer() *layerDef {
	return rs.withAttributes(&layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList("site", gpkg.Integer, "name", gpkg.Text, "range_m", gpkg.Real, "type", gpkg.Text, "area_m2", gpkg.Real,
			"share", gpkg.Real, "served_m2", gpkg.Real, "farthest_m", gpkg.Real, "merged", gpkg.Text),
		each: func(emit emitFunc) error {
			for _, c := range rs.l.ServiceAreasRanges() {
				mp := rs.multiPolygon(rs.l.Cells.Polygons(c.Vertex))
				if len(mp) == 0 {
					continue
				}
				if err := emit(mp, vInt(c.Site), vText(rs.name(c.Site)), vReal(rs.rangeOf(c.Site)), vText(rs.typeOf(c.Site)), vReal(c.Area), vReal(c.Share), vReal(c.Served), vReal(c.Farthest), vInts(c.Merged)); err != nil {
					return err
				}
			}
			return nil
		}}, 0)
}

// gapsLayer is the gaps with their closings: the single device whose
// smallest range increase closes each (fix_site, fix_label, fix_range_m).
func (rs *rangesScene) gapsLayer() *layerDef {
	return &layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList("id", gpkg.Integer, "area_m2", gpkg.Real, "touches_boundary", gpkg.Boolean, "sites", gpkg.Text,
			"fix_site", gpkg.Integer, "fix_label", gpkg.Text, "fix_range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			var buf polyBuf
			for gi := range rs.ra.Gaps {
				g := &rs.ra.Gaps[gi]
				mp := rs.conservativeInto(&buf, g.Outline, 1)
				if len(mp) == 0 {
					continue
				}
				sg := rs.summaryGap(g)
				if err := emit(mp, values(g.ID, g.Area, g.TouchesBoundary, joinInts(g.Sites), sg.FixSite, sg.FixLabel, sg.FixRangeM)...); err != nil {
					return err
				}
			}
			return nil
		}}
}
