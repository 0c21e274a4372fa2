// A single-pass scanner for the GeoJSON members sitecover reads.
//
// scanGeoJSON fills a gjDoc exactly as encoding/json's Unmarshal would,
// for the documents it accepts: it validates the whole input against the
// JSON grammar (RFC 8259: whitespace, literals, the number grammar, string
// escapes, no control characters in strings) and keeps the members it does
// not read only as validated bytes. It declines (ok == false) wherever
// encoding/json's behaviour needs more than that — a key that matches a
// member name only case-insensitively or carries escapes, a non-ASCII key,
// a repeated member, a "type" string with escapes or non-ASCII bytes, a
// value of the wrong JSON kind, nesting deeper than maxScanDepth — and on
// any syntax error; the caller then decodes with encoding/json, whose
// result and error messages stay the reference. FuzzScanGeoJSON checks
// that every accepted input decodes to the same gjDoc with encoding/json.
//
// The scanner allocates a feature's properties and geometry and the
// slices of features and geometries; raw members alias the input bytes.

package main

import "encoding/json"

// maxScanDepth bounds the nesting the scanner follows (encoding/json
// allows 10 000 and reports deeper input as an error).
const maxScanDepth = 512

// gjScan is the scanner state: the input and the read position.
type gjScan struct {
	b []byte
	i int
}

// scanGeoJSON decodes b into a gjDoc, or reports ok == false when the
// input needs encoding/json (see the file comment).
func scanGeoJSON(b []byte) (d gjDoc, ok bool) {
	p := gjScan{b: b}
	p.ws()
	if !p.peek('{') || !p.doc(&d) {
		return gjDoc{}, false
	}
	p.ws()
	return d, p.i == len(p.b)
}

// Member names per object kind, and their indices.
var (
	docKeys  = []string{"type", "features", "id", "properties", "geometry", "coordinates", "geometries"}
	featKeys = []string{"type", "id", "properties", "geometry"}
	geomKeys = []string{"type", "coordinates", "geometries"}
	propKeys = []string{"name", "id", "exclude", "weight"}
)

// doc reads the top-level object.
func (p *gjScan) doc(d *gjDoc) bool {
	return p.object(docKeys, 1, func(k int) bool {
		switch docKeys[k] {
		case "type":
			return p.typeName(&d.Type)
		case "features":
			return p.features(&d.Features)
		case "id":
			return p.raw(&d.ID)
		case "properties":
			return p.props(&d.Properties)
		case "geometry":
			return p.geometryPtr(&d.Geometry, 2)
		case "coordinates":
			return p.raw(&d.Coordinates)
		default: // "geometries"
			return p.geometries(&d.Geometries, 2)
		}
	})
}

// features reads the "features" array (or null).
func (p *gjScan) features(fs *[]gjFeature) bool {
	return objectArray(p, fs, 16, func(f *gjFeature) bool {
		return p.object(featKeys, 3, func(k int) bool {
			switch featKeys[k] {
			case "type":
				return p.typeName(&f.Type)
			case "id":
				return p.raw(&f.ID)
			case "properties":
				return p.props(&f.Properties)
			default: // "geometry"
				return p.geometryPtr(&f.Geometry, 4)
			}
		})
	})
}

// objectArray reads an array of objects (or null) into *dst, each
// element by read, which finds the '{' at p.i. A null array gives a nil
// slice and an empty one an empty slice, as with encoding/json.
func objectArray[T any](p *gjScan, dst *[]T, capHint int, read func(*T) bool) bool {
	if p.null() {
		*dst = nil
		return true
	}
	if !p.peek('[') {
		return false
	}
	out := make([]T, 0, capHint)
	ok := p.array(func() bool {
		if !p.peek('{') {
			return false
		}
		var zero T
		out = append(out, zero)
		return read(&out[len(out)-1])
	})
	*dst = out
	return ok
}

// props reads a properties object (or null).
func (p *gjScan) props(pp **gjProps) bool {
	return objectPtr(p, pp, func(pr *gjProps) bool {
		return p.object(propKeys, 1, func(k int) bool {
			switch propKeys[k] {
			case "name":
				return p.raw(&pr.Name)
			case "id":
				return p.raw(&pr.ID)
			case "exclude":
				return p.raw(&pr.Exclude)
			default: // "weight"
				return p.raw(&pr.Weight)
			}
		})
	})
}

// geometryPtr reads a geometry object (or null) at nesting depth.
func (p *gjScan) geometryPtr(gp **gjGeometry, depth int) bool {
	return objectPtr(p, gp, func(g *gjGeometry) bool { return p.geometry(g, depth) })
}

// objectPtr reads an object (or null) into a new *T, by read, which finds
// the '{' at p.i. A null gives a nil pointer, as with encoding/json.
func objectPtr[T any](p *gjScan, dst **T, read func(*T) bool) bool {
	if p.null() {
		*dst = nil
		return true
	}
	if !p.peek('{') {
		return false
	}
	*dst = new(T)
	return read(*dst)
}

// geometry reads the members of a geometry object into g.
func (p *gjScan) geometry(g *gjGeometry, depth int) bool {
	if depth > maxScanDepth {
		return false
	}
	return p.object(geomKeys, depth, func(k int) bool {
		switch geomKeys[k] {
		case "type":
			return p.typeName(&g.Type)
		case "coordinates":
			return p.raw(&g.Coordinates)
		default: // "geometries"
			return p.geometries(&g.Geometries, depth+2)
		}
	})
}

// geometries reads a GeometryCollection's member array (or null).
func (p *gjScan) geometries(gs *[]gjGeometry, depth int) bool {
	return objectArray(p, gs, 4, func(g *gjGeometry) bool { return p.geometry(g, depth) })
}

// object reads an object at p.i ('{' already seen by peek) whose known
// members are keys: member k is read by member(k), others are validated
// and skipped at nesting depth. A repeated known member declines. With
// keys == nil every member is skipped and names may hold any escape.
func (p *gjScan) object(keys []string, depth int, member func(k int) bool) bool {
	var seen uint32
	if p.opened('}') {
		return true
	}
	for {
		k := -1
		if keys == nil {
			if !p.skipString() {
				return false
			}
		} else {
			key, ok := p.plain()
			if !ok {
				return false
			}
			if k, ok = matchKey(key, keys); !ok {
				return false
			}
		}
		p.ws()
		if !p.peek(':') {
			return false
		}
		p.i++
		p.ws()
		if k >= 0 {
			if seen&(1<<k) != 0 {
				return false
			}
			seen |= 1 << k
			if !member(k) {
				return false
			}
		} else if !p.skip(depth + 1) {
			return false
		}
		if done, ok := p.after('}'); done || !ok {
			return ok
		}
	}
}

// array reads an array at p.i ('[' already seen by peek), calling elem
// at the start of each element.
func (p *gjScan) array(elem func() bool) bool {
	if p.opened(']') {
		return true
	}
	for {
		if !elem() {
			return false
		}
		if done, ok := p.after(']'); done || !ok {
			return ok
		}
	}
}

// after reads what follows a member or element: a comma (more to come)
// or the closing bracket (done); anything else is a syntax error.
func (p *gjScan) after(closing byte) (done, ok bool) {
	p.ws()
	switch {
	case p.peek(','):
		p.i++
		p.ws()
		return false, true
	case p.peek(closing):
		p.i++
		return true, true
	}
	return false, false
}

// opened moves past an opening bracket and reports whether the closing
// one follows at once (an empty object or array, consumed).
func (p *gjScan) opened(closing byte) bool {
	p.i++
	p.ws()
	if p.peek(closing) {
		p.i++
		return true
	}
	return false
}

// matchKey returns the index of the ASCII name key in keys, -1 for a
// member to skip, and ok == false for a case variant of a known name,
// which encoding/json's case-insensitive matching would take.
func matchKey(key []byte, keys []string) (int, bool) {
	for k, name := range keys {
		if string(key) == name {
			return k, true
		}
	}
	for _, name := range keys {
		if asciiEqualFold(key, name) {
			return 0, false
		}
	}
	return -1, true
}

func asciiEqualFold(a []byte, b string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		x, y := a[i], b[i]
		if 'A' <= x && x <= 'Z' {
			x += 'a' - 'A'
		}
		if 'A' <= y && y <= 'Z' {
			y += 'a' - 'A'
		}
		if x != y {
			return false
		}
	}
	return true
}

// plain reads a string of printable ASCII without escapes, the only
// kind whose decoded value is its bytes, for member names and "type".
func (p *gjScan) plain() ([]byte, bool) {
	if !p.peek('"') {
		return nil, false
	}
	start := p.i + 1
	for j := start; j < len(p.b); j++ {
		switch c := p.b[j]; {
		case c == '"':
			p.i = j + 1
			return p.b[start:j], true
		case c == '\\' || c < 0x20 || c >= 0x80:
			return nil, false
		}
	}
	return nil, false
}

// typeName reads a "type" value: a plain string, or null (which leaves
// *s unchanged, as encoding/json does).
func (p *gjScan) typeName(s *string) bool {
	if p.null() {
		return true
	}
	t, ok := p.plain()
	*s = string(t)
	return ok
}

// raw validates the value at p.i and stores its bytes in *m.
func (p *gjScan) raw(m *json.RawMessage) bool {
	start := p.i
	if !p.skip(1) {
		return false
	}
	*m = json.RawMessage(p.b[start:p.i])
	return true
}

// null consumes a null literal if one is next.
func (p *gjScan) null() bool {
	if p.i+4 <= len(p.b) && string(p.b[p.i:p.i+4]) == "null" {
		p.i += 4
		return true
	}
	return false
}

func (p *gjScan) peek(c byte) bool { return p.i < len(p.b) && p.b[p.i] == c }

// ws skips JSON whitespace.
func (p *gjScan) ws() {
	for p.i < len(p.b) {
		switch p.b[p.i] {
		case ' ', '\t', '\n', '\r':
			p.i++
		default:
			return
		}
	}
}

// skip validates one JSON value at p.i, nested depth deep, and moves past
// it.
func (p *gjScan) skip(depth int) bool {
	if depth > maxScanDepth || p.i >= len(p.b) {
		return false
	}
	switch c := p.b[p.i]; {
	case c == '{':
		return p.object(nil, depth, nil)
	case c == '[':
		return p.array(func() bool { return p.skip(depth + 1) })
	case c == '"':
		return p.skipString()
	case c == '-' || '0' <= c && c <= '9':
		return p.skipNumber()
	case c == 't':
		return p.literal("true")
	case c == 'f':
		return p.literal("false")
	case c == 'n':
		return p.literal("null")
	}
	return false
}

func (p *gjScan) literal(s string) bool {
	if p.i+len(s) <= len(p.b) && string(p.b[p.i:p.i+len(s)]) == s {
		p.i += len(s)
		return true
	}
	return false
}

// skipString validates a string (RFC 8259 §7) and moves past it. Bytes
// of 0x80 and above are taken as they are, as encoding/json's validation
// does.
func (p *gjScan) skipString() bool {
	if !p.peek('"') {
		return false
	}
	for j := p.i + 1; j < len(p.b); j++ {
		switch c := p.b[j]; {
		case c == '"':
			p.i = j + 1
			return true
		case c < 0x20:
			return false
		case c == '\\':
			j++
			if j >= len(p.b) {
				return false
			}
			switch p.b[j] {
			case '"', '\\', '/', 'b', 'f', 'n', 'r', 't':
			case 'u':
				if j+4 >= len(p.b) {
					return false
				}
				for _, h := range p.b[j+1 : j+5] {
					if !('0' <= h && h <= '9' || 'a' <= h && h <= 'f' || 'A' <= h && h <= 'F') {
						return false
					}
				}
				j += 4
			default:
				return false
			}
		}
	}
	return false
}

// skipNumber validates a number, -?(0|[1-9][0-9]*)(.[0-9]+)?([eE][+-]?[0-9]+)?,
// and moves past it.
func (p *gjScan) skipNumber() bool {
	b, j := p.b, p.i
	if j < len(b) && b[j] == '-' {
		j++
	}
	digits := func() int { // the number of digits read at j
		d := j
		for j < len(b) && '0' <= b[j] && b[j] <= '9' {
			j++
		}
		return j - d
	}
	switch {
	case j < len(b) && b[j] == '0':
		j++
	case digits() == 0:
		return false
	}
	if j < len(b) && b[j] == '.' {
		j++
		if digits() == 0 {
			return false
		}
	}
	if j < len(b) && (b[j] == 'e' || b[j] == 'E') {
		j++
		if j < len(b) && (b[j] == '+' || b[j] == '-') {
			j++
		}
		if digits() == 0 {
			return false
		}
	}
	p.i = j
	return true
}
