// The loss if one device fails, with own ranges, computed for the one
// device asked about.
//
// coverage.FailuresRanges computes every device's failure at once; for
// 10 000 devices that takes some 110 ms, over the page's 100 ms update
// budget, and the page asks after every edit and slider move for the
// selected device only. So the review computes one device's failure on a
// small sub-layout that has exactly the same answer.
//
// Why the sub-layout is exact. Let v be the failing device (a vertex of
// the regular triangulation), N(v) its neighbours there and π_i(x) =
// |x − p_i|² − r_i² the powers. Only the points of v's power cell P_v
// change their smallest-power device when v fails, and inside P_v the new
// owner is a device of N(v) or a hidden device (the method of
// coverage/plan_failures_ranges.go). Fix any w ∈ N(v): every point x of
// P_v ∩ A keeps a candidate of power ≤ π_w(x), so the new owner's power
// there is at most M = min over w ∈ N(v) of the largest π_w over the
// vertices of P_v ∩ A (π_w is convex: its maximum over a polygon is at a
// vertex). A hidden device u can own x only if π_u(x) < M, so only if
// |x − p_u|² < r_u² + M for a point x of the bounding box of P_v ∩ A. Let
// S be v, the devices at v's or a neighbour's vertex, and the hidden
// devices passing that test. Then
//
//   - v's power cell among S is P_v: P_v is the intersection of the
//     half-planes {π_v ≤ π_u}, u ∈ N(v), and N(v) ⊆ S ⊆ all devices;
//   - inside P_v the power diagram of S \ {v} is that of all devices but
//     v: every point's smallest-power device among all but v lies in S.
//
// So coverage.FailuresRanges on the layout of S reports for v the same
// added uncovered area, deepest point, backup and closing growth as on the
// whole layout; it is run at the ranges now, √(b_i² + t). The power
// differences π_u − π_w do not depend on t, so M and the test are taken
// at t = 0 (b_i), where the whole layout was built.
//
// Error bounds: the sub-layout's cell P_v is cut by the same power lines
// as the whole layout's, so the figures agree to the rounding of the
// measures (1e-12 relative in the tests, rangesTolerance). The hidden
// device test keeps the relative slack subLayoutSlack, so a device that
// rounding would put just outside is taken; an extra device in S changes
// nothing (it owns no part of P_v or owns it in both).

package review

import (
	"errors"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// subLayoutSlack is the relative slack of the hidden-device test: r_u² + M
// and the squared distance to the bounding box carry a few roundings of
// relative size 2⁻⁵³ each; 1e-9 covers them with a wide margin and only
// ever adds a device.
const subLayoutSlack = 1e-9

// rangedFailure returns the failure of the device of layout input index k
// at growth t (k not hidden), computed on the sub-layout of the file
// comment, its Site and Backup given as layout input indices.
func (g *geometry) rangedFailure(k int, t float64, cfg *Config) (coverage.DeviceFailure, error) {
	l := g.layout
	tri := l.Tri
	v := tri.Vertex[k]
	nbrs := tri.Neighbors(v, nil)
	in := func(u int32) bool { return u == v || slices.Contains(nbrs, u) }
	xy := cellXY(l, v)
	m := math.Inf(1)
	for _, u := range nbrs {
		pu, w := tri.Coords[2*u:2*u+2], l.Ranges[u]*l.Ranges[u]
		far := math.Inf(-1)
		for j := 0; j+1 < len(xy); j += 2 {
			dx, dy := xy[j]-pu[0], xy[j+1]-pu[1]
			far = max(far, dx*dx+dy*dy-w)
		}
		m = min(m, far)
	}
	var b orb.Bound
	if len(xy) > 0 {
		b = orb.Bound{Min: orb.Point{xy[0], xy[1]}, Max: orb.Point{xy[0], xy[1]}}
		for j := 2; j+1 < len(xy); j += 2 {
			b = b.Extend(orb.Point{xy[j], xy[j+1]})
		}
	}
	var sub []int // layout input indices of S, ascending
	for i := range l.Sites {
		if u := tri.Vertex[i]; u >= 0 {
			if in(u) {
				sub = append(sub, i)
			}
			continue
		}
		if len(xy) == 0 {
			continue // v serves nothing: no hidden device takes over
		}
		p, r := l.Sites[i], l.InputRanges[i]
		dx := max(0, b.Min[0]-p[0], p[0]-b.Max[0])
		dy := max(0, b.Min[1]-p[1], p[1]-b.Max[1])
		if dx*dx+dy*dy <= (r*r+m)*(1+subLayoutSlack) {
			sub = append(sub, i)
		}
	}
	pts := make([]orb.Point, len(sub))
	ranges := make([]float64, len(sub))
	self := -1
	for j, i := range sub {
		pts[j], ranges[j] = l.Sites[i], grown(l.InputRanges[i], t)
		if i == k {
			self = j
		}
	}
	sl, err := coverage.NewLayoutRanges(pts, ranges, cfg.Region)
	if err != nil {
		return coverage.DeviceFailure{}, err
	}
	rep, err := coverage.FailuresRanges(sl)
	if err != nil {
		return coverage.DeviceFailure{}, err
	}
	j := slices.IndexFunc(rep.Devices, func(d coverage.DeviceFailure) bool { return d.Site == self })
	if j < 0 {
		return coverage.DeviceFailure{}, errors.New("review: device missing from its failure report")
	}
	f := rep.Devices[j]
	f.Site = k
	if f.Backup >= 0 {
		f.Backup = sub[f.Backup]
	}
	return f, nil
}

// cellXY returns the interleaved coordinates of every ring of vertex v's
// clipped cell (empty when the cell is).
func cellXY(l *coverage.Layout, v int32) []float64 {
	c := l.Cells
	r0, r1 := c.RingStart[c.PolyStart[c.SiteStart[v]]], c.RingStart[c.PolyStart[c.SiteStart[v+1]]]
	return c.XY[2*r0 : 2*r1]
}
