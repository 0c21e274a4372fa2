#!/usr/bin/python3
"""Reference uncovered areas and gaps from GEOS, for the coverage tests.

For each scene (sites and a site area) and range r, GEOS via Debian
python3-shapely computes the uncovered part of the area

    area.difference(unary_union([Point(p).buffer(R, resolution=256) ...]))

where buffer(..., resolution=256) is a regular 1024-gon with its vertices
on the circle of radius R. Two polygonal disks bracket the true disk of
radius r:

  * inscribed:     R = r                 (1024-gon inside the disk),
  * circumscribed: R = r / cos(pi/1024)  (1024-gon whose edges touch the
                                           circle, so it contains the disk),

so the true uncovered area lies between the circumscribed and inscribed
results, and so does the area of every gap. Each inscribed polygon misses
r^2 (pi - 512 sin(2 pi/1024)) ~ 1.97e-5 r^2 of its disk, which bounds the
per-disk error of the inscribed result.

Written per case: both uncovered areas, the number of components of each,
and per component of the circumscribed result (which lies inside the true
uncovered set) a representative point, its area, the area of the inscribed
component containing that point, and whether each touches the boundary of
the area (positive-length shared boundary). A case is kept only when the two
brackets have the same components (same count, matched one to one by the
representative points), so that the component structure is not sensitive
to the polygon approximation.

Scenes: random sites (some outside the area, some in the hole) in an
L-shaped area with a square exclusion hole; a two-part area (a polygon with
a hole and a separate rectangle); a fence of collinear sites with duplicate
sites in a notched rectangle. Coordinates are written with repr (exact
float64 round trip).

Usage: ref_gaps.py [--seed S] [--out FILE]
  --seed S   seed of the random sites (default 20240612: the committed data)
  --out FILE output path (default gaps_ref.json beside this script; '-' for
             standard output)
"""

import argparse
import json
import math
import os
import sys

import numpy as np
import shapely
from shapely.geometry import MultiPolygon, Point, Polygon
from shapely.ops import unary_union

N_SEG = 1024
RES = N_SEG // 4


def scene_lshape(rng):
    ext = [(0, 0), (400, 0), (400, 250), (250, 250), (250, 400), (0, 400)]
    hole = [(80, 80), (80, 160), (160, 160), (160, 80)]  # clockwise
    sites = rng.uniform(-20, 420, size=(40, 2))
    return {
        "name": "lshape-hole",
        "area": [[ext, hole]],
        "sites": sites.tolist(),
        "ranges": [25.0, 40.0, 55.0, 75.0],
    }


def scene_two_parts(rng):
    a_ext = [(0, 0), (180, 0), (220, 90), (150, 200), (20, 170)]
    a_hole = [(70, 60), (60, 110), (110, 120), (120, 70)]  # clockwise
    b_ext = [(260, 20), (420, 20), (420, 160), (260, 160)]
    sa = rng.uniform(-10, 230, size=(18, 2))
    sb = np.column_stack([rng.uniform(250, 430, 12), rng.uniform(10, 170, 12)])
    sites = np.vstack([sa, sb])
    return {
        "name": "two-parts",
        "area": [[a_ext, a_hole], [b_ext]],
        "sites": sites.tolist(),
        "ranges": [20.0, 35.0, 50.0],
    }


def scene_fence(rng):
    ext = [(0, 0), (300, 0), (300, 120), (180, 120), (180, 70), (120, 70), (120, 120), (0, 120)]
    fence = [(float(x), 40.0) for x in range(10, 300, 35)]
    extra = rng.uniform(0, 300, size=(8, 2)) * np.array([1.0, 0.4]) + np.array([0.0, 70.0])
    sites = fence + [tuple(p) for p in extra.tolist()]
    sites += [fence[2], fence[5], tuple(extra[0])]  # duplicates
    sites += [(-30.0, 60.0), (330.0, 130.0)]  # outside the area
    return {
        "name": "fence-dups",
        "area": [[ext]],
        "sites": [list(p) for p in sites],
        "ranges": [15.0, 30.0, 45.0],
    }


def region_of(area):
    polys = [Polygon(p[0], p[1:]) for p in area]
    return unary_union(polys)


def components(g):
    if g.is_empty:
        return []
    if g.geom_type == "Polygon":
        return [g]
    return [x for x in g.geoms if x.geom_type == "Polygon" and x.area > 0]


def touches(comp, boundary):
    # Positive-length contact, judged within 1e-7 m of the boundary: GEOS nodes
    # the difference in floating point, so a gap edge that runs along the
    # boundary can come out a few ulps off it, and a bare intersection of the
    # two lines then has length 0.
    return comp.boundary.intersection(boundary.buffer(1e-7)).length > 1e-6


def bracket(region, sites, radii, extra=None):
    """Uncovered part with inscribed and circumscribed 1024-gons of radii
    (one per site); extra(c, q) adds fields per component (circumscribed c,
    inscribed q). None when the two brackets' components do not match."""
    insc = region.difference(unary_union([Point(p).buffer(r, resolution=RES) for p, r in zip(sites, radii)]))
    circ = region.difference(unary_union([Point(p).buffer(r / math.cos(math.pi / N_SEG), resolution=RES)
                                          for p, r in zip(sites, radii)]))
    ci, cc = components(insc), components(circ)
    out = {
        "uncovered_inscribed": insc.area,
        "uncovered_circumscribed": circ.area,
        "count_inscribed": len(ci),
        "count_circumscribed": len(cc),
        "components": [],
    }
    bnd = region.boundary
    used = set()
    ok = len(ci) == len(cc)
    for c in cc:
        rp = c.representative_point()
        match = [k for k, q in enumerate(ci) if q.contains(rp)]
        if len(match) != 1 or match[0] in used:
            ok = False
            break
        used.add(match[0])
        q = ci[match[0]]
        comp = {
            "rep": [rp.x, rp.y],
            "area_circumscribed": c.area,
            "area_inscribed": q.area,
            "touches_circumscribed": touches(c, bnd),
            "touches_inscribed": touches(q, bnd),
        }
        if extra is not None:
            comp.update(extra(c, q))
        out["components"].append(comp)
    return out if ok else None


def case(region, sites, r):
    b = bracket(region, sites, [r] * len(sites))
    return None if b is None else dict({"r": r}, **b)


def build(seed):
    rng = np.random.default_rng(seed)
    scenes = []
    for make in (scene_lshape, scene_two_parts, scene_fence):
        sc = make(rng)
        region = region_of(sc["area"])
        sc["area_m2"] = region.area
        sc["cases"] = []
        for r in sc.pop("ranges"):
            c = case(region, sc["sites"], r)
            if c is not None:
                sc["cases"].append(c)
            else:
                print("note: %s r=%g skipped (brackets disagree)" % (sc["name"], r), file=sys.stderr)
        sc["area"] = [[[list(map(float, p)) for p in ring] for ring in poly] for poly in sc["area"]]
        scenes.append(sc)
    return {
        "generator": "coverage/testdata/ref_gaps.py (GEOS via shapely %s, buffer resolution %d = %d-gon)"
        % (shapely.__version__, RES, N_SEG),
        "seed": seed,
        "segments": N_SEG,
        "scenes": scenes,
    }


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20240612)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "gaps_ref.json"))
    a = ap.parse_args()
    write_json(build(a.seed), a.out)


def write_json(data, out):
    """Writes data as indented JSON to the file out ('-': standard output)."""
    text = json.dumps(data, indent=1)
    if out == "-":
        sys.stdout.write(text)
    else:
        with open(out, "w") as f:
            f.write(text + "\n")


if __name__ == "__main__":
    main()
