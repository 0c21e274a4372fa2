// The "devices in reach" map: the site area coloured by how many devices
// reach each spot at the planned range (0, 1, …, K−1, K or more), with the
// K-gaps numbered by closing range.
//
// The bands come from the k-gap outlines of every k = 1 … K (each the part
// reached by fewer than k devices; they nest): the area is painted in the
// "K or more" colour, then the parts reached by fewer than k devices for
// k = K, K−1, …, 1 in the colours of k−1 devices. Outlines replace arcs by
// chords (sagitta 0.2 % of the range), far below a pixel on a site map.
//
// Palette: ColorBrewer YlGnBu (Brewer, colorbrewer2.org: sequential,
// marked colour-blind safe), light for few devices, dark for many.

package report

import (
	"fmt"
	"image/color"

	"github.com/sitecover/sitecover/coverage"
)

// reachPalette is ColorBrewer's 7-class YlGnBu.
var reachPalette = []color.RGBA{
	{0xFF, 0xFF, 0xCC, 0xFF}, {0xC7, 0xE9, 0xB4, 0xFF}, {0x7F, 0xCD, 0xBB, 0xFF}, {0x41, 0xB6, 0xC4, 0xFF},
	{0x1D, 0x91, 0xC0, 0xFF}, {0x22, 0x5E, 0xA8, 0xFF}, {0x0C, 0x2C, 0x84, 0xFF},
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

// reachMap draws the map as PNG. The bands need every level 1 … K; a
// level not computed leaves its band merged with the next.
func (s *scene) reachMap(kc *coverage.KCoverage, width int) ([]byte, error) {
	return encodeMap(s.drawReachMap(kc, width))
}

func (s *scene) drawReachMap(kc *coverage.KCoverage, width int) (*canvas, error) {
	top := kc.Levels[len(kc.Levels)-1]
	K := min(top.K, len(reachPalette)-1)
	cols := reachColours(K + 1)
	var items []legendItem
	for j := 0; j <= K; j++ {
		label := fmt.Sprintf("%d devices in reach", j)
		switch {
		case j == 1:
			label = "1 device in reach"
		case j == K:
			label = fmt.Sprintf("%d or more devices in reach", j)
		}
		items = append(items, legendItem{label, swatchFill(cols[j], nil)})
	}
	gaps := make([]coverage.Gap, 0, min(len(top.Gaps), maxNumbered))
	for _, g := range top.Gaps[:min(len(top.Gaps), maxNumbered)] {
		gaps = append(gaps, coverage.Gap{ID: g.ID, Deepest: g.Deepest})
	}
	items = append(items, legendItem{fmt.Sprintf("Deepest spot of a part reached by fewer than %d devices, numbered by closing range", top.K), swatchDeepest},
		legendItem{"Device site", swatchDot})
	key := mapKey{items: items, notes: []string{
		s.northNote(),
		"Palette: ColorBrewer YlGnBu (sequential, colour-blind safe). Devices at the same spot count once.",
	}}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single devices and small parts")
	if err != nil {
		return nil, err
	}
	c.title(s.titled(fmt.Sprintf("Devices in reach at %s", metresShort(kc.Range))),
		fmt.Sprintf("%.2f %% of %s reached by %d or more devices; all of it at %s", 100*top.Share, haText(s.l.AreaM2), top.K, metresShort(top.CoverRange)))
	areaMask := s.drawArea(c)
	c.paint(areaMask, color.NRGBA(cols[K]), nil)
	for li := len(kc.Levels) - 1; li >= 0; li-- {
		lv := kc.Levels[li]
		if lv.K > K+1 || len(lv.Gaps) == 0 {
			continue
		}
		band := make([]coverage.Gap, len(lv.Gaps))
		for i, g := range lv.Gaps {
			band[i] = coverage.Gap{Outline: g.Outline}
		}
		s.fillGaps(c, band, cols[lv.K-1])
	}
	s.drawZones(c)
	s.strokeArea(c)
	s.drawSites(c, d)
	c.gapMarks(gaps)
	c.finish(key)
	return c, nil
}
