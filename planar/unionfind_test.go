// Tests of the union-find (unionfind.go) on a small graph, both linking rules.

package planar

import "testing"

// TestUnionFind checks both linking rules against the components of a
// small graph, and that UnionMin keeps the smallest node as the root.
func TestUnionFind(t *testing.T) {
	edges := [][2]int32{{5, 3}, {3, 9}, {1, 2}, {9, 0}, {7, 7}, {2, 8}}
	want := []int32{0, 1, 1, 0, 4, 0, 6, 7, 1, 0} // smallest node of each set
	for _, tc := range []struct {
		name string
		min  bool
	}{{"by-rank", false}, {"smallest-root", true}} {
		t.Run(tc.name, func(t *testing.T) {
			u := NewUnionFind(len(want))
			joined := 0
			for _, e := range edges {
				var ok bool
				if tc.min {
					ok = u.UnionMin(e[0], e[1])
				} else {
					ok = u.Union(e[0], e[1])
				}
				if ok {
					joined++
				}
			}
			if joined != 5 {
				t.Errorf("%d unions joined two sets, want 5", joined)
			}
			root := u.Flatten()
			for a := range want {
				for b := range want {
					if (root[a] == root[b]) != (want[a] == want[b]) {
						t.Fatalf("nodes %d and %d: same set %v, want %v", a, b, root[a] == root[b], want[a] == want[b])
					}
				}
				if tc.min && root[a] != want[a] {
					t.Errorf("root of %d = %d, want %d", a, root[a], want[a])
				}
			}
		})
	}
}
