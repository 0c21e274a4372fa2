// Tests of the bucket grids (bucketgrid.go): bucket arithmetic on small
// boxes worked out by hand, and the neighbourhood queries against brute
// force.

package planar

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestGridOfCells(t *testing.T) {
	cases := []struct {
		name                   string
		minX, minY, maxX, maxY float64
		cells                  int
		nx, ny                 int
	}{
		// √(8·4/2) = 4 columns, 8/4 = 2 rows.
		{"wide box", 0, 0, 4, 2, 8, 4, 2},
		{"square box", 0, 0, 1, 1, 9, 3, 3},
		{"flat box", 0, 0, 5, 0, 10, 10, 1},
		{"tall line", 0, 0, 0, 5, 10, 1, 10},
		{"single point", 3, 3, 3, 3, 10, 1, 1},
		{"no cells", 0, 0, 1, 1, 0, 1, 1},
		{"infinite box", -math.MaxFloat64, 0, math.MaxFloat64, 1, 4, 1, 4},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			g := GridOfCells(c.minX, c.minY, c.maxX, c.maxY, c.cells)
			if g.NX != c.nx || g.NY != c.ny {
				t.Fatalf("%d × %d buckets, want %d × %d", g.NX, g.NY, c.nx, c.ny)
			}
			// Corners and far points land in the border buckets.
			if g.Cell(c.minX, c.minY) != 0 || g.Cell(c.maxX, c.maxY) != g.NumCells()-1 {
				t.Errorf("corners in buckets %d and %d", g.Cell(c.minX, c.minY), g.Cell(c.maxX, c.maxY))
			}
			if g.Cell(math.Inf(-1), math.NaN()) != 0 || g.Cell(math.Inf(1), math.Inf(1)) != g.NumCells()-1 {
				t.Error("points outside the box are not clamped")
			}
		})
	}
}

func TestBucketGridNear(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	xy := make([]float64, 2*500)
	for i := range xy {
		xy[i] = 100 * rng.Float64()
	}
	var ids []int32
	for v := int32(0); v < 500; v += 2 {
		ids = append(ids, v)
	}
	cases := []struct {
		name string
		g    *BucketGrid
		ids  []int32
	}{
		{"all points, by count", NewBucketGrid(GridOfCells(0, 0, 100, 100, 250), xy, nil), nil},
		{"even points, by side", NewBucketGrid(GridOfSide(0, 0, 100, 100, 7), xy, ids), ids},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			// Items in each bucket keep the given order.
			for k := 0; k < c.g.NumCells(); k++ {
				if !slices.IsSorted(c.g.Bucket(k)) {
					t.Fatalf("bucket %d out of order: %v", k, c.g.Bucket(k))
				}
			}
			for q := 0; q < 50; q++ {
				x, y, r := 120*rng.Float64()-10, 120*rng.Float64()-10, 15*rng.Float64()
				var got []int32
				c.g.Near(x, y, r, func(v int32) { got = append(got, v) })
				for v := int32(0); v < 500; v++ {
					listed := c.ids == nil || slices.Contains(c.ids, v)
					if listed && math.Abs(xy[2*v]-x) <= r && math.Abs(xy[2*v+1]-y) <= r && !slices.Contains(got, v) {
						t.Fatalf("query (%g, %g, %g) misses point %d", x, y, r, v)
					}
					if !listed && slices.Contains(got, v) {
						t.Fatalf("query lists point %d, not bucketed", v)
					}
				}
			}
		})
	}
}

func TestHashGrid(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	g := NewHashGrid(1e4)
	pos := map[int32][2]float64{}
	for id := int32(0); id < 300; id++ {
		p := [2]float64{200*rng.Float64() - 50, 200*rng.Float64() - 50}
		pos[id] = p
		g.Insert(id, p[0], p[1])
	}
	for id := int32(0); id < 300; id += 3 {
		g.Remove(id, pos[id][0], pos[id][1])
		delete(pos, id)
	}
	if g.Len() != len(pos) || !g.NeedsRebuild() {
		t.Fatalf("Len %d, want %d; 200 points on a grid sized for 16 should need a rebuild", g.Len(), len(pos))
	}
	for q := 0; q < 50; q++ {
		x, y, r := 200*rng.Float64()-50, 200*rng.Float64()-50, 30*rng.Float64()
		got := g.Within(x, y, r, nil)
		if !slices.IsSorted(got) {
			t.Fatal("Within is not sorted")
		}
		// Nearest-first rings: every point found at ring k is farther than
		// (k − 1)·side; together the rings list every point.
		var rings []int32
		for k := int64(0); ; k++ {
			more := g.Ring(x, y, k, func(id int32) {
				p := pos[id]
				if k >= 1 && math.Hypot(p[0]-x, p[1]-y) <= float64(k-1)*g.Side() {
					t.Errorf("point %d in ring %d is within (k − 1)·side", id, k)
				}
				rings = append(rings, id)
			})
			if !more {
				break
			}
		}
		if len(rings) != len(pos) {
			t.Fatalf("rings list %d points, want %d", len(rings), len(pos))
		}
		for id, p := range pos {
			if math.Hypot(p[0]-x, p[1]-y) <= r && !slices.Contains(got, id) {
				t.Fatalf("Within(%g, %g, %g) misses point %d", x, y, r, id)
			}
		}
	}
}
