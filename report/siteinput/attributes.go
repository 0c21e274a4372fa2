// The sites' own attributes: every CSV column, GeoJSON property or
// GeoPackage attribute of a site that sitecover does not read itself
// (asset id, floor, owner, install date, ...), kept by input index so the
// per-site output layers can carry them (report/attributes.go).
//
// Read by sitecover, hence not attributes: the coordinate columns used
// (lat/lon, x/y or the WKT column), the column or property that gave the
// site its name ("name", else "id"), and the range and type columns or
// properties. Everything else is an attribute under its name as given, in
// the order of the CSV header or of first appearance in the GeoJSON file
// (for a GeoPackage, the layer's column order).
//
// Types: a CSV column is text, its fields as written (trimmed; "" for an
// empty field), so ids like "007" keep their zeros. A GeoJSON property is
// typed by its values over all sites: integer when every value is a JSON
// number written without fraction or exponent that fits int64, real when
// every value is a number, boolean when every value is true or false, else
// text (strings as they are, other values as compact JSON text, so no
// array or object reaches an output). null or a missing property is no
// value (nil). A GeoPackage REAL column stays real (geopackage.go writes
// its whole values with a decimal point). The positions of a MultiPoint
// share their feature's attributes.

package siteinput

import (
	"bytes"
	"encoding/json"
	"strconv"
	"strings"

	"github.com/sitecover/sitecover/report/gpkg"
)

// Attribute is one attribute column of the sites.
type Attribute struct {
	// Name is the column or property name as given in the input.
	Name string
	// Type is gpkg.Text, gpkg.Integer, gpkg.Real or gpkg.Boolean.
	Type gpkg.FieldType
	// Values holds the value of each site by input index: nil (none), a
	// string, an int64, a float64 or a bool, as Type says.
	Values []any
}

// attrBuilder gathers attribute columns while the sites are read.
type attrBuilder struct {
	cols  []Attribute
	index map[string]int // column by name
	// done counts the sites whose attributes were added.
	done int
	// json is true when the values are undecoded JSON (json.RawMessage)
	// to be typed by finish.
	json bool
}

// column returns the column named name, adding it (with no value for the
// sites so far) when new.
func (b *attrBuilder) column(name string) *Attribute {
	if k, ok := b.index[name]; ok {
		return &b.cols[k]
	}
	if b.index == nil {
		b.index = map[string]int{}
	}
	b.index[name] = len(b.cols)
	b.cols = append(b.cols, Attribute{Name: name, Type: gpkg.Text, Values: make([]any, b.done)})
	return &b.cols[len(b.cols)-1]
}

// pad gives every column a value (nil) for each of the first n sites.
func (b *attrBuilder) pad(n int) {
	for k := range b.cols {
		for len(b.cols[k].Values) < n {
			b.cols[k].Values = append(b.cols[k].Values, nil)
		}
	}
}

// addCSV records the fields of one CSV record for the sites up to n:
// names[k] is the header of column cols[k]. The columns are made at the
// first record, one per header (a repeated header is a column of its own),
// and the later records append by position.
func (b *attrBuilder) addCSV(n int, rec []string, cols []int, names []string) {
	if len(b.cols) == 0 {
		for _, name := range names {
			b.cols = append(b.cols, Attribute{Name: name, Type: gpkg.Text, Values: make([]any, b.done)})
		}
	}
	for k, c := range cols {
		v := field(rec, c)
		for len(b.cols[k].Values) < n {
			b.cols[k].Values = append(b.cols[k].Values, v)
		}
	}
	b.done = n
}

// join appends the CSV columns of o, read from the next part of the same
// file (the same columns in the same order), to b.
func (b *attrBuilder) join(o *attrBuilder) {
	if len(o.cols) == 0 {
		return
	}
	if len(b.cols) == 0 {
		b.cols = make([]Attribute, len(o.cols))
		for k, c := range o.cols {
			b.cols[k] = Attribute{Name: c.Name, Type: c.Type, Values: make([]any, b.done)}
		}
	}
	for k := range b.cols {
		b.cols[k].Values = append(b.cols[k].Values, o.cols[k].Values...)
	}
	b.done += o.done
}

// addJSON records the members of a Feature's properties object (raw, or
// nil) for the sites up to n, except name, range and type, and id when
// idGaveName (keys matched ignoring case, as gjProps reads them). A member given twice counts once, with its last value (as
// encoding/json reads it).
func (b *attrBuilder) addJSON(n int, raw []byte, idGaveName bool) {
	b.json = true
	if len(raw) > 0 {
		eachMember(raw, func(key string, val json.RawMessage) {
			if strings.EqualFold(key, "name") || strings.EqualFold(key, "range") || strings.EqualFold(key, "type") ||
				idGaveName && strings.EqualFold(key, "id") {
				return
			}
			col := b.column(key)
			col.Values = col.Values[:min(len(col.Values), b.done)]
			for len(col.Values) < n {
				col.Values = append(col.Values, val)
			}
		})
	}
	b.pad(n)
	b.done = n
}

// eachMember calls fn with each member of the JSON object obj, in order:
// the key decoded, the value as it stands. obj must be valid JSON (the
// decoder checked it), so the scan only finds where tokens end.
func eachMember(obj []byte, fn func(key string, val json.RawMessage)) {
	i := skipSpace(obj, 1)
	for i < len(obj) && obj[i] == '"' {
		end := stringEnd(obj, i)
		key := string(obj[i+1 : end-1])
		if bytes.IndexByte(obj[i:end], '\\') >= 0 {
			json.Unmarshal(obj[i:end], &key)
		}
		i = skipSpace(obj, end)
		i = skipSpace(obj, i+1) // the colon
		vend := valueEnd(obj, i)
		fn(key, obj[i:vend])
		i = skipSpace(obj, vend)
		if i < len(obj) && obj[i] == ',' {
			i = skipSpace(obj, i+1)
		}
	}
}

// skipSpace returns the index of the first non-space byte of b at or after
// i (JSON white space).
func skipSpace(b []byte, i int) int {
	for i < len(b) && (b[i] == ' ' || b[i] == '\t' || b[i] == '\n' || b[i] == '\r') {
		i++
	}
	return i
}

// stringEnd returns the index just past the JSON string starting at b[i].
func stringEnd(b []byte, i int) int {
	for i++; i < len(b); i++ {
		switch b[i] {
		case '\\':
			i++
		case '"':
			return i + 1
		}
	}
	return len(b)
}

// valueEnd returns the index just past the JSON value starting at b[i].
func valueEnd(b []byte, i int) int {
	if i >= len(b) {
		return i
	}
	switch b[i] {
	case '"':
		return stringEnd(b, i)
	case '{', '[':
		depth := 0
		for ; i < len(b); i++ {
			switch b[i] {
			case '"':
				i = stringEnd(b, i) - 1
			case '{', '[':
				depth++
			case '}', ']':
				depth--
				if depth == 0 {
					return i + 1
				}
			}
		}
		return len(b)
	}
	for i < len(b) && !strings.ContainsRune(",}] \t\n\r", rune(b[i])) {
		i++
	}
	return i
}

// finish returns the columns with typed values (see the file comment);
// nil when there are none.
func (b *attrBuilder) finish(n int) []Attribute {
	if len(b.cols) == 0 {
		return nil
	}
	b.pad(n)
	if b.json {
		for k := range b.cols {
			typeJSON(&b.cols[k])
		}
	}
	return b.cols
}

// typeJSON types a column of undecoded JSON values (file comment).
func typeJSON(c *Attribute) {
	ints, nums, bools, some := true, true, true, false
	for i, v := range c.Values {
		raw, _ := v.(json.RawMessage)
		raw = bytes.TrimSpace(raw)
		if len(raw) == 0 || string(raw) == "null" {
			c.Values[i] = nil
			continue
		}
		c.Values[i] = raw
		some = true
		switch raw[0] {
		case 't', 'f':
			ints, nums = false, false
		case '"', '[', '{':
			ints, nums, bools = false, false, false
		default:
			bools = false
			if _, err := strconv.ParseInt(string(raw), 10, 64); err != nil {
				ints = false
			}
		}
	}
	switch {
	case !some:
		c.Type = gpkg.Text
	case ints:
		c.Type = gpkg.Integer
	case nums:
		c.Type = gpkg.Real
	case bools:
		c.Type = gpkg.Boolean
	default:
		c.Type = gpkg.Text
	}
	for i, v := range c.Values {
		if v == nil {
			continue
		}
		raw := v.(json.RawMessage)
		switch c.Type {
		case gpkg.Integer:
			c.Values[i], _ = strconv.ParseInt(string(raw), 10, 64)
		case gpkg.Real:
			c.Values[i], _ = strconv.ParseFloat(string(raw), 64)
		case gpkg.Boolean:
			c.Values[i] = raw[0] == 't'
		default:
			c.Values[i] = jsonAsText(raw)
		}
	}
}

// jsonAsText is a JSON value as text: a string's content, any other value
// as compact JSON.
func jsonAsText(raw json.RawMessage) string {
	if raw[0] == '"' {
		var s string
		if json.Unmarshal(raw, &s) == nil {
			return s
		}
	}
	var b bytes.Buffer
	if json.Compact(&b, raw) == nil {
		return b.String()
	}
	return string(raw)
}
