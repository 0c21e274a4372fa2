// CSV export forms of issue 11: the common header names, WKT point
// columns, header-less files and the list of accepted names.

package siteinput

import (
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func TestCSVExportHeaders(t *testing.T) {
	cases := []struct {
		name, data string
		planar     bool
		want       []orb.Point
		names      []string
	}{
		{"long", "name,lat,long\na,52.5,13.4\n", false, []orb.Point{{13.4, 52.5}}, []string{"a"}},
		{"lng", "lng;lat\n13,4;52,5\n", false, []orb.Point{{13.4, 52.5}}, []string{""}},
		{"Easting/Northing planar", "Easting,Northing,id\n391000.5,5820000.25,7\n", true, []orb.Point{{391000.5, 5820000.25}}, []string{"7"}},
		{"POINT_X/POINT_Y planar", "OBJECTID,POINT_X,POINT_Y\n1,10.5,20.5\n", true, []orb.Point{{10.5, 20.5}}, []string{""}},
		{"WKT lon/lat", "WKT,name\n\"POINT (13.4 52.5)\",a\n\"POINT(13.5 52.6)\",b\n", false, []orb.Point{{13.4, 52.5}, {13.5, 52.6}}, []string{"a", "b"}},
		{"WKT wins over x/y when geographic", "WKT,X,Y\n\"POINT (13.4 52.5)\",13.4,52.5\n", false, []orb.Point{{13.4, 52.5}}, []string{""}},
		{"geometry column, POINT Z, planar", "geometry;name\nPOINT Z (1 2 3);p\n", true, []orb.Point{{1, 2}}, []string{"p"}},
		{"wkt_geom, EWKT with SRID", "wkt_geom\tid\nSRID=4326;point(13.4 52.5)\tq\n", false, []orb.Point{{13.4, 52.5}}, []string{"q"}},
		{"the_geom, POINT M", "the_geom\nPOINT M (5 6 7)\n", true, []orb.Point{{5, 6}}, []string{""}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := loadSites(src("s.csv", c.data), c.planar)
			checkSites(t, s, err, c.want, c.names)
		})
	}
}

func TestCSVHeaderRefusals(t *testing.T) {
	every := []string{"lat", "latitude", "lon", "long", "lng", "longitude", "x", "point_x", "easting",
		"y", "point_y", "northing", "wkt", "wkt_geom", "geometry", "geom", "the_geom"}
	cases := []struct {
		name, data string
		planar     bool
		want       []string
		listsAll   bool
	}{
		{"no header line", "52.5,13.4\n52.6,13.5\n", false, []string{"s.csv line 1: holds numbers, not column names"}, true},
		{"no header line, semicolons", "1;2;3\n", true, []string{"s.csv line 1: holds numbers"}, true},
		{"unknown columns", "alpha,beta\n1,2\n", false, []string{`found "alpha", "beta"`, "no lat/lon or x/y column"}, true},
		{"Easting/Northing, geographic", "Easting,Northing\n391000,5820000\n", false, []string{"line 1: needs lat and lon columns", "Easting/Northing are metres", "--planar"}, true},
		{"WKT not a point", "WKT\n\"LINESTRING (0 0, 1 1)\"\n", true, []string{"s.csv line 2: WKT \"LINESTRING (0 0, 1 1)\" is not a POINT"}, false},
		{"WKT empty point", "WKT\nPOINT EMPTY\n", true, []string{"s.csv line 2: WKT \"POINT EMPTY\" is empty"}, false},
		{"WKT word", "WKT\nPOINT (1 east)\n", true, []string{"s.csv line 2", `coordinate "east" is not a number`}, false},
		{"WKT latitude out of range", "WKT\nPOINT (52.5 95)\n", false, []string{"s.csv line 2: latitude 95 is outside -90..90"}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := loadSites(src("s.csv", c.data), c.planar)
			if err == nil {
				t.Fatal("accepted")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%q lacks %q", err, w)
				}
			}
			if c.listsAll {
				for _, n := range every {
					if !strings.Contains(err.Error(), " "+n) {
						t.Errorf("%q does not list %q", err, n)
					}
				}
			}
		})
	}
}
