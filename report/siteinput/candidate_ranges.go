// Candidate spots with their own ranges (suggest --candidates): a device
// mounted at a spot may be of another model than the default new device.
//
// Each spot's range comes, as a device's does (ranges.go), from
//
//  1. its own range: a CSV column named range or range_m, or a GeoJSON
//     "range" property (a JSON number is metres, a string a length with a
//     unit exactly as --range accepts it: ParseLength);
//  2. else, with a type table (Inputs.TypeRanges), the range of its type: a
//     CSV column named type or device_type, or a GeoJSON "type" property;
//  3. else none of its own (Items.Ranges holds 0): the command gives it the
//     added devices' range (--range, or --new-type's in the table).
//
// Refused, with one line naming the file, the line or feature and the
// value: a range that does not parse, is NaN, zero, negative, has an
// unknown unit or lies outside [MinRangeMetres, MaxRangeMetres]; a type
// with no range in the table; a file with both a range column and a type
// column when a type table is given (two range sources: no precedence is
// guessed). A type column without a table is a label only, as for sites.

package siteinput

import (
	"fmt"
	"maps"
	"slices"
	"strings"
)

// candidateRangeSource keeps, while a candidates file is read, the range
// text and type of each item ("" for none); nil slices when the file has
// no range or type column or property.
type candidateRangeSource struct {
	ranges, types []string
}

// resolveCandidateRanges sets it.Ranges from the range texts and types
// read with the items (see the file comment); name is the file's name.
func (it *Items) resolveCandidateRanges(name string, src candidateRangeSource, tab *TypeRanges) error {
	if src.ranges == nil && (src.types == nil || tab == nil) {
		return nil
	}
	if src.ranges != nil && src.types != nil && tab != nil {
		return errorf("%s has a range column and a type column, and %s gives ranges per device type: two range sources for the candidate spots; use one of them", name, tab.Source)
	}
	rs := make([]float64, len(it.Pts))
	own := false
	for i := range rs {
		where := name + " " + it.Where[i]
		if it.Names[i] != "" {
			where += fmt.Sprintf(" (%q)", it.Names[i])
		}
		if it.Names[i] != "" {

		}
		switch {
		case i < len(src.ranges) && src.ranges[i] != "":
			r, err := ParseLength(src.ranges[i], where+": range")
			if err != nil {
				return errorf("%v", err)
			}
			rs[i], own = r, true
		case tab != nil && i < len(src.types) && typeKey(src.types[i]) != "":
			r, ok := tab.Ranges[typeKey(src.types[i])]
			if !ok {
				return errorf("%s: type %q has no range in %s (it gives %s)", where, strings.TrimSpace(src.types[i]), tab.Source, strings.Join(slices.Sorted(maps.Keys(tab.Ranges)), ", "))
			}
			rs[i], own = r, true
		}
	}
	if own {
		it.Ranges = rs
	}
	return nil
}
