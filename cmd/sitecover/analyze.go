// The analyze command, and the run shared by analyze, gaps and demo:
// load and project the inputs, run coverage.Analyze at the planned range,
// write the report folder, and print a short summary (or summary.json with
// --json) on stdout. Every figure printed is copied from summary.json's
// document (report.Summary), so stdout and the files agree.

package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
)

func newAnalyzeCmd(e *env) *cobra.Command {
	f := &runFlags{}
	cmd := &cobra.Command{
		Use:   "analyze --sites FILE [--area FILE] --range LENGTH [flags]",
		Short: "Full report: coverage, gaps, full-cover range, service areas, holes, maps",
		Long: `analyze writes the full report of a layout at the planned range into the
output folder: report.txt, summary.json, GeoJSON layers (sites, service areas,
gaps, hole closing points), PNG maps (service areas; coverage with gaps) and
PNG charts (covered share against range; hole lifetimes).

The range takes a unit: m, km, ft (0.3048 m) or mi (1609.344 m); a plain
number is metres. Devices with their own ranges: a range column (CSV) or
"range" property (GeoJSON), or a type column with --type-range or
--range-table; --range is then the default for devices without one.`,
		Example: `  sitecover analyze --sites sensors.geojson --area campus.geojson --range 120m
  sitecover analyze --sites sensors.csv --area campus.geojson --exclude ponds.geojson --range 400ft
  sitecover analyze --sites gateways.csv --range 2km --out gw-report --json > summary.json
  sitecover analyze --planar --sites plan-xy.csv --area plan-xy.geojson --range 25`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if _, err := parseReach(f.reach); err != nil {
				return err
			}
			in, err := f.rangesInputs(cmd)
			if err != nil {
				return err
			}
			return asInput(runAnalysis(e, "analyze", f, in, true))
		},
	}
	cmd.Flags().Var(newOnceString(&f.reach, ""), "reach", "also report the share reached by at least k devices, the range giving every spot k devices, and the parts short of k, for k = 1 … the largest listed (e.g. 2 or 2,3; redundancy and positioning)")
	f.addInputFlags(cmd.Flags())
	f.addOutCRSFlag(cmd.Flags())
	f.addContextFlag(cmd.Flags())
	f.addRangeFlag(cmd.Flags(), "", "planned range of every device, e.g. 150m, 0.2km, 500ft, 0.1mi (required unless the sites give their own: a range column, or a type column with --type-range)")
	f.addOutputFlags(cmd.Flags(), true)
	return cmd
}

// runAnalysis is the analyze/gaps/demo pipeline. With charts false the
// PNG charts are skipped and the gap table is printed (the gaps command).
func runAnalysis(e *env, command string, f *runFlags, in siteinput.Inputs, charts bool) error {
	sc, pr, err := startRun(e, command, f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	var out analysisOutput
	if sc.ranges != nil {
		out, err = rangesAnalysis(f, sc, pr, in)
	} else {
		out, err = commonAnalysis(f, sc, pr, in, charts)
	}
	if err != nil {
		return err
	}
	written, err := writeReport(f, pr, charts, out.write)
	if err != nil {
		return err
	}
	if done, err := printHead(e, f, out.warnings()); done {
		return err
	}
	out.print(e.stdout, !charts)
	printWritten(e.stdout, f.out, written)
	return nil
}

// analysisOutput is what runAnalysis writes and prints of one analysis:
// the report folder, the warnings and the stdout summary (with the gap
// table when gapTable is true).
type analysisOutput struct {
	write    func(opt report.Options) ([]string, error)
	warnings func() []string
	print    func(w io.Writer, gapTable bool)
}

// commonAnalysis runs coverage.Analyze at the common range. Without
// --reach (whose outputs are known only after the analysis) the report
// is started as soon as the layout is built (report.StartAnalysis), so
// the sites and service-area layers stream to disk while the rest of the
// analysis runs; its write then finishes that report.
func commonAnalysis(f *runFlags, sc *scene, pr *progress, in siteinput.Inputs, charts bool) (analysisOutput, error) {
	pr.set(fmt.Sprintf("analysing %d sites", len(sc.sites)))
	var aw *report.AnalysisWriter
	var startErr error
	var opt coverage.Options
	if f.reach == "" {
		opt.LayoutReady = func(l *coverage.Layout) {
			aw, startErr = report.StartAnalysis(f.out, l, sc.rangeM, sc.meta, f.reportOptions(pr, charts))
		}
	}
	a, err := coverage.Analyze(sc.sites, sc.region, sc.rangeM, opt)
	if err != nil {
		if aw != nil {
			aw.Abort()
		}
		return analysisOutput{}, inputErrorf("%s: %v", inputNames(in), err)
	}
	if startErr != nil {
		return analysisOutput{}, inputErrorf("%v", startErr)
	}
	kc, err := runReach(pr, f, a, sc.rangeM)
	if err != nil {
		return analysisOutput{}, err
	}
	doc := sync.OnceValue(func() *report.SummaryDoc { // one document for warnings and print
		d := report.SummaryCapped(a, sc.meta) // the document summary.json holds: bounded at any size
		if kc != nil {
			d.Reach = report.ReachSummary(kc, a.Layout, sc.meta)
		}
		return d
	})
	return analysisOutput{
		write: func(opt report.Options) ([]string, error) {
			if aw != nil {
				return aw.Finish(a)
			}
			opt.Reach = kc
			return report.WriteAnalysis(f.out, a, sc.meta, opt)
		},
		warnings: func() []string { return doc().Warnings },
		print: func(w io.Writer, gapTable bool) {
			d := doc()
			printAnalysis(w, d, innerGaps(a.Gaps), sc.meta)
			printReach(w, d)
			if gapTable {
				printGapTable(w, d, sc.meta)
			}
		},
	}, nil
}

// setMeta fills the report metadata from the flags.
func (sc *scene) setMeta(command string, f *runFlags) {
	sc.meta.Command = command
	sc.meta.Version = strings.TrimPrefix(versionString(), "sitecover ")
	sc.meta.LifeSafety = f.lifeSafety
	if f.title != "" {
		sc.meta.Title = f.title
	}
}

// inputNames lists the input names for messages about the whole scene.
func inputNames(in siteinput.Inputs) string {
	s := in.Sites.Name
	if in.Area != nil {
		s += ", " + in.Area.Name
	}
	if in.Exclude != nil {
		s += ", " + in.Exclude.Name
	}
	return s
}

// printWarnings repeats the report's warnings on stderr.
func printWarnings(w io.Writer, warnings []string) {
	for _, s := range warnings {
		fmt.Fprintf(w, "sitecover: warning: %s\n", s)
	}
}

// printSummaryFile copies the written summary.json to w, byte for byte.
func printSummaryFile(w io.Writer, dir string) error {
	b, err := os.ReadFile(filepath.Join(dir, report.FileSummary))
	if err != nil {
		return inputErrorf("reading back %s: %v", report.FileSummary, unwrapPathErr(err))
	}
	_, err = w.Write(b)
	return err
}

// innerGaps counts the gaps that do not touch the site boundary.
func innerGaps(gaps []coverage.Gap) int {
	inner := 0
	for _, g := range gaps {
		if !g.TouchesBoundary {
			inner++
		}
	}
	return inner
}

// printAnalysis prints the headline figures of an analysis (d as
// summary.json holds it, its lists capped; inner gaps counted by the
// caller over all of them).
func printAnalysis(w io.Writer, d *report.SummaryDoc, inner int, m report.Meta) {
	if m.Title != "" {
		fmt.Fprintln(w, m.Title)
	}
	hull := ""
	if d.AreaFromHull {
		hull = " (convex hull of the sites)"
	}
	fmt.Fprintf(w, "  %-24s %d\n", "sites", d.Sites)
	fmt.Fprintf(w, "  %-24s %s m²%s\n", "site area", fmtNum(d.AreaM2, 1), hull)
	fmt.Fprintf(w, "  %-24s %s m\n", "planned range", fmtNum(d.RangeM, 2))
	fmt.Fprintf(w, "  %-24s %s %% (%s m² uncovered in %s, %d inner)\n", "covered at planned range",
		report.CoveredPercent(d.CoveredFraction, d.UncoveredAreaM2, 2), report.AreaNumber(d.UncoveredAreaM2, 1), nGaps(d.GapsTotal), inner)
	where := ""
	if len(d.FullCoverWorstPoints) > 0 {
		where = " at " + fmtPoint(d.FullCoverWorstPoint, d.Coordinates)
		if n := len(d.FullCoverWorstPoints); n > 1 {
			where += fmt.Sprintf(" and %d more", n-1)
		}
	}
	fmt.Fprintf(w, "  %-24s %s m, needed%s\n", "full-cover range", fmtNum(d.FullCoverRangeM, 2), where)
	p := d.RangePercentiles
	fmt.Fprintf(w, "  %-24s 50%%: %s m  90%%: %s m  95%%: %s m  99%%: %s m\n", "range covering",
		fmtNum(p.P50, 1), fmtNum(p.P90, 1), fmtNum(p.P95, 1), fmtNum(p.P99, 1))
	fmt.Fprintf(w, "  %-24s %s m\n", "link range (mesh)", fmtNum(d.LinkRangeM, 2))
}

// maxGapRows is the number of gaps printed on stdout.
const maxGapRows = 40

// printGapTable prints the gaps at the planned range, by closing range.
func printGapTable(w io.Writer, d *report.SummaryDoc, m report.Meta) {
	if len(d.Gaps) == 0 {
		fmt.Fprintf(w, "No gaps at %s m.\n", fmtNum(d.RangeM, 2))
		return
	}
	fmt.Fprintf(w, "\nGaps at %s m, by closing range:\n", fmtNum(d.RangeM, 2))
	fmt.Fprintf(w, "  %4s  %12s  %11s  %-26s  %-8s  %s\n", "gap", "area m²", "closing m", "deepest point", "kind", "bordering devices")
	for i, g := range d.Gaps {
		if i == maxGapRows {
			printMoreGaps(w, d.GapsTotal-i)
			break
		}
		kind := gapRowKind(g.TouchesBoundary)
		var sites []string
		for k, s := range g.Sites {
			if k == 6 {
				sites = append(sites, fmt.Sprintf("+%d", len(g.Sites)-k))
				break
			}
			sites = append(sites, siteLabel(m, s))
		}
		fmt.Fprintf(w, "  %4d  %12s  %11s  %-26s  %-8s  %s\n", g.ID, fmtNum(g.AreaM2, 1), fmtNum(g.ClosingRangeM, 2),
			fmtPoint(g.DeepestPoint, d.Coordinates), kind, strings.Join(sites, ", "))
	}
}

// printMoreGaps ends a gap table cut at maxGapRows, n gaps short.
func printMoreGaps(w io.Writer, n int) {
	fmt.Fprintf(w, "  ... and %d more gaps (all in report.txt, summary.json and gaps.geojson)\n", n)
}

// gapRowKind is a gap's kind in the stdout tables: "edge" when it
// reaches the site boundary, else "inner".
func gapRowKind(touchesBoundary bool) string {
	if touchesBoundary {
		return "edge"
	}
	return "inner"
}

// siteLabel names input site i as every output does (report.DeviceLabel).
func siteLabel(m report.Meta, i int) string { return report.DeviceLabel(m.SiteNames, i) }

// printWritten lists the files written.
func printWritten(w io.Writer, dir string, written []string) {
	names := make([]string, len(written))
	for i, p := range written {
		names[i] = filepath.Base(p)
	}
	fmt.Fprintf(w, "Wrote %s to %s: %s\n", report.Plural(len(written), "file"), dir, strings.Join(names, ", "))
}

// fmtNum formats v with d decimals.
func fmtNum(v float64, d int) string { return fmt.Sprintf("%.*f", d, v) }

// fmtPoint formats an output point in the one text form of every output
// (report.FormatPoint).
func fmtPoint(p report.Point, kind string) string { return report.FormatPoint(p, kind) }
