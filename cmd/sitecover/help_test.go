// Help, version and shell completion.

package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/report"
)

func TestHelp(t *testing.T) {
	r := mustRun(t, "--help")
	if !strings.Contains(r.stdout, report.Cautions()) {
		t.Errorf("root help lacks the cautions:\n%s", r.stdout)
	}
	for _, cmd := range []string{"analyze", "cells", "gaps", "demo"} {
		t.Run(cmd, func(t *testing.T) {
			r := mustRun(t, cmd, "--help")
			if !strings.Contains(r.stdout, "Examples:") || !strings.Contains(r.stdout, "sitecover "+cmd+" ") {
				t.Errorf("%s --help lacks examples:\n%s", cmd, r.stdout)
			}
		})
	}
	r = mustRun(t)
	if !strings.Contains(r.stdout, "Available Commands") {
		t.Errorf("bare sitecover: %s", r.stdout)
	}
}

func TestVersionAndCompletion(t *testing.T) {
	r := mustRun(t, "--version")
	if !strings.HasPrefix(r.stdout, "sitecover dev (") {
		t.Errorf("--version: %q", r.stdout)
	}
	for _, sh := range []string{"bash", "zsh", "fish", "powershell"} {
		t.Run("completion "+sh, func(t *testing.T) {
			r := mustRun(t, "completion", sh)
			if !strings.Contains(r.stdout, "sitecover") || len(r.stdout) < 200 {
				t.Errorf("completion %s: %q", sh, r.stdout[:min(len(r.stdout), 200)])
			}
		})
	}
}

func TestBinary(t *testing.T) {
	// The built program: -ldflags sets the version, exit codes reach the
	// shell, and bad input prints one line and no stack trace.
	if testing.Short() {
		t.Skip("builds the binary")
	}
	bin := filepath.Join(t.TempDir(), "sitecover")
	build := exec.Command("go", "build", "-ldflags", "-X main.version=9.8.7", "-o", bin, ".")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	out, err := exec.Command(bin, "--version").Output()
	if err != nil || !strings.HasPrefix(string(out), "sitecover 9.8.7 (") {
		t.Errorf("--version: %q %v", out, err)
	}
	dir := t.TempDir()
	bad := writeFile(t, dir, "bad.csv", "lat,lon\n44,-99\n95.2,-99\n")
	for _, c := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"bad input", []string{"analyze", "--sites", bad, "--range", "1m", "--out", dir}, 1, "bad.csv line 3: latitude 95.2 is outside -90..90"},
		{"bad usage", []string{"analyze", "--nonsense"}, 2, "unknown flag: --nonsense"},
		{"demo", []string{"demo", "--out", filepath.Join(dir, "demo"), "--no-maps"}, 0, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			cmd := exec.Command(bin, c.args...)
			var stderr strings.Builder
			cmd.Stderr = &stderr
			code := exitCodeOf(t, cmd.Run())
			if code != c.code {
				t.Errorf("%v: exit %d, want %d (%s)", c.args, code, c.code, stderr.String())
			}
			if c.want != "" && (!strings.Contains(stderr.String(), c.want) || strings.Count(stderr.String(), "\n") != 1) {
				t.Errorf("%v: stderr %q", c.args, stderr.String())
			}
		})
	}
	if _, err := os.Stat(filepath.Join(dir, "demo", "summary.json")); err != nil {
		t.Error(err)
	}
}
