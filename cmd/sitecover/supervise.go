// The supervisor: a crash is one line and exit 3, never a goroutine dump.
//
// A Go program cannot recover from running out of memory or from a panic on
// a worker goroutine: the runtime prints a trace of every goroutine and
// exits with status 2. So the command runs its work in a child process
// (itself, with supervisedEnv set) and watches the child's stderr: lines
// the child writes are passed through as they come, until a line starts
// like the runtime's crash output ("fatal error: ", "panic: ", "runtime: ",
// …). From there the trace is held back, and when the child has ended the
// supervisor prints one line naming the fault and exits 3. With
// SITECOVER_DEBUG set the trace is passed through too.
//
// The child dies with the supervisor (Linux parent-death signal), and an
// interrupt or termination sent to the supervisor alone is passed on to the
// child, so Ctrl-C and kill behave as for one process. A child killed by
// SIGKILL that the supervisor did not send (the kernel's out-of-memory
// killer) is reported as out of memory, exit 3.

package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
	"os/signal"
	"strings"
	"syscall"
)

// supervisedEnv marks the child process; supervisedTerminalEnv tells it
// that the supervisor's stderr is a terminal (its own is a pipe).
const (
	supervisedEnv         = "SITECOVER_SUPERVISED"
	supervisedTerminalEnv = "SITECOVER_STDERR_TERMINAL"
)

// crashMarkers start the lines of the Go runtime's crash output.
var crashMarkers = []string{"fatal error: ", "panic: ", "runtime: ", "goroutine ", "SIGSEGV", "SIGBUS", "unexpected fault address", "[signal "}

// supervise runs the command in a child process and returns the exit code
// to use; ok is false when no child could be started (run in-process then).
func supervise(args []string) (code int, ok bool) {
	exe, err := os.Executable()
	if err != nil {
		return 0, false
	}
	cmd := exec.Command(exe, args...)
	cmd.Env = append(os.Environ(), supervisedEnv+"=1")
	if isTerminal(os.Stderr) {
		cmd.Env = append(cmd.Env, supervisedTerminalEnv+"=1")
	}
	cmd.Stdin, cmd.Stdout = os.Stdin, os.Stdout
	filter := &crashFilter{w: os.Stderr, passTrace: os.Getenv("SITECOVER_DEBUG") != ""}
	cmd.Stderr = filter
	cmd.SysProcAttr = childProcAttr()
	sig := make(chan os.Signal, 1)
	signal.Notify(sig, os.Interrupt, syscall.SIGTERM)
	defer signal.Stop(sig)
	if err := cmd.Start(); err != nil {
		return 0, false
	}
	sent := false
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	for {
		select {
		case s := <-sig:
			sent = true
			cmd.Process.Signal(s)
			continue
		case err = <-done:
		}
		break
	}
	return childExit(cmd.ProcessState, filter, sent, os.Stderr), true
}

// childExit turns the child's end into the supervisor's exit code, printing
// the one line for a crash.
func childExit(ps *os.ProcessState, f *crashFilter, sent bool, stderr io.Writer) int {
	if f.crashed {
		fmt.Fprintln(stderr, crashLine(f.first))
		return exitInternal
	}
	if ps == nil {
		return exitInternal
	}
	if st, ok := ps.Sys().(syscall.WaitStatus); ok && st.Signaled() {
		if st.Signal() == syscall.SIGKILL && !sent {
			fmt.Fprintln(stderr, "sitecover: the run was killed by the system, most likely for lack of memory (no output folder was changed unless it was complete)")
			return exitInternal
		}
		return 128 + int(st.Signal())
	}
	return ps.ExitCode()
}

// crashLine is the one line printed for a crash whose output began with
// first.
func crashLine(first string) string {
	if strings.Contains(first, "out of memory") {
		return "sitecover: out of memory: this input needs more memory than the machine could give (see DEVELOPERS.md for memory per site); no output folder was changed"
	}
	return fmt.Sprintf("sitecover: internal error: %s (this is a bug; please report it with the command line; SITECOVER_DEBUG=1 shows the trace)", strings.TrimSpace(first))
}

// crashFilter passes the child's stderr through until the runtime's crash
// output starts, then holds the rest back (or passes it on with
// passTrace). It is used by one goroutine (exec's copier).
type crashFilter struct {
	w         io.Writer
	passTrace bool
	midLine   bool   // the bytes so far on this line were passed on
	partial   []byte // the start of a line that may still become a marker
	crashed   bool
	first     string // the first line of the crash output
	firstOpen bool   // first has not reached its newline yet
}

// Write implements io.Writer.
func (f *crashFilter) Write(p []byte) (int, error) {
	n := len(p)
	for len(p) > 0 {
		if f.crashed {
			if f.firstOpen { // the first crash line goes on
				j := bytes.IndexByte(p, '\n')
				if j < 0 {
					j = len(p)
				} else {
					f.firstOpen = false
				}
				f.first += string(p[:j])
			}
			if f.passTrace {
				f.w.Write(p)
			}
			return n, nil
		}
		i := bytes.IndexByte(p, '\n')
		chunk := p
		if i >= 0 {
			chunk = p[:i+1]
		}
		p = p[len(chunk):]
		if f.midLine {
			f.w.Write(chunk)
		} else {
			f.partial = append(f.partial, chunk...)
			switch f.classify() {
			case lineCrash:
				f.crashed, f.first = true, strings.TrimRight(string(f.partial), "\n")
				f.firstOpen = !bytes.HasSuffix(f.partial, []byte("\n"))
				if f.passTrace {
					f.w.Write(f.partial)
				}
				f.partial = nil
				continue
			case lineOrdinary:
				f.w.Write(f.partial)
				f.partial = f.partial[:0]
				f.midLine = true
			case lineUndecided:
				continue
			}
		}
		if i >= 0 {
			f.midLine = false
		}
	}
	return n, nil
}

// Line classes for crashFilter.classify.
const (
	lineUndecided = iota
	lineOrdinary
	lineCrash
)

// classify decides whether the held line start is crash output.
func (f *crashFilter) classify() int {
	s := string(f.partial)
	undecided := false
	for _, m := range crashMarkers {
		if strings.HasPrefix(s, m) {
			return lineCrash
		}
		if strings.HasPrefix(m, s) && !strings.HasSuffix(s, "\n") {
			undecided = true
		}
	}
	if undecided {
		return lineUndecided
	}
	return lineOrdinary
}
