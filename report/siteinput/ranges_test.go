// Tests of per-device ranges: the range column and property, the type
// tables, the common default and every refusal of ranges.go.

package siteinput

import (
	"errors"
	"slices"
	"strings"
	"testing"
)

// planarSquare is a 400 m square area in local metres.
const planarSquare = `{"type":"Polygon","coordinates":[[[-100,-100],[300,-100],[300,300],[-100,300],[-100,-100]]]}`

// loadRanges loads planar sites with the square area.
func loadRanges(sites string, in Inputs) (*Scene, error) {
	name := "sites.csv"
	if strings.HasPrefix(strings.TrimSpace(sites), "{") {
		name = "sites.geojson"
	}
	in.Sites = src(name, sites)
	a := src("area.geojson", planarSquare)
	in.Area = &a
	in.Planar = true
	return Load(in)
}

func TestRanges(t *testing.T) {
	table, err := ParseTypeRanges([]string{"gateway=150m", "Sensor = 0.04km"}, "--type-range")
	if err != nil {
		t.Fatal(err)
	}
	file, err := LoadRangeTable(src("types.csv", "type;range\ngateway;150 m\nsensor;40\n"))
	if err != nil {
		t.Fatal(err)
	}
	ft := 0.3048 // metres per foot, multiplied at run time as ParseLength does
	cases := []struct {
		name, sites string
		in          Inputs
		ranges      []float64
		common      float64
		types       []string
	}{
		{"CSV range column with units", "x,y,range\n0,0,150m\n100,0,40\n0,100,0.04km\n", Inputs{},
			[]float64{150, 40, 40}, 0, nil},
		{"empty cell takes --range", "x,y,range\n0,0,150m\n100,0,\n0,100,40\n", Inputs{Range: 60},
			[]float64{150, 60, 40}, 60, nil},
		{"all equal: no per-device ranges", "x,y,range_m\n0,0,150\n100,0,150m\n0,100,0.15km\n", Inputs{},
			nil, 150, nil},
		{"type column with --type-range, case and spaces ignored", "x,y,type\n0,0,gateway\n100,0, SENSOR\n0,100,sensor\n",
			Inputs{TypeRanges: table}, []float64{150, 40, 40}, 0, []string{"gateway", "SENSOR", "sensor"}},
		{"type column with a range table file", "x,y,device_type\n0,0,gateway\n100,0,sensor\n0,100,sensor\n",
			Inputs{TypeRanges: file}, []float64{150, 40, 40}, 0, []string{"gateway", "sensor", "sensor"}},
		{"type column without a table: types only", "x,y,type\n0,0,gateway\n100,0,sensor\n0,100,sensor\n",
			Inputs{Range: 80}, nil, 80, []string{"gateway", "sensor", "sensor"}},
		{"GeoJSON range number and string, MultiPoint shares", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"range":150,"type":"gateway"},"geometry":{"type":"Point","coordinates":[0,0]}},
			{"type":"Feature","properties":{"range":"131.234ft"},"geometry":{"type":"MultiPoint","coordinates":[[100,0],[0,100]]}},
			{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[100,100]}}]}`,
			Inputs{Range: 20}, []float64{150, 131.234 * ft, 131.234 * ft, 20}, 20, []string{"gateway", "", "", ""}},
		{"no range source: the common range", "x,y\n0,0\n100,0\n0,100\n", Inputs{Range: 70}, nil, 70, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sc, err := loadRanges(c.sites, c.in)
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(sc.Ranges, c.ranges) || sc.Range != c.common || !slices.Equal(sc.Types, c.types) {
				t.Errorf("ranges %v (common %g) types %q, want %v (%g) %q", sc.Ranges, sc.Range, sc.Types, c.ranges, c.common, c.types)
			}
		})
	}
}

func TestRangesRefused(t *testing.T) {
	table, _ := ParseTypeRanges([]string{"gateway=150m"}, "--type-range")
	cases := []struct {
		name, sites string
		in          Inputs
		want        []string
	}{
		{"unparseable", "x,y,range\n0,0,150m\n100,0,far\n0,100,40\n", Inputs{}, []string{"sites.csv line 3", `"far"`}},
		{"zero", "x,y,range\n0,0,0\n100,0,40\n0,100,40\n", Inputs{}, []string{"sites.csv line 2", "greater than 0"}},
		{"negative", "x,y,range\n0,0,40\n100,0,-5m\n0,100,40\n", Inputs{}, []string{"line 3", `"-5m"`, "greater than 0"}},
		{"NaN", "x,y,range\n0,0,40\n100,0,NaN\n0,100,40\n", Inputs{}, []string{"line 3", "NaN", "not a positive number"}},
		{"unknown unit", "name,x,y,range\na,0,0,40\nb,100,0,40yd\nc,0,100,40\n", Inputs{}, []string{`line 3 ("b")`, `unknown unit "yd"`}},
		{"out of bounds", "x,y,range\n0,0,40\n100,0,2000km\n0,100,40\n", Inputs{}, []string{"line 3", "between 1 mm and 1000 km"}},
		{"empty cell without --range", "x,y,range\n0,0,40\n100,0,\n0,100,40\n", Inputs{}, []string{"line 3", "no range"}},
		{"type not in the table", "x,y,type\n0,0,gateway\n100,0,siren\n0,100,gateway\n", Inputs{TypeRanges: table},
			[]string{"line 3", `type "siren" has no range in --type-range`, "gateway"}},
		{"table without a type column", "x,y\n0,0\n100,0\n0,100\n", Inputs{TypeRanges: table}, []string{"--type-range", "no type column"}},
		{"range column and a table", "x,y,range,type\n0,0,40,gateway\n100,0,40,gateway\n0,100,40,gateway\n", Inputs{TypeRanges: table},
			[]string{"range column", "--type-range", "two range sources"}},
		{"GeoJSON range not a length", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"range":true},"geometry":{"type":"Point","coordinates":[0,0]}}]}`, Inputs{},
			[]string{"sites.geojson feature 0", "range true"}},
		{"GeoJSON range zero", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"name":"g","range":0},"geometry":{"type":"Point","coordinates":[0,0]}}]}`, Inputs{},
			[]string{`feature 0 ("g")`, "greater than 0"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := loadRanges(c.sites, c.in)
			var ie *Error
			if !errors.As(err, &ie) {
				t.Fatalf("error %v, want an *Error", err)
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not mention %q", err, w)
				}
			}
		})
	}
	t.Run("no range anywhere", func(t *testing.T) {
		if _, err := loadRanges("x,y\n0,0\n100,0\n0,100\n", Inputs{RangeRequired: true}); !errors.Is(err, ErrNoRange) {
			t.Errorf("error %v, want ErrNoRange", err)
		}
	})
}

func TestTypeTablesRefused(t *testing.T) {
	for _, c := range []struct {
		name string
		vals []string
		want string
	}{
		{"no equals sign", []string{"gateway 150m"}, "TYPE=LENGTH"},
		{"empty type", []string{"=150m"}, "TYPE=LENGTH"},
		{"bad length", []string{"gateway=fast"}, `--type-range gateway "fast"`},
		{"conflicting", []string{"gateway=150m", "GATEWAY=100m"}, "given twice"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := ParseTypeRanges(c.vals, "--type-range"); err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want it to mention %q", err, c.want)
			}
		})
	}
	for _, c := range []struct{ name, data, want string }{
		{"missing columns", "kind,metres\na,1\n", "needs the columns type and range"},
		{"bad range", "type,range\na,1\nb,0\n", "types.csv line 3: range"},
		{"no types", "type,range\n", "no types"},
	} {
		t.Run("file "+c.name, func(t *testing.T) {
			if _, err := LoadRangeTable(src("types.csv", c.data)); err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want it to mention %q", err, c.want)
			}
		})
	}
}
