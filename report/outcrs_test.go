// Tests of the layers in a projected system (outcrs.go): the output
// points against PROJ, and the copies' files and crs member.

package report

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report/siteinput"
)

// gridTol is the largest distance allowed between a written grid point
// and PROJ's: the 1 mm rounding moves a point by at most 0.5·√2 mm, and
// the Krüger series of both sides agree to nanometres.
const gridTol = 1e-3

func TestGridPointsAgainstPROJ(t *testing.T) {
	// Reference: PROJ's cs2cs (Debian proj-bin), EPSG:4326 (latitude,
	// longitude) to the grid, on the unrounded longitude/latitude of each
	// local-plane point; our written point must be within gridTol.
	if _, err := exec.LookPath("cs2cs"); err != nil {
		msg := "reference tool cs2cs unavailable (" + err.Error() + "); install proj-bin"
		if os.Getenv("SITECOVER_LIVE") == "1" {
			t.Fatal(msg)
		}
		t.Skip(msg)
	}
	// northFirst: the EPSG axis order, which cs2cs prints, is northing
	// then easting.
	for _, c := range []struct {
		name, code string
		lon, lat   float64
		northFirst bool
	}{
		{"UTM 32N in Munich", "EPSG:32632", 11.5, 48.1, false},
		{"UTM 33S, far from the central meridian", "EPSG:32733", 17.9, -33.9, false},
		{"SWEREF99 TM", "EPSG:3006", 18.07, 59.33, true},
		{"NZTM2000", "EPSG:2193", 174.78, -41.29, true},
		{"Portugal TM06", "EPSG:3763", -9.14, 38.72, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			crs, err := siteinput.ParseCRS(c.code)
			if err != nil {
				t.Fatal(err)
			}
			tm, err := planar.NewLocalPlane([]orb.Point{{c.lon, c.lat}, {c.lon + 0.02, c.lat + 0.02}})
			if err != nil {
				t.Fatal(err)
			}
			s := newScene(nil, nil, Meta{ToLonLat: tm.Inverse, OutCRS: crs})
			s.grid = &gridOutput{crs: crs, toLonLat: tm.Inverse}
			var pts []orb.Point
			for i := range 9 {
				for j := range 9 {
					pts = append(pts, orb.Point{-2000 + 500*float64(i) + 0.1234567*float64(j), -2000 + 500*float64(j) + 0.7654321*float64(i)})
				}
			}
			worst := 0.0
			for k, ref := range cs2csPoints(t, tm, c.code, pts) {
				e, n := ref[0], ref[1]
				if c.northFirst {
					e, n = n, e
				}
				g := s.point(pts[k])
				worst = max(worst, math.Hypot(g[0]-e, g[1]-n))
			}
			if worst > gridTol {
				t.Errorf("largest distance to PROJ %.3g m, want ≤ %g", worst, gridTol)
			}
		})
	}
}

func TestGridCopies(t *testing.T) {
	// WriteCells with OutCRS writes the two layers once more, named by
	// the code, with the crs member, x/y point fields and grid
	// coordinates; they are listed by Files.
	tm, err := planar.NewLocalPlane([]orb.Point{{11.5, 48.1}})
	if err != nil {
		t.Fatal(err)
	}
	crs, _ := siteinput.ParseCRS("EPSG:32632")
	sites := []orb.Point{{0, 0}, {100, 0}, {0, 100}, {100, 100}}
	an := analyze(t, sites, region(t, square(100)), 60)
	m := Meta{ToLonLat: tm.Inverse, OutCRS: crs}
	dir := t.TempDir()
	written, err := WriteCells(dir, an.Layout, m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	files := Files(true, m, Options{})
	for _, want := range []string{"sites-epsg32632.geojson", "service-areas-epsg32632.geojson"} {
		if !strings.Contains(strings.Join(files, " "), want) || !strings.Contains(strings.Join(written, " "), want) {
			t.Errorf("%s not in Files %v or written %v", want, files, written)
		}
		b, err := os.ReadFile(filepath.Join(dir, want))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.HasPrefix(b, []byte(`{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::32632"}},"features":[`)) {
			t.Errorf("%s: no crs member: %.120s", want, b)
		}
		if bytes.Contains(b, []byte("_lon")) || bytes.Contains(b, []byte("local plane")) {
			t.Errorf("%s: longitude fields or the local-plane note in a grid layer", want)
		}
	}
	// The first site at the local origin is at the grid position of the
	// plane's origin.
	lon, lat := tm.Inverse(0, 0)
	e, n := crs.FromLonLat(lon, lat)
	b, _ := os.ReadFile(filepath.Join(dir, "sites-epsg32632.geojson"))
	want := fmt.Sprintf(`"coordinates":[%s,%s]`, trimNum(round(e, 3)), trimNum(round(n, 3)))
	if !bytes.Contains(b, []byte(want)) {
		t.Errorf("sites-epsg32632.geojson has no %s:\n%.300s", want, b)
	}
}

// trimNum formats v as the layers do.
func trimNum(v float64) string { return string(appendNum(nil, v)) }
