// The demo command: the full analysis of the embedded, invented Quillmere
// Science Park (package examplesites) at its planned range, written like
// analyze would write it.

package main

import (
	"fmt"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/spf13/cobra"
)

func newDemoCmd(e *env) *cobra.Command {
	f := &runFlags{}
	cmd := &cobra.Command{
		Use:   "demo [--out DIR] [flags]",
		Short: "Analyze the built-in demo campus (invented data)",
		Long: fmt.Sprintf(`demo writes the full report of the built-in demo: %s,
%d environmental sensors, a pond and a quarry that need no coverage, and a
planned range of %g m. The data are invented.`,
			examplesites.Title, 40, examplesites.PlannedRange),
		Example: `  sitecover demo
  sitecover demo --out campus-report
  sitecover demo --range 170m --json`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			r := examplesites.PlannedRange
			if cmd.Flags().Changed("range") {
				var err error
				if r, err = parseRange(f.rangeText); err != nil {
					return inputErrorf("%v", err)
				}
			}
			sites, area, _, title := examplesites.Campus()
			in := sceneInputs{
				sites: source{name: examplesites.SitesFile + " (built in)", data: sites},
				area:  &source{name: examplesites.AreaFile + " (built in)", data: area},
			}
			if f.title == "" {
				f.title = title
			}
			return asInput(runAnalysis(e, "demo", f, in, r, true))
		},
	}
	f.addRangeFlag(cmd.Flags(), fmt.Sprintf("%gm", examplesites.PlannedRange), "planned range")
	f.addOutputFlags(cmd.Flags(), true)
	return cmd
}
