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
// f must be safe to call concurrently on disjoint ranges. Both return after
// every call of f has returned.

package planar

import (
	"runtime"
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
