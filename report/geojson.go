// GeoJSON layers (RFC 7946): sites, service areas, gaps, hole-closing
// points and the covered area (and the planning layers of
// plan_layers.go).
//
// Geometry is mapped vertex by vertex from the local plane to WGS84 with
// Meta.ToLonLat and rounded to 7 decimals (RFC 7946 §11.2 recommends
// about 6; 7 keeps 1.1 cm). Straight edges in the plane become straight
// edges in lon/lat; over a site (a few km) the difference between the two
// is far below the rounding. After rounding each ring is repaired: repeated
// positions are dropped, rings with fewer than three distinct positions or
// zero area are dropped (a polygon whose exterior is dropped goes with
// it), and every ring is oriented by the sign of its shoelace area in the
// output coordinates — exterior rings counter-clockwise, holes clockwise
// (RFC 7946 §3.1.6); a polygon that rounding would make invalid is split
// at repeated points or written with more digits (outline.go); gap
// outlines are grown and covered parts shrunk by the largest move of
// rounding first, so that they keep their promise (outline_grow.go). No "crs"
// member is written (§4), except in the projected copies (outcrs.go).
//
// With Meta.Planar the same layers hold local x/y metres rounded to 1 mm
// and carry a foreign member "coordinates" saying so; their file names end
// in "-xy.geojson" (see LayerFile).
//
// Geometries are orb values (orb.Point, orb.MultiPolygon) in the
// orb/geojson model; they are encoded by the hand-written writer below.

package report

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report/gpkg"
)

// geoJSON writes one FeatureCollection to a stream. The encoder is written
// out by hand (positions with strconv's shortest round-trip formatting of
// the already rounded values, so a 7-decimal value prints with at most 7
// decimals) because reflection-based encoding of 10⁵ features costs more
// than the analysis; the tests decode every layer with orb/geojson. Text
// gathers in a small buffer that is handed on whenever it passes
// geoJSONFlush bytes, so a layer is never held whole in memory.
type geoJSON struct {
	w   io.Writer
	b   []byte
	n   int
	err error // the first write error
}

// geoJSONFlush is the buffered size at which a layer's text is written on
// (the stream's buffer size, streamBuffer).
const geoJSONFlush = streamBuffer

func (s *scene) newGeoJSON(w io.Writer) *geoJSON {
	l := &geoJSON{w: w, b: make([]byte, 0, 2*geoJSONFlush)}
	l.b = append(l.b, `{"type":"FeatureCollection",`...)
	if s.grid != nil {
		l.b = append(l.b, s.grid.member...)
	} else if !s.geographic() {
		l.b = append(l.b, `"coordinates":"local plane x/y in metres (not WGS84; not RFC 7946 longitude/latitude)",`...)
	}
	l.b = append(l.b, `"features":[`...)
	return l
}

// feature writes one feature with the given fields and values.
func (l *geoJSON) feature(g orb.Geometry, fields []gpkg.Field, vals []value) error {
	if l.n > 0 {
		l.b = append(l.b, ',')
	}
	l.n++
	l.b = append(l.b, "\n"+`{"type":"Feature","geometry":`...)
	l.geometry(g)
	l.b = append(l.b, `,"properties":{`...)
	for i, f := range fields {
		l.b = kv(l.b, f.Name, i == 0)
		n := len(l.b)
		l.b = appendValue(l.b, vals[i])
		if f.Type == gpkg.Real && vals[i].kind != nullValue && !hasDecimalMark(l.b[n:]) {
			// A whole number in a REAL field keeps a decimal point, so a
			// reader that guesses types (GDAL) makes the field real, as in
			// the GeoPackage, whatever the values.
			l.b = append(l.b, ".0"...)
		}
	}
	l.b = append(l.b, "}}"...)
	l.spill()
	return l.err
}

// spill writes the buffered text on once it passes geoJSONFlush bytes.
func (l *geoJSON) spill() {
	if len(l.b) < geoJSONFlush {
		return
	}
	if l.err == nil {
		_, l.err = l.w.Write(l.b)
	}
	l.b = l.b[:0]
}

// geometry appends g (or the point or multipolygon it points to, see
// emitFunc) as appendGeometry does, writing on between the rings of a
// multipolygon, so that a single huge feature (the covered area of a
// large site is one polygon with a hole per gap) never gathers whole.
func (l *geoJSON) geometry(g orb.Geometry) {
	switch g := g.(type) {
	case *orb.Point:
		l.point(*g)
	case orb.Point:
		l.point(g)
	case *orb.MultiPolygon:
		l.multiPolygon(*g)
	case orb.MultiPolygon:
		l.multiPolygon(g)
	default:
		l.b = appendGeometry(l.b, g)
	}
}

// point appends a Point geometry (as appendGeometry does).
func (l *geoJSON) point(p orb.Point) {
	l.b = append(l.b, `{"type":"Point","coordinates":`...)
	l.b = appendPos(l.b, p)
	l.b = append(l.b, '}')
}

// multiPolygon appends a MultiPolygon geometry, writing on between rings.
func (l *geoJSON) multiPolygon(mp orb.MultiPolygon) {
	l.b = append(l.b, `{"type":"MultiPolygon","coordinates":[`...)
	for i, p := range mp {
		if i > 0 {
			l.b = append(l.b, ',')
		}
		l.b = append(l.b, '[')
		for k, r := range p {
			if k > 0 {
				l.b = append(l.b, ',')
			}
			l.ring(r)
			l.spill()
		}
		l.b = append(l.b, ']')
	}
	l.b = append(l.b, "]}"...)
}

// ring appends the positions of r as appendRing does, writing on every
// ringSpill positions, so that the buffer never grows past its capacity
// for a ring of 10⁶ positions (the outline of a gap spanning the site).
func (l *geoJSON) ring(r orb.Ring) {
	l.b = append(l.b, '[')
	for j, q := range r {
		if j > 0 {
			l.b = append(l.b, ',')
		}
		l.b = appendPos(l.b, q)
		if j%ringSpill == ringSpill-1 {
			l.spill()
		}
	}
	l.b = append(l.b, ']')
}

// ringSpill is how many positions ring writes between spills: at most
// some 50 bytes each, far below the buffer's spare geoJSONFlush bytes.
const ringSpill = 1024

// hasDecimalMark reports whether a written number has a decimal point or
// an exponent, or is the word null (the bytes '.', 'e', 'n').
func hasDecimalMark(num []byte) bool {
	for _, c := range num {
		if c == '.' || c == 'e' || c == 'n' {
			return true
		}
	}
	return false
}

// close ends the collection and writes what is left.
func (l *geoJSON) close() error {
	l.b = append(l.b, "\n]}\n"...)
	if l.err == nil {
		_, l.err = l.w.Write(l.b)
	}
	l.b = nil
	return l.err
}

// appendValue appends one property value (a real that is not finite as
// null, an index list as joinInts writes it).
func appendValue(b []byte, v value) []byte {
	switch v.kind {
	case textValue:
		return appendStr(b, v.s)
	case intValue:
		return strconv.AppendInt(b, v.n, 10)
	case realValue:
		return appendNum(b, v.f)
	case boolValue:
		return strconv.AppendBool(b, v.n != 0)
	case intsValue:
		b = append(b, '"')
		for i, x := range v.ints {
			if i > 0 {
				b = append(b, ListSeparator...)
			}
			b = strconv.AppendInt(b, int64(x), 10)
		}
		return append(b, '"')
	}
	return append(b, "null"...)
}

func appendGeometry(b []byte, g orb.Geometry) []byte {
	switch g := g.(type) {
	case orb.Point:
		b = append(b, `{"type":"Point","coordinates":`...)
		b = appendPos(b, g)
	case orb.LineString:
		b = append(b, `{"type":"LineString","coordinates":[`...)
		for i, q := range g {
			if i > 0 {
				b = append(b, ',')
			}
			b = appendPos(b, q)
		}
		b = append(b, ']')
	case orb.MultiPolygon:
		b = append(b, `{"type":"MultiPolygon","coordinates":[`...)
		for i, p := range g {
			if i > 0 {
				b = append(b, ',')
			}
			b = append(b, '[')
			for k, r := range p {
				if k > 0 {
					b = append(b, ',')
				}
				b = appendRing(b, r)
			}
			b = append(b, ']')
		}
		b = append(b, ']')
	}
	return append(b, '}')
}

// appendRing appends the positions of a ring as a JSON array.
func appendRing(b []byte, r orb.Ring) []byte {
	b = append(b, '[')
	for j, q := range r {
		if j > 0 {
			b = append(b, ',')
		}
		b = appendPos(b, q)
	}
	return append(b, ']')
}

func appendPos(b []byte, p orb.Point) []byte {
	b = append(b, '[')
	b = appendNum(b, p[0])
	b = append(b, ',')
	b = appendNum(b, p[1])
	return append(b, ']')
}

// appendNum appends a finite number in its shortest round-trip form
// without exponent; non-finite values (never produced by the analysis)
// become null so the file stays valid JSON.
//
// Output coordinates are already rounded to 7 (or 3) decimals. Such a
// value v below 1e8 in magnitude is the double nearest to n/10⁷ for the
// integer n = round(v·10⁷), and n/10⁷ written out with trailing zeros
// dropped is its shortest round-trip form: any other decimal that rounds
// to v lies within half an ulp (< 10⁻⁸) of it, so on the 10⁻⁷ grid it is
// n/10⁷ itself. Those values are written from n with integer arithmetic;
// all others go through strconv.
//
// The integer n is v·10⁷ rounded half away from zero (as math.Round, by
// truncation and the exact fractional part: |v·10⁷| < 10¹⁵); the
// comparison comes first, as NaN and infinities fail it.
func appendNum(b []byte, v float64) []byte {
	if math.Abs(v) < 1e8 && v != 0 {
		x := v * 1e7
		n := float64(int64(x))
		if f := x - n; f >= 0.5 {
			n++
		} else if f <= -0.5 {
			n--
		}
		if n/1e7 == v {
			return appendDecimal7(b, int64(n))
		}
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return append(b, "null"...)
	}
	return strconv.AppendFloat(b, v, 'f', -1, 64)
}

// appendDecimal7 appends n/10⁷ in plain decimal without trailing zeros.
// The digits are produced right to left into a local array, two at a
// time from digitPairs: the integer part of |n|/10⁷ < 10¹² has at most 12
// digits, with sign, point and 7 decimals at most 21 bytes.
func appendDecimal7(b []byte, n int64) []byte {
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	var d [24]byte
	i := len(d)
	u := uint64(n)
	ip, frac := u/1e7, u%1e7
	if frac != 0 {
		// k: decimals left to write, leading zeros included; four
		// trailing zeros (millimetres in the plane) go at once.
		k := 7
		if frac%10000 == 0 {
			frac /= 10000
			k -= 4
		}
		for frac%10 == 0 {
			frac /= 10
			k--
		}
		for ; k >= 2; k -= 2 {
			q := frac / 100
			r := 2 * (frac - 100*q)
			i -= 2
			d[i], d[i+1] = digitPairs[r], digitPairs[r+1]
			frac = q
		}
		if k == 1 {
			i--
			d[i] = byte('0' + frac)
		}
		i--
		d[i] = '.'
	}
	for ip >= 100 {
		q := ip / 100
		r := 2 * (ip - 100*q)
		i -= 2
		d[i], d[i+1] = digitPairs[r], digitPairs[r+1]
		ip = q
	}
	if ip >= 10 {
		i -= 2
		d[i], d[i+1] = digitPairs[2*ip], digitPairs[2*ip+1]
	} else {
		i--
		d[i] = byte('0' + ip)
	}
	return append(b, d[i:]...)
}

// digitPairs holds "00" to "99": digitPairs[2k:2k+2] is k in two digits.
const digitPairs = "00010203040506070809" +
	"10111213141516171819" +
	"20212223242526272829" +
	"30313233343536373839" +
	"40414243444546474849" +
	"50515253545556575859" +
	"60616263646566676869" +
	"70717273747576777879" +
	"80818283848586878889" +
	"90919293949596979899"

// appendStr appends s as a JSON string (invalid UTF-8 replaced by U+FFFD).
func appendStr(b []byte, s string) []byte {
	s = strings.ToValidUTF8(s, "\uFFFD")
	b = append(b, '"')
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == '"' || c == '\\':
			b = append(b, '\\', c)
		case c < 0x20:
			b = append(b, fmt.Sprintf("\\u%04x", c)...)
		default:
			b = append(b, c)
		}
	}
	return append(b, '"')
}

// kv appends "key": with a leading comma unless first.
func kv(b []byte, key string, first bool) []byte {
	if !first {
		b = append(b, ',')
	}
	b = append(b, '"')
	b = append(b, key...)
	return append(b, `":`...)
}

// sitesLayer is every input site: its input index, name, range (its own,
// or the common one; null when the run has none) and type ("" when the
// sites have no types), and, for a site at exactly the position of an
// earlier one, that site's index (−1 for none).
func (s *scene) sitesLayer() *layerDef {
	return s.withAttributes(&layerDef{geom: gpkg.Point,
		fields: fieldList("site", gpkg.Integer, "name", gpkg.Text, "range_m", gpkg.Real, "type", gpkg.Text, "duplicate_of", gpkg.Integer),
		each: func(emit emitFunc) error {
			tri := s.l.Tri
			vals := make([]value, 5) // reused: emit encodes a feature before it returns
			pt := new(orb.Point)     // reused likewise (emitFunc)
			for i, p := range s.l.Sites {
				dup := -1
				if tri != nil && i < len(tri.Vertex) && tri.Vertex[i] >= 0 {
					if src := int(tri.Source[tri.Vertex[i]]); src != i {
						dup = src
					}
				}
				var r value
				if v := s.rangeOf(i); v > 0 {
					r = vReal(v)
				}
				vals[0], vals[1], vals[2], vals[3], vals[4] = vInt(i), vText(s.name(i)), r, vText(s.typeOf(i)), vInt(dup)
				*pt = orb.Point(s.point(p))
				if err := emit(pt, vals...); err != nil {
					return err
				}
			}
			return nil
		}}, 0)
}

// serviceAreasLayer is the service area of each distinct site position;
// merged lists the duplicates merged into it (ListSeparator between).
func (s *scene) serviceAreasLayer() *layerDef {
	f := append([]any{"site", gpkg.Integer, "name", gpkg.Text, "area_m2", gpkg.Real, "share", gpkg.Real, "farthest_m", gpkg.Real},
		s.coordFields("farthest")...)
	return s.withAttributes(&layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList(append(f, "merged", gpkg.Text)...),
		each: func(emit emitFunc) error {
			var buf polyBuf
			vals := make([]value, 8)     // reused: emit encodes a feature before it returns
			mpv := new(orb.MultiPolygon) // reused likewise (emitFunc)
			return s.forCells(func(c *coverage.ServiceArea, far Point) error {
				mp := s.cellPolygons(&buf, c.Vertex)
				if len(mp) == 0 {
					return nil
				}
				vals[0], vals[1], vals[2], vals[3], vals[4] = vInt(c.Site), vText(s.name(c.Site)), vReal(c.Area), vReal(c.Share), vReal(c.Farthest)
				vals[5], vals[6], vals[7] = vReal(far[0]), vReal(far[1]), vInts(c.Merged)
				*mpv = mp
				return emit(mpv, vals...)
			})
		}}, 0)
}

// forCells calls f with each service area in the order of s.cells and its
// farthest point in output coordinates (c is valid during the call
// only). A scene without s.cells (the early scene of an AnalysisWriter,
// which runs beside the analysis) derives each from the layout in turn,
// into one variable, holding no list of them: the inputs in order, each
// first input at a vertex giving that vertex's entry, its Merged the
// other inputs at the vertex (Triangulation.Duplicates).
func (s *scene) forCells(f func(c *coverage.ServiceArea, far Point) error) error {
	if s.cells != nil {
		for i := range s.cells {
			if err := f(&s.cells[i], s.farthestOut(i)); err != nil {
				return err
			}
		}
		return nil
	}
	tri := s.l.Tri
	merged := map[int32][]int{} // vertex → its inputs after the first
	for _, g := range tri.Duplicates() {
		m := make([]int, 0, len(g)-1)
		for _, i := range g {
			if i != tri.Source[tri.Vertex[i]] {
				m = append(m, int(i))
			}
		}
		merged[tri.Vertex[g[0]]] = m
	}
	var c coverage.ServiceArea // one for all: f may keep no reference to it
	for i, v := range tri.Vertex {
		if v < 0 || int(tri.Source[v]) != i {
			continue
		}
		c = s.l.ServiceArea(v)
		c.Merged = merged[v]
		if err := f(&c, s.point(c.FarthestPoint)); err != nil {
			return err
		}
	}
	return nil
}

// gapFields are the fields of a gaps layer.
func (s *scene) gapFields() []gpkg.Field {
	f := append([]any{"id", gpkg.Integer, "area_m2", gpkg.Real, "closing_range_m", gpkg.Real}, s.coordFields("deepest")...)
	return fieldList(append(f, "touches_boundary", gpkg.Boolean, "sites", gpkg.Text, "range_m", gpkg.Real)...)
}

// gapLayer is a gaps layer for gaps at range r; deepest gives gap i's
// deepest point in output coordinates. Outlines are grown by the rounding
// reach before rounding, so each written one contains its gap
// (outline_grow.go).
func (s *scene) gapLayer(gaps []coverage.Gap, r float64, deepest func(i int) Point) *layerDef {
	return &layerDef{geom: gpkg.MultiPolygon, fields: s.gapFields(),
		each: func(emit emitFunc) error {
			vals := make([]value, 8)     // reused: emit encodes a feature before it returns
			mpv := new(orb.MultiPolygon) // reused likewise (emitFunc)
			return s.gapOutlines(gaps, func(gi int, mp orb.MultiPolygon) error {
				g := &gaps[gi]
				d := deepest(gi)
				vals[0], vals[1], vals[2], vals[3], vals[4] = vInt(g.ID), vReal(g.Area), vReal(g.ClosingRange), vReal(d[0]), vReal(d[1])
				vals[5], vals[6], vals[7] = vBool(g.TouchesBoundary), vInts(g.Sites), vReal(r)
				*mpv = mp
				return emit(mpv, vals...)
			})
		}}
}

func (s *scene) gapsLayer() *layerDef { return s.gapLayer(s.a.Gaps, s.a.Range, s.deepestOut) }

// holesLayer is the closing point of each hole of the union of disks.
func (s *scene) holesLayer() *layerDef {
	return &layerDef{geom: gpkg.Point,
		fields: fieldList("birth_m", gpkg.Real, "death_m", gpkg.Real, "lifetime_m", gpkg.Real, "note", gpkg.Text, "birth_sites", gpkg.Text),
		each: func(emit emitFunc) error {
			p := s.a.Persistence
			if p == nil {
				return nil
			}
			vals := make([]value, 5) // reused: emit encodes a feature before it returns
			pt := new(orb.Point)     // reused likewise (emitFunc)
			for i := range p.Holes {
				h := &p.Holes[i]
				vals[0], vals[1], vals[2], vals[3], vals[4] = vReal(h.Birth), vReal(h.Death), vReal(h.Death-h.Birth), vText(s.holeNote(i)), vInts(h.BirthSites[:])
				*pt = orb.Point(s.closingOut(i))
				if err := emit(pt, vals...); err != nil {
					return err
				}
			}
			return nil
		}}
}

// coveredLayer is the covered part of the area at the planned range
// (coverage.Layout.Covered: the area less the gap outlines, so inside the
// true covered part by at most the chord tolerance; shrunk by the rounding
// reach before rounding, outline_grow.go), one feature per connected
// covered part, largest first by outline area (before the shrinking).
func (s *scene) coveredLayer() *layerDef {
	return &layerDef{geom: gpkg.MultiPolygon, lead: true,
		fields: fieldList("part", gpkg.Integer, "outline_area_m2", gpkg.Real, "range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			parts := s.l.Covered(s.a.Gaps)
			area := make([]float64, len(parts))
			for i, p := range parts {
				for _, r := range p {
					area[i] += planar.RingArea(planar.FlatRing(r))
				}
			}
			order := make([]int, len(parts))
			for i := range order {
				order[i] = i
			}
			slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(area[b], area[a]) })
			n := 0
			var buf polyBuf
			for _, i := range order {
				mp := s.conservativeInto(&buf, orb.MultiPolygon{parts[i]}, -1)
				if len(mp) == 0 {
					continue
				}
				n++
				if err := emit(mp, vInt(n), vReal(area[i]), vReal(s.a.Range)); err != nil {
					return err
				}
			}
			return nil
		}}
}

// multiPolygon converts a local-plane multipolygon to output coordinates,
// rounded, repaired, oriented (exterior CCW, holes CW) and checked valid
// (checkRounding), into memory of its own.
func (s *scene) multiPolygon(in orb.MultiPolygon) orb.MultiPolygon {
	var b polyBuf
	if mp := s.multiPolygonInto(&b, in); len(mp) > 0 {
		return mp
	}
	return orb.MultiPolygon{}
}

// polyBuf is the memory of the output multipolygon of one feature, reused
// from feature to feature by a layer producer (emit encodes a feature
// before it returns, so nothing refers to it afterwards): a layer of 10⁶
// service areas then costs a few growing slices instead of several
// allocations per ring.
type polyBuf struct {
	pts   []orb.Point   // the rings' positions, ring after ring
	rings []orb.Ring    // the kept rings, slices of pts
	polys []orb.Polygon // the kept polygons, slices of rings
	off   offsetScratch // conservativeInto's moved ring
	// offsetRoundChunks' memory: the feature's rings, the index of each
	// polygon's first, and the chunks' conversions.
	all    []orb.Ring
	first  []int
	chunks []*ringChunk
}

// reset empties b for the next feature; the multipolygon it held is
// overwritten from here on.
func (b *polyBuf) reset() {
	b.pts, b.rings, b.polys = b.pts[:0], b.rings[:0], b.polys[:0]
}

// reserve sizes b for the conversion of in at once: one allocation for a
// feature of 10⁵ rings instead of a doubling slice copied some twenty
// times.
func (b *polyBuf) reserve(in orb.MultiPolygon) {
	pts, rings := 0, 0
	for _, poly := range in {
		rings += len(poly)
		for _, r := range poly {
			pts += len(r) + 1
		}
	}
	b.pts = slices.Grow(b.pts, pts)
	b.rings = slices.Grow(b.rings, rings)
	b.polys = slices.Grow(b.polys, len(in))
}

// multiPolygonInto is multiPolygon into the memory of b (valid until b is
// used again).
func (s *scene) multiPolygonInto(b *polyBuf, in orb.MultiPolygon) orb.MultiPolygon {
	return s.checkRounding(in, s.roundInto(b, in))
}

// roundInto converts a local-plane multipolygon to output coordinates,
// rounded, repaired and oriented, into the memory of b, unchecked.
func (s *scene) roundInto(b *polyBuf, in orb.MultiPolygon) orb.MultiPolygon {
	b.reset()
	b.reserve(in)
	for _, poly := range in {
		r0 := len(b.rings)
		for k, ring := range poly {
			if !s.addRing(b, planar.FlatRing(ring), k == 0) && k == 0 {
				break
			}
		}
		b.endPolygon(r0)
	}
	return b.polys
}

// cellPolygons is multiPolygon of the clipped cell of vertex v, read from
// the flat cell arrays without building the orb value first.
func (s *scene) cellPolygons(b *polyBuf, v int32) orb.MultiPolygon {
	b.reset()
	c := s.l.Cells
	for p := c.SiteStart[v]; p < c.SiteStart[v+1]; p++ {
		r0 := len(b.rings)
		for k := c.PolyStart[p]; k < c.PolyStart[p+1]; k++ {
			xy, _ := c.Ring(int(k))
			if !s.addRing(b, xy, k == c.PolyStart[p]) && k == c.PolyStart[p] {
				break
			}
		}
		b.endPolygon(r0)
	}
	if outlineValid(b.polys) {
		return b.polys
	}
	return s.checkRounding(c.Polygons(v), b.polys)
}

// ring converts one ring as addRing does, into memory of its own; nil
// when it degenerates.
func (s *scene) ring(in orb.Ring, exterior bool) orb.Ring {
	var b polyBuf
	if !s.addRing(&b, planar.FlatRing(in), exterior) {
		return nil
	}
	return b.rings[0]
}

// endPolygon keeps the rings from index r0 on as one polygon, if any.
func (b *polyBuf) endPolygon(r0 int) {
	if n := len(b.rings); n > r0 {
		b.polys = append(b.polys, b.rings[r0:n:n])
	}
}

// addRing converts one ring (interleaved local coordinates, closed or
// not) to output coordinates and keeps it in b, closed; false, keeping
// nothing, when it degenerates after rounding (fewer than three distinct
// positions, or zero area).
func (s *scene) addRing(b *polyBuf, xy []float64, exterior bool) bool {
	start := len(b.pts)
	for i := 0; i+1 < len(xy); i += 2 {
		b.pts = append(b.pts, orb.Point(s.point(orb.Point{xy[i], xy[i+1]})))
	}
	r := planar.DropRepeats(b.pts[start:]) // rounding may repeat points
	a := 0.0
	if len(r) >= 3 {
		a = planar.RingArea(planar.FlatRing(r))
	}
	if a == 0 {
		b.pts = b.pts[:start]
		return false
	}
	if (a > 0) != exterior {
		for i, j := 0, len(r)-1; i < j; i, j = i+1, j-1 {
			r[i], r[j] = r[j], r[i]
		}
	}
	b.pts = append(b.pts[:start+len(r)], r[0])
	end := len(b.pts)
	b.rings = append(b.rings, b.pts[start:end:end])
	return true
}
