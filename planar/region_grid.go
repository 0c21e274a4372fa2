// The edge grid: a uniform grid over the edges of a set of rings, for the
// Region's validation and point location and for ClipCells.
//
// Every ring edge is registered in each grid cell that it may pass through
// (Franklin, "Adaptive grids for geometric operations", Cartographica 21,
// 1984): per grid row the edge's x-range within the row's y-range, widened
// by a rounding margin, so the registration is a conservative superset and
// no exact test downstream misses an edge. About density cells per vertex
// over the rings' bounding box (at most gridMaxSide cells a side); cell
// lists in one flat array (cellStart, entries), each entry e<<1 | first
// with first marking the leftmost cell of the edge's run in its row, so a
// ray walked to the right along a row meets each edge once.
//
// Rounding margin. Grid coordinates are computed from the input by a
// subtraction and a division; the errors of any computed point (an edge's
// x at a row boundary, a clipped box corner) are far below gridRoundRel
// (2⁻⁴⁰) times the largest coordinate magnitude, and that much slack, plus
// gridPadCells of a cell, is added on every side.
//
// Queries: locate (crossing-number parity along a horizontal ray, exact by
// EdgeRay), segmentHits (does a segment meet any ring edge, exact by
// SegmentsMeet, after Liang–Barsky clipping to the grid's box), cellEdges
// (the edges registered in the cells overlapping a box) and edgePair (the
// exact contact of two edges, for Region validation).

package planar

import (
	"math"
	"slices"
)

const (
	// gridRoundRel bounds the rounding error of computed grid
	// coordinates relative to the largest coordinate magnitude.
	gridRoundRel = 0x1p-40
	// gridPadCells is the extra margin, in cells, on every side.
	gridPadCells = 1e-9
	// gridMaxSide caps the number of cells along each axis.
	gridMaxSide = 8192
	// gridMinTol keeps the margin positive for a grid at the origin.
	gridMinTol = 1e-300
)

// regionGrid is a uniform grid over ring edges. Edge e runs from vertex e
// to vertex next[e] of its ring. Each grid cell lists the edges that may
// pass through it (a conservative superset); an entry is e<<1 | first,
// where first marks the leftmost cell of the edge's run in that row.
type regionGrid struct {
	xy         []float64
	next       []int32
	x0, y0     float64
	cw, ch     float64 // cell width and height
	nx, ny     int
	cellStart  []int32
	entries    []int32
	padX, padY float64 // rounding margin in cell units
}

// build registers every ring edge of (xy, ringStart) in a grid of about
// one cell per vertex.
func (g *regionGrid) build(xy []float64, ringStart []int32) { g.buildDensity(xy, ringStart, 1) }

// buildDensity is build with about density cells per vertex.
func (g *regionGrid) buildDensity(xy []float64, ringStart []int32, density float64) {
	g.xy = xy
	nv := len(xy) / 2
	g.next = make([]int32, nv)
	for k := 0; k+1 < len(ringStart); k++ {
		for i := ringStart[k]; i < ringStart[k+1]; i++ {
			g.next[i] = i + 1
		}
		if ringStart[k+1] > ringStart[k] {
			g.next[ringStart[k+1]-1] = ringStart[k]
		}
	}
	minx, miny := math.Inf(1), math.Inf(1)
	maxx, maxy := math.Inf(-1), math.Inf(-1)
	for i := 0; i < nv; i++ {
		minx, maxx = math.Min(minx, xy[2*i]), math.Max(maxx, xy[2*i])
		miny, maxy = math.Min(miny, xy[2*i+1]), math.Max(maxy, xy[2*i+1])
	}
	if nv == 0 {
		minx, miny, maxx, maxy = 0, 0, 1, 1
	}
	w, h := maxx-minx, maxy-miny
	if !(w > 0) {
		w = math.Max(1, h)
	}
	if !(h > 0) {
		h = math.Max(1, w)
	}
	cells := math.Max(1, density*float64(nv))
	side := math.Sqrt(w * h / cells)
	g.nx = int(math.Min(gridMaxSide, math.Max(1, math.Ceil(w/side))))
	g.ny = int(math.Min(gridMaxSide, math.Max(1, math.Ceil(h/side))))
	g.x0, g.y0 = minx, miny
	g.cw, g.ch = w/float64(g.nx), h/float64(g.ny)
	// Rounding margin (see the file comment).
	mag := math.Max(math.Max(math.Abs(minx), math.Abs(maxx)), math.Max(math.Abs(miny), math.Abs(maxy)))
	tol := mag*gridRoundRel + gridMinTol
	g.padX = tol/g.cw + gridPadCells
	g.padY = tol/g.ch + gridPadCells

	counts := make([]int32, g.nx*g.ny+1)
	g.rasterAll(func(c int, e int32, first bool) { counts[c+1]++ })
	for c := 1; c < len(counts); c++ {
		counts[c] += counts[c-1]
	}
	g.cellStart = counts
	g.entries = make([]int32, counts[len(counts)-1])
	fill := slices.Clone(counts[:len(counts)-1])
	g.rasterAll(func(c int, e int32, first bool) {
		v := e << 1
		if first {
			v |= 1
		}
		g.entries[fill[c]] = v
		fill[c]++
	})
}

// rasterAll calls emit for every (cell, edge) registration, in edge order.
func (g *regionGrid) rasterAll(emit func(c int, e int32, first bool)) {
	for e := range g.next {
		ax, ay := g.xy[2*e], g.xy[2*e+1]
		b := g.next[e]
		bx, by := g.xy[2*b], g.xy[2*b+1]
		r0, r1 := g.rows(ay, by)
		for r := r0; r <= r1; r++ {
			c0, c1 := g.cols(ax, ay, bx, by, r)
			for c := c0; c <= c1; c++ {
				emit(r*g.nx+c, int32(e), c == c0)
			}
		}
	}
}

// rows returns the first and last grid row that a segment from height ay
// to height by may pass through, with the rounding margin.
func (g *regionGrid) rows(ay, by float64) (r0, r1 int) {
	ylo, yhi := math.Min(ay, by), math.Max(ay, by)
	return g.clampRow(math.Floor((ylo-g.y0)/g.ch - g.padY)), g.clampRow(math.Floor((yhi-g.y0)/g.ch + g.padY))
}

// cols returns the first and last column of row r that the segment ab may
// pass through: its x-range over the row's height (never beyond the
// segment's own x-range), with the rounding margin.
func (g *regionGrid) cols(ax, ay, bx, by float64, r int) (c0, c1 int) {
	ylo, yhi := math.Min(ay, by), math.Max(ay, by)
	sy0 := math.Max(ylo, math.Min(yhi, g.y0+float64(r)*g.ch))
	sy1 := math.Max(ylo, math.Min(yhi, g.y0+float64(r+1)*g.ch))
	var xa, xb float64
	if ay == by {
		xa, xb = ax, bx
	} else {
		xa = ax + (sy0-ay)*(bx-ax)/(by-ay)
		xb = ax + (sy1-ay)*(bx-ax)/(by-ay)
	}
	xlo := math.Max(math.Min(xa, xb), math.Min(ax, bx))
	xhi := math.Min(math.Max(xa, xb), math.Max(ax, bx))
	return g.clampCol(math.Floor((xlo-g.x0)/g.cw - g.padX)), g.clampCol(math.Floor((xhi-g.x0)/g.cw + g.padX))
}

func (g *regionGrid) clampRow(f float64) int {
	if !(f >= 0) {
		return 0
	}
	if f >= float64(g.ny-1) {
		return g.ny - 1
	}
	return int(f)
}

func (g *regionGrid) clampCol(f float64) int {
	if !(f >= 0) {
		return 0
	}
	if f >= float64(g.nx-1) {
		return g.nx - 1
	}
	return int(f)
}

// locate applies the crossing-number rule to (px, py) over all rings: it
// returns the parity (inside) and whether the point lies on some edge (on;
// then inside is meaningless). Edges for which skip (if not nil) returns
// true are ignored. If hit is not nil it is called with every edge that
// the ray crosses (so parity per ring can be taken).
func (g *regionGrid) locate(px, py float64, skip func(e int32) bool, hit func(e int32)) (inside, on bool) {
	if len(g.next) == 0 {
		return false, false
	}
	xmax := g.x0 + float64(g.nx)*g.cw
	ymax := g.y0 + float64(g.ny)*g.ch
	if !(px <= xmax+g.padX*g.cw && py >= g.y0-g.padY*g.ch && py <= ymax+g.padY*g.ch) {
		return false, false
	}
	r := g.clampRow(math.Floor((py - g.y0) / g.ch))
	c0 := g.clampCol(math.Floor((px - g.x0) / g.cw))
	for c := c0; c < g.nx; c++ {
		cell := r*g.nx + c
		for _, ent := range g.entries[g.cellStart[cell]:g.cellStart[cell+1]] {
			if c > c0 && ent&1 == 0 {
				continue
			}
			e := ent >> 1
			if skip != nil && skip(e) {
				continue
			}
			b := g.next[e]
			o, cr := EdgeRay(g.xy[2*e], g.xy[2*e+1], g.xy[2*b], g.xy[2*b+1], px, py)
			if o {
				return false, true
			}
			if cr {
				inside = !inside
				if hit != nil {
					hit(e)
				}
			}
		}
	}
	return inside, false
}

// segmentHits reports whether the segment pq meets (crosses or touches)
// any ring edge, exactly. Only edges registered in the grid cells that the
// segment's part inside the grid passes through are tested.
func (g *regionGrid) segmentHits(px, py, qx, qy float64) bool {
	if len(g.next) == 0 {
		return false
	}
	gx1, gy1 := g.x0+float64(g.nx)*g.cw, g.y0+float64(g.ny)*g.ch
	// Fast path: both ends in one grid cell (a cell is convex, so the
	// segment lies in it) that no edge passes through.
	if px >= g.x0 && px < gx1 && qx >= g.x0 && qx < gx1 && py >= g.y0 && py < gy1 && qy >= g.y0 && qy < gy1 {
		c0, c1 := int((px-g.x0)/g.cw), int((qx-g.x0)/g.cw)
		r0, r1 := int((py-g.y0)/g.ch), int((qy-g.y0)/g.ch)
		if c0 == c1 && r0 == r1 && c0 < g.nx && r0 < g.ny {
			cell := r0*g.nx + c0
			if g.cellStart[cell] == g.cellStart[cell+1] {
				return false
			}
		}
	}
	// Clip pq to the grid box (Liang–Barsky), slightly enlarged.
	mx, my := g.padX*g.cw, g.padY*g.ch
	t0, t1 := 0.0, 1.0
	dx, dy := qx-px, qy-py
	for _, c := range [4][2]float64{{-dx, px - (g.x0 - mx)}, {dx, gx1 + mx - px}, {-dy, py - (g.y0 - my)}, {dy, gy1 + my - py}} {
		p, q := c[0], c[1]
		if p == 0 {
			if q < 0 {
				return false
			}
			continue
		}
		r := q / p
		if p < 0 {
			t0 = math.Max(t0, r)
		} else {
			t1 = math.Min(t1, r)
		}
	}
	if t0 > t1 {
		return false
	}
	ax, ay, bx, by := px+t0*dx, py+t0*dy, px+t1*dx, py+t1*dy
	r0, r1 := g.rows(ay, by)
	for r := r0; r <= r1; r++ {
		c0, c1 := g.cols(ax, ay, bx, by, r)
		for cc := c0; cc <= c1; cc++ {
			cell := r*g.nx + cc
			for _, ent := range g.entries[g.cellStart[cell]:g.cellStart[cell+1]] {
				e := ent >> 1
				n := g.next[e]
				if SegmentsMeet(px, py, qx, qy, g.xy[2*e], g.xy[2*e+1], g.xy[2*n], g.xy[2*n+1]) {
					return true
				}
			}
		}
	}
	return false
}

// cellEdges calls f for every ring edge registered in a grid cell that
// overlaps the box [x0, x1] × [y0, y1] (possibly more than once).
func (g *regionGrid) cellEdges(x0, y0, x1, y1 float64, f func(e int32)) {
	if len(g.next) == 0 {
		return
	}
	c0 := g.clampCol(math.Floor((x0-g.x0)/g.cw - g.padX))
	c1 := g.clampCol(math.Floor((x1-g.x0)/g.cw + g.padX))
	r0 := g.clampRow(math.Floor((y0-g.y0)/g.ch - g.padY))
	r1 := g.clampRow(math.Floor((y1-g.y0)/g.ch + g.padY))
	for r := r0; r <= r1; r++ {
		for cc := c0; cc <= c1; cc++ {
			cell := r*g.nx + cc
			for _, ent := range g.entries[g.cellStart[cell]:g.cellStart[cell+1]] {
				f(ent >> 1)
			}
		}
	}
}

// edgePair tests edges a < b for contact: 0 none, 1 proper crossing, 2
// touching (an endpoint on the other edge, or collinear overlap), 3
// adjacent edges overlapping (the ring doubles back). Edges sharing a
// vertex (consecutive in a ring) may meet only at that vertex.
func (g *regionGrid) edgePair(a, b int32) int {
	an, bn := g.next[a], g.next[b]
	ax, ay, bx, by := g.xy[2*a], g.xy[2*a+1], g.xy[2*an], g.xy[2*an+1]
	cx, cy, dx, dy := g.xy[2*b], g.xy[2*b+1], g.xy[2*bn], g.xy[2*bn+1]
	// Quick reject on bounding boxes.
	if math.Max(ax, bx) < math.Min(cx, dx) || math.Max(cx, dx) < math.Min(ax, bx) ||
		math.Max(ay, by) < math.Min(cy, dy) || math.Max(cy, dy) < math.Min(ay, by) {
		return 0
	}
	switch {
	case an == b && bn == a:
		return 3 // two-edge ring; cannot happen after cleaning
	case an == b:
		// a: A→B, b: B→D. Overlap iff D lies on line AB on A's side of B.
		if Orient2D(ax, ay, bx, by, dx, dy) == 0 && regionSameSide(bx, by, ax, ay, dx, dy) {
			return 3
		}
		return 0
	case bn == a:
		// b: C→A, a: A→B. Overlap iff B lies on line CA on C's side of A.
		if Orient2D(cx, cy, ax, ay, bx, by) == 0 && regionSameSide(ax, ay, cx, cy, bx, by) {
			return 3
		}
		return 0
	}
	o1 := Orient2D(ax, ay, bx, by, cx, cy)
	o2 := Orient2D(ax, ay, bx, by, dx, dy)
	o3 := Orient2D(cx, cy, dx, dy, ax, ay)
	o4 := Orient2D(cx, cy, dx, dy, bx, by)
	if (o1 > 0 && o2 < 0 || o1 < 0 && o2 > 0) && (o3 > 0 && o4 < 0 || o3 < 0 && o4 > 0) {
		return 1
	}
	if o1 == 0 && OnSegment(ax, ay, bx, by, cx, cy) ||
		o2 == 0 && OnSegment(ax, ay, bx, by, dx, dy) ||
		o3 == 0 && OnSegment(cx, cy, dx, dy, ax, ay) ||
		o4 == 0 && OnSegment(cx, cy, dx, dy, bx, by) {
		return 2
	}
	return 0
}

// regionSameSide reports whether p and q, collinear with o, lie on the same
// side of o along their common line (both strictly away from o).
func regionSameSide(ox, oy, px, py, qx, qy float64) bool {
	if px != ox || qx != ox {
		return (px-ox > 0) == (qx-ox > 0) && px != ox && qx != ox
	}
	return (py-oy > 0) == (qy-oy > 0) && py != oy && qy != oy
}

// cellPairs calls fn(a, b), a < b, for every pair of distinct edges
// registered in a common grid cell, cell by cell in order; a pair sharing
// several cells is visited once per shared cell. O(Σ cell occupancy²).
func (g *regionGrid) cellPairs(fn func(a, b int32)) {
	for c := 0; c+1 < len(g.cellStart); c++ {
		ents := g.entries[g.cellStart[c]:g.cellStart[c+1]]
		for i := 0; i < len(ents); i++ {
			e1 := ents[i] >> 1
			for j := i + 1; j < len(ents); j++ {
				if e2 := ents[j] >> 1; e1 != e2 {
					fn(min(e1, e2), max(e1, e2))
				}
			}
		}
	}
}
