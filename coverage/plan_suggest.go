// Where to add devices: free placement minimising the full-cover range, and
// the fewest additions that close every gap at a planned range.
//
// Method. Farthest-point insertion (Gonzalez, "Clustering to minimize the
// maximum intercluster distance", Theor. Comp. Sci. 38, 1985): each new
// device goes to the current worst point, the point of the area farthest
// from every device (the vertex of a clipped cell attaining the full-cover
// range: on the cell of site x the distance to the nearest device is
// |q − x|, a convex function, so its maximum over the cell is at a vertex).
// With the existing devices fixed this is Gonzalez's greedy
// 2-approximation of the k-centre problem over the area. Then local
// refinement in the manner of Lloyd's iteration for the minimax objective:
// each new device moves to the centre of the smallest circle enclosing its
// clipped cell (Welzl 1991; the circle is fixed by the cell's farthest
// points, and its centre is the position that serves the cell with the
// smallest range). A move is kept when the full-cover range falls, or when
// it stays and the largest radius among the cells the move changed falls
// (a strict descent in that order, so refinement cannot cycle); otherwise
// the device goes back. Rounds repeat while the full-cover range falls,
// first around each new device as it is inserted (it and the new devices
// next to it), then over all new devices. A refined centre outside the
// area or inside an exclusion zone is moved to the nearest point of the
// area's boundary, nudged inward until the exact point-in-area test
// accepts it; a device is never placed where planar.Region.Contains says
// no.
//
// FewestAdditions builds two plans and keeps the one with fewer devices
// (the first on a tie): (1) farthest-point insertion with refinement until
// the full-cover range is at most the planned range r; (2) hexagonal
// seeding — devices on the triangular lattice of spacing r·√3, whose disks
// of radius r form the thinnest covering of the plane (Kershner 1939),
// kept only where they add covered area to the existing layout, tried at
// 9 lattice offsets (1 when the estimate exceeds 500 devices), remaining
// gaps (along the boundary) closed by farthest-point insertion. Each plan
// then drops every new device whose removal keeps the full-cover range
// within r (latest first), so no single addition of the result is
// redundant.
//
// Every figure is computed exactly from the clipped cells (plan_overlay.go;
// relative error of order 1e-14). The comparison for FewestAdditions is the
// hexagonal estimate area / ((3√3/2) r²): the thinnest covering of the
// plane by equal disks is the hexagonal one, each disk serving a regular
// hexagon of area (3√3/2) r² (Kershner, "The number of circles covering a
// set", Amer. J. Math. 61, 1939); boundary losses make any real site need
// more.
//
// The full-cover test "range ≤ r" allows 1e-12 relative, so a layout that
// meets r exactly (lattice spacing s at r = s/√2) is not pushed on by
// rounding.

package coverage

import (
	"errors"
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// SuggestOptions tunes SuggestAdditions and FewestAdditions. The zero value
// gives the defaults.
type SuggestOptions struct {
	// Range is the planned range (metres) at which SuggestAdditions
	// reports covered and uncovered area. FewestAdditions uses its r
	// argument instead. 0 reports everything as uncovered.
	Range float64
	// Refine is the largest number of refinement rounds per addition and
	// at the end; 0 means 8, a negative value turns refinement off (plain
	// farthest-point insertion).
	Refine int
	// MaxAdditions caps FewestAdditions; 0 means 8·⌈HexEstimate⌉ + 64.
	MaxAdditions int
}

// Step gives the plan's figures before and after one addition, the devices
// being added in the order of Suggestion.Added.
type Step struct {
	// Added is the new device's position.
	Added orb.Point
	// FullCoverBefore and FullCoverAfter are the full-cover ranges (m).
	FullCoverBefore, FullCoverAfter float64
	// FullCoverPowerBefore and FullCoverPowerAfter are, with per-device
	// ranges (SuggestAdditionsRanges), the uniform growth of every r² that
	// leaves no gap (m²); FullCoverBefore and FullCoverAfter are then the
	// range an added device would need under it.
	FullCoverPowerBefore, FullCoverPowerAfter float64
	// CoveredBefore and CoveredAfter are the covered fractions (0..1) of
	// the area at the planned range.
	CoveredBefore, CoveredAfter float64
	// UncoveredBefore and UncoveredAfter are the uncovered areas (m²) at
	// the planned range.
	UncoveredBefore, UncoveredAfter float64
}

// Suggestion is a set of positions for new devices.
type Suggestion struct {
	// Added are the new devices' positions, in the order they were
	// inserted; each lies in the site area, outside every exclusion zone.
	Added []orb.Point
	// Steps[j] are the figures of adding Added[j] to the existing devices
	// and Added[:j].
	Steps []Step
	// Range is the planned range the covered figures refer to (m).
	Range float64
	// Existing is the number of existing devices.
	Existing int
	// FullCoverBefore and FullCoverAfter are the full-cover ranges of the
	// layout alone and with every addition.
	FullCoverBefore, FullCoverAfter float64
	// NewRange is, with per-device ranges (SuggestAdditionsRanges,
	// FewestAdditionsRanges), the range of every added device; Range is
	// then 0, the covered figures refer to each device's own range, and
	// FullCoverBefore and FullCoverAfter are the range an added device
	// would need when every r² grows by FullCoverPowerBefore and
	// FullCoverPowerAfter, the growth that leaves no gap (NewRange when
	// none is needed).
	NewRange                                  float64
	FullCoverPowerBefore, FullCoverPowerAfter float64
	// CoveredBefore and CoveredAfter are covered fractions (0..1).
	CoveredBefore, CoveredAfter float64
	// UncoveredBefore and UncoveredAfter are uncovered areas (m²).
	UncoveredBefore, UncoveredAfter float64
	// Reached tells, for FewestAdditions, whether no gap remains at Range.
	Reached bool
	// Method names the construction FewestAdditions kept
	// (MethodFarthestPoint or MethodHexagonal); empty for
	// SuggestAdditions.
	Method string
	// HexEstimate is, for FewestAdditions, the number of devices a
	// hexagonal covering of an area this size needs, area / ((3√3/2)·r²)
	// (Kershner 1939); HexDevices is its ceiling.
	HexEstimate float64
	HexDevices  int
	// TotalDevices is Existing + len(Added).
	TotalDevices int
	// HexRatio is TotalDevices / HexEstimate: how far the plan is from the
	// thinnest possible covering (1 is the unreachable ideal).
	HexRatio float64
}

// ErrAdditionCap is returned (wrapped) by FewestAdditions when the cap on
// additions is reached before every gap is closed; the Suggestion returned
// with it holds the devices placed so far.
var ErrAdditionCap = errors.New("addition cap reached before full cover")

const (
	planDefaultRefine = 8
	planRangeTol      = 1e-12
)

// planHexShrink shrinks the seeding lattice's spacing below r·√3, whose
// covering radius is exactly r: the lattice points are computed with a
// rounding or two each (relative 1e-16 of the coordinates), which could
// leave a deep hole a few ulps beyond r; 1e-9 is far above that and costs
// nothing measurable in the number of seeds.
const planHexShrink = 1e-9

// planMoveFloor is the smallest cell radius used to scale the no-move test
// of refinement: a move shorter than planSECTol·ρ is within the accuracy of
// the enclosing circle's centre (plan_sec.go) and is not made; for a cell of
// radius 0 only an exact coincidence is then no move.
const planMoveFloor = 1e-300

// SuggestAdditions proposes positions for k new devices inside the site
// area (never in an exclusion zone), the existing devices staying where
// they are, that make the full-cover range small: farthest-point insertion
// followed by smallest-enclosing-circle refinement (see the file comment).
// Steps reports the full-cover range, covered fraction and uncovered area
// at opt.Range before and after each addition.
//
// Suggestions are planning aids: the positions are exact for the disk
// model, and a surveyor must confirm that a device can be mounted there
// and reaches its range.
func SuggestAdditions(l *Layout, k int, opt SuggestOptions) (*Suggestion, error) {
	const where = "coverage: SuggestAdditions"
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if k < 0 {
		return nil, fmt.Errorf("%s: %d additions requested; need k ≥ 0", where, k)
	}
	if r := opt.Range; math.IsNaN(r) || math.IsInf(r, 0) || r < 0 {
		return nil, fmt.Errorf("%s: range %v must be a finite number ≥ 0", where, r)
	}
	o := newPlanOverlay(l, opt.Range)
	rounds := planRounds(opt)
	for j := 0; j < k; j++ {
		id, near, err := planInsert(o)
		if err != nil {
			return nil, fmt.Errorf("%s: addition %d: %w", where, j+1, err)
		}
		planRefine(o, append(near, id), rounds)
	}
	planRefine(o, o.liveIDs(), rounds)
	return planReport(o, opt.Range), nil
}

// FewestAdditions adds devices until no gap remains at the planned range r
// (the better of farthest-point insertion and hexagonal seeding, see the
// file comment), and compares the total with the hexagonal covering
// estimate. When the cap
// opt.MaxAdditions is reached first it returns the devices placed so far
// together with an error wrapping ErrAdditionCap.
//
// Suggestions are planning aids, exact for the disk model only.
func FewestAdditions(l *Layout, r float64, opt SuggestOptions) (*Suggestion, error) {
	const where = "coverage: FewestAdditions"
	if err := planCheckLayout(l); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
		return nil, fmt.Errorf("%s: range %v must be a finite number > 0", where, r)
	}
	hex := l.AreaM2 / (1.5 * math.Sqrt(3) * r * r)
	limit := opt.MaxAdditions
	if limit <= 0 {
		limit = 8*int(math.Min(math.Ceil(hex), 1<<26)) + 64
	}
	rounds := planRounds(opt)

	// Farthest-point insertion with refinement.
	best := newPlanOverlay(l, r)
	method := MethodFarthestPoint
	capped, err := planFillGaps(best, limit, rounds)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if !capped {
		planRefine(best, best.liveIDs(), rounds)
		planPrune(best)
		// Hexagonal seeding, at 9 lattice offsets (1 for large problems).
		shifts := 3
		if hex > 500 {
			shifts = 1
		}
		for sx := 0; sx < shifts; sx++ {
			for sy := 0; sy < shifts; sy++ {
				o := newPlanOverlay(l, r)
				if !planSeedHex(o, float64(sx)/float64(shifts), float64(sy)/float64(shifts), limit) {
					continue
				}
				planPrune(o)
				if c, err := planFillGaps(o, limit-len(o.liveIDs()), 0); err != nil || c {
					continue
				}
				planPrune(o)
				if len(o.liveIDs()) < len(best.liveIDs()) {
					best, method = o, MethodHexagonal
				}
			}
		}
	}
	s := planReport(best, r)
	s.Method = method
	s.Reached = s.FullCoverAfter <= r*(1+planRangeTol)
	s.HexEstimate = hex
	s.HexDevices = int(math.Ceil(hex))
	if hex > 0 {
		s.HexRatio = float64(s.TotalDevices) / hex
	}
	if capped {
		return s, fmt.Errorf("%s: %w: %d additions leave a full-cover range of %.6g m > %.6g m (raise SuggestOptions.MaxAdditions)",
			where, ErrAdditionCap, len(s.Added), s.FullCoverAfter, r)
	}
	return s, nil
}

// Construction methods reported in Suggestion.Method.
const (
	// MethodFarthestPoint is farthest-point insertion with
	// smallest-enclosing-circle refinement.
	MethodFarthestPoint = "farthest-point insertion"
	// MethodHexagonal is hexagonal seeding: devices on the thinnest
	// covering lattice where they add coverage, redundant ones dropped,
	// remaining gaps closed by farthest-point insertion.
	MethodHexagonal = "hexagonal seeding"
)

// planFillGaps inserts devices at the worst point (refining each) until
// the full-cover range is within the overlay's range; it reports whether
// the limit stopped it first.
func planFillGaps(o *planOverlay, limit, rounds int) (bool, error) {
	target := o.r * (1 + planRangeTol)
	for added := 0; o.fullCover() > target; added++ {
		if added >= limit {
			return true, nil
		}
		id, near, err := planInsert(o)
		if err != nil {
			return false, fmt.Errorf("addition %d: %w", len(o.liveIDs())+1, err)
		}
		planRefine(o, append(near, id), rounds)
	}
	return false, nil
}

// planPrune drops planned devices whose removal keeps the full-cover range
// within the overlay's range, latest first.
func planPrune(o *planOverlay) {
	target := o.r * (1 + planRangeTol)
	if o.fullCover() > target {
		return
	}
	ids := o.liveIDs()
	for i := len(ids) - 1; i >= 0; i-- {
		id := ids[i]
		x, y := o.pos(id)
		o.remove(id)
		if o.fullCover() > target {
			o.place(id, x, y)
		}
	}
}

// planSeedHex places devices on the triangular lattice of spacing r·√3
// (whose disks of radius r cover the plane: Kershner 1939), shifted by
// (fx, fy) of a lattice step, keeping the lattice points whose disk adds
// covered area to the bare layout; a point outside the area moves to the
// nearest point of the area when that is within r. It reports false when
// more than limit devices would be placed.
func planSeedHex(o *planOverlay, fx, fy float64, limit int) bool {
	r := o.r
	b := o.l.Area.Bound()
	sp := r * math.Sqrt(3) * (1 - planHexShrink)
	h := sp * math.Sqrt(3) / 2
	var pts []float64
	for j := -1; ; j++ {
		y := b.Min[1] + (float64(j)+fy)*h
		if y > b.Max[1]+h {
			break
		}
		off := fx * sp
		if j%2 != 0 {
			off += sp / 2
		}
		for x := b.Min[0] - sp + off; x <= b.Max[0]+sp; x += sp {
			if px, py, ok := o.inside(x, y); ok && math.Hypot(px-x, py-y) < r {
				pts = append(pts, px, py)
			}
		}
	}
	gains := planGains(o, pts)
	n := 0
	for _, g := range gains {
		if g > planGainEps(r) {
			n++
		}
	}
	if n > limit {
		return false
	}
	for i, g := range gains {
		if g > planGainEps(r) {
			o.add(pts[2*i], pts[2*i+1])
		}
	}
	return true
}

func planRounds(opt SuggestOptions) int {
	switch {
	case opt.Refine < 0:
		return 0
	case opt.Refine == 0:
		return planDefaultRefine
	}
	return opt.Refine
}

// liveIDs returns the ids of the planned devices in the plan.
func (o *planOverlay) liveIDs() []int32 {
	var ids []int32
	for id, c := range o.dev {
		if c >= 0 {
			ids = append(ids, int32(id))
		}
	}
	return ids
}

// planInsert adds a device at the current worst point.
func planInsert(o *planOverlay) (int32, []int32, error) {
	_, w := o.worst()
	x, y, ok := o.inside(w[0], w[1])
	if !ok {
		return -1, nil, fmt.Errorf("no point of the site area found near the worst point (%.6g, %.6g)", w[0], w[1])
	}
	id, near := o.add(x, y)
	return id, near, nil
}

// planRefine moves the listed devices towards the centres of their cells'
// smallest enclosing circles while the full-cover range falls (see the
// file comment for the acceptance rule).
func planRefine(o *planOverlay, ids []int32, rounds int) {
	var perm []int32
	for round := 0; round < rounds; round++ {
		improved := false
		for _, id := range ids {
			if o.dev[id] < 0 {
				continue
			}
			vs := o.devVertices(id)
			if len(vs) == 0 {
				continue
			}
			var cx, cy float64
			cx, cy, _, perm = planSEC(vs, perm)
			px, py := o.pos(id)
			rho := o.devRho(id)
			if math.Hypot(cx-px, cy-py) <= planSECTol*math.Max(rho, planMoveFloor) {
				continue
			}
			qx, qy, ok := o.inside(cx, cy)
			if !ok || (qx == px && qy == py) {
				continue
			}
			r0 := o.fullCover()
			before, after := o.move(id, qx, qy)
			r1 := o.fullCover()
			tol := planRangeTol * r0
			switch {
			case r1 < r0-tol:
				improved = true
			case r1 <= r0+tol && after < before-planRangeTol*before:
			default:
				o.move(id, px, py)
			}
		}
		if !improved {
			return
		}
	}
}

// planReport replays the additions in order from the bare layout and
// collects the figures.
func planReport(o *planOverlay, r float64) *Suggestion {
	pts := o.positions()
	o = o.fresh()
	area := o.l.AreaM2
	frac := func(unc float64) float64 {
		if !(area > 0) {
			return 0
		}
		return math.Max(0, math.Min(1, 1-unc/area))
	}
	s := &Suggestion{Range: r, Existing: len(o.l.Sites), Added: pts, Steps: make([]Step, len(pts))}
	fc, unc := o.fullCover(), o.uncovered()
	s.FullCoverBefore, s.UncoveredBefore, s.CoveredBefore = fc, unc, frac(unc)
	for j, p := range pts {
		st := Step{Added: p, FullCoverBefore: fc, UncoveredBefore: unc, CoveredBefore: frac(unc)}
		o.add(p[0], p[1])
		fc, unc = o.fullCover(), o.uncovered()
		st.FullCoverAfter, st.UncoveredAfter, st.CoveredAfter = fc, unc, frac(unc)
		s.Steps[j] = st
	}
	s.FullCoverAfter, s.UncoveredAfter, s.CoveredAfter = fc, unc, frac(unc)
	s.TotalDevices = s.Existing + len(pts)
	return s
}
