// A report folder is complete or untouched.
//
// One report is a set of files (report.txt, summary.json, layers, maps, and
// manifest.json listing them). The set is written into a hidden staging
// folder beside the output folder and swapped in whole at the end:
//
//  1. The output folder is created if needed and locked (flock on the
//     folder itself, non-blocking): a second run into the same folder is
//     refused instead of interleaving its files.
//  2. Staging folders left by a run that was killed are removed (their lock
//     is gone with their process); report sub-folders found in them are
//     moved back first.
//  3. The files are written into the staging folder, each synced, then
//     manifest.json, then the staging folder itself is synced.
//  4. The staging folder and the output folder are exchanged in one
//     rename (renameat2 RENAME_EXCHANGE on Linux: atomic); where the file
//     system cannot exchange, the old folder is renamed aside first and the
//     new one renamed into place (a crash between the two leaves the
//     complete old set aside, restored by step 2 of the next run).
//  5. Entries of the previous folder that were not part of the previous set
//     (the sub-folders of planning runs, written by their own runs) are
//     moved into the new folder; the rest of the previous set is removed.
//
// A reader of the output folder thus sees the whole previous set or the
// whole new set, never a mix. An interrupted run (AbortWrites, called by the
// command's signal handler) removes its staging folder; an error while
// writing (disk full) does the same and leaves the output folder as it was.
//
// The swap replaces the folder's entries, so a folder that holds files
// sitecover did not write (a user's own folder) is refused before anything
// is computed.

package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"time"
)

// FileManifest is the name of the manifest written last into every report
// folder: which run made the set (program version, command, arguments,
// time), its inputs with their SHA-256 checksums, and every file of the set
// with its size and checksum.
const FileManifest = "manifest.json"

// stagingMark is part of the name of every staging folder:
// ".<folder>.<stagingMark>-<random>" beside the output folder.
const stagingMark = "sitecover-staging"

// Manifest is the content of manifest.json.
type Manifest struct {
	Program   string          `json:"program"`
	Version   string          `json:"version"`
	Command   string          `json:"command"`
	Arguments []string        `json:"arguments"`
	Written   string          `json:"written"`
	Inputs    []ManifestEntry `json:"inputs"`
	Files     []ManifestEntry `json:"files"`
}

// ManifestEntry is one file of a manifest: an input (with its role, e.g.
// "sites") or an output, with its size in bytes and SHA-256 checksum.
type ManifestEntry struct {
	Role   string `json:"role,omitempty"`
	Path   string `json:"path"`
	Bytes  int64  `json:"bytes"`
	SHA256 string `json:"sha256"`
}

// active holds the staging folders of the writes in progress, so that
// AbortWrites can remove them; swapping holds mu too, so an abort happens
// either before a swap (the old set stays) or after it (the new set stays).
var active = struct {
	mu      sync.Mutex
	sets    map[*outputSet]bool
	aborted bool
}{sets: map[*outputSet]bool{}}

// AbortWrites stops every report write in progress in this process: their
// staging folders are removed and their output folders stay as they were
// (or, for a write whose swap had already happened, hold the new set).
// Later writes fail. It is meant for a signal handler before exiting.
func AbortWrites() {
	active.mu.Lock()
	defer active.mu.Unlock()
	active.aborted = true
	for o := range active.sets {
		o.discard()
		delete(active.sets, o)
	}
}

// Interrupted reports whether AbortWrites has been called in this process:
// a write that failed since then failed because of it.
func Interrupted() bool {
	active.mu.Lock()
	defer active.mu.Unlock()
	return active.aborted
}

// errAborted is returned by writes after AbortWrites.
var errAborted = errors.New("interrupted")

// outputSet is one report folder being replaced.
type outputSet struct {
	dir   string   // the output folder
	stage string   // the staging folder beside it
	lock  *os.File // the output folder, opened and locked
	slock *os.File // the staging folder, opened and locked
	// created is the outermost folder of dir's path that this run
	// created (dir itself or a parent), "" when dir existed or once the
	// new set is in it.
	created string
}

// CheckOutputFolder reports, writing nothing that stays, whether a report
// with the given file names can be written into dir: dir is a folder or
// can be created, no output would overwrite an input named in m, dir
// holds nothing but an earlier report (or is empty), and the folders the
// report goes through accept new files (probeWritable). Commands call it
// before their computation so that a bad --out fails at once; names nil
// stands for every name a sitecover report may hold.
func CheckOutputFolder(dir string, names []string, m Meta) error {
	if dir == "" {
		dir = "."
	}
	if names == nil {
		names = knownOutputNames()
	}
	if fi, err := os.Stat(dir); err == nil && !fi.IsDir() {
		return fmt.Errorf("output folder %s: exists and is not a folder", dir)
	}
	inputs := []string{m.SitesFile, m.AreaFile, m.ExcludeFile, m.CandidatesFile, m.PointsFile, m.RangeTableFile, m.ContextFile}
	for _, name := range names {
		out := filepath.Join(dir, name)
		for _, in := range inputs {
			if in != "" && samePath(in, out) {
				return fmt.Errorf("output %s is the input file %s: refusing to overwrite it (choose another --out folder)", out, in)
			}
		}
	}
	ents, err := os.ReadDir(dir)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) || errors.Is(err, syscall.ENOTDIR) { // missing, or under a file
			if err := checkCreatable(dir); err != nil {
				return err
			}
			return probeWritable(dir)
		}
		return fmt.Errorf("output folder %s: cannot read it: %v", dir, unwrapPath(err))
	}
	if foreign := foreignEntry(dir, ents, names); foreign != "" {
		return fmt.Errorf("output folder %s holds %s, which sitecover did not write: give --out a new or empty folder (a report replaces the folder's contents)", dir, foreign)
	}
	return probeWritable(dir)
}

// probeWritable checks, by creating and removing a probe file, that the
// folder the staging folder goes into (the parent of dir, or its nearest
// existing ancestor when dir is still to be created) and dir itself, when
// it exists, accept new entries.
func probeWritable(dir string) error {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return fmt.Errorf("output folder %s: %v", dir, err)
	}
	probe := func(p string) error {
		f, err := os.CreateTemp(p, ".sitecover-probe-*")
		if err != nil {
			return fmt.Errorf("output folder %s: not writable: %v", dir, unwrapPath(err))
		}
		f.Close()
		os.Remove(f.Name())
		return nil
	}
	if fi, err := os.Stat(abs); err == nil && fi.IsDir() {
		if err := probe(abs); err != nil {
			return err
		}
	}
	p := filepath.Dir(abs)
	for {
		if fi, err := os.Stat(p); err == nil && fi.IsDir() {
			return probe(p)
		}
		q := filepath.Dir(p)
		if q == p {
			return nil
		}
		p = q
	}
}

// checkCreatable reports whether the missing folder dir could be created:
// its nearest existing ancestor must be a writable folder.
func checkCreatable(dir string) error {
	p := filepath.Clean(dir)
	for {
		parent := filepath.Dir(p)
		fi, err := os.Stat(parent)
		if err == nil {
			if !fi.IsDir() {
				return fmt.Errorf("output folder %s: cannot create it: %s is not a folder", dir, parent)
			}
			return nil
		}
		if parent == p {
			return nil
		}
		p = parent
	}
}

// foreignEntry returns the first entry of dir that is neither part of a
// sitecover report (a name the previous manifest lists, a name of this
// report, the manifest itself, a report sub-folder) nor a staging folder;
// "" when there is none.
func foreignEntry(dir string, ents []os.DirEntry, names []string) string {
	ours := map[string]bool{FileManifest: true}
	for _, n := range names {
		ours[n] = true
	}
	for _, n := range knownOutputNames() {
		ours[n] = true
	}
	if prev, err := readManifest(dir); err == nil {
		for _, f := range prev.Files {
			ours[f.Path] = true
		}
	}
	for _, e := range ents {
		n := e.Name()
		switch {
		case ours[n], strings.HasPrefix(n, ".sitecover-probe-"):
		case e.IsDir() && isReportFolder(filepath.Join(dir, n)):
		default:
			return n
		}
	}
	return ""
}

// isReportFolder reports whether dir holds a sitecover report: a manifest,
// or (written before manifests) a report.txt beside a summary.json.
func isReportFolder(dir string) bool {
	if _, err := os.Stat(filepath.Join(dir, FileManifest)); err == nil {
		return true
	}
	_, err1 := os.Stat(filepath.Join(dir, FileReport))
	_, err2 := os.Stat(filepath.Join(dir, FileSummary))
	return err1 == nil && err2 == nil
}

// readManifest reads dir's manifest.json.
func readManifest(dir string) (*Manifest, error) {
	b, err := os.ReadFile(filepath.Join(dir, FileManifest))
	if err != nil {
		return nil, err
	}
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, err
	}
	return &m, nil
}

// openOutputSet checks dir (as CheckOutputFolder), creates and locks it,
// clears staging folders left by killed runs and creates this run's
// staging folder.
func openOutputSet(dir string, names []string, m Meta) (*outputSet, error) {
	if dir == "" {
		dir = "."
	}
	if err := CheckOutputFolder(dir, names, m); err != nil {
		return nil, err
	}
	created := outermostMissing(dir)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("output folder %s: cannot create it: %v", dir, unwrapPath(err))
	}
	lock, err := lockFolder(dir)
	if err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		lock.Close()
		return nil, fmt.Errorf("output folder %s: %v", dir, err)
	}
	parent, base := filepath.Split(abs)
	clearStale(parent, base, abs)
	// Creating and registering the staging folder is one step for
	// AbortWrites, so an interrupt never leaves an unregistered one.
	active.mu.Lock()
	defer active.mu.Unlock()
	if active.aborted {
		lock.Close()
		return nil, errAborted
	}
	stage, err := os.MkdirTemp(parent, "."+base+"."+stagingMark+"-*")
	if err != nil {
		lock.Close()
		return nil, fmt.Errorf("output folder %s: not writable: %v", dir, unwrapPath(err))
	}
	slock, err := lockFolder(stage)
	if err != nil {
		os.RemoveAll(stage)
		lock.Close()
		return nil, err
	}
	if created != "" {
		created, _ = filepath.Abs(created)
	}
	o := &outputSet{dir: abs, stage: stage, lock: lock, slock: slock, created: created}
	active.sets[o] = true
	return o, nil
}

// outermostMissing returns the outermost folder of dir's path that does
// not exist, the first that os.MkdirAll(dir) creates; "" when dir exists
// (or cannot be examined).
func outermostMissing(dir string) string {
	top := ""
	for d := filepath.Clean(dir); ; {
		if _, err := os.Stat(d); !errors.Is(err, os.ErrNotExist) {
			return top
		}
		top = d
		up := filepath.Dir(d)
		if up == d {
			return top
		}
		d = up
	}
}

// clearStale removes the staging folders of earlier runs on dir (named
// ".<base>.sitecover-staging-*" in parent) whose lock is free, after moving
// any report sub-folder in them that dir lacks back into dir.
func clearStale(parent, base, dir string) {
	matches, _ := filepath.Glob(filepath.Join(parent, "."+base+"."+stagingMark+"-*"))
	for _, st := range matches {
		f, err := lockFolder(st)
		if err != nil {
			continue // a live run's staging folder
		}
		if strings.HasSuffix(st, "-previous") && isReportFolder(st) {
			// A swap by renames was cut between its renames: st holds the
			// previous set and dir, empty, was made anew. Put it back.
			if ents, err := os.ReadDir(dir); err == nil && len(ents) == 0 && os.Remove(dir) == nil {
				if os.Rename(st, dir) == nil {
					f.Close()
					continue
				}
				os.Mkdir(dir, 0o755)
			}
		}
		rescueSubfolders(st, dir)
		os.RemoveAll(st)
		f.Close()
	}
}

// rescueSubfolders moves each report sub-folder of from that to lacks into
// to.
func rescueSubfolders(from, to string) {
	ents, _ := os.ReadDir(from)
	for _, e := range ents {
		src := filepath.Join(from, e.Name())
		if !e.IsDir() || !isReportFolder(src) {
			continue
		}
		dst := filepath.Join(to, e.Name())
		if _, err := os.Lstat(dst); errors.Is(err, os.ErrNotExist) {
			os.Rename(src, dst)
		}
	}
}

// path returns the staging path of a file of the set.
func (o *outputSet) path(name string) string { return filepath.Join(o.stage, name) }

// finalPath returns the path a file of the set will have once swapped in.
func (o *outputSet) finalPath(name string) string { return filepath.Join(o.dir, name) }

// commit writes the manifest, swaps the staging folder in and removes the
// previous set. After an error the output folder is unchanged.
func (o *outputSet) commit(man *Manifest) error {
	b, err := json.MarshalIndent(man, "", "  ")
	if err != nil {
		o.abort()
		return err
	}
	if _, _, err := storeFile(o.path(FileManifest), append(b, '\n')); err != nil {
		o.abort()
		return fmt.Errorf("%s: cannot write: %v", o.finalPath(FileManifest), err)
	}
	if err := syncFolder(o.stage); err != nil {
		o.abort()
		return fmt.Errorf("output folder %s: cannot write: %v", o.dir, err)
	}
	// The swap and the removal of the previous set are one step for
	// AbortWrites: an interrupt waits for them, so it leaves no debris.
	active.mu.Lock()
	defer active.mu.Unlock()
	if active.aborted || !active.sets[o] {
		return errAborted
	}
	delete(active.sets, o)
	if err := swapFolders(o.stage, o.dir); err != nil {
		o.discard()
		return fmt.Errorf("output folder %s: cannot replace it: %v", o.dir, err)
	}
	o.created = "" // dir holds the new set
	// o.stage now holds the previous set: keep what was not part of it.
	prevNames := map[string]bool{FileManifest: true}
	if prev, err := readManifest(o.stage); err == nil {
		for _, f := range prev.Files {
			prevNames[f.Path] = true
		}
	}
	ents, _ := os.ReadDir(o.stage)
	for _, e := range ents {
		n := e.Name()
		if prevNames[n] || !e.IsDir() {
			continue
		}
		if _, err := os.Lstat(filepath.Join(o.dir, n)); errors.Is(err, os.ErrNotExist) {
			os.Rename(filepath.Join(o.stage, n), filepath.Join(o.dir, n))
		}
	}
	syncFolder(filepath.Dir(o.dir))
	o.discard()
	return nil
}

// abort removes the staging folder and unlocks; the output folder is left
// as it was.
func (o *outputSet) abort() {
	active.mu.Lock()
	delete(active.sets, o)
	active.mu.Unlock()
	o.discard()
}

// discard removes the staging folder and releases both locks. The folder is
// first renamed, so that writers still running (an abort from a signal
// handler does not wait for them) can no longer create files in it, and the
// removal is retried for a file created just before the rename. The
// folders this run created for the output folder (o.created and those
// inside it) are removed too, each only if empty, while the output folder
// is locked: a run stopped before its swap leaves no folder where there
// was none.
func (o *outputSet) discard() {
	gone := o.stage + "-discarded"
	if os.Rename(o.stage, gone) != nil {
		gone = o.stage
	}
	for range 5 {
		if os.RemoveAll(gone) == nil {
			break
		}
	}
	for d := o.dir; o.created != ""; d = filepath.Dir(d) {
		if os.Remove(d) != nil || d == o.created {
			break
		}
	}
	o.slock.Close()
	o.lock.Close()
}

// storeFile writes b to path (a new file in the staging folder), synced,
// and returns its size and SHA-256 checksum.
func storeFile(path string, b []byte) (int64, string, error) {
	return storeStream(path, func(w io.Writer) error {
		_, err := w.Write(b)
		return err
	})
}

// syncFolder flushes a folder's entries to disk.
func syncFolder(dir string) error {
	f, err := os.Open(dir)
	if err != nil {
		return unwrapPath(err)
	}
	defer f.Close()
	if err := f.Sync(); err != nil && !errors.Is(err, os.ErrInvalid) {
		return unwrapPath(err)
	}
	return nil
}

// inputEntries lists the inputs of m by role, each with the checksum the
// run took as it read it (m.InputSums): the data the run used, even if a
// file has changed since. An input without one is listed without it.
func inputEntries(m Meta) []ManifestEntry {
	roles := []struct{ role, path string }{
		{"sites", m.SitesFile}, {"area", m.AreaFile}, {"exclude", m.ExcludeFile},
		{"candidates", m.CandidatesFile}, {"points", m.PointsFile},
		{"range-table", m.RangeTableFile}, {"context", m.ContextFile},
	}
	var out []ManifestEntry
	for _, r := range roles {
		if r.path == "" {
			continue
		}
		e := ManifestEntry{Role: r.role, Path: r.path}
		if sum, ok := m.InputSums[r.path]; ok {
			e.Bytes, e.SHA256 = sum.Bytes, sum.SHA256
		}
		out = append(out, e)
	}
	return out
}

// newManifest starts the manifest of a set written now for m.
func newManifest(m Meta) *Manifest {
	args := m.Arguments
	if args == nil {
		args = []string{}
	}
	return &Manifest{
		Program:   "sitecover",
		Version:   m.Version,
		Command:   m.Command,
		Arguments: args,
		Written:   time.Now().UTC().Format(time.RFC3339),
		Inputs:    inputEntries(m),
		Files:     []ManifestEntry{},
	}
}

// swapByRenames exchanges the folders a (the new set) and b (the output
// folder) with three renames through a third name beside a, which keeps the
// staging mark: a crash in between leaves b's previous set under that name,
// where the next run's clearStale finds it (its lock is gone) and moves its
// report sub-folders back.
func swapByRenames(a, b string) error {
	aside := a + "-previous"
	if err := os.Rename(b, aside); err != nil {
		return err
	}
	if err := os.Rename(a, b); err != nil {
		os.Rename(aside, b)
		return err
	}
	return os.Rename(aside, a)
}

// knownOutputNames lists every file name a sitecover report may hold, for
// recognising an earlier report's folder.
func knownOutputNames() []string {
	var names []string
	all := Options{Maps: true, Charts: true, GeoPackage: true}
	for _, planar := range []bool{false, true} {
		m := Meta{Planar: planar}
		names = append(names, Files(false, m, all)...)
		names = append(names, Files(true, m, all)...)
		for _, mv := range []Move{MoveAdd, MoveFewest, MoveCandidates, MoveFailures, MoveAssign} {
			names = append(names, PlanFiles(mv, m, all)...)
		}
	}
	return names
}
