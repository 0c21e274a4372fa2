// Writing one report: the files are produced in parallel, each streamed
// (written, hashed and synced) into the staging folder of the report's
// output set (stream.go), and the set is swapped into the output folder
// when every file is there (outset.go). Before anything is produced the
// writer checks that no output path names an input file (by cleaned
// absolute path, and by device/inode when both exist, which also catches
// hard links and symbolic links).

package report

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/paulmach/orb"
)

// writer writes the files of one report into a staging folder and swaps
// it in (see outset.go).
type writer struct {
	set      *outputSet
	meta     Meta
	progress func(string)
	done     []string
}

// newWriter prepares dir for the given file names: it checks the folder
// (CheckOutputFolder: never an input overwritten, never a user's own
// folder), creates and locks it, and opens the staging folder.
func newWriter(dir string, names []string, m Meta, progress func(string)) (*writer, error) {
	set, err := openOutputSet(dir, names, m)
	if err != nil {
		return nil, err
	}
	return &writer{set: set, meta: m, progress: progress}, nil
}

// samePath reports whether a and b name the same file.
func samePath(a, b string) bool {
	aa, err1 := filepath.Abs(a)
	bb, err2 := filepath.Abs(b)
	if err1 == nil && err2 == nil && aa == bb {
		return true
	}
	fa, err1 := os.Stat(a)
	fb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && os.SameFile(fa, fb)
}

// unwrapPath drops the path from a *PathError (the caller names it).
func unwrapPath(err error) error {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err
	}
	return err
}

// step is one output file: a plain file written by write, a GeoJSON layer
// (layer; its features also go into the GeoPackage), or, with gpkg set,
// the GeoPackage itself, which the layer steps fill.
type step struct {
	name  string
	write func(io.Writer) error
	layer *layerDef
	gpkg  bool
	// running, when set, is the step already being produced by start;
	// writeAll only collects its result.
	running *running
}

// running is a step producing in the background (start): done is closed
// when it has finished, with its manifest entry or error.
type running struct {
	done  chan struct{}
	entry ManifestEntry
	err   error
}

// start begins producing the GeoJSON layer step st (no GeoPackage) of
// scene s in a goroutine of its own, and returns st to pass to writeAll
// in its place. The layer stops at its next feature, failing, once stop
// is set (AnalysisWriter.Abort).
func (w *writer) start(s *scene, st step, stop *atomic.Bool) step {
	r := &running{done: make(chan struct{})}
	def := *st.layer
	each := def.each
	def.each = func(emit emitFunc) error {
		return each(func(g orb.Geometry, vals ...value) error {
			if stop.Load() {
				return errAborted
			}
			return emit(g, vals...)
		})
	}
	go func() {
		defer close(r.done)
		n, sum, err := storeStream(w.set.path(st.name), func(out io.Writer) error { return s.writeLayer(out, &def, nil) })
		if err != nil {
			r.err = fmt.Errorf("%s: %v", w.set.finalPath(st.name), err)
			return
		}
		r.entry = ManifestEntry{Path: st.name, Bytes: n, SHA256: sum}
	}()
	return step{name: st.name, running: r}
}

// waitRunning waits for the steps started by start among steps.
func waitRunning(steps []step) {
	for _, st := range steps {
		if st.running != nil {
			<-st.running.done
		}
	}
}

// writeAll produces and stores the files of steps, then swaps the set in.
// Up to GOMAXPROCS steps run at a time (a step only reads the scene), besides
// those already running (start), each
// streaming its file into the staging folder (storeStream: buffered,
// hashed and counted as it goes, synced at the end); the layer steps also
// insert their features into the GeoPackage, which is completed when every
// layer is done. If any step fails nothing is swapped in: the output
// folder keeps its previous set, the staging folder is removed, and the
// error is that of the first failed step in step order. On success w.done
// lists the files, in step order.
func (w *writer) writeAll(s *scene, steps []step) error {
	errs := make([]error, len(steps))
	entries := make([]ManifestEntry, len(steps))
	var gp *gpkgSet
	gpAt := -1
	var defs []*layerDef
	for i, st := range steps {
		if st.gpkg {
			gpAt = i
		}
		if st.layer != nil {
			defs = append(defs, st.layer)
		}
	}
	if gpAt >= 0 {
		var err error
		if gp, err = s.openGeoPackage(w.set.path(steps[gpAt].name), defs); err != nil {
			w.set.abort()
			return fmt.Errorf("%s: cannot write: %v", w.set.finalPath(steps[gpAt].name), err)
		}
	}
	order := leadFirst(steps)
	workers := min(runtime.GOMAXPROCS(0), len(steps))
	var next int
	var mu sync.Mutex // guards next and the progress callback
	var producing sync.WaitGroup
	for range workers {
		producing.Go(func() {
			for {
				mu.Lock()
				if next >= len(order) {
					mu.Unlock()
					return
				}
				i := order[next]
				next++
				if w.progress != nil && !steps[i].gpkg && steps[i].running == nil {
					w.progress(steps[i].name)
				}
				mu.Unlock()
				st := steps[i]
				if st.gpkg || st.running != nil {
					continue
				}
				write := st.write
				if st.layer != nil {
					write = func(out io.Writer) error { return s.writeLayer(out, st.layer, gp) }
				}
				n, sum, err := storeStream(w.set.path(st.name), write)
				if err != nil {
					errs[i] = fmt.Errorf("%s: %v", w.set.finalPath(st.name), err)
					continue
				}
				entries[i] = ManifestEntry{Path: st.name, Bytes: n, SHA256: sum}
			}
		})
	}
	producing.Wait()
	waitRunning(steps)
	for i, st := range steps {
		if r := st.running; r != nil {
			entries[i], errs[i] = r.entry, r.err
		}
	}
	failed := slices.IndexFunc(errs, func(e error) bool { return e != nil })
	if gp != nil {
		if failed >= 0 {
			gp.w.Abort()
		} else if err := w.closeGeoPackage(gp, steps[gpAt].name); err != nil {
			errs[gpAt], failed = err, gpAt
		} else {
			entries[gpAt].Path = steps[gpAt].name
			entries[gpAt].Bytes, entries[gpAt].SHA256, errs[gpAt] = hashFile(w.set.path(steps[gpAt].name))
			if errs[gpAt] != nil {
				failed = gpAt
			}
		}
	}
	if failed >= 0 {
		w.set.abort()
		if Interrupted() {
			return errAborted // the files went with the staging folder
		}
		return errs[failed]
	}
	man := newManifest(w.meta)
	man.Files = entries
	if err := w.set.commit(man); err != nil {
		return err
	}
	for _, st := range steps {
		w.done = append(w.done, w.set.finalPath(st.name))
	}
	w.done = append(w.done, w.set.finalPath(FileManifest))
	return nil
}

// leadFirst returns the order in which writeAll starts steps: the layer
// steps marked lead (a layer of one huge feature, converted and checked
// in one piece: the covered area) first, so that the longest step is not
// the last to begin, then the others in step order.
func leadFirst(steps []step) []int {
	order := make([]int, 0, len(steps))
	for i, st := range steps {
		if st.layer != nil && st.layer.lead {
			order = append(order, i)
		}
	}
	for i, st := range steps {
		if st.layer == nil || !st.layer.lead {
			order = append(order, i)
		}
	}
	return order
}

// closeGeoPackage completes the GeoPackage (its R-trees and bounding
// boxes), reporting progress under its name.
func (w *writer) closeGeoPackage(gp *gpkgSet, name string) error {
	if w.progress != nil {
		w.progress(name)
	}
	if err := gp.w.Close(); err != nil {
		return fmt.Errorf("%s: cannot write: %v", w.set.finalPath(name), err)
	}
	return nil
}
