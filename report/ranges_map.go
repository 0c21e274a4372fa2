// The coverage map of devices with their own ranges: each device's disk
// at its own radius (filled as one union, so the covered area reads as
// one colour), the disk outlines coloured by device type with a legend row
// per type and range, the gaps at the planned ranges and their deepest
// points. Disks are polygons within 0.2 px of true circles (circleSides),
// as on the common-range map.

package report

import (
	"fmt"
	"image/color"
)

// typeEdges colours the disk outlines of the (type, range) groups in
// order; further groups reuse them cyclically.
var typeEdges = []color.RGBA{oiBlue, oiGreen, oiPurple, oiOrange, colInk}

func (rs *rangesScene) coverageMap(width int) ([]byte, error) {
	return encodeMap(rs.drawCoverageMap(width))
}

// drawCoverageMap draws the coverage map at the planned ranges.
func (rs *rangesScene) drawCoverageMap(width int) (*canvas, error) {
	a := rs.ra
	groups := rs.groups(nil)
	items := []legendItem{{"Covered: within its own range of a device", swatchFill(colCovered, nil)}}
	for k, g := range groups {
		items = append(items, legendItem{fmt.Sprintf("%s: range %s (%s)", typeName(g.Type), metresShort(g.RangeM), Plural(g.Devices, "device")),
			swatchLine(typeEdges[k%len(typeEdges)], 3)})
	}
	numbered := min(len(a.Gaps), maxNumbered)
	if len(a.Gaps) > 0 {
		items = append(items, legendItem{"Gap: not covered at the planned ranges", swatchFill(colGap, nil)},
			legendItem{"Deepest point of a gap", swatchDeepest})
	}
	items = append(items, legendItem{"Device site", swatchDot})
	items = append(items, rs.contextLegend()...)
	key := mapKey{items: items, notes: []string{rs.northNote(),
		"Each disk is drawn at its device's own range."}}
	c, d, err := rs.layoutMap(rs.extent(), width, &key, "single disks and small gaps")
	if err != nil {
		return nil, err
	}
	c.title(rs.titled("Coverage at the planned ranges"), fmt.Sprintf("%s %% of %s covered, %s, %.0f m² uncovered",
		CoveredPercent(a.CoveredFraction, a.UncoveredArea, 2), haText(rs.l.AreaM2), Plural(len(a.Gaps), "gap"), a.UncoveredArea))
	areaMask := rs.drawArea(c)
	rs.drawContext(c)
	rs.fillGaps(c, a.Gaps, colGap)
	fill := c.newFill()
	for i, p := range rs.l.Sites {
		rho := rs.rangeOf(i) * c.k
		fill.circle(c.ox+p[0]*c.k, c.oy-p[1]*c.k, rho, unitCircle(circleSides(rho)))
	}
	c.paint(fill.mask(), color.NRGBA(colCovered), areaMask)
	for k, g := range groups {
		edge := c.newFill()
		for i, p := range rs.l.Sites {
			if rs.typeOf(i) != g.Type || rs.rangeOf(i) != g.RangeM {
				continue
			}
			rho := g.RangeM * c.k
			unit := unitCircle(circleSides(rho))
			px, py := c.ox+p[0]*c.k, c.oy-p[1]*c.k
			n := len(unit) / 2
			for j := range n {
				q := (j + 1) % n
				edge.segment(px+rho*unit[2*j], py+rho*unit[2*j+1], px+rho*unit[2*q], py+rho*unit[2*q+1], 1.5*c.u)
			}
		}
		col := typeEdges[k%len(typeEdges)]
		c.paint(edge.mask(), color.NRGBA{col.R, col.G, col.B, 0xC0}, areaMask)
	}
	rs.drawZones(c)
	rs.strokeArea(c)
	rs.drawSites(c, d)
	if len(a.Hidden) > 0 {
		// Hidden devices have no vertex of the regular triangulation, so
		// drawSites (by vertex) leaves them out: mark them here.
		rho := d.siteRadius(c.u)
		marks := c.newFill()
		for _, i := range a.Hidden {
			p := rs.l.Sites[i]
			marks.circle(c.ox+p[0]*c.k, c.oy-p[1]*c.k, rho, unitCircle(circleSides(rho)))
		}
		c.paint(marks.mask(), color.NRGBA(colInk), nil)
	}
	c.gapMarks(a.Gaps[:numbered])
	c.finish(key)
	return c, nil
}
