// The steps shared by the command runs: reading --range and the input
// flags, starting a run (progress line, scene, output folder, metadata),
// writing the report folder with the output flags, and the first lines of
// output (warnings on stderr, summary.json with --json). No arithmetic is
// done here; the figures come from packages coverage and report.

package main

import (
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
)

// rangedInputs is the start of a command that needs --sites and --range:
// it checks both are given, parses the range (m) and opens the inputs.
func (f *runFlags) rangedInputs(cmd *cobra.Command) (siteinput.Inputs, float64, error) {
	if err := requireFlags(cmd, "sites", "range"); err != nil {
		return siteinput.Inputs{}, 0, err
	}
	r, err := parseRange(f.rangeText)
	if err != nil {
		return siteinput.Inputs{}, 0, inputErrorf("%v", err)
	}
	in, err := f.inputs()
	if err != nil {
		return siteinput.Inputs{}, 0, err
	}
	in.Range = r
	return in, r, nil
}

// optionalRange parses --range (m) when it was given; given is false when
// it was not.
func (f *runFlags) optionalRange(cmd *cobra.Command) (r float64, given bool, err error) {
	if !cmd.Flags().Changed("range") {
		return 0, false, nil
	}
	if r, err = parseRange(f.rangeText); err != nil {
		return 0, false, inputErrorf("%v", err)
	}
	return r, true, nil
}

// openSource reads the input file given to flag, for an optional input of
// siteinput.Inputs.
func openSource(path, flag string) (*siteinput.Source, error) {
	s, err := readSource(path, flag)
	if err != nil {
		return nil, err
	}
	return &s, nil
}

// startRun begins a run of command: it starts the progress line, loads the
// scene, checks the output folder and fills the report metadata. The caller
// ends the progress line; on error startRun has ended it.
func startRun(e *env, command string, f *runFlags, in siteinput.Inputs) (*scene, *progress, error) {
	if f.out == "" {
		return nil, nil, usageErrorf("--out needs a folder name")
	}
	pr := startProgress(e.stderr, e.terminal)
	pr.set("reading inputs")
	sc, err := loadScene(in)
	if err != nil {
		pr.end()
		return nil, nil, err
	}
	sc.setMeta(command, f)
	sc.meta.Arguments = e.args
	setMemoryLimit(len(sc.sites))
	// Before any computation: an output folder that cannot be written, an
	// output that would overwrite an input, or a folder holding files
	// sitecover did not write fails now.
	if err := report.CheckOutputFolder(f.out, nil, sc.meta); err != nil {
		pr.end()
		return nil, nil, inputErrorf("%v", err)
	}
	return sc, pr, nil
}

// writeReport calls write with the report options of the output flags
// (the charts only when charts is true and maps are wanted), reporting each
// file on the progress line, then ends the line. It returns the files
// written; a failure is an input error.
func writeReport(f *runFlags, pr *progress, charts bool, write func(report.Options) ([]string, error)) ([]string, error) {
	written, err := write(f.reportOptions(pr, charts))
	pr.end()
	if err != nil {
		return nil, inputErrorf("%v", err)
	}
	return written, nil
}

// reportOptions are the report options of the output flags: the charts
// only when charts is true and maps are wanted, each file reported on the
// progress line.
func (f *runFlags) reportOptions(pr *progress, charts bool) report.Options {
	return report.Options{
		GeoPackage: f.gpkg,
		Maps:       !f.noMaps,
		Charts:     !f.noMaps && charts,
		MapWidth:   f.mapWidth,
		Progress:   func(file string) { pr.set("writing " + file) },
	}
}

// printHead repeats the report's warnings on stderr and, with --json,
// copies the written summary.json to stdout; done is true when that was
// the whole of the run's output (err is then its result).
func printHead(e *env, f *runFlags, warnings []string) (done bool, err error) {
	printWarnings(e.stderr, warnings)
	if f.json {
		return true, printSummaryFile(e.stdout, f.out)
	}
	return false, nil
}
