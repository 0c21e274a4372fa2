// Fault injection for the supervisor's tests: with SITECOVER_FAULT_INJECT
// set in the environment, the (supervised) command crashes on purpose
// before doing anything else, the way a real fault would:
//
//	out-of-memory    the address space is capped 512 MiB above what is in
//	                 use (setrlimit RLIMIT_AS) and memory is allocated until
//	                 the Go runtime fails ("fatal error: out of memory")
//	goroutine-panic  a worker goroutine panics (not recoverable by run)
//
// Ordinary runs never set it.

package main

import (
	"os"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// faultInjectEnv names the fault to inject.
const faultInjectEnv = "SITECOVER_FAULT_INJECT"

// injectFault crashes as named by SITECOVER_FAULT_INJECT; it returns when
// the variable is unset or names no fault.
func injectFault() {
	switch os.Getenv(faultInjectEnv) {
	case "out-of-memory":
		vm := vmSize()
		lim := vm + 512<<20
		syscall.Setrlimit(syscall.RLIMIT_AS, &syscall.Rlimit{Cur: lim, Max: lim})
		var keep [][]byte
		for {
			b := make([]byte, 64<<20)
			for i := 0; i < len(b); i += 4096 {
				b[i] = 1
			}
			keep = append(keep, b)
		}
	case "goroutine-panic":
		go func() { panic("injected fault") }()
		time.Sleep(10 * time.Second)
	}
}

// vmSize returns the process's virtual memory size in bytes
// (/proc/self/status VmSize), or 1 GiB when it cannot be read.
func vmSize() uint64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 1 << 30
	}
	for _, line := range strings.Split(string(b), "\n") {
		if f := strings.Fields(line); len(f) >= 2 && f[0] == "VmSize:" {
			if kb, err := strconv.ParseUint(f[1], 10, 64); err == nil {
				return kb << 10
			}
		}
	}
	return 1 << 30
}
