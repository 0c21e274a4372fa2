// suggest --reach K: devices added until every spot of the site is reached
// by at least K devices at --range (coverage.ReachAdditions), written by
// report.WriteReachPlan.

package main

import (
	"errors"
	"fmt"
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
                          addition.
`

// addSuggestReachFlag registers suggest's --reach.
func addSuggestReachFlag(fs *pflag.FlagSet, f *runFlags) {
	fs.Var(newOnceString(&f.reach, ""), "reach", "add devices until every spot is reached by at least K devices at --range (a whole number ≥ 1)")
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
	if !fl.Changed("range") {
		return usageErrorf("--reach needs --range: the range at which every spot must be reached by K devices (see '%s --help')", cmd.CommandPath())
	}
	ps := planSpec{}
	in, err := f.planInputs(cmd, &ps)
	if err != nil {
		return err
	}
	return asInput(suggestReach(e, f, in, ps.r, K))
}

// suggestReach computes and writes the plan.
func suggestReach(e *env, f *runFlags, in siteinput.Inputs, r float64, K int) error {
	sc, pr, err := startRun(e, "suggest", f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	if err := refuseRanges(sc, "suggest --reach", in); err != nil {
		return err
	}
	fail := func(err error) error {
		return inputErrorf("%s: %v", inputNames(in), strings.TrimPrefix(err.Error(), "coverage: "))
	}
	pr.set(fmt.Sprintf("service areas of %d sites", len(sc.sites)))
	l, err := coverage.NewLayout(sc.sites, sc.region)
	if err != nil {
		return fail(err)
	}
	pr.set(fmt.Sprintf("adding devices until every spot is reached by %d", K))
	p := &report.ReachPlan{Layout: l}
	p.Suggestion, err = coverage.ReachAdditions(l, K, r, coverage.SuggestOptions{})
	if errors.Is(err, coverage.ErrReachCap) && p.Suggestion != nil {
		p.CapReached = true
	} else if err != nil {
		return fail(err)
	}
	pr.set("k-coverage with the additions")
	if p.After, err = coverage.NewLayout(append(append([]orb.Point(nil), sc.sites...), p.Suggestion.Added...), sc.region); err != nil {
		return fail(err)
	}
	kmax := min(K, p.After.Tri.NumVertices())
	if p.AfterReach, err = coverage.KCover(p.After, r, coverage.KOptions{MaxK: kmax, CurveSamples: reachCurveSamples, Gaps: true}); err != nil {
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
	sg := p.Suggestion
	fmt.Fprintf(e.stdout, "  %-24s %d new + %d existing\n", "suggested devices", len(sg.Added), sg.Existing)
	fmt.Fprintf(e.stdout, "  %-24s %s m before, %s m after\n", fmt.Sprintf("%d-cover range", K), reachRangeOut(sg.CoverRangeBefore), reachRangeOut(sg.CoverRangeAfter))
	fmt.Fprintf(e.stdout, "  %-24s %s %% before, %s %% after\n", fmt.Sprintf("reached by %d+ devices", K), fmtNum(100*sg.ShareBefore, 2), fmtNum(100*sg.ShareAfter, 2))
	if p.CapReached {
		fmt.Fprintln(e.stdout, "  the cap on additions was reached first: some spots are still reached by fewer devices")
	}
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
