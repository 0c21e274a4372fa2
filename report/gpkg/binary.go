// GeoPackageBinary geometry blobs (OGC 12-128, clause 2.1.3), encoding and
// decoding.
//
// A blob is a header followed by a geometry in Well-Known Binary (ISO
// 13249-3 / OGC 06-103r4 "ISO WKB"):
//
//	magic    2 bytes  'G' 'P'
//	version  1 byte   0 (= version 1 of the blob format)
//	flags    1 byte   bits 7-6 reserved (0), bit 5 X (1 = extended blob,
//	                  not supported), bit 4 Y (1 = empty geometry), bits 3-1
//	                  E (envelope code: 0 none, 1 [minx maxx miny maxy],
//	                  2 adds z, 3 adds m, 4 adds z and m), bit 0 B (byte order
//	                  of srs_id and envelope: 1 = little endian)
//	srs_id   int32
//	envelope 0, 32, 48, 48 or 64 bytes of float64 (by code E)
//	WKB      byte order byte (1 = little endian), uint32 type, coordinates
//
// The encoder writes little-endian 2-D ISO WKB and an [minx maxx miny maxy]
// envelope for every geometry except a point. The decoder accepts either
// byte order, ISO type codes with Z, M or ZM (1000+, 2000+, 3000+) and the
// older extended-WKB Z/M flag bits; Z and M values are read past and
// dropped (sitecover works in two dimensions). Counts in a blob are checked
// against the bytes that remain before anything is allocated, so a damaged
// blob costs no more memory than its own length.

package gpkg

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// WKB geometry type codes (ISO 13249-3, Table 2; the same in OGC 06-103r4).
const (
	wkbPoint              = 1
	wkbLineString         = 2
	wkbPolygon            = 3
	wkbMultiPoint         = 4
	wkbMultiLineString    = 5
	wkbMultiPolygon       = 6
	wkbGeometryCollection = 7
)

// Header layout constants of a GeoPackageBinary blob.
const (
	headerLen        = 8       // magic, version, flags, srs_id
	flagLittleEndian = 1 << 0  // B: header values little endian
	flagEnvelopeXY   = 1 << 1  // E = 1: envelope [minx maxx miny maxy]
	flagEmpty        = 1 << 4  // Y: empty geometry
	flagExtended     = 1 << 5  // X: ExtendedGeoPackageBinary
	flagReserved     = 3 << 6  // must be zero
	envelopeShift    = 1       // E occupies bits 3-1
	envelopeMask     = 7       // after the shift
	maxDepth         = 32      // nesting of geometry collections accepted when decoding
	ewkbZ            = 1 << 31 // extended-WKB flag: has Z
	ewkbM            = 1 << 30 // extended-WKB flag: has M
	ewkbSRID         = 1 << 29 // extended-WKB flag: SRID follows the type
	ewkbFlags        = ewkbZ | ewkbM | ewkbSRID
)

// envelopeBytes is the envelope length for each envelope code E.
var envelopeBytes = [5]int{0, 32, 48, 48, 64}

// envelope is a 2-D bounding box, empty while minX > maxX.
type envelope struct{ minX, maxX, minY, maxY float64 }

func emptyEnvelope() envelope {
	return envelope{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
}

func (e *envelope) add(p orb.Point) {
	e.minX = math.Min(e.minX, p[0])
	e.maxX = math.Max(e.maxX, p[0])
	e.minY = math.Min(e.minY, p[1])
	e.maxY = math.Max(e.maxY, p[1])
}

func (e *envelope) extend(o envelope) {
	e.minX = math.Min(e.minX, o.minX)
	e.maxX = math.Max(e.maxX, o.maxX)
	e.minY = math.Min(e.minY, o.minY)
	e.maxY = math.Max(e.maxY, o.maxY)
}

func (e envelope) empty() bool { return e.minX > e.maxX }

// errNonFinite reports a NaN or infinite coordinate.
var errNonFinite = errors.New("coordinate is NaN or infinite")

// wkbEncoder appends a geometry as little-endian 2-D ISO WKB to buf and
// gathers its envelope.
type wkbEncoder struct {
	buf []byte
	env envelope
	bad bool // a coordinate was NaN or infinite
}

func (e *wkbEncoder) header(typ uint32) {
	e.buf = append(e.buf, 1)
	e.buf = binary.LittleEndian.AppendUint32(e.buf, typ)
}

func (e *wkbEncoder) count(n int) {
	e.buf = binary.LittleEndian.AppendUint32(e.buf, uint32(n))
}

func (e *wkbEncoder) point(p orb.Point) {
	if math.IsNaN(p[0]) || math.IsNaN(p[1]) || math.IsInf(p[0], 0) || math.IsInf(p[1], 0) {
		e.bad = true
	}
	e.env.add(p)
	e.buf = binary.LittleEndian.AppendUint64(e.buf, math.Float64bits(p[0]))
	e.buf = binary.LittleEndian.AppendUint64(e.buf, math.Float64bits(p[1]))
}

func (e *wkbEncoder) points(ps []orb.Point) {
	e.count(len(ps))
	for _, p := range ps {
		e.point(p)
	}
}

// ring writes a polygon ring, closing it (repeating the first point) when
// the caller left it open, as WKB requires closed rings.
func (e *wkbEncoder) ring(r orb.Ring) {
	if len(r) > 0 && r[0] != r[len(r)-1] {
		e.count(len(r) + 1)
		for _, p := range r {
			e.point(p)
		}
		e.point(r[0])
		return
	}
	e.points(r)
}

func (e *wkbEncoder) polygon(p orb.Polygon) {
	e.header(wkbPolygon)
	e.count(len(p))
	for _, r := range p {
		e.ring(r)
	}
}

// geometry writes g; it returns an error for a Go type that has no WKB
// counterpart here (orb.Ring, orb.Bound and types from other packages).
func (e *wkbEncoder) geometry(g orb.Geometry) error {
	switch g := g.(type) {
	case orb.Point:
		e.header(wkbPoint)
		e.point(g)
	case orb.LineString:
		e.header(wkbLineString)
		e.points(g)
	case orb.Polygon:
		e.polygon(g)
	case orb.MultiPoint:
		e.header(wkbMultiPoint)
		e.count(len(g))
		for _, p := range g {
			e.header(wkbPoint)
			e.point(p)
		}
	case orb.MultiLineString:
		e.header(wkbMultiLineString)
		e.count(len(g))
		for _, l := range g {
			e.header(wkbLineString)
			e.points(l)
		}
	case orb.MultiPolygon:
		e.header(wkbMultiPolygon)
		e.count(len(g))
		for _, p := range g {
			e.polygon(p)
		}
	case orb.Collection:
		e.header(wkbGeometryCollection)
		e.count(len(g))
		for _, c := range g {
			if err := e.geometry(c); err != nil {
				return err
			}
		}
	default:
		return fmt.Errorf("geometry of Go type %T has no GeoPackage encoding (use Point, LineString, Polygon, their Multi forms or Collection)", g)
	}
	return nil
}

// appendBlob appends the GeoPackageBinary blob of g (which must not be
// nil) in srs srsID to dst and returns it with the geometry's envelope
// (empty for an empty geometry).
func appendBlob(dst []byte, g orb.Geometry, srsID int32) ([]byte, envelope, error) {
	start := len(dst)
	dst = append(dst, 'G', 'P', 0, 0)
	dst = binary.LittleEndian.AppendUint32(dst, uint32(srsID))
	_, isPoint := g.(orb.Point)
	if !isPoint {
		dst = append(dst, make([]byte, envelopeBytes[1])...) // filled below
	}
	enc := wkbEncoder{buf: dst, env: emptyEnvelope()}
	if err := enc.geometry(g); err != nil {
		return dst[:start], enc.env, err
	}
	if enc.bad {
		return dst[:start], enc.env, errNonFinite
	}
	dst = enc.buf
	flags := byte(flagLittleEndian)
	switch {
	case enc.env.empty():
		// Empty geometry: no envelope (clause 2.1.3.1.1 allows NaN
		// envelopes or none); drop the reserved envelope bytes.
		flags |= flagEmpty
		if !isPoint {
			env := start + headerLen
			dst = append(dst[:env], dst[env+envelopeBytes[1]:]...)
		}
	case !isPoint:
		flags |= flagEnvelopeXY
		env := dst[start+headerLen:]
		binary.LittleEndian.PutUint64(env[0:], math.Float64bits(enc.env.minX))
		binary.LittleEndian.PutUint64(env[8:], math.Float64bits(enc.env.maxX))
		binary.LittleEndian.PutUint64(env[16:], math.Float64bits(enc.env.minY))
		binary.LittleEndian.PutUint64(env[24:], math.Float64bits(enc.env.maxY))
	}
	dst[start+3] = flags
	return dst, enc.env, nil
}

// blobHeader is the decoded header of a GeoPackageBinary blob.
type blobHeader struct {
	srsID int32
	empty bool
	wkb   []byte // the WKB that follows the header and envelope
}

// parseHeader checks and splits a GeoPackageBinary blob.
func parseHeader(b []byte) (blobHeader, error) {
	if len(b) < headerLen {
		return blobHeader{}, fmt.Errorf("geometry blob of %d bytes is shorter than the %d-byte GeoPackageBinary header", len(b), headerLen)
	}
	if b[0] != 'G' || b[1] != 'P' {
		return blobHeader{}, fmt.Errorf("geometry blob does not start with the GeoPackageBinary magic \"GP\" (found %q)", b[:2])
	}
	if b[2] != 0 {
		return blobHeader{}, fmt.Errorf("GeoPackageBinary version byte %d, only 0 is defined", b[2])
	}
	flags := b[3]
	if flags&flagExtended != 0 {
		return blobHeader{}, errors.New("ExtendedGeoPackageBinary geometry (flag bit X) is not supported")
	}
	if flags&flagReserved != 0 {
		return blobHeader{}, fmt.Errorf("GeoPackageBinary flags 0x%02x set reserved bits", flags)
	}
	code := int(flags>>envelopeShift) & envelopeMask
	if code >= len(envelopeBytes) {
		return blobHeader{}, fmt.Errorf("GeoPackageBinary envelope code %d is not defined (0-4)", code)
	}
	var order binary.ByteOrder = binary.BigEndian
	if flags&flagLittleEndian != 0 {
		order = binary.LittleEndian
	}
	h := blobHeader{srsID: int32(order.Uint32(b[4:8])), empty: flags&flagEmpty != 0}
	n := headerLen + envelopeBytes[code]
	if len(b) < n {
		return blobHeader{}, fmt.Errorf("geometry blob of %d bytes ends inside its %d-byte envelope", len(b), envelopeBytes[code])
	}
	h.wkb = b[n:]
	return h, nil
}

// wkbDecoder reads WKB; off is the read position in b.
type wkbDecoder struct {
	b   []byte
	off int
}

func (d *wkbDecoder) errf(format string, args ...any) error {
	return fmt.Errorf("WKB at byte %d: %s", d.off, fmt.Sprintf(format, args...))
}

func (d *wkbDecoder) need(n int) error {
	if n < 0 || len(d.b)-d.off < n {
		return d.errf("needs %d more bytes, %d left", n, len(d.b)-d.off)
	}
	return nil
}

// wkbHead is one geometry's byte order, base type and coordinate width.
type wkbHead struct {
	order  binary.ByteOrder
	base   uint32
	stride int // float64 values per coordinate: 2, 3 (Z or M) or 4 (ZM)
}

func (d *wkbDecoder) head() (wkbHead, error) {
	if err := d.need(5); err != nil {
		return wkbHead{}, err
	}
	var h wkbHead
	switch d.b[d.off] {
	case 0:
		h.order = binary.BigEndian
	case 1:
		h.order = binary.LittleEndian
	default:
		return h, d.errf("byte order byte %d (0 or 1 expected)", d.b[d.off])
	}
	t := h.order.Uint32(d.b[d.off+1:])
	d.off += 5
	h.stride = 2
	if t&ewkbFlags != 0 { // extended WKB as some older writers produce
		if t&ewkbZ != 0 {
			h.stride++
		}
		if t&ewkbM != 0 {
			h.stride++
		}
		if t&ewkbSRID != 0 {
			if err := d.need(4); err != nil {
				return h, err
			}
			d.off += 4
		}
		t &^= ewkbFlags
	}
	switch t / 1000 { // ISO: 1000 Z, 2000 M, 3000 ZM
	case 1, 2:
		h.stride++
	case 3:
		h.stride += 2
	}
	h.base = t % 1000
	if t >= 4000 || h.base < wkbPoint || h.base > wkbGeometryCollection {
		return h, d.errf("geometry type %d is not supported (points, line strings, polygons, their multi forms and collections are)", t)
	}
	return h, nil
}

// count reads an element count and checks that count elements of at least
// minBytes each fit in the rest of the blob.
func (d *wkbDecoder) count(h wkbHead, minBytes int) (int, error) {
	if err := d.need(4); err != nil {
		return 0, err
	}
	n := int(h.order.Uint32(d.b[d.off:]))
	d.off += 4
	if n > (len(d.b)-d.off)/minBytes {
		return 0, d.errf("count %d does not fit in the %d bytes left", n, len(d.b)-d.off)
	}
	return n, nil
}

func (d *wkbDecoder) point(h wkbHead) (orb.Point, error) {
	if err := d.need(8 * h.stride); err != nil {
		return orb.Point{}, err
	}
	p := orb.Point{
		math.Float64frombits(h.order.Uint64(d.b[d.off:])),
		math.Float64frombits(h.order.Uint64(d.b[d.off+8:])),
	}
	d.off += 8 * h.stride
	return p, nil
}

func (d *wkbDecoder) points(h wkbHead) ([]orb.Point, error) {
	n, err := d.count(h, 8*h.stride)
	if err != nil {
		return nil, err
	}
	ps := make([]orb.Point, n)
	for i := range ps {
		if ps[i], err = d.point(h); err != nil {
			return nil, err
		}
	}
	return ps, nil
}

func (d *wkbDecoder) polygon(h wkbHead) (orb.Polygon, error) {
	n, err := d.count(h, 4)
	if err != nil {
		return nil, err
	}
	p := make(orb.Polygon, n)
	for i := range p {
		r, err := d.points(h)
		if err != nil {
			return nil, err
		}
		p[i] = r
	}
	return p, nil
}

// member reads one member of a multi geometry and checks its base type.
func (d *wkbDecoder) member(want uint32, depth int) (orb.Geometry, error) {
	at := d.off
	g, err := d.geometry(depth + 1)
	if err != nil {
		return nil, err
	}
	if want != 0 && wkbTypeOf(g) != want {
		d.off = at
		return nil, d.errf("member of type %s inside a %s", wkbName(wkbTypeOf(g)), wkbName(want))
	}
	return g, nil
}

// members reads the n members of a multi geometry, each of base type
// want (whose Go type is T).
func members[T orb.Geometry](d *wkbDecoder, n int, want uint32, depth int) ([]T, error) {
	out := make([]T, n)
	for i := range out {
		g, err := d.member(want, depth)
		if err != nil {
			return nil, err
		}
		out[i] = g.(T)
	}
	return out, nil
}

// geometry reads one geometry. A WKB point with NaN coordinates (the WKB
// form of an empty point) is returned as a Point holding NaN.
func (d *wkbDecoder) geometry(depth int) (orb.Geometry, error) {
	if depth > maxDepth {
		return nil, d.errf("geometry collections nested deeper than %d", maxDepth)
	}
	h, err := d.head()
	if err != nil {
		return nil, err
	}
	switch h.base {
	case wkbPoint:
		return d.point(h)
	case wkbLineString:
		ps, err := d.points(h)
		return orb.LineString(ps), err
	case wkbPolygon:
		return d.polygon(h)
	}
	n, err := d.count(h, 5+4) // a member has at least its head and a count
	if err != nil {
		return nil, err
	}
	switch h.base {
	case wkbMultiPoint:
		mp, err := members[orb.Point](d, n, wkbPoint, depth)
		return orb.MultiPoint(mp), err
	case wkbMultiLineString:
		ml, err := members[orb.LineString](d, n, wkbLineString, depth)
		return orb.MultiLineString(ml), err
	case wkbMultiPolygon:
		mp, err := members[orb.Polygon](d, n, wkbPolygon, depth)
		return orb.MultiPolygon(mp), err
	}
	c := make(orb.Collection, n)
	for i := range c {
		if c[i], err = d.member(0, depth); err != nil {
			return nil, err
		}
	}
	return c, nil
}

// decodeWKB reads exactly one geometry from b.
func decodeWKB(b []byte) (orb.Geometry, error) {
	d := wkbDecoder{b: b}
	g, err := d.geometry(0)
	if err != nil {
		return nil, err
	}
	if d.off != len(b) {
		return nil, d.errf("%d bytes left after the geometry", len(b)-d.off)
	}
	return g, nil
}

// wkbTypeOf is the WKB base type code of a decoded geometry.
func wkbTypeOf(g orb.Geometry) uint32 {
	switch g.(type) {
	case orb.Point:
		return wkbPoint
	case orb.LineString:
		return wkbLineString
	case orb.Polygon:
		return wkbPolygon
	case orb.MultiPoint:
		return wkbMultiPoint
	case orb.MultiLineString:
		return wkbMultiLineString
	case orb.MultiPolygon:
		return wkbMultiPolygon
	case orb.Collection:
		return wkbGeometryCollection
	}
	return 0
}

// wkbName is the geometry_type_name of a WKB base type code.
func wkbName(t uint32) string {
	names := [...]string{"GEOMETRY", "POINT", "LINESTRING", "POLYGON", "MULTIPOINT", "MULTILINESTRING", "MULTIPOLYGON", "GEOMETRYCOLLECTION"}
	if int(t) < len(names) {
		return names[t]
	}
	return fmt.Sprintf("type %d", t)
}
