// The PNG maps of the planning moves, drawn like the analysis maps
// (drawing.go, raster.go: north up, scale bar, legend, circles within
// 0.2 px, colour-blind-safe colours):
//
//   - suggestions and candidates: the gaps of the existing layout split
//     into the part the new devices close (yellow) and the part left
//     (vermilion, deepest points ringed and numbered), the existing
//     coverage (sky blue), the new devices' reach (dashed circles) and
//     marks, and the candidate spots not picked;
//   - failures: each service area filled by the loss its device's failure
//     causes, in up to five classes of round width on the viridis scale
//     (designed to be read with every common colour-vision deficiency and
//     in grey; van der Walt & Smith, matplotlib, 2015), devices with no
//     loss in grey, the ten worst marked "rank 1" to "rank 10", and the point that
//     fixes the range surviving any single failure;
//   - assignment: coverage at the range, service-area edges, a line from
//     each demand item to its serving device, and the items marked by
//     shape and colour — squares within range, triangles beyond it — so
//     that the distinction survives without colour.

package report

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"slices"
	"strconv"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"golang.org/x/image/font"
	"golang.org/x/image/vector"
)

// Planning map colours.
var (
	colClosed  = tint(oiYellow, 0.15)
	colNew     = oiBlue
	colNewDisk = color.RGBA{0x1A, 0x1A, 0x1A, 0xFF}
	colBeyond  = oiVermilion
	colWithin  = oiBlue
	colNoLoss  = color.RGBA{0xFF, 0xFF, 0xFF, 0xFF} // white: unlike the hatched exclusion grey
	colBuild   = color.RGBA{0xBF, 0xBF, 0xBF, 0xFF}
)

// viridis holds five colours of the viridis scale, low to high.
var viridis = []color.RGBA{
	{0xFD, 0xE7, 0x25, 0xFF}, {0x5E, 0xC9, 0x62, 0xFF}, {0x21, 0x91, 0x8C, 0xFF},
	{0x3B, 0x52, 0x8B, 0xFF}, {0x44, 0x01, 0x54, 0xFF},
}

// maxMarked is the largest number of planning marks drawn one by one
// with labels (new devices, picks, ranks, loaded devices).
const maxMarked = 60

// beforeAfter describes one before/after map.
type beforeAfter struct {
	title, sub string
	newLabel   string
	closed     string // legend of the closed part of the gaps
	added      []orb.Point
	addedR     []float64 // each new device's range (nil: one range)
	labels     []string
	others     []orb.Point // candidate spots not picked
	before     []coverage.Gap
	after      []coverage.Gap
}

func (s *planScene) suggestionMap(width int) ([]byte, error) {
	p, sg := s.p, s.p.Suggestion
	ba := beforeAfter{before: p.GapsBefore, after: p.GapsAfter, added: sg.Added, newLabel: "New device, numbered in placement order", closed: "Gap closed by the new devices"}
	for j := range sg.Added {
		ba.labels = append(ba.labels, fmt.Sprintf("+%d", j+1))
	}
	at := metresShort(p.Range)
	if p.own() {
		at = metresShort(p.NewRange) + " (own ranges for the others)"
	}
	if p.Move == MoveAdd {
		ba.title = fmt.Sprintf("%d suggested devices at %s", len(sg.Added), at)
	} else {
		if sg.Reached {
			ba.title = fmt.Sprintf("%s close every gap at %s", Plural(len(sg.Added), "addition"), at)
		} else {
			ba.title = fmt.Sprintf("%s at %s, gaps remain", Plural(len(sg.Added), "addition"), at)
		}
	}
	full := "Full cover"
	if p.own() {
		full = "New device needs (r² grown alike)"
	}
	ba.sub = fmt.Sprintf(full+" %s -> %s; covered %s %% -> %s %%; uncovered %.0f m² -> %.0f m²",
		metresShort(sg.FullCoverBefore), metresShort(sg.FullCoverAfter),
		CoveredPercent(sg.CoveredBefore, sg.UncoveredBefore, 2), CoveredPercent(sg.CoveredAfter, sg.UncoveredAfter, 2),
		sg.UncoveredBefore, sg.UncoveredAfter)
	if !p.RangeGiven {
		ba.sub += " (range: " + p.RangeNote + ")"
	}
	return encodeMap(s.drawBeforeAfter(width, ba))
}

func (s *planScene) candidateMap(width int) ([]byte, error) {
	p, ch := s.p, s.p.Choice
	ba := beforeAfter{before: p.GapsBefore, after: ch.Remaining, newLabel: "Picked spot, numbered in pick order", closed: "Gap closed by the picked spots"}
	picked := make([]bool, len(p.Candidates))
	for j, c := range ch.Picked {
		picked[c] = true
		ba.added = append(ba.added, p.Candidates[c])
		ba.labels = append(ba.labels, fmt.Sprint(j+1))
	}
	ba.addedR = ch.Ranges
	for i, c := range p.Candidates {
		if !picked[i] {
			ba.others = append(ba.others, c)
		}
	}
	at := metresShort(ch.Range)
	switch {
	case ch.Ranges != nil:
		at = "their own ranges"
	case p.own():
		at = metresShort(p.NewRange) + " (own ranges for the others)"
	}
	ba.title = fmt.Sprintf("%d of %d candidate spots picked at %s", len(ch.Picked), len(p.Candidates), at)
	ba.sub = fmt.Sprintf("Covered %s %% -> %s %%; uncovered %.0f m² -> %.0f m²",
		CoveredPercent(ch.FractionBefore, ch.UncoveredBefore, 2), CoveredPercent(ch.FractionAfter, ch.UncoveredAfter, 2),
		ch.UncoveredBefore, ch.UncoveredAfter)
	switch {
	case ch.Complete:
		ba.sub += "; full cover reached"
	case ch.Exhausted:
		ba.sub += fmt.Sprintf("; full cover cannot be reached from these spots (%s left)", Plural(len(ch.Remaining), "gap"))
	}
	return encodeMap(s.drawBeforeAfter(width, ba))
}

// drawBeforeAfter draws a before/after map.
func (s *planScene) drawBeforeAfter(width int, ba beforeAfter) (*canvas, error) {
	r := s.p.Range
	within := metresShort(r)
	if s.p.own() {
		r, within = s.p.NewRange, "each within its own range"
	}
	numbered := min(len(ba.after), maxNumbered)
	items := []legendItem{{fmt.Sprintf("Covered by the existing devices (%s)", within), swatchFill(colCovered, colDiskEdge)}}
	if gapArea(ba.before) > gapArea(ba.after) {
		items = append(items, legendItem{ba.closed, swatchFill(colClosed, nil)})
	}
	if len(ba.after) > 0 {
		items = append(items, legendItem{"Gap left, numbered by closing range; ring: deepest point", swatchDeepest})
	}
	if len(ba.added) > 0 {
		reach := metresShort(r)
		if ba.addedR != nil {
			reach = "its own range"
		}
		items = append(items, legendItem{fmt.Sprintf("Reach of a new device (%s)", reach), swatchDashed})
	}
	items = append(items, legendItem{"Existing device", swatchDot})
	if len(ba.added) > 0 {
		items = append(items, legendItem{ba.newLabel, swatchNew})
	}
	if len(ba.others) > 0 {
		items = append(items, legendItem{"Candidate spot not picked", swatchSpot})
	}
	key := mapKey{items: items, notes: []string{s.northNote()}}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single disks and small gaps")
	if err != nil {
		return nil, err
	}
	c.title(s.titled(ba.title), ba.sub)

	areaMask := s.drawArea(c)
	s.fillGaps(c, ba.before, colClosed)
	s.fillGaps(c, ba.after, colGap)
	rho := r * c.k
	unit := unitCircle(circleSides(rho))
	if s.p.own() {
		c.paint(s.ownDiskMask(c), color.NRGBA(colCovered), areaMask)
	} else {
		c.paint(s.diskMask(c, rho, unit), color.NRGBA(colCovered), areaMask)
		if d.spacing >= 8*c.u && rho >= 3 {
			s.diskOutlines(c, rho, unit, areaMask)
		}
	}
	s.drawZones(c)
	s.strokeArea(c)
	s.drawSiteMarks(c, d)
	s.drawHiddenMarks(c, d)
	// New devices' reach, then the marks.
	if len(ba.added) <= 10*maxMarked && rho >= 2 {
		c.inFrame(func() {
			c.setReachDash()
			for j, q := range ba.added {
				x, y := c.px(q)
				if ba.addedR != nil {
					c.dc.DrawCircle(x, y, ba.addedR[j]*c.k)
				} else {
					c.dc.DrawCircle(x, y, rho)
				}
				c.dc.Stroke()
			}
			c.dc.SetDash()
		})
	}
	for _, q := range ba.others {
		x, y := c.px(q)
		c.spotMark(x, y, 6*c.u)
	}
	for _, q := range ba.added {
		x, y := c.px(q)
		c.newMark(x, y, 7*c.u)
	}
	c.gapMarks(ba.after[:numbered])
	if len(ba.added) <= maxMarked {
		s.placeLabels(c, ba.added, ba.labels, 9*c.u, 18, true)
	}
	c.finish(key)
	return c, nil
}

// setReachDash sets gg's pen to the dashed line of a new device's reach;
// the caller clears the dash.
func (c *canvas) setReachDash() {
	c.dc.SetColor(colNewDisk)
	c.dc.SetLineWidth(1.8 * c.u)
	c.dc.SetDash(7*c.u, 5*c.u)
}

// trianglePath adds to gg's path an upward triangle inscribed in the
// circle of radius r about (x, y).
func (c *canvas) trianglePath(x, y, r float64) {
	c.dc.MoveTo(x, y-r)
	c.dc.LineTo(x+r*0.87, y+r*0.5)
	c.dc.LineTo(x-r*0.87, y+r*0.5)
	c.dc.ClosePath()
}

// newFillSeparate is newFill with a rasterizer of its own, for fills
// collected at the same time as another.
func (c *canvas) newFillSeparate() *fastFill {
	return &fastFill{c: c, vr: vector.NewRasterizer(c.w, c.h)}
}

// inFrame runs draw with gg's drawing clipped to the map frame.
func (c *canvas) inFrame(draw func()) {
	c.dc.Push()
	c.dc.DrawRectangle(c.fx, c.fy, c.fw, c.fh)
	c.dc.Clip()
	draw()
	c.dc.ResetClip()
	c.dc.Pop()
}

// newMark draws a new device: a blue square with a white halo and a dark
// edge.
func (c *canvas) newMark(x, y, r float64) { c.newMarkIn(x, y, r, colNew) }

// newMarkIn draws a new device's square filled with fill.
func (c *canvas) newMarkIn(x, y, r float64, fill color.Color) {
	c.dc.DrawRectangle(x-r, y-r, 2*r, 2*r)
	c.dc.SetColor(color.White)
	c.dc.SetLineWidth(4.5 * c.u)
	c.dc.StrokePreserve()
	c.dc.SetColor(fill)
	c.dc.FillPreserve()
	c.dc.SetColor(colInk)
	c.dc.SetLineWidth(1.6 * c.u)
	c.dc.Stroke()
}

// spotMark draws a candidate spot not picked: an open triangle.
func (c *canvas) spotMark(x, y, r float64) {
	c.trianglePath(x, y, r)
	c.haloStroke(4*c.u, colInk, 1.8*c.u)
}

func swatchNew(c *canvas, x, y, w, h float64) { c.newMark(x+w/2, y+h/2, 7*c.u) }

func swatchSpot(c *canvas, x, y, w, h float64) { c.spotMark(x+w/2, y+h/2+1*c.u, 7*c.u) }

func swatchDashed(c *canvas, x, y, w, h float64) {
	c.setReachDash()
	c.dc.DrawLine(x, y+h/2, x+w, y+h/2)
	c.dc.Stroke()
	c.dc.SetDash()
}

// placeLabels writes texts beside the points at pixel offset gap from
// each, placed as labelSites places site labels (maplabels.go).
func (s *planScene) placeLabels(c *canvas, pts []orb.Point, texts []string, gap, pt float64, bold bool) {
	l := s.newLabeler(c)
	for _, p := range pts {
		x, y := c.px(p)
		l.taken = append(l.taken, labelBox{x - gap, y - gap, x + gap, y + gap})
	}
	pt = c.labelPt(pt)
	face := c.face(pt, bold)
	for i, p := range pts {
		text := texts[i]
		w := float64(font.MeasureString(face, text)) / 64
		h := pt * c.u * 0.78
		x, y := c.px(p)
		g := gap + 2*c.u
		cands := []labelBox{
			{x + g, y - g - h + 4*c.u, x + g + w, y - g + 4*c.u},
			{x + g, y + g - 4*c.u, x + g + w, y + g + h - 4*c.u},
			{x - g - w, y - g - h + 4*c.u, x - g, y - g + 4*c.u},
			{x - g - w, y + g - 4*c.u, x - g, y + g + h - 4*c.u},
		}
		b := l.place(cands, w*h)
		c.haloText(text, b.x0, b.y1, 0, 0, pt, bold, colInk)
	}
}

// gapArea is the total area of gaps.
func gapArea(gaps []coverage.Gap) float64 {
	t := 0.0
	for _, g := range gaps {
		t += g.Area
	}
	return t
}

// lossClasses returns the class upper bounds of the positive losses:
// their quintiles (the values at ranks ⌈kn/5⌉, k = 1..5), rounded up to
// two significant digits so the legend reads plainly, repeated bounds
// dropped. Quintile classes keep a skewed distribution (a few critical
// devices, many redundant ones) from painting nearly every cell alike.
func lossClasses(losses []float64) []float64 {
	var pos []float64
	for _, v := range losses {
		if v > 0 && !math.IsInf(v, 0) {
			pos = append(pos, v)
		}
	}
	if len(pos) == 0 {
		return nil
	}
	slices.Sort(pos)
	var ub []float64
	for k := 1; k <= 5; k++ {
		i := (k*len(pos)+4)/5 - 1
		u := roundUp2(pos[i])
		if len(ub) == 0 || u > ub[len(ub)-1] {
			ub = append(ub, u)
		}
	}
	return ub
}

// roundUp2 rounds v > 0 up to two significant digits.
func roundUp2(v float64) float64 {
	e := math.Pow(10, math.Floor(math.Log10(v))-1)
	r := math.Ceil(v/e-1e-9) * e
	// Keep the printed value exact (e.g. 0.1 + rounding).
	if t, err := strconv.ParseFloat(strconv.FormatFloat(r, 'g', 2, 64), 64); err == nil && t >= v {
		return t
	}
	return r
}

// classColours spreads n classes over the viridis colours.
func classColours(n int) []color.RGBA {
	out := make([]color.RGBA, n)
	for k := range out {
		idx := len(viridis) - 1
		if n > 1 {
			idx = int(math.Round(float64(k) * float64(len(viridis)-1) / float64(n-1)))
		}
		out[k] = viridis[idx]
	}
	return out
}

// lossClass returns the class of a loss (-1: no loss).
func lossClass(loss float64, ub []float64) int {
	if !(loss > 0) {
		return -1
	}
	for k, u := range ub {
		if loss <= u {
			return k
		}
	}
	return len(ub) - 1
}

func (s *planScene) drawFailureMap(width int) (*canvas, error) {
	fr := s.p.Failures
	maxLoss := 0.0
	bySite := make(map[int]*coverage.DeviceFailure, len(fr.Devices))
	rank := make(map[int]int, len(fr.Devices))
	for k := range fr.Devices {
		d := &fr.Devices[k]
		bySite[d.Site] = d
		rank[d.Site] = k + 1
		if !math.IsInf(d.AddedUncovered, 0) {
			maxLoss = math.Max(maxLoss, d.AddedUncovered)
		}
	}
	losses := make([]float64, len(fr.Devices))
	for k, d := range fr.Devices {
		losses[k] = d.AddedUncovered
	}
	ub := lossClasses(losses)
	cols := classColours(len(ub))
	var items []legendItem
	noLoss := false
	for _, d := range fr.Devices {
		noLoss = noLoss || lossClass(d.AddedUncovered, ub) < 0
	}
	if noLoss {
		items = append(items, legendItem{"No loss (the others cover all it served)", swatchFill(colNoLoss, colCellEdge)})
	}
	for k := range ub {
		lo := 0.0
		if k > 0 {
			lo = ub[k-1]
		}
		items = append(items, legendItem{fmt.Sprintf("Loss %s-%s m²", trimFloat(lo), trimFloat(ub[k])), swatchFill(cols[k], colCellEdge)})
	}
	items = append(items, legendItem{"Device; rank 1 to 10: the ten worst failures, largest loss first", swatchDot})
	if s.surviveMarked() {
		items = append(items, legendItem{"Point fixing the range that survives any single failure", swatchWorst})
	}
	at := metresShort(fr.Range)
	if fr.Ranges != nil {
		at = "the planned ranges"
	}
	key := mapKey{items: items, notes: []string{
		fmt.Sprintf("Service areas filled by the area left uncovered at %s when their device is out of service (the others working).", at),
		s.northNote(),
	}}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single service areas")
	if err != nil {
		return nil, err
	}
	title := s.titled("Device failures at " + at)
	sub := "Whichever single device fails, the others cover everything from "
	switch {
	case fr.Ranges != nil && math.IsInf(fr.SurvivePower, 1), fr.Ranges == nil && math.IsInf(fr.SurviveRange, 0):
		sub = "A single device: nothing remains when it fails"
	case fr.Ranges != nil && fr.SurvivePower <= 0:
		sub = fmt.Sprintf("No single failure opens a gap at the planned ranges; worst loss %.0f m²", maxLoss)
	case fr.Ranges != nil:
		sub = "Any single failure is survived at " + GroupsText(s.rangeGroups(nil), s.rangeGroups(func(i int) float64 { return fr.SurviveRanges[i] })) +
			fmt.Sprintf(" (r² grown alike; diamond: where); worst loss %.0f m²", maxLoss)
	default:
		sub += metresShort(fr.SurviveRange) + fmt.Sprintf(" (diamond); worst loss %.0f m²", maxLoss)
	}
	c.title(title, sub)

	s.drawArea(c)
	if cl := s.l.Cells; cl != nil {
		// class 0: no loss, class k+1: loss class k
		class := make([]int, len(cl.SiteStart)-1)
		for v := range class {
			if df := bySite[int(s.l.Tri.Source[v])]; df != nil {
				class[v] = lossClass(df.AddedUncovered, ub) + 1
			}
		}
		s.paintCells(c, class, append([]color.RGBA{colNoLoss}, cols...))
		if d.spacing >= 4*c.u {
			s.strokeCellEdges(c, 1.0*c.u, color.NRGBA{0x30, 0x30, 0x30, 0xC0})
		}
	}
	s.drawZones(c)
	s.strokeArea(c)
	s.drawSiteMarks(c, d)
	var pts []orb.Point
	var texts []string
	s.drawHiddenMarks(c, d)
	for k := 0; k < min(10, len(fr.Devices)); k++ {
		if fr.Devices[k].Shared || fr.Devices[k].Hidden {
			continue
		}
		pts = append(pts, s.l.Sites[fr.Devices[k].Site])
		texts = append(texts, "rank "+strconv.Itoa(k+1))
	}
	mark, needs := s.surviveMarked(), "needs "
	if fr.Ranges != nil {
		needs = "backup needs "
	}
	if mark {
		x, y := c.px(fr.SurvivePoint)
		c.worstMark(x, y)
	}
	if d.spacing >= 12*c.u {
		s.placeLabels(c, pts, texts, 6*c.u, 18, true)
	}
	if mark {
		s.placeLabels(c, []orb.Point{fr.SurvivePoint}, []string{needs + metresShort(fr.SurviveRange)}, 12*c.u, 17, true)
	}
	c.finish(key)
	return c, nil
}

// surviveMarked reports whether the failure map marks the point that fixes
// the single-failure figure: there is one, and with per-device ranges it
// needs some growth.
func (s *planScene) surviveMarked() bool {
	fr := s.p.Failures
	if fr.Ranges != nil {
		return fr.SurviveSite >= 0 && fr.SurvivePower > 0 && !math.IsInf(fr.SurvivePower, 1)
	}
	return fr.SurviveSite >= 0 && !math.IsInf(fr.SurviveRange, 0)
}

func (s *planScene) failureMap(width int) ([]byte, error) {
	return encodeMap(s.drawFailureMap(width))
}

func (s *planScene) drawAssignmentMap(width int) (*canvas, error) {
	p, a := s.p, s.p.Assignment
	ranged := s.hasRange()
	items, polys := s.assignmentLegend(ranged)
	key := mapKey{items: items, notes: []string{s.northNote()}}
	const dense = "single devices and demand items"
	if s.denseNote(width, dense) == "" && len(p.Demand) > 5000 {
		key.notes = append(key.notes, fmt.Sprintf("%d demand items: single items and lines cannot be told apart here; use %s and %s in a GIS.",
			len(p.Demand), LayerFile(FileAssignment, s.m.Planar), FileAssignmentCSV))
	}
	c, d, err := s.layoutMap(s.demandExtent(), width, &key, dense)
	if err != nil {
		return nil, err
	}
	title := s.titled(fmt.Sprintf("Demand served (%s)", Plural(len(p.Demand), "item")))
	sub := "Each item is served by its nearest device"
	switch {
	case p.own():
		sub = fmt.Sprintf("%d of %s within their device's own range; %d beyond every device's reach", a.Served, Plural(len(p.Demand), "item"), a.Unserved)
		if p.Weighted {
			sub += fmt.Sprintf(" (weight %s within, %s beyond)", weightText(a.ServedWeight), weightText(a.UnservedWeight))
		}
	case ranged:
		sub = fmt.Sprintf("%d of %s within %s of their nearest device; %d beyond", a.Served, Plural(len(p.Demand), "item"), metresShort(p.Range), a.Unserved)
		if p.Weighted {
			sub += fmt.Sprintf(" (weight %s within, %s beyond)", weightText(a.ServedWeight), weightText(a.UnservedWeight))
		}
	}
	c.title(title, sub)

	areaMask := s.drawArea(c)
	switch {
	case p.own():
		c.paint(s.ownDiskMask(c), color.NRGBA(colCovered), areaMask)
	case ranged:
		rho := p.Range * c.k
		unit := unitCircle(circleSides(rho))
		c.paint(s.diskMask(c, rho, unit), color.NRGBA(colCovered), areaMask)
	}
	if s.l.Cells != nil && d.spacing >= 4*c.u {
		s.strokeCellEdges(c, 1.0*c.u, color.NRGBA{0x44, 0x44, 0x44, 0xA0})
	}
	s.drawZones(c)
	s.strokeArea(c)
	if polys > 0 {
		f := c.newFill()
		edge := c.newFillSeparate()
		var tmp []float64
		for _, mp := range p.DemandPolygons {
			for _, poly := range mp {
				for k, ring := range poly {
					tmp = ringXY(ring, tmp[:0])
					f.ringXY(tmp, k == 0)
					edge.polylineXY(tmp, 1.2*c.u)
				}
			}
		}
		c.paint(f.mask(), color.NRGBA{colBuild.R, colBuild.G, colBuild.B, 0xC0}, nil) // coverage shows through
		c.paint(edge.mask(), color.NRGBA(colInk), nil)
	}
	// Lines: within range dark, beyond range vermilion and wider.
	lw := 1.4 * c.u
	if len(p.Demand) > 5000 {
		lw = 0.7
	}
	in, out := c.newFill(), c.newFillSeparate()
	for i, q := range p.Demand {
		x0, y0 := c.px(q)
		x1, y1 := c.px(s.l.Sites[a.Device[i]])
		if !ranged || a.Within[i] {
			in.segment(x0, y0, x1, y1, lw)
		} else {
			out.segment(x0, y0, x1, y1, 1.6*lw)
		}
	}
	c.paint(in.mask(), color.NRGBA{0x1A, 0x1A, 0x1A, 0xB0}, nil)
	c.paint(out.mask(), color.NRGBA(colBeyond), nil)
	s.drawSiteMarks(c, d)
	s.drawHiddenMarks(c, d)
	s.drawDemandMarks(c, ranged)
	// Label the devices that serve something, when few.
	var pts []orb.Point
	var texts []string
	for i, ld := range a.Load {
		if ld.Count == 0 {
			continue
		}
		t := s.label(i) + fmt.Sprintf(": %d", ld.Count)
		if p.Weighted {
			t += " (w " + weightText(ld.Weight) + ")"
		}
		pts = append(pts, s.l.Sites[i])
		texts = append(texts, t)
	}
	if len(pts) <= maxMarked && d.spacing >= 25*c.u {
		s.placeLabels(c, pts, texts, 6*c.u, 14, false)
	}
	c.finish(key)
	return c, nil
}

// assignmentLegend returns the legend entries of the assignment map, for
// the classes present, and the number of demand polygons.
func (s *planScene) assignmentLegend(ranged bool) ([]legendItem, int) {
	p, a := s.p, s.p.Assignment
	var items []legendItem
	switch {
	case p.own():
		items = append(items, legendItem{"Within a device's own range (each disk at its range)", swatchFill(colCovered, colDiskEdge)})
	case ranged:
		items = append(items, legendItem{fmt.Sprintf("Within %s of a device", metresShort(p.Range)), swatchFill(colCovered, colDiskEdge)})
	}
	items = append(items, legendItem{"Service-area edge", swatchLine(colCellEdge, 1.2)})
	switch {
	case !ranged:
		items = append(items, legendItem{"Demand item, line to its device", swatchWithin})
	case a.Served > 0:
		items = append(items, legendItem{"Demand item within range, line to its device", swatchWithin})
	}
	if ranged && a.Unserved > 0 {
		items = append(items, legendItem{"Demand item beyond range", swatchBeyond})
	}
	polys := 0
	for _, q := range p.DemandPolygons {
		if q != nil {
			polys++
		}
	}
	if polys > 0 {
		items = append(items, legendItem{"Building or yard outline (demand polygon)", swatchFill(colBuild, colInk)})
	}
	items = append(items, legendItem{"Device (label: items served)", swatchDot})
	return items, polys
}

// drawDemandMarks draws the demand items: squares within range, triangles
// beyond, on white halos when they are few enough to be told apart.
func (s *planScene) drawDemandMarks(c *canvas, ranged bool) {
	p, a := s.p, s.p.Assignment
	r := 5.5 * c.u
	if len(p.Demand) > 5000 {
		r = math.Max(1.2, 2*c.u)
	}
	halo, inM, outM := c.newFill(), c.newFillSeparate(), c.newFillSeparate()
	for i, q := range p.Demand {
		x, y := c.px(q)
		if !ranged || a.Within[i] {
			halo.ringPx([]float64{x - r - 1.5*c.u, y - r - 1.5*c.u, x + r + 1.5*c.u, y - r - 1.5*c.u, x + r + 1.5*c.u, y + r + 1.5*c.u, x - r - 1.5*c.u, y + r + 1.5*c.u}, 1)
			inM.ringPx([]float64{x - r, y - r, x + r, y - r, x + r, y + r, x - r, y + r}, 1)
		} else {
			t := 1.3 * r
			h := t + 2*c.u
			halo.ringPx([]float64{x, y - h, x + h*0.87, y + h*0.5, x - h*0.87, y + h*0.5}, 1)
			outM.ringPx([]float64{x, y - t, x + t*0.87, y + t*0.5, x - t*0.87, y + t*0.5}, 1)
		}
	}
	if len(p.Demand) <= 5000 {
		c.paint(halo.mask(), color.NRGBA{0xFF, 0xFF, 0xFF, 0xFF}, nil)
	}
	c.paint(inM.mask(), color.NRGBA(colWithin), nil)
	c.paint(outM.mask(), color.NRGBA(colBeyond), nil)
}

// ownDiskMask is the mask of every device's disk at its own range.
func (s *planScene) ownDiskMask(c *canvas) *image.Alpha {
	f := c.newFill()
	for i, q := range s.l.Sites {
		rho := s.rangeOf(i) * c.k
		f.circle(c.ox+q[0]*c.k, c.oy-q[1]*c.k, rho, unitCircle(circleSides(rho)))
	}
	return f.mask()
}

// drawHiddenMarks marks the hidden devices (per-device ranges), which
// have no vertex of the regular triangulation and so are left out by
// drawSiteMarks: same dot, no halo.
func (s *planScene) drawHiddenMarks(c *canvas, d density) {
	if len(s.l.Hidden) == 0 {
		return
	}
	rho := d.siteRadius(c.u)
	marks := c.newFill()
	for _, i := range s.l.Hidden {
		q := s.l.Sites[i]
		marks.circle(c.ox+q[0]*c.k, c.oy-q[1]*c.k, rho, unitCircle(circleSides(rho)))
	}
	c.paint(marks.mask(), color.NRGBA(colInk), nil)
}

func (s *planScene) assignmentMap(width int) ([]byte, error) {
	return encodeMap(s.drawAssignmentMap(width))
}

// demandExtent is the map extent of the assignment map: the area and
// every demand item.
func (s *planScene) demandExtent() orb.Bound {
	b := s.extent()
	for _, q := range s.p.Demand {
		b = b.Extend(q)
	}
	return b
}

func swatchWithin(c *canvas, x, y, w, h float64) {
	c.swatchRule(x, y, w, h, colInk, 1.4*c.u)
	r := 5.5 * c.u
	c.dc.DrawRectangle(x+w/2-r, y+h/2-r, 2*r, 2*r)
	c.dc.SetColor(color.White)
	c.dc.SetLineWidth(3 * c.u)
	c.dc.StrokePreserve()
	c.dc.SetColor(colWithin)
	c.dc.Fill()
}

func swatchBeyond(c *canvas, x, y, w, h float64) {
	c.swatchRule(x, y, w, h, colBeyond, 2.2*c.u)
	t := 7 * c.u
	cx, cy := x+w/2, y+h/2+1*c.u
	c.trianglePath(cx, cy, t)
	c.dc.SetColor(color.White)
	c.dc.SetLineWidth(3 * c.u)
	c.dc.StrokePreserve()
	c.dc.SetColor(colBeyond)
	c.dc.Fill()
}

// swatchRule draws a horizontal line lw px wide in col across the middle
// of a legend swatch.
func (c *canvas) swatchRule(x, y, w, h float64, col color.Color, lw float64) {
	c.dc.SetColor(col)
	c.dc.SetLineWidth(lw)
	c.dc.DrawLine(x, y+h/2, x+w, y+h/2)
	c.dc.Stroke()
}
