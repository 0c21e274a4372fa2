// Fault injection: the command is killed (SIGKILL) or interrupted (SIGINT)
// at random moments of a run, many times, and the output folder must always
// hold one complete set — the files its manifest.json lists, each with the
// listed SHA-256 checksum, and nothing else. Two runs into one folder at
// once never interleave.

package main

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/sitecover/sitecover/report"
)

// buildBinary builds the command once for a test.
func buildBinary(t *testing.T) string {
	t.Helper()
	bin := filepath.Join(t.TempDir(), "sitecover")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// checkCompleteSet fails unless dir holds exactly the files its manifest
// lists (plus the manifest), each matching its checksum.
func checkCompleteSet(t *testing.T, dir string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, report.FileManifest))
	if err != nil {
		t.Fatalf("no manifest: %v", err)
	}
	var m report.Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatalf("manifest: %v", err)
	}
	want := []string{report.FileManifest}
	for _, f := range m.Files {
		want = append(want, f.Path)
		data, err := os.ReadFile(filepath.Join(dir, f.Path))
		if err != nil {
			t.Fatalf("%s listed but missing: %v", f.Path, err)
		}
		sum := sha256.Sum256(data)
		if hex.EncodeToString(sum[:]) != f.SHA256 {
			t.Fatalf("%s does not match its manifest checksum: a mixed folder", f.Path)
		}
	}
	ents, _ := os.ReadDir(dir)
	var got []string
	for _, e := range ents {
		got = append(got, e.Name())
	}
	slices.Sort(got)
	slices.Sort(want)
	if !slices.Equal(got, want) {
		t.Fatalf("folder holds %v, manifest lists %v", got, want)
	}
}

// exitCodeOf returns the exit code of a finished command (-1 when a
// signal ended it); a failure to run it at all fails the test.
func exitCodeOf(t *testing.T, err error) int {
	t.Helper()
	if ee, ok := err.(*exec.ExitError); ok {
		return ee.ExitCode()
	}
	if err != nil {
		t.Fatal(err)
	}
	return 0
}

// staging lists staging folders beside dir.
func staging(dir string) []string {
	m, _ := filepath.Glob(filepath.Join(filepath.Dir(dir), ".*sitecover-staging*"))
	return m
}

func TestOutputFolderSurvivesKills(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs it many times")
	}
	bin := buildBinary(t)
	dir := t.TempDir()
	rng := rand.New(rand.NewPCG(7, 11))
	var sb strings.Builder
	sb.WriteString("x,y\n")
	for range 4000 {
		fmt.Fprintf(&sb, "%.3f,%.3f\n", rng.Float64()*2000, rng.Float64()*2000)
	}
	sites := writeFile(t, dir, "sites.csv", sb.String())
	area := writeFile(t, dir, "area.geojson", squareGeoJSON(0, 0, 2000))
	out := filepath.Join(dir, "out")
	args := func(r int) []string {
		return []string{"analyze", "--planar", "--sites", sites, "--area", area, "--range", fmt.Sprint(r), "--out", out, "--map-width", "600"}
	}
	start := time.Now()
	if b, err := exec.Command(bin, args(20)...).CombinedOutput(); err != nil {
		t.Fatalf("first run: %v\n%s", err, b)
	}
	full := time.Since(start)
	checkCompleteSet(t, out)

	for i := range 16 {
		before := staging(out) // a SIGKILL's debris, cleared by the next write
		cmd := exec.Command(bin, args(21+i)...)
		var stderr strings.Builder
		cmd.Stderr = &stderr
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		time.Sleep(time.Duration(rng.Float64() * float64(full)))
		sig := syscall.SIGKILL
		if i%2 == 1 {
			sig = syscall.SIGINT
		}
		cmd.Process.Signal(sig)
		code := exitCodeOf(t, cmd.Wait())
		checkCompleteSet(t, out)
		if sig == syscall.SIGINT {
			// -1: the signal came before the program installed its
			// handler (nothing written yet); the folder check above holds.
			if code != 0 && code != 130 && code != -1 {
				t.Errorf("kill %d: SIGINT gave exit %d, stderr %q", i, code, stderr.String())
			}
			if code == 130 && strings.Count(strings.TrimSpace(stderr.String()), "\n") > 1 {
				t.Errorf("kill %d: more than one line after SIGINT: %q", i, stderr.String())
			}
			for _, s := range staging(out) {
				if !slices.Contains(before, s) {
					t.Errorf("kill %d: staging folder left after SIGINT: %v", i, s)
				}
			}
		}
	}
	// A run after the kills completes and clears what SIGKILL left.
	if b, err := exec.Command(bin, args(50)...).CombinedOutput(); err != nil {
		t.Fatalf("run after kills: %v\n%s", err, b)
	}
	checkCompleteSet(t, out)
	if s := staging(out); len(s) > 0 {
		t.Errorf("staging folders left after a complete run: %v", s)
	}

	// Two runs into one folder at once: each completes or is refused
	// because the folder is in use; the folder holds one complete set.
	for i := range 3 {
		a, b := exec.Command(bin, args(30+i)...), exec.Command(bin, args(40+i)...)
		var ea, eb strings.Builder
		a.Stderr, b.Stderr = &ea, &eb
		a.Start()
		b.Start()
		for _, c := range []struct {
			cmd    *exec.Cmd
			stderr *strings.Builder
		}{{a, &ea}, {b, &eb}} {
			if err := c.cmd.Wait(); err != nil && !strings.Contains(c.stderr.String(), "in use by another sitecover run") {
				t.Errorf("concurrent run: %v, stderr %q", err, c.stderr.String())
			}
		}
		checkCompleteSet(t, out)
	}
}
