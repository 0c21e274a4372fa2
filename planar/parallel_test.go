// Tests of the parallel loop helpers (parallel.go): every index visited
// once; ParallelSortFunc sorts as slices.Sort.

package planar

import (
	"cmp"
	"math/rand/v2"
	"runtime"
	"slices"
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

// TestParallelSortFunc checks ParallelSortFunc against slices.Sort on four
// workers, with distinct values, few values, one value and sorted input.
func TestParallelSortFunc(t *testing.T) {
	prev := runtime.GOMAXPROCS(4)
	defer runtime.GOMAXPROCS(prev)
	cases := []struct {
		name    string
		n, vals int
		presort bool
	}{
		{"short", 100, 1000, false},
		{"distinct", 200_000, 1 << 30, false},
		{"few-values", 200_000, 7, false},
		{"all-equal", 100_000, 1, false},
		{"sorted", 100_000, 1 << 30, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(uint64(tc.n), uint64(tc.vals)))
			s := make([]int, tc.n)
			for i := range s {
				s[i] = r.IntN(tc.vals)
			}
			if tc.presort {
				slices.Sort(s)
			}
			want := slices.Clone(s)
			slices.Sort(want)
			ParallelSortFunc(s, cmp.Compare[int])
			if !slices.Equal(s, want) {
				t.Fatalf("not sorted like slices.Sort")
			}
		})
	}
}
