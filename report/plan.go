// Planning reports: the outputs of the planning moves — suggested
// additions (free placement, fewest additions for a range), the choice
// among candidate spots, single-device failures and the assignment of
// demand points to devices.
//
// As for the analysis, nothing here computes coverage: every figure comes
// from package coverage (coverage.SuggestAdditions, FewestAdditions,
// ChooseCandidates, Failures, Assign, Layout.Gaps; exact to rounding for
// the disk model, see their documentation) and is only converted,
// rounded for display and drawn. The few sums formed here (a candidate's
// cumulative covered area, the totals of a load table) are sums of those
// figures in a fixed order.
//
// Each move writes its own folder: report.txt, summary.json, the existing
// sites as a GeoJSON layer, the move's GeoJSON layers and CSV tables, and
// one PNG map (see PlanFiles). The cautions close every report.txt, or
// open it with Meta.LifeSafety, as for the analysis.

package report

import (
	"fmt"
	"io"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// Move names a planning move.
type Move string

// The planning moves.
const (
	// MoveAdd places K new devices freely (coverage.SuggestAdditions).
	MoveAdd Move = "add"
	// MoveFewest adds the fewest devices that close every gap at a range
	// (coverage.FewestAdditions).
	MoveFewest Move = "fewest"
	// MoveCandidates picks among candidate spots
	// (coverage.ChooseCandidates).
	MoveCandidates Move = "candidates"
	// MoveFailures ranks the devices by the effect of their failure
	// (coverage.Failures).
	MoveFailures Move = "failures"
	// MoveAssign assigns demand points to their serving device
	// (coverage.Assign).
	MoveAssign Move = "assign"
)

// Plan is one planning move with the figures of the existing layout it
// starts from. The CLI fills it in from package coverage.
type Plan struct {
	// Move selects which of the move fields below are used.
	Move Move
	// Layout is the existing layout (devices and site area).
	Layout *coverage.Layout
	// Range is the range the covered figures refer to (m). For MoveAssign
	// it may be 0 when no range was given (distances only).
	Range float64
	// RangeGiven is false when the command chose Range itself;
	// RangeNote then says how (e.g. "the full-cover range after the
	// additions").
	RangeGiven bool
	RangeNote  string
	// FullCover is the existing layout's full-cover range (one common
	// range).
	FullCover coverage.FullCover
	// NewRange is the range of the added devices or picked spots with
	// per-device ranges (MoveAdd, MoveFewest, MoveCandidates), NewType
	// their type when it was given by type ("" otherwise).
	NewRange float64
	NewType  string
	// FullCoverRanges is the existing layout's full-cover figure when the
	// devices have their own ranges (Layout from coverage.NewLayoutRanges:
	// Range is then 0, the covered figures refer to each device's own
	// range and FullCover is unused); nil for one common range.
	FullCoverRanges *coverage.RangesFullCover
	// Uncovered is the existing layout's uncovered area at Range (m²).
	Uncovered float64
	// GapsBefore are the existing layout's gaps at Range (MoveAdd,
	// MoveFewest, MoveCandidates).
	GapsBefore []coverage.Gap
	// GapsAfter are the gaps at Range with the additions (MoveAdd,
	// MoveFewest; for MoveCandidates Choice.Remaining is used).
	GapsAfter []coverage.Gap

	// Requested is K for MoveAdd and MoveCandidates (0: the fewest that
	// cover everything, MoveCandidates only).
	Requested int
	// Suggestion is the result of MoveAdd and MoveFewest.
	Suggestion *coverage.Suggestion
	// CapReached is true when FewestAdditions stopped at its cap before
	// every gap was closed.
	CapReached bool

	// Choice, Candidates and CandidateNames are the result and the input
	// spots (local plane) of MoveCandidates.
	Choice         *coverage.Choice
	Candidates     []orb.Point
	CandidateNames []string
	// CandidateRanges holds each candidate spot's range when the spots
	// carry their own (coverage.ChooseCandidatesEach; nil otherwise);
	// NewRange is then the default of the spots without one.
	CandidateRanges []float64

	// Failures is the result of MoveFailures.
	Failures *coverage.FailureReport

	// Assignment is the result of MoveAssign; Demand are the demand
	// points (local plane; a polygon's representative point), DemandNames
	// their names, DemandPolygons the polygon of each polygon item (nil for
	// a point item) and Weighted tells whether weights were given.
	Assignment     *coverage.Assignment
	Demand         []orb.Point
	DemandNames    []string
	DemandPolygons []orb.MultiPolygon
	Weighted       bool
}

// own reports whether the devices have their own ranges (the layout holds
// them: coverage.NewLayoutRanges).
func (p *Plan) own() bool { return p.Layout.InputRanges != nil }

// Output files of the planning moves (GeoJSON names take "-xy" with
// Meta.Planar, see LayerFile).
const (
	FileProposed      = "proposed-devices.geojson"
	FileGapsBefore    = "gaps-before.geojson"
	FileGapsAfter     = "gaps-after.geojson"
	FileCandidates    = "candidates.geojson"
	FileFailures      = "failures.geojson"
	FileFailuresCSV   = "failures.csv"
	FileAssignment    = "assignment.geojson"
	FileAssignmentCSV = "assignment.csv"
	FileDeviceLoad    = "device-load.geojson"
	FileDeviceLoadCSV = "device-load.csv"
	FileMapSuggest    = "map-suggestions.png"
	FileMapCandidates = "map-candidates.png"
	FileMapFailures   = "map-failures.png"
	FileMapAssignment = "map-assignment.png"
)

// PlanFiles returns the names of the files WritePlan writes for move with
// the given Meta and Options, in the order they are written.
func PlanFiles(move Move, m Meta, opt Options) []string {
	f := []string{FileReport, FileSummary}
	layers := planLayerFiles(move)
	for _, l := range layers {
		f = append(f, LayerFile(l, m.Planar))
	}
	var png string
	switch move {
	case MoveAdd, MoveFewest:
		png = FileMapSuggest
	case MoveCandidates:
		png = FileMapCandidates
	case MoveFailures:
		f = append(f, FileFailuresCSV)
		png = FileMapFailures
	case MoveAssign:
		f = append(f, FileAssignmentCSV, FileDeviceLoadCSV)
		png = FileMapAssignment
	}
	if opt.GeoPackage {
		f = append(f, FileGeoPackage)
	}
	if opt.Maps && png != "" {
		f = append(f, png)
	}
	f = append(f, gridLayerFiles(m, layers...)...)
	return append(f, FileManifest)
}

// planLayerFiles are the GeoJSON layers of move, in the order written
// (before the "-xy" of LayerFile).
func planLayerFiles(move Move) []string {
	f := []string{FileSites}
	switch move {
	case MoveAdd, MoveFewest:
		f = append(f, FileProposed, FileGapsBefore, FileGapsAfter)
	case MoveCandidates:
		f = append(f, FileCandidates, FileGapsBefore, FileGapsAfter)
	case MoveFailures:
		f = append(f, FileFailures)
	case MoveAssign:
		f = append(f, FileAssignment, FileDeviceLoad)
	}
	return f
}

// planScene is a scene with the plan it reports.
type planScene struct {
	*scene
	p *Plan
}

func newPlanScene(p *Plan, m Meta) *planScene {
	if p.own() && m.Ranges == nil {
		m.Ranges = p.Layout.InputRanges // each device's range, wherever devices are listed
	}
	s := &planScene{scene: newScene(p.Layout, nil, m), p: p}
	return s
}

// check reports a plan whose move fields are missing.
func (p *Plan) check() error {
	if p == nil || p.Layout == nil {
		return fmt.Errorf("report: no plan to write")
	}
	ok := false
	switch p.Move {
	case MoveAdd, MoveFewest:
		ok = p.Suggestion != nil
	case MoveCandidates:
		ok = p.Choice != nil && len(p.CandidateNames) == len(p.Candidates)
	case MoveFailures:
		ok = p.Failures != nil && (p.Failures.Ranges != nil) == p.own()
	case MoveAssign:
		ok = p.Assignment != nil && len(p.Demand) == len(p.Assignment.Device)
	default:
		return fmt.Errorf("report: unknown planning move %q", p.Move)
	}
	if !ok {
		return fmt.Errorf("report: plan %q lacks its result", p.Move)
	}
	if p.own() && p.FullCoverRanges == nil {
		return fmt.Errorf("report: plan %q with per-device ranges lacks FullCoverRanges", p.Move)
	}
	return nil
}

// WritePlan writes the report of a planning move (the files listed by
// PlanFiles(p.Move, m, opt)) into dir, creating dir if needed, and returns
// the paths written. Errors as for WriteAnalysis.
func WritePlan(dir string, p *Plan, m Meta, opt Options) ([]string, error) {
	if err := p.check(); err != nil {
		return nil, err
	}
	files := PlanFiles(p.Move, m, opt)
	w, err := newWriter(dir, files, m, opt.Progress)
	if err != nil {
		return nil, err
	}
	s := newPlanScene(p, m)
	s.files = files
	s.listMax = SummaryListMax
	steps := []step{
		{name: FileReport, write: s.writePlanTextTo},
		{name: FileSummary, write: func(out io.Writer) error { return writeDoc(out, s.planSummary()) }},
	}
	steps = append(steps, s.planLayers()...)
	width := mapWidth(opt)
	var drawMap func(int) ([]byte, error)
	png := ""
	switch p.Move {
	case MoveAdd, MoveFewest:
		drawMap, png = s.suggestionMap, FileMapSuggest
	case MoveCandidates:
		drawMap, png = s.candidateMap, FileMapCandidates
	case MoveFailures:
		steps = append(steps, step{name: FileFailuresCSV, write: s.failuresCSV})
		drawMap, png = s.failureMap, FileMapFailures
	case MoveAssign:
		steps = append(steps,
			step{name: FileAssignmentCSV, write: s.assignmentCSV},
			step{name: FileDeviceLoadCSV, write: s.loadCSV})
		drawMap, png = s.assignmentMap, FileMapAssignment
	}
	if opt.GeoPackage {
		steps = append(steps, step{name: FileGeoPackage, gpkg: true})
	}
	if opt.Maps {
		steps = append(steps, step{name: png, write: fromBytes(func() ([]byte, error) { return drawMap(width) })})
	}
	steps = append(steps, s.gridCopies(func(g *scene) []step { return (&planScene{scene: g, p: p}).planLayers() })...)
	err = w.writeAll(s.scene, steps)
	return w.done, err
}

// planLayers are the layer steps of the plan's move, in the order of
// planLayerFiles.
func (s *planScene) planLayers() []step {
	p := s.p
	steps := []step{s.layerStep(FileSites, s.sitesLayer())}
	switch p.Move {
	case MoveAdd, MoveFewest:
		steps = append(steps,
			s.layerStep(FileProposed, s.proposedLayer()),
			s.layerStep(FileGapsBefore, s.planGapLayer(p.GapsBefore)),
			s.layerStep(FileGapsAfter, s.planGapLayer(p.GapsAfter)))
	case MoveCandidates:
		steps = append(steps,
			s.layerStep(FileCandidates, s.candidatesLayer()),
			s.layerStep(FileGapsBefore, s.planGapLayer(p.GapsBefore)),
			s.layerStep(FileGapsAfter, s.planGapLayer(p.Choice.Remaining)))
	case MoveFailures:
		steps = append(steps, s.layerStep(FileFailures, s.failuresLayer()))
	case MoveAssign:
		steps = append(steps,
			s.layerStep(FileAssignment, s.assignmentLayer()),
			s.layerStep(FileDeviceLoad, s.loadLayer()))
	}
	return steps
}

// PlanSummary builds the summary.json document of a planning move.
func PlanSummary(p *Plan, m Meta) (*PlanDoc, error) {
	if err := p.check(); err != nil {
		return nil, err
	}
	return newPlanScene(p, m).planSummary(), nil
}
