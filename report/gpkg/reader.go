// Reading a GeoPackage: Open checks that a file is a GeoPackage, Layers
// lists its feature layers (gpkg_contents rows of data_type 'features'
// joined with gpkg_geometry_columns and gpkg_spatial_ref_sys), and
// ReadLayer decodes a layer's rows one at a time into orb geometries and
// attribute maps.
//
// Attribute values come back as Go values by the column's declared type
// (OGC 12-128 Table 1): BOOLEAN → bool; TINYINT, SMALLINT, MEDIUMINT, INT,
// INTEGER → int64; FLOAT, DOUBLE, REAL → float64; TEXT, TEXT(n), DATE,
// DATETIME → string (dates as stored); BLOB → []byte; NULL → nil. A value
// stored with another SQLite type than its column declares (SQLite allows
// it) is returned as stored.

package gpkg

import (
	"database/sql"
	"errors"
	"fmt"
	"math"
	"os"
	"strings"

	"github.com/paulmach/orb"
)

// Error is a problem with a GeoPackage being read; it names the file and,
// where known, the layer and the feature's fid.
type Error struct {
	File   string
	Layer  string // "" when the problem is with the file as a whole
	FID    int64
	HasFID bool // FID is set
	Err    error
}

// Error formats e as "file: layer "name": feature fid 7: problem".
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Layer != "" {
		fmt.Fprintf(&b, ": layer %q", e.Layer)
	}
	if e.HasFID {
		fmt.Fprintf(&b, ": feature fid %d", e.FID)
	}
	b.WriteString(": ")
	b.WriteString(e.Err.Error())
	return b.String()
}

// Unwrap returns the underlying error.
func (e *Error) Unwrap() error { return e.Err }

// Reader reads one GeoPackage file.
type Reader struct {
	path string
	db   *sql.DB
}

// LayerInfo describes one feature layer of a file.
type LayerInfo struct {
	File        string
	Name        string
	Description string
	Geometry    GeometryType // declared geometry_type_name, e.g. POINT or MULTIPOLYGON
	GeomColumn  string       // geometry column name
	FIDColumn   string       // integer primary key column name
	SRS         SRS          // the layer's coordinate reference system
	HasZ, HasM  bool         // z or m declared (read and dropped by ReadLayer)
	Fields      []Field      // attribute columns, in table order, with declared types as written (e.g. MEDIUMINT, TEXT(20))
	// Bounds is the gpkg_contents bounding box; nil when the file gives
	// none.
	Bounds *orb.Bound
}

// Feature is one row of a layer.
type Feature struct {
	FID int64
	// Geometry is nil for a NULL or empty geometry. Z and M values are
	// dropped.
	Geometry   orb.Geometry
	Properties map[string]any // by field name; see the package comment for the Go types
}

// geoPackageIDs are the application_id values of GeoPackage versions:
// "GPKG" (1.2 and later), "GP11" (1.1), "GP10" (1.0).
var geoPackageIDs = map[uint32]bool{0x47504B47: true, 0x47503131: true, 0x47503130: true}

// Open opens the GeoPackage at path for reading; path must exist.
func Open(path string) (*Reader, error) {
	fail := func(err error) (*Reader, error) { return nil, &Error{File: path, Err: err} }
	st, err := os.Stat(path)
	if err != nil {
		return fail(err)
	}
	if !st.Mode().IsRegular() {
		return fail(errors.New("not a regular file"))
	}
	uri, err := sqliteURI(path)
	if err != nil {
		return fail(err)
	}
	db, err := sql.Open("sqlite", uri+"?mode=ro")
	if err != nil {
		return fail(err)
	}
	r := &Reader{path: path, db: db}
	if err := r.check(); err != nil {
		db.Close()
		return fail(err)
	}
	return r, nil
}

// check refuses files that are not GeoPackages with feature tables.
func (r *Reader) check() error {
	var appID int64
	if err := r.db.QueryRow("PRAGMA application_id").Scan(&appID); err != nil {
		return fmt.Errorf("not a GeoPackage (not an SQLite database: %v)", err)
	}
	var n int
	err := r.db.QueryRow(`SELECT count(*) FROM sqlite_master WHERE type IN ('table', 'view') AND name IN ('gpkg_contents', 'gpkg_geometry_columns', 'gpkg_spatial_ref_sys')`).Scan(&n)
	if err != nil {
		return fmt.Errorf("not a GeoPackage (%v)", err)
	}
	if n != 3 {
		if !geoPackageIDs[uint32(appID)] {
			return fmt.Errorf("not a GeoPackage (SQLite application_id 0x%08X, not \"GPKG\", and tables gpkg_contents, gpkg_geometry_columns, gpkg_spatial_ref_sys missing)", uint32(appID))
		}
		return errors.New("GeoPackage without feature tables (gpkg_contents, gpkg_geometry_columns or gpkg_spatial_ref_sys missing)")
	}
	return nil
}

// Close closes the file.
func (r *Reader) Close() error { return r.db.Close() }

// Layers lists the feature layers in the order of gpkg_contents.
func (r *Reader) Layers() ([]LayerInfo, error) {
	rows, err := r.db.Query(`
SELECT c.table_name, COALESCE(c.description, ''), g.column_name, g.geometry_type_name, g.srs_id, g.z, g.m,
       c.min_x, c.min_y, c.max_x, c.max_y,
       s.srs_id, COALESCE(s.srs_name, ''), COALESCE(s.organization, ''), COALESCE(s.organization_coordsys_id, 0),
       COALESCE(s.definition, ''), COALESCE(s.description, '')
FROM gpkg_contents c
JOIN gpkg_geometry_columns g ON g.table_name = c.table_name
LEFT JOIN gpkg_spatial_ref_sys s ON s.srs_id = g.srs_id
WHERE c.data_type = 'features'
ORDER BY c.rowid`)
	if err != nil {
		return nil, &Error{File: r.path, Err: err}
	}
	defer rows.Close()
	var out []LayerInfo
	for rows.Next() {
		l := LayerInfo{File: r.path}
		var geomType string
		var z, m int
		var minX, minY, maxX, maxY sql.NullFloat64
		var srsFound sql.NullInt64
		if err := rows.Scan(&l.Name, &l.Description, &l.GeomColumn, &geomType, &l.SRS.ID, &z, &m,
			&minX, &minY, &maxX, &maxY,
			&srsFound, &l.SRS.Name, &l.SRS.Organization, &l.SRS.OrgCoordsysID, &l.SRS.Definition, &l.SRS.Description); err != nil {
			return nil, &Error{File: r.path, Layer: l.Name, Err: err}
		}
		if !srsFound.Valid {
			return nil, &Error{File: r.path, Layer: l.Name, Err: fmt.Errorf("srs_id %d is not in gpkg_spatial_ref_sys", l.SRS.ID)}
		}
		l.Geometry = GeometryType(strings.ToUpper(geomType))
		l.HasZ, l.HasM = z != 0, m != 0
		if minX.Valid && minY.Valid && maxX.Valid && maxY.Valid {
			l.Bounds = &orb.Bound{Min: orb.Point{minX.Float64, minY.Float64}, Max: orb.Point{maxX.Float64, maxY.Float64}}
		}
		out = append(out, l)
	}
	if err := rows.Err(); err != nil {
		return nil, &Error{File: r.path, Err: err}
	}
	for i := range out {
		if err := r.columns(&out[i]); err != nil {
			return nil, &Error{File: r.path, Layer: out[i].Name, Err: err}
		}
	}
	return out, nil
}

// columns fills in the fid column and the attribute fields of l.
func (r *Reader) columns(l *LayerInfo) error {
	rows, err := r.db.Query("PRAGMA table_info(" + quoteIdent(l.Name) + ")")
	if err != nil {
		return err
	}
	defer rows.Close()
	type column struct {
		name, typ string
		pk        int
	}
	var cols []column
	for rows.Next() {
		var c column
		var cid, notNull int
		var dflt sql.NullString
		if err := rows.Scan(&cid, &c.name, &c.typ, &notNull, &dflt, &c.pk); err != nil {
			return err
		}
		cols = append(cols, c)
	}
	if err := rows.Err(); err != nil {
		return err
	}
	if len(cols) == 0 {
		return errors.New("listed in gpkg_contents but no such table or view")
	}
	for _, c := range cols {
		if c.pk == 1 && valueClass(c.typ) == classInteger {
			l.FIDColumn = c.name
		}
	}
	if l.FIDColumn == "" { // a view: its first column is the id (Requirement 150)
		if valueClass(cols[0].typ) != classInteger {
			return fmt.Errorf("no INTEGER PRIMARY KEY column (first column %q is %s)", cols[0].name, cols[0].typ)
		}
		l.FIDColumn = cols[0].name
	}
	foundGeom := false
	for _, c := range cols {
		switch {
		case strings.EqualFold(c.name, l.GeomColumn):
			foundGeom = true
		case c.name != l.FIDColumn:
			l.Fields = append(l.Fields, Field{Name: c.name, Type: FieldType(strings.ToUpper(c.typ))})
		}
	}
	if !foundGeom {
		return fmt.Errorf("geometry column %q registered in gpkg_geometry_columns is not in the table", l.GeomColumn)
	}
	return nil
}

// Value classes of declared column types.
const (
	classOther = iota
	classInteger
	classBoolean
	classReal
	classText
	classDate // DATE or DATETIME: read as the stored text
	classBlob
)

// valueClass maps a declared column type to how its values are returned.
func valueClass(typ string) int {
	t := strings.ToUpper(strings.TrimSpace(typ))
	if i := strings.IndexByte(t, '('); i >= 0 {
		t = strings.TrimSpace(t[:i])
	}
	switch t {
	case "BOOLEAN":
		return classBoolean
	case "TINYINT", "SMALLINT", "MEDIUMINT", "INT", "INTEGER":
		return classInteger
	case "FLOAT", "DOUBLE", "REAL":
		return classReal
	case "TEXT":
		return classText
	case "DATE", "DATETIME":
		return classDate
	case "BLOB":
		return classBlob
	}
	return classOther
}

// Layer returns the description of the named layer (matched
// case-insensitively, as SQLite matches table names).
func (r *Reader) Layer(name string) (LayerInfo, error) {
	layers, err := r.Layers()
	if err != nil {
		return LayerInfo{}, err
	}
	var names []string
	for _, l := range layers {
		if strings.EqualFold(l.Name, name) {
			return l, nil
		}
		names = append(names, fmt.Sprintf("%q", l.Name))
	}
	if len(names) == 0 {
		return LayerInfo{}, &Error{File: r.path, Err: fmt.Errorf("no feature layer %q: the file has no feature layers", name)}
	}
	return LayerInfo{}, &Error{File: r.path, Err: fmt.Errorf("no feature layer %q (layers: %s)", name, strings.Join(names, ", "))}
}

// RequireWGS84 returns an error naming the layer's coordinate reference
// system unless it is EPSG:4326 (WGS 84 longitude/latitude), for callers
// that take only that.
func (l LayerInfo) RequireWGS84() error {
	if l.SRS.IsWGS84() {
		return nil
	}
	return &Error{File: l.File, Layer: l.Name, Err: fmt.Errorf("coordinates in %s, not WGS 84 longitude/latitude (EPSG:4326)", l.SRS)}
}

// ReadLayer calls fn with each feature of the named layer in fid order;
// an error from fn stops the reading and is returned. The Feature's
// Properties map is new for each call.
func (r *Reader) ReadLayer(name string, fn func(Feature) error) error {
	l, err := r.Layer(name)
	if err != nil {
		return err
	}
	sel := []string{quoteIdent(l.FIDColumn), quoteIdent(l.GeomColumn)}
	classes := make([]int, len(l.Fields))
	for i, f := range l.Fields {
		classes[i] = valueClass(string(f.Type))
		if classes[i] == classDate { // as stored, not as the driver's time.Time
			sel = append(sel, "CAST("+quoteIdent(f.Name)+" AS TEXT)")
		} else {
			sel = append(sel, quoteIdent(f.Name))
		}
	}
	rows, err := r.db.Query("SELECT " + strings.Join(sel, ", ") + " FROM " + quoteIdent(l.Name) + " ORDER BY " + quoteIdent(l.FIDColumn))
	if err != nil {
		return &Error{File: r.path, Layer: l.Name, Err: err}
	}
	defer rows.Close()
	var fid sql.NullInt64
	var blob sql.RawBytes
	vals := make([]any, len(l.Fields))
	dest := make([]any, 2+len(vals))
	dest[0], dest[1] = &fid, &blob
	for i := range vals {
		dest[2+i] = &vals[i]
	}
	for rows.Next() {
		if err := rows.Scan(dest...); err != nil {
			return &Error{File: r.path, Layer: l.Name, Err: err}
		}
		if !fid.Valid {
			return &Error{File: r.path, Layer: l.Name, Err: fmt.Errorf("row with NULL %s", l.FIDColumn)}
		}
		f := Feature{FID: fid.Int64, Properties: make(map[string]any, len(vals))}
		if f.Geometry, err = l.decode(blob); err != nil {
			return &Error{File: r.path, Layer: l.Name, FID: f.FID, HasFID: true, Err: err}
		}
		for i, v := range vals {
			f.Properties[l.Fields[i].Name] = normalize(classes[i], v)
		}
		if err := fn(f); err != nil {
			return err
		}
	}
	if err := rows.Err(); err != nil {
		return &Error{File: r.path, Layer: l.Name, Err: err}
	}
	return nil
}

// Features reads the whole named layer into memory (ReadLayer streams).
func (r *Reader) Features(name string) ([]Feature, error) {
	var out []Feature
	err := r.ReadLayer(name, func(f Feature) error {
		out = append(out, f)
		return nil
	})
	return out, err
}

// decode turns a geometry blob of layer l into a geometry (nil for NULL
// or empty, flagged so or a point with NaN coordinates), checking its srs_id against the layer's.
func (l *LayerInfo) decode(blob []byte) (orb.Geometry, error) {
	if blob == nil {
		return nil, nil
	}
	h, err := parseHeader(blob)
	if err != nil {
		return nil, err
	}
	if h.srsID != l.SRS.ID {
		return nil, fmt.Errorf("geometry in srs_id %d, but the layer is in %s (Requirement 33: they must agree)", h.srsID, l.SRS)
	}
	g, err := decodeWKB(h.wkb)
	if err != nil {
		return nil, err
	}
	if p, ok := g.(orb.Point); h.empty || ok && math.IsNaN(p[0]) && math.IsNaN(p[1]) {
		return nil, nil // empty; WKB writes an empty point as NaN, NaN
	}
	return g, nil
}

// normalize converts a driver value to the Go type of its column class.
func normalize(class int, v any) any {
	switch class {
	case classBoolean:
		if i, ok := v.(int64); ok {
			return i != 0
		}
	case classReal:
		if i, ok := v.(int64); ok {
			return float64(i)
		}
	}
	return v
}
