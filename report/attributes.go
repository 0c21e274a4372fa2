// The sites' own attributes in the per-site output layers: every column
// or property of an input site that sitecover does not read itself
// (Meta.SiteAttributes, read by siteinput: asset id, floor, owner, ...)
// is appended, after the layer's own fields, to each feature of the
// sites layer and of the service-area layer (the site's attributes; a
// service area of merged duplicates carries those of its first site).
//
// Names: an attribute keeps its input name, trimmed, except that
//   - quotes, backslashes and control characters become "_" (the name is
//     then written as is in GeoJSON and as a quoted GeoPackage column),
//     and an empty name becomes "field_k" (k: its 1-based position among
//     the attributes, as GDAL names header-less columns);
//   - a name equal, ignoring case, to one of sitecover's per-site fields
//     (siteFieldNames) or of the layer's own fields, or to the GeoPackage
//     columns fid and geom, is prefixed with "input_" (repeatedly while
//     it still clashes): an input column "share" is written "input_share";
//   - a name equal, ignoring case, to an earlier attribute's (GeoPackage
//     and GDAL names are case-insensitive) gets "_2", "_3", ...
//
// The same attribute has the same name in every per-site layer. Types and
// values are siteinput's (text, integer, real, boolean; nil for none).

package report

import (
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/report/gpkg"
)

// attrPrefix is put in front of an attribute name that clashes with one of
// sitecover's own fields.
const attrPrefix = "input_"

// siteFieldNames are sitecover's own fields of the per-site layers (the
// sites and service-area layers, with common or own ranges) and the
// GeoPackage's own columns; an attribute of one of these names is
// prefixed in every layer, so it is named alike in all of them.
var siteFieldNames = []string{
	"site", "name", "range_m", "type", "duplicate_of", "area_m2", "share", "farthest_m",
	"farthest_lon", "farthest_lat", "farthest_x", "farthest_y", "merged",
	"full_cover_range_m", "hidden", "served_m2", "fid", "geom",
}

// attributeFields returns the output fields of the site attributes for a
// layer whose own fields are own (see the file comment for the names).
func (s *scene) attributeFields(own []gpkg.Field) []gpkg.Field {
	taken := map[string]bool{}
	for _, n := range siteFieldNames {
		taken[n] = true
	}
	for _, f := range own {
		taken[strings.ToLower(f.Name)] = true
	}
	out := make([]gpkg.Field, len(s.m.SiteAttributes))
	used := map[string]bool{}
	for k, a := range s.m.SiteAttributes {
		name := cleanFieldName(a.Name)
		if name == "" {
			name = "field_" + strconv.Itoa(k+1)
		}
		for taken[strings.ToLower(name)] {
			name = attrPrefix + name
		}
		base := name
		for n := 2; used[strings.ToLower(name)] || taken[strings.ToLower(name)]; n++ {
			name = base + "_" + strconv.Itoa(n)
		}
		used[strings.ToLower(name)] = true
		out[k] = gpkg.Field{Name: name, Type: a.Type}
	}
	return out
}

// cleanFieldName trims a name and replaces quotes, backslashes, control
// characters and invalid UTF-8 by "_".
func cleanFieldName(name string) string {
	name = strings.ToValidUTF8(strings.TrimSpace(name), "_")
	return strings.Map(func(r rune) rune {
		if r == '"' || r == '\\' || r < 0x20 || r == 0x7f {
			return '_'
		}
		return r
	}, name)
}

// withAttributes returns d with the site attributes appended to its fields
// and to each feature's values, taken for the input site whose index is
// value siteAt of the feature. Without attributes it returns d unchanged.
func (s *scene) withAttributes(d *layerDef, siteAt int) *layerDef {
	attrs := s.m.SiteAttributes
	if len(attrs) == 0 {
		return d
	}
	extra := s.attributeFields(d.fields)
	each := d.each
	fields := append(d.fields[:len(d.fields):len(d.fields)], extra...)
	return &layerDef{table: d.table, geom: d.geom, fields: fields, lead: d.lead,
		each: func(emit emitFunc) error {
			var all []value // reused: emit reads the values before it returns
			return each(func(g orb.Geometry, vals ...value) error {
				site := -1
				if v := vals[siteAt]; v.kind == intValue {
					site = int(v.n)
				}
				all = append(all[:0], vals...)
				for _, a := range attrs {
					var v value
					if site >= 0 && site < len(a.Values) {
						v = vAny(a.Values[site])
					}
					all = append(all, v)
				}
				return emit(g, all...)
			})
		}}
}
