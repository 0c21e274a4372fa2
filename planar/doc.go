// Package planar is sitecover's geometry kernel: it maps WGS84 longitude and
// latitude to an accurate local plane in metres, decides orientation and
// in-circle questions exactly, builds the Delaunay triangulation of the
// device sites, clips each site's Voronoi cell to the site area, and measures
// the exact area of a polygon intersected with a disk.
//
// Methods followed:
//   - Projection: ellipsoidal transverse Mercator by the Krüger series to
//     sixth order in the third flattening n (Karney, "Transverse Mercator
//     with an accuracy of a few nanometers", J. Geodesy 85, 2011).
//   - Predicates: orient2d and incircle with a floating-point filter and an
//     exact expansion-arithmetic fallback (Shewchuk, "Adaptive precision
//     floating-point arithmetic and fast robust geometric predicates",
//     Discrete & Computational Geometry 18, 1997). Signs are exact for all
//     finite float64 inputs.
//   - Triangulation: incremental insertion in biased randomized insertion
//     order along a Hilbert curve (Amenta, Choi & Rote, "Incremental
//     constructions con BRIO", SoCG 2003), with Lawson flips, a hull-edge
//     step for points outside the hull, and Bowyer–Watson cavity
//     retriangulation by two workers for large inputs; every decision is an
//     exact predicate, and ties among cocircular points are broken the same
//     way on every run.
//   - Cells: the Voronoi cell of a site is the convex polygon whose vertices
//     are the circumcentres of its Delaunay triangles; it is intersected
//     with the site area (a polygon set with holes) edge by edge.
//   - Power cells (ClipPowerCells, RegularTriangulation.PowerCells): for
//     weighted sites (a device's range squared) the same clipper with power
//     lines for bisectors and power centres for circumcentres (Aurenhammer,
//     SIAM J. Comput. 16, 1987), on the regular triangulation
//     (TriangulateRegular); equal weights give ClipCells's output exactly.
//     RegularTriangulation.NearestPower finds the vertex of smallest power.
//   - Areas: polygon ∩ disk by the closed form summed over polygon edges
//     (each edge contributes a triangle part and a circular-sector part).
//   - Rings (ring.go, ringset.go): shoelace area and moments, exact
//     point-in-ring and segment tests, and RingSet, rings in the flat
//     layout Region and Cells use. One boundary convention holds
//     throughout: a ring, a region or a cell contains its boundary.
//   - Half-planes (halfplane.go): Sutherland–Hodgman clipping of ring sets
//     by a few half-planes at a time, with each output vertex's provenance
//     (the planners' incremental cells), in floating point with a stated
//     error bound.
//   - Bucket grids (bucketgrid.go): the static BucketGrid and the dynamic
//     HashGrid that list nearby points for neighbourhood queries.
//
// It also owns the small primitives the other packages share, one copy
// each: rings (RingArea, PointInRing, EdgeRay, SegmentsCross/Meet; ring.go),
// circumcentres with an error bound (Circumcentre, CircumcentreErr), the
// accurate cross product and exact dot-product sign (Cross, DotSign),
// error-free and double-double arithmetic (TwoSum, TwoProduct, DDAdd,
// DDAddDD, DDReduceTwoPi), union-find (UnionFind) and the parallel loop
// helpers (ParallelFor, ParallelChunks).
//
// Data lives in flat slices: float64 coordinates interleaved as x0, y0, x1,
// y1, ... and int32 indices. There is no pointer per triangle or per cell.
package planar
