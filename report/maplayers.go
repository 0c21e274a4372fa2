// Map layers drawn in the local plane and shared by every map: the site
// area and its exclusion zones, the disks of a range, the gaps, the
// clipped cells and their edges, site marks and the marks of deepest and
// farthest points.
//
// Speed: every layer is one path filled or stroked once (all disks in one
// path, all cells of one colour in one path), so a map costs a handful of
// rasterizer passes whatever the number of sites. Per-site labels, disk
// outlines and cell edges are dropped when sites are too dense to show
// them (mean spacing below a few pixels).

package report

import (
	"fmt"
	"image"
	"image/color"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// areaFill adds every ring of the site area to f.
func (s *scene) areaFill(f *fastFill) {
	ar := s.l.Area
	if ar == nil {
		return
	}
	for p := range ar.NumPolygons() {
		for k := int(ar.PolyStart[p]); k < int(ar.PolyStart[p+1]); k++ {
			f.ringXY(ar.Ring(k), k == int(ar.PolyStart[p]))
		}
	}
}

// drawArea paints the page outside the area grey and the area white, and
// returns the area's mask.
func (s *scene) drawArea(c *canvas) *image.Alpha {
	c.dc.SetColor(colOutside)
	c.dc.DrawRectangle(c.fx, c.fy, c.fw, c.fh)
	c.dc.Fill()
	f := c.newFill()
	s.areaFill(f)
	m := f.mask()
	c.paint(m, color.NRGBA(colArea), nil)
	return m
}

// drawZones fills and hatches the exclusion zones (holes of the area).
func (s *scene) drawZones(c *canvas) {
	ar := s.l.Area
	if ar == nil || ar.NumRings() == ar.NumPolygons() {
		return
	}
	f := c.newFill()
	for p := range ar.NumPolygons() {
		for k := int(ar.PolyStart[p]) + 1; k < int(ar.PolyStart[p+1]); k++ {
			f.ringXY(ar.Ring(k), true)
		}
	}
	c.paintHatch(f.mask())
}

// strokeArea draws the outline of the site area and its zones.
func (s *scene) strokeArea(c *canvas) {
	ar := s.l.Area
	if ar == nil {
		return
	}
	f := c.newFill()
	for k := range ar.NumRings() {
		f.polylineXY(ar.Ring(k), 2.2*c.u)
	}
	c.paint(f.mask(), color.NRGBA(colInk), nil)
}

// diskMask returns the mask of every site's disk of radius rho px,
// drawn as the polygon unit (from unitCircle) scaled by rho.
func (s *scene) diskMask(c *canvas, rho float64, unit []float64) *image.Alpha {
	f := c.newFill()
	s.forSites(func(x, y float64) { f.circle(c.ox+x*c.k, c.oy-y*c.k, rho, unit) })
	return f.mask()
}

// diskOutlines strokes every existing device's disk of radius rho px,
// thin and translucent, inside the area (clip).
func (s *scene) diskOutlines(c *canvas, rho float64, unit []float64, clip *image.Alpha) {
	f := c.newFill()
	w := 1.0 * c.u
	s.forSites(func(x, y float64) {
		px, py := c.ox+x*c.k, c.oy-y*c.k
		n := len(unit) / 2
		for i := range n {
			j := (i + 1) % n
			f.segment(px+rho*unit[2*i], py+rho*unit[2*i+1], px+rho*unit[2*j], py+rho*unit[2*j+1], w)
		}
	})
	c.paint(f.mask(), color.NRGBA{colDiskEdge.R, colDiskEdge.G, colDiskEdge.B, 0x90}, clip)
}

// fillGaps paints the outlines of gaps in col.
func (s *scene) fillGaps(c *canvas, gaps []coverage.Gap, col color.RGBA) {
	if len(gaps) == 0 {
		return
	}
	f := c.newFill()
	var tmp []float64
	for _, g := range gaps {
		for _, poly := range g.Outline {
			for k, ring := range poly {
				tmp = ringXY(ring, tmp[:0])
				f.ringXY(tmp, k == 0)
			}
		}
	}
	c.paint(f.mask(), color.NRGBA(col), nil)
}

// paintCells fills the clipped cell of each vertex v in cols[class[v]],
// one path per class, classes in palette order.
func (s *scene) paintCells(c *canvas, class []int, cols []color.RGBA) {
	for k := range cols {
		f := c.newFill()
		drawn := false
		for v, cv := range class {
			if cv == k {
				s.cellFill(f, v)
				drawn = true
			}
		}
		if drawn {
			c.paint(f.mask(), color.NRGBA(cols[k]), nil)
		}
	}
}

// strokeCellEdges strokes every cell edge once, w px wide, in col.
func (s *scene) strokeCellEdges(c *canvas, w float64, col color.NRGBA) {
	f := c.newFill()
	s.cellEdges(f, w)
	c.paint(f.mask(), col, nil)
}

// cellFill adds the rings of vertex v's clipped cell to f.
func (s *scene) cellFill(f *fastFill, v int) {
	cl := s.l.Cells
	for p := cl.SiteStart[v]; p < cl.SiteStart[v+1]; p++ {
		for k := cl.PolyStart[p]; k < cl.PolyStart[p+1]; k++ {
			f.ringXY(cl.XY[2*cl.RingStart[k]:2*cl.RingStart[k+1]], k == cl.PolyStart[p])
		}
	}
}

// cellEdges adds every cell edge once (bisector edges from the lower
// vertex, boundary edges always) as strokes of width w px.
func (s *scene) cellEdges(f *fastFill, w float64) {
	cl := s.l.Cells
	c := f.c
	for v := range len(cl.SiteStart) - 1 {
		for p := cl.SiteStart[v]; p < cl.SiteStart[v+1]; p++ {
			for k := cl.PolyStart[p]; k < cl.PolyStart[p+1]; k++ {
				lo, hi := cl.RingStart[k], cl.RingStart[k+1]
				for i := lo; i < hi; i++ {
					if j := cl.EdgeSource[i]; j >= 0 && int(j) < v {
						continue // drawn from the other side
					}
					n := i + 1
					if n == hi {
						n = lo
					}
					f.segment(c.ox+cl.XY[2*i]*c.k, c.oy-cl.XY[2*i+1]*c.k, c.ox+cl.XY[2*n]*c.k, c.oy-cl.XY[2*n+1]*c.k, w)
				}
			}
		}
	}
}

// ringXY flattens an orb ring into dst as x, y pairs without the closing
// repeat.
func ringXY(r orb.Ring, dst []float64) []float64 {
	n := len(r)
	if n > 1 && r[0] == r[n-1] {
		n--
	}
	for _, p := range r[:n] {
		dst = append(dst, p[0], p[1])
	}
	return dst
}

// forSites calls f with every distinct site position.
func (s *scene) forSites(f func(x, y float64)) {
	if tri := s.l.Tri; tri != nil {
		for v := range tri.NumVertices() {
			f(tri.Coords[2*v], tri.Coords[2*v+1])
		}
		return
	}
	for _, p := range s.l.Sites {
		f(p[0], p[1])
	}
}

// drawSites draws the site marks, and labels when there are few.
func (s *scene) drawSites(c *canvas, d density) {
	rho := s.drawSiteMarks(c, d)
	if len(s.l.Sites) <= maxLabelledSites && d.spacing >= 40*c.u {
		s.labelSites(c, rho)
	}
}

// drawSiteMarks draws the site marks (with a white halo when large
// enough) and returns their radius in px.
func (s *scene) drawSiteMarks(c *canvas, d density) float64 {
	rho := d.siteRadius(c.u)
	ink := color.NRGBA(colInk)
	if d.spacing < 10*c.u {
		ink.A = 0x90 // dense: lighter marks keep the layer beneath visible
	}
	halo := 0.0
	if rho > 2 {
		halo = 1.2 * c.u
	}
	if halo > 0 {
		r := rho + halo
		c.paint(s.diskMask(c, r, unitCircle(circleSides(r))), color.NRGBA{0xFF, 0xFF, 0xFF, 0xFF}, nil)
	}
	c.paint(s.diskMask(c, rho, unitCircle(circleSides(rho))), ink, nil)
	return rho
}

// gapMarks rings the deepest point of each gap and writes its number
// beside it (all rings first, so no ring covers a number).
func (c *canvas) gapMarks(gaps []coverage.Gap) {
	for _, g := range gaps {
		x, y := c.px(g.Deepest)
		c.deepestMark(x, y)
	}
	for _, g := range gaps {
		x, y := c.px(g.Deepest)
		c.haloText(fmt.Sprint(g.ID), x+9*c.u, y-8*c.u, 0, 0, c.labelPt(17), true, colInk)
	}
}

// deepestMarkRadius is the radius of the deepest-point ring in layout
// units; its centre is left open so the gap colour shows through.
const deepestMarkRadius = 7

// deepestMark draws an open ring with a white halo at (x, y).
func (c *canvas) deepestMark(x, y float64) {
	r := deepestMarkRadius * c.u
	c.dc.SetColor(color.White)
	c.dc.SetLineWidth(4.5 * c.u)
	c.dc.DrawCircle(x, y, r)
	c.dc.Stroke()
	c.dc.SetColor(colInk)
	c.dc.SetLineWidth(2.2 * c.u)
	c.dc.DrawCircle(x, y, r)
	c.dc.Stroke()
}

// worstMark draws a diamond at the full-cover worst point.
func (c *canvas) worstMark(x, y float64) {
	r := 9 * c.u
	c.dc.MoveTo(x, y-r)
	c.dc.LineTo(x+r, y)
	c.dc.LineTo(x, y+r)
	c.dc.LineTo(x-r, y)
	c.dc.ClosePath()
	c.haloStroke(4.5*c.u, colWorstMark, 2.2*c.u)
}

// haloStroke strokes gg's current path twice: white and halo px wide,
// then in col and w px wide over it.
func (c *canvas) haloStroke(halo float64, col color.Color, w float64) {
	c.dc.SetColor(color.White)
	c.dc.SetLineWidth(halo)
	c.dc.StrokePreserve()
	c.dc.SetColor(col)
	c.dc.SetLineWidth(w)
	c.dc.Stroke()
}

// coverAlpha is the opacity of the covered fill: opaque, or translucent
// over context layers so the buildings beneath stay visible.
func (s *scene) coverAlpha() uint8 {
	if len(s.m.Context) > 0 || len(s.m.ContextPoints) > 0 {
		return 0xA8
	}
	return 0xFF
}

// drawContext fills and outlines the context polygons (Meta.Context)
// inside the area's frame; it draws nothing without them.
func (s *scene) drawContext(c *canvas) {
	s.drawContextPoints(c)
	if len(s.m.Context) == 0 {
		return
	}
	f := c.newFill()
	var tmp []float64
	for _, poly := range s.m.Context {
		for k, ring := range poly {
			tmp = ringXY(ring, tmp[:0])
			f.ringXY(tmp, k == 0)
		}
	}
	c.paint(f.mask(), color.NRGBA(colContext), nil)
	f = c.newFill()
	for _, poly := range s.m.Context {
		for _, ring := range poly {
			tmp = ringXY(ring, tmp[:0])
			f.polylineXY(tmp, 1.0*c.u)
		}
	}
	c.paint(f.mask(), color.NRGBA(colContextEd), nil)
}

// contextLegend is the legend item of the context layer, when there is
// one.
func (s *scene) contextLegend() []legendItem {
	if len(s.m.Context) == 0 && len(s.m.ContextPoints) == 0 {
		return nil
	}
	return []legendItem{{"Building or other context (drawn only, not analysed)", swatchFill(colContext, colContextEd)}}
}

// contextMarkPx is the half side, in page units, of the square marking a
// context feature given as a point.
const contextMarkPx = 5.0

// drawContextPoints marks the context features given as points
// (Meta.ContextPoints) with small squares in the context colours.
func (s *scene) drawContextPoints(c *canvas) {
	if len(s.m.ContextPoints) == 0 {
		return
	}
	r := contextMarkPx * c.u
	fill, edge := c.newFill(), c.newFillSeparate()
	for _, p := range s.m.ContextPoints {
		x, y := c.px(p)
		sq := []float64{x - r, y - r, x + r, y - r, x + r, y + r, x - r, y + r}
		fill.ringPx(sq, 1)
		edge.ringPx([]float64{x - r - c.u, y - r - c.u, x + r + c.u, y - r - c.u, x + r + c.u, y + r + c.u, x - r - c.u, y + r + c.u}, 1)
		edge.ringPx(sq, -1)
	}
	c.paint(edge.mask(), color.NRGBA(colContextEd), nil)
	c.paint(fill.mask(), color.NRGBA(colContext), nil)
}
