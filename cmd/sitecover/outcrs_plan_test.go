// --out-crs on the planning commands and with --reach: each command writes
// the projected copies of its layers (their figures are checked against
// PROJ in report's TestGridCopiesOfPlans and TestGridCopiesOfReach).

package main

import (
	"os"
	"path/filepath"
	"testing"
)

func TestOutCRSPlanningCLI(t *testing.T) {
	dir := t.TempDir()
	w := func(name, content string) string { return writeFile(t, dir, name, content) }
	sites := w("utm.csv", "Easting,Northing,name\n691000,5335000,a\n691100.25,5335000.5,b\n691000.125,5335100,c\n691150,5335150,d\n")
	area := w("utm.geojson", utmArea)
	points := w("pts.csv", "Easting,Northing,name\n691010,5335010,p\n691120,5335130,q\n")
	cands := w("cands.csv", "Easting,Northing,name\n691050,5335050,x\n690950,5335180,y\n")
	base := []string{"--crs", "EPSG:32632", "--sites", sites, "--area", area, "--no-maps", "--out-crs", "input"}
	for _, c := range []struct {
		name  string
		args  []string
		files []string
	}{
		{"analyze --reach", []string{"analyze", "--range", "90m", "--reach", "2"}, []string{"reach-epsg32632.geojson", "reach-gaps-epsg32632.geojson", "gaps-epsg32632.geojson"}},
		{"suggest", []string{"suggest", "--range", "60m", "--add", "1"}, []string{"sites-epsg32632.geojson", "proposed-devices-epsg32632.geojson", "gaps-before-epsg32632.geojson", "gaps-after-epsg32632.geojson"}},
		{"suggest --candidates", []string{"suggest", "--range", "60m", "--candidates", cands}, []string{"candidates-epsg32632.geojson", "gaps-after-epsg32632.geojson"}},
		{"suggest --reach", []string{"suggest", "--range", "90m", "--reach", "2"}, []string{"reach-added-devices-epsg32632.geojson", "reach-epsg32632.geojson", "reach-gaps-epsg32632.geojson"}},
		{"failures", []string{"failures", "--range", "120m"}, []string{"failures-epsg32632.geojson"}},
		{"assign", []string{"assign", "--points", points}, []string{"assignment-epsg32632.geojson", "device-load-epsg32632.geojson"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, "out", c.name)
			mustRun(t, append(append(c.args, base...), "--out", out)...)
			for _, f := range c.files {
				if _, err := os.Stat(filepath.Join(out, f)); err != nil {
					t.Error(err)
				}
			}
		})
	}
}
