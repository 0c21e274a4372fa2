// Incremental construction of the Delaunay triangulation: points are
// inserted in a biased randomized insertion order (BRIO: Amenta, Choi &
// Rote, "Incremental constructions con BRIO", SoCG 2003), each round sorted
// along a Hilbert curve, located by a visibility walk from the previous
// insertion, and the Delaunay property is restored by Lawson flips.
//
// Invariant between insertions: the triangles form a Delaunay triangulation
// of the points inserted so far; the convex hull is a circular doubly linked
// list of vertices (prev, next, counter-clockwise) and hedge[v] is the hull
// half-edge that starts at hull vertex v. A removed hull vertex v has
// next[v] == v. Collinear hull points are kept as hull vertices.
//
// Inserting point p (Guibas, Knuth & Sharir, "Randomized incremental
// construction of Delaunay and Voronoi diagrams", Algorithmica 7, 1992):
//   - The walk ends in a triangle holding p: a 1→3 split if p is interior,
//     a 2→4 split (or 1→2 on the hull) if p is on an edge, nothing if p
//     equals a vertex (an exact duplicate, recorded).
//   - The walk leaves through a hull edge a→b with p strictly on its right
//     (Orient2D(a, b, p) < 0): the visible hull edges form one chain around
//     it; p is joined to each, as in the sweep-hull of Sinclair (2010). Edges
//     from p to the chain's inner vertices need no test: the quadrilateral
//     around such an edge is not convex at the hull vertex, so the edge is
//     locally Delaunay.
//   - Every edge opposite p is then legalised: flipped if the vertex across
//     it is strictly inside the circumcircle (InCircle > 0), recursively.
//     Flips stop (Lawson) and depend only on the input, so cocircular input
//     gives the same triangulation on every run.
//
// The order only affects speed: every decision is an exact predicate, so
// the result is a Delaunay triangulation for any order. The pseudo-random
// rounds come from a fixed hash of the input index (deterministic).
// Consecutive points of a round are close along the curve, so the walk is
// short and memory access local; earlier rounds give a coarse, well-shaped
// mesh that keeps flips few (about three per point on uniform input).
//
// From parallelMin points on, the last four rounds (about 15/16 of the
// points) are inserted by two workers, one per side of a vertical line
// through the median abscissa (delaunay_parallel.go); the few points they
// leave are then inserted as above. The result does not depend on the
// number of CPUs.
//
// Predicates: the stage-A filters of Orient2D and InCircle (Shewchuk 1997)
// are repeated in line here; undecided cases go to the exact predicates,
// except integer coordinates with differences of at most 2¹², for which the
// float evaluation is itself exact. Coordinates are never translated.

package planar

import (
	"errors"
	"math"
	"math/bits"
	"slices"
	"sync"
	"unsafe"

	"github.com/paulmach/orb"
)

// builder is the working state of one construction. Vertex numbers inside
// it are internal ids: positions in the insertion order.
type builder struct {
	ps    []xyPt  // internal coordinates
	tri   []int32 // three internal ids per triangle
	half  []int32 // opposite half-edge or -1
	nt    int32   // half-edges in use
	prev  []int32 // hull links; for a duplicate, the vertex it equals
	next  []int32 // hull links; dupMark for a duplicate
	hedge []int32 // hull half-edge starting at each hull vertex
	start int32   // some vertex on the hull
	stack []int32
	err   error
}

const dupMark = -2

var errInternal = errors.New("planar: Triangulate: internal error: point location failed")

// bbox is an axis-aligned bounding box.
type bbox struct{ minX, minY, maxX, maxY float64 }

func boundingBox(pts []orb.Point) bbox {
	const parts = 8
	var boxes [parts]bbox
	scan := func(k int) {
		b := bbox{math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)}
		for _, p := range pts[len(pts)*k/parts : len(pts)*(k+1)/parts] {
			b.minX, b.maxX = math.Min(b.minX, p[0]), math.Max(b.maxX, p[0])
			b.minY, b.maxY = math.Min(b.minY, p[1]), math.Max(b.maxY, p[1])
		}
		boxes[k] = b
	}
	if len(pts) < 1<<16 {
		for k := 0; k < parts; k++ {
			scan(k)
		}
	} else {
		ParallelFor(parts, 1, func(lo, hi int) {
			for k := lo; k < hi; k++ {
				scan(k)
			}
		})
	}
	b := boxes[0]
	for _, c := range boxes[1:] {
		b.minX, b.maxX = math.Min(b.minX, c.minX), math.Max(b.maxX, c.maxX)
		b.minY, b.maxY = math.Min(b.minY, c.minY), math.Max(b.maxY, c.maxY)
	}
	return b
}

// parallelMin is the number of points from which the construction splits
// its last rounds between two workers (see delaunay_parallel.go). The
// result does not depend on the number of CPUs: below this size the
// construction is sequential everywhere, above it the split is made and
// the workers run one after the other when only one CPU is available.
const parallelMin = 1 << 15

// triangulateIncremental builds the triangulation of pts (finite, with the
// counter-clockwise seed triangle i0, i1, i2 of distinct, non-collinear
// points).
func triangulateIncremental(pts []orb.Point, box bbox, i0, i1, i2 int32) (*Triangulation, error) {
	n := len(pts)
	split := n >= parallelMin
	x0 := 0.0
	if split {
		x0 = medianX(pts, box)
	}
	work := make([]uint64, 2*n)
	keys, buf := work[:n:n], work[n:]
	brioKeys(pts, box, keys, split, x0)
	sorted := radixSortHigh(keys, buf) // in buf
	refineCells(pts, box, sorted)

	// Internal ids in insertion order; the sort buffers are reused for the
	// order and the hull links.
	w32 := asInt32(work)
	order := w32[0:n:n]
	ps := make([]xyPt, n)
	ParallelFor(n, 1<<15, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			i := uint32(sorted[k])
			order[k] = int32(i)
			p := pts[i]
			ps[k] = xyPt{p[0], p[1]}
		}
	})
	// Phase boundaries: sequential rounds, then each side's last rounds.
	n1, nl := n, 0
	if split {
		n1 = sortIndex(sorted, 1<<63)
		nl = sortIndex(sorted, 1<<63|1<<62) - n1
	}
	b := &builder{
		ps:    ps,
		prev:  w32[n : 2*n : 2*n],
		next:  w32[2*n : 3*n : 3*n],
		hedge: w32[3*n : 4*n : 4*n],
		stack: make([]int32, 0, 64),
	}
	for k := range b.next {
		b.next[k] = -1
	}
	maxT := 2*n - 5
	b.tri = make([]int32, 3*maxT)
	b.half = make([]int32, 3*maxT)

	s0, s1, s2 := int32(-1), int32(-1), int32(-1)
	for k, i := range order {
		switch i {
		case i0:
			s0 = int32(k)
		case i1:
			s1 = int32(k)
		case i2:
			s2 = int32(k)
		}
	}
	isSeed := func(k int32) bool { return k == s0 || k == s1 || k == s2 }
	b.seed(s0, s1, s2)
	for k := int32(0); k < int32(n1); k++ {
		if isSeed(k) {
			continue
		}
		b.add(k)
		if b.err != nil {
			return nil, b.err
		}
	}
	if split {
		deferred := b.insertSplit(int32(n1), int32(n1+nl), int32(n), x0, isSeed)
		for _, k := range deferred {
			b.add(k)
			if b.err != nil {
				return nil, b.err
			}
		}
	}
	return b.finish(pts, order), nil
}

// sortIndex returns the number of words in sorted (increasing) below key.
func sortIndex(sorted []uint64, key uint64) int {
	lo, hi := 0, len(sorted)
	for lo < hi {
		mid := int(uint(lo+hi) >> 1)
		if sorted[mid] < key {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo
}

// medianX returns an abscissa splitting the points about evenly, from a
// histogram of 4096 bins over the bounding box.
func medianX(pts []orb.Point, box bbox) float64 {
	const bins = 4096
	w := box.maxX - box.minX
	if !(w > 0) || w > math.MaxFloat64 {
		return box.minX
	}
	scale := bins / w
	var hist [bins]int32
	var mu sync.Mutex
	ParallelFor(len(pts), 1<<16, func(lo, hi int) {
		var h [bins]int32
		for _, p := range pts[lo:hi] {
			k := int((p[0] - box.minX) * scale)
			h[max(0, min(bins-1, k))]++
		}
		mu.Lock()
		for k, c := range h {
			hist[k] += c
		}
		mu.Unlock()
	})
	half := int32(len(pts) / 2)
	sum := int32(0)
	for k := 0; k < bins; k++ {
		c := hist[k]
		if sum+c > half {
			// Split at the bin edge nearer the median.
			if half-sum > sum+c-half && k+1 < bins {
				k++
			}
			return box.minX + float64(k)/scale
		}
		sum += c
	}
	return box.minX + w/2
}

// brioKeys writes the insertion-order key of every point into the upper
// 32 bits of keys[i] and i into the lower ones. Key bits, from the top:
// phase (1 bit), side (1), round (5), unused (1), Hilbert index (24). The
// round of point i is drawn from a fixed hash of i: the last round holds
// about half the points, each earlier one half as many as the next, the
// first about 32 to 64. The Hilbert index is the position of the point's
// cell on a 2¹² × 2¹² Hilbert curve over the bounding box. When split is
// set, points of the last four rounds form phase 1 and are grouped by side
// (x < x0 or not).
func brioKeys(pts []orb.Point, box bbox, keys []uint64, split bool, x0 float64) {
	n := len(pts)
	last := 0
	for n>>last > 64 {
		last++
	}
	side := math.Max(box.maxX-box.minX, box.maxY-box.minY)
	scale := 0.0
	if side > 0 && side <= math.MaxFloat64 {
		scale = 4096 / side
	}
	ParallelFor(n, 1<<15, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			p := pts[i]
			qx := cell12((p[0] - box.minX) * scale)
			qy := cell12((p[1] - box.minY) * scale)
			round := last - bits.LeadingZeros64(mix64(uint64(i)))
			if round < 0 {
				round = 0
			}
			key := uint64(round)<<57 | uint64(hilbert16(qx<<4, qy<<4)>>8)<<32 | uint64(i)
			if split && round > last-4 {
				key |= 1 << 63
				if !(p[0] < x0) {
					key |= 1 << 62
				}
			}
			keys[i] = key
		}
	})
}

// refineCells orders the points of each crowded Hilbert cell (more than 8
// points with the same key, as in dense clusters) along a Hilbert curve of
// order 16 inside the cell, instead of by index, so that the walk stays
// short there too. Ties keep the index order; the keys are unchanged.
func refineCells(pts []orb.Point, box bbox, sorted []uint64) {
	side := math.Max(box.maxX-box.minX, box.maxY-box.minY)
	if !(side > 0 && side <= math.MaxFloat64) {
		return
	}
	scale := 4096 / side
	sub := func(v float64) uint32 {
		f := (v - math.Floor(v)) * 65536
		if !(f > 0) {
			return 0
		}
		return uint32(math.Min(f, 65535))
	}
	refine := func(part []uint64) {
		n := len(part)
		for s := 0; s < n; {
			key := part[s] >> 32
			e := s + 1
			for e < n && part[e]>>32 == key {
				e++
			}
			if e-s > 8 {
				run := part[s:e]
				for k, w := range run {
					p := pts[uint32(w)]
					h := hilbert16(sub((p[0]-box.minX)*scale), sub((p[1]-box.minY)*scale))
					run[k] = uint64(h)<<32 | w&0xffffffff
				}
				slices.Sort(run)
				for k := range run {
					run[k] = key<<32 | run[k]&0xffffffff
				}
			}
			s = e
		}
	}
	n := len(sorted)
	if n < 1<<16 {
		refine(sorted)
		return
	}
	// Two halves split between runs.
	m := n / 2
	for m < n && sorted[m]>>32 == sorted[m-1]>>32 {
		m++
	}
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		refine(sorted[m:])
	}()
	refine(sorted[:m])
	wg.Wait()
}

func cell12(v float64) uint32 {
	if !(v > 0) {
		return 0
	}
	if v >= 4095 {
		return 4095
	}
	return uint32(v)
}

// mix64 is the SplitMix64 finaliser (Steele, Lea & Flood 2014): a fixed
// bijective hash of the index, for the BRIO rounds.
func mix64(z uint64) uint64 {
	z += 0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// hilbert16 returns the index of cell (x, y), x, y < 2¹⁶, along the
// Hilbert curve of order 16, by the branch-free prefix-scan method of
// rawrunprotected/hilbert_curves (public domain).
func hilbert16(x, y uint32) uint32 {
	a := x ^ y
	b := 0xFFFF ^ a
	c := 0xFFFF ^ (x | y)
	d := x & (y ^ 0xFFFF)
	A := a | (b >> 1)
	B := (a >> 1) ^ a
	C := ((c >> 1) ^ (b & (d >> 1))) ^ c
	D := ((a & (c >> 1)) ^ (d >> 1)) ^ d

	a, b, c, d = A, B, C, D
	A = (a & (a >> 2)) ^ (b & (b >> 2))
	B = (a & (b >> 2)) ^ (b & ((a ^ b) >> 2))
	C ^= (a & (c >> 2)) ^ (b & (d >> 2))
	D ^= (b & (c >> 2)) ^ ((a ^ b) & (d >> 2))

	a, b, c, d = A, B, C, D
	A = (a & (a >> 4)) ^ (b & (b >> 4))
	B = (a & (b >> 4)) ^ (b & ((a ^ b) >> 4))
	C ^= (a & (c >> 4)) ^ (b & (d >> 4))
	D ^= (b & (c >> 4)) ^ ((a ^ b) & (d >> 4))

	a, b, c, d = A, B, C, D
	C ^= (a & (c >> 8)) ^ (b & (d >> 8))
	D ^= (b & (c >> 8)) ^ ((a ^ b) & (d >> 8))

	a = C ^ (C >> 1)
	b = D ^ (D >> 1)
	i0 := x ^ y
	i1 := b | (0xFFFF ^ (i0 | a))
	return interleave16(i1)<<1 | interleave16(i0)
}

// interleave16 spreads the low 16 bits of x to the even bit positions.
func interleave16(x uint32) uint32 {
	x &= 0xFFFF
	x = (x | (x << 8)) & 0x00FF00FF
	x = (x | (x << 4)) & 0x0F0F0F0F
	x = (x | (x << 2)) & 0x33333333
	x = (x | (x << 1)) & 0x55555555
	return x
}

// asInt32 views a []uint64 as twice as many int32.
func asInt32(u []uint64) []int32 {
	if len(u) == 0 {
		return nil
	}
	return unsafeInt32(u)
}

// seed makes the first triangle from the counter-clockwise internal ids.
func (b *builder) seed(v0, v1, v2 int32) {
	b.addTriangle(v0, v1, v2, -1, -1, -1)
	b.next[v0], b.next[v1], b.next[v2] = v1, v2, v0
	b.prev[v0], b.prev[v1], b.prev[v2] = v2, v0, v1
	b.hedge[v0], b.hedge[v1], b.hedge[v2] = 0, 1, 2
	b.start = v0
}

// addTriangle appends triangle (i0, i1, i2) and links its half-edges to
// the opposite half-edges a, b, c (-1 for none); it returns the first
// half-edge.
func (b *builder) addTriangle(i0, i1, i2, a, c1, c2 int32) int32 {
	t := b.nt
	tri := b.tri[t : t+3 : t+3]
	tri[0], tri[1], tri[2] = i0, i1, i2
	half := b.half[t : t+3 : t+3]
	half[0], half[1], half[2] = a, c1, c2
	if a >= 0 {
		b.half[a] = t
	}
	if c1 >= 0 {
		b.half[c1] = t + 1
	}
	if c2 >= 0 {
		b.half[c2] = t + 2
	}
	b.nt += 3
	return t
}

// orient is Orient2D(a, b, p) for internal ids a, b.
func (b *builder) orient(a, c int32, x, y float64) float64 {
	pa, pc := b.ps[a], b.ps[c]
	return Orient2D(pa.x, pa.y, pc.x, pc.y, x, y)
}

// add inserts internal vertex i.
func (b *builder) add(i int32) {
	p := b.ps[i]
	t, inside, zero := walk(b.tri[:b.nt], b.half, b.ps, b.nt-3, p.x, p.y)
	if !inside {
		b.addOutside(i, b.tri[t])
		return
	}
	switch zero {
	case 0:
		b.splitTriangle(i, t)
	case 1, 2, 4:
		b.splitEdge(i, t+int32(bits.TrailingZeros8(zero)))
	case 3, 5, 6:
		// p equals the vertex shared by the two edges it lies on.
		k := int32(bits.TrailingZeros8(^zero & 7)) // the other edge
		b.next[i] = dupMark
		b.prev[i] = b.tri[t+(k+2)%3]
	default:
		b.err = errInternal
	}
}

// addOutside inserts internal vertex i, strictly outside the hull, where
// the hull edge from vertex e is visible from it.
func (b *builder) addOutside(i, e int32) {
	x, y := b.ps[i].x, b.ps[i].y
	next, prev, hedge := b.next, b.prev, b.hedge

	// Triangle on the visible edge e→q: [i, q, e].
	q := next[e]
	t := b.addTriangle(i, q, e, -1, hedge[e], -1)
	open := b.legalize(t + 1) // the hull half-edge i→(next hull vertex)
	hedge[e] = t + 2          // e→i

	// Forward over visible edges.
	nv := q
	for {
		q := next[nv]
		if b.orient(nv, q, x, y) >= 0 {
			break
		}
		t := b.addTriangle(i, q, nv, -1, hedge[nv], open)
		open = b.legalize(t + 1)
		next[nv] = nv // removed from the hull
		nv = q
	}
	// Backward over visible edges.
	for {
		q := prev[e]
		if b.orient(q, e, x, y) >= 0 {
			break
		}
		t := b.addTriangle(i, e, q, hedge[e], hedge[q], -1)
		b.legalize(t + 1)
		hedge[q] = t + 2
		next[e] = e
		e = q
	}
	prev[i], next[e] = e, i
	prev[nv], next[i] = i, nv
	hedge[i] = open
	b.start = e
}

// legalize restores the Delaunay property after the insertion of the point
// opposite half-edge a, flipping recursively (with an explicit stack). It
// returns the half-edge that started as the one before a in its triangle,
// wherever the flips moved it.
//
//	      pl                    pl
//	     /||\                  /  \
//	  al/ || \bl            al/    \a
//	   /  ||  \              /      \
//	  /  a||b  \    flip    /___ar___\
//	p0\   ||   /p1   =>   p0\---bl---/p1
//	   \  ||  /              \      /
//	  ar\ || /br             b\    /br
//	     \||/                  \  /
//	      pr                    pr
func (b *builder) legalize(a int32) int32 {
	tri, half, ps := b.tri, b.half, b.ps
	stack := b.stack[:0]
	var ar int32
	for {
		bb := half[a]
		ar = prevHE(a)
		if bb < 0 {
			if len(stack) == 0 {
				break
			}
			a = stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			continue
		}
		al := nextHE(a)
		bl := prevHE(bb)
		p0, pr, pl, p1 := tri[ar], tri[a], tri[al], tri[bl]
		if inCircleFiltered(ps[p0], ps[pr], ps[pl], ps[p1].x, ps[p1].y) {
			tri[a] = p1
			tri[bb] = p0
			hbl := half[bl]
			if hbl < 0 {
				b.hedge[p1] = a // the hull edge p1→pl moved from bl to a
			}
			har := half[ar]
			if har < 0 {
				b.hedge[p0] = bb // the hull edge p0→pr moved from ar to bb
			}
			half[a] = hbl
			if hbl >= 0 {
				half[hbl] = a
			}
			half[bb] = har
			if har >= 0 {
				half[har] = bb
			}
			half[ar] = bl
			half[bl] = ar
			stack = append(stack, nextHE(bb))
		} else {
			if len(stack) == 0 {
				break
			}
			a = stack[len(stack)-1]
			stack = stack[:len(stack)-1]
		}
	}
	b.stack = stack
	return ar
}

// xyPt is a point of the internal coordinate array (passed in registers).
type xyPt struct{ x, y float64 }

// asPts views interleaved coordinates as points.
func asPts(xy []float64) []xyPt {
	if len(xy) < 2 {
		return nil
	}
	return unsafe.Slice((*xyPt)(unsafe.Pointer(&xy[0])), len(xy)/2)
}

// triStart returns the first half-edge of e's triangle; nextHE and prevHE
// are NextHalfedge and PrevHalfedge in unsigned arithmetic (e >= 0).
func triStart(e int32) int32 { return e - int32(uint32(e)%3) }

func nextHE(e int32) int32 {
	if uint32(e)%3 == 2 {
		return e - 2
	}
	return e + 1
}

func prevHE(e int32) int32 {
	if uint32(e)%3 == 0 {
		return e + 2
	}
	return e - 1
}

// inCircleFiltered reports InCircle(a, b, c, d) > 0. It evaluates
// Shewchuk's stage-A filter in line (the same expression and bound as
// InCircle) and calls InCircle only when the filter cannot decide.
func inCircleFiltered(a, b, c xyPt, dx, dy float64) bool {
	adx, ady := a.x-dx, a.y-dy
	bdx, bdy := b.x-dx, b.y-dy
	cdx, cdy := c.x-dx, c.y-dy
	bdxcdy, cdxbdy := float64(bdx*cdy), float64(cdx*bdy)
	cdxady, adxcdy := float64(cdx*ady), float64(adx*cdy)
	adxbdy, bdxady := float64(adx*bdy), float64(bdx*ady)
	alift := float64(adx*adx) + float64(ady*ady)
	blift := float64(bdx*bdx) + float64(bdy*bdy)
	clift := float64(cdx*cdx) + float64(cdy*cdy)
	det := float64(alift*(bdxcdy-cdxbdy)) + float64(blift*(cdxady-adxcdy)) + float64(clift*(adxbdy-bdxady))
	permanent := float64((math.Abs(bdxcdy)+math.Abs(cdxbdy))*alift) +
		float64((math.Abs(cdxady)+math.Abs(adxcdy))*blift) +
		float64((math.Abs(adxbdy)+math.Abs(bdxady))*clift)
	bound := iccErrBoundA * permanent
	if permanent >= incircleFloor && alift+blift+clift <= incircleLiftCeil {
		if det > bound {
			return true
		}
		if -det > bound {
			return false
		}
	}
	if smallIntegers(a, b, c, dx, dy) {
		// Integer coordinates with differences of at most 2¹² (grids):
		// every product and sum above is an integer below 2⁵³, so det is
		// exact.
		return det > 0
	}
	return InCircle(a.x, a.y, b.x, b.y, c.x, c.y, dx, dy) > 0
}

// smallIntegers reports whether all coordinates are integers of magnitude
// below 2⁵² and a, b, c each differ from (dx, dy) by at most 2¹² per
// coordinate, so that the differences are exact.
func smallIntegers(a, b, c xyPt, dx, dy float64) bool {
	const lim, big = 0x1p12, 0x1p52
	isInt := func(v float64) bool { return v == math.Trunc(v) && math.Abs(v) < big }
	near := func(p xyPt) bool { return math.Abs(p.x-dx) <= lim && math.Abs(p.y-dy) <= lim }
	return isInt(dx) && isInt(dy) && isInt(a.x) && isInt(a.y) && isInt(b.x) && isInt(b.y) &&
		isInt(c.x) && isInt(c.y) && near(a) && near(b) && near(c)
}

// orientSign returns the sign of Orient2D(a, c, (x, y)) with the stage-A
// filter of Orient2D in line.
func orientSign(a, c xyPt, x, y float64) int {
	detleft := float64((a.x - x) * (c.y - y))
	detright := float64((a.y - y) * (c.x - x))
	det := detleft - detright
	detsum := math.Abs(detleft) + math.Abs(detright)
	if bound := ccwErrBoundA * detsum; detsum >= orientFloor {
		if det > bound {
			return 1
		}
		if -det > bound {
			return -1
		}
	}
	if smallIntegers(a, c, c, x, y) {
		// Exact: integer products below 2²⁵.
		switch {
		case det > 0:
			return 1
		case det < 0:
			return -1
		}
		return 0
	}
	switch o := Orient2D(a.x, a.y, c.x, c.y, x, y); {
	case o > 0:
		return 1
	case o < 0:
		return -1
	}
	return 0
}

// orientNegative reports Orient2D(a, c, (x, y)) < 0.
func orientNegative(a, c xyPt, x, y float64) bool { return orientSign(a, c, x, y) < 0 }

// splitTriangle inserts i strictly inside triangle t (its first half-edge).
func (b *builder) splitTriangle(i, t int32) {
	tri, half := b.tri, b.half
	v0, v1, v2 := tri[t], tri[t+1], tri[t+2]
	h1, h2 := half[t+1], half[t+2]
	// t becomes [v0, v1, i].
	tri[t+2] = i
	t1 := b.addTriangle(v1, v2, i, h1, -1, t+1) // v1→v2, v2→i, i→v1
	t2 := b.addTriangle(v2, v0, i, h2, t+2, t1+1)
	if h1 < 0 {
		b.hedge[v1] = t1
	}
	if h2 < 0 {
		b.hedge[v2] = t2
	}
	b.legalize(t)
	b.legalize(t1)
	b.legalize(t2)
}

// splitEdge inserts i in the relative interior of half-edge e.
func (b *builder) splitEdge(i, e int32) {
	tri, half := b.tri, b.half
	en := e - e%3 + (e+1)%3
	ep := e - e%3 + (e+2)%3
	va, vb, vc := tri[e], tri[en], tri[ep]
	hca := half[ep]
	h := half[e]
	if h < 0 {
		// Hull edge a→b: t becomes [i, b, c], new [a, i, c].
		tri[e] = i
		t1 := b.addTriangle(va, i, vc, -1, ep, hca)
		if hca < 0 {
			b.hedge[vc] = t1 + 2
		}
		b.next[va], b.prev[i] = i, va
		b.next[i], b.prev[vb] = vb, i
		b.hedge[va] = t1
		b.hedge[i] = e
		b.legalize(en)
		b.legalize(t1 + 2)
		return
	}
	hn := h - h%3 + (h+1)%3
	hp := h - h%3 + (h+2)%3
	vd := tri[hp]
	hdb := half[hp]
	// t becomes [i, b, c], u becomes [i, a, d]; new [a, i, c], [b, i, d].
	tri[e] = i
	tri[h] = i
	t1 := b.addTriangle(va, i, vc, h, ep, hca)
	t2 := b.addTriangle(vb, i, vd, e, hp, hdb)
	if hca < 0 {
		b.hedge[vc] = t1 + 2
	}
	if hdb < 0 {
		b.hedge[vd] = t2 + 2
	}
	b.legalize(en)
	b.legalize(hn)
	b.legalize(t1 + 2)
	b.legalize(t2 + 2)
}

// finish converts the internal state to a Triangulation in vertex numbers:
// duplicates resolved to the smallest input index of their group, vertices
// numbered in order of first appearance.
func (b *builder) finish(pts []orb.Point, order []int32) *Triangulation {
	n := len(order)
	prev, next, hedge := b.prev, b.next, b.hedge

	// Hull (internal ids) and the hull half-edge ending at each hull vertex.
	var hullInt, hullIn []int32
	v := b.start
	for {
		nv := next[v]
		hullInt = append(hullInt, nv)
		hullIn = append(hullIn, hedge[v])
		v = nv
		if v == b.start {
			break
		}
	}

	dups := false
	for k := 0; k < n; k++ {
		if next[k] == dupMark {
			dups = true
			break
		}
	}
	var vertex, source, perm []int32
	if !dups {
		// Vertex i is input i; internal id k is vertex order[k].
		vertex = make([]int32, n)
		source = make([]int32, n)
		ParallelFor(n, 1<<16, func(lo, hi int) {
			for i := lo; i < hi; i++ {
				vertex[i], source[i] = int32(i), int32(i)
			}
		})
		perm = order
	} else {
		// Smallest input index of each group (in hedge, now free), then
		// the input → representative map.
		minIn := hedge
		for k := 0; k < n; k++ {
			if next[k] != dupMark {
				minIn[k] = order[k]
			}
		}
		for k := 0; k < n; k++ {
			if next[k] == dupMark {
				if r := prev[k]; order[k] < minIn[r] {
					minIn[r] = order[k]
				}
			}
		}
		vertex = make([]int32, n)
		for k := 0; k < n; k++ {
			r := int32(k)
			if next[k] == dupMark {
				r = prev[k]
			}
			vertex[order[k]] = minIn[r]
		}
		source = numberVertices(vertex, vertex)
		// perm: internal id → vertex number (in prev, now free).
		perm = prev
		for k := 0; k < n; k++ {
			if next[k] != dupMark {
				perm[k] = vertex[order[k]]
			}
		}
	}
	m := len(source)

	tri := b.tri[:b.nt:b.nt]
	half := b.half[:b.nt:b.nt]
	coords := make([]float64, 2*m)
	inedge := make([]int32, m)
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		if !dups {
			copy(asPts(coords), unsafe.Slice((*xyPt)(unsafe.Pointer(&pts[0])), len(pts)))
			return
		}
		for v, i := range source {
			coords[2*v], coords[2*v+1] = pts[i][0], pts[i][1]
		}
	}()
	ParallelFor(len(tri), 1<<16, func(lo, hi int) {
		for e := lo; e < hi; e++ {
			tri[e] = perm[tri[e]]
		}
	})
	// The last half-edge ending at each vertex, in increasing order.
	for t := int32(0); t < b.nt; t += 3 {
		tr := tri[t : t+3 : t+3]
		inedge[tr[1]] = t
		inedge[tr[2]] = t + 1
		inedge[tr[0]] = t + 2
	}
	hull := make([]int32, len(hullInt))
	for k, v := range hullInt {
		hull[k] = perm[v]
		inedge[hull[k]] = hullIn[k]
	}
	wg.Wait()
	return &Triangulation{
		Coords:    coords,
		Vertex:    vertex,
		Source:    source,
		Triangles: tri,
		Halfedges: half,
		Hull:      hull,
		Inedge:    inedge,
	}
}
