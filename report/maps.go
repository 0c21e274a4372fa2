// The two analysis maps: service areas and coverage at the planned range.
// They are drawn with the map kit shared with the planning maps
// (mapkit.go: page, legend, titles; maplayers.go: area, disks, gaps,
// cells and sites; maplabels.go: label placement; cellcolours.go: the
// service-area colouring; draw.go and raster.go: the canvas and the fast
// fills).

package report

import (
	"cmp"
	"fmt"
	"image/color"
	"slices"

	"github.com/sitecover/sitecover/coverage"
)

// maxNumbered is how many gaps get a number and a deepest-point mark.
const maxNumbered = 40

// drawServiceAreaMap draws the service-area map.
func (s *scene) drawServiceAreaMap(width int) (*canvas, error) {
	items := []legendItem{
		{"Service area: the part of the site nearest to one device (colours only tell neighbours apart)", swatchFill(cellPalette[0], colCellEdge)},
		{"Device site", swatchDot},
	}
	key := mapKey{items: items, notes: []string{s.northNote()}}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single service areas")
	if err != nil {
		return nil, err
	}
	n := len(s.l.Sites)
	title := s.titled("Service areas")
	sub := fmt.Sprintf("%s, site area %s; each device serves the part of the site nearest to it", Plural(n, "site"), haText(s.l.AreaM2))
	c.title(title, sub)

	s.drawArea(c)
	if cl := s.l.Cells; cl != nil {
		cols := s.cellColours()
		class := make([]int, len(cl.SiteStart)-1)
		for v := range class {
			class[v] = int(cols[v]) % len(cellPalette)
		}
		s.paintCells(c, class, cellPalette)
		if d.spacing >= 4*c.u {
			w, alpha := 1.0*c.u, uint8(0xB0)
			if d.spacing < 12*c.u {
				w, alpha = 0.6, 0x80
			}
			s.strokeCellEdges(c, w, color.NRGBA{0x44, 0x44, 0x44, alpha})
		}
	}
	s.drawZones(c)
	s.strokeArea(c)
	s.drawSites(c, d)
	c.finish(key)
	return c, nil
}

func (s *scene) serviceAreaMap(width int) ([]byte, error) {
	return encodeMap(s.drawServiceAreaMap(width))
}

// drawCoverageMap draws the coverage map at the planned range.
func (s *scene) drawCoverageMap(width int) (*canvas, error) {
	a := s.a
	numbered := min(len(a.Gaps), maxNumbered)
	gapLabel := "Gap: not covered at the planned range, numbered by closing range (1 closes last)"
	if numbered < len(a.Gaps) {
		gapLabel = fmt.Sprintf("Gap: not covered at the planned range (the %d with the largest closing range are numbered)", numbered)
	}
	items := []legendItem{{fmt.Sprintf("Covered: within %s of a device", metresShort(a.Range)), swatchFill(colCovered, colDiskEdge)}}
	switch {
	case len(a.Gaps) > 0:
		items = append(items, legendItem{gapLabel, swatchFill(colGap, nil)},
			legendItem{"Deepest point of a gap (where it closes last)", swatchDeepest})
	case len(a.FullCover.Worst) > 0:
		items = append(items, legendItem{"Point farthest from every device (full-cover range needed there)", swatchWorst})
	}
	items = append(items, legendItem{"Device site", swatchDot})
	items = append(items, s.contextLegend()...)
	key := mapKey{items: items, notes: []string{
		s.northNote(),
		"Disks drawn within 0.2 px of true circles, over the gaps, so gap edges along disks are true arcs too.",
	}, table: gapTable(a.Gaps)}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single disks and small gaps")
	if err != nil {
		return nil, err
	}
	title := s.titled("Coverage at " + metresShort(a.Range))
	sub := fmt.Sprintf("%s %% of %s covered, %s, %.0f m² uncovered; full cover needs %s",
		CoveredPercent(a.CoveredFraction, a.UncoveredArea, 2), haText(s.l.AreaM2), Plural(len(a.Gaps), "gap"), a.UncoveredArea, metresShort(a.FullCover.Range))
	c.title(title, sub)

	areaMask := s.drawArea(c)
	s.drawContext(c)
	// Gaps first, disks over them: the gap outlines replace arcs by chords
	// lying inside the disks, so the disks drawn on top restore the true
	// circular edge (within 0.2 px). Over a context layer the disks are
	// translucent, so the gaps go on top instead (their chords then
	// overhang the disks by at most the sagitta, 0.2 % of the range).
	translucent := s.coverAlpha() < 0xFF
	if !translucent {
		s.fillGaps(c, a.Gaps, colGap)
	}
	rho := a.Range * c.k
	unit := unitCircle(circleSides(rho))
	cov := color.NRGBA(colCovered)
	cov.A = s.coverAlpha()
	c.paint(s.diskMask(c, rho, unit), cov, areaMask) // disks only inside the area
	if translucent {
		s.fillGaps(c, a.Gaps, colGap)
	}
	if d.spacing >= 8*c.u && rho >= 3 {
		s.diskOutlines(c, rho, unit, areaMask)
	}
	s.drawZones(c)

	s.strokeArea(c)
	s.drawSites(c, d)
	c.gapMarks(a.Gaps[:numbered])
	if len(a.Gaps) == 0 {
		for _, p := range a.FullCover.Worst[:min(len(a.FullCover.Worst), maxNumbered)] {
			x, y := c.px(p)
			c.worstMark(x, y)
		}
	}
	c.finish(key)
	return c, nil
}

func (s *scene) coverageMap(width int) ([]byte, error) {
	return encodeMap(s.drawCoverageMap(width))
}

func swatchDeepest(c *canvas, x, y, w, h float64) {
	c.dc.SetColor(colGap)
	c.dc.DrawRectangle(x, y, w, h)
	c.dc.Fill()
	c.deepestMark(x+w/2, y+h/2)
}

func swatchWorst(c *canvas, x, y, w, h float64) { c.worstMark(x+w/2, y+h/2) }

// maxGapTableRows is how many gaps the coverage map's table lists.
const maxGapTableRows = 5

// gapTable is the coverage map's table of the largest gaps by area: the
// gap's number on the map, its area and the range that closes it; nil
// without gaps.
func gapTable(gaps []coverage.Gap) [][]string {
	if len(gaps) == 0 {
		return nil
	}
	idx := make([]int, len(gaps))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(i, j int) int { return cmp.Compare(gaps[j].Area, gaps[i].Area) })
	head := "Largest gaps"
	if len(gaps) <= maxGapTableRows {
		head = "Gaps"
	}
	t := [][]string{{head, "Area m²", "Closes at"}}
	for _, i := range idx[:min(len(idx), maxGapTableRows)] {
		g := gaps[i]
		t = append(t, []string{fmt.Sprintf("Gap %d", g.ID), fmt.Sprintf("%.0f", g.Area), metres(g.ClosingRange)})
	}
	return t
}
