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

// setMemoryLimit sets the soft memory limit for a run on the given number
// of sites, unless GOMEMLIMIT is set, and prepares the heap for huge pages
// (hugepages_linux.go).
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
}

// memoryLimitFor is the soft memory limit of a run on the given number of
// sites.
func memoryLimitFor(sites int) int64 {
	return max(int64(sites)*memLimitPerSite, memLimitFloor)
}
