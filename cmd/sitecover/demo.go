// The demo command: the full analysis of the embedded, invented Quillmere
// Science Park (package examplesites) at its planned range, written like
// analyze would write it, then each planning move on the same campus, each
// in a sub-folder of --out like the planning commands would write it:
//
//	suggest-add         suggest --add 3 --range <planned range>
//	suggest-fewest      suggest --range <planned range>
//	suggest-candidates  suggest --candidates campus-candidates.geojson --range <planned range>
//	failures            failures --range <planned range>
//	assign              assign --points campus-buildings.geojson --range <planned range>

package main

import (
	"fmt"
	"path/filepath"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
)

// demoAdd is the number of devices the demo's free placement adds.
const demoAdd = 3

// demoPlan is one planning step of the demo.
type demoPlan struct {
	dir, command, what string
	ps                 planSpec
	candidates, points bool
}

// demoPlans are the demo's planning steps at range r.
func demoPlans(r float64) []demoPlan {
	return []demoPlan{
		{dir: "suggest-add", command: "suggest", what: fmt.Sprintf("suggest --add %d: free placement", demoAdd),
			ps: planSpec{move: report.MoveAdd, k: demoAdd, r: r, rangeGiven: true}},
		{dir: "suggest-fewest", command: "suggest", what: "suggest --range: fewest additions for no gap",
			ps: planSpec{move: report.MoveFewest, r: r, rangeGiven: true}},
		{dir: "suggest-candidates", command: "suggest", what: "suggest --candidates " + examplesites.CandidatesFile + ": the fewest spots",
			ps: planSpec{move: report.MoveCandidates, r: r, rangeGiven: true}, candidates: true},
		{dir: "failures", command: "failures", what: "failures: single-device outages",
			ps: planSpec{move: report.MoveFailures, r: r, rangeGiven: true}},
		{dir: "assign", command: "assign", what: "assign --points " + examplesites.BuildingsFile + ": buildings to devices",
			ps: planSpec{move: report.MoveAssign, r: r, rangeGiven: true}, points: true},
	}
}

func newDemoCmd(e *env) *cobra.Command {
	f := &runFlags{}
	noPlans := false
	cmd := &cobra.Command{
		Use:   "demo [--out DIR] [flags]",
		Short: "Analyze the built-in demo campus and run each planning move on it (invented data)",
		Long: fmt.Sprintf(`demo writes the full report of the built-in demo: %s,
%d environmental sensors, a pond and a quarry that need no coverage, and a
planned range of %g m. The data are invented.

Then it analyses the same campus with mixed ranges into the sub-folder
mixed-ranges: the sensors as short-range devices (80 m) among six long-range
gateways (180 m), each range given in the sites file.

Then it runs each planning move on the campus at the same range, each into a
sub-folder of --out: suggest-add (%d devices placed freely), suggest-fewest
(the fewest additions for no gap), suggest-candidates (the fewest of %d
invented mounting spots), failures (single-device outages) and assign (the
campus buildings to their serving sensors). --no-plans skips them.`,
			examplesites.Title, 40, examplesites.PlannedRange, demoAdd, 22),
		Example: `  sitecover demo
  sitecover demo --out campus-report
  sitecover demo --range 170m --json
  sitecover demo --no-plans --no-maps`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			r, given, err := f.optionalRange(cmd)
			if err != nil {
				return err
			}
			if !given {
				r = examplesites.PlannedRange
			}
			sites, area, _, title := examplesites.Campus()
			in := siteinput.Inputs{
				Sites:   siteinput.Source{Name: examplesites.SitesFile + " (built in)", Data: sites},
				Area:    &siteinput.Source{Name: examplesites.AreaFile + " (built in)", Data: area},
				Context: &siteinput.Source{Name: examplesites.BuildingsFile + " (built in)", Data: examplesites.BuildingsGeoJSON()},
				Range:   r,
			}
			if f.title == "" {
				f.title = title
			}
			f.gpkg = true // the demo shows every output
			if err := asInput(runAnalysis(e, "demo", f, in, true)); err != nil || noPlans {
				return err
			}
			if err := runMixedDemo(e, f, in); err != nil {
				return err
			}
			mode := printBrief
			if f.json {
				mode = printNone
			}
			for _, dp := range demoPlans(r) {
				pin := in
				if dp.candidates {
					pin.Candidates = &siteinput.Source{Name: examplesites.CandidatesFile + " (built in)", Data: examplesites.CandidatesGeoJSON()}
				}
				if dp.points {
					pin.Points = &siteinput.Source{Name: examplesites.BuildingsFile + " (built in)", Data: examplesites.BuildingsGeoJSON()}
				}
				pf := *f
				pf.out = filepath.Join(f.out, dp.dir)
				if mode == printBrief {
					fmt.Fprintf(e.stdout, "\n%s (%s)\n", dp.what, dp.dir)
				}
				if err := asInput(runPlan(e, "demo", &pf, pin, dp.ps, mode)); err != nil {
					return err
				}
			}
			return nil
		},
	}
	f.addRangeFlag(cmd.Flags(), fmt.Sprintf("%gm", examplesites.PlannedRange), "planned range")
	f.addOutputFlags(cmd.Flags(), true)
	cmd.Flags().BoolVar(&noPlans, "no-plans", false, "write the analysis only, without the mixed-range and planning sub-folders")
	return cmd
}
