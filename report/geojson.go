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
// at repeated points or written with more digits (outline.go). No "crs"
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
	"bytes"
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
	w io.Writer
	b []byte
	n int
}

// geoJSONFlush is the buffered size at which a layer's text is written on.
const geoJSONFlush = 64 << 10

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

// feature writes one feature with the given fields and values (nil,
// string, bool, float64 or an integer type).
func (l *geoJSON) feature(g orb.Geometry, fields []gpkg.Field, vals []any) error {
	if l.n > 0 {
		l.b = append(l.b, ',')
	}
	l.n++
	l.b = append(l.b, "\n"+`{"type":"Feature","geometry":`...)
	l.b = appendGeometry(l.b, g)
	l.b = append(l.b, `,"properties":{`...)
	for i, f := range fields {
		l.b = kv(l.b, f.Name, i == 0)
		n := len(l.b)
		l.b = appendValue(l.b, vals[i])
		if f.Type == gpkg.Real && vals[i] != nil && !bytes.ContainsAny(l.b[n:], ".en") {
			// A whole number in a REAL field keeps a decimal point, so a
			// reader that guesses types (GDAL) makes the field real, as in
			// the GeoPackage, whatever the values.
			l.b = append(l.b, ".0"...)
		}
	}
	l.b = append(l.b, "}}"...)
	if len(l.b) < geoJSONFlush {
		return nil
	}
	_, err := l.w.Write(l.b)
	l.b = l.b[:0]
	return err
}

// close ends the collection and writes what is left.
func (l *geoJSON) close() error {
	l.b = append(l.b, "\n]}\n"...)
	_, err := l.w.Write(l.b)
	l.b = nil
	return err
}

// appendValue appends one property value.
func appendValue(b []byte, v any) []byte {
	switch v := v.(type) {
	case nil:
		return append(b, "null"...)
	case string:
		return appendStr(b, v)
	case bool:
		return strconv.AppendBool(b, v)
	case float64:
		return appendNum(b, v)
	case int:
		return strconv.AppendInt(b, int64(v), 10)
	case int32:
		return strconv.AppendInt(b, int64(v), 10)
	case int64:
		return strconv.AppendInt(b, v, 10)
	}
	panic(fmt.Sprintf("report: layer property of type %T", v)) // a programming error: every producer passes the types above
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
				b = append(b, '[')
				for j, q := range r {
					if j > 0 {
						b = append(b, ',')
					}
					b = appendPos(b, q)
				}
				b = append(b, ']')
			}
			b = append(b, ']')
		}
		b = append(b, ']')
	}
	return append(b, '}')
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
func appendNum(b []byte, v float64) []byte {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return append(b, "null"...)
	}
	if math.Abs(v) < 1e8 && v != 0 {
		if n := math.Round(v * 1e7); n/1e7 == v {
			return appendDecimal7(b, int64(n))
		}
	}
	return strconv.AppendFloat(b, v, 'f', -1, 64)
}

// appendDecimal7 appends n/10⁷ in plain decimal without trailing zeros.
func appendDecimal7(b []byte, n int64) []byte {
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	b = strconv.AppendInt(b, n/1e7, 10)
	frac := n % 1e7
	if frac == 0 {
		return b
	}
	var d [8]byte
	d[0] = '.'
	for i := 7; i >= 1; i-- {
		d[i] = byte('0' + frac%10)
		frac /= 10
	}
	k := 8
	for d[k-1] == '0' {
		k--
	}
	return append(b, d[:k]...)
}

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
			for i, p := range s.l.Sites {
				dup := -1
				if tri != nil && i < len(tri.Vertex) && tri.Vertex[i] >= 0 {
					if src := int(tri.Source[tri.Vertex[i]]); src != i {
						dup = src
					}
				}
				var r any
				if v := s.rangeOf(i); v > 0 {
					r = v
				}
				if err := emit(orb.Point(s.point(p)), i, s.name(i), r, s.typeOf(i), dup); err != nil {
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
			for i, c := range s.cells {
				mp := s.multiPolygon(s.l.Cells.Polygons(c.Vertex))
				if len(mp) == 0 {
					continue
				}
				far := s.farthestOut(i)
				if err := emit(mp, c.Site, s.name(c.Site), c.Area, c.Share, c.Farthest, far[0], far[1], joinInts(c.Merged)); err != nil {
					return err
				}
			}
			return nil
		}}, 0)
}

// gapFields are the fields of a gaps layer.
func (s *scene) gapFields() []gpkg.Field {
	f := append([]any{"id", gpkg.Integer, "area_m2", gpkg.Real, "closing_range_m", gpkg.Real}, s.coordFields("deepest")...)
	return fieldList(append(f, "touches_boundary", gpkg.Boolean, "sites", gpkg.Text, "range_m", gpkg.Real)...)
}

// gapLayer is a gaps layer for gaps at range r; deepest gives gap i's
// deepest point in output coordinates.
func (s *scene) gapLayer(gaps []coverage.Gap, r float64, deepest func(i int) Point) *layerDef {
	return &layerDef{geom: gpkg.MultiPolygon, fields: s.gapFields(),
		each: func(emit emitFunc) error {
			for gi, g := range gaps {
				mp := s.multiPolygon(g.Outline)
				if len(mp) == 0 {
					continue
				}
				d := deepest(gi)
				if err := emit(mp, g.ID, g.Area, g.ClosingRange, d[0], d[1], g.TouchesBoundary, joinInts(g.Sites), r); err != nil {
					return err
				}
			}
			return nil
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
			for i, h := range p.Holes {
				if err := emit(orb.Point(s.closingOut(i)), h.Birth, h.Death, h.Death-h.Birth, s.holeNote(i), joinInts(h.BirthSites[:])); err != nil {
					return err
				}
			}
			return nil
		}}
}

// coveredLayer is the covered part of the area at the planned range
// (coverage.Layout.Covered: the area less the gap outlines, so inside the
// true covered part by at most the chord tolerance), one feature per
// connected covered part, largest first by outline area.
func (s *scene) coveredLayer() *layerDef {
	return &layerDef{geom: gpkg.MultiPolygon,
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
			for _, i := range order {
				mp := s.multiPolygon(orb.MultiPolygon{parts[i]})
				if len(mp) == 0 {
					continue
				}
				n++
				if err := emit(mp, n, area[i], s.a.Range); err != nil {
					return err
				}
			}
			return nil
		}}
}

// multiPolygon converts a local-plane multipolygon to output coordinates,
// rounded, repaired and oriented (exterior CCW, holes CW).
func (s *scene) multiPolygon(in orb.MultiPolygon) orb.MultiPolygon {
	out := orb.MultiPolygon{}
	for _, poly := range in {
		var op orb.Polygon
		for k, ring := range poly {
			r := s.ring(ring, k == 0)
			if r == nil {
				if k == 0 {
					break
				}
				continue
			}
			op = append(op, r)
		}
		if len(op) > 0 {
			out = append(out, op)
		}
	}
	return s.checkRounding(in, out)
}

// ring converts one ring; nil when it degenerates after rounding.
func (s *scene) ring(in orb.Ring, exterior bool) orb.Ring {
	r := make(orb.Ring, len(in), len(in)+1)
	for i, p := range in {
		r[i] = orb.Point(s.point(p))
	}
	r = planar.DropRepeats(r) // rounding may repeat points
	if len(r) < 3 {
		return nil
	}
	a := planar.RingArea(planar.FlatRing(r))
	if a == 0 {
		return nil
	}
	if (a > 0) != exterior {
		for i, j := 0, len(r)-1; i < j; i, j = i+1, j-1 {
			r[i], r[j] = r[j], r[i]
		}
	}
	return append(r, r[0])
}
