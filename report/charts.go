// The two PNG charts, drawn with gonum.org/v1/plot.
//
// Coverage curve: the covered share of the area against the common range,
// from the analysis's exact curve (sampled, then joined by straight
// segments; the samples are exact values, the segments between them an
// interpolation), with vertical markers at the planned range, the 95 %
// range and the full-cover range.
//
// Hole lifetimes: each hole of the union of disks as a point (range at
// which it appears, range at which it closes) above the diagonal; the
// farther from the diagonal, the longer the hole lives (persistence
// diagram; Edelsbrunner & Harer, Computational Topology, AMS 2010, §VII).
// The chart of devices with their own ranges (ranges_charts.go) draws the
// same way, in the reference devices' range.

package report

import (
	"bytes"
	"fmt"
	"image/color"
	"image/png"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// curveSamples is the number of exact samples of the coverage curve (one
// every 7 px or so at 1600 px; the curve is smooth between them).
const curveSamples = 200

// chartSize returns the pixel size and DPI of a chart of width w: fonts
// scale with the width (12 pt text is 32 px at 1600 px).
func chartSize(w int) (int, int, int) {
	dpi := max(48, int(math.Round(96*float64(w)/800)))
	return w, int(math.Round(0.62 * float64(w))), dpi
}

func renderPlot(p *plot.Plot, w int) ([]byte, error) {
	pw, ph, dpi := chartSize(w)
	inch := func(px int) vg.Length { return vg.Length(float64(px)/float64(dpi)) * vg.Inch }
	c := vgimg.NewWith(vgimg.UseWH(inch(pw), inch(ph)), vgimg.UseDPI(dpi))
	p.Draw(draw.New(c))
	var b bytes.Buffer
	if err := (&png.Encoder{CompressionLevel: png.BestSpeed}).Encode(&b, c.Image()); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

func styleAxes(p *plot.Plot) {
	sans := func(f *font.Font) { f.Typeface, f.Variant = "Liberation", "Sans" }
	sans(&p.Title.TextStyle.Font)
	sans(&p.X.Label.TextStyle.Font)
	sans(&p.Y.Label.TextStyle.Font)
	sans(&p.X.Tick.Label.Font)
	sans(&p.Y.Tick.Label.Font)
	sans(&p.Legend.TextStyle.Font)
	p.Title.TextStyle.Font.Size = vg.Points(15)
	p.Title.Padding = vg.Points(8)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font.Size = vg.Points(12)
		ax.Tick.Label.Font.Size = vg.Points(10.5)
	}
	p.Legend.TextStyle.Font.Size = vg.Points(10.5)
	p.Add(plotter.NewGrid())
}

func vline(x, y0, y1 float64, col color.Color, dashes []vg.Length, width float64) (*plotter.Line, error) {
	l, err := plotter.NewLine(plotter.XYs{{X: x, Y: y0}, {X: x, Y: y1}})
	if err != nil {
		return nil, err
	}
	l.Color = col
	l.Width = vg.Points(width)
	l.Dashes = dashes
	return l, nil
}

func (s *scene) curveChart(width int) ([]byte, error) {
	a := s.a
	full := a.FullCover.Range
	p95 := s.rangeAt(0.95)
	xmax := 1.08 * math.Max(math.Max(full, a.Range), 1e-9)

	title := "Covered share of the site area against range"
	if s.m.Title != "" {
		title = s.m.Title + "\n" + title
	}
	return curvePlot(title, "Range (m)", xmax, s.curvePoints(xmax), []curveMark{
		{a.Range, fmt.Sprintf("planned range %s: %s %%", metresShort(a.Range), CoveredPercent(a.CoveredFraction, a.UncoveredArea, 2)), oiBlue, []vg.Length{vg.Points(6), vg.Points(3)}},
		{p95, fmt.Sprintf("95 %% covered at %s", metresShort(p95)), oiOrange, []vg.Length{vg.Points(2), vg.Points(2)}},
		{full, fmt.Sprintf("full cover at %s", metresShort(full)), oiVermilion, nil},
	}, width)
}

// curveMark is a vertical marker of a coverage curve chart, with its
// legend entry.
type curveMark struct {
	x      float64
	label  string
	col    color.Color
	dashes []vg.Length
}

// curvePlot draws a coverage curve chart: the covered share xy (percent)
// against an x-axis from 0 to xmax, with the markers (also used by the
// chart of devices with their own ranges, ranges_charts.go).
func curvePlot(title, xLabel string, xmax float64, xy plotter.XYs, marks []curveMark, width int) ([]byte, error) {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = xLabel
	p.Y.Label.Text = "Area covered (%)"
	p.X.Min, p.X.Max = 0, xmax
	p.X.Tick.Marker = niceTicks{}
	// headroom above 100 % holds the legend clear of the curve and markers
	p.Y.Min, p.Y.Max = 0, 128
	p.Y.Tick.Marker = percentTicks{}
	styleAxes(p)

	line, err := plotter.NewLine(xy)
	if err != nil {
		return nil, err
	}
	line.Color = colInk
	line.Width = vg.Points(1.8)
	p.Add(line)
	p.Legend.Add("covered share", line)
	for _, m := range marks {
		l, err := vline(m.x, 0, 100, m.col, m.dashes, 1.6)
		if err != nil {
			return nil, err
		}
		p.Add(l)
		p.Legend.Add(m.label, l)
	}
	p.Legend.Left = true
	p.Legend.Top = true
	p.Legend.XOffs = vg.Points(8)
	p.Legend.YOffs = vg.Points(-4)
	return renderPlot(p, width)
}

// percentTicks marks 0..100 % only (the axis runs higher to make room
// for the legend).
type percentTicks struct{}

// Ticks returns major ticks every 20 % and minor ticks every 10 %.
func (percentTicks) Ticks(min, max float64) []plot.Tick {
	var t []plot.Tick
	for v := 0; v <= 100; v += 10 {
		tk := plot.Tick{Value: float64(v)}
		if v%20 == 0 {
			tk.Label = fmt.Sprint(v)
		}
		t = append(t, tk)
	}
	return t
}

// niceTicks labels an axis every 1, 2 or 5 × 10^k units, 5 to 10 labels.
type niceTicks struct{}

// Ticks returns labelled major ticks and unlabelled minor ticks halfway.
func (niceTicks) Ticks(min, max float64) []plot.Tick {
	if !(max > min) {
		return nil
	}
	step := niceLength((max - min) / 5)
	var t []plot.Tick
	for k := math.Ceil(min/step*2) / 2; k*step <= max+1e-9*step; k += 0.5 {
		v := k * step
		tk := plot.Tick{Value: v}
		if math.Abs(k-math.Round(k)) < 1e-9 {
			tk.Label = trimFloat(v)
		}
		t = append(t, tk)
	}
	return t
}

// curvePoints samples the coverage curve in percent: exact samples from 0
// to the full-cover range (Curve.Samples, which includes the curve's
// breakpoints), then the flat 100 % up to xmax.
func (s *scene) curvePoints(xmax float64) plotter.XYs {
	smp := s.l.Curve().Samples(curveSamples)
	xy := make(plotter.XYs, 0, len(smp)+1)
	for _, p := range smp {
		xy = append(xy, plotter.XY{X: p.Range, Y: 100 * p.Fraction})
	}
	if n := len(xy); n > 0 && xy[n-1].X < xmax {
		xy = append(xy, plotter.XY{X: xmax, Y: xy[n-1].Y})
	}
	return xy
}

func (s *scene) holeChart(width int) ([]byte, error) {
	a := s.a
	var holes []lifetime
	if a.Persistence != nil {
		for i, h := range a.Persistence.Holes {
			holes = append(holes, lifetime{h.Birth, h.Death, s.holeNote(i) != ""})
		}
	}
	title := Plural(len(holes), "hole") + " of the union of disks (not gaps): when each appears and closes"
	if s.m.Title != "" {
		title = s.m.Title + "\n" + title
	}
	return lifetimePlot(lifetimeChart{
		title: title, xLabel: "Range at which the hole appears (m)", yLabel: "Range at which it closes (m)",
		holes: holes, planned: a.Range,
		plannedLabel: fmt.Sprintf("planned range %s (holes open there: upper left)", metresShort(a.Range)),
		markedLabel:  fmt.Sprintf("hole closing outside the site or living < %s (marked in report.txt)", metresShort(briefHoleFraction*a.Range)),
	}, width)
}

// lifetime is one hole of a lifetimes chart: the range at which it
// appears and closes, and whether report.txt marks it.
type lifetime struct {
	b, d   float64
	marked bool
}

// lifetimeChart is what a hole-lifetimes chart shows: the holes, the
// planned range (with own ranges, the reference devices', ranges_charts.go)
// and the texts.
type lifetimeChart struct {
	title, xLabel, yLabel     string
	holes                     []lifetime
	planned                   float64
	plannedLabel, markedLabel string
	// zoom starts both axes at a round value below the earliest
	// appearance and the planned range instead of at 0 (with own ranges
	// every hole appears near the reference devices' planned range).
	zoom bool
}

// lifetimePlot draws a hole-lifetimes chart: each hole a point (appears,
// closes) above the diagonal, the planned range as the corner of the
// upper-left quadrant of the holes open there.
func lifetimePlot(c lifetimeChart, width int) ([]byte, error) {
	p := plot.New()
	p.Title.Text = c.title
	p.X.Label.Text = c.xLabel
	p.Y.Label.Text = c.yLabel
	styleAxes(p)
	top := math.Max(c.planned, 1e-9)
	for _, h := range c.holes {
		top = math.Max(top, h.d)
	}
	lo := 0.0
	if c.zoom {
		lo = c.planned
		for _, h := range c.holes {
			lo = math.Min(lo, h.b)
		}
		// a margin of 8 % of the span below, rounded down to a tick step
		lo -= 0.08 * (top - lo)
		step := niceLength((1.08*top - lo) / 5)
		lo = math.Max(0, math.Floor(lo/step)*step)
	}
	top = lo + 1.08*(top-lo)
	p.X.Min, p.X.Max = lo, top
	p.Y.Min, p.Y.Max = lo, top
	p.X.Tick.Marker = niceTicks{}
	p.Y.Tick.Marker = niceTicks{}

	diag, err := plotter.NewLine(plotter.XYs{{X: lo, Y: lo}, {X: top, Y: top}})
	if err != nil {
		return nil, err
	}
	diag.Color = colFrame
	diag.Width = vg.Points(1.2)
	p.Add(diag)
	p.Legend.Add("appears = closes", diag)

	// holes open at the planned range lie left of x = r and above y = r
	r := c.planned
	hr, err := plotter.NewLine(plotter.XYs{{X: lo, Y: r}, {X: r, Y: r}, {X: r, Y: top}})
	if err != nil {
		return nil, err
	}
	hr.Color = oiBlue
	hr.Width = vg.Points(1.4)
	hr.Dashes = []vg.Length{vg.Points(6), vg.Points(3)}
	p.Add(hr)
	p.Legend.Add(c.plannedLabel, hr)

	if len(c.holes) == 0 {
		p.Legend.Add("no holes at any range")
	}
	for _, mk := range []bool{false, true} {
		var pts plotter.XYs
		for _, h := range c.holes {
			if h.marked == mk {
				pts = append(pts, plotter.XY{X: h.b, Y: h.d})
			}
		}
		if len(pts) == 0 {
			continue // the legend lists only what is drawn
		}
		sc, err := plotter.NewScatter(pts)
		if err != nil {
			return nil, err
		}
		sc.GlyphStyle.Color = oiPurple
		sc.GlyphStyle.Radius = vg.Points(3)
		sc.GlyphStyle.Shape = draw.CircleGlyph{}
		label := "hole"
		if mk {
			sc.GlyphStyle.Color = colHatch
			sc.GlyphStyle.Shape = draw.RingGlyph{}
			label = c.markedLabel
		}
		if len(c.holes) > 2000 {
			// many holes: small squares, far cheaper to draw than circles
			sc.GlyphStyle.Radius = vg.Points(1.2)
			sc.GlyphStyle.Shape = draw.BoxGlyph{}
		}
		p.Add(sc)
		p.Legend.Add(label, sc)
	}
	p.Legend.Left = false
	p.Legend.Top = false
	p.Legend.XOffs = vg.Points(-6)
	p.Legend.YOffs = vg.Points(6)
	return renderPlot(p, width)
}
