// Fuzz test of ClipCells on small site sets drawn from a half-unit lattice
// (so cocircular, collinear, duplicate and on-boundary sites are common)
// against fixed site areas whose vertices and edges lie on lattice lines,
// hence often exactly on bisectors and Voronoi vertices. The checks are
// the partition identity (clipped areas sum to the area), the structure
// checks of clipCheckCells and the absence of inconsistent boundary orders.

package planar

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// clipFuzzRegions are valid site areas inside [0, 20]².
var clipFuzzRegions = []orb.MultiPolygon{
	// U shape with a square hole.
	{{
		{{0, 0}, {20, 0}, {20, 20}, {12, 20}, {12, 8}, {8, 8}, {8, 20}, {0, 20}},
		{{2, 2}, {2, 6}, {6, 6}, {6, 2}},
	}},
	// Two parts, the second with a hole holding an island.
	{
		{{{0, 0}, {9, 0}, {9, 20}, {0, 20}}, {{2, 2}, {7, 2}, {7, 7}, {2, 7}}},
		{{{11, 0}, {20, 0}, {20, 20}, {11, 20}}, {{13, 5}, {18, 5}, {18, 15}, {13, 15}}},
		{{{14, 8}, {17, 8}, {17, 12}, {14, 12}}},
	},
	// Diamond with a triangular hole.
	{{
		{{10, 0}, {20, 10}, {10, 20}, {0, 10}},
		{{8, 8}, {12, 8}, {10, 12}},
	}},
	// Comb with slanted teeth.
	{{
		{{0, 0}, {20, 0}, {20, 15}, {17, 15}, {16, 4}, {13, 4}, {12, 15}, {9, 15}, {8, 4}, {5, 4}, {4, 15}, {0, 15}},
	}},
}

// clipFuzzPartition checks that no cell area is negative and that the
// areas sum to the region's (the cells partition the plane).
func clipFuzzPartition(t *testing.T, reg *Region, cells *Cells) {
	t.Helper()
	sum := 0.0
	for _, a := range cells.Area {
		if a < -1e-12 {
			t.Errorf("negative cell area %g", a)
		}
		sum += a
	}
	if math.Abs(sum-reg.Area()) > 1e-9*reg.Area() {
		t.Errorf("areas sum to %.15g, region %.15g", sum, reg.Area())
	}
}

func FuzzClipCells(f *testing.F) {
	f.Add([]byte{0, 0, 40, 40}, uint8(0), uint8(0))
	f.Add([]byte{10, 10, 30, 30, 10, 30, 30, 10, 20, 20}, uint8(1), uint8(1))
	f.Add([]byte{1, 1, 3, 3, 5, 5, 7, 7, 9, 9}, uint8(2), uint8(0))
	f.Fuzz(func(t *testing.T, raw []byte, which uint8, shift uint8) {
		if len(raw) > 400 {
			raw = raw[:400]
		}
		// Sites on the half-unit lattice over [-1, 21]²; shift moves them
		// by a quarter unit to leave the lattice's bisectors.
		off := 0.25 * float64(shift%2)
		var pts []orb.Point
		for i := 0; i+1 < len(raw); i += 2 {
			x := float64(raw[i]%45)/2 - 1 + off
			y := float64(raw[i+1]%45)/2 - 1
			pts = append(pts, orb.Point{x, y})
		}
		if len(pts) == 0 {
			return
		}
		reg, err := NewRegion(clipFuzzRegions[int(which)%len(clipFuzzRegions)])
		if err != nil {
			t.Fatal(err)
		}
		tri, err := Triangulate(pts)
		if err != nil {
			t.Fatal(err)
		}
		cells, st, err := clipCells(tri, nil, reg, 1+int(shift/2)%2)
		if err != nil {
			t.Fatal(err)
		}
		if st.anomalies != 0 {
			t.Errorf("%d inconsistent boundary orders", st.anomalies)
		}
		clipFuzzPartition(t, reg, cells)
		clipCheckCells(t, tri, reg, cells)
	})
}

// FuzzClipPowerCells is FuzzClipCells for power cells: each site gets a
// weight from a few squares of half-units (0, 1, 2.25, 4, 6.25), so equal
// and exactly degenerate power configurations (power centres shared by
// four sites, power lines through area vertices, hidden sites) are common.
func FuzzClipPowerCells(f *testing.F) {
	f.Add([]byte{0, 0, 0, 40, 40, 1}, uint8(0), uint8(0))
	f.Add([]byte{10, 10, 2, 30, 30, 3, 10, 30, 0, 30, 10, 1, 20, 20, 4}, uint8(1), uint8(1))
	f.Add([]byte{1, 1, 0, 3, 3, 1, 5, 5, 2, 7, 7, 3, 9, 9, 4}, uint8(2), uint8(0))
	f.Add([]byte{8, 8, 4, 12, 8, 4, 8, 12, 4, 12, 12, 4, 10, 10, 0, 20, 20, 2}, uint8(3), uint8(2))
	f.Fuzz(func(t *testing.T, raw []byte, which uint8, shift uint8) {
		if len(raw) > 600 {
			raw = raw[:600]
		}
		off := 0.25 * float64(shift%2)
		var pts []orb.Point
		var w []float64
		for i := 0; i+2 < len(raw); i += 3 {
			pts = append(pts, orb.Point{float64(raw[i]%45)/2 - 1 + off, float64(raw[i+1]%45)/2 - 1})
			r := float64(raw[i+2]%5) / 2
			w = append(w, r*r)
		}
		if len(pts) == 0 {
			return
		}
		reg, err := NewRegion(clipFuzzRegions[int(which)%len(clipFuzzRegions)])
		if err != nil {
			t.Fatal(err)
		}
		rt, err := TriangulateRegular(pts, w)
		if err != nil {
			t.Fatal(err)
		}
		cells, st, err := clipCells(&rt.Triangulation, rt.Weights, reg, 1+int(shift/2)%2)
		if err != nil {
			t.Fatal(err)
		}
		if st.anomalies != 0 && !anyZeroWidthCell(rt) {
			t.Errorf("%d anomalies", st.anomalies)
		}
		clipFuzzPartition(t, reg, cells)
		clipCheckPowerCells(t, &rt.Triangulation, rt.Weights, reg, cells)
	})
}

// anyZeroWidthCell reports whether some vertex's power cell has zero width:
// two of its power lines coincide with opposite sides (its lift lies
// exactly on the lower hull, and the perturbation keeps it as a vertex).
// Such a cell is empty after clipping, and the clipper may count the
// inconsistent order of its coinciding edges as an anomaly.
func anyZeroWidthCell(rt *RegularTriangulation) bool {
	xy, w := rt.Coords, rt.Weights
	for v := int32(0); int(v) < rt.NumVertices(); v++ {
		nb := rt.Neighbors(v, nil)
		for _, j := range nb {
			for _, k := range nb {
				jx, jy := xy[2*j]-xy[2*v], xy[2*j+1]-xy[2*v+1]
				kx, ky := xy[2*k]-xy[2*v], xy[2*k+1]-xy[2*v+1]
				if j >= k || jx*ky-jy*kx != 0 || jx*kx+jy*ky >= 0 {
					continue
				}
				// Opposite directions: the lines are x·n = h_j/|n_j| and
				// x·(−n) = h_k/|n_k| along the unit n.
				hj := (jx*jx + jy*jy + w[v] - w[j]) / (2 * math.Hypot(jx, jy))
				hk := (kx*kx + ky*ky + w[v] - w[k]) / (2 * math.Hypot(kx, ky))
				if math.Abs(hj+hk) <= 1e-12*(math.Abs(hj)+math.Abs(hk)+1) {
					return true
				}
			}
		}
	}
	return false
}
