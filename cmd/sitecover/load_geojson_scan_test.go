// The GeoJSON scanner against the reference decoder, encoding/json from
// the Go standard library: every input the scanner accepts must decode to
// the same gjDoc with json.Unmarshal, and every input json.Unmarshal
// rejects must be declined.
//
//	go test -run '^$' -fuzz '^FuzzScanGeoJSON$' -fuzztime 20s ./cmd/sitecover

package main

import (
	"encoding/json"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/sitecover/sitecover/examplesites"
)

// checkScan compares scanGeoJSON with json.Unmarshal on data and returns
// whether the scanner accepted it.
func checkScan(t *testing.T, data []byte) bool {
	t.Helper()
	got, ok := scanGeoJSON(data)
	var want gjDoc
	err := json.Unmarshal(data, &want)
	if !ok {
		return false
	}
	if err != nil {
		t.Fatalf("scanner accepted %q, encoding/json: %v", data, err)
	}
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("scanner and encoding/json differ on %q:\n got %+v\nwant %+v", data, got, want)
	}
	return true
}

func TestScanGeoJSON(t *testing.T) {
	for _, c := range []struct {
		name   string
		in     string
		accept bool
	}{
		{"point", `{"type":"Point","coordinates":[1,2]}`, true},
		{"whitespace everywhere", " \r\n\t{ \"type\" : \"Point\" ,\n\"coordinates\" : [ 1 , 2.5e-3 ] }\n", true},
		{"collection", `{"type":"FeatureCollection","features":[{"type":"Feature","id":7,"properties":{"name":"a\u00e9\"b","x":[{},[]]},"geometry":{"type":"Point","coordinates":[-1.5,2E+2,0]}}]}`, true},
		{"null members", `{"type":null,"features":null,"properties":null,"geometry":null,"geometries":null,"coordinates":null,"id":null}`, true},
		{"empty arrays", `{"type":"FeatureCollection","features":[]}`, true},
		{"empty geometries", `{"type":"GeometryCollection","geometries":[]}`, true},
		{"nested collection", `{"type":"Feature","properties":{},"geometry":{"type":"GeometryCollection","geometries":[{"type":"Point","coordinates":[1,2]},{"type":"GeometryCollection","geometries":[{"type":"MultiPoint","coordinates":[[1,2]]}]}]}}`, true},
		{"unknown members", `{"type":"Point","bbox":[0,0,1,1],"crs":{"a":true,"b":false,"c":null},"coordinates":[1,2],"foreign":"x\\y\/\b\f\n\r\t\u12aB"}`, true},
		{"feature member unknown to features", `{"type":"FeatureCollection","features":[{"type":"Feature","features":5,"coordinates":"x","geometry":null}]}`, true},
		{"raw strings and literals", `{"type":"Feature","properties":{"name":"x","id":-0.0,"exclude":true,"weight":false},"geometry":null}`, true},
		{"invalid utf-8 in a raw value", "{\"type\":\"Feature\",\"properties\":{\"name\":\"\xff\"},\"geometry\":null}", true},

		{"case variant key", `{"Type":"Point","coordinates":[1,2]}`, false},
		{"case variant property", `{"type":"Feature","properties":{"NAME":"x"}}`, false},
		{"escaped non-ASCII key", `{"typ\u017f":"Point"}`, false},
		{"raw non-ASCII key", "{\"t\xc5\xbfpe\":\"Point\"}", false},
		{"escaped key", `{"\u0074ype":"Point"}`, false},
		{"repeated member", `{"type":"Point","type":"MultiPoint"}`, false},
		{"escaped type", `{"type":"Po\u0069nt"}`, false},
		{"non-ASCII type", "{\"type\":\"P\xc3\xb6int\"}", false},
		{"type is a number", `{"type":5}`, false},
		{"features is an object", `{"type":"FeatureCollection","features":{}}`, false},
		{"feature is null", `{"type":"FeatureCollection","features":[null]}`, false},
		{"properties is a string", `{"type":"Feature","properties":"x"}`, false},
		{"geometry is an array", `{"type":"Feature","geometry":[]}`, false},
		{"top level is an array", `[{"type":"Point"}]`, false},
		{"trailing comma", `{"type":"Point","coordinates":[1,2],}`, false},
		{"trailing comma in array", `{"type":"Point","coordinates":[1,2,]}`, false},
		{"leading zero", `{"type":"Point","coordinates":[01,2]}`, false},
		{"bare dot", `{"type":"Point","coordinates":[1.,2]}`, false},
		{"plus sign", `{"type":"Point","coordinates":[+1,2]}`, false},
		{"NaN", `{"type":"Point","coordinates":[NaN,2]}`, false},
		{"empty exponent", `{"type":"Point","coordinates":[1e,2]}`, false},
		{"control character", "{\"type\":\"Point\",\"x\":\"a\tb\"}", false},
		{"bad escape", `{"type":"Point","x":"\q"}`, false},
		{"short unicode escape", `{"type":"Point","x":"\u12"}`, false},
		{"text after the value", `{"type":"Point"} x`, false},
		{"second value", `{"type":"Point"}{}`, false},
		{"unclosed", `{"type":"Point","coordinates":[1,2]`, false},
		{"missing colon", `{"type" "Point"}`, false},
		{"bad literal", `{"type":"Point","x":nul}`, false},
		{"deep nesting", `{"type":"Point","coordinates":` + strings.Repeat("[", 600) + strings.Repeat("]", 600) + `}`, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := checkScan(t, []byte(c.in)); got != c.accept {
				t.Errorf("accepted = %v, want %v", got, c.accept)
			}
		})
	}
}

// TestScanGeoJSONDemo checks the embedded demo files are taken by the
// scanner, not only by the fallback.
func TestScanGeoJSONDemo(t *testing.T) {
	for name, data := range map[string][]byte{
		"sites":      examplesites.SitesGeoJSON(),
		"area":       examplesites.AreaGeoJSON(),
		"buildings":  examplesites.BuildingsGeoJSON(),
		"candidates": examplesites.CandidatesGeoJSON(),
	} {
		if !checkScan(t, data) {
			t.Errorf("%s: the scanner declined the demo file", name)
		}
	}
}

// TestScanGeoJSONMutations compares the scanner with encoding/json on
// 200 000 random edits (JSON tokens and bytes inserted, deleted, replaced)
// of small GeoJSON documents; fixed seed, so a failure reproduces.
func TestScanGeoJSONMutations(t *testing.T) {
	seeds := []string{
		`{"type":"FeatureCollection","features":[{"type":"Feature","id":"f1","properties":{"name":"a","exclude":true},"geometry":{"type":"Point","coordinates":[1.5,-2e3]}}]}`,
		`{"type":"GeometryCollection","geometries":[{"type":"Point","coordinates":[1,2]},{"type":"Polygon","coordinates":[[[0,0],[1,0],[0,1],[0,0]]]}]}`,
		`{"type":"Feature","properties":{"weight":2,"id":3,"x":{"y":[null,true]}},"geometry":null,"bbox":[0,1]}`,
	}
	tokens := []string{"{", "}", "[", "]", ",", ":", `"`, `\`, `\u00e9`, "null", "true", "false", "-", "0", "1", ".", "e", "+",
		" ", "\n", `"type"`, `"Type"`, `"features"`, `"geometry"`, `"properties"`, `"name"`, `"NAME"`, `"geometries"`,
		`"coordinates"`, `"Point"`, `"Feature"`, "\x00", "\xff", "\xc5\xbf"}
	rng := rand.New(rand.NewPCG(7, 11))
	accepted := 0
	for n := 0; n < 200000; n++ {
		b := []byte(seeds[rng.IntN(len(seeds))])
		for range 1 + rng.IntN(3) {
			at := rng.IntN(len(b) + 1)
			switch rng.IntN(3) {
			case 0: // insert a token
				tok := tokens[rng.IntN(len(tokens))]
				b = append(b[:at], append([]byte(tok), b[at:]...)...)
			case 1: // delete a run
				if at < len(b) {
					b = append(b[:at], b[min(len(b), at+1+rng.IntN(4)):]...)
				}
			default: // replace a byte
				if at < len(b) {
					b[at] = byte(rng.IntN(128))
				}
			}
		}
		if checkScan(t, b) {
			accepted++
		}
	}
	if accepted < 1000 {
		t.Errorf("only %d of 200000 edits accepted: the comparison tests too little", accepted)
	}
	t.Logf("%d of 200000 edited documents accepted by the scanner, all equal to encoding/json", accepted)
}

func FuzzScanGeoJSON(f *testing.F) {
	f.Add([]byte(`{"type":"Point","coordinates":[1,2]}`))
	f.Add([]byte(`{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"name":1,"id":"a"},"geometry":{"type":"MultiPoint","coordinates":[[1,2],[3,4,5]]}}]}`))
	f.Add([]byte(`{"type":"GeometryCollection","geometries":[{"type":"Point","coordinates":[1e3,-2.5]},null]}`))
	f.Add([]byte(`{"type":"Feature","properties":{"exclude":true,"weight":2.5,"x":{"y":[null,"\u00e9"]}},"geometry":null}`))
	f.Add([]byte(`{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]],"bbox":[0,0,1,1]}`))
	f.Fuzz(func(t *testing.T, data []byte) { checkScan(t, data) })
}
