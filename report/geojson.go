// GeoJSON layers (RFC 7946): sites, service areas, gaps and hole-closing
// points (and the planning layers of plan_layers.go).
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
// (RFC 7946 §3.1.6). No "crs" member is written (§4).
//
// With Meta.Planar the same layers hold local x/y metres rounded to 1 mm
// and carry a foreign member "coordinates" saying so; their file names end
// in "-xy.geojson" (see LayerFile).
//
// Geometries are orb values (orb.Point, orb.MultiPolygon) in the
// orb/geojson model; they are encoded by the hand-written writer below.

package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// layer builds one FeatureCollection as JSON text. The encoder is written
// out by hand (positions with strconv's shortest round-trip formatting of
// the already rounded values, so a 7-decimal value prints with at most 7
// decimals) because reflection-based encoding of 10⁵ features costs more
// than the analysis; the tests decode every layer with orb/geojson.
type layer struct {
	b []byte
	n int
}

func (s *scene) newLayer() *layer { return s.newLayerSized(1 << 16) }

// newLayerSized starts a layer with room for about size bytes (a large
// layer built by doubling would copy itself many times over).
func (s *scene) newLayerSized(size int) *layer {
	l := &layer{b: make([]byte, 0, size)}
	l.b = append(l.b, `{"type":"FeatureCollection",`...)
	if !s.geographic() {
		l.b = append(l.b, `"coordinates":"local plane x/y in metres (not WGS84; not RFC 7946 longitude/latitude)",`...)
	}
	l.b = append(l.b, `"features":[`...)
	return l
}

// feature appends one feature; props appends the members of the
// properties object (without braces).
func (l *layer) feature(g orb.Geometry, props func(b []byte) []byte) {
	if l.n > 0 {
		l.b = append(l.b, ',')
	}
	l.n++
	l.b = append(l.b, "\n"+`{"type":"Feature","geometry":`...)
	l.b = appendGeometry(l.b, g)
	l.b = append(l.b, `,"properties":{`...)
	l.b = props(l.b)
	l.b = append(l.b, "}}"...)
}

func (l *layer) bytes() []byte { return append(l.b, "\n]}\n"...) }

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

func appendInts(b []byte, v []int) []byte {
	b = append(b, '[')
	for i, x := range v {
		if i > 0 {
			b = append(b, ',')
		}
		b = strconv.AppendInt(b, int64(x), 10)
	}
	return append(b, ']')
}

// kv appends "key": followed by the value appended by f, with a leading
// comma unless first.
func kv(b []byte, key string, first bool) []byte {
	if !first {
		b = append(b, ',')
	}
	b = append(b, '"')
	b = append(b, key...)
	return append(b, `":`...)
}

func (s *scene) sitesLayer() ([]byte, error) {
	l := s.newLayer()
	tri := s.l.Tri
	for i, p := range s.l.Sites {
		dup := -1
		if tri != nil && i < len(tri.Vertex) && tri.Vertex[i] >= 0 {
			if src := int(tri.Source[tri.Vertex[i]]); src != i {
				dup = src
			}
		}
		l.feature(orb.Point(s.point(p)), func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "site", true), int64(i), 10)
			b = appendStr(kv(b, "name", false), s.name(i))
			b = s.appendRangeProps(b, i)
			return strconv.AppendInt(kv(b, "duplicate_of", false), int64(dup), 10)
		})
	}
	return l.bytes(), nil
}

func (s *scene) serviceAreasLayer() ([]byte, error) {
	// About 26 bytes a position and 200 of properties a feature.
	l := s.newLayerSized(13*len(s.l.Cells.XY) + 200*len(s.cells) + 1<<16)
	for i, c := range s.cells {
		mp := s.multiPolygon(s.l.Cells.Polygons(c.Vertex))
		if len(mp) == 0 {
			continue
		}
		l.feature(mp, func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "site", true), int64(c.Site), 10)
			b = appendStr(kv(b, "name", false), s.name(c.Site))
			b = appendNum(kv(b, "area_m2", false), c.Area)
			b = appendNum(kv(b, "share", false), c.Share)
			b = appendNum(kv(b, "farthest_m", false), c.Farthest)
			b = appendPos(kv(b, "farthest_point", false), orb.Point(s.farthestOut(i)))
			return appendInts(kv(b, "merged", false), c.Merged)
		})
	}
	return l.bytes(), nil
}

func (s *scene) gapsLayer() ([]byte, error) {
	l := s.newLayer()
	for gi, g := range s.a.Gaps {
		mp := s.multiPolygon(g.Outline)
		if len(mp) == 0 {
			continue
		}
		l.feature(mp, func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "id", true), int64(g.ID), 10)
			b = appendNum(kv(b, "area_m2", false), g.Area)
			b = appendNum(kv(b, "closing_range_m", false), g.ClosingRange)
			b = appendPos(kv(b, "deepest_point", false), orb.Point(s.deepestOut(gi)))
			b = strconv.AppendBool(kv(b, "touches_boundary", false), g.TouchesBoundary)
			b = appendInts(kv(b, "sites", false), g.Sites)
			return appendNum(kv(b, "range_m", false), s.a.Range)
		})
	}
	return l.bytes(), nil
}

func (s *scene) holesLayer() ([]byte, error) {
	l := s.newLayer()
	if p := s.a.Persistence; p != nil {
		for i, h := range p.Holes {
			note := s.holeNote(i)
			l.feature(orb.Point(s.closingOut(i)), func(b []byte) []byte {
				b = appendNum(kv(b, "birth_m", true), h.Birth)
				b = appendNum(kv(b, "death_m", false), h.Death)
				b = appendNum(kv(b, "lifetime_m", false), h.Death-h.Birth)
				b = appendStr(kv(b, "note", false), note)
				return appendInts(kv(b, "birth_sites", false), h.BirthSites[:])
			})
		}
	}
	return l.bytes(), nil
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
	return out
}

// ring converts one ring; nil when it degenerates after rounding.
func (s *scene) ring(in orb.Ring, exterior bool) orb.Ring {
	r := make(orb.Ring, 0, len(in)+1)
	for i, p := range in {
		var q orb.Point
		if i > 0 && i == len(in)-1 && p == in[0] {
			q = r[0] // the closing position, already converted
		} else {
			q = orb.Point(s.point(p))
		}
		if len(r) > 0 && r[len(r)-1] == q {
			continue
		}
		r = append(r, q)
	}
	for len(r) > 1 && r[len(r)-1] == r[0] {
		r = r[:len(r)-1]
	}
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
