// Label placement on maps: each label tries a fixed list of boxes around
// its anchor (upper right, lower right, upper left, lower left of a site
// mark) and takes the first that overlaps no earlier label or mark and
// stays in the frame; failing that, the box of least cost (overlap with
// earlier boxes plus four times the part outside the frame). Greedy in
// input order, O(n²) in the number of labels, which is capped
// (maxLabelledSites).

package report

import (
	"math"

	"github.com/paulmach/orb"
	"golang.org/x/image/font"
)

// maxLabelledSites is the largest site count labelled by name on a map.
const maxLabelledSites = 60

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
		text := s.label(i)
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
