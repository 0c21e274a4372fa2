// Tests of the names of the sites' own attributes in the per-site layers
// (attributes.go).

package report

import (
	"slices"
	"testing"

	"github.com/sitecover/sitecover/report/gpkg"
	"github.com/sitecover/sitecover/report/siteinput"
)

func TestAttributeFieldNames(t *testing.T) {
	cases := []struct {
		name string
		in   []string
		own  []string
		want []string
	}{
		{"kept as given", []string{"asset id", "Floor", "owner"}, []string{"site", "name"}, []string{"asset id", "Floor", "owner"}},
		{"clash with our fields, any case", []string{"share", "Site", "FID", "geom"}, []string{"site"}, []string{"input_share", "input_Site", "input_FID", "input_geom"}},
		{"clash with the layer's own field", []string{"extra_m"}, []string{"site", "extra_m"}, []string{"input_extra_m"}},
		{"repeats, ignoring case", []string{"a", "A", "a", "share", "input_share"}, nil, []string{"a", "A_2", "a_3", "input_share", "input_share_2"}},
		{"empty and unsafe characters", []string{"", "  ", "x\"y\\z\t"}, nil, []string{"field_1", "field_2", "x_y_z"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var m Meta
			for _, n := range c.in {
				m.SiteAttributes = append(m.SiteAttributes, siteinput.Attribute{Name: n, Type: gpkg.Text})
			}
			var own []gpkg.Field
			for _, n := range c.own {
				own = append(own, gpkg.Field{Name: n, Type: gpkg.Text})
			}
			s := newScene(nil, nil, m)
			var got []string
			for _, f := range s.attributeFields(own) {
				got = append(got, f.Name)
			}
			if !slices.Equal(got, c.want) {
				t.Errorf("names %q, want %q", got, c.want)
			}
		})
	}
}
