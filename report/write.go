// Atomic output: each file is written to a temporary file in the output
// folder, synced, closed and renamed over its final name. rename(2) within
// one directory is atomic on POSIX file systems, so a reader sees either
// the previous file or the complete new one, never a part. Temporary files
// are removed on every error path.
//
// Before anything is written the writer checks that the folder can be
// created and written, and that no output path names an input file (by
// cleaned absolute path, and by device/inode when both exist, which also
// catches hard links and symbolic links).

package report

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"sync"
)

// writer writes the files of one report into dir.
type writer struct {
	dir      string
	progress func(string)
	done     []string
}

// newWriter prepares dir for the given file names: it creates dir, checks
// it is writable, and refuses names that are input files.
func newWriter(dir string, names []string, m Meta, progress func(string)) (*writer, error) {
	if dir == "" {
		dir = "."
	}
	if fi, err := os.Stat(dir); err == nil && !fi.IsDir() {
		return nil, fmt.Errorf("output folder %s: exists and is not a folder", dir)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("output folder %s: cannot create it: %v", dir, unwrapPath(err))
	}
	probe, err := os.CreateTemp(dir, ".sitecover-probe-*")
	if err != nil {
		return nil, fmt.Errorf("output folder %s: not writable: %v", dir, unwrapPath(err))
	}
	probe.Close()
	os.Remove(probe.Name())

	inputs := []string{m.SitesFile, m.AreaFile, m.ExcludeFile, m.CandidatesFile, m.PointsFile}
	for _, name := range names {
		out := filepath.Join(dir, name)
		for _, in := range inputs {
			if in != "" && samePath(in, out) {
				return nil, fmt.Errorf("output %s is the input file %s: refusing to overwrite it (choose another --out folder)", out, in)
			}
		}
	}
	return &writer{dir: dir, progress: progress}, nil
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

// writeAll produces and stores the files of steps. Up to GOMAXPROCS steps
// produce their bytes at a time (a step only reads the scene); each
// finished file is then written and synced on its own goroutine, so the
// disk wait overlaps the next step's work. Every file is written
// atomically, so a failed step leaves no part of its file; the others still
// complete. w.done lists the files written, in step order; the error is
// that of the first failed step in step order.
func (w *writer) writeAll(steps []step) error {
	errs := make([]error, len(steps))
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
				path := filepath.Join(w.dir, steps[i].name)
				b, err := steps[i].make()
				if err != nil {
					errs[i] = fmt.Errorf("%s: %v", path, err)
					continue
				}
				storing.Go(func() { errs[i] = writeAtomic(path, b) })
			}
		})
	}
	producing.Wait()
	storing.Wait()
	var first error
	for i, st := range steps {
		switch {
		case errs[i] == nil:
			w.done = append(w.done, filepath.Join(w.dir, st.name))
		case first == nil:
			first = errs[i]
		}
	}
	return first
}

// writeAtomic writes b to path through a temporary file in the same
// folder.
func writeAtomic(path string, b []byte) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, unwrapPath(err))
	}
	tmp := f.Name()
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(tmp)
		}
	}()
	if _, err = f.Write(b); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, unwrapPath(err))
	}
	if err = f.Chmod(0o644); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, unwrapPath(err))
	}
	if err = f.Sync(); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, unwrapPath(err))
	}
	if err = f.Close(); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, unwrapPath(err))
	}
	if err = os.Rename(tmp, path); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, unwrapPath(err))
	}
	return nil
}
