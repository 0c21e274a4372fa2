// suggest --reach K: devices added until every spot of the site is reached
// by at least K devices at --range (coverage.ReachAdditions), or with
// devices of their own ranges at those ranges, the new devices at --range
// or of --new-type (coverage.ReachAdditionsRanges), written by
// report.WriteReachPlan; finishReach is the end every suggest --reach run
// shares (candidates_reach.go too).

package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

// suggestReachHelp is the --reach paragraph of suggest's help.
const suggestReachHelp = `  --reach K --range R     add devices until every spot is reached by at least K
                          devices at R (redundancy, positioning): each new
                          device at the spot needing the most range for K
                          (farthest-point insertion, Gonzalez 1985) or 0.9 R
                          from it, whichever reaches more area K times;
                          redundant ones dropped; exact figures after each
                          addition. With devices of their own ranges every
                          spot is reached by K at those ranges, the new
                          devices at --range R or of --new-type TYPE; the
                          figures are the ranges each group of devices needs
                          (all grow together).
`

// addSuggestReachFlag registers suggest's --reach.
func addSuggestReachFlag(fs *pflag.FlagSet, f *runFlags) {
	fs.Var(newOnceString(&f.reach, ""), "reach", "add devices until every spot is reached by at least K devices at --range, or at the devices' own ranges (a whole number ≥ 1)")
}

// parseSuggestReach parses suggest's --reach: one whole number ≥ 1.
func parseSuggestReach(s string) (int, error) {
	k, err := strconv.Atoi(strings.TrimSpace(s))
	if err != nil {
		return 0, usageErrorf("--reach %q: not a whole number of devices (e.g. --reach 2)", s)
	}
	if k < 1 {
		return 0, usageErrorf("--reach %q: k = %d must be at least 1", s, k)
	}
	return k, nil
}

// runSuggestReach runs suggest --reach.
func runSuggestReach(e *env, cmd *cobra.Command, f *runFlags) error {
	K, err := parseSuggestReach(f.reach)
	if err != nil {
		return err
	}
	fl := cmd.Flags()
	if fl.Changed("candidates") {
		return runCandidatesReach(e, cmd, f, K)
	}
	if fl.Changed("add") {
		return usageErrorf("--reach places devices freely until every spot is reached by K devices; it does not combine with --add (except with --candidates: that many spots)")
	}
	ps := planSpec{}
	if fl.Changed("new-type") {
		ps.newType = fl.Lookup("new-type").Value.String()
	}
	if !fl.Changed("range") && ps.newType == "" {
		return usageErrorf("--reach needs --range: the range at which every spot must be reached by K devices, or with devices of their own ranges the new devices' range (--range or --new-type; see '%s --help')", cmd.CommandPath())
	}
	in, err := f.planInputs(cmd, &ps)
	if err != nil {
		return err
	}
	return asInput(suggestReach(e, f, in, ps, K))
}

// suggestReach computes and writes the plan: at one common range
// (coverage.ReachAdditions), or with devices of their own ranges and new
// ones at --range or of --new-type (coverage.ReachAdditionsRanges).
func suggestReach(e *env, f *runFlags, in siteinput.Inputs, ps planSpec, K int) error {
	sc, pr, err := startRun(e, "suggest", f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	r, ranges := ps.r, sc.ranges
	if ranges != nil || ps.newType != "" {
		if r, err = newDeviceRange(sc, in, ps); err != nil {
			return err
		}
		if ranges == nil && r != sc.rangeM {
			// New devices of another range than the existing ones.
			ranges = repeatRange(sc.rangeM, len(sc.sites))
			sc.meta.Ranges = ranges
		}
	}
	fail := reachFail(in)
	l, err := reachLayout(pr, sc, ranges)
	if err != nil {
		return fail(err)
	}
	pr.set(fmt.Sprintf("adding devices until every spot is reached by %d", K))
	p := &report.ReachPlan{Layout: l}
	if ranges != nil {
		p.NewType = ps.newType
		p.Suggestion, err = coverage.ReachAdditionsRanges(l, K, r, coverage.SuggestOptions{})
	} else {
		p.Suggestion, err = coverage.ReachAdditions(l, K, r, coverage.SuggestOptions{})
	}
	if errors.Is(err, coverage.ErrReachCap) && p.Suggestion != nil {
		p.CapReached = true
	} else if err != nil {
		return fail(err)
	}
	return finishReach(e, f, pr, sc, fail, p, p.Suggestion.Added, repeatRange(r, len(p.Suggestion.Added)), K, r, ranges, func(w io.Writer) {
		sg := p.Suggestion
		fmt.Fprintf(w, "  %-24s %d new + %d existing\n", "suggested devices", len(sg.Added), sg.Existing)
		if ranges != nil {
			before, after := report.ReachPlanNeeded(p, sc.meta)
			fmt.Fprintf(w, "  %-24s before: %s\n  %-24s after:  %s\n", fmt.Sprintf("%d-cover ranges", K), before, "", after)
		} else {
			fmt.Fprintf(w, "  %-24s %s m before, %s m after\n", fmt.Sprintf("%d-cover range", K), reachRangeOut(sg.CoverRangeBefore), reachRangeOut(sg.CoverRangeAfter))
		}
		fmt.Fprintf(w, "  %-24s %s %% before, %s %% after\n", fmt.Sprintf("reached by %d+ devices", K), fmtNum(100*sg.ShareBefore, 2), fmtNum(100*sg.ShareAfter, 2))
		if p.CapReached {
			fmt.Fprintln(w, "  the cap on additions was reached first: some spots are still reached by fewer devices")
		}
	})
}

// reachFail turns an error of the computation into an input error naming
// the inputs.
func reachFail(in siteinput.Inputs) func(error) error {
	return func(err error) error {
		return inputErrorf("%s: %v", inputNames(in), strings.TrimPrefix(err.Error(), "coverage: "))
	}
}

// reachLayout builds the existing layout of suggest --reach: at one
// common range, or (ranges set) with each device's own range.
func reachLayout(pr *progress, sc *scene, ranges []float64) (*coverage.Layout, error) {
	pr.set(fmt.Sprintf("service areas of %d sites", len(sc.sites)))
	if ranges != nil {
		return coverage.NewLayoutRanges(sc.sites, ranges, sc.region)
	}
	return coverage.NewLayout(sc.sites, sc.region)
}

// finishReach completes a suggest --reach run with the plan p: the layout
// with the added devices (p.After; with own ranges, ranges set, the
// existing devices' ranges and addedR for the new ones) and its k-coverage up to
// K at r or at the own ranges (p.AfterReach), then writes the report
// folder and prints the title, the figures (print) and the files written.
func finishReach(e *env, f *runFlags, pr *progress, sc *scene, fail func(error) error, p *report.ReachPlan,
	added []orb.Point, addedR []float64, K int, r float64, ranges []float64, print func(w io.Writer)) error {
	pr.set("k-coverage with the additions")
	sites := append(append([]orb.Point(nil), sc.sites...), added...)
	var err error
	if ranges != nil {
		rs := append(append([]float64(nil), ranges...), addedR...)
		if p.After, err = coverage.NewLayoutRanges(sites, rs, sc.region); err != nil {
			return fail(err)
		}
		opt := coverage.KOptions{MaxK: min(K, reachDistinct(p.After)), CurveSamples: reachCurveSamples, Gaps: true}
		p.AfterReach, err = coverage.KCoverRanges(p.After, opt)
	} else {
		if p.After, err = coverage.NewLayout(sites, sc.region); err != nil {
			return fail(err)
		}
		opt := coverage.KOptions{MaxK: min(K, p.After.Tri.NumVertices()), CurveSamples: reachCurveSamples, Gaps: true}
		p.AfterReach, err = coverage.KCover(p.After, r, opt)
	}
	if err != nil {
		return fail(err)
	}
	written, err := writeReport(f, pr, false, func(opt report.Options) ([]string, error) {
		return report.WriteReachPlan(f.out, p, sc.meta, opt)
	})
	if err != nil {
		return err
	}
	if done, err := printHead(e, f, nil); done {
		return err
	}
	if sc.meta.Title != "" {
		fmt.Fprintln(e.stdout, sc.meta.Title)
	}
	print(e.stdout)
	printWritten(e.stdout, f.out, written)
	return nil
}

// reachRangeOut formats a k-cover range ("none" while fewer than k
// devices stand).
func reachRangeOut(v float64) string {
	if math.IsInf(v, 0) {
		return "none"
	}
	return fmtNum(v, 2)
}
