// The run harness: panics become one "internal error" line and exit 3;
// the progress line appears only after its delay and only on a terminal,
// and is erased at the end.

package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// panicWriter panics on every write, to drive a panic through run.
type panicWriter struct{}

func (panicWriter) Write([]byte) (int, error) { panic("writer exploded") }

func TestPanicBecomesInternalError(t *testing.T) {
	var stderr bytes.Buffer
	code := run([]string{"--version"}, panicWriter{}, &stderr)
	if code != exitInternal {
		t.Errorf("exit %d, want %d", code, exitInternal)
	}
	if got := stderr.String(); !strings.HasPrefix(got, "sitecover: internal error: writer exploded") ||
		strings.Count(got, "\n") != 1 || strings.Contains(got, "goroutine") {
		t.Errorf("stderr %q", got)
	}
}

// syncBuffer is a bytes.Buffer safe for the progress goroutine.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

func TestProgress(t *testing.T) {
	var w syncBuffer
	p := startProgressAfter(&w, true, 20*time.Millisecond, 5*time.Millisecond)
	p.set("analysing 7 sites")
	time.Sleep(80 * time.Millisecond)
	p.end()
	got := w.String()
	if !strings.Contains(got, "\r\x1b[Ksitecover: analysing 7 sites ... ") || !strings.HasSuffix(got, "\r\x1b[K") {
		t.Errorf("progress output %q", got)
	}
	// A short run shows nothing.
	var quiet syncBuffer
	p = startProgressAfter(&quiet, true, time.Hour, time.Millisecond)
	p.set("x")
	p.end()
	if quiet.String() != "" {
		t.Errorf("short run printed %q", quiet.String())
	}
	// Disabled (not a terminal): nothing, and the methods are safe.
	p = startProgress(&quiet, false)
	p.set("x")
	p.end()
	if quiet.String() != "" {
		t.Errorf("disabled progress printed %q", quiet.String())
	}
}

func TestIsTerminal(t *testing.T) {
	f, err := os.Create(filepath.Join(t.TempDir(), "log"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if isTerminal(f) || isTerminal(&bytes.Buffer{}) {
		t.Error("a file or a buffer is not a terminal")
	}
	if tty, err := os.OpenFile("/dev/tty", os.O_WRONLY, 0); err == nil {
		defer tty.Close()
		if !isTerminal(tty) {
			t.Error("/dev/tty is a terminal")
		}
	}
}
