// The planning commands: suggest (where to add devices: K placed freely,
// the fewest for a range, or a choice among candidate spots), failures
// (what each device's outage uncovers, and the range that survives any
// single failure) and assign (which device serves each demand point or
// building). Each loads the scene like analyze, builds the layout, runs
// the move from package coverage, writes its report folder (report.txt,
// summary.json, GeoJSON layers, CSV tables, one PNG map; see
// report.PlanFiles) and prints the headline figures, or summary.json with
// --json. Every figure printed is copied from the summary document, so
// stdout and the files agree.

package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

// planFlags are the flags of the planning commands beyond runFlags.
type planFlags struct {
	add        int
	candidates string
	points     string
	newType    string
}

// maxAdd bounds --add: more additions than this is a mistake, not a plan.
const maxAdd = 1_000_000

// planOutDir is the default output folder of a planning command: a
// sub-folder of the analysis folder, so the two never mix.
func planOutDir(name string) string { return filepath.Join("sitecover-report", name) }

// addPlanOutputFlags registers the output flags of planning command name,
// with --out defaulting to planOutDir(name).
func (f *runFlags) addPlanOutputFlags(fs *pflag.FlagSet, name string) {
	f.addOutputFlags(fs, true)
	dir := planOutDir(name)
	f.out = dir
	fs.Lookup("out").DefValue = dir
}

const planCaution = `
Suggestions, rankings and assignments are planning aids for the disk model:
confirm every position and range on site. Cautions:
`

func newSuggestCmd(e *env) *cobra.Command {
	f := &runFlags{}
	pf := &planFlags{}
	cmd := &cobra.Command{
		Use:   "suggest --sites FILE [--area FILE] (--add K [--range LENGTH] | --range LENGTH | --candidates FILE --range LENGTH [--add K]) [flags]",
		Short: "Where to add devices: K placed freely, the fewest for a range, or the best candidate spots",
		Long: `suggest proposes new devices, the existing ones staying where they are:

  --add K                 K new devices placed freely in the area (never in an
                          exclusion zone) to make the full-cover range small:
                          farthest-point insertion (Gonzalez 1985), then each
                          moves to the centre of the smallest circle enclosing
                          its service area. Figures before and after each
                          addition: full-cover range, and covered share and
                          uncovered area at --range; without --range at the
                          full-cover range the new layout needs.
  --range R               the fewest additions that leave no gap at R, compared
                          with the hexagonal-covering estimate
                          area / ((3*sqrt(3)/2) R^2) (Kershner 1939).
  --candidates FILE       choose among the spots where a device can be mounted
                          (poles, roofs, walls; GeoJSON points or CSV like
                          --sites): K of them (--add K) maximising the area
                          covered at --range, or the fewest that cover
                          everything; says when full cover cannot be reached
                          and what stays uncovered. A spot may carry its own
                          range (a range column or property, or a type with
                          --type-range/--range-table); one without takes
                          --range (or --new-type).

Devices with their own ranges (a range column, or a type column with
--type-range or --range-table): the added devices get the range of --range, or
of --new-type TYPE in the type table; every figure comes from the power cells
(where |x - p|^2 - r^2 is smallest). --add K puts each new device at the point
that needs the largest growth of every r^2 to be covered, the fewest additions
repeat that until no gap is left, and candidate spots are chosen by the exact
area each adds. The full-cover figure is then the range a new device would need
with every r^2 grown alike until no gap is left. --new-type also adds devices
of another type to a site whose devices share one range.
` + suggestReachHelp + candidatesReachHelp + `
The report folder (default sitecover-report/suggest) gets report.txt,
summary.json, the proposed devices or the candidate spots, the gaps before and
after as GeoJSON, and a map.
` + planCaution + report.Cautions(),
		Example: `  sitecover suggest --sites sensors.geojson --area campus.geojson --add 3 --range 120m
  sitecover suggest --sites sensors.geojson --area campus.geojson --add 2
  sitecover suggest --sites sensors.csv --area campus.geojson --range 150m
  sitecover suggest --sites sensors.csv --area campus.geojson --candidates poles.geojson --range 120m
  sitecover suggest --sites sensors.csv --area campus.geojson --candidates roofs.csv --range 120m --add 4
  sitecover suggest --sites devices.csv --type-range gateway=150m --type-range sensor=40m --new-type gateway --add 2`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := requireFlags(cmd, "sites"); err != nil {
				return err
			}
			fl := cmd.Flags()
			if fl.Changed("reach") {
				return runSuggestReach(e, cmd, f)
			}
			ps := planSpec{newType: pf.newType}
			hasAdd, hasRange := fl.Changed("add"), fl.Changed("range")
			hasNew := hasRange || fl.Changed("new-type")
			if hasAdd && (pf.add <= 0 || pf.add > maxAdd) {
				return inputErrorf("--add %d: must be a whole number of devices from 1 to %d", pf.add, maxAdd)
			}
			switch {
			case fl.Changed("candidates"):
				if !hasNew {
					return usageErrorf("--candidates needs --range (or --new-type): spots are chosen for the area they cover at a range (see '%s --help')", cmd.CommandPath())
				}
				ps.move, ps.k = report.MoveCandidates, pf.add
			case hasAdd:
				ps.move, ps.k = report.MoveAdd, pf.add
			case hasNew:
				ps.move = report.MoveFewest
			default:
				return usageErrorf("suggest needs --add K (free placement), --range LENGTH (fewest additions for that range) or --candidates FILE with --range (see '%s --help')", cmd.CommandPath())
			}
			in, err := f.planInputs(cmd, &ps)
			if err != nil {
				return err
			}
			if ps.move == report.MoveCandidates {
				if in.Candidates, err = openSource(pf.candidates, "--candidates"); err != nil {
					return err
				}
			}
			return asInput(runPlan(e, "suggest", f, in, ps, printFull))
		},
	}
	f.addInputFlags(cmd.Flags())
	cmd.Flags().IntVar(&pf.add, "add", 0, "number of new devices to place (with --candidates: number of spots to pick; default: the fewest that cover everything)")
	cmd.Flags().Var(newOnceString(&pf.candidates, ""), "candidates", "candidate mounting spots: GeoJSON Point/MultiPoint features or CSV like --sites")
	cmd.Flags().Var(newOnceString(&pf.newType, ""), "new-type", "device type of the added devices: their range is that type's in --type-range or --range-table (instead of --range)")
	f.addRangeFlag(cmd.Flags(), "", "planned range of every device, e.g. 150m, 0.2km, 500ft, 0.1mi")
	f.addPlanOutputFlags(cmd.Flags(), "suggest")
	f.addOutCRSFlag(cmd.Flags())
	addSuggestReachFlag(cmd.Flags(), f)
	return cmd
}

func newFailuresCmd(e *env) *cobra.Command {
	f := &runFlags{}
	cmd := &cobra.Command{
		Use:   "failures --sites FILE [--area FILE] (--range LENGTH | a range or type column) [flags]",
		Short: "Device failures: what each outage uncovers, and the range that survives any single failure",
		Long: `failures takes every device out of service in turn, the others working, and
ranks the devices by the area their failure leaves uncovered at --range, with
the deepest new gap (the range the others need to cover what it served) and
the device that backs it up there. It also gives the range at which the area
stays fully covered whichever single device fails: the largest distance from
a point of the area to its second-nearest device.

Devices with their own ranges (a range column, or a type column with
--type-range or --range-table; --range is then the default of the rest): each
failure is taken at the devices' own ranges, with power cells (where
|x - p|^2 - r^2 is smallest) as service areas, and the range that survives any
single failure is given per device type, every device's r^2 growing by the
same amount. A hidden device (the others cover its whole disk) costs nothing
when it fails.

Each failure is computed locally (only the failed device's service area
changes hands, among its Delaunay neighbours), so a million devices take
seconds. The report folder (default sitecover-report/failures) gets
report.txt, summary.json, failures.geojson and failures.csv, and a map of the
devices coloured by loss.
` + planCaution + report.Cautions(),
		Example: `  sitecover failures --sites sensors.geojson --area campus.geojson --range 120m
  sitecover failures --sites sirens.csv --area town.geojson --range 0.5mi --json
  sitecover failures --planar --sites aps.csv --area floor.geojson --range 15 --out ap-failures`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			in, err := f.rangesInputs(cmd)
			if err != nil {
				return err
			}
			return asInput(runPlan(e, "failures", f, in, planSpec{move: report.MoveFailures, r: in.Range, rangeGiven: in.Range > 0}, printFull))
		},
	}
	f.addInputFlags(cmd.Flags())
	f.addRangeFlag(cmd.Flags(), "", "planned range of every device, e.g. 150m, 0.2km, 500ft, 0.1mi (required)")
	f.addPlanOutputFlags(cmd.Flags(), "failures")
	f.addOutCRSFlag(cmd.Flags())
	return cmd
}

func newAssignCmd(e *env) *cobra.Command {
	f := &runFlags{}
	pf := &planFlags{}
	cmd := &cobra.Command{
		Use:   "assign --sites FILE [--area FILE] --points FILE [--range LENGTH] [flags]",
		Short: "Which device serves each demand point or building, and the load per device",
		Long: `assign gives each demand item (buildings, assets, people) its serving device -
the nearest one, whose service area holds it - with the distance and, with
--range, whether it is within range; and the load of every device (items
served and their summed weight, within range or not).

Devices with their own ranges (a range column, or a type column with
--type-range or --range-table): an item is served by the device whose power
cell holds it (where |x - p|^2 - r^2 is smallest; the service area the maps
show), and is within reach when inside that device's own range - exactly when
some device covers it. Hidden devices (the others cover their whole disk)
serve nothing.

--points FILE: GeoJSON Point/MultiPoint features, or Polygon/MultiPolygon
features (buildings, yards: each placed at its centroid, or at a point on it
when the centroid falls outside), or CSV like --sites. An optional weight
(a "weight" property, or a weight column) gives each item its importance;
without one it counts 1.

The report folder (default sitecover-report/assign) gets report.txt,
summary.json, assignment.csv (point, name, device, device_name, distance_m,
within_range, weight, coordinates), device-load.csv, assignment.geojson (a
line from each item to its device), device-load.geojson and a map.
` + planCaution + report.Cautions(),
		Example: `  sitecover assign --sites sensors.geojson --area campus.geojson --points buildings.geojson --range 120m
  sitecover assign --sites gateways.csv --points meters.csv --range 2km --json
  sitecover assign --planar --sites aps.csv --area floor.geojson --points desks.csv`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := requireFlags(cmd, "sites", "points"); err != nil {
				return err
			}
			ps := planSpec{move: report.MoveAssign}
			in, err := f.planInputs(cmd, &ps)
			if err != nil {
				return err
			}
			if in.Points, err = openSource(pf.points, "--points"); err != nil {
				return err
			}
			return asInput(runPlan(e, "assign", f, in, ps, printFull))
		},
	}
	f.addInputFlags(cmd.Flags())
	cmd.Flags().Var(newOnceString(&pf.points, ""), "points", "demand points or polygons: GeoJSON (optional \"weight\" property) or CSV like --sites (optional weight column) (required)")
	f.addRangeFlag(cmd.Flags(), "", "range of every device, e.g. 150m, 0.2km, 500ft, 0.1mi (default: distances only)")
	f.addPlanOutputFlags(cmd.Flags(), "assign")
	f.addOutCRSFlag(cmd.Flags())
	return cmd
}

// planSpec is one planning move to run.
type planSpec struct {
	move report.Move
	// k is K for add and candidates (0: the fewest, candidates only).
	k int
	// r is the range (m); rangeGiven is false when none was given.
	r          float64
	rangeGiven bool
	// newType is the type of the added devices (suggest --new-type).
	newType string
}

// planInputs parses --range into ps when it was given, then opens the
// input files named by the flags.
func (f *runFlags) planInputs(cmd *cobra.Command, ps *planSpec) (siteinput.Inputs, error) {
	var err error
	if ps.r, ps.rangeGiven, err = f.optionalRange(cmd); err != nil {
		return siteinput.Inputs{}, err
	}
	in, err := f.inputs()
	in.Range = ps.r
	return in, err
}

// printMode says what a planning run prints on stdout.
type printMode int

const (
	printFull  printMode = iota // headline figures, or summary.json with --json
	printBrief                  // a few lines of figures and the files (the demo)
	printNone                   // nothing (the demo with --json)
)

// runPlan runs one planning move and writes its report folder.
func runPlan(e *env, command string, f *runFlags, in siteinput.Inputs, ps planSpec, mode printMode) error {
	sc, pr, err := startRun(e, command, f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	own := sc.ranges != nil // the devices have their own, different ranges
	adding := ps.move == report.MoveAdd || ps.move == report.MoveFewest || ps.move == report.MoveCandidates
	newR := 0.0 // the added devices' range, with own ranges
	if adding {
		if newR, err = newDeviceRange(sc, in, ps); err != nil {
			return err
		}
		if !own && ps.newType != "" && newR != sc.rangeM {
			// Added devices of another range than the existing ones.
			own = true
			sc.ranges = make([]float64, len(sc.sites))
			for i := range sc.ranges {
				sc.ranges[i] = sc.rangeM
			}
			sc.meta.Ranges = sc.ranges
		} else if !own && ps.newType != "" {
			ps.r, ps.rangeGiven = newR, true
		}
	}
	candR, err := candidateRanges(sc, ps, newR)
	if err != nil {
		return err
	}
	if candR != nil && !own {
		common := sc.rangeM
		if common == 0 {
			common = ps.r
		}
		if slices.ContainsFunc(candR, func(r float64) bool { return r != common }) {
			// Candidate spots of other ranges than the existing devices.
			own = true
			sc.ranges = repeatRange(common, len(sc.sites))
			sc.meta.Ranges = sc.ranges
		} else {
			candR = nil // every spot has the devices' one range
		}
	}
	if !own && !ps.rangeGiven && sc.rangeM > 0 {
		// One range for every device from the sites file (a range column
		// with one value, or a type table): the range of the figures.
		ps.r, ps.rangeGiven = sc.rangeM, true
	}
	timed := func(phase string, t0 time.Time) {
		sc.meta.Timings = append(sc.meta.Timings, coverage.Timing{Phase: phase, Seconds: time.Since(t0).Seconds()})
	}
	pr.set(fmt.Sprintf("service areas of %d sites", len(sc.sites)))
	t0 := time.Now()
	var l *coverage.Layout
	if own {
		l, err = coverage.NewLayoutRanges(sc.sites, sc.ranges, sc.region)
	} else {
		l, err = coverage.NewLayout(sc.sites, sc.region)
	}
	if err != nil {
		return inputErrorf("%s: %v", inputNames(in), err)
	}
	timed("layout", t0)
	t0 = time.Now()
	p := &report.Plan{Move: ps.move, Layout: l, Range: ps.r, RangeGiven: ps.rangeGiven, Requested: ps.k}
	if own {
		fc := l.FullCoverRanges()
		p.FullCoverRanges, p.Range, p.RangeGiven = &fc, 0, true
		p.NewRange, p.NewType = newR, ps.newType
	} else {
		p.FullCover = l.FullCover()
	}
	timed("full cover", t0)
	fail := func(err error) error {
		return inputErrorf("%s: %v", inputNames(in), strings.TrimPrefix(err.Error(), "coverage: "))
	}
	t0 = time.Now()
	switch {
	case own && adding:
		if err := runOwnAdditions(p, l, sc, ps, newR, candR, pr); err != nil {
			return fail(err)
		}
		timed("suggest", t0)
	case ps.move == report.MoveAdd:
		pr.set(fmt.Sprintf("placing %d new devices", ps.k))
		r := ps.r
		if !ps.rangeGiven {
			// The figures are given at the range the new layout needs
			// to cover everything: a first pass finds it (placement does
			// not depend on the range of the figures).
			s0, err := coverage.SuggestAdditions(l, ps.k, coverage.SuggestOptions{})
			if err != nil {
				return fail(err)
			}
			r = s0.FullCoverAfter
			p.Range, p.RangeNote = r, "the full-cover range with the new devices"
		}
		if p.Suggestion, err = coverage.SuggestAdditions(l, ps.k, coverage.SuggestOptions{Range: r}); err != nil {
			return fail(err)
		}
		timed("suggest", t0)
	case ps.move == report.MoveFewest:
		pr.set(fmt.Sprintf("fewest additions for %s m", fmtNum(ps.r, 2)))
		p.Suggestion, err = coverage.FewestAdditions(l, ps.r, coverage.SuggestOptions{})
		if errors.Is(err, coverage.ErrAdditionCap) && p.Suggestion != nil {
			p.CapReached = true
		} else if err != nil {
			return fail(err)
		}
		timed("suggest", t0)
	case ps.move == report.MoveCandidates:
		pr.set(fmt.Sprintf("choosing among %d candidate spots", len(sc.candidates.Pts)))
		p.Candidates, p.CandidateNames = sc.candidates.Pts, sc.candidates.Names
		if p.Choice, err = coverage.ChooseCandidates(l, p.Candidates, ps.r, ps.k); err != nil {
			return fail(err)
		}
		timed("choose candidates", t0)
	case ps.move == report.MoveFailures:
		pr.set(fmt.Sprintf("failures of %d devices", len(sc.sites)))
		if own {
			p.Failures, err = coverage.FailuresRanges(l)
		} else {
			p.Failures, err = coverage.Failures(l, ps.r)
		}
		if err != nil {
			return fail(err)
		}
		timed("failures", t0)
	case ps.move == report.MoveAssign:
		d := sc.demand
		pr.set(fmt.Sprintf("assigning %d demand items", len(d.Pts)))
		p.Demand, p.DemandNames, p.DemandPolygons, p.Weighted = d.Pts, d.Names, d.Polys, d.Weights != nil
		if own {
			p.Assignment, err = coverage.AssignPowerCells(l, d.Pts, d.Weights)
		} else {
			p.Assignment, err = coverage.Assign(l, d.Pts, d.Weights, ps.r)
		}
		if err != nil {
			return fail(err)
		}
		timed("assign", t0)
	}
	t0 = time.Now()
	switch {
	case own:
		p.Uncovered = l.UncoveredAreaGrown(0)
	case p.Range > 0:
		p.Uncovered = l.UncoveredArea(p.Range)
	}
	switch {
	case own && adding:
		pr.set("gaps before and after")
		p.GapsBefore = l.GapsRanges(0, 0)
		if p.Suggestion != nil {
			l2, err := coverage.NewLayoutRanges(append(append([]orb.Point(nil), sc.sites...), p.Suggestion.Added...),
				append(append([]float64(nil), sc.ranges...), repeatRange(newR, len(p.Suggestion.Added))...), sc.region)
			if err != nil {
				return fail(err)
			}
			p.GapsAfter = l2.GapsRanges(0, 0)
		}
		timed("gaps", t0)
	case adding:
		pr.set("gaps before and after")
		p.GapsBefore = l.Gaps(p.Range, 0)
		if p.Suggestion != nil {
			after := append(append([]orb.Point(nil), sc.sites...), p.Suggestion.Added...)
			l2, err := coverage.NewLayout(after, sc.region)
			if err != nil {
				return fail(err)
			}
			p.GapsAfter = l2.Gaps(p.Range, 0)
		}
		timed("gaps", t0)
	}
	written, err := writeReport(f, pr, false, func(opt report.Options) ([]string, error) {
		return report.WritePlan(f.out, p, sc.meta, opt)
	})
	if err != nil {
		return err
	}
	doc, err := report.PlanSummary(p, sc.meta)
	if err != nil {
		return err
	}
	if mode == printFull {
		if done, err := printHead(e, f, doc.Warnings); done {
			return err
		}
		if sc.meta.Title != "" {
			fmt.Fprintln(e.stdout, sc.meta.Title)
		}
	}
	if mode == printNone {
		return nil
	}
	printPlan(e.stdout, doc, sc.meta, mode)
	printWritten(e.stdout, f.out, written)
	return nil
}

// newDeviceRange returns the range of the devices suggest adds: the range
// of --new-type in the type table, else --range (0 when neither was
// given; with own ranges that is bad usage).
func newDeviceRange(sc *scene, in siteinput.Inputs, ps planSpec) (float64, error) {
	if ps.newType == "" {
		if sc.ranges != nil && !ps.rangeGiven {
			return 0, usageErrorf("the devices have their own ranges: give the added devices' range with --range LENGTH or --new-type TYPE")
		}
		return ps.r, nil
	}
	if in.TypeRanges == nil {
		return 0, usageErrorf("--new-type %q needs a table of ranges per type: --type-range TYPE=LENGTH or --range-table FILE", ps.newType)
	}
	r, ok := in.TypeRanges.Ranges[strings.ToLower(strings.TrimSpace(ps.newType))] // the table's key: trimmed, lower case
	if !ok {
		return 0, inputErrorf("--new-type %q: %s gives no range for this type", ps.newType, in.TypeRanges.Source)
	}
	if sc.ranges == nil && sc.rangeM == 0 {
		return 0, usageErrorf("--new-type %q: the existing devices have no range: give --range, a range column or a type column", ps.newType)
	}
	return r, nil
}

// repeatRange returns n copies of r.
func repeatRange(r float64, n int) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = r
	}
	return out
}

// runOwnAdditions runs suggest's move when the devices have their own
// ranges, the added ones range r (candidate spots: candR[i] each, when
// some carry their own; nil otherwise).
func runOwnAdditions(p *report.Plan, l *coverage.Layout, sc *scene, ps planSpec, r float64, candR []float64, pr *progress) error {
	var err error
	switch ps.move {
	case report.MoveAdd:
		pr.set(fmt.Sprintf("placing %d new devices of %s m", ps.k, fmtNum(r, 2)))
		p.Suggestion, err = coverage.SuggestAdditionsRanges(l, ps.k, r)
	case report.MoveFewest:
		pr.set(fmt.Sprintf("fewest additions of %s m devices", fmtNum(r, 2)))
		p.Suggestion, err = coverage.FewestAdditionsRanges(l, r, coverage.SuggestOptions{})
		if errors.Is(err, coverage.ErrAdditionCap) && p.Suggestion != nil {
			p.CapReached, err = true, nil
		}
	case report.MoveCandidates:
		pr.set(fmt.Sprintf("choosing among %d candidate spots", len(sc.candidates.Pts)))
		p.Candidates, p.CandidateNames = sc.candidates.Pts, sc.candidates.Names
		if candR != nil {
			p.CandidateRanges = candR
			p.Choice, err = coverage.ChooseCandidatesEach(l, p.Candidates, candR, ps.k)
		} else {
			p.Choice, err = coverage.ChooseCandidatesRanges(l, p.Candidates, r, ps.k)
		}
	}
	return err
}

// candidateRanges returns each candidate spot's range when some spot of
// suggest --candidates carries its own (a range or type column; nil
// otherwise): its own, else r, the added devices' range (--range or
// --new-type).
func candidateRanges(sc *scene, ps planSpec, r float64) ([]float64, error) {
	if ps.move != report.MoveCandidates {
		return nil, nil
	}
	return fillCandidateRanges(sc, r)
}

// fillCandidateRanges returns each candidate spot's range when some spot
// carries its own (nil otherwise): its own, else r (an error when r ≤ 0).
func fillCandidateRanges(sc *scene, r float64) ([]float64, error) {
	if sc.candidates == nil || sc.candidates.Ranges == nil {
		return nil, nil
	}
	out := make([]float64, len(sc.candidates.Ranges))
	for i, v := range sc.candidates.Ranges {
		if v == 0 {
			if r <= 0 {
				return nil, usageErrorf("--candidates: %s has no range of its own: give the default with --range LENGTH or --new-type TYPE", report.ItemLabel(sc.candidates.Names[i], "candidate", i))
			}
			v = r
		}
		out[i] = v
	}
	return out, nil
}

// printPlan prints the headline figures of a planning move.
func printPlan(w io.Writer, d *report.PlanDoc, m report.Meta, mode printMode) {
	line := func(key, format string, args ...any) {
		fmt.Fprintf(w, "  %-26s %s\n", key, fmt.Sprintf(format, args...))
	}
	switch d.Move {
	case report.MoveAdd, report.MoveFewest:
		printSuggestions(w, line, d, m, mode)
	case report.MoveCandidates:
		printCandidates(w, line, d, mode)
	case report.MoveFailures:
		printFailures(w, line, d, m, mode)
	case report.MoveAssign:
		printAssignment(line, d, m)
	}
}

// lineFunc prints one "key  value" line of a planning summary.
type lineFunc func(key, format string, args ...any)

// printSuggestions prints the figures of suggest --add and of the fewest
// additions.
func printSuggestions(w io.Writer, line lineFunc, d *report.PlanDoc, m report.Meta, mode printMode) {
	s := d.Suggestions
	if d.Move == report.MoveAdd {
		line("suggested devices", "%d new + %d existing", len(s.Added), s.Existing)
	} else {
		switch {
		case len(s.Added) == 0 && s.Reached:
			line("fewest additions", "none needed: no gap at %s m", fmtNum(s.RangeM, 2))
		case s.Reached && s.NewRangeM > 0:
			line("fewest additions", "%d (%s) for no gap at the planned ranges, %s in all", len(s.Added), s.Method, report.Plural(s.TotalDevices, "device"))
		case s.Reached:
			line("fewest additions", "%d (%s) for no gap at %s m, %s in all", len(s.Added), s.Method, fmtNum(s.RangeM, 2), report.Plural(s.TotalDevices, "device"))
		default:
			line("additions", "%d placed, gaps remain (the search stopped at its cap)", len(s.Added))
		}
		line("hexagonal estimate", "%s devices (Kershner 1939): the plan uses %s times that", fmtNum(s.HexEstimate, 1), fmtNum(s.HexRatio, 2))
	}
	note := ""
	if !d.RangeGiven {
		note = " (" + d.RangeNote + ")"
	}
	if s.NewRangeM > 0 {
		line("range of the figures", "each device's own; new devices %s", newDevices(s.NewRangeM, s.NewType))
		line("new device needs", "%s m -> %s m (every r² grown alike until no gap is left)", fmtNum(s.FullCoverRangeBeforeM, 2), fmtNum(s.FullCoverRangeAfterM, 2))
	} else {
		line("range of the figures", "%s m%s", fmtNum(s.RangeM, 2), note)
		line("full-cover range", "%s m -> %s m", fmtNum(s.FullCoverRangeBeforeM, 2), fmtNum(s.FullCoverRangeAfterM, 2))
	}
	line("covered", "%s %% -> %s %% (%s m² -> %s m² uncovered)",
		report.CoveredPercent(s.CoveredFractionBefore, s.UncoveredBeforeM2, 2), report.CoveredPercent(s.CoveredFractionAfter, s.UncoveredAfterM2, 2),
		report.AreaNumber(s.UncoveredBeforeM2, 1), report.AreaNumber(s.UncoveredAfterM2, 1))
	if mode == printFull && len(s.Added) > 0 {
		full := "full cover m"
		if s.NewRangeM > 0 {
			full = "new needs m"
		}
		fmt.Fprintf(w, "\n  %4s  %-26s  %-18s  %-17s  %s\n", "new", "position", full, "covered %", "uncovered m²")
		for i, a := range s.Added {
			if i == maxGapRows {
				fmt.Fprintf(w, "  ... and %d more (all in report.txt, summary.json and %s)\n", len(s.Added)-i, report.LayerFile(report.FileProposed, m.Planar))
				break
			}
			fmt.Fprintf(w, "  %4s  %-26s  %-18s  %-17s  %s\n", fmt.Sprintf("+%d", a.N), fmtPoint(a.Point, d.Coordinates),
				fmtNum(a.FullCoverBeforeM, 2)+" -> "+fmtNum(a.FullCoverAfterM, 2),
				report.CoveredPercent(a.CoveredBefore, a.UncoveredBeforeM2, 2)+" -> "+report.CoveredPercent(a.CoveredAfter, a.UncoveredAfterM2, 2),
				report.AreaNumber(a.UncoveredBeforeM2, 1)+" -> "+report.AreaNumber(a.UncoveredAfterM2, 1))
		}
	}
}

// printCandidates prints the figures of suggest --candidates.
func printCandidates(w io.Writer, line lineFunc, d *report.PlanDoc, mode printMode) {
	c := d.Candidates
	switch {
	case c.OwnRanges:
		line("candidate spots picked", "%d of %d, each with its own range (else %s)", len(c.Picked), c.Count, newDevices(c.NewRangeM, c.NewType))
	case c.NewRangeM > 0:
		line("candidate spots picked", "%d of %d, new devices %s", len(c.Picked), c.Count, newDevices(c.NewRangeM, c.NewType))
	default:
		line("candidate spots picked", "%d of %d at %s m", len(c.Picked), c.Count, fmtNum(c.RangeM, 2))
	}
	line("covered", "%s %% -> %s %% (%s m² -> %s m² uncovered)",
		report.CoveredPercent(c.CoveredFractionBefore, c.UncoveredBeforeM2, 2), report.CoveredPercent(c.CoveredFractionAfter, c.UncoveredAfterM2, 2),
		report.AreaNumber(c.UncoveredBeforeM2, 1), report.AreaNumber(c.UncoveredAfterM2, 1))
	full := "full-cover range"
	switch {
	case c.OwnRanges:
		full = fmt.Sprintf("%s m device needs", fmtNum(c.FullCoverRangeForM, 2))
	case c.NewRangeM > 0:
		full = "new device needs"
	}
	line(full, "%s m -> %s m", fmtNum(c.FullCoverRangeBeforeM, 2), fmtNum(c.FullCoverRangeAfterM, 2))
	switch {
	case c.Complete:
		line("result", "full cover: no gap remains")
	case c.Exhausted:
		line("result", "FULL COVER CANNOT BE REACHED from these spots: %s m² stay uncovered in %s", report.AreaNumber(c.UncoveredAfterM2, 1), nGaps(len(c.Remaining)))
	default:
		line("result", "%s m² stay uncovered in %s", report.AreaNumber(c.UncoveredAfterM2, 1), nGaps(len(c.Remaining)))
	}
	if mode == printFull {
		for i, pk := range c.Picked {
			if i == maxGapRows {
				fmt.Fprintf(w, "  ... and %d more picks (all in report.txt and summary.json)\n", len(c.Picked)-i)
				break
			}
			at := ""
			if pk.RangeM > 0 {
				at = " (" + fmtNum(pk.RangeM, 2) + " m)"
			}
			fmt.Fprintf(w, "  %4d  %s%s at %s: +%s m²\n", pk.Order, report.ItemLabel(pk.Name, "candidate", pk.Candidate), at, fmtPoint(pk.Point, d.Coordinates), fmtNum(pk.GainM2, 1))
		}
	}
}

// printFailures prints the single-failure figures and the worst failures.
func printFailures(w io.Writer, line lineFunc, d *report.PlanDoc, m report.Meta, mode printMode) {
	own := d.RangeGroups != nil
	switch {
	case own && d.SurviveAnySingleFailureRanges == nil:
		line("survive any single failure", "impossible: a single device")
	case own:
		line("survive any single failure", "%s (all r² grown alike), needed at %s when %s fails",
			report.GroupsText(d.RangeGroups, d.SurviveAnySingleFailureRanges), fmtPoint(d.SurvivePoint, d.Coordinates), siteLabel(m, d.SurviveSite))
	case d.SurviveAnySingleFailureM == nil:
		line("survive any single failure", "impossible: a single device")
	default:
		line("survive any single failure", "%s m, needed at %s when %s fails", fmtNum(*d.SurviveAnySingleFailureM, 2),
			fmtPoint(d.SurvivePoint, d.Coordinates), siteLabel(m, d.SurviveSite))
	}
	switch {
	case own:
		line("uncovered, all working", "%s m² at the planned ranges", report.AreaNumber(*d.UncoveredAreaM2, 1))
		line("redundant (hidden)", "%s", hiddenNote(d.Hidden, m, "their failure costs nothing"))
	case d.RangeM != nil:
		line("uncovered, all working", "%s m² at %s m", report.AreaNumber(*d.UncoveredAreaM2, 1), fmtNum(*d.RangeM, 2))
	}
	rows := len(d.Failures)
	if mode == printBrief {
		rows = min(rows, 3)
	} else {
		rows = min(rows, 10)
	}
	if rows > 0 {
		fmt.Fprintf(w, "  worst failures by rank (loss: area uncovered when the device is out of service):\n")
	}
	for _, fl := range d.Failures[:rows] {
		closing := "deepest new gap: no device left"
		switch {
		case fl.Hidden:
			closing = "hidden: costs nothing"
		case own && fl.ClosingRangeM != nil && fl.AddedUncoveredM2 == 0 && *fl.ClosingRangeM == 0:
			closing = "serves no part of the area"
		case own && fl.ClosingRangeM != nil:
			closing = "deepest new gap: backup " + siteLabel(m, fl.Backup) + " needs " + fmtNum(*fl.ClosingRangeM, 2) + " m"
		case fl.ClosingRangeM != nil:
			closing = "deepest new gap needs " + fmtNum(*fl.ClosingRangeM, 2) + " m"
		}
		fmt.Fprintf(w, "  rank %-3d %-28s loss %10s m²  %s\n", fl.Rank, siteLabel(m, fl.Site), fmtNum(fl.AddedUncoveredM2, 1), closing)
	}
}

// printAssignment prints the assignment figures.
func printAssignment(line lineFunc, d *report.PlanDoc, m report.Meta) {
	a := d.Assignment
	what := fmt.Sprintf("%d", a.Points)
	if a.Polygons > 0 {
		what += fmt.Sprintf(" (%d polygons)", a.Polygons)
	}
	line("demand items", "%s", what)
	if a.Served != nil {
		wt := ""
		if a.Weighted {
			wt = fmt.Sprintf(" (weight %s of %s)", trimNum(*a.ServedWeight), trimNum(*a.ServedWeight+*a.UnservedWeight))
		}
		if d.RangeM != nil {
			line("within range", "%d of %d at %s m%s", *a.Served, a.Points, fmtNum(*d.RangeM, 2), wt)
		} else {
			line("within reach", "%d of %d, each at its device's own range%s", *a.Served, a.Points, wt)
			line("redundant (hidden)", "%s", hiddenNote(d.Hidden, m, "they serve nothing"))
		}
	}
	busiest := -1
	for i, ld := range a.Load {
		if busiest < 0 || ld.Weight > a.Load[busiest].Weight {
			busiest = i
		}
	}
	if busiest >= 0 {
		ld := a.Load[busiest]
		wt := ""
		if a.Weighted {
			wt = ", weight " + trimNum(ld.Weight)
		}
		line("busiest device", "%s: %s%s", siteLabel(m, ld.Device), report.Plural(ld.Count, "item"), wt)
	}
	if a.Farthest != nil {
		p := a.Farthest
		line("farthest item", "%s: %s m from %s", report.ItemLabel(p.Name, "item", p.Point), fmtNum(p.DistanceM, 2), siteLabel(m, p.Device))
	}
}

// hiddenList names the hidden devices ("none" when there is none).
func hiddenList(hidden []int, m report.Meta) string {
	if len(hidden) == 0 {
		return "none"
	}
	var names []string
	for _, i := range hidden {
		names = append(names, siteLabel(m, i))
	}
	return strings.Join(names, ", ")
}

// newDevices describes the added devices' range and type.
func newDevices(r float64, typ string) string {
	t := fmtNum(r, 2) + " m"
	if typ != "" {
		t = typ + " " + t
	}
	return t
}

// hiddenNote is hiddenList followed by ": note" when there is a hidden
// device.
func hiddenNote(hidden []int, m report.Meta, note string) string {
	if len(hidden) == 0 {
		return "none"
	}
	return hiddenList(hidden, m) + ": " + note
}

// trimNum formats a weight without needless decimals.
func trimNum(v float64) string {
	if v == math.Trunc(v) && math.Abs(v) < 1e15 {
		return fmt.Sprintf("%.0f", v)
	}
	return fmt.Sprintf("%.6g", v)
}

// nGaps is "1 gap" or "n gaps".
func nGaps(n int) string { return report.Plural(n, "gap") }
