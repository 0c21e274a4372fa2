// Tests of the projected copies of the k-coverage and planning layers
// (outcrs.go): each copy is listed and written, holds the features of its
// WGS84 layer, and its points agree with PROJ's cs2cs.

package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report/siteinput"
)

// copyLayer is the part of a layer file the copy tests read.
type copyLayer struct {
	CRS      json.RawMessage `json:"crs"`
	Features []struct {
		Geometry struct {
			Type        string          `json:"type"`
			Coordinates json.RawMessage `json:"coordinates"`
		} `json:"geometry"`
		Properties map[string]any `json:"properties"`
	} `json:"features"`
}

func readCopyLayer(t *testing.T, path string) copyLayer {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var l copyLayer
	if err := json.Unmarshal(b, &l); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return l
}

// copyPositions returns the positions of a point or line layer, feature
// after feature.
func copyPositions(t *testing.T, l copyLayer) [][2]float64 {
	t.Helper()
	var out [][2]float64
	for _, f := range l.Features {
		switch f.Geometry.Type {
		case "Point":
			var p [2]float64
			json.Unmarshal(f.Geometry.Coordinates, &p)
			out = append(out, p)
		case "LineString":
			var ls [][2]float64
			json.Unmarshal(f.Geometry.Coordinates, &ls)
			out = append(out, ls...)
		default:
			t.Fatalf("copyPositions of a %s", f.Geometry.Type)
		}
	}
	return out
}

// cs2csPoints converts local-plane points with PROJ's cs2cs (Debian
// proj-bin) from EPSG:4326 (the unrounded longitude/latitude of the
// plane's inverse) to code; nil when cs2cs is missing outside a live run.
func cs2csPoints(t *testing.T, tm *planar.TransverseMercator, code string, pts []orb.Point) [][2]float64 {
	t.Helper()
	if _, err := exec.LookPath("cs2cs"); err != nil {
		if os.Getenv("SITECOVER_LIVE") == "1" {
			t.Fatal("reference tool cs2cs unavailable; install proj-bin")
		}
		t.Log("cs2cs unavailable: positions not compared")
		return nil
	}
	var in bytes.Buffer
	for _, p := range pts {
		lon, lat := tm.Inverse(p[0], p[1])
		fmt.Fprintf(&in, "%.12f %.12f\n", lat, lon)
	}
	cmd := exec.Command("cs2cs", "-f", "%.6f", "EPSG:4326", code)
	cmd.Stdin = &in
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("cs2cs: %v", err)
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(lines) != len(pts) {
		t.Fatalf("cs2cs gave %d lines for %d points", len(lines), len(pts))
	}
	res := make([][2]float64, len(pts))
	for k, line := range lines {
		if _, err := fmt.Sscan(line, &res[k][0], &res[k][1]); err != nil {
			t.Fatalf("cs2cs line %q: %v", line, err)
		}
	}
	return res
}

// checkCopies checks every projected copy among files written to dir:
// the crs member, the feature count and property names of its WGS84
// layer, and, for the layers in want, each position against cs2cs within
// gridTol (UTM: easting first, as cs2cs prints it).
func checkCopies(t *testing.T, dir string, files []string, tm *planar.TransverseMercator, want map[string][]orb.Point) {
	t.Helper()
	n := 0
	for _, f := range files {
		if !strings.Contains(f, "-epsg32632.") {
			continue
		}
		n++
		orig := strings.Replace(f, "-epsg32632", "", 1)
		if !slices.Contains(files, orig) {
			t.Errorf("%s: no layer %s", f, orig)
			continue
		}
		cp, wgs := readCopyLayer(t, filepath.Join(dir, f)), readCopyLayer(t, filepath.Join(dir, orig))
		if !bytes.Contains(cp.CRS, []byte("urn:ogc:def:crs:EPSG::32632")) {
			t.Errorf("%s: crs member %s", f, cp.CRS)
		}
		if len(cp.Features) != len(wgs.Features) {
			t.Errorf("%s: %d features, %s %d", f, len(cp.Features), orig, len(wgs.Features))
			continue
		}
		for i := range cp.Features {
			if len(cp.Features[i].Properties) != len(wgs.Features[i].Properties) {
				t.Errorf("%s feature %d: %d properties, %s %d", f, i, len(cp.Features[i].Properties), orig, len(wgs.Features[i].Properties))
				break
			}
		}
		pts, ok := want[orig]
		if !ok {
			continue
		}
		got := copyPositions(t, cp)
		if len(got) != len(pts) {
			t.Errorf("%s: %d positions, want %d", f, len(got), len(pts))
			continue
		}
		ref := cs2csPoints(t, tm, "EPSG:32632", pts)
		worst := 0.0
		for k := range ref {
			worst = max(worst, math.Hypot(got[k][0]-ref[k][0], got[k][1]-ref[k][1]))
		}
		if worst > gridTol {
			t.Errorf("%s: largest distance to PROJ %.3g m, want ≤ %g", f, worst, gridTol)
		}
	}
	if n == 0 {
		t.Errorf("no projected copy among %v", files)
	}
}

// utmMeta is the metadata of a run near Munich with copies in UTM 32N.
func utmMeta(t *testing.T) (Meta, *planar.TransverseMercator) {
	t.Helper()
	tm, err := planar.NewLocalPlane([]orb.Point{{11.5, 48.1}})
	if err != nil {
		t.Fatal(err)
	}
	crs, err := siteinput.ParseCRS("EPSG:32632")
	if err != nil {
		t.Fatal(err)
	}
	return Meta{ToLonLat: tm.Inverse, OutCRS: crs, Title: "Lattice", Command: "test"}, tm
}

// basenames returns the file names of paths.
func basenames(paths []string) []string {
	out := make([]string, len(paths))
	for i, p := range paths {
		out[i] = filepath.Base(p)
	}
	return out
}

func TestGridCopiesOfPlans(t *testing.T) {
	m, tm := utmMeta(t)
	for _, mv := range allMoves {
		t.Run(string(mv), func(t *testing.T) {
			p := latticePlan(t, mv, 10/math.Sqrt2)
			dir := t.TempDir()
			written, err := WritePlan(dir, p, m, Options{})
			if err != nil {
				t.Fatal(err)
			}
			files := PlanFiles(mv, m, Options{})
			if got := basenames(written); !slices.Equal(got, files) {
				t.Fatalf("wrote %v, want %v", got, files)
			}
			want := map[string][]orb.Point{FileSites: p.Layout.Sites}
			switch mv {
			case MoveAdd, MoveFewest:
				var added []orb.Point
				for _, st := range p.Suggestion.Steps {
					added = append(added, st.Added)
				}
				want[FileProposed] = added
			case MoveCandidates:
				want[FileCandidates] = p.Candidates
			case MoveFailures:
				var at []orb.Point
				for _, d := range p.Failures.Devices {
					at = append(at, p.Layout.Sites[d.Site])
				}
				want[FileFailures] = at
			case MoveAssign:
				var line, load []orb.Point
				for i, q := range p.Demand {
					line = append(line, q, p.Layout.Sites[p.Assignment.Device[i]])
				}
				for i := range p.Assignment.Load {
					load = append(load, p.Layout.Sites[i])
				}
				want[FileAssignment], want[FileDeviceLoad] = line, load
			}
			checkCopies(t, dir, files, tm, want)
		})
	}
}

func TestGridCopiesOfReach(t *testing.T) {
	m, tm := utmMeta(t)
	sites := lattice(6, 10, [2]int{2, 3})
	t.Run("analyze --reach", func(t *testing.T) {
		an := analyze(t, sites, region(t, square(60)), 8)
		kc, err := coverage.KCover(an.Layout, 8, coverage.KOptions{MaxK: 2, Gaps: true})
		if err != nil {
			t.Fatal(err)
		}
		opt := Options{Reach: kc}
		dir := t.TempDir()
		written, err := WriteAnalysis(dir, an, m, opt)
		if err != nil {
			t.Fatal(err)
		}
		files := Files(false, m, opt)
		if got := basenames(written); !slices.Equal(got, files) {
			t.Fatalf("wrote %v, want %v", got, files)
		}
		for _, f := range []string{"reach-epsg32632.geojson", "reach-gaps-epsg32632.geojson"} {
			if !slices.Contains(files, f) {
				t.Errorf("%s not written", f)
			}
		}
		checkCopies(t, dir, files, tm, map[string][]orb.Point{FileSites: sites})
	})
	t.Run("suggest --reach", func(t *testing.T) {
		l := newLayout(t, sites, 60)
		p := &ReachPlan{Layout: l}
		var err error
		if p.Suggestion, err = coverage.ReachAdditions(l, 2, 12, coverage.SuggestOptions{}); err != nil {
			t.Fatal(err)
		}
		p.After = newLayout(t, append(slices.Clone(sites), p.Suggestion.Added...), 60)
		if p.AfterReach, err = coverage.KCover(p.After, 12, coverage.KOptions{MaxK: 2, Gaps: true}); err != nil {
			t.Fatal(err)
		}
		dir := t.TempDir()
		written, err := WriteReachPlan(dir, p, m, Options{})
		if err != nil {
			t.Fatal(err)
		}
		files := ReachPlanFiles(m)
		if got := basenames(written); !slices.Equal(got, files) {
			t.Fatalf("wrote %v, want %v", got, files)
		}
		checkCopies(t, dir, files, tm, map[string][]orb.Point{FileSites: sites, FileReachAdded: p.Suggestion.Added})
	})
}
