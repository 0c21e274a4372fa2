// The cells command: service areas only. Each site's service area is its
// Voronoi cell clipped to the site area: the part of the site closer to it
// than to any other site (exact polygons, see package planar). No range is
// needed.

package main

import (
	"fmt"
	"io"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
)

func newCellsCmd(e *env) *cobra.Command {
	f := &runFlags{}
	cmd := &cobra.Command{
		Use:   "cells --sites FILE [--area FILE] [flags]",
		Short: "Service areas: which device serves which part of the site",
		Long: `cells writes the service area of every site - the part of the site area
closer to it than to any other site (its Voronoi cell clipped to the area;
with devices of their own ranges, its power cell: where its disk reaches
deepest) - with its size, share and farthest point: report.txt, summary.json, the sites
and service-area GeoJSON layers and the service-area map.`,
		Example: `  sitecover cells --sites sirens.csv --area town.geojson
  sitecover cells --sites call-points.geojson --area building.geojson --out cells --no-maps
  sitecover cells --planar --sites plan-xy.csv --area plan-xy.geojson --json`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := requireFlags(cmd, "sites"); err != nil {
				return err
			}
			in, err := f.inputs()
			if err != nil {
				return err
			}
			return asInput(runCells(e, f, in))
		},
	}
	f.addInputFlags(cmd.Flags())
	f.addOutCRSFlag(cmd.Flags())
	f.addContextFlag(cmd.Flags())
	f.addOutputFlags(cmd.Flags(), true)
	return cmd
}

func runCells(e *env, f *runFlags, in siteinput.Inputs) error {
	sc, pr, err := startRun(e, "cells", f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	pr.set(fmt.Sprintf("service areas of %d sites", len(sc.sites)))
	var l *coverage.Layout
	if sc.ranges != nil {
		// Power cells: each device's share when ranges differ.
		l, err = coverage.NewLayoutRanges(sc.sites, sc.ranges, sc.region)
	} else {
		l, err = coverage.NewLayout(sc.sites, sc.region)
	}
	if err != nil {
		return inputErrorf("%s: %v", inputNames(in), err)
	}
	written, err := writeReport(f, pr, false, func(opt report.Options) ([]string, error) {
		return report.WriteCells(f.out, l, sc.meta, opt)
	})
	if err != nil {
		return err
	}
	doc := report.CellsSummary(l, sc.meta)
	if done, err := printHead(e, f, doc.Warnings); done {
		return err
	}
	printCells(e.stdout, doc, sc.meta)
	printWritten(e.stdout, f.out, written)
	return nil
}

// printCells prints the headline figures of the service areas.
func printCells(w io.Writer, d *report.CellsDoc, m report.Meta) {
	if m.Title != "" {
		fmt.Fprintln(w, m.Title)
	}
	fmt.Fprintf(w, "  %-24s %d (%d service areas)\n", "sites", d.Sites, len(d.Cells))
	fmt.Fprintf(w, "  %-24s %s m²\n", "site area", fmtNum(d.AreaM2, 1))
	big, far := -1, -1
	for i, c := range d.Cells {
		if big < 0 || c.AreaM2 > d.Cells[big].AreaM2 {
			big = i
		}
		if far < 0 || c.FarthestM > d.Cells[far].FarthestM {
			far = i
		}
	}
	if big >= 0 {
		c := d.Cells[big]
		fmt.Fprintf(w, "  %-24s %s: %s m² (%s %% of the area)\n", "largest service area", siteLabel(m, c.Site),
			fmtNum(c.AreaM2, 1), fmtNum(100*c.Share, 2))
		c = d.Cells[far]
		fmt.Fprintf(w, "  %-24s %s: %s m to %s\n", "farthest served point", siteLabel(m, c.Site),
			fmtNum(c.FarthestM, 2), fmtPoint(c.FarthestPoint, d.Coordinates))
	}
}
