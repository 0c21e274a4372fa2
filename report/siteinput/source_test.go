package siteinput

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/report/gpkg"
)

// TestReadFileChecksum checks Source.Sum against crypto/sha256 over the
// whole file, as sha256sum computes it: for a CSV file with a byte order
// mark (the mark is dropped from Data but counted in the checksum), for
// GeoJSON, and for a GeoPackage (read through its own handle and
// converted, so Data is not the file).
func TestReadFileChecksum(t *testing.T) {
	dir := t.TempDir()
	write := func(name, content string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	cases := []struct{ name, path string }{
		{"csv with a byte order mark", write("sites.csv", "\xef\xbb\xbfx,y\r\n1,2\r\n3,4\r\n")},
		{"geojson", write("sites.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[7.1,45.2]}}]}`)},
		{"geopackage", writeOnePointLayer(t, filepath.Join(dir, "sites.gpkg"))},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			src, err := ReadFile(c.path, "--sites")
			if err != nil {
				t.Fatal(err)
			}
			data, err := os.ReadFile(c.path)
			if err != nil {
				t.Fatal(err)
			}
			d := sha256.Sum256(data)
			want := Checksum{Bytes: int64(len(data)), SHA256: hex.EncodeToString(d[:])}
			if src.Sum != want {
				t.Errorf("Sum = %+v, want %+v", src.Sum, want)
			}
		})
	}
}

// writeOnePointLayer writes a GeoPackage with one layer of two points in
// WGS84 to path and returns path.
func writeOnePointLayer(t *testing.T, path string) string {
	t.Helper()
	w, err := gpkg.Create(path, gpkg.Options{})
	if err != nil {
		t.Fatal(err)
	}
	l, err := w.AddLayer(gpkg.LayerSpec{Name: "devices", Geometry: gpkg.Point, SRS: gpkg.WGS84})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range []orb.Point{{7.1, 45.2}, {7.2, 45.3}} {
		if err := l.Insert(p); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}
