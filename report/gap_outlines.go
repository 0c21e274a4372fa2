// Gap outlines of a gaps layer, converted ahead on the other processors.
//
// Each gap's written outline is its exact outline moved out by the
// rounding reach, converted to output coordinates and checked
// (conservativeInto): about two thirds of the work of a gaps layer, the
// rest being the GeoJSON text. A large gaps layer is often the last file
// of a report to finish, on one core; converting its outlines in batches
// on helper goroutines while the layer's own goroutine writes the features
// in order lets it use the idle core. The features are the same, in the
// same order: each conversion depends only on its gap and the scene.

package report

import (
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// gapBatch is the number of gaps converted by one helper at a time.
const gapBatch = 256

// gapOutlines calls f, in gap order and from the calling goroutine, with
// each gap's written outline (conservativeInto, grown by the rounding
// reach), skipping gaps whose outline vanishes. f must not keep mp. With
// more than one processor and at least 4·gapBatch gaps the outlines are
// converted ahead by GOMAXPROCS helpers, at most two batches per helper
// ahead of f. An error from f stops the helpers and is returned.
func (s *scene) gapOutlines(gaps []coverage.Gap, f func(gi int, mp orb.MultiPolygon) error) error {
	return s.gapOutlinesWith(runtime.GOMAXPROCS(0), gaps, f)
}

// gapOutlinesWith is gapOutlines with the given number of helpers; below
// two, or for few gaps, it converts in the calling goroutine.
func (s *scene) gapOutlinesWith(helpers int, gaps []coverage.Gap, f func(gi int, mp orb.MultiPolygon) error) error {
	if helpers < 2 || len(gaps) < 4*gapBatch {
		var buf polyBuf
		for gi := range gaps {
			if mp := s.conservativeInto(&buf, gaps[gi].Outline, 1); len(mp) > 0 {
				if err := f(gi, mp); err != nil {
					return err
				}
			}
		}
		return nil
	}
	type batch struct {
		mps  []orb.MultiPolygon // nil: the outline vanished
		done chan struct{}
	}
	batches := make([]batch, (len(gaps)+gapBatch-1)/gapBatch)
	for i := range batches {
		batches[i].done = make(chan struct{})
	}
	// A helper takes a slot before the next batch index and f's side
	// frees it after writing that batch: indices are taken in order, so
	// the batch f waits for holds a slot or takes the next one freed.
	slots := make(chan struct{}, 2*helpers)
	quit := make(chan struct{})
	var next atomic.Int64
	var wg sync.WaitGroup
	for range helpers {
		wg.Go(func() {
			var buf polyBuf
			for {
				select {
				case <-quit:
					return
				case slots <- struct{}{}:
				}
				b := int(next.Add(1) - 1)
				if b >= len(batches) {
					<-slots
					return
				}
				lo, hi := b*gapBatch, min(len(gaps), (b+1)*gapBatch)
				mps := make([]orb.MultiPolygon, hi-lo)
				for gi := lo; gi < hi; gi++ {
					if mp := s.conservativeInto(&buf, gaps[gi].Outline, 1); len(mp) > 0 {
						mps[gi-lo] = mp.Clone() // mp lives in buf
					}
				}
				batches[b].mps = mps
				close(batches[b].done)
			}
		})
	}
	defer func() {
		close(quit)
		wg.Wait()
	}()
	for b := range batches {
		<-batches[b].done
		for k, mp := range batches[b].mps {
			if len(mp) == 0 {
				continue
			}
			if err := f(b*gapBatch+k, mp); err != nil {
				return err
			}
		}
		batches[b].mps = nil
		<-slots
	}
	return nil
}
