// Reading the records of a large CSV file in parallel parts.
//
// Without any quote character a CSV record ends at each newline, so the
// body can be cut at newlines into one part per processor and each part
// read on its own (csvRowReader.read, with the line numbers of the file).
// The parts are joined in file order, giving the same site set as one
// sequential read. A body with a quote character anywhere (a quoted field
// may hold a newline), or smaller than parallelCSVBytes, is read
// sequentially, as is one where any part fails: the error is then the
// sequential read's, the first bad line of the file.

package siteinput

import (
	"bytes"
	"runtime"
	"sync"

	"github.com/paulmach/orb"
)

// parallelCSVBytes is the smallest CSV body read in parallel parts: below
// it the parts' start-up and joining are not worth it.
const parallelCSVBytes = 1 << 20

// readParallel reads body (whose first line is line line0+1 of the file)
// in parallel parts and joins them; ok is false when the body is not
// split (see the file comment) or a part fails, and the caller reads it
// sequentially.
func (rr *csvRowReader) readParallel(body []byte, line0 int) (s *siteSet, weights []float64, ok bool) {
	procs := runtime.GOMAXPROCS(0)
	if procs < 2 || len(body) < parallelCSVBytes || bytes.IndexByte(body, '"') >= 0 {
		return nil, nil, false
	}
	parts := csvParts(body, procs)
	sets := make([]*siteSet, len(parts))
	ws := make([][]float64, len(parts))
	failed := make([]bool, len(parts))
	var wg sync.WaitGroup
	first := line0 // the line before part i
	for i, part := range parts {
		lines, before := bytes.Count(part, []byte{'\n'}), first
		wg.Go(func() {
			sets[i] = rr.newSet(lines + 1)
			failed[i] = rr.read(part, before, sets[i], &ws[i]) != nil
		})
		first += lines
	}
	wg.Wait()
	for _, f := range failed {
		if f {
			return nil, nil, false
		}
	}
	s, weights = joinCSVParts(sets, ws)
	return s, weights, true
}

// csvParts cuts body after newlines into at most k parts of about equal
// size (fewer when lines are long).
func csvParts(body []byte, k int) [][]byte {
	var parts [][]byte
	start := 0
	for i := 1; i < k; i++ {
		at := max(start, i*len(body)/k-1) // a newline just before i/k ends the part
		nl := bytes.IndexByte(body[at:], '\n')
		if nl < 0 {
			break
		}
		end := at + nl + 1
		parts = append(parts, body[start:end])
		start = end
	}
	return append(parts, body[start:])
}

// joinCSVParts concatenates the site sets (and weights) read from
// consecutive parts of one file.
func joinCSVParts(sets []*siteSet, ws [][]float64) (*siteSet, []float64) {
	n, nw := 0, 0
	for i, p := range sets {
		n += len(p.Pts)
		nw += len(ws[i])
	}
	s := &siteSet{Lines: true,
		Pts: make([]orb.Point, 0, n), Names: make([]string, 0, n), Src: make([]int32, 0, n)}
	if sets[0].Ranges != nil { // every part has the file's columns
		s.Ranges = make([]string, 0, n)
	}
	if sets[0].Types != nil {
		s.Types = make([]string, 0, n)
	}
	var weights []float64
	if nw > 0 {
		weights = make([]float64, 0, nw)
	}
	for i, p := range sets {
		s.Pts = append(s.Pts, p.Pts...)
		s.Names = append(s.Names, p.Names...)
		s.Src = append(s.Src, p.Src...)
		s.Ranges = append(s.Ranges, p.Ranges...)
		s.Types = append(s.Types, p.Types...)
		weights = append(weights, ws[i]...)
		s.attrs.join(&p.attrs)
	}
	s.tagged = len(s.Pts)
	return s, weights
}
