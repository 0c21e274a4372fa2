// The gaps command: coverage at one range. It writes the report folder
// without the charts (report.txt, summary.json, GeoJSON layers, the maps)
// and prints the table of gaps: each connected uncovered part of the area,
// its exact area, the range that closes it, its deepest point, whether it
// is an edge gap (it runs against the site boundary) or an inner gap
// (coverage surrounds it), and the devices around it.

package main

import (
	"github.com/spf13/cobra"
)

func newGapsCmd(e *env) *cobra.Command {
	f := &runFlags{}
	cmd := &cobra.Command{
		Use:   "gaps --sites FILE [--area FILE] --range LENGTH [flags]",
		Short: "Coverage at a range: the gaps, their areas and the ranges that close them",
		Long: `gaps analyses coverage at one range and prints the gaps, largest closing
range first: area, closing range (the range at which the gap vanishes),
deepest point (the point farthest from every device), edge gap (it runs
against the site boundary) or inner gap (coverage surrounds it), and the
devices around it. The report folder gets report.txt, summary.json, the GeoJSON
layers and the maps (no charts).`,
		Example: `  sitecover gaps --sites sensors.geojson --area campus.geojson --range 120m
  sitecover gaps --sites sirens.csv --area town.geojson --range 0.5mi --no-maps
  sitecover gaps --sites aps.csv --area floor.geojson --planar --range 15 --json`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			in, err := f.rangesInputs(cmd)
			if err != nil {
				return err
			}
			return asInput(runAnalysis(e, "gaps", f, in, false))
		},
	}
	f.addInputFlags(cmd.Flags())
	f.addOutCRSFlag(cmd.Flags())
	f.addContextFlag(cmd.Flags())
	f.addRangeFlag(cmd.Flags(), "", "range of every device, e.g. 150m, 0.2km, 500ft, 0.1mi (required unless the sites give their own: a range column, or a type column with --type-range)")
	f.addOutputFlags(cmd.Flags(), true)
	return cmd
}
