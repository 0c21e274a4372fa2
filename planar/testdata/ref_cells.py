#!/usr/bin/python3
"""Reference values for planar's clipped Voronoi cells and polygon-disk areas.

Run with Debian's /usr/bin/python3 (python3-shapely, GEOS):

    /usr/bin/python3 planar/testdata/ref_cells.py            # writes cells_ref.json
    /usr/bin/python3 planar/testdata/ref_cells.py --seed 7 --out /tmp/x.json

Everything computed here comes from GEOS through shapely, not from sitecover:

* cells: GEOS's Voronoi diagram of the sites (GEOSVoronoiDiagram, with an
  envelope far larger than the site area), each cell intersected with the
  site area (GEOSIntersection) and its area taken (GEOSArea). A cell is
  matched to its site by containment (a site lies strictly inside its own
  Voronoi cell). Exact duplicate sites share one cell; the area goes to the
  first input index and later duplicates get null.
* contains: whether the site area covers each query point (GEOS covers,
  which counts boundary points as covered), for random points, every ring
  vertex and every edge midpoint.
* disk: the polygon intersected with a 4096-gon inscribed in the circle
  (Point.buffer with 1024 segments per quarter, whose vertices lie on the
  circle) and with the same 4096-gon scaled by 1/cos(pi/4096) about the
  centre, which circumscribes the circle. The exact area of polygon ∩ disk
  lies between the two areas (inscribed ⊂ disk ⊂ circumscribed).

Sites are random (Python's random.Random(seed)) except for the grid,
collinear and tiny cases; the site areas are invented shapes in metres.
"""

import argparse
import ctypes
import json
import math
import os
import random

from shapely.geometry import MultiPoint, MultiPolygon, Point, Polygon, box
from shapely.geometry.base import geom_factory
from shapely.geos import lgeos
from shapely import affinity

N_POLY = 4096  # sides of the polygonal disk


def voronoi_cells(points, envelope):
    """GEOS Voronoi polygons of points, clipped to envelope.

    shapely 1.8.5's voronoi_diagram(envelope=...) crashes with GEOS 3.11
    (its argument declarations do not match the reentrant call), so the
    reentrant C function is called directly with explicit ctypes types.
    """
    fn = lgeos._lgeos.GEOSVoronoiDiagram_r
    fn.restype = ctypes.c_void_p
    fn.argtypes = [ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p, ctypes.c_double, ctypes.c_int]
    mp = MultiPoint(points)
    res = geom_factory(fn(lgeos.geos_handle, mp._geom, envelope._geom, 0.0, 0))
    return list(res.geoms)


def shape_of(region):
    polys = [Polygon(p[0], p[1:]) for p in region]
    for p in polys:
        assert p.is_valid, p
    return MultiPolygon(polys)


def cells_case(name, region, sites):
    shape = shape_of(region)
    minx, miny, maxx, maxy = shape.bounds
    for x, y in sites:
        minx, miny, maxx, maxy = min(minx, x), min(miny, y), max(maxx, x), max(maxy, y)
    pad = 10 * max(maxx - minx, maxy - miny) + 1
    env = box(minx - pad, miny - pad, maxx + pad, maxy + pad)
    areas = [None] * len(sites)
    first = {}
    for i, s in enumerate(sites):
        first.setdefault((s[0], s[1]), i)
    distinct = list(first.keys())
    if len(distinct) == 1:
        # GEOS returns no cell for a single site: its cell is the plane.
        areas[first[distinct[0]]] = shape.area
    else:
        cells = voronoi_cells(distinct, env)
        assert len(cells) == len(distinct), (name, len(cells), len(distinct))
        for cell in cells:
            owners = [p for p in distinct if cell.contains(Point(p))]
            assert len(owners) == 1, (name, owners)
            areas[first[owners[0]]] = cell.intersection(shape).area
    return {
        "name": name,
        "region": region,
        "sites": sites,
        "areas": areas,
        "region_area": shape.area,
    }


def contains_case(name, region, rnd, n):
    shape = shape_of(region)
    minx, miny, maxx, maxy = shape.bounds
    pts = [[minx - 5 + rnd.random() * (maxx - minx + 10), miny - 5 + rnd.random() * (maxy - miny + 10)] for _ in range(n)]
    for poly in region:
        for ring in poly:
            for i, p in enumerate(ring):
                q = ring[(i + 1) % len(ring)]
                pts.append(list(p))
                pts.append([(p[0] + q[0]) / 2, (p[1] + q[1]) / 2])
    return {"name": name, "region": region, "points": pts, "covers": [shape.covers(Point(p)) for p in pts]}


def disk_case(name, ring, cx, cy, r):
    poly = Polygon(ring)
    assert poly.is_valid
    inscribed = Point(cx, cy).buffer(r, N_POLY // 4)
    circum = affinity.scale(inscribed, 1 / math.cos(math.pi / N_POLY), 1 / math.cos(math.pi / N_POLY), origin=(cx, cy))
    lo = poly.intersection(inscribed).area
    hi = poly.intersection(circum).area
    return {"name": name, "ring": [c for p in ring for c in p], "cx": cx, "cy": cy, "r": r, "lo": lo, "hi": hi}


def offset(region, dx, dy):
    return [[[[x + dx, y + dy] for x, y in ring] for ring in poly] for poly in region]


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20240611)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "cells_ref.json"))
    args = ap.parse_args()
    rnd = random.Random(args.seed)

    # A non-convex polygon (a U shape) with a hole, and a second part.
    region_u = [
        [
            [[0, 0], [100, 0], [100, 100], [60, 100], [60, 40], [40, 40], [40, 100], [0, 100]],
            [[10, 10], [10, 30], [30, 30], [30, 10]],
        ],
        [
            [[120, 0], [150, 0], [150, 50], [120, 50]],
        ],
    ]
    # An irregular polygon with a slanted hole and an island in a second part.
    region_irr = [
        [
            [[3.25, 1.5], [61.75, -4.0], [97.5, 22.25], [71.0, 49.5], [88.5, 91.0], [44.25, 73.5], [12.0, 96.75], [-6.5, 41.0]],
            [[30.5, 30.25], [52.0, 26.5], [47.25, 48.75]],
        ],
        [
            [[110, 60], [170, 60], [170, 120], [110, 120]],
            [[120, 70], [160, 70], [160, 110], [120, 110]],
        ],
        [
            [[130, 80], [150, 80], [140, 100]],
        ],
    ]

    def uniform(n, x0, y0, x1, y1):
        return [[x0 + rnd.random() * (x1 - x0), y0 + rnd.random() * (y1 - y0)] for _ in range(n)]

    cases = []
    cases.append(cells_case("uniform-60-u", region_u, uniform(60, -20, -20, 170, 120)))
    cases.append(cells_case("uniform-400-u", region_u, uniform(400, -10, -10, 160, 110)))
    cases.append(cells_case("uniform-300-irregular", region_irr, uniform(300, -20, -20, 180, 130)))
    off = (512345.0, 5712345.0)
    pts = uniform(200, -10, -10, 160, 110)
    cases.append(cells_case("offset-200-u", offset(region_u, *off), [[x + off[0], y + off[1]] for x, y in pts]))
    # Grid whose bisectors carry the region boundary: sites at 10i+5.
    grid = [[10 * i + 5, 10 * j + 5] for j in range(-1, 16) for i in range(-1, 11)]
    cases.append(cells_case("grid-bisectors-u", region_u, grid))
    # Grid with sites on the region boundary and at its corners.
    grid2 = [[10 * i, 10 * j] for j in range(0, 11) for i in range(0, 16)]
    cases.append(cells_case("grid-on-boundary-u", region_u, grid2))
    cases.append(cells_case("collinear-u", region_u, [[-5 + 13.5 * k, 3 + 9.25 * k] for k in range(9)]))
    cases.append(cells_case("collinear-vertical-u", region_u, [[50, -30 + 17 * k] for k in range(10)]))
    cases.append(cells_case("two-u", region_u, [[20.5, 60.25], [130.0, 25.0]]))
    cases.append(cells_case("one-irregular", region_irr, [[37.5, 12.25]]))
    cases.append(cells_case("outside-u", region_u, [[-40, -30], [210, 40], [75, 160], [-60, 140]]))
    dup = uniform(40, 0, 0, 150, 100)
    dup = dup + [list(p) for p in dup[:5]]
    rnd.shuffle(dup)
    cases.append(cells_case("duplicates-u", region_u, dup))

    disks = []
    square = [[0, 0], [10, 0], [10, 10], [0, 10]]
    lshape = [[0, 0], [20, 0], [20, 8], [8, 8], [8, 20], [0, 20]]
    star = []
    for k in range(10):
        rr = 10 if k % 2 == 0 else 4
        a = math.pi * k / 5
        star.append([50 + rr * math.cos(a), 50 + rr * math.sin(a)])
    comb = [[0, 0], [30, 0], [30, 12], [25, 12], [25, 3], [20, 3], [20, 12], [15, 12], [15, 3], [10, 3], [10, 12], [0, 12]]
    disks.append(disk_case("square-centre-r6", square, 5, 5, 6))
    disks.append(disk_case("square-corner-r4", square, 0, 0, 4))
    disks.append(disk_case("square-edge-tangent", square, 5, 13, 3))
    disks.append(disk_case("square-offcentre", square, 7.3, 2.1, 5.5))
    disks.append(disk_case("lshape-reflex", lshape, 8, 8, 5))
    disks.append(disk_case("lshape-big", lshape, 10, 10, 12))
    disks.append(disk_case("star-centre", star, 50, 50, 6))
    disks.append(disk_case("star-offset", star, 55, 47, 7.5))
    disks.append(disk_case("comb-through-teeth", comb, 15, 8, 9))
    disks.append(disk_case("comb-small", comb, 22.5, 7, 2))
    for k in range(6):
        cx, cy, r = rnd.uniform(-5, 35), rnd.uniform(-5, 20), rnd.uniform(0.5, 15)
        disks.append(disk_case("comb-random-%d" % k, comb, cx, cy, r))

    contains = [contains_case("u", region_u, rnd, 300), contains_case("irregular", region_irr, rnd, 300)]

    out = {"seed": args.seed, "n_poly": N_POLY, "cells": cases, "disk": disks, "contains": contains}
    with open(args.out, "w") as f:
        json.dump(out, f, indent=None, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
