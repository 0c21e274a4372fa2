// Tests of the parallel loop helpers (parallel.go): every index visited once.

package planar

import (
	"sync"
	"testing"
)

// TestParallelCovers checks that both schedules visit every index exactly
// once and that ParallelChunks numbers its chunks by position.
func TestParallelCovers(t *testing.T) {
	for _, tc := range []struct {
		name         string
		n, grain, wk int
	}{
		{"empty", 0, 1, 0},
		{"one", 1, 1, 0},
		{"below-grain", 100, 1000, 0},
		{"many", 100003, 7, 0},
		{"one-worker", 5000, 16, 1},
		{"more-workers-than-chunks", 10, 4, 64},
	} {
		t.Run(tc.name, func(t *testing.T) {
			seen := make([]int32, tc.n)
			var mu sync.Mutex
			ParallelFor(tc.n, tc.grain, func(lo, hi int) {
				for i := lo; i < hi; i++ {
					mu.Lock()
					seen[i]++
					mu.Unlock()
				}
			})
			ParallelChunks(tc.n, tc.grain, tc.wk, func(ci, lo, hi int) {
				if lo != ci*tc.grain || hi != min(tc.n, lo+tc.grain) {
					t.Errorf("chunk %d is [%d, %d)", ci, lo, hi)
				}
				for i := lo; i < hi; i++ {
					mu.Lock()
					seen[i]++
					mu.Unlock()
				}
			})
			for i, k := range seen {
				if k != 2 {
					t.Fatalf("index %d visited %d times, want 2", i, k)
				}
			}
		})
	}
}
