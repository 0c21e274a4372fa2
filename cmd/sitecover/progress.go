// A progress line on stderr for long runs.
//
// Nothing is shown for the first 2 s, nor ever when stderr is not a
// terminal (a pipe, a file, a test buffer), so scripted use sees only the
// results. After 2 s the current phase and the elapsed time are redrawn in
// place about four times a second, and the line is erased when the run
// ends.

package main

import (
	"fmt"
	"io"
	"sync"
	"time"
)

// progressDelay is how long a run goes before progress is shown.
const progressDelay = 2 * time.Second

// progress shows the current phase of a run.
type progress struct {
	w     io.Writer
	start time.Time
	mu    sync.Mutex
	phase string
	shown bool
	stop  chan struct{}
	done  chan struct{}
}

// startProgress starts a progress line on w when enabled (a terminal).
// The returned value is never nil; its methods do nothing when disabled.
func startProgress(w io.Writer, enabled bool) *progress {
	return startProgressAfter(w, enabled, progressDelay, 250*time.Millisecond)
}

// startProgressAfter is startProgress with the delay and redraw period
// given (for tests).
func startProgressAfter(w io.Writer, enabled bool, delay, period time.Duration) *progress {
	p := &progress{w: w, start: time.Now()}
	if !enabled {
		return p
	}
	p.stop, p.done = make(chan struct{}), make(chan struct{})
	go p.loop(delay, period)
	return p
}

func (p *progress) loop(delay, period time.Duration) {
	defer close(p.done)
	timer := time.NewTimer(delay)
	defer timer.Stop()
	select {
	case <-p.stop:
		return
	case <-timer.C:
	}
	tick := time.NewTicker(period)
	defer tick.Stop()
	for {
		p.draw()
		select {
		case <-p.stop:
			return
		case <-tick.C:
		}
	}
}

func (p *progress) draw() {
	p.mu.Lock()
	defer p.mu.Unlock()
	fmt.Fprintf(p.w, "\r\x1b[Ksitecover: %s ... %.1f s", p.phase, time.Since(p.start).Seconds())
	p.shown = true
}

// set names the phase now running.
func (p *progress) set(phase string) {
	if p.stop == nil {
		return
	}
	p.mu.Lock()
	p.phase = phase
	p.mu.Unlock()
}

// end stops the line and erases it.
func (p *progress) end() {
	if p.stop == nil {
		return
	}
	close(p.stop)
	<-p.done
	p.stop = nil
	if p.shown {
		fmt.Fprint(p.w, "\r\x1b[K")
	}
}
