// The antimeridian (issue 11): the RFC 7946 §3.1.9 cut form and sites on
// both sides of ±180° project to adjacent parts whose shared edge is
// bit-identical.

package siteinput

import (
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

func TestAntimeridianCut(t *testing.T) {
	sites := src("s.csv", "lat,lon\n-17.0,179.93\n-17.05,-179.91\n-16.95,-179.97\n-16.98,179.87\n")
	// Odd numbers so that lon − lon₀ rounds differently at +180 and −180.
	west := `[[179.8123,-17.1234],[180,-17.1234],[180,-16.9087],[179.8123,-16.9087],[179.8123,-17.1234]]`
	east := `[[-180,-17.1234],[-179.7891,-17.1234],[-179.7891,-16.9087],[-180,-16.9087],[-180,-17.1234]]`
	cases := []struct{ name, area string }{
		{"two features", `{"type":"FeatureCollection","features":[` +
			`{"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[` + west + `]}},` +
			`{"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[` + east + `]}}]}`},
		{"one MultiPolygon", `{"type":"MultiPolygon","coordinates":[[` + west + `],[` + east + `]]}`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			area := src("a.geojson", c.area)
			s, err := loadSites(sites, false)
			if err != nil {
				t.Fatal(err)
			}
			polys, err := loadArea(area, false, false)
			if err != nil {
				t.Fatal(err)
			}
			sc := &Scene{}
			if err := sc.project(Inputs{Sites: sites, Area: &area}, s, polys); err != nil {
				t.Fatal(err)
			}
			// The edge at lon 180 of the west part runs from input vertex
			// 1 to 2; the edge at lon −180 of the east part from 3 to 4
			// (the closing repeat). Densified, both must hold the same
			// points in opposite order.
			w, e := polys[0].Rings[0], polys[1].Rings[0]
			wEdge := slices.Clone(w[inputVertex(polys[0].Orig[0], 1) : inputVertex(polys[0].Orig[0], 2)+1])
			eEdge := e[inputVertex(polys[1].Orig[0], 3) : inputVertex(polys[1].Orig[0], 4)+1]
			slices.Reverse(wEdge)
			if !slices.Equal(wEdge, eEdge) || len(wEdge) < 2 {
				t.Errorf("shared edge differs: west %v, east %v", wEdge, eEdge)
			}
			// The parts are side by side: the west one lies west.
			wx0, ex1 := w[0][0], e[inputVertex(polys[1].Orig[0], 1)][0]
			if !(wx0 < wEdge[0][0] && ex1 > eEdge[0][0]) {
				t.Errorf("parts not adjacent in the plane: west %v, east %v", w, e)
			}
			// Sites on both sides land within the area's extent.
			for i, p := range sc.Sites {
				if p[0] < wx0 || p[0] > ex1 {
					t.Errorf("site %d at %v outside the parts' span %v..%v", i, p, wx0, ex1)
				}
			}
			// Loading the whole scene: merging the parts needs polygon
			// union; until planar has it the region is refused as
			// touching, never as overlapping.
			_, err = Load(Inputs{Sites: sites, Area: &area})
			if err != nil && (strings.Contains(err.Error(), "overlaps") || !strings.Contains(err.Error(), "touch")) {
				t.Errorf("Load: %v", err)
			}
		})
	}
	// Over many central meridians near ±180°, plain Forward puts the two
	// copies of a vertex on the cut apart in some cases; the frame never
	// does.
	t.Run("frame vs plain projection", func(t *testing.T) {
		plainDiffers := 0
		for i := range 2000 {
			lon0 := math.Remainder(179.5+float64(i)*0.000487, 360)
			tm := planar.NewTransverseMercator(planar.WGS84, lon0, -17, 1, 0, 0)
			b := orb.Bound{Min: orb.Point{179.5, -18}, Max: orb.Point{-179.0, -16}}
			f := newLonFrame(tm, b)
			for _, lat := range []float64{-17.1234, -16.9087} {
				x1, y1 := f.forward(180, lat)
				x2, y2 := f.forward(-180, lat)
				if x1 != x2 || y1 != y2 {
					t.Fatalf("lon0 %v lat %v: frame gives (%v, %v) at +180 and (%v, %v) at −180", lon0, lat, x1, y1, x2, y2)
				}
				px1, py1 := tm.Forward(180, lat)
				px2, py2 := tm.Forward(-180, lat)
				if px1 != px2 || py1 != py2 {
					plainDiffers++
				}
				// The frame is the same map as the plane (to rounding).
				if math.Abs(px1-x1) > 1e-6 || math.Abs(py1-y1) > 1e-6 {
					t.Fatalf("lon0 %v: frame (%v, %v), plane (%v, %v)", lon0, x1, y1, px1, py1)
				}
			}
		}
		if plainDiffers == 0 {
			t.Error("plain projection never differed: the test no longer shows the problem")
		}
		t.Logf("plain projection put the copies apart in %d of 4000 cases", plainDiffers)
	})
}

// inputVertex returns the index of input vertex v in a densified ring.
func inputVertex(orig []int32, v int32) int {
	for i, o := range orig {
		if o == v {
			return i
		}
	}
	return -1
}
