// The soft memory limit of a run. Go's collector lets the heap grow to
// about twice its live size between collections (GOGC=100); at 10⁶–10⁷
// devices that headroom, not the data, decides the peak resident size.
// Once the number of sites is known, a run sets the runtime's soft limit
// (runtime/debug.SetMemoryLimit) to memLimitPerSite bytes per site, at
// least memLimitFloor, so the collector works harder as the heap nears it.
// Measured on uniform planar layouts: the live heap of an analyze run
// without maps peaks at about 550 B per site at 10⁶ sites, and a limit of
// 1000 MiB gave a peak RSS of 1.04 GB there, a 10 GiB limit 10.5 GB at
// 10⁷, with no measurable CPU cost. The limit is soft: a run that needs
// more (maps, --reach) still gets it, paying with more collections. A
// GOMEMLIMIT set in the environment is left as it is.
//
// Runs of gcLargeSites sites or more also lower the collector's growth
// target (debug.SetGCPercent, GOGC) from 100 to gcPercentLarge: the heap
// lets a collection cost little, since it is mostly flat arrays without
// pointers (at 10⁶ sites a collection's mark phase takes 10–60 ms of
// one core), while a gigabyte of fresh memory costs 1.5–2 CPU-s of page
// zeroing on virtual machines that hand freed memory back to the host
// (the 2-core machine: a new process's first 1 GiB of huge pages took
// 1.2–2.2 s of system time to touch, the same gigabyte touched again
// 0.06 s). Measured there, analyze without maps, interleaved runs, 10⁶
// sites on tmpfs (medians of 6): GOGC 100 5.90 s, 80 5.88 s, 60 5.75 s,
// 40 5.73 s, peak RSS 1040 → 960 MB; 10⁷ sites on disk: GOGC 50 75.5 and
// 71.6 s at 9.5–9.8 GB against 76.9 and 75.2 s at 9.9–10.0 GB. A GOGC set
// in the environment is left as it is.

package main

import (
	"os"
	"runtime/debug"
)

// memLimitPerSite and memLimitFloor set the soft memory limit: bytes per
// site, and the least limit (small runs never reach it).
const (
	memLimitPerSite = 1024
	memLimitFloor   = 1 << 30
)

// gcPercentLarge is the collector's growth target (percent of the live
// heap, as GOGC) of runs on gcLargeSites sites or more; smaller runs keep
// the runtime's default, 100.
const (
	gcPercentLarge = 50
	gcLargeSites   = 100_000
)

// setMemoryLimit sets the soft memory limit and the collector's growth
// target for a run on the given number of sites, unless GOMEMLIMIT or GOGC
// is set, and prepares the heap for huge pages (hugepages_linux.go).
func setMemoryLimit(sites int) {
	limit := memoryLimitFor(sites)
	// Before the limit: with it set, the block adviseHugePages takes and
	// frees puts the heap over the limit, and the runtime may then return
	// memory to the kernel in the allocating goroutine (3 s stalls were
	// seen at 10⁶ sites).
	adviseHugePages(sites, limit)
	if _, set := os.LookupEnv("GOMEMLIMIT"); !set {
		debug.SetMemoryLimit(limit)
	}
	if _, set := os.LookupEnv("GOGC"); !set {
		debug.SetGCPercent(gcPercentFor(sites))
	}
}

// gcPercentFor is the collector's growth target of a run on the given
// number of sites.
func gcPercentFor(sites int) int {
	if sites >= gcLargeSites {
		return gcPercentLarge
	}
	return 100
}

// memoryLimitFor is the soft memory limit of a run on the given number of
// sites.
func memoryLimitFor(sites int) int64 {
	return max(int64(sites)*memLimitPerSite, memLimitFloor)
}
