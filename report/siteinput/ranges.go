// Per-device ranges: each device's range from the sites file or from a
// table of ranges per device type, with --range as the common default.
//
// Sources, for each device in input order:
//
//  1. its own range: a CSV column named range or range_m, or a GeoJSON
//     "range" property (a JSON number is metres, a string is a length with
//     a unit exactly as --range accepts it: ParseLength);
//  2. else, with a type table (Inputs.TypeRanges), the range of its type: a
//     CSV column named type or device_type, or a GeoJSON "type" property;
//     types are matched after trimming spaces, ignoring case;
//  3. else the common range Inputs.Range (--range).
//
// Refused, with one line naming the file, the line or feature and the
// value: a range that does not parse, is NaN, zero, negative, has an
// unknown unit or lies outside [MinRangeMetres, MaxRangeMetres]; a type
// with no range in the table; a type table without a type column; a device
// with no range from any source; and a range column together with a type
// table (two range sources: no precedence is guessed, one must be dropped).
// A range column is never ignored: every command that reads sites either
// uses it or refuses it.

package siteinput

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"maps"
	"os"
	"slices"
	"strings"
)

// ErrNoRange is returned by Load when Inputs.RangeRequired is set and no
// source gives any device a range (no --range, no range column, no type
// table): the caller reports its missing --range flag.
var ErrNoRange = errors.New("no range given")

// TypeRanges is a table of ranges per device type.
type TypeRanges struct {
	// Ranges maps each type, lower case and trimmed, to its range (m).
	Ranges map[string]float64
	// Source names where the table came from in messages: "--type-range"
	// or the table file's name.
	Source string
	// Sum identifies the table file's bytes as read (zero for
	// --type-range).
	Sum Checksum
}

// typeKey is the table key of a device type: trimmed, lower case.
func typeKey(t string) string { return strings.ToLower(strings.TrimSpace(t)) }

// ParseTypeRanges reads --type-range values of the form TYPE=LENGTH (for
// example "gateway=150m"), one per flag use. A value without "=", an empty
// type, a bad length, or one type given twice with different ranges is an
// error naming the value.
func ParseTypeRanges(values []string, flag string) (*TypeRanges, error) {
	tr := &TypeRanges{Ranges: map[string]float64{}, Source: flag}
	for _, v := range values {
		name, length, ok := strings.Cut(v, "=")
		if !ok || typeKey(name) == "" {
			return nil, errorf("%s %q: give TYPE=LENGTH, e.g. gateway=150m", flag, v)
		}
		r, err := ParseLength(length, flag+" "+strings.TrimSpace(name))
		if err != nil {
			return nil, errorf("%v", err)
		}
		if err := tr.add(name, r, flag+" "+v); err != nil {
			return nil, err
		}
	}
	return tr, nil
}

// add puts type name with range r into the table; where names the entry.
func (tr *TypeRanges) add(name string, r float64, where string) error {
	k := typeKey(name)
	if old, dup := tr.Ranges[k]; dup && old != r {
		return errorf("%s: type %q given twice with different ranges (%g m and %g m)", where, strings.TrimSpace(name), old, r)
	}
	tr.Ranges[k] = r
	return nil
}

// LoadRangeTable reads a table of ranges per device type from a small CSV
// file with the header "type,range" (delimiter as for sites: ',', ';' or
// TAB) and one type per line, the range with a unit as --range accepts.
// Every problem names the file and line.
func LoadRangeTable(src Source) (*TypeRanges, error) {
	r := csv.NewReader(bytes.NewReader(src.Data))
	r.Comma = csvDelimiter(src.Data)
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	header, err := r.Read()
	if err != nil {
		return nil, csvError(src, err)
	}
	ti, ri := -1, -1
	for i, h := range header {
		switch typeKey(h) {
		case "type", "device_type":
			ti = i
		case "range", "range_m":
			ri = i
		}
	}
	if ti < 0 || ri < 0 {
		return nil, errorf("%s line 1: a range table needs the columns type and range (found %s)", src.Name, quoteList(header))
	}
	tr := &TypeRanges{Ranges: map[string]float64{}, Source: src.Name}
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvError(src, err)
		}
		line, _ := r.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		where := fmt.Sprintf("%s line %d", src.Name, line)
		if len(rec) <= max(ti, ri) || typeKey(rec[ti]) == "" {
			return nil, errorf("%s: needs a type and a range", where)
		}
		v, err := ParseLength(rec[ri], where+": range")
		if err != nil {
			return nil, errorf("%v", err)
		}
		if err := tr.add(rec[ti], v, where); err != nil {
			return nil, err
		}
	}
	if len(tr.Ranges) == 0 {
		return nil, errorf("%s: a header but no types", src.Name)
	}
	return tr, nil
}

// maxRangeTableBytes bounds a range table file: a table of device types
// is a few lines, so a megabyte is a wrong file.
const maxRangeTableBytes = 1 << 20

// ReadRangeTable reads the range table file at path (given to flag) with
// LoadRangeTable. It is not a sites file, so the sites' early checks
// (ReadFile) do not apply; a missing file, a folder or one over
// maxRangeTableBytes is an *Error.
func ReadRangeTable(path, flag string) (*TypeRanges, error) {
	fi, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil, errorf("%s: no such file (given to %s)", path, flag)
	case err != nil:
		return nil, errorf("%s: cannot read: %v", path, unwrapPathErr(err))
	case fi.IsDir():
		return nil, errorf("%s: is a folder, not a file (given to %s)", path, flag)
	case fi.Size() > maxRangeTableBytes:
		return nil, errorf("%s: %s, too large for a table of ranges per type (given to %s)", path, byteSize(fi.Size()), flag)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, errorf("%s: cannot read: %v", path, unwrapPathErr(err))
	}
	sum := ChecksumOf(b)
	b = bytes.TrimPrefix(b, []byte("\xef\xbb\xbf"))
	if len(bytes.TrimSpace(b)) == 0 {
		return nil, errorf("%s: file is empty", path)
	}
	tr, err := LoadRangeTable(Source{Name: path, Data: b})
	if tr != nil {
		tr.Sum = sum
	}
	return tr, err
}

// jsonLength renders a GeoJSON "range" property as a length text: a number
// is metres, a string is kept, null or absent is "" (no range of its own);
// ok is false for any other JSON value.
func jsonLength(raw json.RawMessage) (text string, ok bool) {
	raw = bytes.TrimSpace(raw)
	if len(raw) == 0 || string(raw) == "null" {
		return "", true
	}
	switch raw[0] {
	case '"':
		var s string
		if json.Unmarshal(raw, &s) != nil {
			return "", false
		}
		// An empty string is no range, as an empty CSV field is.
		return strings.TrimSpace(s), true
	case '-', '0', '1', '2', '3', '4', '5', '6', '7', '8', '9':
		return string(raw), true
	}
	return "", false
}

// resolveRanges gives every site its range (see the file comment) and sets
// sc.Ranges (nil when all are equal), sc.Range and sc.Types.
func (sc *Scene) resolveRanges(in Inputs, sites *siteSet) error {
	name := in.Sites.Name
	tab := in.TypeRanges
	sc.Types = sites.Types
	if sites.Ranges != nil && tab != nil {
		return errorf("%s has a range column and %s gives ranges per device type: two range sources; use one of them", name, tab.Source)
	}
	if tab != nil && sites.Types == nil {
		return errorf("%s gives ranges per device type, but %s has no type column (CSV: type; GeoJSON: a \"type\" property)", tab.Source, name)
	}
	if sites.Ranges == nil && tab == nil {
		if in.Range == 0 && in.RangeRequired {
			return ErrNoRange
		}
		sc.Range = in.Range
		return nil
	}
	rs := make([]float64, len(sites.Pts))
	for i := range rs {
		where := name + " " + sites.label(i)
		switch {
		case sites.Ranges != nil && sites.Ranges[i] != "":
			r, err := ParseLength(sites.Ranges[i], where+": range")
			if err != nil {
				return errorf("%v", err)
			}
			rs[i] = r
		case tab != nil && typeKey(sites.Types[i]) != "":
			r, ok := tab.Ranges[typeKey(sites.Types[i])]
			if !ok {
				return errorf("%s: type %q has no range in %s (it gives %s)", where, strings.TrimSpace(sites.Types[i]), tab.Source, strings.Join(slices.Sorted(maps.Keys(tab.Ranges)), ", "))
			}
			rs[i] = r
		case in.Range > 0:
			rs[i] = in.Range
		default:
			what := "range"
			if tab != nil {
				what = "type"
			}
			return errorf("%s: no %s, and no --range for devices without one", where, what)
		}
	}
	sc.Range = rs[0]
	for _, r := range rs {
		if r != rs[0] {
			sc.Ranges, sc.Range = rs, in.Range
			break
		}
	}
	return nil
}
