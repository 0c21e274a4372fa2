#!/usr/bin/python3
"""Reference coverage figures for a planar scene, computed outside sitecover.

Usage:
    /usr/bin/python3 cmd/sitecover/testdata/ref_scene.py SCENE.json > REF.json

SCENE.json: {"sites": [[x, y], ...], "area": [[ring, hole, ...], ...], "range": r}
with rings as [[x, y], ...] in local metres. The output holds:

  area_m2             GEOS polygon area
  full_cover_range_m  max over sites i of the largest distance from site i to
                      a vertex of (GEOS Voronoi cell of i) ∩ area. The
                      nearest-site distance is convex on a cell, so its
                      maximum over the clipped cell is at one of these
                      vertices: exact up to rounding.
  uncovered_area_m2   Σ_i area(cell_i ∩ area − disk_i), disks as inscribed
                      4·quad-gons for quad = 256 and 512, then Richardson
                      extrapolation (the polygon error is c/N² + O(1/N⁴)),
                      leaving an error far below 1e-3 m² for site-sized scenes.
  covered_fraction    1 − uncovered / area
  gaps                components of area − ∪ disks (GEOS union, same
                      extrapolation of each area), sorted by decreasing closing
                      range; closing_range_m is the largest distance from a
                      vertex of (gap ∩ cell_i) to site i, exact for the same
                      reason as the full-cover range (arc vertices are at
                      distance r, below it); touches_boundary: the gap meets the
                      area's boundary (exterior or a hole) within 1e-6 m; sites:
                      the sites whose cells the gap meets with positive area.
  range_percentiles   smallest range covering 50/90/95/99 % (bisection on the
                      extrapolated uncovered area, to 1e-9 m).
  link_range_m        longest edge of the Euclidean minimum spanning tree of
                      the distinct sites (scipy.sparse.csgraph on all pairs).
  holes               finite H1 pairs with death > birth of the GUDHI alpha
                      complex (sqrt of its squared-radius filtration values).
"""

import json
import math
import sys

from shapely.geometry import MultiPoint, MultiPolygon, Point, Polygon
from shapely.ops import unary_union, voronoi_diagram

QUAD = 256


def verts(g):
    for p in getattr(g, "geoms", [g]):
        if p.is_empty or p.geom_type != "Polygon":
            continue
        yield from p.exterior.coords
        for h in p.interiors:
            yield from h.coords


def clipped_cells(area, sites):
    mp = MultiPoint([Point(p) for p in sites])
    w = max(area.bounds[2] - area.bounds[0], area.bounds[3] - area.bounds[1])
    env = area.envelope.buffer(10 * w + 1)
    vd = voronoi_diagram(mp, envelope=env)
    cells = []
    for cell in vd.geoms:
        owner = min(range(len(sites)), key=lambda i: cell.distance(Point(sites[i])))
        cells.append((owner, cell.intersection(area)))
    return cells


def extrapolate(a_n, a_2n):
    return a_2n + (a_2n - a_n) / 3


def uncovered(cells, sites, r):
    def at(q):
        return sum(c.difference(Point(sites[i]).buffer(r, q)).area
                   for i, c in cells if not c.is_empty)
    if r <= 0:
        return sum(c.area for _, c in cells)
    return extrapolate(at(QUAD), at(2 * QUAD))


def gap_components(area, sites, r, q):
    u = area.difference(unary_union([Point(p).buffer(r, q) for p in sites]))
    return [g for g in getattr(u, "geoms", [u]) if not g.is_empty and g.area > 1e-9]


def reference(area, sites, r):
    sites = [tuple(map(float, p)) for p in sites]
    cells = clipped_cells(area, sites)
    full, worst = 0.0, None
    for i, c in cells:
        for v in verts(c):
            d = math.dist(v, sites[i])
            if d > full:
                full, worst = d, list(v)
    total = area.area
    pct = {}
    for q in (50, 90, 95, 99):
        lo, hi = 0.0, full
        while hi - lo > 1e-9:
            mid = (lo + hi) / 2
            if 1 - uncovered(cells, sites, mid) / total >= q / 100:
                hi = mid
            else:
                lo = mid
        pct["p%d" % q] = hi
    fine = gap_components(area, sites, r, 2 * QUAD)
    coarse = gap_components(area, sites, r, QUAD)
    gaps = []
    for g in fine:
        c = g.centroid
        match = min(coarse, key=lambda h: h.centroid.distance(c)) if coarse else g
        closing, deepest, near = 0.0, None, []
        for i, cell in cells:
            inter = cell.intersection(g)
            if inter.area > 1e-9:
                near.append(i)
            for v in verts(inter):
                d = math.dist(v, sites[i])
                if d > closing:
                    closing, deepest = d, list(v)
        gaps.append({
            "area_m2": extrapolate(match.area, g.area),
            "closing_range_m": closing,
            "deepest_xy": deepest,
            "touches_boundary": bool(g.distance(area.boundary) < 1e-6),
            "sites": sorted(near),
        })
    gaps.sort(key=lambda g: -g["closing_range_m"])
    holes = []
    try:
        import gudhi
    except ImportError:
        gudhi = None
    if gudhi is not None and len(set(sites)) >= 3:
        st = gudhi.AlphaComplex(points=[list(p) for p in sites]).create_simplex_tree()
        for dim, (b, d) in st.persistence():
            if dim == 1 and d != float("inf") and d > b:
                holes.append({"birth_m": math.sqrt(b), "death_m": math.sqrt(d)})
        holes.sort(key=lambda h: (-(h["death_m"] - h["birth_m"]), h["birth_m"]))
    u = uncovered(cells, sites, r)
    return {
        "link_range_m": link_range(sites),
        "area_m2": total,
        "range_m": r,
        "full_cover_range_m": full,
        "full_cover_worst_xy": worst,
        "uncovered_area_m2": u,
        "covered_fraction": 1 - u / total,
        "range_percentiles": pct,
        "gaps": gaps,
        "holes": holes,
        "source": "cmd/sitecover/testdata/ref_scene.py: GEOS via shapely %s, GUDHI %s" % (
            __import__("shapely").__version__, gudhi.__version__ if gudhi else "absent"),
    }


def link_range(sites):
    from scipy.sparse.csgraph import minimum_spanning_tree
    from scipy.spatial.distance import pdist, squareform
    pts = sorted(set(sites))
    if len(pts) < 2:
        return 0.0
    return float(minimum_spanning_tree(squareform(pdist(pts))).toarray().max())


def area_of(polys):
    return MultiPolygon([Polygon(p[0], p[1:]) for p in polys]).buffer(0) \
        if len(polys) > 1 else Polygon(polys[0][0], polys[0][1:])


def main():
    scene = json.load(open(sys.argv[1]))
    area = area_of(scene["area"])
    if not area.is_valid:
        sys.exit("invalid area")
    json.dump(reference(area, scene["sites"], float(scene["range"])), sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
