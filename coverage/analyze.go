// Analyze: the whole coverage analysis of a layout at one planned range.
//
// It chains the exact pieces of this package: triangulation and clipped
// cells (planar), the full-cover range (max vertex distance per cell), the
// covered fraction and uncovered area (closed-form polygon–disk areas), the
// ranges covering given fractions (inverse of the exact curve, to 1e-9 of
// the full-cover range), the gaps (exact tracing and union across
// bisectors) and the persistence of the alpha filtration with the Betti
// numbers of the union of disks at the range. The numbers carry the error
// bounds of the functions that produce them.

package coverage

import (
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// DefaultPercentiles are the covered fractions whose ranges Analyze
// reports by default.
var DefaultPercentiles = []float64{0.5, 0.9, 0.95, 0.99}

// Options tunes Analyze. The zero value gives the defaults.
type Options struct {
	// ChordTolerance is the largest sagitta of the chords replacing arcs in
	// gap outlines, relative to the range (0: DefaultChordTolerance, 0.002;
	// negative: no outlines).
	ChordTolerance float64
	// Percentiles are the covered fractions, each in [0, 1], for which the
	// smallest sufficient range is reported (nil: DefaultPercentiles).
	Percentiles []float64
	// LayoutReady, when not nil, is called with the layout as soon as it
	// is built (triangulated and clipped), before the rest of the
	// analysis. The rest only reads the layout, so the callee may go on
	// reading it concurrently, e.g. to start writing the outputs that need
	// nothing else.
	LayoutReady func(*Layout)
}

// percentiles checks the options and returns the percentiles asked for
// (DefaultPercentiles when nil).
func (opt Options) percentiles() ([]float64, error) {
	if math.IsNaN(opt.ChordTolerance) || math.IsInf(opt.ChordTolerance, 0) {
		return nil, errors.New("coverage: chord tolerance is not a finite number")
	}
	pct := opt.Percentiles
	if pct == nil {
		pct = DefaultPercentiles
	}
	for i, f := range pct {
		if !(f >= 0 && f <= 1) {
			return nil, fmt.Errorf("coverage: percentile %d (%v) is not a fraction in [0, 1]", i, f)
		}
	}
	return pct, nil
}

// Timing is the wall-clock time of one phase of Analyze.
type Timing struct {
	// Phase is one of triangulate, clip, fullcover, curve, gaps,
	// persistence, and links (AnalyzeRanges).
	Phase string
	// Seconds is the elapsed time.
	Seconds float64
}

// Analysis is the result of Analyze.
type Analysis struct {
	// Layout is the triangulated layout with its clipped cells.
	Layout *Layout
	// Range is the planned range analysed (metres).
	Range float64
	// FullCover is the smallest range covering the whole area.
	FullCover FullCover
	// CoveredFraction is the covered fraction of the area at Range.
	CoveredFraction float64
	// UncoveredArea is the uncovered area at Range (m²).
	UncoveredArea float64
	// Gaps are the components of the uncovered area at Range.
	Gaps []Gap
	// Percentiles are the smallest ranges reaching the requested covered
	// fractions, in the order requested.
	Percentiles []RangeAt
	// Persistence holds the persistence pairs of the alpha filtration.
	Persistence *Persistence
	// Pieces and EnclosedHoles are the Betti numbers of the union of the
	// disks of radius Range (in the whole plane, not clipped to the area).
	Pieces, EnclosedHoles int
	// Timings lists the phases in order.
	Timings []Timing
}

// Analyze runs the full analysis of sites over area at range r (metres).
// r must be finite and >= 0 (r = 0: nothing is covered and the whole area
// is gaps). Errors name the offending input.
func Analyze(sites []orb.Point, area *planar.Region, r float64, opt Options) (*Analysis, error) {
	if math.IsNaN(r) || math.IsInf(r, 0) {
		return nil, fmt.Errorf("coverage: range %v is not a finite number", r)
	}
	if r < 0 {
		return nil, fmt.Errorf("coverage: range %v m is negative", r)
	}
	pct, err := opt.percentiles()
	if err != nil {
		return nil, err
	}
	tol := opt.ChordTolerance
	if tol == 0 {
		tol = DefaultChordTolerance
	}

	l, tTri, tClip, err := newLayoutTimed(sites, area)
	if err != nil {
		return nil, err
	}
	if opt.LayoutReady != nil {
		opt.LayoutReady(l)
	}
	a := &Analysis{Layout: l, Range: r}
	a.Timings = append(a.Timings, Timing{"triangulate", tTri}, Timing{"clip", tClip})

	t0 := time.Now()
	a.FullCover = l.FullCover()
	a.Timings = append(a.Timings, Timing{"fullcover", time.Since(t0).Seconds()})

	t0 = time.Now()
	a.UncoveredArea = l.UncoveredArea(r)
	a.CoveredFraction = coveredFromUncovered(a.UncoveredArea, l.AreaM2)
	cv := l.Curve()
	rs := cv.RangesFor(pct)
	a.Percentiles = make([]RangeAt, len(pct))
	for i, f := range pct {
		a.Percentiles[i] = RangeAt{Fraction: f, Range: rs[i]}
	}
	a.Timings = append(a.Timings, Timing{"curve", time.Since(t0).Seconds()})

	t0 = time.Now()
	a.Gaps = l.Gaps(r, tol)
	a.Timings = append(a.Timings, Timing{"gaps", time.Since(t0).Seconds()})

	t0 = time.Now()
	f := NewFiltration(l.Tri)
	a.Persistence = ComputePersistence(l.Tri, f)
	a.Pieces, a.EnclosedHoles = a.Persistence.Betti(r)
	a.Timings = append(a.Timings, Timing{"persistence", time.Since(t0).Seconds()})
	return a, nil
}
