// Devices with their own ranges through the CLI: a range column, a type
// column with --type-range or --range-table, the stdout summary, the
// report files and the equal-range case (the common-range report, figure
// for figure).

package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// mixedCSV is a gateway reaching 150 m and three sensors reaching 40 m;
// s3 lies inside g1's disk, so it is hidden (redundant for coverage).
const mixedCSV = "name,x,y,type,range\ng1,0,0,gateway,150m\ns1,200,0,sensor,40\ns2,100,120,sensor,40m\ns3,20,10,sensor,0.04km\n"

func TestRangesCLI(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	mixed := writeFile(t, dir, "mixed.csv", mixedCSV)
	typed := writeFile(t, dir, "typed.csv", "name,x,y,type\ng1,0,0,gateway\ns1,200,0,sensor\ns2,100,120,sensor\ns3,20,10,sensor\n")
	table := writeFile(t, dir, "types.csv", "type,range\ngateway,150m\nsensor,40m\n")
	readJSON := func(t *testing.T, path string, v any) {
		t.Helper()
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, v); err != nil {
			t.Fatal(err)
		}
	}
	for _, c := range []struct {
		name string
		args []string
	}{
		{"range column", []string{"analyze", "--sites", mixed}},
		{"type column with --type-range", []string{"analyze", "--sites", typed, "--type-range", "gateway=150m", "--type-range", "sensor=40m"}},
		{"type column with --range-table", []string{"gaps", "--sites", typed, "--range-table", table}},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-"))
			r := mustRun(t, append(c.args, "--planar", "--area", area, "--out", out)...)
			for _, w := range []string{"range of gateway         150.00 m (1 device)", "range of sensor          40.00 m (3 devices)", "redundant (hidden)       s3"} {
				if !strings.Contains(r.stdout, w) {
					t.Errorf("stdout lacks %q:\n%s", w, r.stdout)
				}
			}
			if c.args[0] == "gaps" && !strings.Contains(r.stdout, "g1 to 316.23 m") {
				t.Errorf("gaps stdout lacks the single-device fix:\n%s", r.stdout)
			}
			var doc struct {
				Hidden  []int `json:"hidden"`
				Devices []struct {
					Type   string  `json:"type"`
					RangeM float64 `json:"range_m"`
				} `json:"devices"`
				Gaps []struct {
					FixLabel string `json:"fix_label"`
				} `json:"gaps"`
			}
			readJSON(t, filepath.Join(out, "summary.json"), &doc)
			if !slices.Equal(doc.Hidden, []int{3}) || len(doc.Devices) != 4 || doc.Devices[0].RangeM != 150 || doc.Devices[1].Type != "sensor" || doc.Devices[1].RangeM != 40 {
				t.Errorf("summary.json hidden %v devices %+v", doc.Hidden, doc.Devices)
			}
			txt, _ := os.ReadFile(filepath.Join(out, "report.txt"))
			for _, w := range []string{"grows all ranges together", "single-device fix", "yes (hidden"} {
				if !strings.Contains(string(txt), w) {
					t.Errorf("report.txt lacks %q", w)
				}
			}
			sites, _ := os.ReadFile(filepath.Join(out, "sites-xy.geojson"))
			if !strings.Contains(string(sites), `"range_m":150,"type":"gateway"`) || !strings.Contains(string(sites), `"hidden":true`) {
				t.Errorf("sites layer lacks ranges, types or hidden: %s", sites)
			}
		})
	}
	t.Run("equal ranges from a column: the common-range report", func(t *testing.T) {
		equal := writeFile(t, dir, "equal.csv", "name,x,y,type,range\ng1,0,0,gateway,150m\ns1,200,0,sensor,150\ns2,100,120,sensor,0.15km\n")
		plain := writeFile(t, dir, "plain.csv", "name,x,y\ng1,0,0\ns1,200,0\ns2,100,120\n")
		outA, outB := filepath.Join(dir, "eq-col"), filepath.Join(dir, "eq-flag")
		mustRun(t, "analyze", "--planar", "--sites", equal, "--area", area, "--out", outA, "--no-maps")
		mustRun(t, "analyze", "--planar", "--sites", plain, "--area", area, "--out", outB, "--range", "150m", "--no-maps")
		var a, b map[string]any
		readJSON(t, filepath.Join(outA, "summary.json"), &a)
		readJSON(t, filepath.Join(outB, "summary.json"), &b)
		for _, k := range []string{"range_m", "covered_fraction", "uncovered_area_m2", "full_cover_range_m", "gaps", "holes"} {
			ja, _ := json.Marshal(a[k])
			jb, _ := json.Marshal(b[k])
			if string(ja) != string(jb) {
				t.Errorf("%s: range column %s, --range %s", k, ja, jb)
			}
		}
		sites, _ := os.ReadFile(filepath.Join(outA, "sites-xy.geojson"))
		if !strings.Contains(string(sites), `"range_m":150,"type":"sensor"`) {
			t.Errorf("sites layer lacks range_m and type: %s", sites)
		}
	})
	t.Run("cells with a hidden device", func(t *testing.T) {
		r := mustRun(t, "cells", "--planar", "--sites", mixed, "--area", area, "--out", filepath.Join(dir, "cells"), "--no-maps")
		if !strings.Contains(r.stdout, "service areas") {
			t.Errorf("stdout %q", r.stdout)
		}
	})
}
