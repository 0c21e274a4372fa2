// suggest --reach K: the devices added so that every spot of the site is
// reached by at least K devices (coverage.ReachAdditions), or the candidate
// spots picked for it (suggest --reach K --candidates FILE,
// coverage.ChooseCandidatesReach), written as report.txt, summary.json,
// the existing devices, the added devices or the candidate spots with the
// exact figures after each addition or pick, the k-coverage of the layout
// with them (the bands by number of devices in reach and the k-gaps, as
// analyze --reach writes them), the "devices in reach" map of that layout
// with the new devices marked (kcover_map.go) and, with --gpkg, every layer
// in sitecover.gpkg.
//
// With own ranges (coverage.ReachAdditionsRanges; free placement only) the
// K-cover figures are uniform power growths t, written as analyze --reach
// writes them (kcover.go): the range each group of devices (type and
// planned range) needs, √(r² + t) — before for the existing devices, after
// and at each step for the layout with every addition, the new devices a
// group of their own (the --new-type type, or their range).

package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/gpkg"
)

// FileReachAdded is the layer of the devices suggest --reach adds.
const FileReachAdded = "reach-added-devices.geojson"

// ReachPlan is the result of suggest --reach to write: Suggestion (free
// placement) or Choice (candidate spots).
type ReachPlan struct {
	// Layout is the existing layout.
	Layout *coverage.Layout
	// Suggestion is the result of coverage.ReachAdditions.
	Suggestion *coverage.ReachSuggestion
	// Choice is the result of coverage.ChooseCandidatesReach, Candidates
	// and CandidateNames the candidate spots (local plane) and their names.
	Choice         *coverage.ReachChoice
	Candidates     []orb.Point
	CandidateNames []string
	// CandidateRanges and CandidateTypes are, with own ranges
	// (Choice.OwnRanges), each candidate spot's range (m) and type (""
	// for none; nil when no spot has one).
	CandidateRanges []float64
	CandidateTypes  []string
	// CapReached tells that the cap on additions stopped the placement.
	CapReached bool
	// NewType is the type of the added devices with own ranges
	// (Suggestion.OwnRanges, or the default of candidate spots without a
	// range of their own; suggest --new-type), "" for none.
	NewType string
	// After is the layout with the additions and AfterReach its
	// k-coverage at the planned range (every level 1 … K, with gaps).
	After      *coverage.Layout
	AfterReach *coverage.KCoverage
}

// ReachPlanDoc is summary.json of suggest --reach.
type ReachPlanDoc struct {
	Command string `json:"command"`
	// K is the number of devices every spot must be reached by.
	K int `json:"k"`
	// RangeM is the planned range (m).
	RangeM float64 `json:"range_m"`
	// Existing is the number of existing devices; Added the steps.
	Existing int             `json:"existing_devices"`
	Added    []ReachAddedDoc `json:"added"`
	// KCoverRange* are the K-cover ranges before and after (null: fewer
	// than K distinct devices).
	KCoverRangeBeforeM *float64 `json:"k_cover_range_before_m"`
	KCoverRangeAfterM  *float64 `json:"k_cover_range_after_m"`
	// CoveredFraction* are the shares reached by at least K devices.
	CoveredFractionBefore float64 `json:"covered_fraction_before"`
	CoveredFractionAfter  float64 `json:"covered_fraction_after"`
	Reached               bool    `json:"reached"`
	CapReached            bool    `json:"cap_reached"`
	Pruned                int     `json:"pruned"`
	Method                string  `json:"method"`
	// OwnRanges is set when the devices have their own ranges: RangeM is
	// then the new devices' range (of type NewType), the K-cover ranges
	// null and the K-cover figures the uniform power growths
	// KCoverPower*M2 with the ranges each group of devices (type and
	// planned range; before: the existing devices, after: with the new
	// ones) needs for them, √(r² + t), in KCoverRanges*.
	OwnRanges           bool         `json:"own_ranges,omitempty"`
	NewType             string       `json:"new_type,omitempty"`
	KCoverPowerBeforeM2 *float64     `json:"k_cover_power_before_m2,omitempty"`
	KCoverPowerAfterM2  *float64     `json:"k_cover_power_after_m2,omitempty"`
	KCoverRangesBefore  []RangeGroup `json:"k_cover_ranges_before,omitempty"`
	KCoverRangesAfter   []RangeGroup `json:"k_cover_ranges_after,omitempty"`
	// Candidates is the choice among candidate spots (suggest --reach
	// --candidates; Added is then empty).
	Candidates *ReachCandidatesDoc `json:"candidates,omitempty"`
	// Reach is the k-coverage of the layout with the additions.
	Reach *ReachDoc `json:"reach_after"`
}

// ReachCandidatesDoc is the choice among candidate spots for a k target
// in summary.json.
type ReachCandidatesDoc struct {
	// File is the candidates file; Count the number of spots in it;
	// Requested the number of picks asked for (0: the fewest).
	File      string `json:"file"`
	Count     int    `json:"count"`
	Requested int    `json:"requested"`
	// Picked lists the chosen spots in the order picked.
	Picked []ReachPickDoc `json:"picked"`
	// Exhausted: no remaining spot adds reach; the target cannot be
	// reached from these candidates.
	Exhausted bool `json:"exhausted"`
	// LowerBound is a lower bound on the number of candidates any choice
	// needs (0 when Exhausted); Optimal says the picks match it.
	LowerBound int  `json:"lower_bound"`
	Optimal    bool `json:"optimal"`
	// ShortAreaM2 is the area reached by fewer than k devices with the
	// picks (m²).
	ShortAreaM2 float64 `json:"short_area_m2"`
	// Evaluations counts the exact depth evaluations (lazy greedy).
	Evaluations int `json:"evaluations"`
}

// ReachPickDoc is one picked candidate spot in summary.json.
type ReachPickDoc struct {
	// Order numbers the picks from 1; Candidate is the 0-based index in
	// the candidates file.
	Order     int    `json:"order"`
	Candidate int    `json:"candidate"`
	Name      string `json:"name"`
	Point     Point  `json:"position"`
	// DepthGainM2 is what the pick added to Σ_k (area reached by ≥ k
	// devices), k = 1 … K, when picked (m²).
	DepthGainM2 float64 `json:"depth_gain_m2"`
	// KCoverRangeM, CoveredFraction and CoveredAreaM2 are the figures
	// with this and the earlier picks.
	KCoverRangeM    *float64 `json:"k_cover_range_m"`
	CoveredFraction float64  `json:"covered_fraction"`
	CoveredAreaM2   float64  `json:"covered_area_m2"`
	// RangeM, KCoverPowerM2 and KCoverRanges are set with own ranges: the
	// spot's range (m), the K-cover power growth (m²) with this and the
	// earlier picks and the range each group of devices needs for it (m),
	// the groups those of the layout with every pick.
	RangeM        float64      `json:"range_m,omitempty"`
	KCoverPowerM2 *float64     `json:"k_cover_power_m2,omitempty"`
	KCoverRanges  []RangeGroup `json:"k_cover_ranges,omitempty"`
}

// ReachAddedDoc is one added device in summary.json.
type ReachAddedDoc struct {
	N               int      `json:"n"`
	Position        Point    `json:"position"`
	KCoverRangeM    *float64 `json:"k_cover_range_m"`
	CoveredFraction float64  `json:"covered_fraction"`
	CoveredAreaM2   float64  `json:"covered_area_m2"`
	// KCoverPowerM2 and KCoverRanges (own ranges) are the K-cover power
	// growth (m²) with this and the earlier additions and the range each
	// group of devices needs for it (m), the groups (and their device
	// counts) those of the layout with every addition.
	KCoverPowerM2 *float64     `json:"k_cover_power_m2,omitempty"`
	KCoverRanges  []RangeGroup `json:"k_cover_ranges,omitempty"`
}

// reachMethod names the placement method in the outputs.
const reachMethod = "farthest-point insertion on the k-th nearest distance (Gonzalez 1985), each device at the spot needing the most range or 0.9 range from it (the larger area reached by k), then redundant additions dropped"

// reachMethodOwn names the placement method with own ranges.
const reachMethodOwn = "farthest-point insertion on the k-th smallest power |x − p|² − r² (Gonzalez 1985), each new device at the spot needing the most growth or 0.9 of the new devices' range from it (the larger area reached by k), then redundant additions dropped"

// reachChoiceMethod names the choice method in the outputs.
const reachChoiceMethod = "greedy submodular set cover on the depth (the sum over k = 1 … K of the area reached by k devices; Wolsey 1982, after Johnson 1974 and Chvátal 1979), lazy re-evaluation, then redundant picks dropped"

// reachChoiceMethodOwn names the choice method with own ranges.
const reachChoiceMethodOwn = reachChoiceMethod + "; each device at its own range (order-k power diagram, Aurenhammer 1987)"

// ReachPlanFiles lists the files WriteReachPlan writes for the free
// placement without map or GeoPackage (ReachPlanOutputs lists them all).
func ReachPlanFiles(m Meta) []string {
	return ReachPlanOutputs(&ReachPlan{}, m, Options{})
}

// ReachPlanOutputs lists the files WriteReachPlan writes for p with the
// given options, in the order they are written.
func ReachPlanOutputs(p *ReachPlan, m Meta, opt Options) []string {
	pts := FileReachAdded
	if p.Choice != nil {
		pts = FileCandidates
	}
	f := []string{FileReport, FileSummary, LayerFile(FileSites, m.Planar), LayerFile(pts, m.Planar),
		LayerFile(FileReach, m.Planar), LayerFile(FileReachGaps, m.Planar)}
	f = append(f, gridLayerFiles(m, FileSites, pts, FileReach, FileReachGaps)...)
	if opt.GeoPackage {
		f = append(f, FileGeoPackage)
	}
	if opt.Maps {
		f = append(f, FileMapReach)
	}
	return append(f, FileManifest)
}

// check reports a plan whose parts are missing.
func (p *ReachPlan) check() error {
	if p == nil || p.Layout == nil || (p.Suggestion == nil) == (p.Choice == nil) || p.After == nil || p.AfterReach == nil ||
		p.Choice != nil && len(p.CandidateNames) != len(p.Candidates) ||
		p.Choice != nil && p.Choice.OwnRanges && len(p.CandidateRanges) != len(p.Candidates) ||
		p.CandidateTypes != nil && len(p.CandidateTypes) != len(p.Candidates) {
		return errors.New("report: WriteReachPlan: incomplete plan")
	}
	return nil
}

// reachAfterMeta is m for the layout with the additions: the new devices
// named "+1", "+2", … in placement order, or by their candidate's label.
func (p *ReachPlan) reachAfterMeta(m Meta) Meta {
	n := len(p.Layout.Sites)
	names := make([]string, n, len(p.After.Sites))
	copy(names, m.SiteNames)
	if p.Choice != nil {
		for _, pk := range p.Choice.Picks {
			names = append(names, ItemLabel(p.CandidateNames[pk.Candidate], "candidate", pk.Candidate))
		}
		if p.own() {
			m = p.reachChoiceMeta(m, names)
		}
		m.SiteNames = names
		return m
	}
	for j := range p.Suggestion.Added {
		names = append(names, fmt.Sprintf("+%d", j+1))
	}
	m.SiteNames = names
	if p.own() {
		m.Ranges = append(append([]float64(nil), p.Layout.InputRanges...), repeatFloat(p.Suggestion.Range, len(p.Suggestion.Added))...)
		if m.Types != nil || p.NewType != "" {
			types := make([]string, n, len(p.After.Sites))
			copy(types, m.Types)
			for range p.Suggestion.Added {
				types = append(types, p.NewType)
			}
			m.Types = types
		}
	}
	return m
}

// reachChoiceMeta is m for the layout with the picks with own ranges:
// each pick's range and, when some device or spot has a type, its type.
func (p *ReachPlan) reachChoiceMeta(m Meta, names []string) Meta {
	n := len(p.Layout.Sites)
	m.Ranges = slices.Clone(p.Layout.InputRanges)
	for _, pk := range p.Choice.Picks {
		m.Ranges = append(m.Ranges, pk.Range)
	}
	if m.Types != nil || p.CandidateTypes != nil {
		types := make([]string, n, len(names))
		copy(types, m.Types)
		for _, pk := range p.Choice.Picks {
			t := ""
			if p.CandidateTypes != nil {
				t = p.CandidateTypes[pk.Candidate]
			}
			types = append(types, t)
		}
		m.Types = types
	}
	return m
}

// reachBeforeMeta is m for the existing layout: with own ranges each
// device's planned range.
func (p *ReachPlan) reachBeforeMeta(m Meta) Meta {
	if p.own() {
		m.Ranges = p.Layout.InputRanges
	}
	return m
}

// own reports whether the plan is for devices with their own ranges
// (coverage.ReachAdditionsRanges, coverage.ChooseCandidatesReachRanges).
func (p *ReachPlan) own() bool {
	return p.Suggestion != nil && p.Suggestion.OwnRanges || p.Choice != nil && p.Choice.OwnRanges
}

// coverPowers returns the K-cover powers before and after and K of an
// own-range plan.
func (p *ReachPlan) coverPowers() (before, after float64, K int) {
	if p.Choice != nil {
		return p.Choice.CoverPowerBefore, p.Choice.CoverPowerAfter, p.Choice.K
	}
	return p.Suggestion.CoverPowerBefore, p.Suggestion.CoverPowerAfter, p.Suggestion.K
}

// repeatFloat returns n copies of v.
func repeatFloat(v float64, n int) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = v
	}
	return out
}

// WriteReachPlan writes the outputs of suggest --reach into dir (staged
// and swapped in whole, as every output set).
func WriteReachPlan(dir string, p *ReachPlan, m Meta, opt Options) ([]string, error) {
	if err := p.check(); err != nil {
		return nil, err
	}
	files := ReachPlanOutputs(p, m, opt)
	w, err := newWriter(dir, files, m, opt.Progress)
	if err != nil {
		return nil, err
	}
	s := newScene(p.Layout, nil, p.reachBeforeMeta(m))
	after := newScene(p.After, nil, p.reachAfterMeta(m))
	var pts step
	if p.Choice != nil {
		pts = s.layerStep(FileCandidates, s.reachCandidatesLayer(p, after))
	} else {
		pts = s.layerStep(FileReachAdded, s.reachAddedLayer(p.Suggestion, after))
	}
	steps := []step{
		{name: FileReport, write: func(out io.Writer) error { _, err := out.Write(after.reachPlanText(p)); return err }},
		{name: FileSummary, write: func(out io.Writer) error { return writeDoc(out, after.reachPlanDoc(p)) }},
		s.layerStep(FileSites, s.sitesLayer()),
		pts,
		after.layerStep(FileReach, after.reachLayer(p.AfterReach)),
		after.layerStep(FileReachGaps, after.reachGapsLayer(p.AfterReach)),
	}
	steps = append(steps, s.gridCopies(func(g *scene) []step {
		gp := g.layerStep(FileReachAdded, g.reachAddedLayer(p.Suggestion, after))
		if p.Choice != nil {
			gp = g.layerStep(FileCandidates, g.reachCandidatesLayer(p, after))
		}
		return []step{g.layerStep(FileSites, g.sitesLayer()), gp}
	})...)
	steps = append(steps, after.gridCopies(func(g *scene) []step { return g.reachLayerSteps(p.AfterReach) })...)
	if opt.GeoPackage {
		steps = append(steps, step{name: FileGeoPackage, gpkg: true})
	}
	if opt.Maps {
		width := mapWidth(opt)
		steps = append(steps, step{name: FileMapReach, write: fromBytes(func() ([]byte, error) {
			return encodeMap(after.drawReachMap(p.AfterReach, width, p.reachMarks(after)))
		})})
	}
	err = w.writeAll(s, steps)
	return w.done, err
}

// reachMarks are the map marks of the plan: the new devices or picked
// spots, and the candidate spots not picked; after is the scene of the
// layout with them (own ranges: the ranges per group of devices).
func (p *ReachPlan) reachMarks(after *scene) reachMarks {
	var mk reachMarks
	if p.Choice != nil {
		ch := p.Choice
		picked := make([]bool, len(p.Candidates))
		for _, pk := range ch.Picks {
			picked[pk.Candidate] = true
			mk.added = append(mk.added, pk.Position)
		}
		for i, c := range p.Candidates {
			if !picked[i] {
				mk.others = append(mk.others, c)
			}
		}
		mk.label = "Picked spot (named on the map by its candidate label)"
		if ch.OwnRanges {
			mk.title = fmt.Sprintf("%d of %d candidate spots picked for %d devices in reach at their own ranges", len(ch.Picks), len(p.Candidates), ch.K)
			mk.sub = fmt.Sprintf("Reached by %d or more: %.2f %% -> %.2f %%", ch.K, 100*ch.ShareBefore, 100*ch.ShareAfter)
			if !math.IsInf(ch.CoverPowerAfter, 0) {
				mk.sub += "; all of it at " + after.reachNeededShort(ch.CoverPowerAfter)
			}
			if ch.Exhausted {
				mk.sub += "; THESE CANDIDATES CANNOT REACH EVERY SPOT"
			}
			return mk
		}
		mk.title = fmt.Sprintf("%d of %d candidate spots picked for %d devices in reach at %s", len(ch.Picks), len(p.Candidates), ch.K, metresShort(ch.Range))
		mk.sub = fmt.Sprintf("%d-cover range %s -> %s; reached by %d or more: %.2f %% -> %.2f %%", ch.K,
			reachRangeShort(ch.CoverRangeBefore), reachRangeShort(ch.CoverRangeAfter), ch.K, 100*ch.ShareBefore, 100*ch.ShareAfter)
		if ch.Exhausted {
			mk.sub += "; THESE CANDIDATES CANNOT REACH EVERY SPOT"
		}
		return mk
	}
	sg := p.Suggestion
	mk.added = sg.Added
	mk.label = "Added device (+1, +2, … in placement order)"
	if sg.OwnRanges {
		mk.title = fmt.Sprintf("%s (%s) for %d devices in reach at their own ranges", Plural(len(sg.Added), "added device"), after.reachNewShort(p), sg.K)
		mk.sub = fmt.Sprintf("Reached by %d or more: %.2f %% -> %.2f %%", sg.K, 100*sg.ShareBefore, 100*sg.ShareAfter)
		if !math.IsInf(sg.CoverPowerAfter, 0) {
			mk.sub += "; all of it at " + after.reachNeededShort(sg.CoverPowerAfter)
		}
		return mk
	}
	mk.title = fmt.Sprintf("%s for %d devices in reach at %s", Plural(len(sg.Added), "added device"), sg.K, metresShort(sg.Range))
	mk.sub = fmt.Sprintf("%d-cover range %s -> %s; reached by %d or more: %.2f %% -> %.2f %%", sg.K,
		reachRangeShort(sg.CoverRangeBefore), reachRangeShort(sg.CoverRangeAfter), sg.K, 100*sg.ShareBefore, 100*sg.ShareAfter)
	return mk
}

// reachRangeShort formats a k-cover range for a map ("none" when
// infinite).
func reachRangeShort(v float64) string {
	if math.IsInf(v, 0) {
		return "none"
	}
	return metresShort(v)
}

// ReachPlanSummary builds summary.json of suggest --reach.
func ReachPlanSummary(p *ReachPlan, m Meta) *ReachPlanDoc {
	return newScene(p.After, nil, p.reachAfterMeta(m)).reachPlanDoc(p)
}

// finiteOrNil returns &v, nil for an infinite v (JSON null).
func finiteOrNil(v float64) *float64 {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return nil
	}
	return &v
}

func (s *scene) reachPlanDoc(p *ReachPlan) *ReachPlanDoc {
	if p.Choice != nil {
		return s.reachChoiceDoc(p)
	}
	sg := p.Suggestion
	d := &ReachPlanDoc{Command: "suggest --reach", K: sg.K, RangeM: sg.Range, Existing: sg.Existing, Added: []ReachAddedDoc{},
		KCoverRangeBeforeM: finiteOrNil(sg.CoverRangeBefore), KCoverRangeAfterM: finiteOrNil(sg.CoverRangeAfter),
		CoveredFractionBefore: sg.ShareBefore, CoveredFractionAfter: sg.ShareAfter, Reached: sg.Reached,
		CapReached: p.CapReached, Pruned: sg.Pruned, Method: reachMethod, Reach: s.reachDoc(p.AfterReach)}
	for j, st := range sg.Steps {
		a := ReachAddedDoc{N: j + 1, Position: s.point(st.Added), KCoverRangeM: finiteOrNil(st.CoverRange),
			CoveredFraction: st.Share, CoveredAreaM2: st.CoveredArea}
		if sg.OwnRanges {
			a.KCoverPowerM2, a.KCoverRanges = finiteOrNil(st.CoverPower), s.reachNeededFinite(st.CoverPower)
		}
		d.Added = append(d.Added, a)
	}
	if sg.OwnRanges {
		d.OwnRanges, d.NewType, d.Method = true, p.NewType, reachMethodOwn
		d.KCoverPowerBeforeM2, d.KCoverPowerAfterM2 = finiteOrNil(sg.CoverPowerBefore), finiteOrNil(sg.CoverPowerAfter)
		d.KCoverRangesBefore, d.KCoverRangesAfter = s.reachBefore(p).reachNeededFinite(sg.CoverPowerBefore), s.reachNeededFinite(sg.CoverPowerAfter)
	}
	return d
}

// reachBefore is the scene of the existing layout for s, the scene of the
// layout with the additions (its metadata cut to the existing devices).
func (s *scene) reachBefore(p *ReachPlan) *scene {
	n := len(p.Layout.Sites)
	m := s.m
	m.SiteNames = m.SiteNames[:min(n, len(m.SiteNames))]
	m.Ranges = m.Ranges[:min(n, len(m.Ranges))]
	if m.Types != nil {
		m.Types = m.Types[:min(n, len(m.Types))]
	}
	return &scene{l: p.Layout, m: m}
}

// reachNeededFinite is reachNeeded for a K-cover power that may be +Inf
// (fewer than K distinct devices): nil then.
func (s *scene) reachNeededFinite(t float64) []RangeGroup {
	if math.IsInf(t, 0) || math.IsNaN(t) {
		return nil
	}
	return s.reachNeeded(t)
}

// reachNeededOrNone is reachNeededText for a K-cover power that may be
// +Inf: "none (fewer than K distinct devices)" then.
func (s *scene) reachNeededOrNone(t float64, K int) string {
	if math.IsInf(t, 0) || math.IsNaN(t) {
		return fmt.Sprintf("none (fewer than %d distinct devices)", K)
	}
	return s.reachNeededText(t)
}

// ReachPlanNeeded returns, for suggest --reach with own ranges, the
// ranges per group of devices at which every spot is reached by K devices
// before and after the additions, as text (ReachNeededText; "none" while
// fewer than K distinct devices stand); "" for one common range.
func ReachPlanNeeded(p *ReachPlan, m Meta) (before, after string) {
	if !p.own() {
		return "", ""
	}
	s := newScene(p.After, nil, p.reachAfterMeta(m))
	pb, pa, K := p.coverPowers()
	return s.reachBefore(p).reachNeededOrNone(pb, K), s.reachNeededOrNone(pa, K)
}

// reachChoiceDoc is summary.json of suggest --reach --candidates.
func (s *scene) reachChoiceDoc(p *ReachPlan) *ReachPlanDoc {
	ch := p.Choice
	d := &ReachPlanDoc{Command: "suggest --reach --candidates", K: ch.K, RangeM: ch.Range, Existing: ch.Existing, Added: []ReachAddedDoc{},
		KCoverRangeBeforeM: finiteOrNil(ch.CoverRangeBefore), KCoverRangeAfterM: finiteOrNil(ch.CoverRangeAfter),
		CoveredFractionBefore: ch.ShareBefore, CoveredFractionAfter: ch.ShareAfter, Reached: ch.Reached,
		Pruned: ch.Pruned, Method: reachChoiceMethod, Reach: s.reachDoc(p.AfterReach),
		Candidates: &ReachCandidatesDoc{File: s.m.CandidatesFile, Count: len(p.Candidates), Requested: ch.Requested,
			Picked: []ReachPickDoc{}, Exhausted: ch.Exhausted, LowerBound: ch.LowerBound, Optimal: ch.Optimal,
			ShortAreaM2: math.Max(0, p.AfterReach.AreaM2-ch.CoveredAfter), Evaluations: ch.Evaluations}}
	for j, pk := range ch.Picks {
		pd := ReachPickDoc{Order: j + 1, Candidate: pk.Candidate,
			Name: p.CandidateNames[pk.Candidate], Point: s.point(pk.Position), DepthGainM2: pk.Gain,
			KCoverRangeM: finiteOrNil(pk.CoverRange), CoveredFraction: pk.Share, CoveredAreaM2: pk.CoveredArea}
		if ch.OwnRanges {
			pd.RangeM, pd.KCoverPowerM2, pd.KCoverRanges = pk.Range, finiteOrNil(pk.CoverPower), s.reachNeededFinite(pk.CoverPower)
		}
		d.Candidates.Picked = append(d.Candidates.Picked, pd)
	}
	if ch.OwnRanges {
		d.OwnRanges, d.NewType, d.Method = true, p.NewType, reachChoiceMethodOwn
		d.KCoverPowerBeforeM2, d.KCoverPowerAfterM2 = finiteOrNil(ch.CoverPowerBefore), finiteOrNil(ch.CoverPowerAfter)
		d.KCoverRangesBefore, d.KCoverRangesAfter = s.reachBefore(p).reachNeededFinite(ch.CoverPowerBefore), s.reachNeededFinite(ch.CoverPowerAfter)
	}
	return d
}

// reachPlanText is report.txt of suggest --reach.
func (s *scene) reachPlanText(p *ReachPlan) []byte {
	if p.Choice != nil {
		return s.reachChoiceText(p)
	}
	// With own ranges the K-cover figures are the ranges each group of
	// devices needs (all ranges grow together), as analyze --reach words
	// them.
	sg, own := p.Suggestion, p.own()
	var b strings.Builder
	if s.m.Title != "" {
		fmt.Fprintf(&b, "%s\n", s.m.Title)
	}
	if own {
		fmt.Fprintf(&b, "SUGGEST: EVERY SPOT REACHED BY %d DEVICES, each device at its own planned range;\n  new devices: %s\n", sg.K, s.reachNewDevices(p))
	} else {
		fmt.Fprintf(&b, "SUGGEST: EVERY SPOT REACHED BY %d DEVICES at the planned range %s m\n", sg.K, fmtReach(sg.Range, 2))
	}
	fmt.Fprintf(&b, "  existing devices        %d\n  added devices           %d", sg.Existing, len(sg.Added))
	if sg.Pruned > 0 {
		fmt.Fprintf(&b, " (%d more placed, then dropped as redundant)", sg.Pruned)
	}
	b.WriteString("\n")
	if !own {
		fmt.Fprintf(&b, "  %d-cover range           %s m before, %s m after\n", sg.K, reachRangeText(sg.CoverRangeBefore), reachRangeText(sg.CoverRangeAfter))
	}
	fmt.Fprintf(&b, "  reached by %d+ devices   %s %% before, %s %% after\n", sg.K, fmtReach(100*sg.ShareBefore, 3), fmtReach(100*sg.ShareAfter, 3))
	at := ""
	if own {
		fmt.Fprintf(&b, "  Ranges at which every spot is reached by %d devices (all ranges grow together):\n", sg.K)
		fmt.Fprintf(&b, "    before  %s\n    after   %s\n", s.reachBefore(p).reachNeededOrNone(sg.CoverPowerBefore, sg.K), s.reachNeededOrNone(sg.CoverPowerAfter, sg.K))
		at = " at their planned ranges"
	}
	switch {
	case p.CapReached:
		b.WriteString("  The cap on additions was reached first: some spots are still reached by fewer devices.\n")
	case sg.Reached:
		fmt.Fprintf(&b, "  Every spot of the site is reached by at least %d devices%s.\n", sg.K, at)
	}
	if len(sg.Steps) > 0 && own {
		fmt.Fprintf(&b, "\n  %4s  %-28s  %12s  %s\n", "n", "position", "reached %", "ranges for every spot (all grow together)")
		for j, st := range sg.Steps {
			fmt.Fprintf(&b, "  %4d  %-28s  %12s  %s\n", j+1, s.pointText(st.Added), fmtReach(100*st.Share, 3), s.reachNeededOrNone(st.CoverPower, sg.K))
		}
	} else if len(sg.Steps) > 0 {
		fmt.Fprintf(&b, "\n  %4s  %-28s  %14s  %12s\n", "n", "position", "k-cover m", "reached %")
		for j, st := range sg.Steps {
			fmt.Fprintf(&b, "  %4d  %-28s  %14s  %12s\n", j+1, s.pointText(st.Added), reachRangeText(st.CoverRange), fmtReach(100*st.Share, 3))
		}
	}
	if own {
		b.WriteString("\n  Method: farthest-point insertion on the k-th smallest power |x − p|² − r² (Gonzalez 1985), each\n" +
			"  new device at the spot needing the most growth or 0.9 of the new devices' range from it (the\n" +
			"  larger area reached by k), then redundant additions dropped; every figure exact (order-k power\n" +
			"  diagram, Aurenhammer 1987, Lee 1982). Suggestions are planning aids for the disk model: a surveyor\n" +
			"  must confirm that a device can be mounted at each spot and reaches its range.\n")
	} else {
		fmt.Fprintf(&b, "\n  Method: %s; every figure exact\n  (order-k Voronoi pieces, Lee 1982). Suggestions are planning aids for the disk model:\n"+
			"  a surveyor must confirm that a device can be mounted at each spot and reaches its range.\n", reachMethod)
	}
	b.Write(s.reachText(p.AfterReach))
	return []byte(b.String())
}

// reachNewShort names the new devices of an own-range plan on a map:
// "TYPE X m" or "X m".
func (s *scene) reachNewShort(p *ReachPlan) string {
	if p.NewType != "" {
		return p.NewType + " " + metresShort(p.Suggestion.Range)
	}
	return metresShort(p.Suggestion.Range)
}

// reachNewDevices names the new devices of an own-range plan: "TYPE at X
// m" or "X m".
func (s *scene) reachNewDevices(p *ReachPlan) string {
	r := fmtReach(p.Suggestion.Range, 2) + " m"
	if p.NewType != "" {
		return p.NewType + " at " + r
	}
	return r
}

// reachRangeText formats a k-cover range ("none" when infinite: fewer
// than k distinct devices).
func reachRangeText(v float64) string {
	if math.IsInf(v, 0) {
		return "none"
	}
	return fmtReach(v, 2)
}

// reachAddedLayer is one point per added device with the figures after it.
// With own ranges (after, the scene of the layout with the additions, for
// the ranges per group) the K-cover range gives way to k_cover_power_m2
// and k_cover_ranges (the ranges each group of devices needs, as text),
// and range_m is the new devices' range.
func (s *scene) reachAddedLayer(sg *coverage.ReachSuggestion, after *scene) *layerDef {
	f := []any{"n", gpkg.Integer, "k", gpkg.Integer}
	if sg.OwnRanges {
		f = append(f, "k_cover_power_m2", gpkg.Real, "k_cover_ranges", gpkg.Text)
	} else {
		f = append(f, "k_cover_range_m", gpkg.Real)
	}
	f = append(f, "covered_fraction", gpkg.Real, "covered_area_m2", gpkg.Real, "range_m", gpkg.Real)
	return &layerDef{geom: gpkg.Point,
		fields: fieldList(f...),
		each: func(emit emitFunc) error {
			for j, st := range sg.Steps {
				v := []any{j + 1, sg.K}
				if sg.OwnRanges {
					v = append(v, nullInf(st.CoverPower), after.reachNeededOrNone(st.CoverPower, sg.K))
				} else {
					v = append(v, nullInf(st.CoverRange))
				}
				v = append(v, st.Share, st.CoveredArea, sg.Range)
				if err := emit(orb.Point(s.point(st.Added)), values(v...)...); err != nil {
					return err
				}
			}
			return nil
		}}
}

// nullInf is v with +Inf (fewer than K devices stand) as NaN, written as
// null.
func nullInf(v float64) float64 {
	if math.IsInf(v, 0) {
		return math.NaN()
	}
	return v
}

// reachChoiceText is report.txt of suggest --reach --candidates.
func (s *scene) reachChoiceText(p *ReachPlan) []byte {
	ch := p.Choice
	var b strings.Builder
	if s.m.Title != "" {
		fmt.Fprintf(&b, "%s\n", s.m.Title)
	}
	what := "THE FEWEST CANDIDATE SPOTS"
	if ch.Requested > 0 {
		what = fmt.Sprintf("%d CANDIDATE SPOTS", ch.Requested)
	}
	if ch.OwnRanges {
		fmt.Fprintf(&b, "SUGGEST: %s FOR EVERY SPOT REACHED BY %d DEVICES, each device at its own planned range\n", what, ch.K)
	} else {
		fmt.Fprintf(&b, "SUGGEST: %s FOR EVERY SPOT REACHED BY %d DEVICES at the planned range %s m\n", what, ch.K, fmtReach(ch.Range, 2))
	}
	fmt.Fprintf(&b, "  existing devices        %d\n  candidate spots         %d\n  picked                  %d", ch.Existing, len(p.Candidates), len(ch.Picks))
	if ch.Pruned > 0 {
		fmt.Fprintf(&b, " (%d more picked, then dropped as redundant)", ch.Pruned)
	}
	b.WriteString("\n")
	at := ""
	if ch.OwnRanges {
		at = " at their planned ranges"
	} else {
		fmt.Fprintf(&b, "  %d-cover range           %s m before, %s m after\n", ch.K, reachRangeText(ch.CoverRangeBefore), reachRangeText(ch.CoverRangeAfter))
	}
	fmt.Fprintf(&b, "  reached by %d+ devices   %s %% before, %s %% after\n", ch.K, fmtReach(100*ch.ShareBefore, 3), fmtReach(100*ch.ShareAfter, 3))
	if ch.OwnRanges {
		fmt.Fprintf(&b, "  Ranges at which every spot is reached by %d devices (all ranges grow together):\n", ch.K)
		fmt.Fprintf(&b, "    before  %s\n    after   %s\n", s.reachBefore(p).reachNeededOrNone(ch.CoverPowerBefore, ch.K), s.reachNeededOrNone(ch.CoverPowerAfter, ch.K))
	}
	short := math.Max(0, p.AfterReach.AreaM2-ch.CoveredAfter)
	switch {
	case ch.Reached && ch.Optimal:
		fmt.Fprintf(&b, "  Every spot of the site is reached by at least %d devices%s, with the fewest\n  candidate spots possible (the lower bound below is met).\n", ch.K, at)
	case ch.Reached:
		fmt.Fprintf(&b, "  Every spot of the site is reached by at least %d devices%s.\n", ch.K, at)
		if ch.Requested == 0 {
			fmt.Fprintf(&b, "  No choice of fewer than %d of these spots can do it (a lower bound from the\n  greedy's own gains); the choice is greedy and may use more than the fewest.\n", ch.LowerBound)
		}
	case ch.Exhausted:
		fmt.Fprintf(&b, "  THESE CANDIDATES CANNOT REACH EVERY SPOT %d TIMES: no remaining spot adds reach;\n"+
			"  %s m² stay reached by fewer than %d devices, in %s (listed under k = %d below).\n", ch.K, fmtReach(short, 1), ch.K, Plural(len(ch.Remaining), "part"), ch.K)
	default:
		fmt.Fprintf(&b, "  %s m² stay reached by fewer than %d devices, in %s; more picks may reach them.\n", fmtReach(short, 1), ch.K, Plural(len(ch.Remaining), "part"))
	}
	if len(ch.Picks) > 0 && ch.OwnRanges {
		fmt.Fprintf(&b, "\n  %4s  %-28s  %14s  %10s  %12s  %-16s  %s\n", "pick", "position", "depth gain m²", "range m", "reached %", "candidate", "ranges for every spot (all grow together)")
		for j, pk := range ch.Picks {
			fmt.Fprintf(&b, "  %4d  %-28s  %14s  %10s  %12s  %-16s  %s\n", j+1, s.pointText(pk.Position), fmtReach(pk.Gain, 1), fmtReach(pk.Range, 2),
				fmtReach(100*pk.Share, 3), ItemLabel(p.CandidateNames[pk.Candidate], "candidate", pk.Candidate), s.reachNeededOrNone(pk.CoverPower, ch.K))
		}
		b.WriteString("  Depth gain: what the pick added to the area reached by 1, 2, … K devices, summed.\n")
	} else if len(ch.Picks) > 0 {
		fmt.Fprintf(&b, "\n  %4s  %-28s  %14s  %14s  %12s  %s\n", "pick", "position", "depth gain m²", "k-cover m", "reached %", "candidate")
		for j, pk := range ch.Picks {
			fmt.Fprintf(&b, "  %4d  %-28s  %14s  %14s  %12s  %s\n", j+1, s.pointText(pk.Position), fmtReach(pk.Gain, 1),
				reachRangeText(pk.CoverRange), fmtReach(100*pk.Share, 3), ItemLabel(p.CandidateNames[pk.Candidate], "candidate", pk.Candidate))
		}
		b.WriteString("  Depth gain: what the pick added to the area reached by 1, 2, … K devices, summed.\n")
	}
	b.WriteString("\n  Method: greedy submodular set cover on the depth, the sum over k = 1 … K of the area\n" +
		"  reached by k devices (Wolsey 1982, after Johnson 1974 and Chvátal 1979), lazy re-evaluation,\n" +
		"  then redundant picks dropped; every figure exact (order-k " + reachChoicePieces(ch.OwnRanges) + ").\n" +
		"  Choices are planning aids for the disk model: a surveyor must confirm that a device can be\n" +
		"  mounted at each spot and reaches its range.\n")
	b.Write(s.reachText(p.AfterReach))
	return []byte(b.String())
}

// reachChoicePieces names the pieces the figures come from.
func reachChoicePieces(own bool) string {
	if own {
		return "power diagram pieces, Aurenhammer 1987, Lee 1982"
	}
	return "Voronoi pieces, Lee 1982"
}

// reachCandidatesLayer is every candidate spot with its pick order (−1
// and null figures for a spot not picked) and the figures after its pick.
// With own ranges (after, the scene of the layout with the picks, for the
// ranges per group) the K-cover range gives way to k_cover_power_m2 and
// k_cover_ranges (as text), and range_m is each spot's own range.
func (s *scene) reachCandidatesLayer(p *ReachPlan, after *scene) *layerDef {
	ch := p.Choice
	f := []any{"candidate", gpkg.Integer, "name", gpkg.Text, "picked", gpkg.Boolean, "pick_order", gpkg.Integer,
		"depth_gain_m2", gpkg.Real, "k", gpkg.Integer}
	if ch.OwnRanges {
		f = append(f, "k_cover_power_m2", gpkg.Real, "k_cover_ranges", gpkg.Text)
	} else {
		f = append(f, "k_cover_range_m", gpkg.Real)
	}
	f = append(f, "covered_fraction", gpkg.Real, "range_m", gpkg.Real)
	return &layerDef{geom: gpkg.Point,
		fields: fieldList(f...),
		each: func(emit emitFunc) error {
			at := make([]int, len(p.Candidates))
			for i := range at {
				at[i] = -1
			}
			for j, pk := range ch.Picks {
				at[pk.Candidate] = j
			}
			for i, c := range p.Candidates {
				order, gain, rng, share := -1, math.NaN(), math.NaN(), math.NaN()
				var needed any
				if j := at[i]; j >= 0 {
					pk := ch.Picks[j]
					order, gain, rng, share = j+1, pk.Gain, nullInf(pk.CoverRange), pk.Share
					if ch.OwnRanges {
						rng, needed = nullInf(pk.CoverPower), after.reachNeededOrNone(pk.CoverPower, ch.K)
					}
				}
				v := []any{i, p.CandidateNames[i], order > 0, order, gain, ch.K, rng}
				if ch.OwnRanges {
					v = append(v, needed)
				}
				v = append(v, share, ch.Range)
				if ch.OwnRanges {
					v[len(v)-1] = p.CandidateRanges[i]
				}
				if err := emit(orb.Point(s.point(c)), values(v...)...); err != nil {
					return err
				}
			}
			return nil
		}}
}
