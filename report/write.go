// Writing one report: the files are produced in parallel, each stored
// (written and synced) in the staging folder of the report's output set,
// and the set is swapped into the output folder when every file is there
// (outset.go). Before anything is produced the writer checks that no output
// path names an input file (by cleaned absolute path, and by device/inode
// when both exist, which also catches hard links and symbolic links).

package report

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"sync"
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

// writeAll produces and stores the files of steps, then swaps the set in.
// Up to GOMAXPROCS steps produce their bytes at a time (a step only reads
// the scene); each finished file is then written and synced on its own
// goroutine, so the disk wait overlaps the next step's work. If any step
// fails nothing is swapped in: the output folder keeps its previous set,
// the staging folder is removed, and the error is that of the first failed
// step in step order. On success w.done lists the files, in step order.
func (w *writer) writeAll(steps []step) error {
	errs := make([]error, len(steps))
	entries := make([]ManifestEntry, len(steps))
	workers := min(runtime.GOMAXPROCS(0), len(steps))
	var next int
	var mu sync.Mutex // guards next and the progress callback
	var producing, storing sync.WaitGroup
	for range workers {
		producing.Go(func() {
			for {
				mu.Lock()
				i := next
				next++
				if i < len(steps) && w.progress != nil {
					w.progress(steps[i].name)
				}
				mu.Unlock()
				if i >= len(steps) {
					return
				}
				final := w.set.finalPath(steps[i].name)
				b, err := steps[i].make()
				if err != nil {
					errs[i] = fmt.Errorf("%s: %v", final, err)
					continue
				}
				storing.Go(func() {
					n, sum, err := storeFile(w.set.path(steps[i].name), b)
					if err != nil {
						errs[i] = fmt.Errorf("%s: cannot write: %v", final, err)
						return
					}
					entries[i] = ManifestEntry{Path: steps[i].name, Bytes: n, SHA256: sum}
				})
			}
		})
	}
	producing.Wait()
	storing.Wait()
	for i := range steps {
		if errs[i] != nil {
			w.set.abort()
			if Interrupted() {
				return errAborted // the files went with the staging folder
			}
			return errs[i]
		}
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
