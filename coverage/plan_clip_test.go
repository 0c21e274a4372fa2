// Tests of the candidate-vertex test of clipped cell pieces (plan_clip.go)
// under the module's closed boundary convention. Expected values are
// elementary geometry worked out in the comments.

package coverage

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// A U-shaped base cell, 0..8 × 0..6 with the notch 2..4 × 2..6 open at the
// top, clipped to y ≥ 4 and then x ≥ 2. The first clip leaves the two arm
// tops joined by a bridge along y = 4; the second crosses that bridge at
// the candidate (2, 4), which lies on the cell's boundary (the notch's left
// wall x = 2). The true piece is closed: U ∩ {y ≥ 4} ∩ {x ≥ 2} is the
// rectangle 4..8 × 4..6 plus the segment x = 2, 4 ≤ y ≤ 6 (the left arm's
// inner side), so (2, 4) is a point of it and must be accepted. The former
// half-open crossing rule counted the notch's left wall as outside (two
// crossings of the ray towards +x) and rejected it; the right wall would
// have been inside, so the old answer depended on which side of a notch a
// vertex lay. Every call site tests candidates the same way.
func TestPlanCandidateOnCellBoundary(t *testing.T) {
	u := []orb.Point{{0, 0}, {8, 0}, {8, 6}, {4, 6}, {4, 2}, {2, 2}, {2, 6}, {0, 6}}
	l := cvLayout(t, []orb.Point{{6, 1}}, cvRegion(t, [][]orb.Point{u}))
	var cell, a, piece planar.ClipRings
	rs := planCellRings(l.Cells, 0)
	for k := 0; k < rs.NumRings(); k++ {
		cell.AppendRing(rs.Ring(k), 0)
	}
	if planCellConvex(&cell.RingSet) {
		t.Fatal("the U cell was taken as convex")
	}
	planar.HalfPlane{NY: -1, H: -4}.ClipSet(&cell, &a)
	planar.HalfPlane{NX: -1, H: -2}.ClipSet(&a, &piece)
	found := false
	for i, f := range piece.Prov {
		if f&planar.ProvCandidate != 0 && piece.XY[2*i] == 2 && piece.XY[2*i+1] == 4 {
			found = true
		}
	}
	if !found {
		t.Fatalf("no candidate at (2, 4); rings %v, provenance %v", piece.XY, piece.Prov)
	}
	// The true piece's points: in the closed U, y ≥ 4 and x ≥ 2.
	onPiece := func(x, y float64) bool {
		return planar.PointInRing(planar.FlatRing(orb.Ring(u)), x, y) >= 0 && y >= 4 && x >= 2
	}
	o := newPlanOverlay(l, 1)
	calls := []struct {
		name  string
		valid func(label int32, x, y float64) bool
	}{
		// SuggestAdditions, FewestAdditions, ChooseCandidates: the overlay.
		{"overlay", o.valid},
		// Failures: the closure over the failed device's cell copy.
		{"failures", func(_ int32, x, y float64) bool { return planCellHolds(&cell.RingSet, x, y) }},
	}
	for _, c := range calls {
		t.Run(c.name, func(t *testing.T) {
			if !c.valid(0, 2, 4) {
				t.Error("candidate (2, 4) on the cell boundary rejected")
			}
			if c.valid(0, 3, 4) {
				t.Error("(3, 4), inside the notch, accepted")
			}
			// Every accepted vertex is a point of the piece, and every
			// output vertex that is a point of the piece is accepted.
			kept := planPieceVertices(&piece, c.valid, nil)
			n := 0
			for i := 0; i+1 < len(piece.XY); i += 2 {
				if onPiece(piece.XY[i], piece.XY[i+1]) {
					n++
				}
			}
			if len(kept)/2 != n {
				t.Errorf("%d vertices accepted, %d of the output vertices are points of the piece", len(kept)/2, n)
			}
			for i := 0; i+1 < len(kept); i += 2 {
				if !onPiece(kept[i], kept[i+1]) {
					t.Errorf("accepted (%g, %g), not a point of the piece", kept[i], kept[i+1])
				}
			}
			// The farthest point from (8, 6) is (2, 4) at √40 (the
			// candidate and the kept crossing coincide there).
			_, _, far, fx, fy := planMeasures(&piece, 8, 6, 0, c.valid)
			if far != math.Sqrt(40) || fx != 2 || fy != 4 {
				t.Errorf("farthest point (%g, %g) at %g, want (2, 4) at √40", fx, fy, far)
			}
		})
	}
}
