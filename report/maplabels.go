// Label placement on maps: each label tries a fixed list of boxes around
// its anchor (upper right, lower right, upper left, lower left of a mark)
// and takes the first that overlaps no earlier label or mark, crosses no
// line of the site outline and stays in the frame; failing that, the box
// of least cost: overlap with earlier boxes, plus lineCost times its area
// when an outline edge crosses it, plus four times the part outside the
// frame.
// Greedy in input order, O(n·(n + e)) for n labels (capped,
// maxLabelledSites) and e outline edges.
//
// Labels are never drawn smaller than minLabelPx, whatever the map width,
// so that they stay readable on narrow maps (--map-width 800).

package report

import (
	"math"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"golang.org/x/image/font"
)

// maxLabelledSites is the largest site count labelled by name on a map.
const maxLabelledSites = 60

// minLabelPx is the smallest label size in px: at 11 px the capitals of
// the Go fonts are about 8 px tall, readable on screen and in print at
// 100 %. (At the 1600 px default labels are 14–17 layout units = px.)
const minLabelPx = 11

// labelPt returns the label size pt in layout units, raised so that it is
// drawn at minLabelPx or more.
func (c *canvas) labelPt(pt float64) float64 { return math.Max(pt, minLabelPx/c.u) }

// lineCost is the cost of a label box crossed by an outline edge, as a
// fraction of its area: less than a fifth of the box hidden under another
// label (a haloed label stays readable on a line, not under a label).
const lineCost = 0.2

// labeler places labels one after another on a map.
type labeler struct {
	taken []labelBox // marks and labels already placed
	frame labelBox
	lines []float64 // segments to keep clear, px: x0, y0, x1, y1 each
}

// newLabeler returns a labeler for c that keeps labels off the site
// outline (and its exclusion zones).
func (s *scene) newLabeler(c *canvas) *labeler {
	l := &labeler{frame: c.labelFrame()}
	if ar := s.l.Area; ar != nil {
		for k := range ar.NumRings() {
			xy := ar.Ring(k)
			n := len(xy) / 2
			for i := range n {
				j := (i + 1) % n
				l.lines = append(l.lines, c.ox+xy[2*i]*c.k, c.oy-xy[2*i+1]*c.k, c.ox+xy[2*j]*c.k, c.oy-xy[2*j+1]*c.k)
			}
		}
	}
	return l
}

// place picks one of cands for a label of the given area and takes it.
func (l *labeler) place(cands []labelBox, area float64) labelBox {
	best, bestCost := 0, math.Inf(1)
	for k, b := range cands {
		cost := 0.0
		for _, t := range l.taken {
			cost += boxOverlap(b, t)
		}
		cost += 4 * (area - boxOverlap(b, l.frame))
		for i := 0; i+3 < len(l.lines); i += 4 {
			if segmentMeetsBox(l.lines[i], l.lines[i+1], l.lines[i+2], l.lines[i+3], b) {
				cost += lineCost * area
				break
			}
		}
		if cost < bestCost-1e-9 {
			best, bestCost = k, cost
		}
		if cost == 0 {
			break
		}
	}
	l.taken = append(l.taken, cands[best])
	return cands[best]
}

// segmentMeetsBox reports whether the segment (x0, y0)–(x1, y1) meets the
// box b: an endpoint lies in it, or the segment meets one of its four
// sides (planar.SegmentsMeet, exact).
func segmentMeetsBox(x0, y0, x1, y1 float64, b labelBox) bool {
	in := func(x, y float64) bool { return x >= b.x0 && x <= b.x1 && y >= b.y0 && y <= b.y1 }
	if in(x0, y0) || in(x1, y1) {
		return true
	}
	return planar.SegmentsMeet(x0, y0, x1, y1, b.x0, b.y0, b.x1, b.y0) ||
		planar.SegmentsMeet(x0, y0, x1, y1, b.x1, b.y0, b.x1, b.y1) ||
		planar.SegmentsMeet(x0, y0, x1, y1, b.x1, b.y1, b.x0, b.y1) ||
		planar.SegmentsMeet(x0, y0, x1, y1, b.x0, b.y1, b.x0, b.y0)
}

// labelSites writes each distinct site's label beside its mark (see the
// file comment for the placement).
func (s *scene) labelSites(c *canvas, rho float64) {
	l := s.newLabeler(c)
	s.forSites(func(x, y float64) {
		px, py := c.ox+x*c.k, c.oy-y*c.k
		l.taken = append(l.taken, labelBox{px - rho - 1, py - rho - 1, px + rho + 1, py + rho + 1})
	})
	pt := c.labelPt(14)
	face := c.face(pt, false)
	seen := map[orb.Point]bool{}
	gap := 3 * c.u
	for i, p := range s.l.Sites {
		if seen[p] {
			continue
		}
		seen[p] = true
		text := s.label(i)
		w := float64(font.MeasureString(face, text)) / 64
		h := pt * c.u * 0.78 // cap height and a little
		x, y := c.px(p)
		cands := []labelBox{
			{x + rho + gap, y - rho - h, x + rho + gap + w, y - rho},
			{x + rho + gap, y + rho, x + rho + gap + w, y + rho + h},
			{x - rho - gap - w, y - rho - h, x - rho - gap, y - rho},
			{x - rho - gap - w, y + rho, x - rho - gap, y + rho + h},
		}
		b := l.place(cands, w*h)
		c.haloText(text, b.x0, b.y1, 0, 0, pt, false, colInk)
	}
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
