// The two PNG maps: service areas and coverage at the planned range.
//
// Service areas are coloured so that cells sharing an edge differ: the
// adjacency of the clipped cells is a subgraph of the Delaunay
// triangulation, hence planar and 5-degenerate, and greedy colouring in
// smallest-last order (Matula & Beck, "Smallest-last ordering and
// clustering and graph coloring algorithms", J. ACM 30, 1983) uses at most
// six colours; the palette has seven.
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
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"golang.org/x/image/font"
)

// maxNumbered is how many gaps get a number and a deepest-point mark.
const maxNumbered = 40

// maxLabelledSites is the largest site count labelled by name on a map.
const maxLabelledSites = 60

// density describes how crowded the sites are on the page.
type density struct {
	spacing float64 // mean site spacing in px
}

func (s *scene) density(c *canvas) density { return s.densityAt(c.k) }

// densityAt returns the site density at scale k px/m.
func (s *scene) densityAt(k float64) density {
	n := 1
	if s.l.Tri != nil {
		n = max(s.l.Tri.NumVertices(), 1)
	} else if len(s.l.Sites) > 0 {
		n = len(s.l.Sites)
	}
	// spacing over the area actually drawn
	a := s.l.AreaM2 * k * k
	if !(a > 0) {
		return density{spacing: math.Inf(1)}
	}
	return density{spacing: math.Sqrt(a / float64(n))}
}

func (d density) siteRadius(u float64) float64 {
	switch {
	case d.spacing >= 30*u:
		return 4.5 * u
	case d.spacing >= 10*u:
		return 2.5 * u
	default:
		return math.Max(0.8, math.Min(1.5*u, d.spacing/5))
	}
}

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

// denseNote returns a map note when the sites are too dense to show one
// by one at this width, or "".
func (s *scene) denseNote(width int, what string) string {
	u := float64(width) / 1600
	k, _ := frameScale(s.extent(), float64(width)-56*u)
	d := s.densityAt(k)
	if d.spacing >= 8*u {
		return ""
	}
	return fmt.Sprintf("Sites are %.1f px apart on average at this width: %s cannot be told apart here; use %s in a GIS.", d.spacing, what, "the GeoJSON layers")
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

// labelSites writes each distinct site's label beside its mark, trying
// four positions (upper right, lower right, upper left, lower left) and
// taking the first that overlaps no earlier label, no site mark and stays
// in the frame; failing that, the one with the least overlap.
func (s *scene) labelSites(c *canvas, rho float64) {
	var taken []labelBox
	s.forSites(func(x, y float64) {
		px, py := c.ox+x*c.k, c.oy-y*c.k
		taken = append(taken, labelBox{px - rho - 1, py - rho - 1, px + rho + 1, py + rho + 1})
	})
	frame := c.labelFrame()
	face := c.face(14, false)
	seen := map[orb.Point]bool{}
	gap := 3 * c.u
	for i, p := range s.l.Sites {
		if seen[p] {
			continue
		}
		seen[p] = true
		text := s.shortLabel(i)
		w := float64(font.MeasureString(face, text)) / 64
		h := 14 * c.u * 0.78 // cap height and a little
		x, y := c.px(p)
		cands := []labelBox{
			{x + rho + gap, y - rho - h, x + rho + gap + w, y - rho},
			{x + rho + gap, y + rho, x + rho + gap + w, y + rho + h},
			{x - rho - gap - w, y - rho - h, x - rho - gap, y - rho},
			{x - rho - gap - w, y + rho, x - rho - gap, y + rho + h},
		}
		b := pickLabelBox(cands, taken, frame, w*h)
		taken = append(taken, b)
		c.haloText(text, b.x0, b.y1, 0, 0, 14, false, colInk)
	}
}

// titled returns a map or report title: base, then the report title if
// any.
func (s *scene) titled(base string) string {
	if s.m.Title != "" {
		return base + ": " + s.m.Title
	}
	return base
}

// northNote is the map note on orientation and the plane drawn in.
func (s *scene) northNote() string {
	return "North up: the y axis of the local plane (grid north). " + s.planeNote()
}

// areaLegend returns the legend items that close every map legend: the
// site area outline and the exclusion zones.
func areaLegend() []legendItem {
	return []legendItem{
		{"Site area outline", swatchLine(colInk, 2.2)},
		{"Exclusion zone (no coverage needed)", swatchHatch},
	}
}

// mapKey is what a map's legend shows: its items and its notes.
type mapKey struct {
	items []legendItem
	notes []string
}

// layoutMap closes key with the area legend and, when the sites are too
// dense to tell apart at this width, a note that dense (what cannot be
// told apart) is best seen in a GIS; it then lays out the page over ext
// and returns it with the site density on it.
func (s *scene) layoutMap(ext orb.Bound, width int, key *mapKey, dense string) (*canvas, density, error) {
	key.items = append(key.items, areaLegend()...)
	if n := s.denseNote(width, dense); n != "" {
		key.notes = append(key.notes, n)
	}
	c, err := layoutCanvas(ext, width, key.items, len(key.notes))
	if err != nil {
		return nil, density{}, err
	}
	return c, s.density(c), nil
}

// finish draws what frames every map: the frame, the scale bar, the
// north arrow and the legend of key.
func (c *canvas) finish(key mapKey) {
	c.frame()
	c.scaleBar()
	c.northArrow()
	c.legend(key.items, key.notes)
}

// encodeMap encodes a drawn map as PNG, or passes on the drawing error.
func encodeMap(c *canvas, err error) ([]byte, error) {
	if err != nil {
		return nil, err
	}
	return c.encode()
}

// diskMask returns the mask of every site's disk of radius rho px,
// drawn as the polygon unit (from unitCircle) scaled by rho.
func (s *scene) diskMask(c *canvas, rho float64, unit []float64) *image.Alpha {
	f := c.newFill()
	s.forSites(func(x, y float64) { f.circle(c.ox+x*c.k, c.oy-y*c.k, rho, unit) })
	return f.mask()
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

// gapMarks rings the deepest point of each gap and writes its number
// beside it (all rings first, so no ring covers a number).
func (c *canvas) gapMarks(gaps []coverage.Gap) {
	for _, g := range gaps {
		x, y := c.px(g.Deepest)
		c.deepestMark(x, y)
	}
	for _, g := range gaps {
		x, y := c.px(g.Deepest)
		c.haloText(fmt.Sprint(g.ID), x+9*c.u, y-8*c.u, 0, 0, 17, true, colInk)
	}
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

// labelBox is the box of a label or a mark, in px.
type labelBox struct{ x0, y0, x1, y1 float64 }

// boxOverlap returns the area a and b share.
func boxOverlap(a, b labelBox) float64 {
	w := math.Min(a.x1, b.x1) - math.Max(a.x0, b.x0)
	h := math.Min(a.y1, b.y1) - math.Max(a.y0, b.y0)
	if w <= 0 || h <= 0 {
		return 0
	}
	return w * h
}

// labelFrame is the box labels must stay in: the frame less 2 px.
func (c *canvas) labelFrame() labelBox {
	return labelBox{c.fx + 2, c.fy + 2, c.fx + c.fw - 2, c.fy + c.fh - 2}
}

// pickLabelBox returns the first candidate box of a label of the given
// area that overlaps nothing taken and stays in frame; failing that, the
// one of least cost, the overlap with taken boxes plus four times the
// part outside the frame.
func pickLabelBox(cands, taken []labelBox, frame labelBox, area float64) labelBox {
	best, bestCost := 0, math.Inf(1)
	for k, b := range cands {
		cost := 0.0
		for _, t := range taken {
			cost += boxOverlap(b, t)
		}
		cost += 4 * (area - boxOverlap(b, frame))
		if cost < bestCost-1e-9 {
			best, bestCost = k, cost
		}
		if cost == 0 {
			break
		}
	}
	return cands[best]
}

// shortLabel is a site's map label: its name, or #i.
func (s *scene) shortLabel(i int) string {
	if n := s.name(i); n != "" {
		return n
	}
	return fmt.Sprintf("#%d", i)
}

// cellColours colours the clipped cells so that neighbours differ, by
// greedy colouring in smallest-last order. It returns a palette index per
// triangulation vertex.
func (s *scene) cellColours() []int8 {
	cl := s.l.Cells
	n := len(cl.SiteStart) - 1
	if n <= 0 {
		return nil
	}
	// neighbour pairs from the cell edges lying on bisectors
	var keys []uint64
	for v := range n {
		for p := cl.SiteStart[v]; p < cl.SiteStart[v+1]; p++ {
			for k := cl.PolyStart[p]; k < cl.PolyStart[p+1]; k++ {
				for i := cl.RingStart[k]; i < cl.RingStart[k+1]; i++ {
					j := cl.EdgeSource[i]
					if j < 0 || int(j) == v || int(j) >= n {
						continue
					}
					a, b := uint64(v), uint64(j)
					if a > b {
						a, b = b, a
					}
					keys = append(keys, a<<32|b)
				}
			}
		}
	}
	slices.Sort(keys)
	keys = slices.Compact(keys)
	deg := make([]int32, n+1)
	for _, key := range keys {
		deg[key>>32]++
		deg[key&0xffffffff]++
	}
	start := make([]int32, n+1)
	for v := range n {
		start[v+1] = start[v] + deg[v]
	}
	adj := make([]int32, start[n])
	fill := slices.Clone(start[:n])
	for _, key := range keys {
		a, b := int32(key>>32), int32(key&0xffffffff)
		adj[fill[a]] = b
		fill[a]++
		adj[fill[b]] = a
		fill[b]++
	}
	// smallest-last order with degree buckets
	d := make([]int32, n)
	maxDeg := int32(0)
	for v := range n {
		d[v] = start[v+1] - start[v]
		maxDeg = max(maxDeg, d[v])
	}
	buckets := make([][]int32, maxDeg+1)
	for v := range n {
		buckets[d[v]] = append(buckets[d[v]], int32(v))
	}
	removed := make([]bool, n)
	order := make([]int32, 0, n)
	low := int32(0)
	for len(order) < n {
		for low > 0 && len(buckets[low-1]) > 0 {
			low--
		}
		for len(buckets[low]) == 0 {
			low++
		}
		b := buckets[low]
		v := b[len(b)-1]
		buckets[low] = b[:len(b)-1]
		if removed[v] || d[v] != low {
			continue // stale entry
		}
		removed[v] = true
		order = append(order, v)
		for _, w := range adj[start[v]:start[v+1]] {
			if !removed[w] {
				d[w]--
				buckets[d[w]] = append(buckets[d[w]], w)
			}
		}
	}
	col := make([]int8, n)
	for i := range col {
		col[i] = -1
	}
	var used [64]bool
	for i := n - 1; i >= 0; i-- {
		v := order[i]
		for k := range used {
			used[k] = false
		}
		for _, w := range adj[start[v]:start[v+1]] {
			if c := col[w]; c >= 0 && int(c) < len(used) {
				used[c] = true
			}
		}
		c := 0
		for c < len(used)-1 && used[c] {
			c++
		}
		col[v] = int8(c)
	}
	return col
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
	sub := fmt.Sprintf("%d sites, site area %s; each device serves the part of the site nearest to it", n, haText(s.l.AreaM2))
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

func (s *scene) planeNote() string {
	if s.geographic() {
		p := s.projection()
		if p == "" {
			return "Drawn in the local plane."
		}
		return "Local plane: " + p + "."
	}
	return "Coordinates: local plane x/y in metres, as given."
}

func haText(m2 float64) string {
	if m2 >= 1e6 {
		return fmt.Sprintf("%.3f km2 (%.1f ha)", m2/1e6, m2/1e4)
	}
	return fmt.Sprintf("%.0f m2 (%.2f ha)", m2, m2/1e4)
}

// drawCoverageMap draws the coverage map at the planned range.
func (s *scene) drawCoverageMap(width int) (*canvas, error) {
	a := s.a
	numbered := min(len(a.Gaps), maxNumbered)
	gapLabel := "Gap: not covered at the planned range, numbered by closing range (1 closes last)"
	if numbered < len(a.Gaps) {
		gapLabel = fmt.Sprintf("Gap: not covered at the planned range (the %d with the largest closing range are numbered)", numbered)
	}
	items := []legendItem{
		{fmt.Sprintf("Covered: within %s of a device", metresShort(a.Range)), swatchFill(colCovered, colDiskEdge)},
		{gapLabel, swatchFill(colGap, nil)},
		{"Deepest point of a gap (where it closes last)", swatchDeepest},
		{"Device site", swatchDot},
	}
	if len(a.Gaps) == 0 && len(a.FullCover.Worst) > 0 {
		items[2] = legendItem{"Point farthest from every device (full-cover range needed there)", swatchWorst}
	}
	key := mapKey{items: items, notes: []string{
		s.northNote(),
		"Disks drawn within 0.2 px of true circles, over the gaps, so gap edges along disks are true arcs too.",
	}}
	c, d, err := s.layoutMap(s.extent(), width, &key, "single disks and small gaps")
	if err != nil {
		return nil, err
	}
	title := s.titled("Coverage at " + metresShort(a.Range))
	sub := fmt.Sprintf("%.2f %% of %s covered, %d gap(s), %.0f m2 uncovered; full cover needs %s",
		100*a.CoveredFraction, haText(s.l.AreaM2), len(a.Gaps), a.UncoveredArea, metresShort(a.FullCover.Range))
	c.title(title, sub)

	areaMask := s.drawArea(c)
	// Gaps first, disks over them: the gap outlines replace arcs by chords
	// lying inside the disks, so the disks drawn on top restore the true
	// circular edge (within 0.2 px).
	s.fillGaps(c, a.Gaps, colGap)

	rho := a.Range * c.k
	unit := unitCircle(circleSides(rho))
	c.paint(s.diskMask(c, rho, unit), color.NRGBA(colCovered), areaMask) // disks only inside the area
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

func swatchDeepest(c *canvas, x, y, w, h float64) {
	c.dc.SetColor(colGap)
	c.dc.DrawRectangle(x, y, w, h)
	c.dc.Fill()
	c.deepestMark(x+w/2, y+h/2)
}

func swatchWorst(c *canvas, x, y, w, h float64) { c.worstMark(x+w/2, y+h/2) }

func metresShort(v float64) string {
	if v >= 10000 {
		return trimFloat(math.Round(v/10)/100) + " km"
	}
	return trimFloat(math.Round(v*100)/100) + " m"
}
