// AnalyzeRanges: the whole coverage analysis when each device has its own
// range.
//
// It chains the pieces of ranges*.go exactly as Analyze chains the
// common-range ones: the regular triangulation and clipped power cells,
// the full-cover figure (largest power at a cell vertex), the uncovered
// area at the planned ranges (closed-form polygon–disk areas per power
// cell), the coverage curve under uniform power growth and its inverse,
// the gaps with what closes each, the persistence of the weighted alpha
// filtration with the Betti numbers of the union at the planned ranges,
// the link network and the hidden devices. Every power t is a uniform
// growth of all devices' powers; the matching ranges are √(r_i² + t)
// (Layout.GrownRanges). With all ranges equal, Common holds Analyze's
// result at that range, figure for figure, and the figures here are taken
// from it (the gaps traced again for their closings).

package coverage

import (
	"fmt"
	"math"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// PowerAt pairs a covered fraction with the uniform power growth reaching
// it.
type PowerAt struct {
	// Fraction is the covered fraction of the site area, in [0, 1].
	Fraction float64
	// Power is the smallest growth t (m²) with at least that covered
	// fraction; the devices' ranges are then √(r_i² + t).
	Power float64
}

// RangesAnalysis is the result of AnalyzeRanges.
type RangesAnalysis struct {
	// Layout is the layout with its regular triangulation and power cells.
	Layout *Layout
	// FullCover is the full-cover figure under uniform power growth.
	FullCover RangesFullCover
	// CoveredFraction and UncoveredArea (m²) are at the planned ranges.
	CoveredFraction float64
	UncoveredArea   float64
	// Gaps are the components of the uncovered area at the planned
	// ranges, each with its Closing.
	Gaps []Gap
	// Percentiles are the smallest uniform power growths reaching the
	// requested covered fractions, in the order requested.
	Percentiles []PowerAt
	// Persistence holds the pairs of the weighted alpha filtration.
	Persistence *PowerPersistence
	// HoleClosings holds, per hole of Persistence (same order), what
	// closes it in metres when it is open at the planned ranges; nil
	// entries for the others.
	HoleClosings []*HoleClosing
	// Pieces and EnclosedHoles are the Betti numbers of the union of the
	// disks at the planned ranges (in the whole plane).
	Pieces, EnclosedHoles int
	// ConnectPower is the growth t at which the union of disks becomes one
	// piece (the last merge; the smallest −r_i² for a single device).
	ConnectPower float64
	// Links is the network of devices linked two-way by their ranges.
	Links LinkSummary
	// Hidden lists the input indices of devices redundant for coverage.
	Hidden []int
	// Common is Analyze's result at the common range when all ranges are
	// equal; nil otherwise.
	Common *Analysis
	// Timings lists the phases in order.
	Timings []Timing
}

// AnalyzeRanges runs the full analysis of devices at sites with their own
// ranges (metres, one per site, positive and finite) over area. opt is as
// for Analyze (ChordTolerance relative to each arc's own radius). Errors
// name the offending input.
//
// The links read only the sites and ranges, and the persistence only the
// triangulation, so they run on their own goroutines: the links beside the
// triangulation (which is serial), the persistence, once the triangulation
// is built, beside the clipping, the full cover and the curve (not beside
// the gaps, whose working set is the largest). Each Timing is then that phase's
// own elapsed time, the phases overlapping. The results are those of
// running the phases in turn.
func AnalyzeRanges(sites []orb.Point, ranges []float64, area *planar.Region, opt Options) (*RangesAnalysis, error) {
	pct, err := opt.percentiles()
	if err != nil {
		return nil, err
	}
	if len(ranges) == len(sites) && len(ranges) > 0 && rangesEqual(ranges) {
		return analyzeEqualRanges(sites, ranges, area, opt, pct)
	}
	if err := checkRanges(sites, ranges); err != nil {
		return nil, err
	}
	a := &RangesAnalysis{}
	links := a.startLinks(sites, ranges)
	var pers *phaseRun
	l, tTri, tClip, err := newLayoutRangesTimed(sites, ranges, area, func(l *Layout) { pers = a.startPersistence(l) })
	if err != nil {
		pers.wait()
		links.wait()
		return nil, err
	}
	a.Layout, a.Hidden = l, l.Hidden
	a.Timings = append(a.Timings, Timing{"triangulate", tTri}, Timing{"clip", tClip})

	t0 := time.Now()
	a.FullCover = l.FullCoverRanges()
	a.Timings = append(a.Timings, Timing{"fullcover", time.Since(t0).Seconds()})

	t0 = time.Now()
	a.UncoveredArea = l.UncoveredAreaGrown(0)
	a.CoveredFraction = coveredFromUncovered(a.UncoveredArea, l.AreaM2)
	a.Percentiles = make([]PowerAt, len(pct))
	for i, t := range l.CurveRanges().RangesFor(pct) {
		a.Percentiles[i] = PowerAt{Fraction: pct[i], Power: t}
	}
	a.Timings = append(a.Timings, Timing{"curve", time.Since(t0).Seconds()})
	// The gaps' working set is the largest of all phases: the persistence
	// ends before they start, so that the two do not add up at the peak.
	pers.wait()
	a.finish(opt, pers, links)
	return a, nil
}

// rangesEqual reports whether all ranges are the same number.
func rangesEqual(ranges []float64) bool {
	for _, r := range ranges {
		if r != ranges[0] {
			return false
		}
	}
	return true
}

// analyzeEqualRanges is AnalyzeRanges for one common range r: Analyze at r
// (Common) with its figures restated as powers t = ρ² − r², and the
// gaps' closings, the weighted persistence and the links added.
func analyzeEqualRanges(sites []orb.Point, ranges []float64, area *planar.Region, opt Options, pct []float64) (*RangesAnalysis, error) {
	r0 := ranges[0]
	if math.IsNaN(r0) || math.IsInf(r0, 0) || !(r0 > 0) {
		return nil, fmt.Errorf("coverage: site 0 has range %v m; a range must be a positive finite number", r0)
	}
	a := &RangesAnalysis{}
	links := a.startLinks(sites, ranges)
	c, err := Analyze(sites, area, r0, Options{ChordTolerance: opt.ChordTolerance, Percentiles: pct})
	if err != nil {
		links.wait()
		return nil, err
	}
	l := c.Layout
	l.Ranges = make([]float64, l.numVertices())
	for v := range l.Ranges {
		l.Ranges[v] = r0
	}
	l.InputRanges, l.Hidden = append([]float64(nil), ranges...), []int{}
	a.Layout, a.Hidden, a.Common, a.Timings = l, l.Hidden, c, c.Timings[:4:4]
	a.UncoveredArea, a.CoveredFraction = c.UncoveredArea, c.CoveredFraction
	a.FullCover = l.FullCoverRanges()
	a.Percentiles = make([]PowerAt, len(pct))
	for i, p := range c.Percentiles {
		a.Percentiles[i] = PowerAt{Fraction: p.Fraction, Power: p.Range*p.Range - r0*r0}
	}
	a.finish(opt, a.startPersistence(l), links)
	return a, nil
}

// phaseRun is a phase running on its own goroutine.
type phaseRun struct {
	done chan struct{}
	secs float64
}

// startPhase runs f on a new goroutine, timing it.
func startPhase(f func()) *phaseRun {
	p := &phaseRun{done: make(chan struct{})}
	go func() {
		defer close(p.done)
		t0 := time.Now()
		f()
		p.secs = time.Since(t0).Seconds()
	}()
	return p
}

// wait waits for the phase to end and returns its elapsed seconds (0 for
// nil: no phase was started).
func (p *phaseRun) wait() float64 {
	if p == nil {
		return 0
	}
	<-p.done
	return p.secs
}

// startLinks finds the links of the devices into a.Links on a goroutine.
func (a *RangesAnalysis) startLinks(sites []orb.Point, ranges []float64) *phaseRun {
	return startPhase(func() { a.Links = LinksRanges(sites, ranges) })
}

// startPersistence computes, on a goroutine, the persistence of l's
// weighted alpha filtration into a with the hole closings and the union's
// Betti numbers at the planned ranges. It reads l's triangulation and
// ranges only, never its cells.
func (a *RangesAnalysis) startPersistence(l *Layout) *phaseRun {
	return startPhase(func() {
		p, f := l.persistenceRanges()
		a.Persistence = p
		a.HoleClosings = l.holeClosings(p, f)
		a.Pieces, a.EnclosedHoles = p.Betti(0)
		a.ConnectPower = p.Births[0]
		for _, m := range p.Merges {
			a.ConnectPower = math.Max(a.ConnectPower, m.Death)
		}
	})
}

// finish adds the gaps to a while the persistence and the links (started
// by the caller) run, and the phases' timings in order.
func (a *RangesAnalysis) finish(opt Options, pers, links *phaseRun) {
	t0 := time.Now()
	a.Gaps = a.Layout.GapsRanges(0, opt.ChordTolerance)
	a.Timings = append(a.Timings, Timing{"gaps", time.Since(t0).Seconds()})
	a.Timings = append(a.Timings, Timing{"persistence", pers.wait()}, Timing{"links", links.wait()})
}
