// Fast fills for the heavy map layers (cells, disks, gaps, site marks,
// thin strokes), with golang.org/x/image/vector: a signed-area
// accumulation rasterizer whose cost is linear in the number of edges plus
// the number of pixels, independent of how many edges share a scanline.
// (The rasterizer behind gg keeps a sorted cell list per scanline, which
// turns quadratic with 10⁵ small polygons.)
//
// Coverage rule: the accumulated signed area of a pixel is clamped to
// [0, 1] after taking its absolute value, so shapes of equal orientation
// unite (overlapping disks) and a clockwise ring inside a counter-
// clockwise one cuts a hole. Rings are therefore oriented before they are
// added: exterior rings one way, holes the other. Overlapping shapes of
// opposite orientation are never added to one fill.
//
// Strokes are unions of one quadrilateral per segment (all of the same
// orientation) plus a small disk at each joint for lines wider than
// 1.5 px, which matches a round-joined stroke to within 0.2 px.
//
// Geometry far above the page is clipped at y = −2 px before rasterizing
// (the rasterizer steps through every row from an edge's top), which
// leaves the inside of the page unchanged; x is clamped by the rasterizer
// itself, which is exact for area coverage.

package report

import (
	"image"
	"image/color"
	"image/draw"
	"math"

	"github.com/sitecover/sitecover/planar"
	"golang.org/x/image/vector"
)

// fastFill collects polygons in pixel coordinates for one fill.
type fastFill struct {
	c   *canvas
	vr  *vector.Rasterizer
	buf []float64 // current ring, pixel x, y interleaved
}

func (c *canvas) newFill() *fastFill {
	if c.vr == nil {
		c.vr = vector.NewRasterizer(c.w, c.h)
	} else {
		c.vr.Reset(c.w, c.h)
	}
	return &fastFill{c: c, vr: c.vr}
}

// ringPx adds a closed ring given in pixels (x, y interleaved, no repeat).
// sign > 0 orients it clockwise on screen, sign < 0 counter-clockwise, 0
// keeps it as given.
func (f *fastFill) ringPx(px []float64, sign int) {
	n := len(px) / 2
	if n < 3 {
		return
	}
	if sign != 0 {
		if a := planar.RingArea(px); (a > 0) != (sign > 0) { // > 0: clockwise on screen (y down)
			reverseXY(px)
		}
	}
	minY := math.Inf(1)
	for i := 1; i < len(px); i += 2 {
		minY = math.Min(minY, px[i])
	}
	if minY < -2 {
		px = clipBelow(px, -2)
		if len(px) < 6 {
			return
		}
	}
	f.vr.MoveTo(float32(px[0]), float32(px[1]))
	for i := 2; i+1 < len(px); i += 2 {
		f.vr.LineTo(float32(px[i]), float32(px[i+1]))
	}
	f.vr.ClosePath()
}

// ringXY adds a ring given in plane coordinates (x, y interleaved, no
// repeat); exterior chooses the orientation (holes the opposite).
func (f *fastFill) ringXY(xy []float64, exterior bool) {
	f.buf = f.buf[:0]
	c := f.c
	for i := 0; i+1 < len(xy); i += 2 {
		f.buf = append(f.buf, c.ox+xy[i]*c.k, c.oy-xy[i+1]*c.k)
	}
	f.ringPx(f.buf, orient(exterior))
}

// orient returns the ringPx sign for an exterior ring or a hole.
func orient(exterior bool) int {
	if exterior {
		return 1
	}
	return -1
}

// circle adds a circle of radius rho px at pixel (x, y); unit holds the
// cos/sin pairs of the polygon (see unitCircle).
func (f *fastFill) circle(x, y, rho float64, unit []float64) {
	f.buf = f.buf[:0]
	for i := 0; i+1 < len(unit); i += 2 {
		f.buf = append(f.buf, x+rho*unit[i], y+rho*unit[i+1])
	}
	f.ringPx(f.buf, 1)
}

// segment adds a quadrilateral of width w px around the segment (x0, y0)–
// (x1, y1).
func (f *fastFill) segment(x0, y0, x1, y1, w float64) {
	dx, dy := x1-x0, y1-y0
	l := math.Hypot(dx, dy)
	if l == 0 {
		return
	}
	nx, ny := -dy/l*w/2, dx/l*w/2
	f.buf = append(f.buf[:0], x0+nx, y0+ny, x1+nx, y1+ny, x1-nx, y1-ny, x0-nx, y0-ny)
	f.ringPx(f.buf, 1)
}

// polylineXY adds a stroke of width w px along a closed plane ring.
func (f *fastFill) polylineXY(xy []float64, w float64) {
	c := f.c
	n := len(xy) / 2
	var joint []float64
	if w > 1.5 {
		joint = unitCircle(circleSides(w / 2))
	}
	for i := range n {
		j := (i + 1) % n
		x0, y0 := c.ox+xy[2*i]*c.k, c.oy-xy[2*i+1]*c.k
		x1, y1 := c.ox+xy[2*j]*c.k, c.oy-xy[2*j+1]*c.k
		f.segment(x0, y0, x1, y1, w)
		if joint != nil {
			f.circle(x0, y0, w/2, joint)
		}
	}
}

// mask rasterizes the collected shapes into a coverage mask.
func (f *fastFill) mask() *image.Alpha {
	m := image.NewAlpha(image.Rect(0, 0, f.c.w, f.c.h))
	f.vr.DrawOp = draw.Src
	f.vr.Draw(m, m.Bounds(), image.Opaque, image.Point{})
	return m
}

// frameRect is the map frame in whole pixels.
func (c *canvas) frameRect() image.Rectangle {
	return image.Rect(int(math.Floor(c.fx)), int(math.Floor(c.fy)), int(math.Ceil(c.fx+c.fw)), int(math.Ceil(c.fy+c.fh))).Intersect(image.Rect(0, 0, c.w, c.h))
}

// paint blends colour col through mask (and clip, when not nil) onto the
// page inside the map frame.
func (c *canvas) paint(mask *image.Alpha, col color.NRGBA, clip *image.Alpha) {
	dst := c.dc.Image().(*image.RGBA)
	r := c.frameRect()
	ca := uint32(col.A)
	for y := r.Min.Y; y < r.Max.Y; y++ {
		mo := mask.PixOffset(r.Min.X, y)
		do := dst.PixOffset(r.Min.X, y)
		for x := r.Min.X; x < r.Max.X; x, mo, do = x+1, mo+1, do+4 {
			a := uint32(mask.Pix[mo])
			if a == 0 {
				continue
			}
			if clip != nil {
				a = a * uint32(clip.Pix[mo]) / 255
			}
			a = a * ca / 255
			if a == 0 {
				continue
			}
			p := dst.Pix[do : do+4 : do+4]
			p[0] = uint8((uint32(col.R)*a + uint32(p[0])*(255-a)) / 255)
			p[1] = uint8((uint32(col.G)*a + uint32(p[1])*(255-a)) / 255)
			p[2] = uint8((uint32(col.B)*a + uint32(p[2])*(255-a)) / 255)
			p[3] = uint8(a + uint32(p[3])*(255-a)/255)
		}
	}
}

// paintHatch fills mask with the exclusion-zone pattern: a grey ground
// with antialiased 45° lines every 9 layout units.
func (c *canvas) paintHatch(mask *image.Alpha) {
	dst := c.dc.Image().(*image.RGBA)
	r := c.frameRect()
	step := 9 * c.u * math.Sqrt2 // along x + y
	half := 1.3 * c.u / 2        // half line width, px
	for y := r.Min.Y; y < r.Max.Y; y++ {
		mo := mask.PixOffset(r.Min.X, y)
		do := dst.PixOffset(r.Min.X, y)
		for x := r.Min.X; x < r.Max.X; x, mo, do = x+1, mo+1, do+4 {
			a := uint32(mask.Pix[mo])
			if a == 0 {
				continue
			}
			ph := math.Mod(float64(x+y)+0.5, step)
			d := math.Abs(ph-step/2) / math.Sqrt2 // distance to the line, px
			cov := math.Max(0, math.Min(1, half+0.5-d))
			col := [3]float64{
				float64(colExcluded.R) + cov*(float64(colHatch.R)-float64(colExcluded.R)),
				float64(colExcluded.G) + cov*(float64(colHatch.G)-float64(colExcluded.G)),
				float64(colExcluded.B) + cov*(float64(colHatch.B)-float64(colExcluded.B)),
			}
			p := dst.Pix[do : do+4 : do+4]
			for k := range 3 {
				p[k] = uint8((uint32(col[k]+0.5)*a + uint32(p[k])*(255-a)) / 255)
			}
			p[3] = uint8(a + uint32(p[3])*(255-a)/255)
		}
	}
}

func reverseXY(px []float64) {
	n := len(px) / 2
	for i, j := 0, n-1; i < j; i, j = i+1, j-1 {
		px[2*i], px[2*j] = px[2*j], px[2*i]
		px[2*i+1], px[2*j+1] = px[2*j+1], px[2*i+1]
	}
}

// clipBelow clips a closed ring to the half-plane y >= y0
// (Sutherland–Hodgman with one edge), returning a new slice.
func clipBelow(px []float64, y0 float64) []float64 {
	n := len(px) / 2
	out := make([]float64, 0, len(px)+4)
	for i := range n {
		j := (i + 1) % n
		ax, ay, bx, by := px[2*i], px[2*i+1], px[2*j], px[2*j+1]
		ain, bin := ay >= y0, by >= y0
		if ain {
			out = append(out, ax, ay)
		}
		if ain != bin {
			t := (y0 - ay) / (by - ay)
			out = append(out, ax+t*(bx-ax), y0)
		}
	}
	return out
}
