#!/usr/bin/python3
"""Reference values for planar's polygon union and difference (SiteArea).

Run with Debian's /usr/bin/python3 (python3-shapely, GEOS):

    /usr/bin/python3 planar/testdata/ref_boolean.py            # writes boolean_ref.json
    /usr/bin/python3 planar/testdata/ref_boolean.py --seed 7 --out /tmp/x.json

Each case is a list of area polygons and a list of exclusion polygons
(rings as [x, y] lists, closed, exteriors counter-clockwise, holes
clockwise). Everything computed here comes from GEOS through shapely, not
from sitecover:

* union_area: area of shapely.ops.unary_union(area polygons) (GEOS
  UnaryUnion, GEOSArea);
* site_area: area of unary_union(area).difference(unary_union(exclusions));
* site_valid: is_valid of that difference (GEOSisValid);
* site_parts: number of polygons in the difference.

Cases are random (Python's random.Random(seed)): rectangles on a coarse
grid (shared edges, collinear overlaps, corners touching, identical
copies), random star-shaped polygons (proper crossings at arbitrary
angles), rectangles 1e-9 apart (near-touching), and polygons with holes.
Coordinates are offset by a few hundred metres to keep the rounding
realistic.
"""

import argparse
import json
import math
import random

from shapely.geometry import Polygon
from shapely.geometry.polygon import orient
from shapely.ops import unary_union

OFFSET = (500.0, 300.0)


def rect(x0, y0, x1, y1):
    return Polygon([(x0, y0), (x1, y0), (x1, y1), (x0, y1)])


def star(rng, cx, cy, r, n):
    angs = sorted(rng.uniform(0, 2 * math.pi) for _ in range(n))
    pts = [(cx + rng.uniform(0.3, 1.0) * r * math.cos(a), cy + rng.uniform(0.3, 1.0) * r * math.sin(a)) for a in angs]
    return Polygon(pts)


def shift(p):
    return Polygon([(x + OFFSET[0], y + OFFSET[1]) for x, y in p.exterior.coords],
                   [[(x + OFFSET[0], y + OFFSET[1]) for x, y in h.coords] for h in p.interiors])


def grid_rect(rng, n):
    x0, y0 = rng.randint(0, n - 1), rng.randint(0, n - 1)
    return rect(x0, y0, rng.randint(x0 + 1, n), rng.randint(y0 + 1, n))


def case_grid(rng, i):
    area = [grid_rect(rng, 6) for _ in range(rng.randint(1, 4))]
    excl = [grid_rect(rng, 6) for _ in range(rng.randint(0, 4))]
    if rng.random() < 0.3:
        area.append(area[0])  # identical copy
    return "grid-%d" % i, area, excl


def case_star(rng, i):
    area = [star(rng, rng.uniform(0, 10), rng.uniform(0, 10), rng.uniform(3, 8), rng.randint(3, 12)) for _ in range(rng.randint(1, 3))]
    excl = [star(rng, rng.uniform(0, 10), rng.uniform(0, 10), rng.uniform(1, 4), rng.randint(3, 9)) for _ in range(rng.randint(0, 5))]
    return "star-%d" % i, area, excl


def case_near(rng, i):
    gap = 1e-9
    w = rng.uniform(1, 3)
    area = [rect(0, 0, w, 2), rect(w + gap, rng.uniform(-1, 1), w + 2, 3)]
    excl = [rect(w - 0.5, 0.5, w - gap, 1.5)] if rng.random() < 0.5 else [rect(w + gap, 0.5, w + 1, 1.5)]
    return "near-%d" % i, area, excl


def case_holes(rng, i):
    outer = rect(0, 0, 10, 10)
    hx, hy = rng.uniform(1, 5), rng.uniform(1, 5)
    hole = [(hx, hy), (hx, hy + rng.uniform(1, 4)), (hx + rng.uniform(1, 4), hy + rng.uniform(1, 4)), (hx + rng.uniform(1, 4), hy)]
    area = [Polygon(outer.exterior.coords, [hole]), star(rng, hx + 1, hy + 1, rng.uniform(0.5, 3), 7)]
    excl = [star(rng, rng.uniform(0, 10), rng.uniform(0, 10), rng.uniform(1, 5), rng.randint(3, 9)) for _ in range(rng.randint(1, 3))]
    return "holes-%d" % i, area, excl


def rings(p):
    p = orient(p, 1.0)  # exterior counter-clockwise, holes clockwise
    return [[list(c) for c in p.exterior.coords]] + [[list(c) for c in h.coords] for h in p.interiors]


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=__file__.replace("ref_boolean.py", "boolean_ref.json"))
    ap.add_argument("--n", type=int, default=40, help="cases per kind")
    args = ap.parse_args()
    rng = random.Random(args.seed)
    cases = []
    for i in range(args.n):
        for kind in (case_grid, case_star, case_near, case_holes):
            name, area, excl = kind(rng, i)
            area = [shift(p) for p in area if p.is_valid and p.area > 0]
            excl = [shift(p) for p in excl if p.is_valid and p.area > 0]
            if not area:
                continue
            ua = unary_union(area)
            site = ua.difference(unary_union(excl)) if excl else ua
            parts = 0 if site.is_empty else (len(site.geoms) if site.geom_type == "MultiPolygon" else 1)
            cases.append({
                "name": name,
                "area": [rings(p) for p in area],
                "excl": [rings(p) for p in excl],
                "union_area": ua.area,
                "site_area": site.area,
                "site_valid": site.is_valid,
                "site_parts": parts,
            })
    with open(args.out, "w") as f:
        json.dump({"seed": args.seed, "cases": cases}, f, indent=None, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
