// Writing a GeoPackage: Create makes the file (never over an existing
// one), AddLayer adds feature tables, Layer.Insert streams features into
// them and Close completes the file (bounding boxes in gpkg_contents,
// R-tree indexes packed and written with their triggers, commit, fsync).
//
// Everything happens in one SQLite transaction with the rollback journal
// off and without fsync per page: the file is not meant to be read before
// Close returns, and on any failure the writer removes it, so a half
// written GeoPackage is never left at the path. Close syncs the finished
// file to disk once. Each feature is one execution of a prepared INSERT,
// so memory stays flat however many features are written (the geometry
// blob is built in a buffer reused per layer); only an indexed layer keeps
// 24 bytes per feature for its R-tree until Close (rtree.go).

package gpkg

import (
	"database/sql"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"time"

	"github.com/paulmach/orb"
	_ "modernc.org/sqlite" // registers the pure-Go "sqlite" database/sql driver
)

// GeometryType is the geometry_type_name of a layer (OGC 12-128 Annex E,
// the core types).
type GeometryType string

// The geometry types a layer can declare.
const (
	Point              GeometryType = "POINT"
	LineString         GeometryType = "LINESTRING"
	Polygon            GeometryType = "POLYGON"
	MultiPoint         GeometryType = "MULTIPOINT"
	MultiLineString    GeometryType = "MULTILINESTRING"
	MultiPolygon       GeometryType = "MULTIPOLYGON"
	GeometryCollection GeometryType = "GEOMETRYCOLLECTION"
	// AnyGeometry lets a layer mix geometry types.
	AnyGeometry GeometryType = "GEOMETRY"
)

// FieldType is the SQL type of an attribute column (OGC 12-128 Table 1).
type FieldType string

// The attribute column types the writer offers, with the Go values each
// takes (nil is NULL in every type):
const (
	Text     FieldType = "TEXT"     // string
	Integer  FieldType = "INTEGER"  // any Go integer type (uint64 up to MaxInt64)
	Real     FieldType = "REAL"     // float64, float32 or any integer; finite
	Boolean  FieldType = "BOOLEAN"  // bool, stored as 0 or 1
	Date     FieldType = "DATE"     // time.Time (its date) or a "2006-01-02" string
	DateTime FieldType = "DATETIME" // time.Time (in UTC, ms) or a "2006-01-02T15:04:05.000Z" string
)

// TypeOf chooses the column type for a Go value (as Field.Type): string →
// Text, integers → Integer, floats → Real, bool → Boolean, time.Time →
// DateTime. It reports false for nil and other types.
func TypeOf(v any) (FieldType, bool) {
	switch v.(type) {
	case string:
		return Text, true
	case int, int8, int16, int32, int64, uint, uint8, uint16, uint32, uint64:
		return Integer, true
	case float64, float32:
		return Real, true
	case bool:
		return Boolean, true
	case time.Time:
		return DateTime, true
	}
	return "", false
}

// Field is one attribute column of a layer.
type Field struct {
	Name string
	Type FieldType
}

// LayerSpec describes a feature layer to create.
type LayerSpec struct {
	Name        string       // table name; also the identifier shown by a GIS
	Description string       // gpkg_contents description (optional)
	Geometry    GeometryType // declared type; Polygon values are promoted in a MultiPolygon layer, Point in MultiPoint, LineString in MultiLineString
	SRS         SRS          // WGS84, UndefinedCartesian or a caller-defined system
	Fields      []Field      // attribute columns in order, after fid and geom
	// SpatialIndex adds an R-tree index (extension gpkg_rtree_index),
	// which lets a GIS draw a part of a big layer without scanning it.
	SpatialIndex bool
}

// Options are the settings of Create.
type Options struct {
	// Time is stored as every layer's last_change; the zero value means
	// the time of Create. A fixed Time makes the file byte-for-byte
	// reproducible from the same features.
	Time time.Time
}

// Writer writes one GeoPackage file. Its methods are not safe for
// concurrent use.
type Writer struct {
	path     string
	db       *sql.DB
	tx       *sql.Tx
	stamp    string // last_change, '%Y-%m-%dT%H:%M:%fZ'
	layers   []*Layer
	srs      map[int32]SRS
	hasExt   bool  // gpkg_extensions created
	done     bool  // closed or aborted
	complete bool  // Close succeeded: the file stays
	failure  error // first error; after it only Abort or Close (which cleans up) remain
}

// Layer streams features into one table of a Writer.
type Layer struct {
	w     *Writer
	spec  LayerSpec
	stmt  *sql.Stmt
	index *rtreeEntries // envelopes for the R-tree, nil without one
	args  []any
	buf   []byte
	n     int64 // features written = last fid
	env   envelope
}

// timeLayout is the form of last_change and of DATETIME values
// (Requirement 15: '%Y-%m-%dT%H:%M:%fZ' in SQLite strftime terms).
const timeLayout = "2006-01-02T15:04:05.000Z"

// dateLayout is the form of DATE values.
const dateLayout = "2006-01-02"

// Create creates the GeoPackage file path, which must not exist, with the
// required tables and rows and no layers yet.
func Create(path string, opt Options) (*Writer, error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o666)
	if err != nil {
		if errors.Is(err, os.ErrExist) {
			return nil, fmt.Errorf("%s: already exists; a GeoPackage is only written as a new file", path)
		}
		return nil, err
	}
	f.Close() // an empty file is an empty SQLite database
	t := opt.Time
	if t.IsZero() {
		t = time.Now()
	}
	w := &Writer{path: path, stamp: t.UTC().Format(timeLayout), srs: map[int32]SRS{}}
	if err := w.init(); err != nil {
		w.Abort()
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return w, nil
}

// sqliteURI turns a file path into an SQLite URI filename (which the
// driver passes on unchanged), escaping the characters URIs reserve.
func sqliteURI(path string) (string, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return "", err
	}
	esc := strings.NewReplacer("%", "%25", "?", "%3f", "#", "%23").Replace(filepath.ToSlash(abs))
	return "file:" + esc, nil
}

// writePragmas set up the connection for one bulk transaction: no rollback
// journal and no fsync per commit (Close syncs the finished file; a failed
// write removes it).
var writePragmas = []string{
	"PRAGMA journal_mode=OFF",
	"PRAGMA synchronous=OFF",
	fmt.Sprintf("PRAGMA application_id=%d", ApplicationID),
	fmt.Sprintf("PRAGMA user_version=%d", UserVersion),
}

func (w *Writer) init() error {
	uri, err := sqliteURI(w.path)
	if err != nil {
		return err
	}
	if w.db, err = sql.Open("sqlite", uri); err != nil {
		return err
	}
	w.db.SetMaxOpenConns(1) // the pragmas above hold per connection
	for _, p := range writePragmas {
		if _, err := w.db.Exec(p); err != nil {
			return fmt.Errorf("%s: %w", p, err)
		}
	}
	if w.tx, err = w.db.Begin(); err != nil {
		return err
	}
	if _, err := w.tx.Exec(baseSchema); err != nil {
		return err
	}
	for _, s := range requiredSRS {
		if err := w.addSRS(s); err != nil {
			return err
		}
	}
	return nil
}

// addSRS inserts s into gpkg_spatial_ref_sys unless it is there; the same
// srs_id with a different row is refused.
func (w *Writer) addSRS(s SRS) error {
	if old, ok := w.srs[s.ID]; ok {
		if old != s {
			return fmt.Errorf("srs_id %d is already defined as %s, not %s", s.ID, old, s)
		}
		return nil
	}
	if s.Name == "" || s.Organization == "" || s.Definition == "" {
		return fmt.Errorf("%s: srs_name, organization and definition must not be empty", s)
	}
	_, err := w.tx.Exec(`INSERT INTO gpkg_spatial_ref_sys (srs_name, srs_id, organization, organization_coordsys_id, definition, description) VALUES (?, ?, ?, ?, ?, ?)`,
		s.Name, s.ID, s.Organization, s.OrgCoordsysID, s.Definition, s.Description)
	if err == nil {
		w.srs[s.ID] = s
	}
	return err
}

// fail records the first error and returns it; it also returns nil for nil.
func (w *Writer) fail(err error) error {
	if err != nil && w.failure == nil {
		w.failure = err
	}
	return err
}

// usable refuses calls after Close, Abort or a failure.
func (w *Writer) usable() error {
	if w.done {
		return fmt.Errorf("%s: GeoPackage writer already closed", w.path)
	}
	if w.failure != nil {
		return fmt.Errorf("%s: GeoPackage writer stopped after an earlier error: %w", w.path, w.failure)
	}
	return nil
}

// checkName refuses table and column names a GeoPackage reserves or that
// would clash.
func checkName(kind, name string) error {
	switch {
	case name == "":
		return fmt.Errorf("%s name is empty", kind)
	case strings.ContainsRune(name, 0):
		return fmt.Errorf("%s name %q contains a NUL byte", kind, name)
	case kind == "layer" && (hasPrefixFold(name, "gpkg_") || hasPrefixFold(name, "rtree_") || hasPrefixFold(name, "sqlite_")):
		return fmt.Errorf("layer name %q starts with a prefix GeoPackage or SQLite reserves (gpkg_, rtree_, sqlite_)", name)
	}
	return nil
}

func hasPrefixFold(s, prefix string) bool {
	return len(s) >= len(prefix) && strings.EqualFold(s[:len(prefix)], prefix)
}

// validGeometryTypes are the types a LayerSpec may declare.
var validGeometryTypes = map[GeometryType]bool{
	Point: true, LineString: true, Polygon: true, MultiPoint: true,
	MultiLineString: true, MultiPolygon: true, GeometryCollection: true, AnyGeometry: true,
}

// validFieldTypes are the types a Field may have.
var validFieldTypes = map[FieldType]bool{Text: true, Integer: true, Real: true, Boolean: true, Date: true, DateTime: true}

// checkSpec validates a layer's description against the layers so far.
func (w *Writer) checkSpec(s LayerSpec) error {
	if err := checkName("layer", s.Name); err != nil {
		return err
	}
	for _, l := range w.layers {
		if strings.EqualFold(l.spec.Name, s.Name) {
			return fmt.Errorf("layer %q is already in the file (names are case-insensitive)", s.Name)
		}
	}
	if !validGeometryTypes[s.Geometry] {
		return fmt.Errorf("layer %q: geometry type %q is not one of POINT, LINESTRING, POLYGON, their MULTI forms, GEOMETRYCOLLECTION or GEOMETRY", s.Name, s.Geometry)
	}
	seen := map[string]bool{FIDColumn: true, GeometryColumn: true}
	for _, f := range s.Fields {
		if err := checkName("field", f.Name); err != nil {
			return fmt.Errorf("layer %q: %w", s.Name, err)
		}
		if seen[strings.ToLower(f.Name)] {
			return fmt.Errorf("layer %q: field %q repeats a column name (fid and geom are taken; names are case-insensitive)", s.Name, f.Name)
		}
		seen[strings.ToLower(f.Name)] = true
		if !validFieldTypes[f.Type] {
			return fmt.Errorf("layer %q: field %q has type %q, not one of TEXT, INTEGER, REAL, BOOLEAN, DATE, DATETIME", s.Name, f.Name, f.Type)
		}
	}
	return nil
}

// AddLayer creates a feature table. Layers may be filled in any order,
// interleaved or one after another, until Close.
func (w *Writer) AddLayer(s LayerSpec) (*Layer, error) {
	if err := w.usable(); err != nil {
		return nil, err
	}
	if err := w.checkSpec(s); err != nil {
		return nil, fmt.Errorf("%s: %w", w.path, err)
	}
	s.Fields = append([]Field(nil), s.Fields...)
	l := &Layer{w: w, spec: s, env: emptyEnvelope(), args: make([]any, 2+len(s.Fields))}
	if err := l.create(); err != nil {
		return nil, w.fail(fmt.Errorf("%s: layer %q: %w", w.path, s.Name, err))
	}
	w.layers = append(w.layers, l)
	return l, nil
}

// sqlStep is one SQL statement with its arguments.
type sqlStep struct {
	sql  string
	args []any
}

// create writes the layer's table, its registrations and its statements.
func (l *Layer) create() error {
	w, s := l.w, l.spec
	if err := w.addSRS(s.SRS); err != nil {
		return err
	}
	t := quoteIdent(s.Name)
	cols := []string{quoteIdent(FIDColumn) + " INTEGER PRIMARY KEY NOT NULL", quoteIdent(GeometryColumn) + " " + string(s.Geometry)}
	names := []string{quoteIdent(FIDColumn), quoteIdent(GeometryColumn)}
	for _, f := range s.Fields {
		cols = append(cols, quoteIdent(f.Name)+" "+string(f.Type))
		names = append(names, quoteIdent(f.Name))
	}
	stmts := []sqlStep{
		{"CREATE TABLE " + t + " (" + strings.Join(cols, ", ") + ")", nil},
		{`INSERT INTO gpkg_contents (table_name, data_type, identifier, description, last_change, srs_id) VALUES (?, 'features', ?, ?, ?, ?)`,
			[]any{s.Name, s.Name, s.Description, w.stamp, s.SRS.ID}},
		{`INSERT INTO gpkg_geometry_columns (table_name, column_name, geometry_type_name, srs_id, z, m) VALUES (?, ?, ?, ?, 0, 0)`,
			[]any{s.Name, GeometryColumn, string(s.Geometry), s.SRS.ID}},
	}
	if s.SpatialIndex {
		if !w.hasExt {
			stmts = append(stmts, sqlStep{extensionsSchema, nil})
			w.hasExt = true
		}
		stmts = append(stmts,
			sqlStep{"CREATE VIRTUAL TABLE " + quoteIdent(rtreeName(s.Name)) + " USING rtree(id, minx, maxx, miny, maxy)", nil},
			sqlStep{`INSERT INTO gpkg_extensions (table_name, column_name, extension_name, definition, scope) VALUES (?, ?, 'gpkg_rtree_index', ?, 'write-only')`,
				[]any{s.Name, GeometryColumn, rtreeExtensionDefinition}})
	}
	for _, st := range stmts {
		if _, err := w.tx.Exec(st.sql, st.args...); err != nil {
			return err
		}
	}
	var err error
	marks := strings.Repeat(", ?", len(names)-1)
	if l.stmt, err = w.tx.Prepare("INSERT INTO " + t + " (" + strings.Join(names, ", ") + ") VALUES (?" + marks + ")"); err != nil {
		return err
	}
	if s.SpatialIndex {
		l.index = &rtreeEntries{}
	}
	return nil
}

// Count is the number of features written to the layer so far; the last
// one has fid Count().
func (l *Layer) Count() int64 { return l.n }

// Insert writes one feature with fid Count()+1: its geometry (nil for
// none) and one value per field of the layer, in order (nil for NULL). A
// Polygon in a MultiPolygon layer (and likewise Point, LineString) is
// written as a one-member multi geometry. The first error stops the
// writer: Close then removes the file and returns that error.
func (l *Layer) Insert(g orb.Geometry, values ...any) error {
	w := l.w
	if err := w.usable(); err != nil {
		return err
	}
	fid := l.n + 1
	if err := l.bind(fid, g, values); err != nil {
		return w.fail(fmt.Errorf("%s: layer %q: feature %d: %w", w.path, l.spec.Name, fid, err))
	}
	if _, err := l.stmt.Exec(l.args...); err != nil {
		return w.fail(fmt.Errorf("%s: layer %q: feature %d: %w", w.path, l.spec.Name, fid, err))
	}
	l.n = fid
	return nil
}

// bind fills l.args for feature fid and, when the layer is indexed,
// keeps the feature's envelope for the R-tree.
func (l *Layer) bind(fid int64, g orb.Geometry, values []any) error {
	if len(values) != len(l.spec.Fields) {
		return fmt.Errorf("%d values for %d fields", len(values), len(l.spec.Fields))
	}
	l.args[0] = fid
	l.args[1] = nil
	if g != nil {
		g = l.promote(g)
		if want, got := l.spec.Geometry, wkbTypeOf(g); got != 0 && want != AnyGeometry && wkbName(got) != string(want) &&
			!(want == GeometryCollection && got >= wkbMultiPoint) {
			return fmt.Errorf("geometry %T in a %s layer", g, want)
		}
		var env envelope
		var err error
		l.buf, env, err = appendBlob(l.buf[:0], g, l.spec.SRS.ID)
		if err != nil {
			return err
		}
		l.args[1] = l.buf
		if !env.empty() {
			l.env.extend(env)
			if l.index != nil {
				l.index.add(fid, env)
			}
		}
	}
	for i, f := range l.spec.Fields {
		v, err := convert(f.Type, values[i])
		if err != nil {
			return fmt.Errorf("field %q: %w", f.Name, err)
		}
		l.args[2+i] = v
	}
	return nil
}

// promote wraps a single geometry in the multi form the layer declares.
func (l *Layer) promote(g orb.Geometry) orb.Geometry {
	switch l.spec.Geometry {
	case MultiPolygon:
		if p, ok := g.(orb.Polygon); ok {
			return orb.MultiPolygon{p}
		}
	case MultiPoint:
		if p, ok := g.(orb.Point); ok {
			return orb.MultiPoint{p}
		}
	case MultiLineString:
		if p, ok := g.(orb.LineString); ok {
			return orb.MultiLineString{p}
		}
	}
	return g
}

// datePattern and dateTimePattern are the string forms DATE and DATETIME
// values must have (Table 1 of OGC 12-128: ISO 8601 date; date-time in
// UTC with milliseconds, the pattern GDAL's GeoPackage validator checks).
var (
	datePattern     = regexp.MustCompile(`^[0-9]{4}-[0-1][0-9]-[0-3][0-9]$`)
	dateTimePattern = regexp.MustCompile(`^[0-9]{4}-[0-1][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-5][0-9]\.[0-9]{3}Z$`)
)

// convert checks a Go value against a column type and returns what is
// bound to the statement.
func convert(t FieldType, v any) (any, error) {
	if v == nil {
		return nil, nil
	}
	switch t {
	case Text:
		if s, ok := v.(string); ok {
			return s, nil
		}
	case Integer:
		if i, ok := toInt64(v); ok {
			return i, nil
		}
	case Real:
		if f, ok := toFloat64(v); ok {
			if math.IsNaN(f) || math.IsInf(f, 0) {
				return nil, fmt.Errorf("REAL value %v is not finite (use nil for no value)", f)
			}
			return f, nil
		}
	case Boolean:
		if b, ok := v.(bool); ok {
			if b {
				return int64(1), nil
			}
			return int64(0), nil
		}
	case Date, DateTime:
		layout, pattern := dateLayout, datePattern
		if t == DateTime {
			layout, pattern = timeLayout, dateTimePattern
		}
		switch v := v.(type) {
		case time.Time:
			if t == Date {
				return v.Format(layout), nil
			}
			return v.UTC().Format(layout), nil
		case string:
			if !pattern.MatchString(v) {
				return nil, fmt.Errorf("%s string %q is not of the form %s", t, v, layout)
			}
			return v, nil
		}
	}
	return nil, fmt.Errorf("%s column cannot take a Go %T", t, v)
}

func toInt64(v any) (int64, bool) {
	switch v := v.(type) {
	case int:
		return int64(v), true
	case int8:
		return int64(v), true
	case int16:
		return int64(v), true
	case int32:
		return int64(v), true
	case int64:
		return v, true
	case uint:
		return int64(v), uint64(v) <= math.MaxInt64
	case uint8:
		return int64(v), true
	case uint16:
		return int64(v), true
	case uint32:
		return int64(v), true
	case uint64:
		return int64(v), v <= math.MaxInt64
	}
	return 0, false
}

func toFloat64(v any) (float64, bool) {
	switch v := v.(type) {
	case float64:
		return v, true
	case float32:
		return float64(v), true
	}
	if i, ok := toInt64(v); ok {
		return float64(i), true
	}
	return 0, false
}

// Close completes the file: each layer's bounding box goes into
// gpkg_contents (NULL for a layer without geometries), the R-tree triggers
// are created, the transaction is committed and the file synced. After an
// earlier error, or when completing fails, Close removes the file and
// returns the error.
func (w *Writer) Close() error {
	if w.done {
		return nil
	}
	if w.failure != nil {
		err := w.failure
		w.Abort()
		return err
	}
	if err := w.finish(); err != nil {
		w.Abort()
		return fmt.Errorf("%s: %w", w.path, err)
	}
	return nil
}

// finish is Close without the clean-up on failure.
func (w *Writer) finish() error {
	for _, l := range w.layers {
		var bbox [4]any
		if !l.env.empty() {
			bbox = [4]any{l.env.minX, l.env.minY, l.env.maxX, l.env.maxY}
		}
		if _, err := w.tx.Exec(`UPDATE gpkg_contents SET min_x = ?, min_y = ?, max_x = ?, max_y = ? WHERE table_name = ?`,
			bbox[0], bbox[1], bbox[2], bbox[3], l.spec.Name); err != nil {
			return fmt.Errorf("layer %q: %w", l.spec.Name, err)
		}
		if l.spec.SpatialIndex {
			if err := writeRtree(w.tx, rtreeName(l.spec.Name), l.index); err != nil {
				return fmt.Errorf("layer %q: R-tree: %w", l.spec.Name, err)
			}
			l.index = nil
			for _, trig := range rtreeTriggers(l.spec.Name) {
				if _, err := w.tx.Exec(trig); err != nil {
					return fmt.Errorf("layer %q: R-tree trigger: %w", l.spec.Name, err)
				}
			}
		}
		l.closeStmts()
	}
	if err := w.tx.Commit(); err != nil {
		return err
	}
	w.tx = nil
	err := w.db.Close()
	w.db = nil
	w.done = true
	if err == nil {
		err = syncFile(w.path)
	}
	w.complete = err == nil
	return err
}

func (l *Layer) closeStmts() {
	if l.stmt != nil {
		l.stmt.Close()
		l.stmt = nil
	}
}

// syncFile flushes a finished file to disk.
func syncFile(path string) error {
	f, err := os.OpenFile(path, os.O_RDWR, 0)
	if err != nil {
		return err
	}
	err = f.Sync()
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	return err
}

// Abort stops writing and removes the file. It is safe to call after
// Close (it then does nothing) and more than once.
func (w *Writer) Abort() {
	if w.complete {
		return
	}
	for _, l := range w.layers {
		l.closeStmts()
	}
	if w.tx != nil {
		w.tx.Rollback() // journal off: only releases the transaction; the file goes below
		w.tx = nil
	}
	if w.db != nil {
		w.db.Close()
		w.db = nil
	}
	w.done = true
	os.Remove(w.path)
}
