// suggest --reach K --candidates FILE [--add N]: the fewest candidate
// spots (or N of them) so that every spot of the site is reached by at
// least K devices at --range (coverage.ChooseCandidatesReach), written by
// report.WriteReachPlan like the free placement of suggest --reach.

package main

import (
	"fmt"
	"io"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
)

// candidatesReachHelp is the --reach --candidates paragraph of suggest's
// help.
const candidatesReachHelp = `  --reach K --candidates FILE --range R
                          the fewest candidate spots (or --add N of them) so
                          that every spot is reached by at least K devices at
                          R: greedy set cover on the area reached by 1 to K
                          devices (Johnson 1974, Chvatal 1979, Wolsey 1982),
                          a lower bound on the spots needed, and what stays
                          short when the spots cannot do it.
`

// runCandidatesReach runs suggest --reach K --candidates FILE; K is parsed.
func runCandidatesReach(e *env, cmd *cobra.Command, f *runFlags, K int) error {
	fl := cmd.Flags()
	if fl.Changed("new-type") {
		return usageErrorf("--reach counts devices in reach at one common range: give --range, not --new-type")
	}
	if !fl.Changed("range") {
		return usageErrorf("--reach with --candidates needs --range: the range at which every spot must be reached by K devices (see '%s --help')", cmd.CommandPath())
	}
	picks := 0
	if fl.Changed("add") {
		n, err := fl.GetInt("add")
		if err != nil || n <= 0 || n > maxAdd {
			return inputErrorf("--add %d: must be a whole number of spots from 1 to %d", n, maxAdd)
		}
		picks = n
	}
	ps := planSpec{}
	in, err := f.planInputs(cmd, &ps)
	if err != nil {
		return err
	}
	if in.Candidates, err = openSource(fl.Lookup("candidates").Value.String(), "--candidates"); err != nil {
		return err
	}
	return asInput(candidatesReach(e, f, in, ps.r, K, picks))
}

// candidatesReach computes and writes the choice.
func candidatesReach(e *env, f *runFlags, in siteinput.Inputs, r float64, K, picks int) error {
	sc, pr, err := startRun(e, "suggest", f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	if err := refuseRanges(sc, "suggest --reach --candidates", in); err != nil {
		return err
	}
	if err := refuseCandidateRanges(sc, "suggest --reach --candidates", in); err != nil {
		return err
	}
	fail := reachFail(in)
	l, err := reachLayout(pr, sc, nil)
	if err != nil {
		return fail(err)
	}
	cands := sc.candidates
	pr.set(fmt.Sprintf("choosing among %d candidate spots for %d devices in reach", len(cands.Pts), K))
	p := &report.ReachPlan{Layout: l, Candidates: cands.Pts, CandidateNames: cands.Names}
	if p.Choice, err = coverage.ChooseCandidatesReach(l, cands.Pts, K, r, picks); err != nil {
		return fail(err)
	}
	var added []orb.Point
	for _, pk := range p.Choice.Picks {
		added = append(added, pk.Position)
	}
	return finishReach(e, f, pr, sc, fail, p, added, K, r, nil, func(w io.Writer) { printReachChoice(w, p, K, picks) })
}

// printReachChoice prints the figures of suggest --reach --candidates.
func printReachChoice(w io.Writer, p *report.ReachPlan, K, picks int) {
	ch := p.Choice
	fmt.Fprintf(w, "  %-24s %d of %d\n", "candidate spots picked", len(ch.Picks), len(p.Candidates))
	fmt.Fprintf(w, "  %-24s %s m before, %s m after\n", fmt.Sprintf("%d-cover range", K), reachRangeOut(ch.CoverRangeBefore), reachRangeOut(ch.CoverRangeAfter))
	fmt.Fprintf(w, "  %-24s %s %% before, %s %% after\n", fmt.Sprintf("reached by %d+ devices", K), fmtNum(100*ch.ShareBefore, 2), fmtNum(100*ch.ShareAfter, 2))
	switch {
	case ch.Reached && ch.Optimal:
		fmt.Fprintf(w, "  %-24s every spot reached by %d devices, with the fewest spots possible\n", "result", K)
	case ch.Reached && picks == 0:
		fmt.Fprintf(w, "  %-24s every spot reached by %d devices (greedy; no choice of fewer than %d spots can)\n", "result", K, ch.LowerBound)
	case ch.Reached:
		fmt.Fprintf(w, "  %-24s every spot reached by %d devices\n", "result", K)
	case ch.Exhausted:
		fmt.Fprintf(w, "  %-24s THESE CANDIDATES CANNOT REACH EVERY SPOT %d TIMES: %s m² stay short in %s\n", "result", K,
			report.AreaNumber(p.AfterReach.AreaM2-ch.CoveredAfter, 1), report.Plural(len(ch.Remaining), "part"))
	default:
		fmt.Fprintf(w, "  %-24s %s m² stay reached by fewer than %d devices\n", "result", report.AreaNumber(p.AfterReach.AreaM2-ch.CoveredAfter, 1), K)
	}
	for j, pk := range ch.Picks {
		if j == maxGapRows {
			fmt.Fprintf(w, "  ... and %d more picks (all in report.txt and summary.json)\n", len(ch.Picks)-j)
			break
		}
		fmt.Fprintf(w, "  %4d  %s: %s-cover range %s m, reached by %d+ %s %%\n", j+1, report.ItemLabel(p.CandidateNames[pk.Candidate], "candidate", pk.Candidate),
			fmt.Sprint(K), reachRangeOut(pk.CoverRange), K, fmtNum(100*pk.Share, 2))
	}
}

// refuseCandidateRanges refuses candidate spots with their own ranges in
// a command that counts devices in reach at one common range.
func refuseCandidateRanges(sc *scene, command string, in siteinput.Inputs) error {
	if sc.candidates == nil || sc.candidates.Ranges == nil {
		return nil
	}
	return inputErrorf("%s: the candidate spots have their own ranges (range column or type table); %s counts devices in reach at one common range: give only --range", in.Candidates.Name, command)
}
