// Queries on a Delaunay triangulation: point location, nearest vertex,
// vertex neighbourhoods and circumcentres.
//
//   - Locate is a visibility walk (Devillers, Pion & Teillaud, "Walking in
//     a triangulation", IJFCS 13, 2002): from the current triangle, cross
//     an edge that has the query point strictly on its outer side, never
//     re-testing the edge just crossed. Every test is the exact Orient2D.
//     On a Delaunay triangulation the walk cannot cycle (Edelsbrunner,
//     "An acyclicity theorem for cell complexes in d dimensions",
//     Combinatorica 10, 1990); a step cap with an exhaustive scan behind it
//     guarantees termination on any other input.
//   - Nearest is greedy descent over Delaunay neighbours. If v is not a
//     nearest vertex of q, the segment from v to q leaves the Voronoi cell
//     of v through the cell of a Delaunay neighbour w, and the triangle
//     inequality gives |q−w| < |q−v|; so a vertex with no strictly closer
//     neighbour is a nearest vertex (folklore; see e.g. Bose & Morin,
//     "Online routing in triangulations", SIAM J. Comput. 33, 2004).
//     Distances are compared in floating point with an error bound (each
//     squared distance is within 4ε relative of its true value, ε = 2⁻⁵³)
//     and exactly with math/big when the bound cannot decide, so the
//     descent and the tie test are exact. Among equally near vertices the
//     smallest index is returned; they are cocircular on an empty circle,
//     hence joined by Delaunay edges, and found by a search over ties.
//   - Circumcentres are computed in floating point relative to the first
//     vertex of each triangle (relative error of order ε times the ratio of
//     circumradius to shortest edge).

package planar

import (
	"math"
	"math/big"
)

// walk locates (x, y) starting in the triangle of half-edge e0. It returns
// the first half-edge of the closed triangle holding the point, true, and
// a mask with bit k set when the point lies on the line of half-edge
// (first+k); or a hull half-edge with the point strictly on its outer side
// and false.
func walk(tri, half []int32, ps []xyPt, e0 int32, x, y float64) (int32, bool, uint8) {
	nt := int32(len(tri) / 3)
	b := triStart(e0)
	came := int32(-1)
	for steps := int32(0); steps <= nt+2; steps++ {
		e := b
		if came >= 0 {
			e = nextHE(came)
		}
		moved := false
		var zero uint8
		for k := 0; k < 3; k++ {
			if e != came {
				a, c := ps[tri[e]], ps[tri[nextHE(e)]]
				s := orientSign(a, c, x, y)
				if s < 0 {
					h := half[e]
					if h < 0 {
						return e, false, 0
					}
					came, b, moved = h, triStart(h), true
					break
				}
				if s == 0 {
					zero |= 1 << (e - b)
				}
			}
			e = nextHE(e)
		}
		if !moved {
			return b, true, zero
		}
	}
	return walkScan(tri, half, ps, x, y)
}

// walkScan is the exhaustive fallback of walk.
func walkScan(tri, half []int32, ps []xyPt, x, y float64) (int32, bool, uint8) {
	out := int32(-1)
	for b := int32(0); b < int32(len(tri)); b += 3 {
		inside := true
		var zero uint8
		for e := b; e < b+3; e++ {
			s := orientSign(ps[tri[e]], ps[tri[nextHE(e)]], x, y)
			if s < 0 {
				inside = false
				if half[e] < 0 && out < 0 {
					out = e
				}
			}
			if s == 0 {
				zero |= 1 << (e - b)
			}
		}
		if inside {
			return b, true, zero
		}
	}
	return out, false, 0
}

func finite(x, y float64) bool {
	return math.Abs(x) <= math.MaxFloat64 && math.Abs(y) <= math.MaxFloat64
}

// Locate returns the triangle containing (x, y), or -1 when the point is
// outside the convex hull (or not finite, or there is no triangle). A point
// on an edge or vertex is reported in one of the triangles sharing it. The
// walk starts at triangle hint; pass -1 to start from a sample of
// triangles instead.
func (t *Triangulation) Locate(x, y float64, hint int32) int32 {
	nt := int32(t.NumTriangles())
	if nt == 0 || !finite(x, y) {
		return -1
	}
	if hint < 0 || hint >= nt {
		hint = t.sampleTriangle(x, y)
	}
	e, inside, _ := walk(t.Triangles, t.Halfedges, asPts(t.Coords), 3*hint, x, y)
	if !inside {
		return -1
	}
	return e / 3
}

// sampleTriangle returns, among about nt^(1/3) evenly spaced triangles, the
// one whose first vertex is nearest (x, y) (Mücke, Saias & Zhu's
// jump-and-walk).
func (t *Triangulation) sampleTriangle(x, y float64) int32 {
	nt := int32(t.NumTriangles())
	k := int32(math.Cbrt(float64(nt))) + 1
	best, bd := int32(0), math.Inf(1)
	for j := int32(0); j < k; j++ {
		tr := int32(int64(j) * int64(nt) / int64(k))
		v := t.Triangles[3*tr]
		if d := dist2(t.Coords[2*v], t.Coords[2*v+1], x, y); d < bd {
			best, bd = tr, d
		}
	}
	return best
}

// sampleVertex is sampleTriangle for vertices.
func (t *Triangulation) sampleVertex(x, y float64) int32 {
	m := int32(t.NumVertices())
	k := int32(math.Cbrt(float64(m))) + 1
	best, bd := int32(0), math.Inf(1)
	for j := int32(0); j < k; j++ {
		v := int32(int64(j) * int64(m) / int64(k))
		if d := dist2(t.Coords[2*v], t.Coords[2*v+1], x, y); d < bd {
			best, bd = v, d
		}
	}
	return best
}

// cmpDistErr bounds the rounding error of |q−a|² − |q−b|² in floating point
// relative to |q−a|² + |q−b|² (see cmpDist).
const cmpDistErr = 6 * epsilon

// cmpDist returns the sign of |q−a|² − |q−b|², exactly.
func cmpDist(qx, qy, ax, ay, bx, by float64) int {
	dax, day := ax-qx, ay-qy
	dbx, dby := bx-qx, by-qy
	da := dax*dax + day*day
	db := dbx*dbx + dby*dby
	diff := da - db
	sum := da + db
	// da and db are each within (4ε + O(ε²)) relative of the true values;
	// the subtraction adds ε|diff| (cmpDistErr = 6ε covers both); below
	// orientFloor an underflowed square could break the relative bound.
	if bound := cmpDistErr * sum; sum >= orientFloor && sum <= math.MaxFloat64 {
		if diff > bound {
			return 1
		}
		if -diff > bound {
			return -1
		}
	}
	return cmpDistExact(qx, qy, ax, ay, bx, by)
}

func cmpDistExact(qx, qy, ax, ay, bx, by float64) int {
	r := func(v float64) *big.Rat { return new(big.Rat).SetFloat64(v) }
	sq := func(p, q float64) *big.Rat {
		d := new(big.Rat).Sub(r(p), r(q))
		return d.Mul(d, d)
	}
	da := new(big.Rat).Add(sq(ax, qx), sq(ay, qy))
	db := new(big.Rat).Add(sq(bx, qx), sq(by, qy))
	return da.Cmp(db)
}

// Nearest returns the vertex nearest (x, y), the smallest vertex index
// among equally near ones; -1 when there is no vertex or the query is not
// finite. The search descends from vertex hint (pass -1 to start from a
// sample of vertices); a hint near the answer makes it fast.
func (t *Triangulation) Nearest(x, y float64, hint int32) int32 {
	m := int32(t.NumVertices())
	if m == 0 || !finite(x, y) {
		return -1
	}
	if m == 1 {
		return 0
	}
	if len(t.Triangles) == 0 {
		return t.nearestOnLine(x, y)
	}
	if hint < 0 || hint >= m {
		hint = t.sampleVertex(x, y)
	}
	return t.descend(x, y, hint)
}

// descend is greedy descent from v followed by the tie search.
func (t *Triangulation) descend(x, y float64, v int32) int32 {
	tri, half, xy, inedge := t.Triangles, t.Halfedges, t.Coords, t.Inedge
	for {
		best := v
		bx, by := xy[2*v], xy[2*v+1]
		tie := false
		consider := func(u int32) {
			switch c := cmpDist(x, y, xy[2*u], xy[2*u+1], bx, by); {
			case c < 0:
				best, bx, by, tie = u, xy[2*u], xy[2*u+1], false
			case c == 0:
				tie = true
			}
		}
		e0 := inedge[v]
		e := e0
		for {
			consider(tri[e])
			o := nextHE(e)
			h := half[o]
			if h < 0 {
				consider(tri[nextHE(o)])
				break
			}
			e = h
			if e == e0 {
				break
			}
		}
		if best == v {
			if tie {
				return t.smallestTied(x, y, v)
			}
			return v
		}
		v = best
	}
}

// smallestTied returns the smallest index among the vertices exactly as
// near (x, y) as v, which is a nearest vertex.
func (t *Triangulation) smallestTied(x, y float64, v int32) int32 {
	set := []int32{v}
	min := v
	var buf []int32
	for k := 0; k < len(set); k++ {
		w := set[k]
		buf = t.Neighbors(w, buf[:0])
		for _, u := range buf {
			if cmpDist(x, y, t.Coords[2*u], t.Coords[2*u+1], t.Coords[2*v], t.Coords[2*v+1]) != 0 {
				continue
			}
			seen := false
			for _, s := range set {
				if s == u {
					seen = true
					break
				}
			}
			if !seen {
				set = append(set, u)
				if u < min {
					min = u
				}
			}
		}
	}
	return min
}

// nearestOnLine answers Nearest when all vertices are collinear (Hull
// lists them along the line): binary search on the projection, then exact
// descent along the line.
func (t *Triangulation) nearestOnLine(x, y float64) int32 {
	h, xy := t.Hull, t.Coords
	f, l := h[0], h[len(h)-1]
	ox, oy := xy[2*f], xy[2*f+1]
	dx, dy := xy[2*l]-ox, xy[2*l+1]-oy
	proj := func(v int32) float64 { return (xy[2*v]-ox)*dx + (xy[2*v+1]-oy)*dy }
	pq := (x-ox)*dx + (y-oy)*dy
	lo, hi := 0, len(h)-1
	for lo < hi {
		mid := (lo + hi) / 2
		if proj(h[mid]) < pq {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	k := lo
	cmp := func(a, b int32) int { return cmpDist(x, y, xy[2*a], xy[2*a+1], xy[2*b], xy[2*b+1]) }
	for k > 0 && cmp(h[k-1], h[k]) < 0 {
		k--
	}
	for k+1 < len(h) && cmp(h[k+1], h[k]) < 0 {
		k++
	}
	best := h[k]
	if k > 0 && cmp(h[k-1], best) == 0 && h[k-1] < best {
		best = h[k-1]
	}
	if k+1 < len(h) && cmp(h[k+1], h[k]) == 0 && h[k+1] < best {
		best = h[k+1]
	}
	return best
}

// NearestMany answers Nearest for every query point (xy interleaved: x0,
// y0, x1, y1, ...) into out[i], for i < min(len(xy)/2, len(out)). Queries
// are split into contiguous chunks answered in parallel; within a chunk
// each search starts from the previous answer or from a bucket grid of
// vertices, whichever is nearer, so queries in spatial order cost O(1) each
// and random queries O(1) expected on evenly spread vertices. Results do
// not depend on the chunking.
func (t *Triangulation) NearestMany(xy []float64, out []int32) {
	nq := len(xy) / 2
	if len(out) < nq {
		nq = len(out)
	}
	if nq == 0 {
		return
	}
	var g *hintGrid
	if len(t.Triangles) > 0 && nq >= 64 && float64(nq)*math.Sqrt(float64(t.NumVertices())) > float64(t.NumVertices()) {
		g = t.newHintGrid(nq)
	}
	ParallelFor(nq, 2048, func(lo, hi int) {
		prev := int32(-1)
		for k := lo; k < hi; k++ {
			x, y := xy[2*k], xy[2*k+1]
			hint := prev
			if g != nil {
				if c := g.at(x, y); c >= 0 {
					if hint < 0 || dist2(t.Coords[2*c], t.Coords[2*c+1], x, y) < dist2(t.Coords[2*hint], t.Coords[2*hint+1], x, y) {
						hint = c
					}
				}
			}
			r := t.Nearest(x, y, hint)
			out[k] = r
			if r >= 0 {
				prev = r
			}
		}
	})
}

// hintGrid is a uniform grid over the vertices' bounding box (Grid,
// bucketgrid.go); each bucket holds the smallest vertex index inside it,
// or, when it has none, that of a non-empty bucket nearby (fill).
type hintGrid struct {
	Grid
	cell []int32
}

func (t *Triangulation) newHintGrid(nq int) *hintGrid {
	m := t.NumVertices()
	minX, minY, maxX, maxY := BoundsXY(t.Coords[:2*m], nil)
	g := &hintGrid{Grid: GridOfCells(minX, minY, maxX, maxY, min(m/2, nq))}
	g.cell = make([]int32, g.NumCells())
	for i := range g.cell {
		g.cell[i] = -1
	}
	for v := int32(0); v < int32(m); v++ {
		c := g.Cell(t.Coords[2*v], t.Coords[2*v+1])
		if g.cell[c] < 0 {
			g.cell[c] = v
		}
	}
	g.fill()
	return g
}

// fill gives every empty cell the vertex of a non-empty cell in its row
// (the nearest one to the left, else to the right), and cells of empty
// rows that of a row above or below.
func (g *hintGrid) fill() {
	line := func(n int, at func(k int) *int32) {
		last := int32(-1)
		for k := 0; k < n; k++ {
			if c := at(k); *c >= 0 {
				last = *c
			} else {
				*c = last
			}
		}
		last = -1
		for k := n - 1; k >= 0; k-- {
			if c := at(k); *c >= 0 {
				last = *c
			} else {
				*c = last
			}
		}
	}
	for j := 0; j < g.NY; j++ {
		line(g.NX, func(i int) *int32 { return &g.cell[j*g.NX+i] })
	}
	for i := 0; i < g.NX; i++ {
		line(g.NY, func(j int) *int32 { return &g.cell[j*g.NX+i] })
	}
}

func (g *hintGrid) at(x, y float64) int32 { return g.cell[g.Cell(x, y)] }

// Neighbors appends to buf[:0] the Delaunay neighbours of vertex v in
// counter-clockwise order and returns it. For a hull vertex the list runs
// from the next hull vertex to the previous one. When there is no triangle
// (collinear vertices) the neighbours are the one or two adjacent vertices
// along the line. An out-of-range v gives an empty list.
func (t *Triangulation) Neighbors(v int32, buf []int32) []int32 {
	buf = buf[:0]
	if v < 0 || int(v) >= t.NumVertices() {
		return buf
	}
	if len(t.Triangles) == 0 {
		pos := t.linePosition(v)
		if pos < 0 {
			return buf
		}
		if pos > 0 {
			buf = append(buf, t.Hull[pos-1])
		}
		if pos+1 < len(t.Hull) {
			buf = append(buf, t.Hull[pos+1])
		}
		return buf
	}
	e0 := t.Inedge[v]
	if e0 < 0 {
		return buf
	}
	// Walking e → Halfedges[next(e)] turns clockwise around v.
	e := e0
	for {
		buf = append(buf, t.Triangles[e])
		o := NextHalfedge(e)
		h := t.Halfedges[o]
		if h < 0 {
			buf = append(buf, t.Triangles[NextHalfedge(o)])
			break
		}
		e = h
		if e == e0 {
			break
		}
	}
	for i, j := 0, len(buf)-1; i < j; i, j = i+1, j-1 {
		buf[i], buf[j] = buf[j], buf[i]
	}
	return buf
}

// linePosition returns the position of v in Hull for collinear vertices
// (Hull sorted lexicographically by coordinates), or -1.
func (t *Triangulation) linePosition(v int32) int {
	x, y := t.Coords[2*v], t.Coords[2*v+1]
	lo, hi := 0, len(t.Hull)
	for lo < hi {
		mid := (lo + hi) / 2
		u := t.Hull[mid]
		ux, uy := t.Coords[2*u], t.Coords[2*u+1]
		if ux < x || (ux == x && uy < y) {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	if lo < len(t.Hull) && t.Hull[lo] == v {
		return lo
	}
	for i, u := range t.Hull { // Hull not in lexicographic order
		if u == v {
			return i
		}
	}
	return -1
}

// Circumcenters returns the circumcentre of every triangle, interleaved
// (x, y of triangle k at 2k, 2k+1).
func (t *Triangulation) Circumcenters() []float64 {
	nt := t.NumTriangles()
	out := make([]float64, 2*nt)
	// Halves from 2¹⁶ triangles on, as before; more cores take more ranges.
	ParallelFor(nt, 1<<15, func(lo, hi int) {
		tri, xy := t.Triangles, t.Coords
		for k := lo; k < hi; k++ {
			a, b, c := tri[3*k], tri[3*k+1], tri[3*k+2]
			out[2*k], out[2*k+1] = Circumcentre(xy[2*a], xy[2*a+1], xy[2*b], xy[2*b+1], xy[2*c], xy[2*c+1])
		}
	})
	return out
}
