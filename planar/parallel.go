// Parallel loops over index ranges: the one helper every package uses to
// split a loop over [0, n) across goroutines.
//
// Two schedules, both deterministic in what they hand to f:
//
//   - ParallelFor splits [0, n) into w contiguous ranges of near-equal size,
//     w = min(GOMAXPROCS, n/grain), and runs them at once (the calling
//     goroutine takes the first). For loops whose iterations cost about the
//     same. With w ≤ 1 it calls f(0, n) on the calling goroutine.
//   - ParallelChunks cuts [0, n) into ranges of exactly chunk indices (the
//     last one shorter) numbered 0, 1, …, and hands them out to the workers
//     in order as they become free (dynamic load balancing). The chunk
//     boundaries depend only on n and chunk, so a caller that keeps one
//     result per chunk index and combines them in index order gets the same
//     answer whatever the number of goroutines.
//
// ParallelSortFunc sorts a slice as slices.SortFunc does, partitioning it
// around sampled pivots into up to GOMAXPROCS parts sorted at once.
//
// f must be safe to call concurrently on disjoint ranges. Both return after
// every call of f has returned.

package planar

import (
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
)

// ParallelFor calls f(lo, hi) for contiguous ranges covering [0, n), on up
// to GOMAXPROCS goroutines but never more than n/grain (so each range holds
// at least grain indices); with fewer than 2 such workers it calls f(0, n)
// directly. grain must be positive.
func ParallelFor(n, grain int, f func(lo, hi int)) {
	w := runtime.GOMAXPROCS(0)
	if w > n/grain {
		w = n / grain
	}
	if w <= 1 {
		f(0, n)
		return
	}
	var wg sync.WaitGroup
	for k := 1; k < w; k++ {
		wg.Add(1)
		go func(lo, hi int) {
			defer wg.Done()
			f(lo, hi)
		}(n*k/w, n*(k+1)/w)
	}
	f(0, n/w)
	wg.Wait()
}

// ParallelChunks calls f(ci, lo, hi) for the ranges [ci·chunk,
// min(n, (ci+1)·chunk)), ci = 0, 1, …, on up to workers goroutines (≤ 0
// means GOMAXPROCS; never more than the number of chunks), each taking the
// next chunk as it becomes free. With one worker or one chunk the ranges
// are run in order on the calling goroutine. chunk must be positive.
func ParallelChunks(n, chunk, workers int, f func(ci, lo, hi int)) {
	if n <= 0 {
		return
	}
	nc := (n + chunk - 1) / chunk
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, nc)
	if workers <= 1 {
		for ci := 0; ci < nc; ci++ {
			f(ci, ci*chunk, min(n, (ci+1)*chunk))
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	wg.Add(workers)
	for w := 0; w < workers; w++ {
		go func() {
			defer wg.Done()
			for {
				ci := int(next.Add(1) - 1)
				if ci >= nc {
					return
				}
				f(ci, ci*chunk, min(n, (ci+1)*chunk))
			}
		}()
	}
	wg.Wait()
}

// parallelSortMin is the length below which ParallelSortFunc sorts on the
// calling goroutine: a partition pass and a goroutine cost more than they
// save on shorter slices.
const parallelSortMin = 1 << 14

// parallelSortSamples is the number of evenly spaced elements whose median
// is the pivot of a partition (odd): enough that each side holds about
// half the elements unless many are equal.
const parallelSortSamples = 31

// ParallelSortFunc sorts s in ascending order by cmp, as slices.SortFunc
// (not stable: elements equal under cmp end in an unspecified order). The
// slice is partitioned in place around the median of evenly spaced samples
// and the parts are sorted at once, recursively, on up to GOMAXPROCS
// goroutines; a partition that leaves one side empty (many equal elements)
// is sorted on the calling goroutine.
func ParallelSortFunc[S ~[]E, E any](s S, cmp func(a, b E) int) {
	parallelSort(s, cmp, runtime.GOMAXPROCS(0))
}

// parallelSort sorts s on up to w goroutines.
func parallelSort[S ~[]E, E any](s S, cmp func(a, b E) int, w int) {
	n := len(s)
	if w < 2 || n < parallelSortMin {
		slices.SortFunc(s, cmp)
		return
	}
	var smp [parallelSortSamples]E
	for k := range smp {
		smp[k] = s[(2*k+1)*n/(2*parallelSortSamples)]
	}
	slices.SortFunc(smp[:], cmp)
	p := smp[parallelSortSamples/2]
	// Hoare partition: s[:i] < p <= s[i:].
	i, j := 0, n-1
	for {
		for i <= j && cmp(s[i], p) < 0 {
			i++
		}
		for i <= j && cmp(s[j], p) >= 0 {
			j--
		}
		if i >= j {
			break
		}
		s[i], s[j] = s[j], s[i]
		i++
		j--
	}
	if i == 0 || i == n {
		slices.SortFunc(s, cmp)
		return
	}
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		parallelSort(s[:i], cmp, w/2)
	}()
	parallelSort(s[i:], cmp, w-w/2)
	wg.Wait()
}

// runPair runs f and g, on two goroutines when two CPUs are available.
// They touch disjoint data, so the outcome is the same either way.
func runPair(f, g func()) {
	if runtime.GOMAXPROCS(0) > 1 {
		var wg sync.WaitGroup
		wg.Add(1)
		go func() {
			defer wg.Done()
			g()
		}()
		f()
		wg.Wait()
		return
	}
	f()
	g()
}
