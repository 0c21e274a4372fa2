// suggest --reach K --candidates FILE [--add N]: the fewest candidate
// spots (or N of them) so that every spot of the site is reached by at
// least K devices at --range (coverage.ChooseCandidatesReach), or with
// devices or spots of their own ranges at those ranges, a spot without one
// at --range or of --new-type (coverage.ChooseCandidatesReachRanges),
// written by report.WriteReachPlan like the free placement of suggest
// --reach.

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
                          short when the spots cannot do it. With devices or
                          spots of their own ranges (range or type column)
                          every spot is reached by K at those ranges, a spot
                          without one at --range or of --new-type.
`

// runCandidatesReach runs suggest --reach K --candidates FILE; K is parsed.
func runCandidatesReach(e *env, cmd *cobra.Command, f *runFlags, K int) error {
	fl := cmd.Flags()
	picks := 0
	if fl.Changed("add") {
		n, err := fl.GetInt("add")
		if err != nil || n <= 0 || n > maxAdd {
			return inputErrorf("--add %d: must be a whole number of spots from 1 to %d", n, maxAdd)
		}
		picks = n
	}
	ps := planSpec{move: report.MoveCandidates}
	if fl.Changed("new-type") {
		ps.newType = fl.Lookup("new-type").Value.String()
	}
	in, err := f.planInputs(cmd, &ps)
	if err != nil {
		return err
	}
	if in.Candidates, err = openSource(fl.Lookup("candidates").Value.String(), "--candidates"); err != nil {
		return err
	}
	return asInput(candidatesReach(e, cmd, f, in, ps, K, picks))
}

// candidatesReach computes and writes the choice: at one common range
// (coverage.ChooseCandidatesReach), or with devices or spots of their own
// ranges (coverage.ChooseCandidatesReachRanges).
func candidatesReach(e *env, cmd *cobra.Command, f *runFlags, in siteinput.Inputs, ps planSpec, K, picks int) error {
	sc, pr, err := startRun(e, "suggest", f, in)
	if err != nil {
		return err
	}
	defer pr.end()
	cands := sc.candidates
	r, ranges, candR := ps.r, sc.ranges, []float64(nil)
	own := ranges != nil || ps.newType != "" || cands.Ranges != nil
	switch {
	case !own && !ps.rangeGiven:
		return usageErrorf("--reach with --candidates needs --range: the range at which every spot must be reached by K devices (see '%s --help')", cmd.CommandPath())
	case own:
		if r, candR, ranges, err = reachCandidateRanges(sc, in, ps); err != nil {
			return err
		}
	}
	fail := reachFail(in)
	l, err := reachLayout(pr, sc, ranges)
	if err != nil {
		return fail(err)
	}
	pr.set(fmt.Sprintf("choosing among %d candidate spots for %d devices in reach", len(cands.Pts), K))
	p := &report.ReachPlan{Layout: l, Candidates: cands.Pts, CandidateNames: cands.Names}
	if own {
		p.Choice, err = coverage.ChooseCandidatesReachRanges(l, cands.Pts, candR, K, picks)
	} else {
		p.Choice, err = coverage.ChooseCandidatesReach(l, cands.Pts, K, r, picks)
	}
	if err != nil {
		return fail(err)
	}
	if !p.Choice.OwnRanges && own {
		// Every range equal: the common-range choice, written as one.
		r, ranges, candR, own, sc.meta.Ranges = p.Choice.Range, nil, nil, false, nil
	}
	if own {
		p.CandidateRanges, p.NewType = candR, ps.newType
		if ps.newType != "" {
			// The spots without a range of their own are of --new-type.
			p.CandidateTypes = make([]string, len(candR))
			for i := range candR {
				if cands.Ranges == nil || cands.Ranges[i] == 0 {
					p.CandidateTypes[i] = ps.newType
				}
			}
		}
	}
	var added []orb.Point
	var addedR []float64
	for _, pk := range p.Choice.Picks {
		added = append(added, pk.Position)
		if own {
			addedR = append(addedR, candR[pk.Candidate])
		}
	}
	return finishReach(e, f, pr, sc, fail, p, added, addedR, K, r, ranges, func(w io.Writer) { printReachChoice(w, p, sc.meta, K, picks) })
}

// reachCandidateRanges returns, for suggest --reach --candidates with
// devices or spots of their own ranges, the default range of a spot (r:
// --range or --new-type; 0 when neither is given), each spot's range and
// each existing device's (a common --range repeated; sc.meta.Ranges set
// to them).
func reachCandidateRanges(sc *scene, in siteinput.Inputs, ps planSpec) (r float64, candR, ranges []float64, err error) {
	if ps.rangeGiven || ps.newType != "" {
		if r, err = newDeviceRange(sc, in, ps); err != nil {
			return 0, nil, nil, err
		}
	}
	if ranges = sc.ranges; ranges == nil {
		if sc.rangeM <= 0 {
			return 0, nil, nil, usageErrorf("the existing devices have no range: give --range, a range column or a type column")
		}
		ranges = repeatRange(sc.rangeM, len(sc.sites))
		sc.meta.Ranges = ranges
	}
	if candR, err = fillCandidateRanges(sc, r); err != nil {
		return 0, nil, nil, err
	}
	if candR == nil {
		if r <= 0 {
			return 0, nil, nil, usageErrorf("the devices have their own ranges: give the candidate spots' range with --range LENGTH or --new-type TYPE")
		}
		candR = repeatRange(r, len(sc.candidates.Pts))
	}
	return r, candR, ranges, nil
}

// printReachChoice prints the figures of suggest --reach --candidates (m
// the metadata of the existing devices).
func printReachChoice(w io.Writer, p *report.ReachPlan, m report.Meta, K, picks int) {
	ch := p.Choice
	fmt.Fprintf(w, "  %-24s %d of %d\n", "candidate spots picked", len(ch.Picks), len(p.Candidates))
	if ch.OwnRanges {
		before, after := report.ReachPlanNeeded(p, m)
		fmt.Fprintf(w, "  %-24s before: %s\n  %-24s after:  %s\n", fmt.Sprintf("%d-cover ranges", K), before, "", after)
	} else {
		fmt.Fprintf(w, "  %-24s %s m before, %s m after\n", fmt.Sprintf("%d-cover range", K), reachRangeOut(ch.CoverRangeBefore), reachRangeOut(ch.CoverRangeAfter))
	}
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
		if ch.OwnRanges {
			fmt.Fprintf(w, "  %4d  %s (%s m): reached by %d+ %s %%\n", j+1, report.ItemLabel(p.CandidateNames[pk.Candidate], "candidate", pk.Candidate),
				fmtNum(pk.Range, 2), K, fmtNum(100*pk.Share, 2))
			continue
		}
		fmt.Fprintf(w, "  %4d  %s: %s-cover range %s m, reached by %d+ %s %%\n", j+1, report.ItemLabel(p.CandidateNames[pk.Candidate], "candidate", pk.Candidate),
			fmt.Sprint(K), reachRangeOut(pk.CoverRange), K, fmtNum(100*pk.Share, 2))
	}
}
