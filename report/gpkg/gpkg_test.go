// Tests of the writer and reader on their own: round trips, the
// requirements of OGC 12-128 that SQL can check, refusals, and errors that
// name the file, layer and feature.

package gpkg

import (
	"bytes"
	"database/sql"
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/paulmach/orb"
)

// fixedTime is the last_change of the test files.
var fixedTime = time.Date(2026, 3, 4, 5, 6, 7, 890e6, time.UTC)

// testSite is one feature of the test points layer.
type testSite struct {
	p         orb.Point
	id        string
	n         int64
	r         any // float64 or nil
	ok        bool
	installed string
}

var testSites = []testSite{
	{orb.Point{2.3522, 48.8566}, "north gate", 3, 1.5, true, "2024-05-01"},
	{orb.Point{2.3530, 48.8571}, "hall \"B\"", -7, nil, false, "2023-12-31"},
	{orb.Point{2.3541, 48.8560}, "tower, é", 1 << 40, 0.25, true, "2025-01-02"},
}

var siteFields = []Field{{"id", Text}, {"n", Integer}, {"r", Real}, {"ok", Boolean}, {"installed", Date}, {"seen", DateTime}}

// testAreas are the polygons of the test area layer, in local metres; the
// first is a polygon whose outer ring is left open (the writer closes it),
// the second a multipolygon with a hole.
var testAreas = []orb.Geometry{
	orb.Polygon{{{0, 0}, {100, 0}, {100, 50}, {0, 50}}},
	orb.MultiPolygon{
		{{{200, 0}, {300, 0}, {300, 100}, {200, 100}, {200, 0}}, {{220, 20}, {220, 40}, {240, 40}, {240, 20}, {220, 20}}},
		{{{400, 0}, {410, 0}, {410, 10}, {400, 0}}},
	},
}

// writeTestFile writes the three-layer test file (sites in WGS 84, areas
// in the undefined Cartesian system, a mixed layer) and returns its path.
func writeTestFile(t testing.TB, dir string, index bool) string {
	t.Helper()
	path := filepath.Join(dir, "test.gpkg")
	w, err := Create(path, Options{Time: fixedTime})
	if err != nil {
		t.Fatal(err)
	}
	sites, err := w.AddLayer(LayerSpec{Name: "sites", Description: "devices", Geometry: Point, SRS: WGS84, Fields: siteFields, SpatialIndex: index})
	if err != nil {
		t.Fatal(err)
	}
	areas, err := w.AddLayer(LayerSpec{Name: "areas", Geometry: MultiPolygon, SRS: UndefinedCartesian, Fields: []Field{{"name", Text}}, SpatialIndex: index})
	if err != nil {
		t.Fatal(err)
	}
	mixed, err := w.AddLayer(LayerSpec{Name: "mixed", Geometry: AnyGeometry, SRS: WGS84})
	if err != nil {
		t.Fatal(err)
	}
	// Interleave the layers: each has its own statement in the one transaction.
	for i, s := range testSites {
		if err := sites.Insert(s.p, s.id, s.n, s.r, s.ok, s.installed, fixedTime.Add(time.Duration(i)*time.Hour)); err != nil {
			t.Fatal(err)
		}
		if i < len(testAreas) {
			if err := areas.Insert(testAreas[i], []string{"west", "east"}[i]); err != nil {
				t.Fatal(err)
			}
		}
	}
	for _, g := range []orb.Geometry{orb.LineString{{0, 0}, {1, 1}}, nil, orb.Collection{orb.Point{1, 2}, orb.MultiPoint{{3, 4}}}} {
		if err := mixed.Insert(g); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// closed returns the areas as the reader returns them: multipolygons with
// closed rings.
func closedAreas() []orb.Geometry {
	out := make([]orb.Geometry, len(testAreas))
	for i, g := range testAreas {
		mp, ok := g.(orb.MultiPolygon)
		if !ok {
			p := g.(orb.Polygon)
			ring := append(orb.Ring(nil), p[0]...)
			ring = append(ring, ring[0])
			mp = orb.MultiPolygon{{ring}}
		}
		out[i] = mp
	}
	return out
}

func TestRoundTrip(t *testing.T) {
	for _, index := range []bool{false, true} {
		name := "without R-tree"
		if index {
			name = "with R-tree"
		}
		t.Run(name, func(t *testing.T) {
			r, layers := openLayers(t, writeTestFile(t, t.TempDir(), index))
			var names []string
			for _, l := range layers {
				names = append(names, l.Name+":"+string(l.Geometry))
			}
			if got, want := strings.Join(names, " "), "sites:POINT areas:MULTIPOLYGON mixed:GEOMETRY"; got != want {
				t.Fatalf("layers %q, want %q", got, want)
			}
			t.Run("sites", func(t *testing.T) { checkSites(t, r, layers[0]) })
			t.Run("areas", func(t *testing.T) { checkAreas(t, r, layers[1]) })
			t.Run("mixed", func(t *testing.T) {
				fs, err := r.Features("MIXED") // names match case-insensitively
				if err != nil {
					t.Fatal(err)
				}
				want := []orb.Geometry{orb.LineString{{0, 0}, {1, 1}}, nil, orb.Collection{orb.Point{1, 2}, orb.MultiPoint{{3, 4}}}}
				if len(fs) != len(want) {
					t.Fatalf("%d features, want %d", len(fs), len(want))
				}
				for i, f := range fs {
					if !reflect.DeepEqual(f.Geometry, want[i]) {
						t.Errorf("feature %d: geometry %v, want %v", i, f.Geometry, want[i])
					}
				}
			})
		})
	}
}

// openLayers opens path for the rest of the test and lists its layers.
func openLayers(t *testing.T, path string) (*Reader, []LayerInfo) {
	t.Helper()
	r, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { r.Close() })
	layers, err := r.Layers()
	if err != nil {
		t.Fatal(err)
	}
	return r, layers
}

// boundsAndFeatures checks the layer's bounding box and reads its features.
func boundsAndFeatures(t *testing.T, r *Reader, l LayerInfo, want orb.Bound) []Feature {
	t.Helper()
	if l.Bounds == nil || *l.Bounds != want {
		t.Errorf("bounds %v, want %v", l.Bounds, want)
	}
	fs, err := r.Features(l.Name)
	if err != nil {
		t.Fatal(err)
	}
	return fs
}

func checkSites(t *testing.T, r *Reader, l LayerInfo) {
	if !l.SRS.IsWGS84() || l.SRS != WGS84 || l.RequireWGS84() != nil {
		t.Errorf("SRS %+v, want WGS84", l.SRS)
	}
	if l.Description != "devices" || l.FIDColumn != FIDColumn || l.GeomColumn != GeometryColumn || l.HasZ || l.HasM {
		t.Errorf("layer info %+v", l)
	}
	if !reflect.DeepEqual(l.Fields, siteFields) {
		t.Errorf("fields %v, want %v", l.Fields, siteFields)
	}
	fs := boundsAndFeatures(t, r, l, orb.Bound{Min: orb.Point{2.3522, 48.8560}, Max: orb.Point{2.3541, 48.8571}})
	if len(fs) != len(testSites) {
		t.Fatalf("%d features, want %d", len(fs), len(testSites))
	}
	for i, f := range fs {
		s := testSites[i]
		want := map[string]any{"id": s.id, "n": s.n, "r": s.r, "ok": s.ok, "installed": s.installed,
			"seen": fixedTime.Add(time.Duration(i) * time.Hour).Format(timeLayout)}
		if f.FID != int64(i+1) || f.Geometry != s.p || !reflect.DeepEqual(f.Properties, want) {
			t.Errorf("feature %d: %+v, want fid %d at %v with %v", i, f, i+1, s.p, want)
		}
	}
}

func checkAreas(t *testing.T, r *Reader, l LayerInfo) {
	if l.SRS != UndefinedCartesian {
		t.Errorf("SRS %+v, want undefined Cartesian", l.SRS)
	}
	err := l.RequireWGS84()
	if err == nil || !strings.Contains(err.Error(), `layer "areas": coordinates in srs_id -1 (NONE:-1 "Undefined Cartesian SRS")`) {
		t.Errorf("RequireWGS84 = %v", err)
	}
	fs := boundsAndFeatures(t, r, l, orb.Bound{Min: orb.Point{0, 0}, Max: orb.Point{410, 100}})
	want := closedAreas()
	if len(fs) != len(want) {
		t.Fatalf("%d features, want %d", len(fs), len(want))
	}
	for i, f := range fs {
		if !reflect.DeepEqual(f.Geometry, want[i]) {
			t.Errorf("feature %d: %v, want %v", i, f.Geometry, want[i])
		}
	}
}

// TestSpecRequirements checks with SQL the requirements of OGC 12-128
// (GeoPackage 1.3) that a file's contents show; the numbers are the
// standard's requirement numbers.
func TestSpecRequirements(t *testing.T) {
	path := writeTestFile(t, t.TempDir(), true)
	db, err := sql.Open("sqlite", "file:"+path+"?mode=ro")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	one := func(t *testing.T, q string, args ...any) string {
		t.Helper()
		var s sql.NullString
		if err := db.QueryRow(q, args...).Scan(&s); err != nil {
			t.Fatalf("%s: %v", q, err)
		}
		return s.String
	}
	header, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name, query, want string
	}{
		{"R1 SQLite 3 file", "", ""},
		{"R2 application_id GPKG", "PRAGMA application_id", "1196444487"}, // 0x47504B47
		{"R2 user_version 1.3", "PRAGMA user_version", "10300"},
		{"R6 integrity_check", "PRAGMA integrity_check", "ok"},
		{"R7 foreign_key_check", "SELECT count(*) FROM pragma_foreign_key_check", "0"},
		{"R10 gpkg_spatial_ref_sys", "SELECT count(*) FROM sqlite_master WHERE type = 'table' AND name = 'gpkg_spatial_ref_sys'", "1"},
		{"R11 undefined Cartesian row", "SELECT organization || ' ' || organization_coordsys_id || ' ' || definition FROM gpkg_spatial_ref_sys WHERE srs_id = -1", "NONE -1 undefined"},
		{"R11 undefined geographic row", "SELECT organization || ' ' || organization_coordsys_id || ' ' || definition FROM gpkg_spatial_ref_sys WHERE srs_id = 0", "NONE 0 undefined"},
		{"R11 WGS 84 row", "SELECT organization || ' ' || organization_coordsys_id FROM gpkg_spatial_ref_sys WHERE srs_id = 4326 AND definition LIKE 'GEOGCS[\"WGS 84\"%'", "EPSG 4326"},
		{"R13 gpkg_contents", "SELECT group_concat(table_name || '/' || data_type, ' ') FROM gpkg_contents", "sites/features areas/features mixed/features"},
		{"R14 contents name tables", "SELECT count(*) FROM gpkg_contents c LEFT JOIN sqlite_master m ON m.name = c.table_name WHERE m.name IS NULL", "0"},
		{"R15 last_change form", "SELECT group_concat(DISTINCT last_change) FROM gpkg_contents", "2026-03-04T05:06:07.890Z"},
		{"R14 contents srs defined", "SELECT count(*) FROM gpkg_contents c LEFT JOIN gpkg_spatial_ref_sys s ON s.srs_id = c.srs_id WHERE s.srs_id IS NULL", "0"},
		{"R21 gpkg_geometry_columns", "SELECT group_concat(table_name || '.' || column_name || ':' || geometry_type_name || '@' || srs_id || ':' || z || m, ' ') FROM gpkg_geometry_columns", "sites.geom:POINT@4326:00 areas.geom:MULTIPOLYGON@-1:00 mixed.geom:GEOMETRY@4326:00"},
		{"R23 geometry columns in contents", "SELECT count(*) FROM gpkg_geometry_columns g LEFT JOIN gpkg_contents c ON c.table_name = g.table_name AND c.data_type = 'features' WHERE c.table_name IS NULL", "0"},
		{"R25 R31 column type is geometry_type_name", "SELECT group_concat(t, ' ') FROM (SELECT p.type t FROM gpkg_geometry_columns g JOIN pragma_table_info(g.table_name) p ON p.name = g.column_name ORDER BY g.rowid)", "POINT MULTIPOLYGON GEOMETRY"},
		{"R29 integer primary key", "SELECT group_concat(p.name || ' ' || p.type, ',') FROM gpkg_geometry_columns g JOIN pragma_table_info(g.table_name) p ON p.pk = 1", "fid INTEGER,fid INTEGER,fid INTEGER"},
		{"R33 blob srs_id = column srs_id", "SELECT count(*) FROM sites WHERE substr(geom, 5, 4) != X'E6100000'", "0"},
		{"R146 contents and geometry_columns srs agree", "SELECT count(*) FROM gpkg_contents c JOIN gpkg_geometry_columns g USING (table_name) WHERE c.srs_id != g.srs_id", "0"},
		{"R19 blob magic and flags", "SELECT group_concat(DISTINCT hex(substr(geom, 1, 4))) FROM areas", "47500003"},
		{"R19 point blob without envelope", "SELECT group_concat(DISTINCT hex(substr(geom, 1, 4)) || ' ' || length(geom)) FROM sites", "47500001 29"},
		{"R75 R-tree triggers", "SELECT count(*) FROM sqlite_master WHERE type = 'trigger' AND name GLOB 'rtree_*_geom_*'", "12"},
		{"R78 R-tree extension rows", "SELECT group_concat(table_name || '.' || column_name || ' ' || extension_name || ' ' || scope, ', ') FROM gpkg_extensions", "sites.geom gpkg_rtree_index write-only, areas.geom gpkg_rtree_index write-only"},
		{"R77 R-tree rows", "SELECT (SELECT count(*) FROM rtree_sites_geom) || ' ' || (SELECT count(*) FROM rtree_areas_geom)", "3 2"},
		{"R77 R-tree bounds", "SELECT minx || ' ' || maxx || ' ' || miny || ' ' || maxy FROM rtree_areas_geom WHERE id = 2", "200.0 410.0 0.0 100.0"},
		{"R77 R-tree structure (SQLite rtreecheck)", "SELECT rtreecheck('rtree_sites_geom') || ' ' || rtreecheck('rtree_areas_geom')", "ok ok"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if c.query == "" { // Requirement 1: the SQLite 3 header string
				if !bytes.HasPrefix(header, []byte("SQLite format 3\x00")) {
					t.Fatalf("header %q", header[:16])
				}
				return
			}
			if got := one(t, c.query); got != c.want {
				t.Errorf("%s = %q, want %q", c.query, got, c.want)
			}
		})
	}
}

// TestAwkwardPath: file names with the characters SQLite URIs reserve.
func TestAwkwardPath(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "a dir?x=1#frag%41")
	if err := os.Mkdir(dir, 0o777); err != nil {
		t.Fatal(err)
	}
	path := writeTestFile(t, dir, false)
	if _, err := os.Stat(path); err != nil {
		t.Fatalf("file not where asked: %v", err)
	}
	r, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	if fs, err := r.Features("sites"); err != nil || len(fs) != len(testSites) {
		t.Fatalf("read %d features, %v", len(fs), err)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("folder holds %d entries, want the file alone", len(entries))
	}
}

// TestReproducible: the same features and Options.Time give the same bytes.
func TestReproducible(t *testing.T) {
	a, err := os.ReadFile(writeTestFile(t, t.TempDir(), true))
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(writeTestFile(t, t.TempDir(), true))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Fatal("two writes of the same content differ")
	}
}

// pointWriter creates a file in a new folder with one layer.
func pointWriter(t *testing.T, spec LayerSpec) (string, *Writer, *Layer) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "x.gpkg")
	w, err := Create(path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	l, err := w.AddLayer(spec)
	if err != nil {
		w.Abort()
		t.Fatal(err)
	}
	return path, w, l
}

func TestWriterRefuses(t *testing.T) {
	dir := t.TempDir()
	existing := filepath.Join(dir, "existing.gpkg")
	if err := os.WriteFile(existing, []byte("keep me"), 0o666); err != nil {
		t.Fatal(err)
	}
	t.Run("existing file", func(t *testing.T) {
		_, err := Create(existing, Options{})
		if err == nil || !strings.Contains(err.Error(), "already exists") {
			t.Fatalf("Create over a file: %v", err)
		}
		if b, _ := os.ReadFile(existing); string(b) != "keep me" {
			t.Fatal("existing file changed")
		}
	})
	point := LayerSpec{Name: "p", Geometry: Point, SRS: WGS84, Fields: []Field{{"n", Integer}, {"r", Real}}}
	specCases := []struct {
		name string
		spec LayerSpec
		want string
	}{
		{"reserved prefix", LayerSpec{Name: "gpkg_sites", Geometry: Point, SRS: WGS84}, "reserves"},
		{"empty name", LayerSpec{Geometry: Point, SRS: WGS84}, "layer name is empty"},
		{"same name", LayerSpec{Name: "P", Geometry: Point, SRS: WGS84}, `layer "P" is already in the file`},
		{"bad geometry type", LayerSpec{Name: "q", Geometry: "CIRCULARSTRING", SRS: WGS84}, "geometry type"},
		{"repeated field", LayerSpec{Name: "q", Geometry: Point, SRS: WGS84, Fields: []Field{{"a", Text}, {"A", Text}}}, `field "A" repeats`},
		{"field named fid", LayerSpec{Name: "q", Geometry: Point, SRS: WGS84, Fields: []Field{{"FID", Integer}}}, `field "FID" repeats`},
		{"bad field type", LayerSpec{Name: "q", Geometry: Point, SRS: WGS84, Fields: []Field{{"a", "VARCHAR"}}}, `type "VARCHAR"`},
		{"srs_id redefined", LayerSpec{Name: "q", Geometry: Point, SRS: SRS{ID: 4326, Name: "x", Organization: "EPSG", OrgCoordsysID: 4258, Definition: "x"}}, "already defined"},
	}
	for _, c := range specCases {
		t.Run(c.name, func(t *testing.T) {
			path, w, _ := pointWriter(t, point)
			defer w.Abort()
			_, err := w.AddLayer(c.spec)
			if err == nil || !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), path+": ") {
				t.Fatalf("AddLayer(%+v) = %v, want an error naming the file and containing %q", c.spec, err, c.want)
			}
		})
	}
	insertCases := []struct {
		name   string
		g      orb.Geometry
		values []any
		want   string
	}{
		{"string for INTEGER", orb.Point{1, 2}, []any{"3", 1.0}, `feature 2: field "n": INTEGER column cannot take a Go string`},
		{"NaN REAL", orb.Point{1, 2}, []any{3, math.NaN()}, `field "r": REAL value NaN is not finite`},
		{"NaN coordinate", orb.Point{math.NaN(), 2}, []any{3, 1.0}, "coordinate is NaN or infinite"},
		{"polygon in point layer", orb.Polygon{{{0, 0}, {1, 0}, {0, 1}, {0, 0}}}, []any{3, 1.0}, "geometry orb.Polygon in a POINT layer"},
		{"too few values", orb.Point{1, 2}, []any{3}, "1 values for 2 fields"},
		{"unsupported Go geometry", orb.Bound{}, []any{3, 1.0}, "has no GeoPackage encoding"},
	}
	for _, c := range insertCases {
		t.Run(c.name, func(t *testing.T) {
			path, w, l := pointWriter(t, point)
			if err := l.Insert(orb.Point{0, 0}, 1, 2.5); err != nil {
				t.Fatal(err)
			}
			err := l.Insert(c.g, c.values...)
			if err == nil || !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), path+`: layer "p": `) {
				t.Fatalf("Insert = %v, want an error naming file, layer and containing %q", err, c.want)
			}
			if err2 := l.Insert(orb.Point{0, 0}, 1, 2.5); err2 == nil {
				t.Error("writer accepted a feature after an error")
			}
			if cerr := w.Close(); cerr == nil || !errors.Is(cerr, err) && cerr.Error() != err.Error() {
				t.Errorf("Close after the error = %v, want %v", cerr, err)
			}
			if _, serr := os.Stat(path); !errors.Is(serr, os.ErrNotExist) {
				t.Errorf("file left after a failed write: %v", serr)
			}
		})
	}
}

// rewrite changes a finished test file with SQL, to make broken files.
func rewrite(t *testing.T, path string, stmts ...string) {
	t.Helper()
	db, err := sql.Open("sqlite", path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	for _, s := range stmts {
		if _, err := db.Exec(s); err != nil {
			t.Fatalf("%s: %v", s, err)
		}
	}
}

func TestReaderErrors(t *testing.T) {
	type readCase struct {
		name  string
		setup func(t *testing.T, path string) // makes the file at path
		layer string
		want  string // the whole message after the path
	}
	good := func(t *testing.T, path string) {
		src := writeTestFile(t, t.TempDir(), false)
		b, err := os.ReadFile(src)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, b, 0o666); err != nil {
			t.Fatal(err)
		}
	}
	broken := func(stmts ...string) func(t *testing.T, path string) {
		return func(t *testing.T, path string) {
			good(t, path)
			rewrite(t, path, stmts...)
		}
	}
	cases := []readCase{
		{"missing file", func(*testing.T, string) {}, "", "stat"},
		{"not SQLite", func(t *testing.T, p string) { os.WriteFile(p, []byte("id,lon,lat\n1,2,3\n"), 0o666) }, "", "not a GeoPackage (not an SQLite database"},
		{"SQLite without GeoPackage tables", func(t *testing.T, p string) { rewrite(t, p, "CREATE TABLE t (a)") }, "", `not a GeoPackage (SQLite application_id 0x00000000, not "GPKG"`},
		{"unknown layer", good, "roads", `no feature layer "roads" (layers: "sites", "areas", "mixed")`},
		{"bad magic", broken("UPDATE sites SET geom = X'5850' || substr(geom, 3) WHERE fid = 2"), "sites",
			`layer "sites": feature fid 2: geometry blob does not start with the GeoPackageBinary magic "GP" (found "XP")`},
		{"short blob", broken("UPDATE sites SET geom = X'4750' WHERE fid = 3"), "sites",
			`layer "sites": feature fid 3: geometry blob of 2 bytes is shorter than the 8-byte GeoPackageBinary header`},
		{"truncated WKB", broken("UPDATE areas SET geom = substr(geom, 1, 60) WHERE fid = 2"), "areas",
			`layer "areas": feature fid 2: WKB at byte 9: count 2 does not fit in the 11 bytes left`},
		{"curve geometry", broken("UPDATE mixed SET geom = X'47500001E6100000' || X'01' || X'08000000' || X'00000000' WHERE fid = 1"), "mixed",
			`layer "mixed": feature fid 1: WKB at byte 5: geometry type 8 is not supported`},
		{"blob srs_id differs", broken("UPDATE sites SET geom = substr(geom, 1, 4) || X'E8640000' || substr(geom, 9) WHERE fid = 3"), "sites",
			`layer "sites": feature fid 3: geometry in srs_id 25832, but the layer is in srs_id 4326 (EPSG:4326 "WGS 84 geodetic")`},
		{"srs missing", broken("PRAGMA foreign_keys = OFF", "DELETE FROM gpkg_spatial_ref_sys WHERE srs_id = -1"), "areas",
			`layer "areas": srs_id -1 is not in gpkg_spatial_ref_sys`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "in.gpkg")
			c.setup(t, path)
			r, err := Open(path)
			if err == nil {
				defer r.Close()
				_, err = r.Features(c.layer)
			}
			var ge *Error
			if !errors.As(err, &ge) || ge.File != path {
				t.Fatalf("error %v (%T) is not a *gpkg.Error naming %s", err, err, path)
			}
			if !strings.HasPrefix(err.Error(), path+": ") || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("error %q, want it to contain %q", err, c.want)
			}
		})
	}
}

// TestBlobForms decodes blobs other writers produce: big-endian header
// and WKB, envelope codes 2-4, ISO and extended-WKB Z/M, and empty
// geometries.
func TestBlobForms(t *testing.T) {
	hexBlob := regexp.MustCompile(`\s+`)
	cases := []struct {
		name, blob string
		srs        int32
		want       orb.Geometry
	}{
		{"big-endian point", "47500000 000010E6 00 00000001 3FF0000000000000 4000000000000000", 4326, orb.Point{1, 2}},
		{"ISO point Z with xyz envelope", "47500005 E6100000 " + strings.Repeat("0000000000000000", 6) + "01 E9030000 000000000000F03F 0000000000000040 0000000000000840", 4326, orb.Point{1, 2}},
		{"EWKB point M", "47500001 E6100000 01 01000040 000000000000F03F 0000000000000040 0000000000000840", 4326, orb.Point{1, 2}},
		{"ISO linestring ZM with xyzm envelope", "47500009 FFFFFFFF " + strings.Repeat("0000000000000000", 8) + "01 BA0B0000 01000000 000000000000F03F 0000000000000040 0000000000000840 0000000000001040", -1, orb.LineString{{1, 2}}},
		{"empty polygon", "47500011 E6100000 01 03000000 00000000", 4326, nil},
		{"empty point (NaN)", "47500011 E6100000 01 01000000 000000000000F87F 000000000000F87F", 4326, nil},
		{"NaN point without the empty flag", "47500001 E6100000 01 01000000 000000000000F87F 000000000000F87F", 4326, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			b := mustHex(t, hexBlob.ReplaceAllString(c.blob, ""))
			l := LayerInfo{SRS: SRS{ID: c.srs}}
			g, err := l.decode(b)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(g, c.want) {
				t.Fatalf("decoded %#v, want %#v", g, c.want)
			}
		})
	}
}

func mustHex(t *testing.T, s string) []byte {
	t.Helper()
	b := make([]byte, len(s)/2)
	for i := range b {
		var v byte
		for _, c := range s[2*i : 2*i+2] {
			v <<= 4
			switch {
			case c >= '0' && c <= '9':
				v |= byte(c - '0')
			case c >= 'A' && c <= 'F':
				v |= byte(c - 'A' + 10)
			default:
				t.Fatalf("bad hex %q", s)
			}
		}
		b[i] = v
	}
	return b
}

// FuzzDecodeBlob: no blob makes the decoder panic or allocate beyond its
// length, and what the encoder writes decodes to itself.
func FuzzDecodeBlob(f *testing.F) {
	for _, g := range append(closedAreas(), orb.Point{1, 2}, orb.Collection{orb.LineString{{0, 0}, {1, 1}}}) {
		b, _, err := appendBlob(nil, g, 4326)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		h, err := parseHeader(b)
		if err != nil {
			return
		}
		g, err := decodeWKB(h.wkb)
		if err != nil || g == nil {
			return
		}
		if _, isPoint := g.(orb.Point); isPoint && h.empty {
			return
		}
		// One round closes open rings; from then on a round is exact.
		g2 := roundTrip(t, g, h.srsID)
		if g2 == nil {
			return // NaN coordinates are refused by the writer
		}
		if g3 := roundTrip(t, g2, h.srsID); !reflect.DeepEqual(g2, g3) {
			t.Fatalf("re-encoded %v decodes to %v", g2, g3)
		}
	})
}

// roundTrip encodes and decodes g; nil when the encoder refuses it.
func roundTrip(t *testing.T, g orb.Geometry, srsID int32) orb.Geometry {
	b, _, err := appendBlob(nil, g, srsID)
	if err != nil {
		return nil
	}
	h, err := parseHeader(b)
	if err != nil {
		t.Fatal(err)
	}
	g2, err := decodeWKB(h.wkb)
	if err != nil {
		t.Fatal(err)
	}
	return g2
}
