// Unit tests of the input readers: CSV header variants and delimiters,
// GeoJSON object forms and names, area rings and exclusion flags.

package siteinput

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func src(name, data string) Source { return Source{Name: name, Data: []byte(data)} }

func TestCSVHeaderVariants(t *testing.T) {
	// Column names are matched case-insensitively (issue 4 lists lat,
	// latitude, lon, lng, longitude, x, y, name, id).
	cases := []struct {
		name, data string
		planar     bool
		want       []orb.Point
		names      []string
	}{
		{"lat,lon", "lat,lon\n51.5,-0.12\n51.6,-0.13\n", false, []orb.Point{{-0.12, 51.5}, {-0.13, 51.6}}, []string{"", ""}},
		{"Latitude,Longitude", "Latitude,Longitude,name\n10,20,a\n", false, []orb.Point{{20, 10}}, []string{"a"}},
		{"LON first, LNG", "name,LNG,LAT\nb,20,10\n", false, []orb.Point{{20, 10}}, []string{"b"}},
		{"spaces in header", " id , lat , longitude \nS1, 10 , 20\n", false, []orb.Point{{20, 10}}, []string{"S1"}},
		{"id used when no name", "ID,Lon,Lat\n7,1,2\n", false, []orb.Point{{1, 2}}, []string{"7"}},
		{"name preferred over id", "id,name,lat,lon\n7,gate,2,1\n", false, []orb.Point{{1, 2}}, []string{"gate"}},
		{"semicolon, decimal comma", "lat;lon;name\n51,5;-0,12;a\n", false, []orb.Point{{-0.12, 51.5}}, []string{"a"}},
		{"tab", "x\ty\n1.5\t2.5\n", true, []orb.Point{{1.5, 2.5}}, []string{""}},
		{"X,Y planar", "Name,X,Y\nA,100,200\nB,-5,0\n", true, []orb.Point{{100, 200}, {-5, 0}}, []string{"A", "B"}},
		{"quoted fields, blank lines", "\"lat\",\"lon\"\n\n\"1\",\"2\"\n\n", false, []orb.Point{{2, 1}}, []string{""}},
		{"extra columns ignored", "elev,lat,colour,lon\n5,1,red,2\n", false, []orb.Point{{2, 1}}, []string{""}},
		{"CRLF", "lat,lon\r\n1,2\r\n3,4\r\n", false, []orb.Point{{2, 1}, {4, 3}}, []string{"", ""}},
		{"lat/lon and x/y: geographic uses lat/lon", "lat,lon,x,y\n1,2,300,400\n", false, []orb.Point{{2, 1}}, []string{""}},
		{"lat/lon and x/y: planar uses x/y", "lat,lon,x,y\n1,2,300,400\n", true, []orb.Point{{300, 400}}, []string{""}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := loadSites(src("s.csv", c.data), c.planar)
			checkSites(t, s, err, c.want, c.names)
		})
	}
}

// checkSites checks loaded sites against the wanted positions and names,
// in order.
func checkSites(t *testing.T, s *siteSet, err error, want []orb.Point, names []string) {
	t.Helper()
	if err != nil {
		t.Error(err)
		return
	}
	if len(s.Pts) != len(want) {
		t.Errorf("%d sites, want %d", len(s.Pts), len(want))
		return
	}
	for i := range want {
		if s.Pts[i] != want[i] || s.Names[i] != names[i] {
			t.Errorf("site %d = %v %q, want %v %q", i, s.Pts[i], s.Names[i], want[i], names[i])
		}
	}
}

func TestGeoJSONSiteForms(t *testing.T) {
	cases := []struct {
		name, data string
		want       []orb.Point
		names      []string
	}{
		{"collection", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"name":"a"},"geometry":{"type":"Point","coordinates":[1,2]}},
			{"type":"Feature","properties":{"id":17},"geometry":{"type":"Point","coordinates":[3,4,99]}},
			{"type":"Feature","id":"f3","properties":null,"geometry":{"type":"Point","coordinates":[5,6]}}]}`,
			[]orb.Point{{1, 2}, {3, 4}, {5, 6}}, []string{"a", "17", "f3"}},
		{"multipoint", `{"type":"Feature","properties":{"name":"row"},"geometry":{"type":"MultiPoint","coordinates":[[1,2],[3,4]]}}`,
			[]orb.Point{{1, 2}, {3, 4}}, []string{"row#1", "row#2"}},
		{"bare geometry", `{"type":"Point","coordinates":[7,8]}`, []orb.Point{{7, 8}}, []string{""}},
		{"geometry collection", `{"type":"Feature","properties":{},"geometry":{"type":"GeometryCollection","geometries":[
			{"type":"Point","coordinates":[1,1]},{"type":"MultiPoint","coordinates":[[2,2]]}]}}`,
			[]orb.Point{{1, 1}, {2, 2}}, []string{"", ""}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := loadSites(src("s.geojson", c.data), false)
			checkSites(t, s, err, c.want, c.names)
		})
	}
}

func TestFormatSniffing(t *testing.T) {
	// No telling extension: JSON starts with '{', anything else is CSV.
	cases := []struct {
		name, file, data string
		wantErr          string // "" for a file read as one site
	}{
		{"CSV without .csv", "sites.txt", "lat,lon\n1,2\n", ""},
		{"GeoJSON without extension", "sites", `{"type":"Point","coordinates":[1,2]}`, ""},
		{"binary", "sites.dat", "\x89PNG\r\n\x1a\n\x00\x00", "not GeoJSON or CSV"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := loadSites(src(c.file, c.data), false)
			switch {
			case c.wantErr == "" && (err != nil || len(s.Pts) != 1):
				t.Errorf("got %v, want one site", err)
			case c.wantErr != "" && (err == nil || !strings.Contains(err.Error(), c.wantErr)):
				t.Errorf("error %v, want one containing %q", err, c.wantErr)
			}
		})
	}
}

func TestAreaExcludeAndRings(t *testing.T) {
	area := `{"type":"FeatureCollection","features":[
	 {"type":"Feature","properties":{"name":"Park"},"geometry":{"type":"Polygon","coordinates":[
	   [[0,0],[100,0],[100,100],[0,100],[0,0]],
	   [[10,10],[20,10],[20,20],[10,10]]]}},
	 {"type":"Feature","properties":{"exclude":true,"name":"Pond"},"geometry":{"type":"Polygon","coordinates":[[[50,50],[60,50],[60,60],[50,50]]]}},
	 {"type":"Feature","properties":{"exclude":false},"geometry":{"type":"MultiPolygon","coordinates":[[[[200,0],[300,0],[300,100]]]]}}]}`
	polys, err := loadArea(src("a.geojson", area), true, false)
	if err != nil {
		t.Fatal(err)
	}
	if len(polys) != 3 || polys[0].Exclude || !polys[1].Exclude || polys[2].Exclude {
		t.Fatalf("polygons %+v", polys)
	}
	if polys[0].Name != "Park" || len(polys[0].Rings) != 2 || polys[2].Where != "a.geojson feature 2 polygon 0" {
		t.Errorf("names/rings: %q %d %q", polys[0].Name, len(polys[0].Rings), polys[2].Where)
	}
	// Park (100×100 less the 50 m² triangle hole) less the Pond triangle
	// (50 m²), and the separate 5 000 m² triangle: elementary geometry.
	reg, note, warn, err := buildArea(polys)
	if err != nil {
		t.Fatal(err)
	}
	if reg.NumPolygons() != 2 || len(warn) != 0 || note != "" {
		t.Errorf("assembled %d polygons, note %q, warnings %v", reg.NumPolygons(), note, warn)
	}
	if a := reg.Area(); math.Abs(a-(10000-50-50+5000)) > 1e-9 {
		t.Errorf("area %v, want 14900", a)
	}
	// The whole file as exclusions (the --exclude file).
	ex, err := loadArea(src("x.geojson", area), true, true)
	if err != nil || !ex[0].Exclude || !ex[2].Exclude {
		t.Errorf("excludeAll: %v", err)
	}
}
