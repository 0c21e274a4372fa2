package planar

// Triangulation is a Delaunay triangulation of a point set, stored as
// half-edges in flat arrays.
//
// Vertices are the distinct input points: exact duplicates are merged into
// one vertex. Half-edge e belongs to triangle e/3 and runs from vertex
// Triangles[e] to vertex Triangles[NextHalfedge(e)]; triangles are
// counter-clockwise. Halfedges[e] is the opposite half-edge in the
// neighbouring triangle, or -1 when e lies on the convex hull.
type Triangulation struct {
	// Coords holds the vertex coordinates interleaved: x of vertex v at
	// 2v, y at 2v+1.
	Coords []float64
	// Vertex maps each input index to its vertex (duplicates share one).
	Vertex []int32
	// Source maps each vertex to the smallest input index it came from.
	Source []int32
	// Triangles holds three vertex indices per triangle, counter-clockwise.
	Triangles []int32
	// Halfedges holds the opposite half-edge of each half-edge, -1 on the hull.
	Halfedges []int32
	// Hull lists the convex hull vertices counter-clockwise. When all
	// vertices are collinear there are no triangles and Hull lists every
	// vertex in order along the line, from one end to the other.
	Hull []int32
	// Inedge holds, for each vertex, one half-edge that ends at it; for a
	// hull vertex it is the hull half-edge ending there (Halfedges == -1),
	// so that walking around the vertex starting from Inedge visits all
	// its triangles. -1 when the vertex has no triangle.
	Inedge []int32
}

// NextHalfedge returns the half-edge after e in its triangle.
func NextHalfedge(e int32) int32 {
	if e%3 == 2 {
		return e - 2
	}
	return e + 1
}

// PrevHalfedge returns the half-edge before e in its triangle.
func PrevHalfedge(e int32) int32 {
	if e%3 == 0 {
		return e + 2
	}
	return e - 1
}

// NumVertices returns the number of distinct vertices.
func (t *Triangulation) NumVertices() int { return len(t.Coords) / 2 }

// NumTriangles returns the number of triangles.
func (t *Triangulation) NumTriangles() int { return len(t.Triangles) / 3 }

// Region is a validated site area in the local plane: one or more polygons,
// each an exterior ring with zero or more holes (zones that need no
// coverage). Rings are stored without the closing repeat of the first
// vertex; exterior rings are counter-clockwise and holes clockwise, so the
// area lies to the left of every ring edge.
type Region struct {
	// XY holds all ring vertices interleaved (x, y).
	XY []float64
	// RingStart[k]..RingStart[k+1] are the vertex indices (into XY/2) of
	// ring k; len(RingStart) is the number of rings plus one.
	RingStart []int32
	// PolyStart[p]..PolyStart[p+1] are the rings of polygon p; the first is
	// its exterior, the rest its holes.
	PolyStart []int32
}

// NumRings returns the number of rings.
func (r *Region) NumRings() int { return len(r.RingStart) - 1 }

// NumPolygons returns the number of polygons.
func (r *Region) NumPolygons() int { return len(r.PolyStart) - 1 }

// Ring returns the interleaved coordinates of ring k (a sub-slice of XY).
func (r *Region) Ring(k int) []float64 {
	return r.XY[2*r.RingStart[k] : 2*r.RingStart[k+1]]
}

// BoundaryEdge returns the Cells.EdgeSource label of an edge lying on ring k
// of the site area.
func BoundaryEdge(k int) int32 { return int32(-2 - k) }

// BoundaryRing reports whether label lies on the site area's boundary and
// which ring it lies on.
func BoundaryRing(label int32) (ring int, ok bool) {
	if label <= -2 {
		return int(-2 - label), true
	}
	return 0, false
}

// Cells holds every site's Voronoi cell clipped to a Region, as polygons in
// flat arrays. A site's clipped cell may be empty (a site outside the area
// whose cell misses it), one polygon, or several (the area is non-convex or
// has several parts). Each polygon is an exterior ring (counter-clockwise)
// followed by its holes (clockwise), without closing repeats.
type Cells struct {
	// SiteStart[v]..SiteStart[v+1] are the polygons of vertex v of the
	// triangulation.
	SiteStart []int32
	// PolyStart[p]..PolyStart[p+1] are the rings of polygon p.
	PolyStart []int32
	// RingStart[k]..RingStart[k+1] are the point indices of ring k.
	RingStart []int32
	// XY holds ring points interleaved (x, y).
	XY []float64
	// EdgeSource[i] tells where the ring edge from point i to the next
	// point of its ring lies: a vertex index j >= 0 when it lies on the
	// bisector between this site and vertex j; BoundaryEdge(k) when it lies
	// on ring k of the Region.
	EdgeSource []int32
	// Area is the exact (to rounding) area of each vertex's clipped cell.
	Area []float64
}
