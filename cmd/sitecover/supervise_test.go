package main

import (
	"os"
	"os/exec"
	"runtime"
	"strings"
	"testing"
)

func TestCrashFilter(t *testing.T) {
	cases := []struct {
		name    string
		writes  []string
		pass    string
		crashed bool
		first   string
	}{
		{"ordinary lines", []string{"sitecover: warning: a\n", "sitecover: b\n"}, "sitecover: warning: a\nsitecover: b\n", false, ""},
		{"progress line without newline", []string{"\r\x1b[Ksitecover: reading ... 2.0 s"}, "\r\x1b[Ksitecover: reading ... 2.0 s", false, ""},
		{"out of memory", []string{"sitecover: warning: x\n", "fatal error: runtime: out of memory\n\nruntime stack:\nruntime.throw(...)\n"}, "sitecover: warning: x\n", true, "fatal error: runtime: out of memory"},
		{"panic split across writes", []string{"pan", "ic: boom\n\ngoroutine 7 [running]:\nmain.f()\n"}, "", true, "panic: boom"},
		{"first crash line split after the marker", []string{"panic: ", "injected", " fault\n", "goroutine 1 [running]:\n"}, "", true, "panic: injected fault"},
		{"marker-like start that is not one", []string{"run", "ning fine\n"}, "running fine\n", false, ""},
		{"marker word inside a line", []string{"sitecover: no panic: here\n"}, "sitecover: no panic: here\n", false, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var out strings.Builder
			f := &crashFilter{w: &out}
			for _, w := range c.writes {
				f.Write([]byte(w))
			}
			if out.String() != c.pass || f.crashed != c.crashed || f.first != c.first {
				t.Errorf("passed %q crashed %v first %q; want %q %v %q", out.String(), f.crashed, f.first, c.pass, c.crashed, c.first)
			}
		})
	}
	if !strings.Contains(crashLine("fatal error: runtime: out of memory"), "out of memory") {
		t.Error("out-of-memory line does not say so")
	}
}

// Faults injected into the real binary (SITECOVER_FAULT_INJECT, see
// faultinject_linux.go): running out of memory (a real Go runtime failure
// under a capped address space) and a panic on a worker goroutine each end
// with one line on stderr and exit 3, without the runtime's trace.
func TestCrashIsOneLine(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	if runtime.GOOS != "linux" {
		t.Skip("fault injection is implemented on Linux")
	}
	bin := buildBinary(t)
	for _, c := range []struct{ fault, want string }{
		{"out-of-memory", "sitecover: out of memory"},
		{"goroutine-panic", "sitecover: internal error: panic: injected fault"},
	} {
		t.Run(c.fault, func(t *testing.T) {
			cmd := exec.Command(bin, "--version")
			cmd.Env = append(os.Environ(), faultInjectEnv+"="+c.fault)
			var stderr strings.Builder
			cmd.Stderr = &stderr
			code := exitCodeOf(t, cmd.Run())
			msg := stderr.String()
			if code != exitInternal || strings.Count(msg, "\n") != 1 || !strings.HasPrefix(msg, c.want) || strings.Contains(msg, "goroutine") {
				t.Fatalf("exit %d, stderr %q; want exit 3 and one line starting %q", code, msg, c.want)
			}
		})
	}
}
