// Devices with their own ranges on the command line: the flags giving
// ranges per device type (--type-range TYPE=LENGTH, repeatable, or
// --range-table FILE, a CSV "type,range"), the start of the commands that
// accept a range column instead of --range (analyze, gaps), and the run of
// coverage.AnalyzeRanges with its stdout summary. How each device's range
// is chosen, and what is refused, is siteinput's (report/siteinput/ranges.go).

package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"sync"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

// addTypeRangeFlags registers --type-range and --range-table.
func (f *runFlags) addTypeRangeFlags(fs *pflag.FlagSet) {
	fs.StringArrayVar(&f.typeRange, "type-range", nil, "range of one device type, TYPE=LENGTH (e.g. gateway=150m; repeat for each type): devices take the range of their type column (CSV type, GeoJSON \"type\" property)")
	fs.Var(newOnceString(&f.rangeTable, ""), "range-table", "CSV file of ranges per device type (columns type,range), instead of --type-range")
}

// typeRanges reads the table of ranges per type from --type-range or
// --range-table (nil when neither is given; both is bad usage).
func (f *runFlags) typeRanges() (*siteinput.TypeRanges, error) {
	switch {
	case len(f.typeRange) > 0 && f.rangeTable != "":
		return nil, usageErrorf("--type-range and --range-table both give ranges per device type: use one of them")
	case len(f.typeRange) > 0:
		tr, err := siteinput.ParseTypeRanges(f.typeRange, "--type-range")
		return tr, fromInput(err)
	case f.rangeTable != "":
		tr, err := siteinput.ReadRangeTable(f.rangeTable, "--range-table")
		return tr, fromInput(err)
	}
	return nil, nil
}

// rangesInputs is the start of analyze and gaps: --sites is required,
// --range is optional when the sites carry their own ranges (a range
// column, or a type column with a type table); without any range source
// loading the scene reports the missing --range.
func (f *runFlags) rangesInputs(cmd *cobra.Command) (siteinput.Inputs, error) {
	if err := requireFlags(cmd, "sites"); err != nil {
		return siteinput.Inputs{}, err
	}
	r, _, err := f.optionalRange(cmd)
	if err != nil {
		return siteinput.Inputs{}, err
	}
	in, err := f.inputs()
	if err != nil {
		return siteinput.Inputs{}, err
	}
	in.Range, in.RangeRequired = r, true
	return in, nil
}

// rangesAnalysis runs coverage.AnalyzeRanges for devices with their own
// ranges (runAnalysis writes and prints it).
func rangesAnalysis(f *runFlags, sc *scene, pr *progress, in siteinput.Inputs) (analysisOutput, error) {
	pr.set(fmt.Sprintf("analysing %d sites with their own ranges", len(sc.sites)))
	a, err := coverage.AnalyzeRanges(sc.sites, sc.ranges, sc.region, coverage.Options{})
	if err != nil {
		return analysisOutput{}, inputErrorf("%s: %v", inputNames(in), err)
	}
	kc, err := runReachRanges(pr, f, a.Layout)
	if err != nil {
		return analysisOutput{}, err
	}
	doc := sync.OnceValue(func() *report.RangesDoc { // one document for warnings and print
		d := report.RangesSummary(a, sc.meta)
		if kc != nil {
			d.Reach = report.ReachSummary(kc, a.Layout, sc.meta)
		}
		return d
	})
	return analysisOutput{
		write: func(opt report.Options) ([]string, error) {
			opt.Reach = kc
			return report.WriteRangesAnalysis(f.out, a, sc.meta, opt)
		},
		warnings: func() []string { return doc().Warnings },
		print: func(w io.Writer, gapTable bool) {
			d := doc()
			printRangesAnalysis(w, d, sc.meta)
			printReachDoc(w, d.Reach)
			if gapTable {
				printRangesGapTable(w, d, sc.meta)
			}
		},
	}, nil
}

// printRangesAnalysis prints the headline figures of an analysis with
// per-device ranges: the range of each device type, the coverage at the
// planned ranges, the full-cover ranges and the hidden devices.
func printRangesAnalysis(w io.Writer, d *report.RangesDoc, m report.Meta) {
	if m.Title != "" {
		fmt.Fprintln(w, m.Title)
	}
	fmt.Fprintf(w, "  %-24s %d\n", "sites", d.Sites)
	fmt.Fprintf(w, "  %-24s %s m²\n", "site area", fmtNum(d.AreaM2, 1))
	for _, g := range d.RangeGroups {
		fmt.Fprintf(w, "  %-24s %s m (%s)\n", "range of "+g.Type, fmtNum(g.RangeM, 2), report.Plural(g.Devices, "device"))
	}
	fmt.Fprintf(w, "  %-24s %s %% (%s m² uncovered in %s)\n", "covered at planned",
		report.CoveredPercent(d.CoveredFraction, d.UncoveredAreaM2, 2), report.AreaNumber(d.UncoveredAreaM2, 1), nGaps(len(d.Gaps)))
	var full []string
	for _, g := range d.FullCover {
		full = append(full, fmt.Sprintf("%s %s m", g.Type, fmtNum(g.RangeM, 2)))
	}
	fmt.Fprintf(w, "  %-24s %s\n", "full cover needs", strings.Join(full, ", "))
	fmt.Fprintf(w, "  %-24s %s\n", "redundant (hidden)", hiddenList(d.Hidden, m))
}

// printRangesGapTable prints the gaps at the planned ranges with what
// closes each: the range each bordering device needs when all ranges grow
// together, and the single device whose smallest increase closes it.
func printRangesGapTable(w io.Writer, d *report.RangesDoc, m report.Meta) {
	if len(d.Gaps) == 0 {
		fmt.Fprintln(w, "No gaps at the planned ranges.")
		return
	}
	fmt.Fprintln(w, "\nGaps at the planned ranges:")
	fmt.Fprintf(w, "  %4s  %12s  %-8s  %-26s  %s\n", "gap", "area m²", "kind", "single-device fix", "closing ranges (all grow together)")
	for i, g := range d.Gaps {
		if i == maxGapRows {
			printMoreGaps(w, len(d.Gaps)-i)
			break
		}
		kind := gapRowKind(g.TouchesBoundary)
		fix := "-"
		if g.FixSite >= 0 {
			fix = g.FixLabel + " to " + fmtNum(g.FixRangeM, 2) + " m"
		}
		var need []string
		for k, s := range g.Sites {
			if k == 6 {
				need = append(need, fmt.Sprintf("+%d", len(g.Sites)-k))
				break
			}
			if k < len(g.NeededM) {
				need = append(need, siteLabel(m, s)+" "+fmtNum(g.NeededM[k], 2)+" m")
			}
		}
		fmt.Fprintf(w, "  %4d  %12s  %-8s  %-26s  %s\n", g.ID, fmtNum(g.AreaM2, 1), kind, fix, strings.Join(need, ", "))
	}
}

// mixedDemoDir is the demo's sub-folder of the mixed-range campus.
const mixedDemoDir = "mixed-ranges"

// runMixedDemo analyses the demo campus with mixed ranges
// (examplesites.MixedSitesGeoJSON: each device's range in the sites file)
// into the sub-folder mixedDemoDir of the demo's output. With --json
// nothing more is printed (stdout holds the main summary.json only).
func runMixedDemo(e *env, f *runFlags, in siteinput.Inputs) error {
	mi := in
	mi.Sites = siteinput.Source{Name: examplesites.MixedSitesFile + " (built in)", Data: examplesites.MixedSitesGeoJSON()}
	mf := *f
	mf.out = filepath.Join(f.out, mixedDemoDir)
	me := *e
	if f.json {
		me.stdout, mf.json = io.Discard, false
	} else {
		fmt.Fprintf(e.stdout, "\nMixed ranges: short-range sensors among long-range gateways (%s)\n", mixedDemoDir)
	}
	return asInput(runAnalysis(&me, "demo", &mf, mi, true))
}
