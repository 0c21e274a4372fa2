package main

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/report"
)

// TestManifestInputs checks manifest.json's list of inputs: every input
// file of the run by role (sites, range table, drawing-only context), each
// with the size and SHA-256 of its bytes as given, byte order mark and
// CRLF line ends included (the digest is checked against crypto/sha256 over
// the file, as sha256sum computes it); and that an output would-be
// overwriting the context layer is refused before anything is written.
func TestManifestInputs(t *testing.T) {
	dir := t.TempDir()
	sites := writeFile(t, dir, "sites.csv", "\xef\xbb\xbfx,y,type\r\n0,0,gateway\r\n100,0,sensor\r\n0,100,gateway\r\n100,100,sensor\r\n")
	table := writeFile(t, dir, "types.csv", "type,range\ngateway,80m\nsensor,60m\n")
	context := writeFile(t, dir, "buildings.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[[[10,10],[30,10],[30,30],[10,30],[10,10]]]}}]}`)
	out := filepath.Join(dir, "out")
	mustRun(t, "analyze", "--planar", "--sites", sites, "--range-table", table, "--context", context, "--no-maps", "--out", out)

	var m report.Manifest
	loadJSON(t, filepath.Join(out, report.FileManifest), &m)
	want := map[string]string{"sites": sites, "range-table": table, "context": context}
	if len(m.Inputs) != len(want) {
		t.Fatalf("manifest inputs %+v, want the roles %v", m.Inputs, want)
	}
	for _, in := range m.Inputs {
		path, ok := want[in.Role]
		if !ok || in.Path != path {
			t.Errorf("input %s %s: not expected (want %v)", in.Role, in.Path, want)
			continue
		}
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		sum := sha256.Sum256(data)
		if in.Bytes != int64(len(data)) || in.SHA256 != hex.EncodeToString(sum[:]) {
			t.Errorf("input %s: manifest %d bytes %s, file %d bytes %x", in.Role, in.Bytes, in.SHA256, len(data), sum)
		}
	}

	// A later run drawing the first run's sites layer as its context must
	// not write over it.
	layer := filepath.Join(out, "sites-xy.geojson")
	before, err := os.ReadFile(layer)
	if err != nil {
		t.Fatal(err)
	}
	r := runCLI(t, "analyze", "--planar", "--sites", sites, "--range", "80", "--context", layer, "--no-maps", "--out", out)
	if r.code != 1 || !strings.Contains(r.stderr, "is the input file") || strings.Count(strings.TrimSpace(r.stderr), "\n") != 0 {
		t.Fatalf("exit %d, stderr %q: want one line refusing to overwrite the context layer", r.code, r.stderr)
	}
	if after, _ := os.ReadFile(layer); string(after) != string(before) {
		t.Error("the context layer was overwritten")
	}
}
