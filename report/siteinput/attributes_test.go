// Tests of the sites' own attributes (attributes.go): which columns and
// properties are attributes, their order, types and values, and that a
// properties member that is not an object is still refused with its line.

package siteinput

import (
	"encoding/json"
	"fmt"
	"reflect"
	"strings"
	"testing"
)

// attrSummary writes attributes as "name:TYPE=v0|v1|..." lines.
func attrSummary(attrs []Attribute) string {
	var b strings.Builder
	for _, a := range attrs {
		fmt.Fprintf(&b, "%s:%s=", a.Name, a.Type)
		for i, v := range a.Values {
			if i > 0 {
				b.WriteByte('|')
			}
			if v == nil {
				b.WriteString("nil")
				continue
			}
			fmt.Fprintf(&b, "%v(%s)", v, reflect.TypeOf(v))
		}
		b.WriteByte('\n')
	}
	return b.String()
}

func TestSiteAttributes(t *testing.T) {
	cases := []struct {
		name, file, data string
		want             string
	}{
		{"CSV: every column not read, as text", "s.csv",
			"id,name,lat,lon,floor,owner,range,type,,asset id\n" +
				"A1,North,44.001,8.001,3,ACME,90m,x,e,007\nA2,South,44,8,,Bob,90m,y,f,008\n",
			"id:TEXT=A1(string)|A2(string)\nfloor:TEXT=3(string)|(string)\nowner:TEXT=ACME(string)|Bob(string)\n" +
				":TEXT=e(string)|f(string)\nasset id:TEXT=007(string)|008(string)\n"},
		{"CSV: id gave the name, x/y unused are kept", "s.csv",
			"ID,lat,lon,x,y\n7,1,2,300,400\n",
			"x:TEXT=300(string)\ny:TEXT=400(string)\n"},
		{"CSV: nothing extra", "s.csv", "name,lat,lon\na,1,2\n", ""},
		{"GeoJSON: typed, in order of first appearance", "s.geojson", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"name":"a","floor":3,"h":2.5,"ok":true,"owner":"ACME","tags":["x",1],"o":{"k":[1, 2]}},"geometry":{"type":"Point","coordinates":[8,44]}},
{"type":"Feature","properties":{"name":"b","floor":-4,"h":3,"ok":false,"owner":7,"late":null,"new":"n"},"geometry":{"type":"Point","coordinates":[8.001,44]}},
{"type":"Feature","properties":null,"geometry":{"type":"Point","coordinates":[8.002,44]}}]}`,
			"floor:INTEGER=3(int64)|-4(int64)|nil\nh:REAL=2.5(float64)|3(float64)|nil\nok:BOOLEAN=true(bool)|false(bool)|nil\n" +
				"owner:TEXT=ACME(string)|7(string)|nil\ntags:TEXT=[\"x\",1](string)|nil|nil\no:TEXT={\"k\":[1,2]}(string)|nil|nil\n" +
				"late:TEXT=nil|nil|nil\nnew:TEXT=nil|n(string)|nil\n"},
		{"GeoJSON: id kept beside a name, dropped when it is the name", "s.geojson", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"name":"a","id":"Q1","range":80,"type":"s"},"geometry":{"type":"Point","coordinates":[8,44]}},
{"type":"Feature","properties":{"id":"Q2"},"geometry":{"type":"Point","coordinates":[8.001,44]}}]}`,
			"id:TEXT=Q1(string)|nil\n"},
		{"GeoJSON: a MultiPoint's positions share the attributes; a repeated member counts once", "s.geojson", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"k":1,"k":2},"geometry":{"type":"MultiPoint","coordinates":[[8,44],[8.001,44]]}},
{"type":"Feature","properties":{"k":1.5},"geometry":{"type":"Point","coordinates":[8.002,44]}}]}`,
			"k:REAL=2(float64)|2(float64)|1.5(float64)\n"},
		{"GeoJSON: integer beyond int64 is real", "s.geojson", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"n":12345678901234567890},"geometry":{"type":"Point","coordinates":[8,44]}}]}`,
			"n:REAL=1.2345678901234567e+19(float64)\n"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := loadSites(src(c.file, c.data), false)
			if err != nil {
				t.Fatal(err)
			}
			if got := attrSummary(s.attrs.finish(len(s.Pts))); got != c.want {
				t.Errorf("attributes:\n%s\nwant:\n%s", got, c.want)
			}
		})
	}
}

func TestPropertiesNotObjectKeepsLine(t *testing.T) {
	// Decoding the properties generically must not lose the line of a
	// properties member that is not an object.
	data := "{\"type\":\"FeatureCollection\",\"features\":[\n" +
		"{\"type\":\"Feature\",\"properties\":{},\"geometry\":{\"type\":\"Point\",\"coordinates\":[8,44]}},\n" +
		"{\"type\":\"Feature\",\"properties\":5,\"geometry\":{\"type\":\"Point\",\"coordinates\":[8,44]}}]}"
	_, err := loadSites(src("s.geojson", data), false)
	want := `s.geojson line 3: not GeoJSON: member "features.properties" is a JSON number, expected an object`
	if err == nil || err.Error() != want {
		t.Errorf("error %v, want %s", err, want)
	}
}

func TestGeoPackageRealStaysReal(t *testing.T) {
	// A whole REAL value keeps its decimal point on the way through
	// GeoJSON, so the column is typed real (geopackage.go).
	for _, c := range []struct {
		name string
		v    any
		want string
	}{
		{"whole real", 2.0, "2.0"}, {"fraction", 2.5, "2.5"}, {"large", 1e21, "1e+21"},
		{"integer", int64(3), "3"}, {"text", "a\"b", `"a\"b"`}, {"null", nil, "null"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := string(appendGpkgValue(nil, c.v)); got != c.want {
				t.Errorf("%v → %s, want %s", c.v, got, c.want)
			}
		})
	}
}

func TestEachMember(t *testing.T) {
	// The member scanner against encoding/json on tricky objects.
	for _, c := range []struct{ name, obj, want string }{
		{"empty", `{}`, ""},
		{"spaces", " {\n \"a\" :\t1 ,\r\n\"b\":[1,{\"c\":\"]}\"}] } ", `a=1;b=[1,{"c":"]}"}];`},
		{"escaped key and value", `{"a\"b\\":"x\"}","\u00e9":true,"n":null,"o":{"k":[]},"e":-1.5e3}`, `a"b\="x\"}";é=true;n=null;o={"k":[]};e=-1.5e3;`},
	} {
		t.Run(c.name, func(t *testing.T) {
			var b strings.Builder
			eachMember([]byte(strings.TrimSpace(c.obj)), func(k string, v json.RawMessage) { fmt.Fprintf(&b, "%s=%s;", k, v) })
			if b.String() != c.want {
				t.Errorf("got %s, want %s", b.String(), c.want)
			}
		})
	}
}

func TestCSVRepeatedHeader(t *testing.T) {
	// Two columns of one name stay two attributes (report renames the
	// second).
	s, err := loadSites(src("s.csv", "lat,lon,a,a\n1,2,x,y\n3,4,z,w\n"), false)
	if err != nil {
		t.Fatal(err)
	}
	want := "a:TEXT=x(string)|z(string)\na:TEXT=y(string)|w(string)\n"
	if got := attrSummary(s.attrs.finish(len(s.Pts))); got != want {
		t.Errorf("attributes:\n%s\nwant:\n%s", got, want)
	}
}
