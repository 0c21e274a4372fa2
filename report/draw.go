// Map drawing shared by the PNG maps: the page layout, the affine map from
// the local plane to pixels, fonts, the legend, the scale bar and the
// north arrow.
//
// The plane-to-pixel map is a uniform scale and a translation with the y
// axis flipped, so north (the plane's +y, grid north) is up and lengths
// scale equally in x and y; the scale bar is exact for that scale. Circles
// are drawn as regular polygons whose chords deviate from the true circle
// by at most 0.2 px (n = ⌈π / acos(1 − 0.2/ρ)⌉ sides for a radius of ρ px,
// at least 8), so a disk of the planned range is drawn within 0.2 px.
//
// Colours come from the Okabe–Ito palette (Okabe & Ito, "Color Universal
// Design", 2002/2008; common practice for colour-blind-safe figures).

package report

import (
	"bytes"
	"fmt"
	"image/color"
	"image/png"
	"math"
	"strings"
	"sync"

	"github.com/fogleman/gg"
	"github.com/golang/freetype/truetype"
	"github.com/paulmach/orb"
	"golang.org/x/image/font"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/vector"
)

// Okabe–Ito colours.
var (
	oiOrange    = color.RGBA{0xE6, 0x9F, 0x00, 0xFF}
	oiSkyBlue   = color.RGBA{0x56, 0xB4, 0xE9, 0xFF}
	oiGreen     = color.RGBA{0x00, 0x9E, 0x73, 0xFF}
	oiYellow    = color.RGBA{0xF0, 0xE4, 0x42, 0xFF}
	oiBlue      = color.RGBA{0x00, 0x72, 0xB2, 0xFF}
	oiVermilion = color.RGBA{0xD5, 0x5E, 0x00, 0xFF}
	oiPurple    = color.RGBA{0xCC, 0x79, 0xA7, 0xFF}
)

// Map colours.
var (
	colInk       = color.RGBA{0x1A, 0x1A, 0x1A, 0xFF}
	colFrame     = color.RGBA{0x88, 0x88, 0x88, 0xFF}
	colOutside   = color.RGBA{0xF2, 0xF2, 0xF2, 0xFF}
	colArea      = color.RGBA{0xFF, 0xFF, 0xFF, 0xFF}
	colExcluded  = color.RGBA{0xC0, 0xC0, 0xC0, 0xFF}
	colHatch     = color.RGBA{0x70, 0x70, 0x70, 0xFF}
	colCovered   = tint(oiSkyBlue, 0.55)
	colDiskEdge  = oiBlue
	colGap       = oiVermilion
	colCellEdge  = color.RGBA{0x44, 0x44, 0x44, 0xFF}
	colWorstMark = colInk
	colContext   = color.RGBA{0xD8, 0xCF, 0xC4, 0xFF} // buildings and paths: a warm grey, unlike the cool exclusion grey
	colContextEd = color.RGBA{0x8C, 0x7B, 0x6B, 0xFF}
)

// cellPalette holds the six service-area fills (smallest-last colouring
// needs at most six, cellcolours.go): Okabe–Ito hues lightened to CIELAB
// L* 62–97 so that black site marks and haloed labels stay readable. The
// tints were chosen to maximise the smallest CIEDE2000 difference between
// any two fills, and between any fill and the exclusion-zone grey, under
// normal, protan and deutan vision (colourdiff.go); TestFillDifferences
// holds it at minFillDifference or more.
var cellPalette = []color.RGBA{
	tint(oiSkyBlue, 0.45), tint(oiOrange, 0.40), tint(oiGreen, 0.15),
	tint(oiYellow, 0.75), tint(oiBlue, 0.35), tint(oiVermilion, 0.20),
}

// tint mixes c with white: f = 0 gives c, f = 1 white.
func tint(c color.RGBA, f float64) color.RGBA {
	mix := func(v uint8) uint8 { return uint8(math.Round(float64(v) + (255-float64(v))*f)) }
	return color.RGBA{mix(c.R), mix(c.G), mix(c.B), 0xFF}
}

var (
	fontOnce             sync.Once
	fontRegular, fontBol *truetype.Font
	fontErr              error
)

func loadFonts() error {
	fontOnce.Do(func() {
		fontRegular, fontErr = truetype.Parse(goregular.TTF)
		if fontErr == nil {
			fontBol, fontErr = truetype.Parse(gobold.TTF)
		}
	})
	return fontErr
}

// canvas is one map page.
type canvas struct {
	dc   *gg.Context
	w, h int
	u    float64 // layout unit: 1 at 1600 px width

	// map frame in pixels
	fx, fy, fw, fh float64
	// plane → pixel: px = ox + x*k, py = oy − y*k
	ox, oy, k float64

	faces map[[2]float64]font.Face
	vr    *vector.Rasterizer // reused by newFill

	notes        []string // note lines, wrapped to the frame width
	legendLabels []string // the legend as drawn, for tests
	notesTop     float64  // y of the first note line, set by legend
}

// legendBlock is the width (layout units) kept right of the legend for
// the scale bar and the north arrow.
const legendBlock = 360

// layoutCanvas sizes a page for the extent b at width w with room below
// the map for the legend items, the notes (wrapped to the frame width at
// the note size) and tableRows rows of a key table.
func layoutCanvas(b orb.Bound, w int, items []legendItem, notes []string, tableRows int) (*canvas, error) {
	if err := loadFonts(); err != nil {
		return nil, fmt.Errorf("loading fonts: %v", err)
	}
	u := float64(w) / 1600
	c := &canvas{w: w, u: u, faces: map[[2]float64]font.Face{}}
	margin, titleH := 28*u, 96*u
	c.fx, c.fy = margin, titleH
	c.fw = float64(w) - 2*margin
	c.k, c.fh = frameScale(b, c.fw)
	cx, cy := (b.Min[0]+b.Max[0])/2, (b.Min[1]+b.Max[1])/2
	c.ox = c.fx + c.fw/2 - cx*c.k
	c.oy = c.fy + c.fh/2 + cy*c.k
	rows := c.legendRows(items)
	c.notes = c.wrapNotes(notes)
	legendH := math.Max(float64(rows)*34*u, 96*u) + float64(len(c.notes)+tableRows)*c.noteStep() + 30*u
	c.h = int(math.Ceil(c.fy + c.fh + legendH + margin/2))
	c.dc = gg.NewContext(c.w, c.h)
	c.dc.SetColor(color.White)
	c.dc.Clear()
	return c, nil
}

// frameScale returns the plane-to-pixel scale and the frame height for
// the extent b in a frame of width fw px: the extent is padded by 3 % each
// side and the frame's height kept between 0.5 and 1.1 times its width.
func frameScale(b orb.Bound, fw float64) (k, fh float64) {
	dx, dy := b.Max[0]-b.Min[0], b.Max[1]-b.Min[1]
	if !(dx > 0) && !(dy > 0) {
		dx, dy = 1, 1
	}
	if !(dx > 0) {
		dx = dy
	}
	if !(dy > 0) {
		dy = dx
	}
	const pad = 0.03
	dx, dy = dx*(1+2*pad), dy*(1+2*pad)
	fh = math.Min(math.Max(fw*dy/dx, 0.5*fw), 1.1*fw)
	return math.Min(fw/dx, fh/dy), fh
}

// px maps a plane point to pixels.
func (c *canvas) px(p orb.Point) (float64, float64) { return c.ox + p[0]*c.k, c.oy - p[1]*c.k }

// face returns the font face of size pt (scaled by u), bold or not.
func (c *canvas) face(pt float64, bold bool) font.Face {
	key := [2]float64{pt, 0}
	if bold {
		key[1] = 1
	}
	if f, ok := c.faces[key]; ok {
		return f
	}
	f := fontRegular
	if bold {
		f = fontBol
	}
	fc := truetype.NewFace(f, &truetype.Options{Size: pt * c.u, DPI: 72, Hinting: font.HintingFull})
	c.faces[key] = fc
	return fc
}

// text draws s anchored at (x, y) with anchor fractions (ax, ay).
func (c *canvas) text(s string, x, y, ax, ay, pt float64, bold bool, col color.Color) {
	c.dc.SetFontFace(c.face(pt, bold))
	c.dc.SetColor(col)
	c.dc.DrawStringAnchored(s, x, y, ax, ay)
}

// haloText draws s with a white halo for legibility over map colours.
func (c *canvas) haloText(s string, x, y, ax, ay, pt float64, bold bool, col color.Color) {
	c.dc.SetFontFace(c.face(pt, bold))
	c.dc.SetColor(color.NRGBA{0xFF, 0xFF, 0xFF, 0xE0})
	d := 1.5 * c.u
	for _, o := range [][2]float64{{-d, 0}, {d, 0}, {0, -d}, {0, d}, {-d, -d}, {d, d}, {-d, d}, {d, -d}} {
		c.dc.DrawStringAnchored(s, x+o[0], y+o[1], ax, ay)
	}
	c.dc.SetColor(col)
	c.dc.DrawStringAnchored(s, x, y, ax, ay)
}

// title draws the page title and subtitle.
func (c *canvas) title(title, sub string) {
	c.text(title, c.fx, 44*c.u, 0, 0, 30, true, colInk)
	c.text(sub, c.fx, 78*c.u, 0, 0, c.labelPt(18), false, colInk)
}

// frame draws the map frame outline.
func (c *canvas) frame() {
	c.dc.SetColor(colFrame)
	c.dc.SetLineWidth(1.5 * c.u)
	c.dc.DrawRectangle(c.fx, c.fy, c.fw, c.fh)
	c.dc.Stroke()
}

// circleSides returns the number of sides of a polygon drawing a circle of
// radius rho px within 0.2 px.
func circleSides(rho float64) int {
	if rho <= 0.2 {
		return 8
	}
	n := int(math.Ceil(math.Pi / math.Acos(1-0.2/rho)))
	return min(max(n, 8), 720)
}

// unitCircle returns cos/sin pairs of n equally spaced angles.
func unitCircle(n int) []float64 {
	u := make([]float64, 2*n)
	for i := range n {
		a := 2 * math.Pi * float64(i) / float64(n)
		u[2*i], u[2*i+1] = math.Cos(a), math.Sin(a)
	}
	return u
}

// niceLength returns a round length (1, 2 or 5 × 10^k m) near target.
func niceLength(target float64) float64 {
	if !(target > 0) {
		return 1
	}
	e := math.Pow(10, math.Floor(math.Log10(target)))
	for _, m := range []float64{5, 2, 1} {
		if m*e <= target {
			return m * e
		}
	}
	return e
}

// lengthLabel formats a length in m or km.
func lengthLabel(m float64) string {
	switch {
	case m >= 1000:
		return trimFloat(m/1000) + " km"
	case m >= 1:
		return trimFloat(m) + " m"
	default:
		return trimFloat(m*100) + " cm"
	}
}

func trimFloat(v float64) string {
	s := fmt.Sprintf("%.3f", v)
	for s[len(s)-1] == '0' {
		s = s[:len(s)-1]
	}
	if s[len(s)-1] == '.' {
		s = s[:len(s)-1]
	}
	return s
}

// scaleBar draws a four-part scale bar below the map, left of the north
// arrow: a round length of at most 300 layout units.
func (c *canvas) scaleBar() {
	u := c.u
	length := niceLength(300 * u / c.k)
	L := length * c.k
	right := c.fx + c.fw - 90*u
	x0, y0 := right-L-16*u, c.fy+c.fh+58*u
	hgt := 9 * u
	c.text("Scale", x0-16*u, y0+hgt, 1, 0, 15, false, colInk)
	for i := range 4 {
		if i%2 == 0 {
			c.dc.SetColor(colInk)
		} else {
			c.dc.SetColor(color.White)
		}
		c.dc.DrawRectangle(x0+float64(i)*L/4, y0, L/4, hgt)
		c.dc.Fill()
	}
	c.dc.SetColor(colInk)
	c.dc.SetLineWidth(1.2 * u)
	c.dc.DrawRectangle(x0, y0, L, hgt)
	c.dc.Stroke()
	c.text("0", x0, y0-6*u, 0.5, 0, 15, false, colInk)
	c.text(lengthLabel(length/2), x0+L/2, y0-6*u, 0.5, 0, 15, false, colInk)
	c.text(lengthLabel(length), x0+L, y0-6*u, 0.5, 0, 15, true, colInk)
}

// northArrow draws a north arrow (grid north) below the map at the right.
func (c *canvas) northArrow() {
	u := c.u
	x, y := c.fx+c.fw-30*u, c.fy+c.fh+2*u
	c.text("N", x, y+18*u, 0.5, 0, 20, true, colInk)
	top, bot := y+24*u, y+80*u
	c.dc.SetColor(colInk)
	c.dc.MoveTo(x, top)
	c.dc.LineTo(x+12*u, bot)
	c.dc.LineTo(x, bot-12*u)
	c.dc.ClosePath()
	c.dc.Fill()
	c.dc.SetColor(color.White)
	c.dc.MoveTo(x, top)
	c.dc.LineTo(x-12*u, bot)
	c.dc.LineTo(x, bot-12*u)
	c.dc.ClosePath()
	c.dc.FillPreserve()
	c.dc.SetColor(colInk)
	c.dc.SetLineWidth(1.2 * u)
	c.dc.Stroke()
}

// legendItem is one legend entry: a swatch drawn by draw in the box
// (x, y, w, h) and a label.
type legendItem struct {
	label string
	draw  func(c *canvas, x, y, w, h float64)
}

// legendRows returns how many rows the legend items need.
func (c *canvas) legendRows(items []legendItem) int {
	if len(items) == 0 {
		return 0
	}
	face := c.face(c.labelPt(17), false)
	avail := c.fw - legendBlock*c.u
	rows, x := 1, 0.0
	for _, it := range items {
		iw := legendItemWidth(face, it, c.u)
		if x > 0 && x+iw > avail {
			rows++
			x = 0
		}
		x += iw
	}
	return rows
}

func legendItemWidth(face font.Face, it legendItem, u float64) float64 {
	adv := font.MeasureString(face, it.label)
	return 40*u + 10*u + float64(adv)/64 + 34*u
}

// notePt is the size of note and key-table text, layout units.
func (c *canvas) notePt() float64 { return c.labelPt(15) }

// noteStep is the line step of notes and key-table rows, px.
func (c *canvas) noteStep() float64 { return 24 * c.u * c.notePt() / 15 }

// wrapNotes breaks each note into lines no wider than the frame at the
// note size, at spaces.
func (c *canvas) wrapNotes(notes []string) []string {
	face := c.face(c.notePt(), false)
	var out []string
	for _, n := range notes {
		line := ""
		for _, w := range strings.Fields(n) {
			try := w
			if line != "" {
				try = line + " " + w
			}
			if line != "" && float64(font.MeasureString(face, try))/64 > c.fw {
				out = append(out, line)
				try = w
			}
			line = try
		}
		out = append(out, line)
	}
	return out
}

// legend draws the items below the frame, then the note lines (c.notes).
func (c *canvas) legend(items []legendItem) {
	u := c.u
	x0 := c.fx
	x, y := x0, c.fy+c.fh+24*u
	pt := c.labelPt(17)
	face := c.face(pt, false)
	for _, it := range items {
		iw := legendItemWidth(face, it, u)
		if x > x0 && x+iw > x0+c.fw-legendBlock*u {
			x = x0
			y += 34 * u
		}
		it.draw(c, x, y, 40*u, 22*u)
		c.legendLabels = append(c.legendLabels, it.label)
		c.text(it.label, x+50*u, y+11*u, 0, 0.35, pt, false, colInk)
		x += iw
	}
	y = math.Max(y+34*u, c.fy+c.fh+24*u+96*u) + 8*u
	c.notesTop = y
	for _, n := range c.notes {
		c.text(n, x0, y+12*u, 0, 0.35, c.notePt(), false, color.RGBA{0x40, 0x40, 0x40, 0xFF})
		y += c.noteStep()
	}
}

// keyTable draws table below the legend and its note lines, one row per
// note line: the first column left-aligned, the others right-aligned, the
// head row bold.
func (c *canvas) keyTable(table [][]string) {
	if len(table) == 0 {
		return
	}
	u := c.u
	y := c.notesTop + float64(len(c.notes))*c.noteStep()
	pt := c.notePt()
	face := c.face(pt, false)
	ncol := len(table[0])
	widths := make([]float64, ncol)
	for _, r := range table {
		for k, cell := range r {
			widths[k] = math.Max(widths[k], float64(font.MeasureString(face, cell))/64*1.08)
		}
	}
	for ri, r := range table {
		x := c.fx
		for k, cell := range r {
			ax := 1.0
			at := x + widths[k]
			if k == 0 {
				ax, at = 0, x
			}
			c.text(cell, at, y+12*u, ax, 0.35, pt, ri == 0, colInk)
			x += widths[k] + 24*u
		}
		y += c.noteStep()
	}
}

// swatchFill draws a filled rectangle swatch with a thin outline.
func swatchFill(fill color.Color, edge color.Color) func(c *canvas, x, y, w, h float64) {
	return func(c *canvas, x, y, w, h float64) {
		c.dc.SetColor(fill)
		c.dc.DrawRectangle(x, y, w, h)
		c.dc.Fill()
		if edge != nil {
			c.dc.SetColor(edge)
			c.dc.SetLineWidth(1.2 * c.u)
			c.dc.DrawRectangle(x, y, w, h)
			c.dc.Stroke()
		}
	}
}

// swatchHatch draws the exclusion-zone swatch.
func swatchHatch(c *canvas, x, y, w, h float64) {
	c.dc.Push()
	c.dc.DrawRectangle(x, y, w, h)
	c.dc.Clip()
	c.dc.SetColor(colExcluded)
	c.dc.DrawRectangle(x, y, w, h)
	c.dc.Fill()
	c.hatchLines(x, y, x+w, y+h)
	c.dc.ResetClip()
	c.dc.Pop()
	c.dc.SetColor(colHatch)
	c.dc.SetLineWidth(1.2 * c.u)
	c.dc.DrawRectangle(x, y, w, h)
	c.dc.Stroke()
}

// hatchLines strokes 45° lines over the pixel box (clip first).
func (c *canvas) hatchLines(x0, y0, x1, y1 float64) {
	step := 9 * c.u
	c.dc.SetColor(colHatch)
	c.dc.SetLineWidth(1.3 * c.u)
	for t := x0 - (y1 - y0); t < x1; t += step {
		c.dc.MoveTo(t, y1)
		c.dc.LineTo(t+(y1-y0), y0)
	}
	c.dc.Stroke()
}

// swatchDot draws a site mark swatch.
func swatchDot(c *canvas, x, y, w, h float64) {
	c.siteMark(x+w/2, y+h/2, 4.5*c.u)
	c.dc.Fill()
}

// swatchLine draws a line swatch.
func swatchLine(col color.Color, width float64) func(c *canvas, x, y, w, h float64) {
	return func(c *canvas, x, y, w, h float64) {
		c.dc.SetColor(col)
		c.dc.SetLineWidth(width * c.u)
		c.dc.DrawLine(x, y+h/2, x+w, y+h/2)
		c.dc.Stroke()
	}
}

// siteMark adds a site dot to the path and sets the ink colour.
func (c *canvas) siteMark(x, y, rho float64) {
	c.dc.SetColor(colInk)
	c.dc.DrawCircle(x, y, rho)
}

// encode returns the page as PNG bytes.
func (c *canvas) encode() ([]byte, error) {
	var b bytes.Buffer
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	if err := enc.Encode(&b, c.dc.Image()); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}
