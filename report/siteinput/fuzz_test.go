// Fuzz targets: the readers return a value or an error for any input, never
// panic, and every accepted coordinate passes the coordinate check.
//
//	go test -run '^$' -fuzz '^FuzzLoadSites$' -fuzztime 20s ./report/siteinput
//	go test -run '^$' -fuzz '^FuzzLoadArea$' -fuzztime 20s ./report/siteinput

package siteinput

import (
	"math"
	"testing"

	"github.com/sitecover/sitecover/examplesites"
)

func FuzzLoadSites(f *testing.F) {
	f.Add([]byte("lat,lon\n1,2\n"), false, true)
	f.Add([]byte("x;y\n1,5;2\n"), true, true)
	f.Add([]byte(`{"type":"Point","coordinates":[1,2]}`), false, false)
	f.Add([]byte(`{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"name":1},"geometry":{"type":"MultiPoint","coordinates":[[1,2],[3,4,5]]}}]}`), false, false)
	f.Add(examplesites.SitesGeoJSON(), false, false)
	f.Add(examplesites.SitesCSV(), false, true)
	f.Fuzz(func(t *testing.T, data []byte, planarInput, csv bool) {
		name := "s.geojson"
		if csv {
			name = "s.csv"
		}
		s, err := loadSites(Source{Name: name, Data: data}, planarInput)
		if err != nil {
			return
		}
		if len(s.Pts) == 0 || len(s.Pts) != len(s.Names) {
			t.Fatalf("%d sites, %d names", len(s.Pts), len(s.Names))
		}
		for i, p := range s.Pts {
			if pr := coordProblem(planarInput, p[0], p[1]); pr != "" || math.IsNaN(p[0]) {
				t.Fatalf("site %d %v accepted: %s", i, p, pr)
			}
		}
	})
}

func FuzzLoadArea(f *testing.F) {
	f.Add([]byte(`{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]]}`), true)
	f.Add(examplesites.AreaGeoJSON(), false)
	f.Fuzz(func(t *testing.T, data []byte, planarInput bool) {
		polys, err := loadArea(Source{Name: "a.geojson", Data: data}, planarInput, false)
		if err != nil {
			return
		}
		for _, p := range polys {
			for _, r := range p.Rings {
				for _, q := range r {
					if pr := coordProblem(planarInput, q[0], q[1]); pr != "" {
						t.Fatalf("vertex %v accepted: %s", q, pr)
					}
				}
			}
		}
		// Assembling must not panic either.
		buildArea(polys)
	})
}

// FuzzEarlyCheck: the early check of ReadFile refuses nothing the loader
// accepts, whether it sees the whole file or only a prefix.
//
//	go test -run '^$' -fuzz '^FuzzEarlyCheck$' -fuzztime 20s ./report/siteinput
func FuzzEarlyCheck(f *testing.F) {
	f.Add([]byte("lat,lon\n1,2\n"), true, uint16(5))
	f.Add([]byte("name;x;y\na;1,5;2\n\n"), true, uint16(9))
	f.Add([]byte("WKT\n\"POINT (1 2)\"\n"), true, uint16(0))
	f.Add([]byte(`{"type":"Point","coordinates":[1,2]}`), false, uint16(12))
	f.Add(examplesites.SitesCSV(), true, uint16(300))
	f.Add([]byte("name,lat,lon\n\"two\nlines\",1,2\n"), true, uint16(20))
	f.Fuzz(func(t *testing.T, data []byte, csv bool, cut uint16) {
		name := "s.geojson"
		if csv {
			name = "s.csv"
		}
		src := Source{Name: name, Data: data}
		_, errG := loadSites(src, false)
		_, errP := loadSites(src, true)
		if errG != nil && errP != nil {
			return
		}
		if err := earlyCheck(src, true); err != nil {
			t.Fatalf("whole file refused early but loaded: %v", err)
		}
		n := min(int(cut), len(data))
		if err := earlyCheck(Source{Name: name, Data: data[:n]}, false); err != nil {
			t.Fatalf("prefix of %d bytes refused early but the file loads: %v", n, err)
		}
	})
}
