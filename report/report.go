// Package report turns a coverage analysis into the files a design review
// reads: a fixed-width text report, a machine-readable summary.json, GIS
// layers in GeoJSON (RFC 7946) and the same layers in one GeoPackage
// (OGC 12-128), PNG maps and PNG charts.
//
// Nothing here computes coverage: every figure comes from package coverage
// (exact to floating-point rounding unless coverage states a tolerance, and
// the report repeats that tolerance beside the figure). This package only
// converts units and coordinates, rounds for display, and draws.
//
// Coordinates: the analysis works in a local plane in metres. For
// geographic input Meta.ToLonLat maps plane points back to WGS84 longitude
// and latitude; points in summary.json and the GeoJSON layers are then
// [lon, lat] rounded to 7 decimals (about 1 cm). With Meta.Planar the
// points stay [x, y] metres rounded to 3 decimals (1 mm), and the GeoJSON
// layers are written under names ending in "-xy.geojson" because RFC 7946
// requires WGS84 and a reader must not mistake them for it.
//
// Files are streamed (never held whole in memory; stream.go) into a
// staging folder that is swapped in whole when every file is complete
// (outset.go), so a reader never sees a half-written or mixed set. A path
// that is one of the input files is never written.
package report

import (
	"fmt"
	"io"
	"slices"
	"strings"
	"sync/atomic"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/siteinput"
)

// Meta describes the inputs of a run: what the analysis cannot know about
// itself. The CLI fills it in.
type Meta struct {
	// Title heads the report and the maps (e.g. the site's name).
	Title string
	// Arguments is the command line (without the program name) recorded
	// in manifest.json.
	Arguments []string
	// Command is the CLI command that produced the run: "analyze",
	// "cells", "gaps", "demo", "suggest", "failures" or "assign".
	Command string
	// SitesFile, AreaFile and ExcludeFile are the input paths ("" when
	// not given). Outputs never overwrite them.
	SitesFile, AreaFile, ExcludeFile string
	// CandidatesFile and PointsFile are the inputs of the planning moves
	// (candidate spots, demand points; "" when not given). Outputs never
	// overwrite them either.
	CandidatesFile, PointsFile string
	// RangeTableFile is the table of ranges per device type
	// (--range-table; "" when not given). Outputs never overwrite it.
	RangeTableFile string
	// ContextFile is the drawing-only layer (--context; "" when not
	// given). Outputs never overwrite it.
	ContextFile string
	// InputSums holds, by path, the size and SHA-256 checksum of each
	// input's bytes as the run read them; manifest.json lists them. An
	// input without one is listed without a checksum.
	InputSums map[string]siteinput.Checksum
	// SiteNames holds a name per input site index ("" for none). It may be
	// shorter than the site list.
	SiteNames []string
	// Ranges holds each device's own range (m) by input index when the
	// devices have different ranges; nil for one common range. Types
	// holds each device's type ("" for none); nil without types. Both are
	// shown wherever devices are listed (ranges.go).
	Ranges []float64
	Types  []string
	// SiteAttributes are the sites' own attributes (siteinput.Scene.
	// Attributes), carried into the per-site layers (attributes.go); nil
	// for none.
	SiteAttributes []siteinput.Attribute
	// OutCRS, when set (a projected system), adds a copy of each layer in
	// that system (outcrs.go).
	OutCRS *siteinput.CRS
	// Planar is true when the input coordinates were already local metres.
	Planar bool
	// Projection is a one-line description of the local plane (e.g.
	// "transverse Mercator, WGS84, central meridian 8.54°E").
	Projection string
	// MaxScaleError is the largest |k − 1| of the projection over the
	// extent of the inputs (0 with Planar).
	MaxScaleError float64
	// ToLonLat maps a local-plane point to WGS84 longitude and latitude in
	// degrees; nil when Planar.
	ToLonLat func(x, y float64) (lon, lat float64)
	// AreaFromHull is true when no area was given and the sites' convex
	// hull was used instead.
	AreaFromHull bool
	// LifeSafety is true when the devices were declared life-safety
	// equipment (sirens, alarm call points, defibrillators): the report
	// then puts the cautions first.
	LifeSafety bool
	// Warnings are the input warnings to repeat (sites outside the area,
	// duplicates dropped, ...), one line each.
	Warnings []string
	// ChordTolerance is the coverage.Options.ChordTolerance the analysis
	// ran with (0: coverage.DefaultChordTolerance); the report states it.
	ChordTolerance float64
	// Timings are phases timed outside the analysis (e.g. "load inputs");
	// summary.json lists them before the analysis phases.
	Timings []coverage.Timing
	// Version is the program version printed in the report.
	Version string
	// AreaNote says in one line what building the site area merged or
	// clipped (parcels merged, exclusions clipped); "" when nothing was.
	AreaNote string
	// AreaRelError bounds the relative error of areas against the
	// ellipsoid: the projection's scale error plus the chords of densified
	// edges (siteinput.Scene.AreaRelError); 0 for planar input.
	AreaRelError float64
	// ContextPoints are drawing-only context features given as points
	// (e.g. buildings known by one position), in the local plane.
	ContextPoints []orb.Point
	// Context holds context polygons in the local plane (buildings,
	// paths, ...): drawn on the maps under the coverage, never analysed.
	Context orb.MultiPolygon
}

// Options selects the optional outputs. The zero value writes the text
// report, summary.json and the GeoJSON layers only.
type Options struct {
	// Maps enables the PNG maps.
	Maps bool
	// Charts enables the PNG charts (WriteAnalysis only).
	Charts bool
	// GeoPackage adds sitecover.gpkg, every layer of the run in one
	// GeoPackage (FileGeoPackage). It costs about as much again as the
	// GeoJSON layers (SQLite inserts and the R-tree), so it is asked for.
	GeoPackage bool
	// MapWidth is the width of the maps and charts in pixels; 0 means
	// DefaultMapWidth. Values below MinMapWidth are raised to it.
	MapWidth int
	// Progress, when not nil, is called with each file name before the
	// file is produced (for a progress line on a terminal).
	Progress func(file string)
	// Reach, when not nil, adds the k-coverage outputs to WriteAnalysis
	// (kcover.go).
	Reach *coverage.KCoverage
}

// DefaultMapWidth is the map width used when Options.MapWidth is 0.
const DefaultMapWidth = 1600

// MinMapWidth is the smallest map width drawn.
const MinMapWidth = 400

// Output file names. With Meta.Planar the GeoJSON names end in
// "-xy.geojson" instead (see LayerFile).
const (
	FileReport          = "report.txt"
	FileSummary         = "summary.json"
	FileServiceAreas    = "service-areas.geojson"
	FileGaps            = "gaps.geojson"
	FileHoleClosings    = "hole-closings.geojson"
	FileSites           = "sites.geojson"
	FileCovered         = "covered.geojson"
	FileMapServiceAreas = "map-service-areas.png"
	FileMapCoverage     = "map-coverage.png"
	FileChartCurve      = "chart-coverage-curve.png"
	FileChartHoles      = "chart-hole-lifetimes.png"
)

// LayerFile returns the file name of a GeoJSON layer: name itself for
// geographic input, or name with ".geojson" replaced by "-xy.geojson" for
// planar input (local x/y metres, not RFC 7946 WGS84).
func LayerFile(name string, planar bool) string {
	if !planar {
		return name
	}
	return strings.TrimSuffix(name, ".geojson") + "-xy.geojson"
}

// Files returns the names of the files WriteAnalysis (cells false) or
// WriteCells (cells true) writes with the given Meta and Options, in the
// order they are written.
func Files(cells bool, m Meta, opt Options) []string {
	var f []string
	f = append(f, FileReport, FileSummary)
	f = append(f, LayerFile(FileSites, m.Planar), LayerFile(FileServiceAreas, m.Planar))
	if !cells {
		f = append(f, LayerFile(FileGaps, m.Planar), LayerFile(FileHoleClosings, m.Planar), LayerFile(FileCovered, m.Planar))
	}
	if opt.GeoPackage {
		f = append(f, FileGeoPackage)
	}
	if opt.Maps {
		f = append(f, FileMapServiceAreas)
		if !cells {
			f = append(f, FileMapCoverage)
		}
	}
	if opt.Charts && !cells {
		f = append(f, FileChartCurve, FileChartHoles)
	}
	if !cells {
		f = append(f, reachFiles(m, opt)...)
	}
	if cells {
		f = append(f, gridLayerFiles(m, FileSites, FileServiceAreas)...)
	} else {
		f = append(f, gridLayerFiles(m, FileSites, FileServiceAreas, FileGaps, FileHoleClosings, FileCovered)...)
		if opt.Reach != nil {
			f = append(f, gridLayerFiles(m, FileReach, FileReachGaps)...)
		}
	}
	return append(f, FileManifest)
}

// WriteAnalysis writes the full report of a (the files listed by
// Files(false, m, opt)) into dir, creating dir if needed. It returns the
// paths written. It refuses, before writing anything, when dir cannot be
// created or written, or when an output path is one of the input files.
func WriteAnalysis(dir string, a *coverage.Analysis, m Meta, opt Options) (written []string, err error) {
	if a == nil || a.Layout == nil {
		return nil, fmt.Errorf("report: no analysis to write")
	}
	aw, err := StartAnalysis(dir, a.Layout, a.Range, m, opt)
	if err != nil {
		return nil, err
	}
	return aw.Finish(a)
}

// AnalysisWriter writes the report of an analysis in parts, so that the
// files needing only the layout and the range stream to disk while the
// rest of the analysis is computed (coverage.Options.LayoutReady):
// StartAnalysis opens the output set and starts the sites and
// service-area layers (unless opt.GeoPackage, whose tables are filled
// together at the end); Finish starts the covered layer (before it
// gathers the service-area list), writes the other files and swaps the
// set in; Abort drops it. The files are byte for byte
// those of WriteAnalysis, which is StartAnalysis followed by Finish.
type AnalysisWriter struct {
	w     *writer
	early *scene // the layout and the range only (its analysis a stub)
	m     Meta
	opt   Options
	steps []step // the steps started
	stop  atomic.Bool
}

// StartAnalysis checks and opens dir for the report of an analysis of
// layout l at range r (metres) with m and opt, as WriteAnalysis would,
// and starts writing the layers that need nothing more. opt is that of
// the whole report (with opt.Reach, the k-coverage of the analysis to
// come). The caller must end with Finish or Abort; l must not change in
// between.
func StartAnalysis(dir string, l *coverage.Layout, r float64, m Meta, opt Options) (*AnalysisWriter, error) {
	if l == nil {
		return nil, fmt.Errorf("report: no layout to write")
	}
	w, err := newWriter(dir, Files(false, m, opt), m, opt.Progress)
	if err != nil {
		return nil, err
	}
	aw := &AnalysisWriter{w: w, m: m, opt: opt}
	// The early scene holds no service-area list (forCells): Finish's scene
	// gathers it once the analysis is done and its memory free again.
	aw.early = &scene{l: l, a: &coverage.Analysis{Layout: l, Range: r}, m: m}
	if !opt.GeoPackage {
		for _, st := range cellLayers(aw.early) {
			aw.steps = append(aw.steps, w.start(aw.early, st, &aw.stop))
		}
	}
	return aw, nil
}

// Finish writes the rest of the report of a (the analysis of the layout
// and range given to StartAnalysis), waits for the layers started, and
// swaps the set in. It returns the paths written.
func (aw *AnalysisWriter) Finish(a *coverage.Analysis) (written []string, err error) {
	if a == nil || a.Layout != aw.early.l || a.Range != aw.early.a.Range {
		aw.Abort()
		return nil, fmt.Errorf("report: the analysis is not the one the report was started for")
	}
	m, opt, w := aw.m, aw.opt, aw.w
	if !opt.GeoPackage {
		// The covered layer, the longest step, needs no service-area list:
		// it starts before newScene gathers that list.
		lead := &scene{l: a.Layout, a: a, m: m, area: new(areaEdgesOnce)}
		aw.steps = append(aw.steps, w.start(lead, lead.layerStep(FileCovered, lead.coveredLayer()), &aw.stop))
	}
	s := newScene(a.Layout, a, m)
	s.files = Files(false, m, opt)
	s.listMax = SummaryListMax
	steps := []step{
		{name: FileReport, write: func(out io.Writer) error {
			if err := s.writeTextTo(out); err != nil {
				return err
			}
			_, err := out.Write(s.reachText(opt.Reach))
			return err
		}},
		{name: FileSummary, write: func(out io.Writer) error {
			d := s.summary()
			d.Reach = s.reachDoc(opt.Reach)
			return writeDoc(out, d)
		}},
	}
	for _, st := range analysisLayers(s) {
		if k := slices.IndexFunc(aw.steps, func(r step) bool { return r.name == st.name }); k >= 0 {
			st = aw.steps[k] // already being written
		}
		steps = append(steps, st)
	}
	if opt.GeoPackage {
		steps = append(steps, step{name: FileGeoPackage, gpkg: true})
	}
	width := mapWidth(opt)
	if opt.Maps {
		steps = append(steps,
			step{name: FileMapServiceAreas, write: fromBytes(func() ([]byte, error) { return s.serviceAreaMap(width) })},
			step{name: FileMapCoverage, write: fromBytes(func() ([]byte, error) { return s.coverageMap(width) })})
	}
	if opt.Charts {
		steps = append(steps,
			step{name: FileChartCurve, write: fromBytes(func() ([]byte, error) { return s.curveChart(width) })},
			step{name: FileChartHoles, write: fromBytes(func() ([]byte, error) { return s.holeChart(width) })})
	}
	steps = append(steps, s.reachSteps(opt)...)
	steps = append(steps, s.gridCopies(func(g *scene) []step {
		return append(analysisLayers(g), g.reachLayerSteps(opt.Reach)...)
	})...)
	err = w.writeAll(s, steps)
	return w.done, err
}

// Abort stops the layers started, waits for them and removes the staging
// folder: the output folder keeps its previous set.
func (aw *AnalysisWriter) Abort() {
	aw.stop.Store(true)
	waitRunning(aw.steps)
	aw.w.set.abort()
}

// WriteCells writes the service-area report of l (the files listed by
// Files(true, m, opt)): a text report and summary.json without coverage
// figures, the sites and service-area layers and, with opt.Maps, the
// service-area map. Errors as for WriteAnalysis.
func WriteCells(dir string, l *coverage.Layout, m Meta, opt Options) ([]string, error) {
	if l == nil {
		return nil, fmt.Errorf("report: no layout to write")
	}
	w, err := newWriter(dir, Files(true, m, opt), m, opt.Progress)
	if err != nil {
		return nil, err
	}
	s := newScene(l, nil, m)
	s.files = Files(true, m, opt)
	s.listMax = SummaryListMax
	steps := []step{
		{name: FileReport, write: s.writeTextTo},
		{name: FileSummary, write: func(out io.Writer) error { return writeDoc(out, s.cellsSummary()) }},
	}
	steps = append(steps, cellLayers(s)...)
	if opt.GeoPackage {
		steps = append(steps, step{name: FileGeoPackage, gpkg: true})
	}
	if opt.Maps {
		width := mapWidth(opt)
		steps = append(steps, step{name: FileMapServiceAreas, write: fromBytes(func() ([]byte, error) { return s.serviceAreaMap(width) })})
	}
	steps = append(steps, s.gridCopies(cellLayers)...)
	err = w.writeAll(s, steps)
	return w.done, err
}

// analysisLayers are the layer steps of WriteAnalysis.
func analysisLayers(s *scene) []step {
	return append(cellLayers(s),
		s.layerStep(FileGaps, s.gapsLayer()),
		s.layerStep(FileHoleClosings, s.holesLayer()),
		s.layerStep(FileCovered, s.coveredLayer()))
}

// cellLayers are the layer steps of WriteCells.
func cellLayers(s *scene) []step {
	return []step{
		s.layerStep(FileSites, s.sitesLayer()),
		s.layerStep(FileServiceAreas, s.serviceAreasLayer()),
	}
}

func mapWidth(opt Options) int {
	w := opt.MapWidth
	if w == 0 {
		w = DefaultMapWidth
	}
	return max(w, MinMapWidth)
}

// Cautions returns the cautions printed at the end of every report (and
// by the CLI's --help), as plain text lines without trailing newline.
func Cautions() string {
	return strings.Join(cautionLines, "\n")
}

var cautionLines = []string{
	"- Coverage is modelled as straight-line disks of the planned ranges. Walls,",
	"  floors, terrain, foliage, vehicles, weather and radio interference are",
	"  ignored; real ranges are shorter and uneven. Survey before committing.",
	"- For life-safety devices (sirens, alarm call points, defibrillator",
	"  cabinets) follow the local codes and licensed practice of the fire,",
	"  medical and electrical authorities, and verify every position on site.",
	"- The figures are planning aids for a design review, not a certificate of",
	"  compliance or of service.",
}
