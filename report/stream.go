// Streamed output files: every file of a report is written through a
// buffered writer straight into its staging file, and hashed (SHA-256) and
// counted on the way for the manifest, so no file is ever held whole in
// memory; the writing and hashing run beside the producer (pipeWriter).
//
// Layers: one feature stream, two encoders. A layer is described once
// (layerDef: its GeoPackage table name, geometry type, fields and the
// function producing its features in order); each feature is produced
// once and written both as GeoJSON (geojson.go) into the layer's own file
// and into the run's GeoPackage (FileGeoPackage, package gpkg), so the two
// always hold the same features with the same fields. Property values are
// plain: text, integer, real, boolean or null (a missing value, or a
// number that is not finite); never an array or an object.

package report

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"unsafe"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/report/gpkg"
)

// streamBuffer is the size of the text a layer gathers before handing it
// on to its file (geoJSONFlush).
const streamBuffer = 256 << 10

// streamChunk is the size of the chunks pipeWriter hands to its writing
// goroutine.
const streamChunk = 1 << 20

// pipeWriter gathers what a producer writes into chunks of streamChunk
// bytes and hands each full one to a goroutine of its own, which writes
// it to the file and hashes and counts it, while the producer fills the
// other chunk: the encoding of a layer does not wait for the file system
// or the checksum. Two chunks in all, so a file holds at most 2 MiB in
// memory.
type pipeWriter struct {
	cur    []byte      // the chunk being filled
	full   chan []byte // chunks to write
	free   chan []byte // chunks written, to fill again
	done   chan struct{}
	failed atomic.Bool // set once err is
	// Owned by the writing goroutine until done is closed (err also
	// once failed is set).
	f      *os.File
	direct bool // f has O_DIRECT on (stream_direct_linux.go)
	h      hash.Hash
	n      int64
	err    error
}

func newPipeWriter(f *os.File, direct bool) *pipeWriter {
	w := &pipeWriter{full: make(chan []byte, 2), free: make(chan []byte, 2), done: make(chan struct{}), f: f, direct: direct, h: sha256.New()}
	w.cur = alignedChunk()
	w.free <- alignedChunk()
	go w.run()
	return w
}

// alignedChunk returns an empty buffer of capacity streamChunk starting at
// a multiple of directAlign in memory.
func alignedChunk() []byte {
	b := make([]byte, streamChunk+directAlign)
	off := directAlign - int(uintptr(unsafe.Pointer(&b[0]))%directAlign)
	if off == directAlign {
		off = 0
	}
	return b[off : off : off+streamChunk]
}

// run writes and hashes the chunks handed on, in order; after a write
// error it only hands them back.
func (w *pipeWriter) run() {
	defer close(w.done)
	for b := range w.full {
		if w.err == nil {
			n, err := w.write(b)
			w.h.Write(b[:n])
			w.n += int64(n)
			if err != nil {
				w.err = err
				w.failed.Store(true)
			}
		}
		w.free <- b[:0]
	}
}

// write writes one chunk. With O_DIRECT on, a chunk's multiple of
// directAlign goes directly (every chunk but the last is whole, so the
// file offset stays aligned) and the rest after the flag is cleared; a
// direct write refused as invalid clears the flag and is written again.
func (w *pipeWriter) write(b []byte) (int, error) {
	if !w.direct {
		return w.f.Write(b)
	}
	k := len(b) &^ (directAlign - 1)
	n, err := w.f.Write(b[:k])
	if errors.Is(err, syscall.EINVAL) && n == 0 {
		err = nil // the file system took the flag at open but not here
		k = 0
	}
	if err != nil || k == len(b) {
		return n, err
	}
	w.direct = false
	if err := clearDirect(w.f); err != nil {
		return n, err
	}
	m, err := w.f.Write(b[k:])
	return n + m, err
}

// Write copies p into the chunks, handing each on as it fills; it fails
// with the file's first write error once that is known.
func (w *pipeWriter) Write(p []byte) (int, error) {
	if w.failed.Load() {
		return 0, w.err
	}
	n := len(p)
	for len(p) > 0 {
		if len(w.cur) == cap(w.cur) {
			w.full <- w.cur
			w.cur = <-w.free
		}
		k := copy(w.cur[len(w.cur):cap(w.cur)], p)
		w.cur = w.cur[:len(w.cur)+k]
		p = p[k:]
	}
	return n, nil
}

// close hands on what is left, waits for the writing goroutine and
// returns its first write error.
func (w *pipeWriter) close() error {
	if len(w.cur) > 0 {
		w.full <- w.cur
	}
	close(w.full)
	<-w.done
	return w.err
}

// storeStream creates path (a new file in the staging folder), lets write
// fill it through a pipeWriter, syncs it and returns its size and SHA-256
// checksum.
func storeStream(path string, write func(io.Writer) error) (int64, string, error) {
	f, direct, err := createDirect(path)
	if err != nil {
		return 0, "", unwrapPath(err)
	}
	pw := newPipeWriter(f, direct)
	err = write(pw)
	if cerr := pw.close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return 0, "", unwrapPath(err)
	}
	return pw.n, hex.EncodeToString(pw.h.Sum(nil)), nil
}

// hashFile returns the size and SHA-256 checksum of a finished file (the
// GeoPackage, which SQLite writes itself), read in a stream.
func hashFile(path string) (int64, string, error) {
	f, err := os.Open(path)
	if err != nil {
		return 0, "", unwrapPath(err)
	}
	defer f.Close()
	h := sha256.New()
	n, err := io.Copy(h, f)
	if err != nil {
		return 0, "", unwrapPath(err)
	}
	return n, hex.EncodeToString(h.Sum(nil)), nil
}

// fromBytes adapts a producer of a whole file (a PNG map or chart, which
// the image encoder builds in memory anyway) to a step.
func fromBytes(make func() ([]byte, error)) func(io.Writer) error {
	return func(w io.Writer) error {
		b, err := make()
		if err != nil {
			return err
		}
		_, err = w.Write(b)
		return err
	}
}

// FileGeoPackage is the GeoPackage (OGC 12-128) holding every layer of a
// report, one table per GeoJSON layer (the table name is the layer's
// file name without "-xy" and ".geojson", with "-" turned into "_"): in
// WGS 84 (EPSG:4326) for geographic runs, in the undefined Cartesian
// system (srs_id −1, local metres) for planar ones, each table with an
// R-tree spatial index.
const FileGeoPackage = "sitecover.gpkg"

// ListSeparator separates the items of a list written as one text
// property of a layer (the input indices of sites, e.g. "3;17;42").
const ListSeparator = ";"

// emitFunc receives one feature of a layer: its geometry in output
// coordinates and one value per field of the layer (null for none). The
// geometry is an orb geometry or a pointer to an orb.Point or
// orb.MultiPolygon (plainGeometry): a producer of many features passes a
// pointer to a variable of its own, which boxes nothing (an orb.Point or
// a slice header made an interface value is an allocation). Geometry and
// values are read before it returns, so a producer may reuse them.
type emitFunc func(g orb.Geometry, vals ...value) error

// plainGeometry returns g, or the orb.Point or orb.MultiPolygon g points
// to (emitFunc).
func plainGeometry(g orb.Geometry) orb.Geometry {
	switch g := g.(type) {
	case *orb.Point:
		return *g
	case *orb.MultiPolygon:
		return *g
	}
	return g
}

// value is one property value of a feature, held typed so that producing
// a feature boxes nothing (a layer of 10⁶ features would otherwise
// allocate several boxes for each): null, text, an integer, a real, a
// boolean, or a list of input indices written as one text (joinInts).
// The zero value is null. A real that is not finite is written as null.
type value struct {
	kind valueKind
	n    int64   // integer; boolean (0 or 1)
	f    float64 // real
	s    string  // text
	ints []int   // index list
}

// valueKind is the type of a value.
type valueKind uint8

const (
	nullValue valueKind = iota
	textValue
	intValue
	realValue
	boolValue
	intsValue
)

// Typed values: integer, real, text, boolean and index list (written as
// joinInts writes it).
func vInt[T ~int | ~int32 | ~int64](n T) value { return value{kind: intValue, n: int64(n)} }
func vReal(f float64) value                    { return value{kind: realValue, f: f} }
func vText(s string) value                     { return value{kind: textValue, s: s} }
func vBool(b bool) value {
	if b {
		return value{kind: boolValue, n: 1}
	}
	return value{kind: boolValue}
}
func vInts(v []int) value { return value{kind: intsValue, ints: v} }

// vAny converts a plain Go value (nil, string, bool, float64 or an
// integer type: a site attribute, or a field of a layer of few features)
// to a value.
func vAny(v any) value {
	switch v := v.(type) {
	case nil:
		return value{}
	case string:
		return vText(v)
	case bool:
		return vBool(v)
	case float64:
		return vReal(v)
	case int:
		return vInt(v)
	case int32:
		return vInt(v)
	case int64:
		return vInt(v)
	}
	panic(fmt.Sprintf("report: layer property of type %T", v)) // a programming error: every producer passes the types above
}

// values converts plain Go values as vAny does (for the layers of few
// features, whose producers list their fields as plain values).
func values(vs ...any) []value {
	out := make([]value, len(vs))
	for i, v := range vs {
		out[i] = vAny(v)
	}
	return out
}

// boxed returns v as the plain Go value the GeoPackage writer takes: nil
// for null and for a real that is not finite, the index list joined.
func (v value) boxed() any {
	switch v.kind {
	case textValue:
		return v.s
	case intValue:
		return v.n
	case realValue:
		if math.IsNaN(v.f) || math.IsInf(v.f, 0) {
			return nil
		}
		return v.f
	case boolValue:
		return v.n != 0
	case intsValue:
		return joinInts(v.ints)
	}
	return nil
}

// layerDef is one output layer.
type layerDef struct {
	table  string            // GeoPackage table name
	geom   gpkg.GeometryType // declared geometry type
	fields []gpkg.Field      // property names and types, in order
	each   func(emit emitFunc) error
	// lead marks a layer whose features take long to produce (one huge
	// feature): writeAll starts it before the other steps.
	lead bool
}

// metricDecimals is the number of decimals of a length or area field of a
// layer (metricFields): 1 µm, 1 mm², far below what the rounded
// coordinates (1 mm, 1e-7°) resolve. Shorter numbers make smaller layers
// (at 10⁶ sites about 35 MB less) written without the shortest-decimal
// search.
const metricDecimals = 6

// metricFields returns the indices of the real fields of a layer whose
// names end in "_m" or "_m2": lengths and areas (and powers, in m²),
// written to metricDecimals decimals in the GeoJSON file and the
// GeoPackage alike.
func metricFields(fields []gpkg.Field) []int {
	var out []int
	for k, f := range fields {
		if f.Type == gpkg.Real && (strings.HasSuffix(f.Name, "_m") || strings.HasSuffix(f.Name, "_m2")) {
			out = append(out, k)
		}
	}
	return out
}

// tableName returns the GeoPackage table of a GeoJSON layer file name.
func tableName(file string) string {
	return strings.ReplaceAll(strings.TrimSuffix(file, ".geojson"), "-", "_")
}

// layerStep is the step writing the GeoJSON layer file (name depends on
// Meta.Planar) of def.
func (s *scene) layerStep(file string, def *layerDef) step {
	def.table = tableName(file)
	return step{name: LayerFile(file, s.m.Planar), layer: def}
}

// fieldList builds a field list from name/type pairs.
func fieldList(nt ...any) []gpkg.Field {
	out := make([]gpkg.Field, 0, len(nt)/2)
	for i := 0; i+1 < len(nt); i += 2 {
		out = append(out, gpkg.Field{Name: nt[i].(string), Type: nt[i+1].(gpkg.FieldType)})
	}
	return out
}

// coordFields are the two numeric fields of a point property with the
// given prefix: prefix_lon, prefix_lat (WGS84 degrees) or prefix_x,
// prefix_y (local metres).
func (s *scene) coordFields(prefix string) []any {
	if s.geographic() {
		return []any{prefix + "_lon", gpkg.Real, prefix + "_lat", gpkg.Real}
	}
	return []any{prefix + "_x", gpkg.Real, prefix + "_y", gpkg.Real}
}

// joinInts writes a list of input indices as one text value (gathered in
// a buffer on the stack for short lists: one allocation, the string).
func joinInts(v []int) string {
	if len(v) == 0 {
		return ""
	}
	var buf [64]byte
	b := buf[:0]
	for i, x := range v {
		if i > 0 {
			b = append(b, ListSeparator...)
		}
		b = strconv.AppendInt(b, int64(x), 10)
	}
	return string(b)
}

// gpkgSet is the GeoPackage of a report being written by the layer steps.
type gpkgSet struct {
	mu     sync.Mutex // the writer is not safe for concurrent use
	w      *gpkg.Writer
	layers map[*layerDef]*gpkg.Layer
}

// openGeoPackage creates the GeoPackage at path with a table per layer
// def, in order.
func (s *scene) openGeoPackage(path string, defs []*layerDef) (*gpkgSet, error) {
	w, err := gpkg.Create(path, gpkg.Options{})
	if err != nil {
		return nil, err
	}
	srs := gpkg.UndefinedCartesian
	if s.geographic() {
		srs = gpkg.WGS84
	}
	g := &gpkgSet{w: w, layers: map[*layerDef]*gpkg.Layer{}}
	for _, d := range defs {
		l, err := w.AddLayer(gpkg.LayerSpec{Name: d.table, Geometry: d.geom, SRS: srs, Fields: d.fields, SpatialIndex: true})
		if err != nil {
			w.Abort()
			return nil, err
		}
		g.layers[d] = l
	}
	return g, nil
}

// writeLayer produces the features of d once and writes each as GeoJSON
// to out and, when g is not nil, into its GeoPackage table.
func (s *scene) writeLayer(out io.Writer, d *layerDef, g *gpkgSet) error {
	gj := s.newGeoJSON(out)
	var gl *gpkg.Layer
	if g != nil {
		gl = g.layers[d]
	}
	var boxed []any // the values for the GeoPackage, reused
	metric := metricFields(d.fields)
	err := d.each(func(geom orb.Geometry, vals ...value) error {
		for _, k := range metric {
			if k < len(vals) && vals[k].kind == realValue {
				vals[k].f = round(vals[k].f, metricDecimals)
			}
		}
		if err := gj.feature(geom, d.fields, vals); err != nil {
			return err
		}
		if gl == nil {
			return nil
		}
		boxed = boxed[:0]
		for _, v := range vals {
			boxed = append(boxed, v.boxed())
		}
		g.mu.Lock()
		defer g.mu.Unlock()
		return gl.Insert(plainGeometry(geom), boxed...)
	})
	if err != nil {
		return err
	}
	return gj.close()
}
