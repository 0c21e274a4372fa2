// Huge pages for large runs (Linux).
//
// At 10⁶–10⁷ sites the analysis reads and writes flat arrays of hundreds
// of megabytes in an order set by the geometry, not by the memory layout,
// so most accesses miss the processor's address-translation cache when
// memory is mapped in 4 KiB pages; on a virtual machine each miss walks
// two page tables. With the kernel's transparent huge pages in their
// common "madvise" mode, only memory advised with madvise(MADV_HUGEPAGE)
// is backed by 2 MiB pages, and the Go runtime does not advise its heap.
//
// A large run therefore (1) asks the runtime, before it reads a large
// input file (its size gives an estimate of the sites, inputSiteBytes) and
// again once the number of sites is known, for the heap it will need (the
// soft memory limit, memlimit.go) in
// one untouched block — fresh memory from the kernel is known to be zero,
// so the runtime maps it without touching a page — advises every large
// private anonymous mapping of the process, then frees the block, so the
// heap the analysis grows into is advised before its first page fault;
// and (2) re-advises new large mappings every hugeAdviseEvery while it
// runs (the runtime maps heap growth with mmap(MAP_FIXED), which starts a
// new, unadvised mapping). The advice changes only how memory is paged:
// no result depends on it, and where the kernel has huge pages off
// ("never") or the call fails, nothing changes. Measured with uniform
// planar sites, analyze without maps, on the 2-core machine: 10⁶ sites
// (medians of 6) 7.62 → 6.53 s wall, user+system CPU 13.3 → 11.3 s;
// 10⁷ sites 82–83 s with the output on disk (without the advice 100 s,
// one run with the output on tmpfs); peak RSS unchanged
// (1.06 GB, 10.1 GB). Advising before the input is read matters on
// virtual machines where a page fault is slow (about 11 µs per 4 KiB page
// on the 2-core machine): reading and parsing 10⁶ sites from CSV took
// about 30 000 small-page faults before. SITECOVER_HUGEPAGES=off turns it
// off.

package main

import (
	"bytes"
	"io"
	"math"
	"os"
	"runtime"
	"runtime/debug"
	"strconv"
	"sync"
	"syscall"
	"time"
)

const (
	// hugeAdviseMinSites: smaller runs keep a heap the address-translation
	// cache covers, and are not advised.
	hugeAdviseMinSites = 100_000
	// hugeAdviseMinBytes: mappings smaller than this are not advised
	// (they cannot hold many 2 MiB pages).
	hugeAdviseMinBytes = 8 << 20
	// hugeAdviseEvery is the period of the re-advice of new mappings.
	hugeAdviseEvery = 20 * time.Millisecond
)

// inputSiteBytes is the fewest bytes per site of an input file, for the
// estimate of the sites before reading: a CSV line of two short numbers
// (planar "x,y" lines of a 100 km square are about 20 bytes).
const inputSiteBytes = 20

var (
	hugeAdviseOnce sync.Once
	// hugeAdvised is the largest block adviseHugePages has advised.
	hugeAdvised int64
)

// adviseHugePagesForFile prepares the heap before the input file at path
// is read, for the sites it may hold (inputSiteBytes each: an estimate
// from above, so the run's own call, once the sites are counted, finds
// the heap advised). A file that is not a regular one of 1 MiB or more,
// or has a NUL byte in its first 4 KiB (binary, refused by the reader at
// once), gets no advice. (Measured at 10⁷ sites: an early block smaller
// than the run's, so that the run took a second one, made the run
// slower, 94.5 and 121 s against 89.6 s geographic, and once raised the
// peak RSS to 11.6 GB.)
func adviseHugePagesForFile(path string) {
	fi, err := os.Stat(path)
	if err != nil || !fi.Mode().IsRegular() || fi.Size() < 1<<20 {
		return
	}
	f, err := os.Open(path)
	if err != nil {
		return
	}
	head := make([]byte, 4096)
	n, _ := io.ReadFull(f, head)
	f.Close()
	if bytes.IndexByte(head[:n], 0) >= 0 {
		return
	}
	sites := fi.Size() / inputSiteBytes
	adviseHugePages(int(sites), memoryLimitFor(int(sites)))
}

// adviseHugePages prepares the heap of a run on the given number of sites
// whose soft memory limit is limit bytes (see the file comment). A block
// is taken only when limit is over 1.5 times the block advised before
// (the heap grows into an advised range; beyond it the periodic advice
// follows).
func adviseHugePages(sites int, limit int64) {
	if sites < hugeAdviseMinSites || os.Getenv("SITECOVER_HUGEPAGES") == "off" {
		return
	}
	if total := memTotal(); total > 0 && limit > total/2 {
		limit = total / 2 // never ask for more than half the machine
	}
	if 2*limit <= 3*hugeAdvised {
		return
	}
	hugeAdvised = limit
	// A soft limit already set (a second input, or runs in one test
	// process) would make the runtime collect and scavenge while taking
	// the block: lift it meanwhile.
	prev := debug.SetMemoryLimit(math.MaxInt64)
	defer debug.SetMemoryLimit(prev)
	block := make([]byte, limit)
	adviseMappings()
	runtime.KeepAlive(block)
	block = nil
	debug.FreeOSMemory() // free the block and return it now: its pages were never touched
	hugeAdviseOnce.Do(func() {
		go func() {
			for {
				time.Sleep(hugeAdviseEvery)
				adviseMappings()
			}
		}()
	})
}

// adviseMappings advises every private, writable, anonymous mapping of at
// least hugeAdviseMinBytes listed in /proc/self/maps.
func adviseMappings() {
	maps, err := os.ReadFile("/proc/self/maps")
	if err != nil {
		return
	}
	for line := range bytes.Lines(maps) {
		// start-end perms offset dev inode [path]: anonymous has no path.
		f := bytes.Fields(line)
		if len(f) != 5 || string(f[1]) != "rw-p" {
			continue
		}
		lo, hi, ok := bytes.Cut(f[0], []byte{'-'})
		if !ok {
			continue
		}
		start, err1 := strconv.ParseUint(string(lo), 16, 64)
		end, err2 := strconv.ParseUint(string(hi), 16, 64)
		if err1 != nil || err2 != nil || end < start+hugeAdviseMinBytes {
			continue
		}
		// Advice only: an error (huge pages unsupported) changes nothing.
		syscall.Syscall(syscall.SYS_MADVISE, uintptr(start), uintptr(end-start), syscall.MADV_HUGEPAGE)
	}
}

// memTotal returns the machine's memory in bytes from /proc/meminfo, or 0.
func memTotal() int64 {
	b, err := os.ReadFile("/proc/meminfo")
	if err != nil {
		return 0
	}
	for line := range bytes.Lines(b) {
		if rest, ok := bytes.CutPrefix(line, []byte("MemTotal:")); ok {
			f := bytes.Fields(rest)
			if len(f) == 2 && string(f[1]) == "kB" {
				kb, err := strconv.ParseInt(string(f[0]), 10, 64)
				if err == nil {
					return kb << 10
				}
			}
		}
	}
	return 0
}
