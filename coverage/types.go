package coverage

import (
	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// Layout is a set of device sites and a site area in the local plane, with
// the Delaunay triangulation of the sites and their Voronoi cells clipped to
// the area. Everything else in this package is computed from a Layout.
//
// A layout built by NewLayoutRanges (devices with their own ranges) holds
// the regular triangulation and the power cells instead; its figures come
// from the methods that take the ranges into account (UncoveredAreaGrown,
// GapsRanges, FullCoverRanges, CurveRanges, PersistenceRanges,
// ServiceAreasRanges). The common-range methods treat its cells as Voronoi
// cells, which they are only when all ranges are equal.
type Layout struct {
	// Sites are the device positions in input order (metres).
	Sites []orb.Point
	// Area is the site area; zones that need no coverage are its holes.
	Area *planar.Region
	// Tri is the Delaunay triangulation of the distinct sites.
	Tri *planar.Triangulation
	// Cells are the sites' Voronoi cells clipped to Area, indexed by
	// triangulation vertex (use Tri.Vertex to go from input index).
	Cells *planar.Cells
	// AreaM2 is the area of Area in square metres.
	AreaM2 float64
	// Ranges holds each triangulation vertex's planned range (m) for a
	// layout with per-device ranges (NewLayoutRanges); nil for a common
	// range. Tri is then the regular triangulation of the sites weighted
	// by r_i², Cells the power cells, and Tri.Vertex is −1 for a hidden
	// device.
	Ranges []float64
	// InputRanges holds the planned range of each input site (m), hidden
	// devices included; nil for a common range.
	InputRanges []float64
	// Hidden lists the input indices of the devices whose power cell is
	// empty, ascending: their disk lies inside the union of the others,
	// so they are redundant for coverage. Nil for a common range.
	Hidden []int
}

// FullCover is the smallest common range at which the disks around the
// sites cover the whole area, and where that range is needed.
type FullCover struct {
	// Range is the largest distance from a point of the area to its
	// nearest site (metres).
	Range float64
	// Worst lists the points of the area attaining Range (one or more,
	// ties within 1e-9 relative).
	Worst []orb.Point
	// WorstSites lists, for each Worst point, the input index of a nearest
	// site.
	WorstSites []int
}

// Gap is one connected component of the uncovered part of the area at a
// given range.
type Gap struct {
	// ID numbers gaps from 1 in order of decreasing ClosingRange.
	ID int
	// Area is the exact uncovered area of the component (m²).
	Area float64
	// Centroid is the area centroid of the component.
	Centroid orb.Point
	// Bound is the bounding box of the component.
	Bound orb.Bound
	// TouchesBoundary is true when the component reaches the boundary of
	// the area (an exterior edge or an exclusion zone); false when it is
	// enclosed by coverage.
	TouchesBoundary bool
	// Deepest is the point of the component farthest from every site.
	Deepest orb.Point
	// ClosingRange is the distance from Deepest to its nearest site: the
	// range at which the component vanishes.
	ClosingRange float64
	// Sites lists the input indices of the sites whose cells the component
	// meets, ascending.
	Sites []int
	// Outline is the component's boundary with circular arcs replaced by
	// chords within the requested tolerance.
	Outline orb.MultiPolygon
	// Closing says what closes the gap when devices have their own ranges
	// (GapsRanges); nil from Gaps.
	Closing *GapClosing
}

// Hole is a finite H1 pair of the alpha filtration: a hole enclosed by the
// union of disks.
type Hole struct {
	// Birth is the range at which the loop around the hole closes.
	Birth float64
	// Death is the range at which the hole is filled (the circumradius of
	// the triangle that fills it last).
	Death float64
	// DeathPoint is the circumcentre of that triangle: where the hole closes.
	DeathPoint orb.Point
	// BirthSites are the input indices of the two sites whose disks close
	// the loop at Birth.
	BirthSites [2]int
}

// Merge is a finite H0 pair: two pieces of coverage join at Death.
type Merge struct {
	// Death is the range at which the two pieces join (half the length of
	// the minimum spanning tree edge).
	Death float64
	// Sites are the input indices of the edge's endpoints.
	Sites [2]int
}

// Persistence holds the H0 and H1 persistence pairs of the alpha filtration
// of the sites, values in metres (radii, not squared radii).
type Persistence struct {
	// Merges are the finite H0 pairs (all births are 0), by increasing Death.
	Merges []Merge
	// Holes are the H1 pairs with Death > Birth, by decreasing Death-Birth.
	Holes []Hole
	// ConnectRange is the range at which all disks form one piece (the
	// largest Merge death; 0 for a single site).
	ConnectRange float64
	// LinkRange is the longest edge of the Euclidean minimum spanning tree:
	// the link distance a mesh of the devices needs to be connected.
	LinkRange float64
	// Vertices is the number of distinct sites (exact duplicates count
	// once): the number of pieces at range 0.
	Vertices int
}
