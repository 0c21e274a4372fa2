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
	ks, err := parseReach(f.reach)
	if err != nil || ks == nil {
		return nil, err
	}
	K := slices.Max(ks)
	pr.set(fmt.Sprintf("k-coverage up to k = %d", K))
	kc, err := coverage.KCover(a.Layout, r, coverage.KOptions{MaxK: K, CurveSamples: reachCurveSamples, Gaps: true})
	if errors.Is(err, coverage.ErrKTooLarge) {
		return nil, usageErrorf("--reach %s: k = %d but only %d distinct device positions (devices at the same spot count once)",
			f.reach, K, a.Layout.Tri.NumVertices())
	}
	if err != nil {
		return nil, inputErrorf("%v", err)
	}
	return kc, nil
}

// printReach prints the k-coverage headline figures.
func printReach(w io.Writer, d *report.SummaryDoc) {
	if d.Reach == nil {
		return
	}
	for _, lv := range d.Reach.Levels {
		fmt.Fprintf(w, "  %-24s %s %% (k-cover range %s m, %d parts short)\n", fmt.Sprintf("reached by %d+ devices", lv.K),
			fmtNum(100*lv.CoveredFraction, 2), fmtNum(lv.CoverRangeM, 2), len(lv.Gaps))
	}
}
