// Tests of the packed R-tree: SQLite's rtreecheck() finds the structure
// sound, and window queries through the rtree module return exactly the
// features a brute-force scan finds, for trees of one node up to three
// levels.

package gpkg

import (
	"database/sql"
	"fmt"
	"math/rand/v2"
	"path/filepath"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

func TestPackedRtree(t *testing.T) {
	// SQLite's rtree module caps a node at 51 cells (RTREE_MAXCELLS in
	// rtree.c: 4+24*51 = 1228-byte nodes); 30000 boxes need 589 leaves,
	// 12 nodes above them and the root: three levels.
	for _, n := range []int{0, 1, 51, 52, 30000} {
		t.Run(fmt.Sprintf("%d-features", n), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(uint64(n), 7))
			path := filepath.Join(t.TempDir(), "r.gpkg")
			w, err := Create(path, Options{})
			if err != nil {
				t.Fatal(err)
			}
			l, err := w.AddLayer(LayerSpec{Name: "s", Geometry: AnyGeometry, SRS: UndefinedCartesian, SpatialIndex: true})
			if err != nil {
				t.Fatal(err)
			}
			boxes := make([]orb.Bound, 0, n)
			for i := 0; i < n; i++ {
				p := orb.Point{1000 * rng.Float64(), 1000 * rng.Float64()}
				var g orb.Geometry = p
				if i%3 == 0 { // some boxes with area
					g = orb.LineString{p, {p[0] + 5*rng.Float64(), p[1] + 5*rng.Float64()}}
				}
				boxes = append(boxes, g.Bound())
				if err := l.Insert(g); err != nil {
					t.Fatal(err)
				}
				if i%1000 == 999 { // features without geometry are not indexed
					if err := l.Insert(nil); err != nil {
						t.Fatal(err)
					}
					boxes = append(boxes, orb.Bound{Min: orb.Point{1, 1}, Max: orb.Point{0, 0}})
				}
			}
			if err := w.Close(); err != nil {
				t.Fatal(err)
			}
			db, err := sql.Open("sqlite", "file:"+path+"?mode=ro")
			if err != nil {
				t.Fatal(err)
			}
			defer db.Close()
			var check string
			if err := db.QueryRow("SELECT rtreecheck('rtree_s_geom')").Scan(&check); err != nil || check != "ok" {
				t.Fatalf("rtreecheck: %q %v", check, err)
			}
			for q := 0; q < 50; q++ {
				x, y, s := 1000*rng.Float64(), 1000*rng.Float64(), 100*rng.Float64()
				rows, err := db.Query("SELECT id FROM rtree_s_geom WHERE maxx >= ? AND minx <= ? AND maxy >= ? AND miny <= ? ORDER BY id", x, x+s, y, y+s)
				if err != nil {
					t.Fatal(err)
				}
				var got []int64
				for rows.Next() {
					var id int64
					if err := rows.Scan(&id); err != nil {
						t.Fatal(err)
					}
					got = append(got, id)
				}
				rows.Close()
				// Brute force; the float32 boxes are at most one float32
				// step larger, so count only boxes clear of the window's
				// edge by more than that (float32 spacing at 1000 is 6.1e-5).
				const margin = 1e-4
				var sure, maybe []int64
				for i, b := range boxes {
					fid := int64(i + 1)
					if b.Max[0] >= x+margin && b.Min[0] <= x+s-margin && b.Max[1] >= y+margin && b.Min[1] <= y+s-margin {
						sure = append(sure, fid)
					}
					if b.Max[0] >= x-margin && b.Min[0] <= x+s+margin && b.Max[1] >= y-margin && b.Min[1] <= y+s+margin {
						maybe = append(maybe, fid)
					}
				}
				for _, fid := range sure {
					if !slices.Contains(got, fid) {
						t.Fatalf("window %v %v %v: fid %d missing from the R-tree answer", x, y, s, fid)
					}
				}
				for _, fid := range got {
					if !slices.Contains(maybe, fid) {
						t.Fatalf("window %v %v %v: R-tree answers fid %d outside", x, y, s, fid)
					}
				}
			}
		})
	}
}
