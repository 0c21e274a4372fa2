// Assignment of demand points when devices have their own ranges.
//
// The rule, applied exactly: a device reaches a point q when |q − p_i| ≤
// r_i (its own range); q is served by the NEAREST device that reaches it,
// equally near ones resolving to the smallest input index. A point that no
// device reaches is assigned to its nearest device (same tie rule) and
// marked not within range, as Assign does beyond the common range. This is
// not the power-cell owner: the power cell of q holds the device whose
// disk q lies deepest in relative to its range (smallest |q − p_i|² −
// r_i²), which may be a far gateway rather than a near sensor that also
// reaches q; a planner asks which device the point talks to, and a device
// in reach that is nearer is the usual answer. Hidden devices (coverage
// redundant) still serve: their disks are covered by others, but a point
// nearest to them is theirs. AssignPowerCells (plan_assign_power.go)
// applies the power-cell rule instead, whose loads add up to the service
// areas; both mark the same points within reach (those some disk holds).
//
// Method. Devices are bucketed in a square grid of side s = max r_i
// (sorted cell keys with offsets, no map): every device reaching q lies
// within one cell of q's — two are searched, since a cell index computed
// in floating point may differ by one from the exact one at a cell edge
// (cellSlack). For a point nobody reaches, rings of cells around q are
// searched outwards; after ring k every device within (k − cellSlack)·s of
// q has been seen, so the search stops once the best distance found is at
// most that; rings wholly outside the grid are skipped. Distances are the correctly rounded math.Hypot of the
// coordinate differences, compared with the ranges as given: exact as a
// rule on those rounded distances. The queries run in parallel.

package coverage

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// AssignRanges assigns each demand point to the nearest device whose own
// range reaches it (the file comment states the rule), for devices at
// sites with ranges (metres, one per site, finite and positive). weights
// are as for Assign. The result's Range is 0 and its Ranges holds the
// devices' ranges; Within tells whether the serving device reaches the
// point.
func AssignRanges(sites []orb.Point, ranges []float64, points []orb.Point, weights []float64) (*Assignment, error) {
	const where = "coverage: AssignRanges"
	if len(sites) == 0 {
		return nil, fmt.Errorf("%s: no device to assign to", where)
	}
	if len(ranges) != len(sites) {
		return nil, fmt.Errorf("%s: %d ranges for %d devices", where, len(ranges), len(sites))
	}
	side := 0.0
	for i, r := range ranges {
		if math.IsNaN(r) || math.IsInf(r, 0) || !(r > 0) {
			return nil, fmt.Errorf("%s: device %d: range %v must be a positive finite number", where, i, r)
		}
		if err := planCheckPoint(sites[i]); err != nil {
			return nil, fmt.Errorf("%s: device %d: %w", where, i, err)
		}
		side = math.Max(side, r)
	}
	for i, p := range points {
		if err := planCheckPoint(p); err != nil {
			return nil, fmt.Errorf("%s: point %d: %w", where, i, err)
		}
	}
	w, err := planAssignWeights(where, len(points), weights)
	if err != nil {
		return nil, err
	}
	g := newReachGrid(sites, side)
	a := &Assignment{
		Ranges:   append([]float64(nil), ranges...),
		Device:   make([]int, len(points)),
		Distance: make([]float64, len(points)),
		Within:   make([]bool, len(points)),
		Weight:   w,
		Load:     make([]DeviceLoad, len(sites)),
	}
	planParallel(len(points), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			a.Device[i], a.Distance[i], a.Within[i] = g.serve(points[i], ranges)
		}
	})
	a.tally()
	return a, nil
}

// cellSlack is how many cells beyond the exact reach are searched: the
// rounded cell index of a point differs from the exact one by at most one.
const cellSlack int64 = 1

// reachGrid buckets devices in square cells of side s: the devices of the
// cell with key keys[k] are dev[start[k]:start[k+1]], keys ascending.
type reachGrid struct {
	s          float64
	x0, y0     float64
	keys       []int64
	start      []int32
	dev        []int32
	xy         []float64
	span       int64 // cells per row in the key (keys are cy·span + cx)
	cols, rows int64
}

// newReachGrid buckets sites in cells of side s.
func newReachGrid(sites []orb.Point, s float64) *reachGrid {
	b := orb.MultiPoint(sites).Bound()
	g := &reachGrid{s: s, x0: b.Min[0], y0: b.Min[1], xy: make([]float64, 2*len(sites))}
	g.cols = int64((b.Max[0]-b.Min[0])/s) + 1
	g.rows = int64((b.Max[1]-b.Min[1])/s) + 1
	g.span = g.cols
	type kd struct {
		k int64
		i int32
	}
	kds := make([]kd, len(sites))
	for i, p := range sites {
		g.xy[2*i], g.xy[2*i+1] = p[0], p[1]
		cx, cy := g.cell(p)
		kds[i] = kd{cy*g.span + cx, int32(i)}
	}
	slices.SortFunc(kds, func(a, b kd) int {
		if a.k != b.k {
			return cmp.Compare(a.k, b.k)
		}
		return int(a.i - b.i)
	})
	for j, e := range kds {
		if j == 0 || e.k != kds[j-1].k {
			g.keys = append(g.keys, e.k)
			g.start = append(g.start, int32(j))
		}
		g.dev = append(g.dev, e.i)
	}
	g.start = append(g.start, int32(len(kds)))
	return g
}

// cell returns the cell column and row of p (clamped to the grid).
func (g *reachGrid) cell(p orb.Point) (int64, int64) {
	cx := int64(math.Floor((p[0] - g.x0) / g.s))
	cy := int64(math.Floor((p[1] - g.y0) / g.s))
	return cx, cy
}

// devices returns the devices of cell (cx, cy), none outside the grid.
func (g *reachGrid) devices(cx, cy int64) []int32 {
	if cx < 0 || cy < 0 || cx >= g.cols || cy >= g.rows {
		return nil
	}
	k, ok := slices.BinarySearch(g.keys, cy*g.span+cx)
	if !ok {
		return nil
	}
	return g.dev[g.start[k]:g.start[k+1]]
}

// better reports whether device i at distance d beats device best at bd
// (nearer, or as near with a smaller input index).
func better(d float64, i int32, bd float64, best int32) bool {
	return best < 0 || d < bd || d == bd && i < best
}

// serve returns the device serving q, its distance and whether it reaches
// q (the file comment's rule).
func (g *reachGrid) serve(q orb.Point, ranges []float64) (int, float64, bool) {
	cx, cy := g.cell(q)
	best, bd := int32(-1), math.Inf(1)
	for dy := -1 - cellSlack; dy <= 1+cellSlack; dy++ {
		for dx := -1 - cellSlack; dx <= 1+cellSlack; dx++ {
			for _, i := range g.devices(cx+dx, cy+dy) {
				d := math.Hypot(q[0]-g.xy[2*i], q[1]-g.xy[2*i+1])
				if d <= ranges[i] && better(d, i, bd, best) {
					best, bd = i, d
				}
			}
		}
	}
	if best >= 0 {
		return int(best), bd, true
	}
	// Nobody reaches q: the nearest device, by rings of cells. Ring k
	// holds the cells at Chebyshev distance k from q's cell; after it
	// every device within k·s of q was seen.
	k0 := max(0, -cx, -cy, cx-(g.cols-1), cy-(g.rows-1)) // rings nearer are outside the grid
	maxK := k0 + max(g.cols, g.rows) + cellSlack
	visit := func(x, y int64) {
		for _, i := range g.devices(x, y) {
			d := math.Hypot(q[0]-g.xy[2*i], q[1]-g.xy[2*i+1])
			if better(d, i, bd, best) {
				best, bd = i, d
			}
		}
	}
	for k := k0; k <= maxK; k++ {
		// The cells of ring k inside the grid: its top and bottom rows
		// whole, its side columns between them.
		for y := max(cy-k, 0); y <= min(cy+k, g.rows-1); y++ {
			if y == cy-k || y == cy+k {
				for x := max(cx-k, 0); x <= min(cx+k, g.cols-1); x++ {
					visit(x, y)
				}
				continue
			}
			visit(cx-k, y)
			visit(cx+k, y)
		}
		if best >= 0 && bd <= float64(k-cellSlack)*g.s {
			break
		}
	}
	return int(best), bd, false
}

func abs64(v int64) int64 {
	if v < 0 {
		return -v
	}
	return v
}
