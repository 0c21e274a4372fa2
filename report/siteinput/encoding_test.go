// Text encodings of issue 11: Windows-1252 and UTF-16 exports are decoded
// with a warning, a UTF-8 byte order mark is skipped, and no invalid UTF-8
// survives into a name.

package siteinput

import (
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/paulmach/orb"
)

func TestTextEncodings(t *testing.T) {
	cases := []struct {
		name, data string
		names      []string
		warn       string // "" for none
	}{
		{"UTF-8", "name;lat;lon\nGebäude Süd;52,5;13,4\n", []string{"Gebäude Süd"}, ""},
		{"UTF-8 byte order mark", "\xef\xbb\xbfname,lat,lon\nÅby,52.5,13.4\n", []string{"Åby"}, ""},
		{"Windows-1252", "name;lat;lon\nGeb\xe4ude S\xfcd \x80;52,5;13,4\n", []string{"Gebäude Süd €"}, "s.csv: read as Windows-1252, the usual European spreadsheet export (line 2 is not UTF-8)"},
		{"Windows-1252, undefined byte", "name,lat,lon\nx\x81y,52.5,13.4\n", []string{"x\uFFFDy"}, "bytes undefined in Windows-1252 are replaced by U+FFFD"},
		{"UTF-8 with one bad byte", "name,lat,lon\nGebäude\xff,52.5,13.4\n", []string{"Gebäude\uFFFD"}, "s.csv: not valid UTF-8 at line 2; the invalid bytes are replaced by U+FFFD"},
		{"UTF-16 LE", utf16le("\ufeffname,lat,lon\nÉcole,52.5,13.4\n"), []string{"École"}, "s.csv: read as UTF-16 (little-endian"},
		{"UTF-16 BE", utf16be("\ufeffname,lat,lon\nÉcole,52.5,13.4\n"), []string{"École"}, "s.csv: read as UTF-16 (big-endian"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d, warn, err := decodeText(src("s.csv", c.data))
			if err != nil {
				t.Fatal(err)
			}
			if !utf8.Valid(d.Data) {
				t.Errorf("decoded data is not UTF-8: %q", d.Data)
			}
			if c.warn == "" && warn != "" || !strings.Contains(warn, c.warn) {
				t.Errorf("warning %q, want %q", warn, c.warn)
			}
			s, err := loadSites(d, false)
			checkSites(t, s, err, []orb.Point{{13.4, 52.5}}, c.names)
		})
	}
	// GeoJSON in Windows-1252: the property is decoded the same way.
	t.Run("GeoJSON in Windows-1252", func(t *testing.T) {
		sc, err := Load(Inputs{Sites: src("s.geojson", `{"type":"FeatureCollection","features":[`+
			`{"type":"Feature","properties":{"name":"Caf`+"\xe9"+`"},"geometry":{"type":"Point","coordinates":[13.4,52.5]}},`+
			`{"type":"Feature","properties":{"name":"b"},"geometry":{"type":"Point","coordinates":[13.41,52.5]}},`+
			`{"type":"Feature","properties":{"name":"c"},"geometry":{"type":"Point","coordinates":[13.4,52.51]}}]}`)})
		if err != nil {
			t.Fatal(err)
		}
		if sc.Names[0] != "Café" || len(sc.Warnings) == 0 || !strings.Contains(sc.Warnings[0], "Windows-1252") {
			t.Errorf("names %q, warnings %q", sc.Names, sc.Warnings)
		}
	})
}

// utf16le and utf16be encode s (Basic Multilingual Plane only).
func utf16le(s string) string {
	var b strings.Builder
	for _, r := range s {
		b.WriteByte(byte(r))
		b.WriteByte(byte(r >> 8))
	}
	return b.String()
}

func utf16be(s string) string {
	var b strings.Builder
	for _, r := range s {
		b.WriteByte(byte(r >> 8))
		b.WriteByte(byte(r))
	}
	return b.String()
}
