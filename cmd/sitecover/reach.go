// analyze --reach: k-coverage ("reached by k devices") of the layout,
// computed by coverage.KCover and written by report (kcover.go there).

package main

import (
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
)

// reachCurveSamples is the number of ranges on each coverage-depth curve
// of summary.json.
const reachCurveSamples = 65

// parseReach parses the --reach list ("2" or "2,3"): whole numbers ≥ 1.
// Empty means no k-coverage. Errors are usage errors (exit 2).
func parseReach(s string) ([]int, error) {
	if strings.TrimSpace(s) == "" {
		return nil, nil
	}
	var ks []int
	for _, part := range strings.Split(s, ",") {
		p := strings.TrimSpace(part)
		k, err := strconv.Atoi(p)
		if err != nil {
			return nil, usageErrorf("--reach %q: %q is not a whole number of devices (e.g. --reach 2 or --reach 2,3)", s, p)
		}
		if k < 1 {
			return nil, usageErrorf("--reach %q: k = %d must be at least 1", s, k)
		}
		ks = append(ks, k)
	}
	return ks, nil
}

// runReach computes the k-coverage for --reach (nil without it): every k
// from 1 to the largest listed, so that the map can colour each count.
func runReach(pr *progress, f *runFlags, a *coverage.Analysis, r float64) (*coverage.KCoverage, error) {
	return reachLevels(pr, f, a.Layout, func(K int) (*coverage.KCoverage, error) {
		return coverage.KCover(a.Layout, r, coverage.KOptions{MaxK: K, CurveSamples: reachCurveSamples, Gaps: true})
	})
}

// runReachRanges is runReach for devices with their own ranges
// (coverage.KCoverRanges; hidden devices count, duplicates once).
func runReachRanges(pr *progress, f *runFlags, l *coverage.Layout) (*coverage.KCoverage, error) {
	return reachLevels(pr, f, l, func(K int) (*coverage.KCoverage, error) {
		return coverage.KCoverRanges(l, coverage.KOptions{MaxK: K, CurveSamples: reachCurveSamples, Gaps: true})
	})
}

// reachLevels parses --reach and runs compute up to its largest k,
// turning "k too large" into a usage error.
func reachLevels(pr *progress, f *runFlags, l *coverage.Layout, compute func(K int) (*coverage.KCoverage, error)) (*coverage.KCoverage, error) {
	ks, err := parseReach(f.reach)
	if err != nil || ks == nil {
		return nil, err
	}
	K := slices.Max(ks)
	pr.set(fmt.Sprintf("k-coverage up to k = %d", K))
	kc, err := compute(K)
	if errors.Is(err, coverage.ErrKTooLarge) {
		return nil, usageErrorf("--reach %s: k = %d but only %d distinct device positions (devices at the same spot count once)",
			f.reach, K, reachDistinct(l))
	}
	if err != nil {
		return nil, inputErrorf("%v", err)
	}
	return kc, nil
}

// reachDistinct returns the number of distinct device positions.
func reachDistinct(l *coverage.Layout) int {
	seen := make(map[[2]float64]bool, len(l.Sites))
	for _, p := range l.Sites {
		seen[[2]float64{p[0], p[1]}] = true
	}
	return len(seen)
}

// printReach prints the k-coverage headline figures.
func printReach(w io.Writer, d *report.SummaryDoc) { printReachDoc(w, d.Reach) }

// printReachDoc prints the k-coverage headline figures of a reach
// document (nil: nothing); with own ranges the ranges each group of
// devices needs for k devices everywhere.
func printReachDoc(w io.Writer, d *report.ReachDoc) {
	if d == nil {
		return
	}
	for _, lv := range d.Levels {
		name := fmt.Sprintf("reached by %d+ devices", lv.K)
		if !d.OwnRanges {
			fmt.Fprintf(w, "  %-24s %s %% (k-cover range %s m, %d parts short)\n", name,
				fmtNum(100*lv.CoveredFraction, 2), fmtNum(lv.CoverRangeM, 2), len(lv.Gaps))
			continue
		}
		fmt.Fprintf(w, "  %-24s %s %% (%s short; all of it at %s)\n", name,
			fmtNum(100*lv.CoveredFraction, 2), report.Plural(len(lv.Gaps), "part"), report.ReachNeededText(d.RangeGroups, lv.CoverRanges))
	}
}
