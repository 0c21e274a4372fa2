// Incremental Voronoi cells of a layout plus planned devices, by clipping.
//
// The planners (SuggestAdditions, FewestAdditions, ChooseCandidates) add
// and move a few devices P on top of a fixed layout S whose cells C_u
// (u ∈ S, clipped to the area A) are known. The Voronoi diagram of S ∪ P
// restricted to A is obtained from the C_u without triangulating again:
//
//	cell of u ∈ S:  C_u ∩ ⋂_{p∈P} H(u, p)
//	cell of p ∈ P:  ⋃_{u∈S} C_u ∩ H(p, u) ∩ ⋂_{p'∈P, p'≠p} H(p, p')
//
// where H(a, b) is the closed half-plane of points at least as close to a
// as to b. The C_u partition A, so the pieces of p's cell are disjoint and
// its measures are sums over pieces. Each cell is recomputed from scratch
// from the positions alone whenever it may have changed, so the geometry
// never depends on the order of edits. Locality bounds (all from the
// triangle inequality, every cell lying within its radius ρ, the largest
// distance from its site to its points):
//
//   - p takes something from the current cell X of site x only if some
//     vertex of X is strictly closer to p than to x (a linear inequality
//     is violated on a polygon at a vertex); this needs |p − x| < 2ρ_x;
//   - when p leaves, a device p' can only gain from a piece of p's cell in
//     C_u if some vertex of the piece is at least as close to p' as to u
//     (p' must beat u, which stays), and only if |p' − p| ≤ 2ρ_p + d, d the
//     distance from p to its nearest other site s (|q − p'| ≤ |q − s| ≤
//     ρ_p + d for q in p's cell);
//   - when computing p's cell, another device p' matters only if
//     |p' − p| ≤ 2ρ, ρ the radius of the part clipped so far.
//
// Base sites are found through a static bucket grid (planar.BucketGrid)
// holding every base site except the 256 with the largest cells, which are
// always examined; planned devices through a dynamic one (planar.HashGrid),
// nearest bucket rings first, so that a cell is clipped only by the devices
// within twice its radius. The full-cover range (the largest radius) and
// the largest radius of a planned device's cell are kept in segment trees
// of maxima (plan_segtree.go), updated in O(log n) per recomputed cell.
//
// Measures per cell: area (shoelace), the area within the planned range r
// (planar.RingDiskArea), the uncovered area (their difference), and the
// farthest vertex, whose distance is the cell's radius; the full-cover range
// is the largest radius (on the cell of x the nearest-site distance is
// |q − x|, a convex function, so its maximum is at a vertex). The
// covered-area gain of a hypothetical device c is exact by the same
// partition:
//
//	gain(c) = Σ_X [ area(X ∩ H(c,x) ∩ D(c,r)) − area(X ∩ H(c,x) ∩ D(x,r)) ]
//
// over the current cells X (site x): inside X only x's disk covers (x is
// the nearest site to every point q of X, so any disk D(s, r) holding q
// has |q − x| ≤ |q − s| ≤ r), and after adding c the part of X nearer to c
// is covered by D(c, r) alone. Error bounds are those of plan_clip.go:
// every measure is exact up to rounding of order 1e-14 relative per piece;
// sums over cells accumulate rounding of order 1e-14 of the area.

package coverage

import (
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// planCell is the current cell of a base site whose cell planned devices have
// cut, or of a planned device.
type planCell struct {
	x, y   float64          // site
	base   int32            // base vertex overridden, or -1 for a planned device
	geo    planar.ClipRings // current geometry; rings labelled by the base cell they lie in
	rho    float64          // radius: largest distance from the site to the cell
	fx, fy float64          // vertex at distance rho
	area   float64          // area of the cell
	unc    float64          // uncovered area at the planned range
	live   bool
}

// planOverlay holds a layout's cells plus planned devices.
type planOverlay struct {
	l  *Layout
	r  float64
	nb int // base cells (triangulation vertices)

	baseRho, baseFx, baseFy, baseUnc []float64
	baseConvex                       []bool // cell is one convex ring
	baseUncTotal                     float64
	order                            []int32 // base cells by decreasing radius
	cur                              []int32 // base cell -> overriding planCell, or -1

	cells []planCell
	free  []int32
	dev   []int32          // planned device id -> planCell, -1 when removed
	dg    *planar.HashGrid // planned devices
	// all holds the current radius of every base cell not overridden
	// (slot u) and of every live cell (slot nb + c); devs that of every
	// planned device's cell (slot c). Their maxima are the full-cover
	// range and the reach of a device's cell.
	all, devs planMaxTree

	grid  *planar.BucketGrid // base sites not in big; nil when none
	big   []int32            // base cells examined on every query
	reach float64            // twice the largest radius of a gridded base cell

	ix *planar.RegionIndex
	sc planScratch
}

// planScratch is per-goroutine scratch space.
type planScratch struct {
	a, b, c planar.ClipRings
	near    []planNear
	ids     []int32
	pts     []float64
	perm    []int32
}

type planNear struct {
	id int32
	d  float64
}

// newPlanOverlay prepares the base cells of l with measures at range r.
func newPlanOverlay(l *Layout, r float64) *planOverlay {
	o := &planOverlay{l: l, r: r, ix: l.Area.Index(), dg: planar.NewHashGrid(l.AreaM2)}
	nv := l.Tri.NumVertices()
	o.nb = nv
	defer func() {
		o.all.init(nv, o.baseRho)
		o.devs.init(0, nil)
	}()
	o.baseRho = make([]float64, nv)
	o.baseFx = make([]float64, nv)
	o.baseFy = make([]float64, nv)
	o.baseUnc = make([]float64, nv)
	o.cur = make([]int32, nv)
	o.baseConvex = make([]bool, nv)
	planParallel(nv, func(lo, hi int) {
		for u := lo; u < hi; u++ {
			o.cur[u] = -1
			rs := planCellRings(l.Cells, int32(u))
			o.baseConvex[u] = planCellConvex(&rs)
			ux, uy := o.site(int32(u))
			far, fx, fy, disk := -1.0, ux, uy, 0.0
			for k := 0; k < rs.NumRings(); k++ {
				ring := rs.Ring(k)
				if r > 0 {
					disk += planar.RingDiskArea(ring, ux, uy, r)
				}
				for i := 0; i+1 < len(ring); i += 2 {
					if d := planDist(ring[i], ring[i+1], ux, uy); d > far {
						far, fx, fy = d, ring[i], ring[i+1]
					}
				}
			}
			if far < 0 {
				far = 0
			}
			o.baseRho[u], o.baseFx[u], o.baseFy[u] = far, fx, fy
			o.baseUnc[u] = l.Cells.Area[u] - disk
		}
	})
	for _, v := range o.baseUnc {
		o.baseUncTotal += v
	}
	o.order = make([]int32, nv)
	for i := range o.order {
		o.order[i] = int32(i)
	}
	slices.SortFunc(o.order, func(a, b int32) int {
		if c := cmp.Compare(o.baseRho[b], o.baseRho[a]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	const nBig = 256
	rhoCap := 0.0
	if nv > nBig {
		rhoCap = o.baseRho[o.order[nBig]]
	}
	var rest []int32
	for _, u := range o.order {
		if nv <= nBig || o.baseRho[u] > rhoCap {
			o.big = append(o.big, u)
		} else {
			rest = append(rest, u)
		}
	}
	o.reach = 2 * rhoCap
	o.grid = planBaseGrid(l.Tri.Coords, rest, o.reach)
	return o
}

// fresh returns an overlay of the same layout and range without planned
// devices, sharing the base data (no recomputation).
func (o *planOverlay) fresh() *planOverlay {
	f := &planOverlay{
		l: o.l, r: o.r, nb: o.nb,
		baseRho: o.baseRho, baseFx: o.baseFx, baseFy: o.baseFy, baseUnc: o.baseUnc,
		baseConvex: o.baseConvex, baseUncTotal: o.baseUncTotal, order: o.order,
		grid: o.grid, big: o.big, reach: o.reach, ix: o.ix,
		dg: planar.NewHashGrid(o.l.AreaM2),
	}
	f.cur = make([]int32, len(o.cur))
	for i := range f.cur {
		f.cur[i] = -1
	}
	f.all.init(o.nb, o.baseRho)
	f.devs.init(0, nil)
	return f
}

// planParallel runs fn over [0, n) split across the available cores
// (planar.ParallelFor), each range at least planGrain long: below
// 2·planGrain = 4096 items it runs on the calling goroutine.
func planParallel(n int, fn func(lo, hi int)) { planar.ParallelFor(n, planGrain, fn) }

// planGrain is the least number of items per goroutine in planParallel.
const planGrain = 2048

// planBaseGrid buckets the listed base sites for queries of radius about
// reach: about two sites per bucket, and buckets no smaller than a quarter
// of the reach (so a query scans O(1) buckets). nil when ids is empty.
func planBaseGrid(xy []float64, ids []int32, reach float64) *planar.BucketGrid {
	if len(ids) == 0 {
		return nil
	}
	minX, minY, maxX, maxY := planar.BoundsXY(xy, ids)
	w, h := maxX-minX, maxY-minY
	side := math.Max(w, h)
	cell := math.Sqrt(w * h / (float64(len(ids)) / 2))
	if !(cell > 0) || math.IsInf(cell, 0) {
		cell = side / math.Sqrt(float64(len(ids)))
	}
	if reach > 0 {
		cell = math.Max(cell, reach/4)
	}
	if !(cell > 0) || math.IsInf(cell, 0) {
		cell = 1
	}
	return planar.NewBucketGrid(planar.GridOfSide(minX, minY, maxX, maxY, cell), xy, ids)
}

// site returns the position of base cell u.
func (o *planOverlay) site(u int32) (float64, float64) {
	return o.l.Tri.Coords[2*u], o.l.Tri.Coords[2*u+1]
}

// baseSet copies the base rings of u into s (labelled u).
func (o *planOverlay) baseSet(u int32, s *planar.ClipRings) {
	s.Reset()
	rs := planCellRings(o.l.Cells, u)
	for k := 0; k < rs.NumRings(); k++ {
		s.AppendRing(rs.Ring(k), u)
	}
}

// baseNear calls fn for every base cell u that a device at (x, y) could
// take something from (|p − u| ≤ 2ρ_u).
func (o *planOverlay) baseNear(x, y float64, fn func(u int32)) {
	test := func(u int32) {
		ux, uy := o.site(u)
		if planDist(x, y, ux, uy) <= 2*o.baseRho[u] {
			fn(u)
		}
	}
	for _, u := range o.big {
		test(u)
	}
	if o.grid != nil {
		o.grid.Near(x, y, o.reach, test)
	}
}

// coincidesBase reports whether (x, y) is exactly a base site.
func (o *planOverlay) coincidesBase(x, y float64) bool {
	v := o.l.Tri.Nearest(x, y, -1)
	return v >= 0 && o.l.Tri.Coords[2*v] == x && o.l.Tri.Coords[2*v+1] == y
}

// curGeo returns the current geometry of base cell u into s when it is not
// overridden (copying the base rings), or the overriding cell's geometry.
func (o *planOverlay) curBase(u int32, s *planar.ClipRings) *planar.ClipRings {
	if c := o.cur[u]; c >= 0 {
		return &o.cells[c].geo
	}
	o.baseSet(u, s)
	return s
}

// baseTaken reports whether a device at (px, py) takes something from the
// geometry g of base cell u.
func (o *planOverlay) baseTaken(u int32, g *planar.ClipRings, px, py float64) bool {
	if len(g.XY) == 0 {
		return false
	}
	ux, uy := o.site(u)
	if ux == px && uy == py {
		return false
	}
	return planar.Bisector(ux, uy, px, py).SomeOutside(g.XY)
}

// numDevices returns the number of planned device ids issued.
func (o *planOverlay) numDevices() int { return len(o.dev) }

// pos returns the position of planned device id.
func (o *planOverlay) pos(id int32) (float64, float64) {
	c := &o.cells[o.dev[id]]
	return c.x, c.y
}

// newCell returns a free planCell index.
func (o *planOverlay) newCell() int32 {
	if n := len(o.free); n > 0 {
		c := o.free[n-1]
		o.free = o.free[:n-1]
		o.cells[c].live = true
		return c
	}
	o.cells = append(o.cells, planCell{live: true})
	return int32(len(o.cells) - 1)
}

func (o *planOverlay) freeCell(c int32) {
	o.cells[c].live = false
	o.cells[c].geo.Reset()
	o.free = append(o.free, c)
	o.all.set(o.nb+int(c), -1)
	o.devs.set(int(c), -1)
}

// maxDevRho returns the largest radius of a planned device's cell.
func (o *planOverlay) maxDevRho() float64 { return math.Max(0, o.devs.max()) }

// measure fills the measures of cell ci from its geometry.
func (o *planOverlay) measure(ci int32) {
	c := &o.cells[ci]
	area, disk, far, fx, fy := planMeasures(&c.geo, c.x, c.y, o.r, o.valid)
	if far < 0 {
		far, fx, fy = 0, c.x, c.y
	}
	c.area, c.unc, c.rho, c.fx, c.fy = area, area-disk, far, fx, fy
	if o.r <= 0 {
		c.unc = area
	}
	o.all.set(o.nb+int(ci), far)
	if c.base < 0 {
		o.devs.set(int(ci), far)
	}
}

// recomputeBase recomputes the current cell of base cell u from the
// planned devices.
func (o *planOverlay) recomputeBase(u int32) {
	sc := &o.sc
	ux, uy := o.site(u)
	o.baseSet(u, &sc.a)
	g := &sc.a
	// A device exactly on the base site takes nothing from it.
	_, cut := o.clipByDevices(&g, ux, uy, o.baseRho[u], func(int32) bool { return false })
	c := o.cur[u]
	if !cut {
		if c >= 0 {
			o.freeCell(c)
			o.cur[u] = -1
			o.all.set(int(u), o.baseRho[u])
		}
		return
	}
	if c < 0 {
		c = o.newCell()
		o.cur[u] = c
		o.all.set(int(u), -1)
	}
	cell := &o.cells[c]
	cell.x, cell.y, cell.base = ux, uy, u
	cell.geo.CopyFrom(g)
	o.measure(c)
}

// recomputeDev recomputes the cell of planned device id.
func (o *planOverlay) recomputeDev(id int32) {
	sc := &o.sc
	cell := &o.cells[o.dev[id]]
	px, py := cell.x, cell.y
	g := &sc.a
	g.Reset()
	if !o.coincidesBase(px, py) {
		o.baseNear(px, py, func(u int32) {
			ux, uy := o.site(u)
			mine, theirs := planar.Bisector(px, py, ux, uy), planar.Bisector(ux, uy, px, py)
			rs := planCellRings(o.l.Cells, u)
			for k := 0; k < rs.NumRings(); k++ {
				if ring := rs.Ring(k); theirs.SomeOutside(ring) {
					// Some of this ring is closer to p than to u.
					mine.ClipRing(ring, nil, u, g)
				}
			}
		})
	}
	// Other planned devices; the lower id keeps a shared spot.
	if len(g.XY) > 0 {
		o.clipByDevices(&g, px, py, planRadius(g, px, py), func(j int32) bool { return j < id })
	}
	cell = &o.cells[o.dev[id]]
	cell.geo.CopyFrom(g)
	o.measure(o.dev[id])
}

// clipByDevices clips *g, the cell of a site at (px, py) of radius at
// most rho, by its half-planes against the planned devices, nearest first
// (bucket ring by bucket ring, sorted within a ring), stopping once a ring
// is farther than twice the radius. A device exactly at (px, py) is
// skipped, unless shared(id) says it takes the spot, which empties the
// cell. It returns the radius and whether anything was cut away.
func (o *planOverlay) clipByDevices(g **planar.ClipRings, px, py, rho float64, shared func(id int32) bool) (float64, bool) {
	sc := &o.sc
	near := sc.near[:0]
	lost, cut := false, false
	for k := int64(0); len((*g).XY) > 0; k++ {
		if k >= 2 && float64(k-1)*o.dg.Side() > 2*rho {
			break
		}
		near = near[:0]
		more := o.dg.Ring(px, py, k, func(j int32) {
			qx, qy := o.pos(j)
			if qx == px && qy == py {
				lost = lost || shared(j)
				return
			}
			if d := planDist(qx, qy, px, py); d <= 2*rho {
				near = append(near, planNear{j, d})
			}
		})
		if lost {
			(*g).Reset()
			cut = true
			break
		}
		slices.SortFunc(near, func(a, b planNear) int {
			if c := cmp.Compare(a.d, b.d); c != 0 {
				return c
			}
			return cmp.Compare(a.id, b.id)
		})
		var c bool
		rho, c = o.clipNearest(g, px, py, near, rho)
		cut = cut || c
		if !more {
			break
		}
	}
	sc.near = near[:0]
	return rho, cut
}

// clipNearest clips *g, the cell of a device at (px, py), by its
// half-planes against the listed devices (by increasing distance), stopping
// once the next is farther than twice the radius; it returns the radius.
func (o *planOverlay) clipNearest(g **planar.ClipRings, px, py float64, near []planNear, rho float64) (float64, bool) {
	sc := &o.sc
	cut := false
	for _, nb := range near {
		if nb.d > 2*rho || len((*g).XY) == 0 {
			break
		}
		qx, qy := o.pos(nb.id)
		hp := planar.Bisector(px, py, qx, qy)
		if !hp.SomeOutside((*g).XY) {
			continue
		}
		hp.ClipSet(*g, &sc.b)
		sc.a, sc.b = sc.b, sc.a
		*g = &sc.a
		rho = planRadius(*g, px, py)
		cut = true
	}
	return rho, cut
}

// planRadius returns the largest distance from (x, y) to a vertex of s, 0
// when s is empty.
func planRadius(s *planar.ClipRings, x, y float64) float64 {
	r := 0.0
	for i := 0; i+1 < len(s.XY); i += 2 {
		r = math.Max(r, planDist(s.XY[i], s.XY[i+1], x, y))
	}
	return r
}

// cellRho returns the current radius of base cell u.
func (o *planOverlay) baseCurRho(u int32) float64 {
	if c := o.cur[u]; c >= 0 {
		return o.cells[c].rho
	}
	return o.baseRho[u]
}

// planDirty is a set of cells to recompute.
type planDirty struct {
	base []int32
	devs []int32
}

func (d *planDirty) addBase(u int32) {
	if !slices.Contains(d.base, u) {
		d.base = append(d.base, u)
	}
}

func (d *planDirty) addDev(id int32) {
	if !slices.Contains(d.devs, id) {
		d.devs = append(d.devs, id)
	}
}

// dirtyAdd collects the cells a device appearing at (x, y) may cut
// (skipping device skip).
func (o *planOverlay) dirtyAdd(x, y float64, skip int32, d *planDirty) {
	o.baseNear(x, y, func(u int32) {
		g := o.curBase(u, &o.sc.c)
		if o.baseTaken(u, g, x, y) {
			d.addBase(u)
		}
	})
	o.sc.ids = o.dg.Within(x, y, 2*o.maxDevRho(), o.sc.ids)
	for _, j := range o.sc.ids {
		if j == skip {
			continue
		}
		c := &o.cells[o.dev[j]]
		if len(c.geo.XY) == 0 {
			continue
		}
		if c.x == x && c.y == y {
			d.addDev(j) // tie rule by id may hand the spot over
			continue
		}
		if planDist(c.x, c.y, x, y) <= 2*c.rho && planar.Bisector(c.x, c.y, x, y).SomeOutside(c.geo.XY) {
			d.addDev(j)
		}
	}
}

// dirtyRemove collects the cells that may gain when device id leaves its
// current position.
func (o *planOverlay) dirtyRemove(id int32, d *planDirty) {
	c := &o.cells[o.dev[id]]
	ax, ay := c.x, c.y
	g := &c.geo
	for _, u := range g.Label {
		d.addBase(u)
	}
	// A device sharing the spot takes over.
	sc := &o.sc
	sc.ids = o.dg.Within(ax, ay, 0, sc.ids)
	for _, j := range sc.ids {
		if j != id {
			if qx, qy := o.pos(j); qx == ax && qy == ay {
				d.addDev(j)
			}
		}
	}
	if len(g.XY) == 0 {
		return
	}
	// Distance from the device to its nearest other site.
	v := o.l.Tri.Nearest(ax, ay, -1)
	dmin := planDist(o.l.Tri.Coords[2*v], o.l.Tri.Coords[2*v+1], ax, ay)
	for k := int64(0); ; k++ {
		if k >= 2 && float64(k-1)*o.dg.Side() > dmin {
			break
		}
		more := o.dg.Ring(ax, ay, k, func(j int32) {
			if j != id {
				qx, qy := o.pos(j)
				dmin = math.Min(dmin, planDist(qx, qy, ax, ay))
			}
		})
		if !more {
			break
		}
	}
	lim := 2*c.rho + dmin
	sc.ids = o.dg.Within(ax, ay, lim, sc.ids)
	for _, j := range sc.ids {
		if j == id {
			continue
		}
		qx, qy := o.pos(j)
		if planDist(qx, qy, ax, ay) > lim {
			continue
		}
		for k := 0; k < g.NumRings(); k++ {
			u := g.Label[k]
			ring := g.Ring(k)
			ux, uy := o.site(u)
			if planDist(qx, qy, ux, uy) > 2*o.baseRho[u] {
				continue
			}
			// Some vertex at least as close to q as to u.
			if !planar.Bisector(qx, qy, ux, uy).AllOutside(ring) {
				d.addDev(j)
				break
			}
		}
	}
}

// rhoOf returns the current radius of a dirty-set member.
func (o *planOverlay) rhoOfDirty(d *planDirty) float64 {
	m := 0.0
	for _, u := range d.base {
		m = math.Max(m, o.baseCurRho(u))
	}
	for _, id := range d.devs {
		if o.dev[id] >= 0 {
			m = math.Max(m, o.cells[o.dev[id]].rho)
		}
	}
	return m
}

// apply recomputes the dirty cells (in index order, so that results do
// not depend on how they were found).
func (o *planOverlay) apply(d *planDirty) {
	slices.Sort(d.devs)
	slices.Sort(d.base)
	for _, id := range d.devs {
		if o.dev[id] >= 0 {
			o.recomputeDev(id)
		}
	}
	for _, u := range d.base {
		o.recomputeBase(u)
	}
}

// add places a planned device at (x, y) and returns its id and the other
// planned devices whose cells it may have cut.
func (o *planOverlay) add(x, y float64) (id int32, near []int32) {
	id = int32(len(o.dev))
	o.dev = append(o.dev, -1)
	return id, o.place(id, x, y)
}

// place puts planned device id, currently out of the plan, at (x, y); it
// returns the other planned devices whose cells it may have cut.
func (o *planOverlay) place(id int32, x, y float64) []int32 {
	var d planDirty
	o.dirtyAdd(x, y, id, &d)
	c := o.newCell()
	o.cells[c] = planCell{x: x, y: y, base: -1, live: true, geo: o.cells[c].geo}
	o.dev[id] = c
	o.dg.Insert(id, x, y)
	o.maybeRebuildGrid()
	slices.Sort(d.devs)
	near := slices.Clone(d.devs)
	d.addDev(id)
	o.apply(&d)
	return near
}

// move moves planned device id to (x, y) and returns the largest radius
// among the changed cells before and after.
func (o *planOverlay) move(id int32, x, y float64) (before, after float64) {
	var d planDirty
	o.dirtyRemove(id, &d)
	o.dirtyAdd(x, y, id, &d)
	d.addDev(id)
	before = o.rhoOfDirty(&d)
	c := &o.cells[o.dev[id]]
	o.dg.Remove(id, c.x, c.y)
	c.x, c.y = x, y
	o.dg.Insert(id, x, y)
	o.apply(&d)
	after = o.rhoOfDirty(&d)
	return before, after
}

// remove takes planned device id out of the plan.
func (o *planOverlay) remove(id int32) {
	var d planDirty
	o.dirtyRemove(id, &d)
	x, y := o.pos(id)
	o.dg.Remove(id, x, y)
	o.freeCell(o.dev[id])
	o.dev[id] = -1
	o.maybeRebuildGrid()
	o.apply(&d)
}

// fullCover returns the full-cover range of the current plan.
func (o *planOverlay) fullCover() float64 { return math.Max(0, o.all.max()) }

// maybeRebuildGrid rebuilds the device grid when the number of devices
// has moved far from the one its bucket size was chosen for.
func (o *planOverlay) maybeRebuildGrid() {
	if !o.dg.NeedsRebuild() {
		return
	}
	o.dg.Reset(o.dg.Len())
	for id, c := range o.dev {
		if c >= 0 {
			o.dg.Insert(int32(id), o.cells[c].x, o.cells[c].y)
		}
	}
}

// planWorstTieTol is the relative tolerance within which a cell's farthest
// vertex counts as attaining the full-cover range when the worst point is
// chosen. Radii carry rounding of about 1e-15 relative (the clipped
// vertices' rounding and one square root), so cells whose true radii tie
// may differ by a few ulps; 1e-9 is far above that and far below any
// distance that matters for placement (1 µm per km), so the lexicographic
// tie-break picks the same point whatever the rounding.
const planWorstTieTol = 1e-9

// planNudgeStart is the first inward step of planOverlay.inside, relative
// to the magnitude of the coordinates (at least 1): a nearest boundary point
// is computed with one rounding per operation, within a few ulps (2.2e-16
// relative each) of the boundary, and 1e-12 (some 4500 ulps) clears that.
// Each further step doubles; planNudgeSteps of them reach 2⁷⁹·1e-12 ≈ 6e11
// relative, beyond any site's extent, so the search ends by finding a point
// or leaving the area.
const (
	planNudgeStart = 1e-12
	planNudgeSteps = 80
)

// worst returns the full-cover range and a point attaining it: among the
// cells' farthest vertices within planWorstTieTol relative of the range,
// the lexicographically smallest.
func (o *planOverlay) worst() (rng float64, p orb.Point) {
	rng = o.fullCover()
	thr := rng * (1 - planWorstTieTol)
	p = orb.Point{math.NaN(), math.NaN()}
	take := func(x, y float64) {
		if math.IsNaN(p[0]) || x < p[0] || (x == p[0] && y < p[1]) {
			p = orb.Point{x, y}
		}
	}
	for _, u := range o.order {
		if o.baseRho[u] < thr {
			break
		}
		if o.cur[u] < 0 {
			take(o.baseFx[u], o.baseFy[u])
		}
	}
	for i := range o.cells {
		if c := &o.cells[i]; c.live && c.rho >= thr && len(c.geo.XY) > 0 {
			take(c.fx, c.fy)
		}
	}
	return rng, p
}

// uncovered returns the uncovered area of the plan at the range r.
func (o *planOverlay) uncovered() float64 {
	s := o.baseUncTotal
	for i := range o.cells {
		c := &o.cells[i]
		if !c.live {
			continue
		}
		if c.base >= 0 {
			s -= o.baseUnc[c.base]
		}
		s += c.unc
	}
	return math.Max(0, s)
}

// positions returns the live planned devices in id order.
func (o *planOverlay) positions() []orb.Point {
	var out []orb.Point
	for id := range o.dev {
		if o.dev[id] >= 0 {
			x, y := o.pos(int32(id))
			out = append(out, orb.Point{x, y})
		}
	}
	return out
}

// gain returns the covered area a device at (x, y) would add to the plan at
// range r (see the file comment). It does not change the overlay and is
// safe to call from several goroutines with distinct scratch.
func (o *planOverlay) gain(x, y float64, sc *planScratch) float64 {
	if !(o.r > 0) || o.coincidesBase(x, y) {
		return 0
	}
	sc.ids = o.dg.Within(x, y, 0, sc.ids)
	for _, id := range sc.ids {
		if qx, qy := o.pos(id); qx == x && qy == y {
			return 0
		}
	}
	r := o.r
	g := 0.0
	piece := func(src *planar.ClipRings, sx, sy float64) {
		if !planar.Bisector(sx, sy, x, y).SomeOutside(src.XY) {
			return
		}
		planar.Bisector(x, y, sx, sy).ClipSet(src, &sc.b)
		for k := 0; k < sc.b.NumRings(); k++ {
			ring := sc.b.Ring(k)
			g += planar.RingDiskArea(ring, x, y, r) - planar.RingDiskArea(ring, sx, sy, r)
		}
	}
	o.baseNear(x, y, func(u int32) {
		src := &sc.a
		if c := o.cur[u]; c >= 0 {
			src = &o.cells[c].geo
		} else {
			o.baseSet(u, src)
		}
		if len(src.XY) == 0 {
			return
		}
		ux, uy := o.site(u)
		piece(src, ux, uy)
	})
	sc.ids = o.dg.Within(x, y, 2*o.maxDevRho(), sc.ids)
	for _, id := range sc.ids {
		c := &o.cells[o.dev[id]]
		if len(c.geo.XY) == 0 || planDist(c.x, c.y, x, y) > 2*c.rho {
			continue
		}
		piece(&c.geo, c.x, c.y)
	}
	return math.Max(0, g)
}

// devVertices returns the points of planned device id's cell that are
// vertices of it (into scratch owned by the overlay).
func (o *planOverlay) devVertices(id int32) []float64 {
	o.sc.pts = planPieceVertices(&o.cells[o.dev[id]].geo, o.valid, o.sc.pts[:0])
	return o.sc.pts
}

// valid reports whether a candidate vertex (x, y) of a piece of base cell
// u lies in that closed cell (plan_clip.go); convex cells need no test.
func (o *planOverlay) valid(u int32, x, y float64) bool {
	if o.baseConvex[u] {
		return true
	}
	rs := planCellRings(o.l.Cells, u)
	return planCellHolds(&rs, x, y)
}

// devRho returns the radius of planned device id's cell.
func (o *planOverlay) devRho(id int32) float64 { return o.cells[o.dev[id]].rho }

// inside returns a point of the area at or next to (x, y): the point itself
// when the area holds it, otherwise the nearest point of the area's
// boundary, nudged inward until the exact point-in-area test accepts it.
// ok is false when no such point is found.
func (o *planOverlay) inside(x, y float64) (px, py float64, ok bool) {
	return planInside(o.ix, o.l.Area, x, y)
}

// planInside is planOverlay.inside for the area a with index ix.
func planInside(ix *planar.RegionIndex, a *planar.Region, x, y float64) (px, py float64, ok bool) {
	if ix.Contains(x, y) {
		return x, y, true
	}
	best := math.Inf(1)
	var bx, by, ex, ey float64
	for k := 0; k < a.NumRings(); k++ {
		ring := a.Ring(k)
		n := len(ring) / 2
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			ax, ay := ring[2*i], ring[2*i+1]
			dx, dy := ring[2*j]-ax, ring[2*j+1]-ay
			l2 := dx*dx + dy*dy
			t := 0.0
			if l2 > 0 {
				t = math.Max(0, math.Min(1, ((x-ax)*dx+(y-ay)*dy)/l2))
			}
			qx, qy := ax+t*dx, ay+t*dy
			if d := planDist(x, y, qx, qy); d < best {
				best, bx, by, ex, ey = d, qx, qy, dx, dy
			}
		}
	}
	if math.IsInf(best, 1) {
		return x, y, false
	}
	// The area lies to the left of every ring edge.
	ln := math.Hypot(ex, ey)
	if ln == 0 {
		return x, y, false
	}
	nx, ny := -ey/ln, ex/ln
	step := planNudgeStart * math.Max(1, math.Max(math.Abs(bx), math.Abs(by)))
	for k := 0; k < planNudgeSteps; k++ {
		qx, qy := bx, by
		if k > 0 {
			qx, qy = bx+step*nx, by+step*ny
			step *= 2
		}
		if ix.Contains(qx, qy) {
			return qx, qy, true
		}
	}
	return x, y, false
}

// planDist is the Euclidean distance from (ax, ay) to (bx, by); plain
// square root (coordinates are far below overflow), correctly rounded
// operations, within 2 ulps.
func planDist(ax, ay, bx, by float64) float64 {
	dx, dy := ax-bx, ay-by
	return math.Sqrt(dx*dx + dy*dy)
}
