// Single-device failures: what each device's outage uncovers, and the range
// at which the plan survives any one failure.
//
// Locality. When device v is out of service, only the points of its
// clipped cell V_v ∩ A change their nearest device; every other point keeps
// its nearest device and its coverage. A point q of V_v is then served by
// its second-nearest device w, and w is a Delaunay neighbour of v: the disk
// centred at q through w holds v and no other site inside; shrinking it
// about w (centre moving from q towards w) until v reaches its boundary
// gives a disk with exactly v and w on its boundary and no site inside, so
// vw is an edge of every Delaunay triangulation of the sites. (This holds
// for every q not equidistant from two sites other than v, a set of zero
// area; the distance to the nearest remaining site is continuous, so the
// statement extends to all of V_v. It also holds with ties among
// cocircular sites, and for collinear sites, whose neighbours are the
// adjacent sites along the line.) Hence the new cells inside V_v are the
// Voronoi cells of v's neighbours N(v) restricted to V_v ∩ A: for w ∈ N(v),
//
//	P_w = V_v ∩ A ∩ ⋂_{u ∈ N(v), u ≠ w} H(w, u),
//
// H(w, u) the half-plane nearer w than u — the classic deletion result that
// only the star of v is retriangulated (Devillers, "On deletion in Delaunay
// triangulations", IJCGA 12, 2002). Per device the work is O(deg(v)²)
// half-plane clips of its cell, O(n) in all (the mean degree is below 6).
//
// Per device v, at the planned range r (inside a cell only its own site's
// disk matters: the site is the nearest to every point q of the cell, so
// any disk D(s, r) holding q has |q − site| ≤ |q − s| ≤ r):
//
//	uncovered in V_v before = area(V_v ∩ A) − area(V_v ∩ A ∩ D(v, r))
//	uncovered in V_v after  = area(V_v ∩ A) − Σ_w area(P_w ∩ D(w, r))
//	added uncovered         = area(V_v∩A∩D(v,r)) − Σ_w area(P_w ∩ D(w,r))
//
// and the closing range — the range the remaining devices need to cover
// what v served, the depth of the deepest new gap — is the largest distance
// from a point of V_v ∩ A to its nearest remaining device, the maximum over
// w of the farthest vertex of P_w from w (a convex function's maximum over
// a polygon is at a vertex). The range at which the plan survives any
// single failure is the largest distance from a point of A to its
// second-nearest device, the maximum of the closing ranges. A device that
// shares its spot with another (exact duplicates) changes nothing when it
// fails; its closing range is then its own cell's radius (the twin is the
// second-nearest device).
//
// Error bounds: areas as planar.RingDiskArea and the clipping of
// plan_clip.go (relative error of order 1e-14 of the cell areas; an added
// uncovered area computed slightly below zero by rounding is reported as
// zero); distances are exact up to the rounding of the clipped vertices
// (about 1e-15 relative of the coordinates).

package coverage

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// DeviceFailure is what one device's outage does to the plan.
type DeviceFailure struct {
	// Site is the device's input index.
	Site int
	// Shared is true when another device stands at exactly the same spot,
	// so that this one's failure changes nothing.
	Shared bool
	// ServiceArea is the area of the device's clipped cell (m²): the part
	// of the site area it serves.
	ServiceArea float64
	// Uncovered is the uncovered area of the whole site area at the
	// planned range with this device out of service (m²).
	Uncovered float64
	// AddedUncovered is how much larger Uncovered is than with every
	// device working (m²).
	AddedUncovered float64
	// Deepest is the point of the device's service area farthest from
	// every remaining device: the deepest point of the new gap.
	Deepest orb.Point
	// ClosingRange is the distance from Deepest to the nearest remaining
	// device: the range at which the remaining devices cover everything
	// this device served. +Inf when no device remains.
	ClosingRange float64
	// Backup is the input index of the remaining device nearest Deepest,
	// the one that takes over the deepest point; -1 when none remains.
	Backup int
	// FullCover is the full-cover range of the layout without this device
	// (NaN with per-device ranges: see FullCoverPower).
	FullCover float64
	// Hidden is true, with per-device ranges (FailuresRanges), for a
	// device whose power cell is empty: the others cover its whole disk,
	// so its failure costs nothing.
	Hidden bool
	// ClosingPower is, with per-device ranges, the uniform power growth t
	// (m², every range becoming √(r_i² + t)) at which the remaining
	// devices cover everything this one served: the largest power of a
	// point of its service area with respect to its new serving device.
	// ClosingRange is then the distance from Deepest to Backup, the range
	// the backup alone needs to reach the deepest point. −Inf when the
	// device serves no part of the area (hidden, or an empty clipped
	// cell), +Inf when no device remains; 0 for one common range.
	ClosingPower float64
	// FullCoverPower is, with per-device ranges, the uniform power growth
	// that covers the whole area without this device (+Inf when none
	// remains); 0 for one common range.
	FullCoverPower float64
	// TakeOver lists, with per-device ranges, the input indices (ascending)
	// of the hidden devices that start serving part of the area when this
	// device fails; nil when none does.
	TakeOver []int
}

// FailureReport ranks the devices by the coverage lost when each is out of
// service, one at a time.
type FailureReport struct {
	// Range is the planned range the areas refer to (metres).
	Range float64
	// Uncovered is the uncovered area with every device working (m²).
	Uncovered float64
	// FullCover is the full-cover range with every device working.
	FullCover float64
	// Devices lists every device, worst failure first: by decreasing
	// AddedUncovered, then decreasing ClosingRange, then input index.
	Devices []DeviceFailure
	// SurviveRange is the range at which the area stays fully covered
	// whichever single device fails: the largest distance from a point of
	// the area to its second-nearest device. +Inf with a single device.
	SurviveRange float64
	// SurvivePoint is where SurviveRange is attained.
	SurvivePoint orb.Point
	// SurviveSite is the input index of the device whose failure needs
	// SurviveRange (-1 when the layout has no device).
	SurviveSite int

	// Ranges holds each device's planned range by input index with
	// per-device ranges (FailuresRanges; Range is then 0 and SurviveRange
	// the distance from SurvivePoint to its backup); nil for one common
	// range.
	Ranges []float64
	// SurvivePower is, with per-device ranges, the smallest uniform power
	// growth t (m²) at which the area stays fully covered whichever single
	// device fails: the largest ClosingPower (≤ 0 when the planned ranges
	// already survive any single failure; +Inf with a single device).
	SurvivePower float64
	// SurviveRanges holds, with per-device ranges, the range each device
	// needs for that: √(r_i² + SurvivePower) by input index, the planned
	// range when SurvivePower ≤ 0 (no growth needed).
	SurviveRanges []float64
	// FullCoverPower is, with per-device ranges, the uniform power growth
	// that covers the whole area with every device working.
	FullCoverPower float64
}

// planFailVertex holds per-vertex failure results.
type planFailVertex struct {
	baseUnc, added float64
	rho            float64 // own cell radius
	fx, fy         float64 // own farthest vertex
	closing        float64
	dx, dy         float64 // deepest point after removal
	backup         int32   // vertex nearest the deepest point
}

// Failures computes, for every device, the effect of its failure at the
// planned range r (see the file comment for the method), the ranking and
// the survive range. Only each device's cell and its Delaunay neighbours
// are visited: O(n) for n devices.
//
// Suggestions and rankings are planning aids: they are exact for the disk
// model, not a guarantee that a real device reaches its range.
func Failures(l *Layout, r float64) (*FailureReport, error) {
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("coverage: Failures: %w", err)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r < 0 {
		return nil, fmt.Errorf("coverage: Failures: range %v must be a finite number ≥ 0", r)
	}
	t := l.Tri
	nv := t.NumVertices()
	rep := &FailureReport{Range: r, SurviveSite: -1, SurvivePoint: orb.Point{math.NaN(), math.NaN()}}
	if nv == 0 {
		rep.Uncovered = l.AreaM2
		rep.FullCover = math.Inf(1)
		rep.SurviveRange = math.Inf(1)
		return rep, nil
	}
	mult := make([]int32, nv)
	for _, v := range t.Vertex {
		mult[v]++
	}
	res := make([]planFailVertex, nv)
	planParallel(nv, func(lo, hi int) {
		var sc planFailScratch
		for v := lo; v < hi; v++ {
			planFailOne(l, int32(v), r, mult[v] > 1, &sc, &res[v])
		}
	})
	// Intact totals; top two cell radii for the full cover without v.
	unc := 0.0
	for v := range res {
		unc += res[v].baseUnc
	}
	top := planTopTwo(len(res), func(v int) float64 { return res[v].rho })
	unc = math.Max(0, unc)
	rep.Uncovered = unc
	rep.FullCover = res[top.top1].rho
	// Smallest other input index at each shared vertex.
	twin := make(map[int32][2]int)
	for i, v := range t.Vertex {
		if mult[v] > 1 {
			p, ok := twin[v]
			if !ok {
				p = [2]int{-1, -1}
			}
			if p[0] < 0 {
				p[0] = i
			} else if p[1] < 0 {
				p[1] = i
			}
			twin[v] = p
		}
	}
	devs := make([]DeviceFailure, len(l.Sites))
	for i := range devs {
		v := t.Vertex[i]
		f := &res[v]
		d := DeviceFailure{Site: i, ServiceArea: l.Cells.Area[v]}
		if mult[v] > 1 {
			p := twin[v]
			other := p[0]
			if other == i {
				other = p[1]
			}
			d.Shared = true
			d.Uncovered = unc
			d.Deepest = orb.Point{f.fx, f.fy}
			d.ClosingRange = f.rho
			d.Backup = other
			d.FullCover = rep.FullCover
		} else {
			d.AddedUncovered = f.added
			d.Uncovered = unc + f.added
			d.Deepest = orb.Point{f.dx, f.dy}
			d.ClosingRange = f.closing
			d.Backup = -1
			if f.backup >= 0 {
				d.Backup = int(t.Source[f.backup])
			}
			others := 0.0
			if o := top.other(v); o >= 0 {
				others = res[o].rho
			}
			d.FullCover = math.Max(f.closing, others)
		}
		if rep.SurviveSite < 0 || d.ClosingRange > rep.SurviveRange {
			rep.SurviveRange, rep.SurvivePoint, rep.SurviveSite = d.ClosingRange, d.Deepest, i
		}
		devs[i] = d
	}
	slices.SortFunc(devs, func(a, b DeviceFailure) int {
		if c := cmp.Compare(b.AddedUncovered, a.AddedUncovered); c != 0 {
			return c
		}
		if c := cmp.Compare(b.ClosingRange, a.ClosingRange); c != 0 {
			return c
		}
		return cmp.Compare(a.Site, b.Site)
	})
	rep.Devices = devs
	return rep, nil
}

// planTop2 holds the indices of the largest and second-largest of a list
// of values (the first index on ties; −1 where there is none).
type planTop2 struct{ top1, top2 int32 }

// planTopTwo returns the two largest of n values.
func planTopTwo(n int, val func(i int) float64) planTop2 {
	t := planTop2{-1, -1}
	for i := 0; i < n; i++ {
		switch x := val(i); {
		case t.top1 < 0 || x > val(int(t.top1)):
			t.top1, t.top2 = int32(i), t.top1
		case t.top2 < 0 || x > val(int(t.top2)):
			t.top2 = int32(i)
		}
	}
	return t
}

// other returns the index of the largest value other than v's (−1: none).
func (t planTop2) other(v int32) int32 {
	if t.top1 != v {
		return t.top1
	}
	return t.top2
}

// planFailScratch is per-goroutine scratch space of Failures.
type planFailScratch struct {
	nbrs  []int32
	cell  planar.ClipRings
	split kSplitScratch
}

// planFailOne computes the failure of vertex v.
func planFailOne(l *Layout, v int32, r float64, shared bool, sc *planFailScratch, out *planFailVertex) {
	t, c := l.Tri, l.Cells
	vx, vy := t.Coords[2*v], t.Coords[2*v+1]
	sc.cell.Reset()
	rs := planCellRings(c, v)
	for k := 0; k < rs.NumRings(); k++ {
		sc.cell.AppendRing(rs.Ring(k), v)
	}
	area, disk, far, fx, fy := planMeasures(&sc.cell, vx, vy, r, nil)
	if far < 0 {
		far, fx, fy = 0, vx, vy
	}
	out.baseUnc = area - disk
	if r <= 0 {
		out.baseUnc = area
	}
	out.rho, out.fx, out.fy = far, fx, fy
	out.backup = -1
	sc.nbrs = t.Neighbors(v, sc.nbrs[:0])
	nbrs := sc.nbrs
	if shared {
		return
	}
	if len(nbrs) == 0 {
		// The only device: nothing remains.
		out.added = area - out.baseUnc
		out.closing = math.Inf(1)
		out.dx, out.dy = vx, vy
		return
	}
	if len(sc.cell.XY) == 0 {
		// Serves no part of the area.
		best := math.Inf(1)
		for _, w := range nbrs {
			if d := math.Hypot(t.Coords[2*w]-vx, t.Coords[2*w+1]-vy); d < best {
				best, out.backup = d, w
			}
		}
		out.closing, out.dx, out.dy = 0, vx, vy
		return
	}
	// Candidate vertices of the pieces need a point-in-cell test unless the
	// cell is one convex ring (plan_clip.go).
	var valid func(int32, float64, float64) bool
	if !planCellConvex(&sc.cell.RingSet) {
		valid = func(_ int32, x, y float64) bool { return planCellHolds(&sc.cell.RingSet, x, y) }
	}
	// The pieces P_w: kSplit (kcover_split.go), the same computation that
	// gives the order-2 pieces of KCover.
	kSplit(t, &sc.cell, nbrs, r, valid, false, &sc.split)
	sumDisk := 0.0
	out.closing = -1
	for _, p := range sc.split.res {
		sumDisk += p.disk
		if p.far > out.closing {
			out.closing, out.dx, out.dy, out.backup = p.far, p.fx, p.fy, nbrs[p.cand]
		}
	}
	if r > 0 {
		out.added = math.Max(0, disk-sumDisk)
	}
	if out.closing < 0 {
		out.closing, out.dx, out.dy = 0, vx, vy
	}
}

// planCheckLayout reports a Layout the planners cannot use.
func planCheckLayout(l *Layout) error {
	switch {
	case l == nil:
		return fmt.Errorf("no layout")
	case l.Tri == nil || l.Cells == nil || l.Area == nil:
		return fmt.Errorf("layout is not built (use NewLayout)")
	case len(l.Tri.Vertex) != len(l.Sites):
		return fmt.Errorf("layout has %d sites but its triangulation maps %d", len(l.Sites), len(l.Tri.Vertex))
	case len(l.Cells.SiteStart) != l.Tri.NumVertices()+1:
		return fmt.Errorf("layout cells do not match its triangulation")
	}
	return nil
}
