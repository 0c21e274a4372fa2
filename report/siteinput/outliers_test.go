// Swapped latitude/longitude and stray inputs (issue 11): the message
// names the line or feature instead of only "area too large".

package siteinput

import (
	"fmt"
	"strings"
	"testing"
)

func TestSwappedAndFarInputs(t *testing.T) {
	berlin := func(swapLine int, extra string) string {
		var b strings.Builder
		b.WriteString("name,lat,lon\n")
		for i := 2; i <= 21; i++ {
			lat, lon := 52.50+0.001*float64(i), 13.40+0.0007*float64(i*i%17)
			if i == swapLine {
				lat, lon = lon, lat
			}
			fmt.Fprintf(&b, "s%d,%.6f,%.6f\n", i, lat, lon)
		}
		return b.String() + extra
	}
	square := `{"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[[[%[1]s],[%[2]s],[%[3]s],[%[4]s],[%[1]s]]]}}`
	areaLonLat := fmt.Sprintf(square, "13.39,52.49", "13.43,52.49", "13.43,52.53", "13.39,52.53")
	areaLatLon := fmt.Sprintf(square, "52.49,13.39", "52.49,13.43", "52.53,13.43", "52.53,13.39")
	geo := `{"type":"FeatureCollection","features":[
		{"type":"Feature","properties":{"name":"a"},"geometry":{"type":"Point","coordinates":[13.40,52.52]}},
		{"type":"Feature","properties":{"name":"b"},"geometry":{"type":"Point","coordinates":[13.41,52.52]}},
		{"type":"Feature","properties":{"name":"c"},"geometry":{"type":"Point","coordinates":[13.40,52.53]}},
		{"type":"Feature","properties":{"name":"d"},"geometry":{"type":"Point","coordinates":[52.525,13.405]}}]}`
	cases := []struct {
		name       string
		sites      Source
		area       string
		want, not_ []string
	}{
		{"one swapped CSV line", src("s.csv", berlin(7, "")), areaLonLat,
			[]string{`s.csv line 7 ("s7") lies`, "latitude and longitude swapped? read the other way round it lies", "correct or remove it", "too large for one local plane"}, []string{"split the site"}},
		{"one swapped GeoJSON feature", src("s.geojson", geo), "",
			[]string{`s.geojson feature 3 ("d") lies`, "swapped?"}, nil},
		{"far site, not swapped", src("s.csv", berlin(0, "sydney,-33.87,151.21\n")), areaLonLat,
			[]string{`s.csv line 22 ("sydney") lies 16`, "km from the other sites"}, []string{"swapped"}},
		{"swapped area", src("s.csv", berlin(0, "")), areaLatLon,
			[]string{"a.geojson feature 0 reaches", "latitude and longitude swapped? read the other way round it lies among them"}, nil},
		{"latitude valid only swapped", src("s.csv", "lat,lon\n52.5,13.4\n120.5,13.4\n"), "",
			[]string{"s.csv line 3: latitude 120.5 is outside -90..90 (latitude and longitude swapped?"}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := Inputs{Sites: c.sites}
			if c.area != "" {
				a := src("a.geojson", c.area)
				in.Area = &a
			}
			_, err := Load(in)
			if err == nil {
				t.Fatal("accepted")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%q lacks %q", err, w)
				}
			}
			for _, w := range c.not_ {
				if strings.Contains(err.Error(), w) {
					t.Errorf("%q holds %q", err, w)
				}
			}
		})
	}
}
