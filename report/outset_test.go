package report

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// writeSet writes a set of named files into dir through the writer.
func writeSet(t *testing.T, dir string, files map[string]string, fail string) error {
	t.Helper()
	names := make([]string, 0, len(files))
	var steps []step
	for n, content := range files {
		names = append(names, n)
		steps = append(steps, step{name: n, write: fromBytes(func() ([]byte, error) {
			if n == fail {
				return nil, errors.New("injected failure")
			}
			return []byte(content), nil
		})})
	}
	names = append(names, FileManifest)
	w, err := newWriter(dir, names, Meta{Command: "test", Arguments: []string{"--x"}}, nil)
	if err != nil {
		return err
	}
	return w.writeAll(nil, steps)
}

// listDir returns the names in dir, and fails on staging debris beside it.
func listDir(t *testing.T, dir string) []string {
	t.Helper()
	ents, _ := os.ReadDir(dir)
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	side, _ := filepath.Glob(filepath.Join(filepath.Dir(dir), "*"+stagingMark+"*"))
	if len(side) > 0 {
		t.Errorf("staging debris left: %v", side)
	}
	return names
}

func TestOutputSetSwap(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	first := map[string]string{FileReport: "old report", FileSummary: "{}", FileMapCoverage: "old map"}
	if err := writeSet(t, dir, first, ""); err != nil {
		t.Fatal(err)
	}
	// A planning run's sub-folder, written by its own run, must survive
	// the next swap of its parent.
	sub := filepath.Join(dir, "suggest-add")
	if err := writeSet(t, sub, map[string]string{FileReport: "plan"}, ""); err != nil {
		t.Fatal(err)
	}

	t.Run("failed step leaves the previous set", func(t *testing.T) {
		err := writeSet(t, dir, map[string]string{FileReport: "new", FileSummary: "{\"new\":1}"}, FileSummary)
		if err == nil || !strings.Contains(err.Error(), "injected failure") {
			t.Fatalf("err = %v", err)
		}
		if b, _ := os.ReadFile(filepath.Join(dir, FileReport)); string(b) != "old report" {
			t.Errorf("report.txt = %q, want the previous set's", b)
		}
		listDir(t, dir)
	})

	t.Run("new set replaces the whole previous set", func(t *testing.T) {
		if err := writeSet(t, dir, map[string]string{FileReport: "new report", FileSummary: "{}"}, ""); err != nil {
			t.Fatal(err)
		}
		got := strings.Join(listDir(t, dir), ",")
		// The previous run's map is not part of the new set: it must go,
		// or the folder would mix two runs.
		if got != "manifest.json,report.txt,suggest-add,summary.json" {
			t.Errorf("folder holds %s", got)
		}
		if b, _ := os.ReadFile(filepath.Join(sub, FileReport)); string(b) != "plan" {
			t.Errorf("sub-folder lost: %q", b)
		}
	})

	t.Run("manifest lists the files with checksums", func(t *testing.T) {
		b, err := os.ReadFile(filepath.Join(dir, FileManifest))
		if err != nil {
			t.Fatal(err)
		}
		var m Manifest
		if err := json.Unmarshal(b, &m); err != nil {
			t.Fatal(err)
		}
		if m.Command != "test" || len(m.Arguments) != 1 || len(m.Files) != 2 {
			t.Fatalf("manifest %+v", m)
		}
		for _, f := range m.Files {
			data, _ := os.ReadFile(filepath.Join(dir, f.Path))
			sum := sha256.Sum256(data)
			if f.SHA256 != hex.EncodeToString(sum[:]) || f.Bytes != int64(len(data)) {
				t.Errorf("%s: manifest %d bytes %s, file %d bytes", f.Path, f.Bytes, f.SHA256, len(data))
			}
		}
	})
}

func TestOutputFolderRefusals(t *testing.T) {
	t.Run("a user's folder", func(t *testing.T) {
		dir := t.TempDir()
		os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("mine"), 0o644)
		err := writeSet(t, dir, map[string]string{FileReport: "r"}, "")
		if err == nil || !strings.Contains(err.Error(), "notes.txt") || !strings.Contains(err.Error(), "new or empty folder") {
			t.Fatalf("err = %v", err)
		}
		if got := strings.Join(listDir(t, dir), ","); got != "notes.txt" {
			t.Errorf("folder now holds %s", got)
		}
	})
	t.Run("a folder in use", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "out")
		w, err := newWriter(dir, []string{FileReport}, Meta{}, nil)
		if err != nil {
			t.Fatal(err)
		}
		defer w.set.abort()
		_, err = newWriter(dir, []string{FileReport}, Meta{}, nil)
		if err == nil || !strings.Contains(err.Error(), "in use by another sitecover run") {
			t.Fatalf("second writer: err = %v", err)
		}
	})
}

func TestAbortWrites(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	w, err := newWriter(dir, []string{FileReport}, Meta{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	stage := w.set.stage
	AbortWrites()
	defer func() {
		active.mu.Lock()
		active.aborted = false
		active.mu.Unlock()
	}()
	if _, err := os.Stat(stage); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("staging folder left after abort: %v", err)
	}
	if err := w.writeAll(nil, []step{{name: FileReport, write: fromBytes(func() ([]byte, error) { return []byte("x"), nil })}}); err == nil {
		t.Error("write after abort succeeded")
	}
	if got := listDir(t, dir); len(got) != 0 {
		t.Errorf("folder holds %v after an aborted write", got)
	}
	if _, err := os.Stat(dir); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("output folder the aborted run created is still there: %v", err)
	}
}

// An aborted write removes the output folder only if it created it: a
// folder that was there, empty or holding a report, stays.
func TestAbortKeepsExistingFolder(t *testing.T) {
	for _, c := range []struct {
		name  string
		files map[string]string // written first; nil: no folder; empty: an empty folder
		want  string
	}{
		{"new", nil, ""},
		{"existing empty", map[string]string{}, ""},
		{"earlier report", map[string]string{FileReport: "r"}, "manifest.json,report.txt"},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "out")
			switch {
			case c.files == nil:
			case len(c.files) == 0:
				os.Mkdir(dir, 0o755)
			default:
				if err := writeSet(t, dir, c.files, ""); err != nil {
					t.Fatal(err)
				}
			}
			w, err := newWriter(dir, []string{FileReport}, Meta{}, nil)
			if err != nil {
				t.Fatal(err)
			}
			w.set.abort()
			_, err = os.Stat(dir)
			if exists := err == nil; exists != (c.files != nil) {
				t.Errorf("folder exists = %v after the abort, want %v", exists, c.files != nil)
			}
			if got := strings.Join(listDir(t, dir), ","); got != c.want {
				t.Errorf("folder holds %q, want %q", got, c.want)
			}
		})
	}
}

// An aborted write into a folder whose parents it had to create removes
// those too (the planning commands' default --out is
// sitecover-report/<command>), and nothing above them.
func TestAbortRemovesCreatedParents(t *testing.T) {
	top := t.TempDir()
	dir := filepath.Join(top, "report", "failures")
	w, err := newWriter(dir, []string{FileReport}, Meta{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	w.set.abort()
	if got := listDir(t, top); len(got) != 0 {
		t.Errorf("%s holds %v after the abort, want nothing", top, got)
	}
	if _, err := os.Stat(top); err != nil {
		t.Errorf("the folder above the created ones is gone: %v", err)
	}
}

// A staging folder left by a killed run (no process holds its lock) is
// removed by the next run, after its report sub-folders are moved back.
func TestStaleStagingCleared(t *testing.T) {
	parent := t.TempDir()
	dir := filepath.Join(parent, "out")
	stale := filepath.Join(parent, ".out."+stagingMark+"-123")
	os.MkdirAll(filepath.Join(stale, "failures"), 0o755)
	os.WriteFile(filepath.Join(stale, "failures", FileManifest), []byte("{}"), 0o644)
	os.WriteFile(filepath.Join(stale, FileReport), []byte("half"), 0o644)
	if err := writeSet(t, dir, map[string]string{FileReport: "r"}, ""); err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(listDir(t, dir), ","); got != "failures,manifest.json,report.txt" {
		t.Errorf("folder holds %s", got)
	}
}
