// The "devices in reach" map: the site area coloured by how many devices
// reach each spot at the planned range (with own ranges, each device at
// its own: the order-k power diagram) — the disjoint bands 0, 1, …, K−1
// and "K or more" of coverage.KCoverage.Bands — with the parts reached by
// fewer than K devices (the K-gaps) numbered by closing range, their
// deepest spots ringed, and a table of the largest.
//
// The bands tile the site area (exact overlays of the k-gap outlines, arcs
// as chords with sagitta at most 0.2 % of the range: far below a pixel on
// a site map), so each spot gets exactly one colour; the legend gives each
// band's exact share (closed forms, KCover). The area is first painted in
// the "K or more" colour and the other bands over it, so anti-aliased band
// edges blend into a colour of the map rather than the background.
//
// Palette: ColorBrewer YlGnBu (Brewer, colorbrewer2.org: sequential,
// marked colour-blind safe), light for few devices, dark for many, spread
// over eight of its nine classes; at most eight bands (k beyond 7 joins
// the last).

package report

import (
	"fmt"
	"image/color"
	"math"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// reachPalette is ColorBrewer's 9-class YlGnBu without its lightest class
// (near white, too close to the map's background for the band reached by
// no device).
var reachPalette = []color.RGBA{
	{0xED, 0xF8, 0xB1, 0xFF}, {0xC7, 0xE9, 0xB4, 0xFF}, {0x7F, 0xCD, 0xBB, 0xFF},
	{0x41, 0xB6, 0xC4, 0xFF}, {0x1D, 0x91, 0xC0, 0xFF}, {0x22, 0x5E, 0xA8, 0xFF}, {0x25, 0x34, 0x94, 0xFF},
	{0x08, 0x1D, 0x58, 0xFF},
}

// reachColours returns n colours from the palette, spread over it (light
// to dark); n ≤ len(reachPalette).
func reachColours(n int) []color.RGBA {
	out := make([]color.RGBA, n)
	m := len(reachPalette)
	for i := range out {
		j := 0
		if n > 1 {
			j = i * (m - 1) / (n - 1)
		}
		out[i] = reachPalette[j]
	}
	return out
}

// reachMap draws the map as PNG. It needs every level 1 … K computed with
// its gaps (coverage.KCoverage.Bands).
func (s *scene) reachMap(kc *coverage.KCoverage, width int) ([]byte, error) {
	return encodeMap(s.drawReachMap(kc, width, reachMarks{}))
}

// reachMarks are the planning marks a reach map may carry (suggest
// --reach): the added devices or picked spots (labelled as devices of the
// layout they join) and the spots not picked.
type reachMarks struct {
	added  []orb.Point
	label  string // legend of the added marks
	others []orb.Point
	title  string // replaces the analysis title when set
	sub    string // replaces the analysis subtitle when set
}

// reachBandLabel is the legend text of band b: the number of devices in
// reach and the band's exact share of the site.
func reachBandLabel(b coverage.KBand) string {
	n := fmt.Sprintf("%d devices", b.Devices)
	if b.Devices == 1 {
		n = "1 device"
	}
	if b.OrMore {
		n = fmt.Sprintf("%d or more devices", b.Devices)
	}
	return fmt.Sprintf("%s in reach (%.2f %%)", n, 100*b.Share)
}

// reachGapTable lists the largest parts reached by fewer than K devices
// (number, area, closing range) as the coverage map's gap table does;
// nil when there is none. With own ranges (own set) the closing figure is
// the range the longest-range devices need when all ranges grow together,
// √(r_max² + t) for the part's closing growth t.
func (s *scene) reachGapTable(K int, gaps []coverage.KGap, own bool) [][]string {
	g := make([]coverage.Gap, len(gaps))
	ref := ""
	for i, kg := range gaps {
		g[i] = coverage.Gap{ID: kg.ID, Area: kg.Area, ClosingRange: kg.ClosingRange}
		if own {
			var r float64
			ref, r = s.reachLongest(kg.ClosingPower)
			g[i].ClosingRange = r
		}
	}
	t := gapTable(g)
	if t == nil {
		return nil
	}
	if own {
		t[0][2] = ref + " at"
	}
	t[0][0] = fmt.Sprintf("Short of %d", K)
	for _, row := range t[1:] {
		row[0] = "Part " + strings.TrimPrefix(row[0], "Gap ")
	}
	return t
}

// reachLongest returns the name of the group of devices with the longest
// planned range (its type, else "longest range") and the range it needs
// under the uniform power growth t, √(r_max² + t).
func (s *scene) reachLongest(t float64) (string, float64) {
	name, rmax := "", 0.0
	for _, g := range (&rangesScene{scene: s}).groups(nil) {
		if g.RangeM > rmax {
			name, rmax = g.Type, g.RangeM
		}
	}
	if name == "" {
		name = "longest range"
	}
	return name, math.Sqrt(math.Max(0, rmax*rmax+t))
}

// reachNeededShort is the map's short form of the ranges each group of
// devices needs under the growth t: "TYPE X m" per group (the planned
// range for devices without a type, "r -> X m").
func (s *scene) reachNeededShort(t float64) string {
	planned := (&rangesScene{scene: s}).groups(nil)
	var p []string
	for k, g := range s.reachNeeded(t) {
		head := metresShort(planned[k].RangeM) + " ->"
		if g.Type != "" {
			head = g.Type
		}
		p = append(p, head+" "+metresShort(g.RangeM))
	}
	return strings.Join(p, ", ")
}

// colReachNew fills the marks of added devices and picked spots:
// vermilion (Okabe & Ito's colour-blind-safe set), apart from every
// YlGnBu class in hue and from the dark ones in lightness.
var colReachNew = oiVermilion

func swatchReachNew(c *canvas, x, y, w, h float64) { c.newMarkIn(x+w/2, y+h/2, 7*c.u, colReachNew) }

// swatchReachDeepest is the legend swatch of a numbered part's deepest
// spot: the ring over the lightest band colour.
func swatchReachDeepest(c *canvas, x, y, w, h float64) {
	c.dc.SetColor(reachPalette[0])
	c.dc.DrawRectangle(x, y, w, h)
	c.dc.Fill()
	c.deepestMark(x+w/2, y+h/2)
}

// drawReachMap draws the bands, the numbered K-gaps, the devices and the
// planning marks mk.
func (s *scene) drawReachMap(kc *coverage.KCoverage, width int, mk reachMarks) (*canvas, error) {
	bands, err := kc.Bands(s.l)
	if err != nil {
		return nil, err
	}
	top := kc.Levels[len(kc.Levels)-1]
	// At most len(reachPalette) classes: the bands from the last class on
	// join it ("K or more" with K = len(reachPalette) − 1).
	classes := min(len(bands), len(reachPalette))
	if classes < len(bands) {
		last := &bands[classes-1]
		last.OrMore = true
		for _, b := range bands[classes:] {
			last.Area += b.Area
			last.Share += b.Share
			last.Outline = append(last.Outline, b.Outline...)
		}
		bands = bands[:classes]
	}
	cols := reachColours(classes)
	var items []legendItem
	for j, b := range bands {
		if len(b.Outline) > 0 { // the legend lists only the bands on the map
			items = append(items, legendItem{reachBandLabel(b), swatchFill(cols[j], nil)})
		}
	}
	numbered := min(len(top.Gaps), maxNumbered)
	gaps := make([]coverage.Gap, numbered)
	for i, g := range top.Gaps[:numbered] {
		gaps[i] = coverage.Gap{ID: g.ID, Deepest: g.Deepest}
	}
	if numbered > 0 {
		items = append(items, legendItem{fmt.Sprintf("Part reached by fewer than %d devices: number (by closing range), ring at its deepest spot", top.K), swatchReachDeepest})
	}
	items = append(items, legendItem{"Device site", swatchDot})
	if len(mk.added) > 0 {
		items = append(items, legendItem{mk.label, swatchReachNew})
	}
	if len(mk.others) > 0 {
		items = append(items, legendItem{"Candidate spot not picked", swatchSpot})
	}
	own := reachOwn(kc)
	method := "order-k Voronoi pieces, Lee 1982"
	if own {
		method = "order-k power diagram, Aurenhammer 1987, Lee 1982; each device at its own planned range, all ranges grown together for the closing figures"
	}
	key := mapKey{items: items, notes: []string{
		s.northNote(),
		"Bands exact (" + method + "), with their share of the site. Palette: ColorBrewer YlGnBu (sequential, colour-blind safe). Devices at the same spot count once.",
	}, table: s.reachGapTable(top.K, top.Gaps, own)}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single devices and small parts")
	if err != nil {
		return nil, err
	}
	title := s.titled(fmt.Sprintf("Devices in reach at %s", metresShort(kc.Range)))
	sub := fmt.Sprintf("%.2f %% of %s reached by %d or more devices; all of it at %s", 100*top.Share, haText(s.l.AreaM2), top.K, metresShort(top.CoverRange))
	if own {
		title = s.titled("Devices in reach at their own ranges")
		sub = fmt.Sprintf("%.2f %% of %s reached by %d or more devices; all of it at %s", 100*top.Share, haText(s.l.AreaM2), top.K, s.reachNeededShort(top.CoverPower))
	}
	if mk.title != "" {
		title, sub = s.titled(mk.title), mk.sub
	}
	c.title(title, sub)
	areaMask := s.drawArea(c)
	c.paint(areaMask, color.NRGBA(cols[classes-1]), nil)
	for j := classes - 2; j >= 0; j-- {
		s.fillGaps(c, []coverage.Gap{{Outline: bands[j].Outline}}, cols[j])
	}
	s.drawZones(c)
	s.strokeArea(c)
	s.drawSites(c, d)
	for _, q := range mk.others {
		x, y := c.px(q)
		c.spotMark(x, y, 6*c.u)
	}
	for _, q := range mk.added {
		x, y := c.px(q)
		c.newMarkIn(x, y, 7*c.u, colReachNew)
	}
	c.gapMarks(gaps)
	c.finish(key)
	return c, nil
}
