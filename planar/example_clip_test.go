package planar_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// Four sites in a 20 m square site area with a 4 m square exclusion zone in
// the middle: each site serves a 10 m quadrant less a 2 m corner of the
// zone.
func ExampleClipCells() {
	area, err := planar.NewRegion(orb.MultiPolygon{{
		{{0, 0}, {20, 0}, {20, 20}, {0, 20}, {0, 0}},
		{{8, 8}, {12, 8}, {12, 12}, {8, 12}, {8, 8}},
	}})
	if err != nil {
		fmt.Println(err)
		return
	}
	sites := []orb.Point{{5, 5}, {15, 5}, {5, 15}, {15, 15}}
	tri, err := planar.Triangulate(sites)
	if err != nil {
		fmt.Println(err)
		return
	}
	cells, err := planar.ClipCells(tri, area)
	if err != nil {
		fmt.Println(err)
		return
	}
	for v := 0; v < cells.NumSites(); v++ {
		fmt.Printf("site %d: area %g m², %d polygon(s)\n", v, cells.Area[v], len(cells.Polygons(int32(v))))
	}
	// The ring of site 0 and where each of its edges comes from.
	xy, src := cells.Ring(int(cells.PolyStart[cells.SiteStart[0]]))
	for i, s := range src {
		from := fmt.Sprintf("bisector with site %d", s)
		if k, ok := planar.BoundaryRing(s); ok {
			from = fmt.Sprintf("ring %d of the area", k)
		}
		fmt.Printf("(%g, %g) -> %s\n", xy[2*i], xy[2*i+1], from)
	}
	// Output:
	// site 0: area 96 m², 1 polygon(s)
	// site 1: area 96 m², 1 polygon(s)
	// site 2: area 96 m², 1 polygon(s)
	// site 3: area 96 m², 1 polygon(s)
	// (0, 10) -> ring 0 of the area
	// (0, 0) -> ring 0 of the area
	// (10, 0) -> bisector with site 1
	// (10, 8) -> ring 1 of the area
	// (8, 8) -> ring 1 of the area
	// (8, 10) -> bisector with site 2
}
