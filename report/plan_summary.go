// summary.json of the planning moves.
//
// The document starts with the fields of the analysis's summary.json that
// describe the existing layout, with the same names and meanings
// (command, version, sites, area_m2, range_m, full_cover_range_m,
// full_cover_worst_point, covered_fraction, uncovered_area_m2, projection,
// coordinates, warnings, timings), then the move's own fields: suggestions
// (suggest --add K or the fewest additions), candidates (suggest
// --candidates), failures with survive_any_single_failure_m (failures),
// or assignment (assign). Points follow "coordinates" as in the analysis
// ([lon, lat] rounded to 7 decimals, or [x, y] metres to 3). Values are
// copied from package coverage at full float64 precision; a range that is
// infinite (no device left after a failure) is written as null.

package report

import (
	"math"
	"slices"

	"github.com/sitecover/sitecover/coverage"
)

// PlanDoc is the summary.json document of a planning move.
type PlanDoc struct {
	// Command is the CLI command of the run; Move the planning move.
	Command string `json:"command"`
	Move    Move   `json:"move"`
	Version string `json:"version"`
	// RunInputs names the run's title and input files.
	RunInputs
	// Sites is the number of existing devices (input sites).
	Sites int `json:"sites"`
	// Duplicates counts input sites at exactly the position of an earlier
	// one.
	Duplicates int `json:"duplicates"`
	// AreaM2 is the site area, m²; AreaFromHull tells whether it is the
	// sites' convex hull.
	AreaM2       float64 `json:"area_m2"`
	AreaFromHull bool    `json:"area_from_hull"`
	// RangeM is the range the covered figures refer to (null for assign
	// without a range); RangeGiven is false when the command chose it,
	// RangeNote then says how.
	RangeM     *float64 `json:"range_m"`
	RangeGiven bool     `json:"range_given"`
	RangeNote  string   `json:"range_note,omitempty"`
	// FullCoverRangeM and FullCoverWorstPoint describe the existing
	// layout, as in the analysis (FullCoverRangeM null with per-device
	// ranges: see FullCoverRanges).
	FullCoverRangeM     *float64 `json:"full_cover_range_m"`
	FullCoverWorstPoint Point    `json:"full_cover_worst_point"`
	// With per-device ranges (omitted for one common range): RangeGroups
	// are the devices by type and planned range (the covered figures
	// refer to these ranges; range_m is null), FullCoverRanges the range
	// each group needs to cover the whole area when every device's r²
	// grows by the same amount (the planned range when it is covered
	// already), and Hidden the devices whose disk the others cover
	// entirely (redundant for coverage: they serve nothing and their
	// failure costs nothing).
	RangeGroups     []RangeGroup `json:"range_groups,omitempty"`
	FullCoverRanges []RangeGroup `json:"full_cover_ranges,omitempty"`
	Hidden          []int        `json:"hidden,omitempty"`
	// CoveredFraction and UncoveredAreaM2 are the existing layout's
	// figures at RangeM (null without a range).
	CoveredFraction *float64 `json:"covered_fraction"`
	UncoveredAreaM2 *float64 `json:"uncovered_area_m2"`

	// Suggestions is the result of suggest --add K and of the fewest
	// additions (omitted for other moves).
	Suggestions *SuggestionsDoc `json:"suggestions,omitempty"`
	// Candidates is the result of suggest --candidates.
	Candidates *CandidatesDoc `json:"candidates,omitempty"`
	// FailureFields holds the failures ranking (omitted for other moves).
	*FailureFields
	// Assignment is the result of assign.
	Assignment *AssignmentDoc `json:"assignment,omitempty"`

	Projection    string   `json:"projection"`
	MaxScaleError float64  `json:"max_scale_error"`
	Coordinates   string   `json:"coordinates"`
	Warnings      []string `json:"warnings"`
	Timings       Timings  `json:"timings"`
}

// SuggestionsDoc is the suggestions member of summary.json.
type SuggestionsDoc struct {
	// Mode is "add" (K devices placed freely) or "fewest" (the fewest
	// additions leaving no gap at range_m).
	Mode Move `json:"mode"`
	// Requested is K for "add", 0 for "fewest".
	Requested int `json:"requested"`
	// RangeM is the range the covered figures refer to (0 with per-device
	// ranges: each device's own; NewRangeM and NewType are then the range
	// and type of the added devices, and the full-cover figures the range
	// an added device would need with every r² grown alike until no gap
	// is left).
	RangeM    float64 `json:"range_m"`
	NewRangeM float64 `json:"new_range_m,omitempty"`
	NewType   string  `json:"new_type,omitempty"`
	// Existing is the number of existing devices; Added the new ones in
	// the order they were placed, with the figures before and after each.
	Existing int               `json:"existing"`
	Added    []SuggestedDevice `json:"added"`
	// Totals before any and after all additions.
	FullCoverRangeBeforeM float64 `json:"full_cover_range_before_m"`
	FullCoverRangeAfterM  float64 `json:"full_cover_range_after_m"`
	CoveredFractionBefore float64 `json:"covered_fraction_before"`
	CoveredFractionAfter  float64 `json:"covered_fraction_after"`
	UncoveredBeforeM2     float64 `json:"uncovered_area_before_m2"`
	UncoveredAfterM2      float64 `json:"uncovered_area_after_m2"`
	// GapsBefore and GapsAfter are the gaps at RangeM without and with the
	// additions.
	// (each the first SummaryListMax in summary.json, beside the count
	// of all; the gaps layers hold every one).
	GapsBefore      []SummaryGap `json:"gaps_before"`
	GapsBeforeTotal int          `json:"gaps_before_total"`
	GapsAfter       []SummaryGap `json:"gaps_after"`
	GapsAfterTotal  int          `json:"gaps_after_total"`
	// FewestFields holds the figures of the "fewest" mode.
	*FewestFields
}

// FewestFields are the suggestions fields of the fewest-additions mode.
type FewestFields struct {
	// Reached is true when no gap remains at the range.
	Reached bool `json:"reached"`
	// CapReached is true when the search stopped at its cap first.
	CapReached bool `json:"cap_reached"`
	// Method names the construction kept.
	Method string `json:"method"`
	// TotalDevices is existing plus added.
	TotalDevices int `json:"total_devices"`
	// HexEstimate is area / ((3√3/2)·r²), the devices a hexagonal
	// covering of an area this size needs (Kershner 1939); HexDevices its
	// ceiling; HexRatio is TotalDevices / HexEstimate.
	HexEstimate float64 `json:"hex_estimate"`
	HexDevices  int     `json:"hex_devices"`
	HexRatio    float64 `json:"hex_ratio"`
}

// SuggestedDevice is one proposed device with the figures before and
// after adding it (to the existing devices and the earlier additions).
type SuggestedDevice struct {
	// N numbers the additions from 1 in the order placed.
	N     int   `json:"n"`
	Point Point `json:"point"`
	// FullCoverBeforeM and FullCoverAfterM are full-cover ranges (m).
	FullCoverBeforeM float64 `json:"full_cover_before_m"`
	FullCoverAfterM  float64 `json:"full_cover_after_m"`
	// CoveredBefore and CoveredAfter are covered fractions at range_m.
	CoveredBefore float64 `json:"covered_fraction_before"`
	CoveredAfter  float64 `json:"covered_fraction_after"`
	// UncoveredBeforeM2 and UncoveredAfterM2 are uncovered areas (m²).
	UncoveredBeforeM2 float64 `json:"uncovered_before_m2"`
	UncoveredAfterM2  float64 `json:"uncovered_after_m2"`
}

// CandidatesDoc is the candidates member of summary.json.
type CandidatesDoc struct {
	// File is the candidates file; Count the number of spots in it.
	File  string `json:"file"`
	Count int    `json:"count"`
	// Requested is K (0: the fewest that cover everything).
	Requested int     `json:"requested"`
	RangeM    float64 `json:"range_m"`
	// NewRangeM and NewType: as in SuggestionsDoc (per-device ranges).
	// With spots of their own ranges (OwnRanges), NewRangeM is the default
	// of the spots without one, each pick's range is in Picked, and the
	// full-cover figures are stated for a device of the largest spot range
	// (FullCoverRangeForM).
	NewRangeM float64 `json:"new_range_m,omitempty"`
	NewType   string  `json:"new_type,omitempty"`
	OwnRanges bool    `json:"candidate_ranges,omitempty"`
	// FullCoverRangeForM is the range of the device the full-cover figures
	// are stated for when the spots carry their own ranges.
	FullCoverRangeForM float64 `json:"full_cover_range_for_m,omitempty"`
	// Picked lists the chosen spots in the order picked.
	Picked []PickedCandidate `json:"picked"`
	// Area figures without and with the picks.
	CoveredBeforeM2       float64 `json:"covered_area_before_m2"`
	CoveredAfterM2        float64 `json:"covered_area_after_m2"`
	UncoveredBeforeM2     float64 `json:"uncovered_area_before_m2"`
	UncoveredAfterM2      float64 `json:"uncovered_area_after_m2"`
	CoveredFractionBefore float64 `json:"covered_fraction_before"`
	CoveredFractionAfter  float64 `json:"covered_fraction_after"`
	FullCoverRangeBeforeM float64 `json:"full_cover_range_before_m"`
	FullCoverRangeAfterM  float64 `json:"full_cover_range_after_m"`
	// Complete is true when no gap remains; Exhausted when no remaining
	// spot adds covered area (the choice stopped early).
	Complete  bool `json:"complete"`
	Exhausted bool `json:"exhausted"`
	// GapsBefore are the gaps without picks; Remaining those left with
	// them (empty when Complete).
	// (each the first SummaryListMax in summary.json, beside the count
	// of all; the gaps layers hold every one).
	GapsBefore      []SummaryGap `json:"gaps_before"`
	GapsBeforeTotal int          `json:"gaps_before_total"`
	Remaining       []SummaryGap `json:"remaining"`
	RemainingTotal  int          `json:"remaining_total"`
	// Evaluations counts marginal-area evaluations (lazy greedy).
	Evaluations int `json:"evaluations"`
}

// PickedCandidate is one chosen spot.
type PickedCandidate struct {
	// Order numbers the picks from 1; Candidate is the 0-based index in
	// the candidates file.
	Order     int    `json:"order"`
	Candidate int    `json:"candidate"`
	Name      string `json:"name"`
	Point     Point  `json:"point"`
	// GainM2 is the covered area the spot added when picked;
	// CoveredAfterM2 and CoveredFractionAfter the totals after it.
	GainM2               float64 `json:"gain_m2"`
	CoveredAfterM2       float64 `json:"covered_area_after_m2"`
	CoveredFractionAfter float64 `json:"covered_fraction_after"`
	// RangeM is the range of the device at the spot when the spots carry
	// ranges of their own (omitted otherwise).
	RangeM float64 `json:"range_m,omitempty"`
}

// FailureFields are the failures members of summary.json.
type FailureFields struct {
	// Failures lists the devices, worst failure first (in summary.json
	// the first SummaryListMax; FailuresTotal counts them all and
	// failures.csv and the failures layer list every one).
	Failures      []DeviceFailureDoc `json:"failures"`
	FailuresTotal int                `json:"failures_total"`
	// SurviveAnySingleFailureM is the range at which the area stays fully
	// covered whichever single device fails (null with one device, and
	// with per-device ranges); SurvivePoint is where it is needed and
	// SurviveSite the device whose failure needs it.
	SurviveAnySingleFailureM *float64 `json:"survive_any_single_failure_m"`
	// SurviveAnySingleFailureRanges is, with per-device ranges, the range
	// each group of devices (type, planned range) needs so that any single
	// failure leaves no gap, all r² growing by the same amount (the
	// planned range when no growth is needed; omitted for one common
	// range, and with a single device: nothing remains when it fails).
	SurviveAnySingleFailureRanges []RangeGroup `json:"survive_any_single_failure_ranges,omitempty"`
	SurvivePoint                  Point        `json:"survive_point"`
	SurviveSite                   int          `json:"survive_site"`
}

// DeviceFailureDoc is one device of the failures ranking.
type DeviceFailureDoc struct {
	// Rank numbers the devices from 1 (worst failure first).
	Rank int    `json:"rank"`
	Site int    `json:"site"`
	Name string `json:"name"`
	// Shared is true when another device stands at the same spot.
	Shared bool `json:"shared"`
	// ServiceAreaM2 is the area the device serves.
	ServiceAreaM2 float64 `json:"service_area_m2"`
	// UncoveredM2 is the uncovered area with the device out of service;
	// AddedUncoveredM2 the increase over all devices working.
	UncoveredM2      float64 `json:"uncovered_area_m2"`
	AddedUncoveredM2 float64 `json:"added_uncovered_m2"`
	// DeepestPoint is the deepest point of the new gap and ClosingRangeM
	// the range the remaining devices need to cover what this one served
	// (null when none remains); Backup is the device nearest the deepest
	// point (-1: none).
	DeepestPoint  Point    `json:"deepest_point"`
	ClosingRangeM *float64 `json:"closing_range_m"`
	Backup        int      `json:"backup"`
	BackupName    string   `json:"backup_name"`
	// FullCoverRangeM is the full-cover range without the device (null
	// with per-device ranges).
	FullCoverRangeM *float64 `json:"full_cover_range_m"`
	// With per-device ranges: RangeM is the device's planned range, and
	// Hidden tells that the others cover its whole disk (its failure
	// costs nothing). ClosingRangeM is then the range the backup device
	// needs to reach the deepest point.
	RangeM *float64 `json:"range_m,omitempty"`
	Hidden bool     `json:"hidden,omitempty"`
}

// AssignmentDoc is the assignment member of summary.json.
type AssignmentDoc struct {
	// File is the demand file; Points the number of demand items, of
	// which Polygons were polygons (placed at a representative point).
	File     string `json:"file"`
	Points   int    `json:"points"`
	Polygons int    `json:"polygons"`
	// Weighted is true when weights were given.
	Weighted bool `json:"weighted"`
	// Served and Unserved count the items within and beyond range_m, with
	// their summed weights (null without a range).
	Served         *int     `json:"served"`
	Unserved       *int     `json:"unserved"`
	ServedWeight   *float64 `json:"served_weight"`
	UnservedWeight *float64 `json:"unserved_weight"`
	// Assignments holds one entry per demand item, in file order, when
	// there are at most MaxListedAssignments items (AssignmentsListed);
	// otherwise it is empty and assignment.csv holds the list.
	AssignmentsListed bool            `json:"assignments_listed"`
	Assignments       []AssignedPoint `json:"assignments"`
	// Farthest is the demand item farthest from its device (null when
	// there is none).
	Farthest *AssignedPoint `json:"farthest"`
	// Load holds one entry per device, in input order (in summary.json
	// the first SummaryListMax; LoadTotal counts them all and
	// device-load.csv and the device-load layer list every one).
	Load      []DeviceLoadDoc `json:"load"`
	LoadTotal int             `json:"load_total"`
}

// AssignedPoint is one demand item and its serving device.
type AssignedPoint struct {
	Point      int    `json:"point"`
	Name       string `json:"name"`
	Position   Point  `json:"position"`
	Device     int    `json:"device"`
	DeviceName string `json:"device_name"`
	// DistanceM is the distance to the device; WithinRange whether it is
	// at most range_m (null without a range).
	DistanceM   float64 `json:"distance_m"`
	WithinRange *bool   `json:"within_range"`
	Weight      float64 `json:"weight"`
}

// DeviceLoadDoc is the demand one device serves.
type DeviceLoadDoc struct {
	Device int    `json:"device"`
	Name   string `json:"name"`
	// Count and Weight are the items served and their summed weight;
	// InRange and InRangeWeight those within range (null without a
	// range).
	Count         int      `json:"count"`
	Weight        float64  `json:"weight"`
	InRange       *int     `json:"in_range"`
	InRangeWeight *float64 `json:"in_range_weight"`
	// With per-device ranges: RangeM is the device's planned range and
	// Hidden tells that it serves nothing (the others cover its disk).
	RangeM *float64 `json:"range_m,omitempty"`
	Hidden bool     `json:"hidden,omitempty"`
}

// MaxListedAssignments is the largest number of demand items listed one
// by one in summary.json; larger assignments are listed in assignment.csv
// and assignment.geojson only (a million items would make summary.json
// hundreds of megabytes).
const MaxListedAssignments = 100_000

// MarshalIndent encodes the document as indented JSON ending in a newline.
func (d *PlanDoc) MarshalIndent() ([]byte, error) { return marshalDoc(d) }

// finite returns a pointer to v, or nil when v is not finite (null).
func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

func ptr[T any](v T) *T { return &v }

func (s *planScene) summaryGaps(gaps []coverage.Gap) []SummaryGap {
	out := make([]SummaryGap, 0, s.listed(len(gaps)))
	for i := range s.listed(len(gaps)) {
		out = append(out, s.summaryGap(&gaps[i], s.point(gaps[i].Deepest)))
	}
	return out
}

// hasRange reports whether the plan's covered figures refer to a range:
// a common one, or each device's own.
func (s *planScene) hasRange() bool { return s.p.Range > 0 || s.p.own() }

// rangeGroups returns the devices grouped by type and planned range
// (report/ranges.go), each group's range given by value (nil: planned).
func (s *planScene) rangeGroups(value func(i int) float64) []RangeGroup {
	return (&rangesScene{scene: s.scene}).groups(value)
}

// grownRange is device i's range from a list of ranges after uniform
// power growth (coverage.RangesFullCover.Needed, FailureReport.
// SurviveRanges), its planned range when no growth is needed.
func (s *planScene) grownRange(grown []float64, none bool, i int) float64 {
	if none || i >= len(grown) {
		return s.rangeOf(i)
	}
	return grown[i]
}

// ownRange returns device i's planned range with per-device ranges, nil
// for one common range.
func (s *planScene) ownRange(i int) *float64 {
	if !s.p.own() {
		return nil
	}
	return ptr(s.rangeOf(i))
}

func (s *planScene) planSummary() *PlanDoc {
	p := s.p
	d := &PlanDoc{
		Command:       s.m.Command,
		Move:          p.Move,
		Version:       s.m.Version,
		RunInputs:     s.runInputs(),
		Sites:         len(s.l.Sites),
		Duplicates:    s.duplicates(),
		AreaM2:        s.l.AreaM2,
		AreaFromHull:  s.m.AreaFromHull,
		RangeGiven:    p.RangeGiven,
		RangeNote:     p.RangeNote,
		Projection:    s.projection(),
		MaxScaleError: s.m.MaxScaleError,
		Coordinates:   s.coordKind(),
		Warnings:      s.warnings(),
		Timings:       s.timings(),
	}
	if fc := p.FullCoverRanges; fc != nil {
		if len(fc.Worst) > 0 {
			d.FullCoverWorstPoint = s.point(fc.Worst[0])
		}
		d.RangeGroups = s.rangeGroups(nil)
		d.FullCoverRanges = s.rangeGroups(func(i int) float64 { return s.grownRange(fc.Needed, fc.Covered, i) })
		d.Hidden = append([]int{}, s.l.Hidden...)
	} else {
		d.FullCoverRangeM = ptr(p.FullCover.Range)
		if len(p.FullCover.Worst) > 0 {
			d.FullCoverWorstPoint = s.point(p.FullCover.Worst[0])
		}
	}
	if s.hasRange() {
		if !p.own() {
			d.RangeM = ptr(p.Range)
		}
		d.UncoveredAreaM2 = ptr(p.Uncovered)
		d.CoveredFraction = ptr(s.fraction(p.Uncovered))
	}
	switch p.Move {
	case MoveAdd, MoveFewest:
		d.Suggestions = s.suggestionsDoc()
	case MoveCandidates:
		d.Candidates = s.candidatesDoc()
	case MoveFailures:
		d.FailureFields = s.failureFields()
	case MoveAssign:
		d.Assignment = s.assignmentDoc()
	}
	return d
}

// fraction is the covered fraction for an uncovered area, clamped to
// [0, 1] (as coverage reports it).
func (s *planScene) fraction(uncovered float64) float64 {
	a := s.l.AreaM2
	if !(a > 0) {
		return 0
	}
	return math.Max(0, math.Min(1, 1-uncovered/a))
}

func (s *planScene) suggestionsDoc() *SuggestionsDoc {
	p, sg := s.p, s.p.Suggestion
	d := &SuggestionsDoc{
		Mode:                  p.Move,
		Requested:             p.Requested,
		RangeM:                sg.Range,
		NewRangeM:             sg.NewRange,
		NewType:               p.NewType,
		Existing:              sg.Existing,
		Added:                 make([]SuggestedDevice, 0, len(sg.Steps)),
		FullCoverRangeBeforeM: sg.FullCoverBefore,
		FullCoverRangeAfterM:  sg.FullCoverAfter,
		CoveredFractionBefore: sg.CoveredBefore,
		CoveredFractionAfter:  sg.CoveredAfter,
		UncoveredBeforeM2:     sg.UncoveredBefore,
		UncoveredAfterM2:      sg.UncoveredAfter,
		GapsBefore:            s.summaryGaps(p.GapsBefore),
		GapsBeforeTotal:       len(p.GapsBefore),
		GapsAfter:             s.summaryGaps(p.GapsAfter),
		GapsAfterTotal:        len(p.GapsAfter),
	}
	if p.Move == MoveAdd {
		d.Requested = p.Requested
	} else {
		d.Requested = 0
		d.FewestFields = &FewestFields{
			Reached:      sg.Reached,
			CapReached:   p.CapReached,
			Method:       sg.Method,
			TotalDevices: sg.TotalDevices,
			HexEstimate:  sg.HexEstimate,
			HexDevices:   sg.HexDevices,
			HexRatio:     sg.HexRatio,
		}
	}
	for j, st := range sg.Steps {
		d.Added = append(d.Added, SuggestedDevice{
			N:                 j + 1,
			Point:             s.point(st.Added),
			FullCoverBeforeM:  st.FullCoverBefore,
			FullCoverAfterM:   st.FullCoverAfter,
			CoveredBefore:     st.CoveredBefore,
			CoveredAfter:      st.CoveredAfter,
			UncoveredBeforeM2: st.UncoveredBefore,
			UncoveredAfterM2:  st.UncoveredAfter,
		})
	}
	return d
}

// cumulative returns the covered area after each pick: the covered area
// before plus the gains so far, in pick order.
func cumulative(ch *coverage.Choice) []float64 {
	out := make([]float64, len(ch.Picked))
	c := ch.CoveredBefore
	for j := range ch.Picked {
		c += ch.Gains[j]
		out[j] = c
	}
	return out
}

func (s *planScene) candidatesDoc() *CandidatesDoc {
	p, ch := s.p, s.p.Choice
	d := &CandidatesDoc{
		File:                  s.m.CandidatesFile,
		Count:                 len(p.Candidates),
		Requested:             max(p.Requested, 0),
		RangeM:                ch.Range,
		NewRangeM:             ch.NewRange,
		NewType:               p.NewType,
		Picked:                make([]PickedCandidate, 0, len(ch.Picked)),
		CoveredBeforeM2:       ch.CoveredBefore,
		CoveredAfterM2:        ch.CoveredAfter,
		UncoveredBeforeM2:     ch.UncoveredBefore,
		UncoveredAfterM2:      ch.UncoveredAfter,
		CoveredFractionBefore: ch.FractionBefore,
		CoveredFractionAfter:  ch.FractionAfter,
		FullCoverRangeBeforeM: ch.FullCoverBefore,
		FullCoverRangeAfterM:  ch.FullCoverAfter,
		Complete:              ch.Complete,
		Exhausted:             ch.Exhausted,
		GapsBefore:            s.summaryGaps(p.GapsBefore),
		GapsBeforeTotal:       len(p.GapsBefore),
		Remaining:             s.summaryGaps(ch.Remaining),
		RemainingTotal:        len(ch.Remaining),
		Evaluations:           ch.Evaluations,
	}
	cum := cumulative(ch)
	for j, c := range ch.Picked {
		d.Picked = append(d.Picked, PickedCandidate{
			Order:                j + 1,
			Candidate:            c,
			Name:                 p.CandidateNames[c],
			Point:                s.point(p.Candidates[c]),
			GainM2:               ch.Gains[j],
			CoveredAfterM2:       cum[j],
			CoveredFractionAfter: math.Max(0, math.Min(1, cum[j]/s.l.AreaM2)),
		})
		if ch.Ranges != nil {
			d.Picked[j].RangeM = ch.Ranges[j]
		}
	}
	if p.Choice.Ranges != nil || p.CandidateRanges != nil {
		d.OwnRanges, d.NewRangeM, d.FullCoverRangeForM = true, p.NewRange, ch.NewRange
	}
	return d
}

func (s *planScene) failureFields() *FailureFields {
	fr := s.p.Failures
	f := &FailureFields{
		Failures:                 make([]DeviceFailureDoc, 0, s.listed(len(fr.Devices))),
		FailuresTotal:            len(fr.Devices),
		SurviveAnySingleFailureM: finite(fr.SurviveRange),
		SurvivePoint:             s.point(fr.SurvivePoint),
		SurviveSite:              fr.SurviveSite,
	}
	if fr.Ranges != nil {
		f.SurviveAnySingleFailureM = nil
		if !math.IsInf(fr.SurvivePower, 1) {
			f.SurviveAnySingleFailureRanges = s.rangeGroups(func(i int) float64 { return fr.SurviveRanges[i] })
		}
	}
	for k, d := range fr.Devices[:s.listed(len(fr.Devices))] {
		f.Failures = append(f.Failures, DeviceFailureDoc{
			Rank:             k + 1,
			Site:             d.Site,
			Name:             s.name(d.Site),
			Shared:           d.Shared,
			ServiceAreaM2:    d.ServiceArea,
			UncoveredM2:      d.Uncovered,
			AddedUncoveredM2: d.AddedUncovered,
			DeepestPoint:     s.point(d.Deepest),
			ClosingRangeM:    finite(d.ClosingRange),
			Backup:           d.Backup,
			BackupName:       s.name(d.Backup),
			FullCoverRangeM:  finite(d.FullCover),
			RangeM:           s.ownRange(d.Site),
			Hidden:           d.Hidden,
		})
	}
	return f
}

func (s *planScene) assignmentDoc() *AssignmentDoc {
	p, a := s.p, s.p.Assignment
	d := &AssignmentDoc{
		File:        s.m.PointsFile,
		Points:      len(p.Demand),
		Weighted:    p.Weighted,
		Assignments: []AssignedPoint{},
		Load:        make([]DeviceLoadDoc, s.listed(len(a.Load))),
		LoadTotal:   len(a.Load),
	}
	d.AssignmentsListed = len(p.Demand) <= MaxListedAssignments
	if d.AssignmentsListed {
		d.Assignments = make([]AssignedPoint, len(p.Demand))
	}
	for _, poly := range p.DemandPolygons {
		if poly != nil {
			d.Polygons++
		}
	}
	ranged := s.hasRange()
	if ranged {
		d.Served, d.Unserved = ptr(a.Served), ptr(a.Unserved)
		d.ServedWeight, d.UnservedWeight = ptr(a.ServedWeight), ptr(a.UnservedWeight)
	}
	entry := func(i int) AssignedPoint {
		e := AssignedPoint{
			Point:      i,
			Name:       s.demandName(i),
			Position:   s.point(p.Demand[i]),
			Device:     a.Device[i],
			DeviceName: s.name(a.Device[i]),
			DistanceM:  a.Distance[i],
			Weight:     a.Weight[i],
		}
		if ranged {
			e.WithinRange = ptr(a.Within[i])
		}
		return e
	}
	far := -1
	for i, dist := range a.Distance {
		if far < 0 || dist > a.Distance[far] {
			far = i
		}
	}
	if far >= 0 {
		d.Farthest = ptr(entry(far))
	}
	for i := range d.Assignments {
		d.Assignments[i] = entry(i)
	}
	for i, ld := range a.Load[:len(d.Load)] {
		e := DeviceLoadDoc{Device: i, Name: s.name(i), Count: ld.Count, Weight: ld.Weight, RangeM: s.ownRange(i), Hidden: s.hidden(i)}
		if ranged {
			e.InRange, e.InRangeWeight = ptr(ld.InRange), ptr(ld.InRangeWeight)
		}
		d.Load[i] = e
	}
	return d
}

// hidden reports whether input device i is hidden (per-device ranges: the
// others cover its whole disk).
func (s *planScene) hidden(i int) bool {
	_, ok := slices.BinarySearch(s.l.Hidden, i)
	return ok
}

// demandName returns the name of demand item i, or "".
func (s *planScene) demandName(i int) string {
	if i >= 0 && i < len(s.p.DemandNames) {
		return s.p.DemandNames[i]
	}
	return ""
}
