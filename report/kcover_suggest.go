// suggest --reach K: the devices added so that every spot of the site is
// reached by at least K devices (coverage.ReachAdditions), written as
// report.txt, summary.json, the existing devices, the added devices with
// the exact figures after each addition, and the k-coverage of the layout
// with the additions (the bands by number of devices in reach and the
// k-gaps, as analyze --reach writes them).

package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/gpkg"
)

// FileReachAdded is the layer of the devices suggest --reach adds.
const FileReachAdded = "reach-added-devices.geojson"

// ReachPlan is the result of suggest --reach to write.
type ReachPlan struct {
	// Layout is the existing layout.
	Layout *coverage.Layout
	// Suggestion is the result of coverage.ReachAdditions.
	Suggestion *coverage.ReachSuggestion
	// CapReached tells that the cap on additions stopped the placement.
	CapReached bool
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
	// Reach is the k-coverage of the layout with the additions.
	Reach *ReachDoc `json:"reach_after"`
}

// ReachAddedDoc is one added device in summary.json.
type ReachAddedDoc struct {
	N               int      `json:"n"`
	Position        Point    `json:"position"`
	KCoverRangeM    *float64 `json:"k_cover_range_m"`
	CoveredFraction float64  `json:"covered_fraction"`
	CoveredAreaM2   float64  `json:"covered_area_m2"`
}

// reachMethod names the placement method in the outputs.
const reachMethod = "farthest-point insertion on the k-th nearest distance (Gonzalez 1985), each device at the spot needing the most range or 0.9 range from it (the larger area reached by k), then redundant additions dropped"

// ReachPlanFiles lists the files WriteReachPlan writes (no map or
// GeoPackage yet).
func ReachPlanFiles(m Meta) []string {
	f := []string{FileReport, FileSummary, LayerFile(FileSites, m.Planar), LayerFile(FileReachAdded, m.Planar),
		LayerFile(FileReach, m.Planar), LayerFile(FileReachGaps, m.Planar)}
	f = append(f, gridLayerFiles(m, FileSites, FileReachAdded, FileReach, FileReachGaps)...)
	return append(f, FileManifest)
}

// WriteReachPlan writes the outputs of suggest --reach into dir (staged
// and swapped in whole, as every output set).
func WriteReachPlan(dir string, p *ReachPlan, m Meta, opt Options) ([]string, error) {
	if p == nil || p.Layout == nil || p.Suggestion == nil || p.After == nil || p.AfterReach == nil {
		return nil, errors.New("report: WriteReachPlan: incomplete plan")
	}
	files := ReachPlanFiles(m)
	w, err := newWriter(dir, files, m, opt.Progress)
	if err != nil {
		return nil, err
	}
	s := newScene(p.Layout, nil, m)
	after := newScene(p.After, nil, m)
	steps := []step{
		{name: FileReport, write: func(out io.Writer) error { _, err := out.Write(after.reachPlanText(p)); return err }},
		{name: FileSummary, write: func(out io.Writer) error { return writeDoc(out, after.reachPlanDoc(p)) }},
		s.layerStep(FileSites, s.sitesLayer()),
		s.layerStep(FileReachAdded, s.reachAddedLayer(p.Suggestion)),
		after.layerStep(FileReach, after.reachLayer(p.AfterReach)),
		after.layerStep(FileReachGaps, after.reachGapsLayer(p.AfterReach)),
	}
	steps = append(steps, s.gridCopies(func(g *scene) []step {
		return []step{g.layerStep(FileSites, g.sitesLayer()), g.layerStep(FileReachAdded, g.reachAddedLayer(p.Suggestion))}
	})...)
	steps = append(steps, after.gridCopies(func(g *scene) []step { return g.reachLayerSteps(p.AfterReach) })...)
	err = w.writeAll(s, steps)
	return w.done, err
}

// ReachPlanSummary builds summary.json of suggest --reach.
func ReachPlanSummary(p *ReachPlan, m Meta) *ReachPlanDoc {
	return newScene(p.After, nil, m).reachPlanDoc(p)
}

// finiteOrNil returns &v, nil for an infinite v (JSON null).
func finiteOrNil(v float64) *float64 {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return nil
	}
	return &v
}

func (s *scene) reachPlanDoc(p *ReachPlan) *ReachPlanDoc {
	sg := p.Suggestion
	d := &ReachPlanDoc{Command: "suggest --reach", K: sg.K, RangeM: sg.Range, Existing: sg.Existing, Added: []ReachAddedDoc{},
		KCoverRangeBeforeM: finiteOrNil(sg.CoverRangeBefore), KCoverRangeAfterM: finiteOrNil(sg.CoverRangeAfter),
		CoveredFractionBefore: sg.ShareBefore, CoveredFractionAfter: sg.ShareAfter, Reached: sg.Reached,
		CapReached: p.CapReached, Pruned: sg.Pruned, Method: reachMethod, Reach: s.reachDoc(p.AfterReach)}
	for j, st := range sg.Steps {
		d.Added = append(d.Added, ReachAddedDoc{N: j + 1, Position: s.point(st.Added), KCoverRangeM: finiteOrNil(st.CoverRange),
			CoveredFraction: st.Share, CoveredAreaM2: st.CoveredArea})
	}
	return d
}

// reachPlanText is report.txt of suggest --reach.
func (s *scene) reachPlanText(p *ReachPlan) []byte {
	sg := p.Suggestion
	var b strings.Builder
	if s.m.Title != "" {
		fmt.Fprintf(&b, "%s\n", s.m.Title)
	}
	fmt.Fprintf(&b, "SUGGEST: EVERY SPOT REACHED BY %d DEVICES at the planned range %s m\n", sg.K, fmtReach(sg.Range, 2))
	fmt.Fprintf(&b, "  existing devices        %d\n  added devices           %d", sg.Existing, len(sg.Added))
	if sg.Pruned > 0 {
		fmt.Fprintf(&b, " (%d more placed, then dropped as redundant)", sg.Pruned)
	}
	fmt.Fprintf(&b, "\n  %d-cover range           %s m before, %s m after\n", sg.K, reachRangeText(sg.CoverRangeBefore), reachRangeText(sg.CoverRangeAfter))
	fmt.Fprintf(&b, "  reached by %d+ devices   %s %% before, %s %% after\n", sg.K, fmtReach(100*sg.ShareBefore, 3), fmtReach(100*sg.ShareAfter, 3))
	switch {
	case p.CapReached:
		b.WriteString("  The cap on additions was reached first: some spots are still reached by fewer devices.\n")
	case sg.Reached:
		fmt.Fprintf(&b, "  Every spot of the site is reached by at least %d devices.\n", sg.K)
	}
	if len(sg.Steps) > 0 {
		fmt.Fprintf(&b, "\n  %4s  %-28s  %14s  %12s\n", "n", "position", "k-cover m", "reached %")
		for j, st := range sg.Steps {
			fmt.Fprintf(&b, "  %4d  %-28s  %14s  %12s\n", j+1, s.pointText(st.Added), reachRangeText(st.CoverRange), fmtReach(100*st.Share, 3))
		}
	}
	fmt.Fprintf(&b, "\n  Method: %s; every figure exact\n  (order-k Voronoi pieces, Lee 1982). Suggestions are planning aids for the disk model:\n"+
		"  a surveyor must confirm that a device can be mounted at each spot and reaches its range.\n", reachMethod)
	b.Write(s.reachText(p.AfterReach))
	return []byte(b.String())
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
func (s *scene) reachAddedLayer(sg *coverage.ReachSuggestion) *layerDef {
	return &layerDef{geom: gpkg.Point,
		fields: fieldList("n", gpkg.Integer, "k", gpkg.Integer, "k_cover_range_m", gpkg.Real, "covered_fraction", gpkg.Real,
			"covered_area_m2", gpkg.Real, "range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			for j, st := range sg.Steps {
				rng := st.CoverRange // null while fewer than K devices stand
				if math.IsInf(rng, 0) {
					rng = math.NaN()
				}
				if err := emit(orb.Point(s.point(st.Added)), j+1, sg.K, rng, st.Share, st.CoveredArea, sg.Range); err != nil {
					return err
				}
			}
			return nil
		}}
}
