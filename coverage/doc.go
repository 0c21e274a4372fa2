// Package coverage analyses how a set of fixed devices, each serving a disk
// of common radius r (the range), covers a site area A: a polygon set with
// holes, the holes being zones that need no coverage.
//
// What is computed, and how:
//
//   - Service areas. Each site's Voronoi cell clipped to A (package planar).
//     Inside its cell only the site's own disk matters, so every quantity
//     below is a sum or a union of per-cell pieces.
//
//   - Full-cover range R*. The distance to the nearest site is convex on each
//     cell, so its maximum over a clipped cell is attained at a vertex of the
//     cell polygon: a Voronoi vertex inside A, a crossing of a cell edge with
//     the boundary of A, or a corner of A. R* is the largest of these vertex
//     distances; the points attaining it (within 1e-9 relative) are reported.
//     Exact up to rounding; no sampling.
//
//   - Uncovered area and covered fraction at any r: the sum over cells of
//     area(cell ∩ A) − area(cell ∩ A ∩ D(site, r)), each term the closed-form
//     area of a polygon intersected with a disk, summed edge by edge.
//
//   - Coverage curve. The covered fraction as an exact function of r, with
//     per-cell data precomputed (nearest boundary distance, farthest vertex,
//     winding of the site), its exact derivative (r times the angle of the
//     circle lying inside the cells), and the inverse: the smallest range
//     covering a given fraction, found by safeguarded Newton iteration on the
//     exact monotone function to 1e-9 of R*.
//
//   - Gaps: the connected components of A \ U(r), where U(r) is the union of
//     the closed disks. Inside a clipped cell piece P the uncovered part is
//     P \ D(site, r); its boundary is traced exactly from the piece's edge
//     portions outside the disk and the circle arcs between exit and entry
//     points (clockwise, so that the uncovered side lies to the left).
//     Pieces of neighbouring cells are joined where they share a portion of a
//     bisector edge outside the disks: points of a bisector are equidistant
//     from both sites, so the portion outside one disk is outside the other,
//     and the portions are matched by their coordinate along the bisector.
//     Each gap carries its exact area and centroid (polygon parts plus
//     circular sectors), its deepest point and the range that closes it, the
//     sites whose cells it meets, and an outline with arcs replaced by chords
//     of bounded sagitta.
//
//   - Topology of U(r): the alpha filtration of the Delaunay triangulation
//     and its persistence (Edelsbrunner & Harer, Computational Topology, AMS
//     2010; Edelsbrunner, "The union of balls and its dual shape", 1995),
//     giving the number of pieces of the union and of holes it encloses.
//
//   - Devices with their own ranges (ranges*.go: NewLayoutRanges,
//     AnalyzeRanges). Device i serves D(p_i, r_i); the power
//     π_i(x) = |x − p_i|² − r_i² replaces the distance, power cells (on the
//     regular triangulation) replace Voronoi cells (Aurenhammer, SIAM J.
//     Comput. 16, 1987), and inside P_i only D_i matters, so every
//     quantity above carries over with each cell's own radius. Growth is
//     uniform in power, r_i' = √(r_i² + t), and every power is reported
//     with the ranges it means; the full-cover figure is max over A of
//     min_i π_i; gaps carry what closes each (the range each bordering
//     device needs, and the single device closing it with the smallest
//     increase); holes come from the weighted alpha filtration (Edelsbrunner
//     1995). Devices with an empty power cell are hidden: redundant for
//     coverage. With all ranges equal every figure is the common-range one.
//
//   - Planning moves (plan_*.go), all planning aids for a design review:
//     devices added by farthest-point insertion (Gonzalez, "Clustering to
//     minimize the maximum intercluster distance", 1985) refined by moving
//     each to the centre of the smallest enclosing circle of its cell's
//     farthest points; the fewest additions for a range, compared with the
//     hexagonal covering estimate area / ((3√3/2) r²) (Kershner 1939);
//     candidate spots chosen greedily by exact marginal covered area with
//     lazy re-evaluation (Nemhauser, Wolsey & Fisher 1978: within 1 − 1/e of
//     the best choice); the loss when one device fails, recomputed inside
//     its own cell only; and the nearest-device assignment of demand points.
//
// Gaps and holes are different things, and the site boundary is what makes
// them differ. A gap is a component of A \ U(r): it is measured inside the
// site and may run against the boundary of A (an exterior edge or an
// exclusion zone), in which case it is never "enclosed" by coverage. A hole
// is a bounded component of the plane minus U(r), enclosed by the disks
// whatever A is: an H1 class of the alpha filtration, alive from the range
// at which the loop of disks around it closes to the range at which it is
// filled. The two views disagree in both directions: a gap touching the
// boundary can be an enclosed hole of U(r) that the boundary happens to cut,
// and an enclosed hole can lie partly (or entirely) outside A, where nothing
// needs coverage.
//
// Conventions. Distances are in the local plane (metres). A point at
// distance exactly r from a site is covered. Ring vertices within 1e-12
// relative of a circle are treated as lying on it, so that touching
// configurations (grids, sites on the boundary) are decided consistently.
// Gap areas are exact up to rounding (absolute error of order 1e-15 r² per
// cell); they agree with the closed-form uncovered area to 1e-9 relative.
package coverage
