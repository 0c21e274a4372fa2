// The coverage curve and hole-lifetimes charts of devices with their own
// ranges, drawn with gonum.org/v1/plot as charts.go's.
//
// The covered share of the area as all ranges grow together (every
// device's r² by the same amount t, coverage.Layout.CurveRanges: exact
// samples joined by straight segments). The x-axis is the range of the
// reference devices (the longest planned range, ranges_holes.go),
// √(r_ref² + t): in metres, 0 where those devices' disks appear, their
// planned range at the plan itself. The markers at the planned ranges, 95 %
// and full cover say in the legend what the other device types then have.
//
// Hole lifetimes: each hole of the union of disks (the weighted alpha
// filtration's persistence, coverage.PowerPersistence) as the point
// (appears, closes), both in the reference devices' range √(r_ref² + t) of
// the HOLES section (ranges_holes.go). That map of t is increasing, so the
// diagram keeps its order: a hole is open at the planned ranges (t = 0)
// exactly when it lies left of x = r_ref and above y = r_ref, and its
// distance above the diagonal is its lifetime in reference metres (the
// HOLES section's order). Every hole appears near the reference devices'
// planned range (their disks are the largest), so the axes start at a
// round value below the earliest appearance rather than at 0.

package report

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// maxLegendTypes is the most other device types a chart legend entry
// names (the rest are summarised as "…").
const maxLegendTypes = 3

// othersAt lists the planned-range groups other than the reference with
// their ranges after growth t ("sensor 78 m, siren 260 m").
func (rs *rangesScene) othersAt(t float64) string {
	var parts []string
	for _, g := range rs.groups(nil) {
		if g.Type == rs.refType && g.RangeM == rs.refM {
			continue
		}
		if len(parts) == maxLegendTypes {
			parts = append(parts, "…")
			break
		}
		parts = append(parts, typeName(g.Type)+" "+metresShort(math.Sqrt(math.Max(0, g.RangeM*g.RangeM+t))))
	}
	return strings.Join(parts, ", ")
}

// growthAt returns the smallest growth covering fraction f of the area.
func (rs *rangesScene) growthAt(f float64) float64 {
	for _, p := range rs.ra.Percentiles {
		if math.Abs(p.Fraction-f) < 1e-9 {
			return p.Power
		}
	}
	return rs.l.CurveRanges().RangeFor(f)
}

func (rs *rangesScene) curveChartRanges(width int) ([]byte, error) {
	a := rs.ra
	tFull, t95 := a.FullCover.Power, rs.growthAt(0.95)
	full, x95 := rs.refRange(tFull), rs.refRange(t95)
	xmax := 1.08 * math.Max(math.Max(full, rs.refM), 1e-9)

	smp := rs.l.CurveRanges().Samples(curveSamples)
	xy := make(plotter.XYs, 0, len(smp)+1)
	for _, s := range smp {
		xy = append(xy, plotter.XY{X: rs.refRange(s.Range), Y: 100 * s.Fraction})
	}
	if n := len(xy); n > 0 && xy[n-1].X < xmax {
		xy = append(xy, plotter.XY{X: xmax, Y: xy[n-1].Y})
	}
	title := "Covered share of the site area as all ranges grow together"
	if rs.m.Title != "" {
		title = rs.m.Title + "\n" + title
	}
	with := func(t float64) string {
		if o := rs.othersAt(t); o != "" {
			return " (" + o + ")"
		}
		return ""
	}
	return curvePlot(title, fmt.Sprintf("Range of %s, all devices' r² growing by the same amount (m)", rs.refName()), xmax, xy, []curveMark{
		{rs.refM, fmt.Sprintf("planned ranges, %s%s: %s %%", metresShort(rs.refM), with(0), CoveredPercent(a.CoveredFraction, a.UncoveredArea, 2)),
			oiBlue, []vg.Length{vg.Points(6), vg.Points(3)}},
		{x95, fmt.Sprintf("95 %% covered at %s%s", metresShort(x95), with(t95)), oiOrange, []vg.Length{vg.Points(2), vg.Points(2)}},
		{full, fmt.Sprintf("full cover at %s%s", metresShort(full), with(tFull)), oiVermilion, nil},
	}, width)
}

// holeChartRanges draws the hole lifetimes in reference metres (file
// comment), marking the holes report.txt marks.
func (rs *rangesScene) holeChartRanges(width int) ([]byte, error) {
	holes := rs.lifetimes()
	title := Plural(len(holes), "hole") + " of the union of disks (not gaps): when each appears and closes\nas all ranges grow together"
	if rs.m.Title != "" {
		title = rs.m.Title + "\n" + title
	}
	planned := metresShort(rs.refM)
	if rs.refType != "" {
		planned = rs.refType + " " + planned
	}
	if o := rs.othersAt(0); o != "" {
		planned += ", " + o
	}
	return lifetimePlot(lifetimeChart{
		title:  title,
		xLabel: fmt.Sprintf("Range of %s when the hole appears (m)", rs.refName()),
		yLabel: "Their range when it closes (m)",
		holes:  holes, planned: rs.refM, zoom: true,
		plannedLabel: fmt.Sprintf("planned ranges: %s (holes open there: upper left)", planned),
		markedLabel:  fmt.Sprintf("hole closing outside the site or living < %s (marked in report.txt)", metresShort(briefHoleFraction*rs.refM)),
	}, width)
}

// lifetimes returns each hole's appearance and closing in reference metres
// and whether report.txt marks it.
func (rs *rangesScene) lifetimes() []lifetime {
	var holes []lifetime
	if p := rs.ra.Persistence; p != nil {
		notes := rs.rangesHoleNotes()
		for k, h := range p.Holes {
			holes = append(holes, lifetime{rs.refRange(h.Birth), rs.refRange(h.Death), notes[k] != ""})
		}
	}
	return holes
}
