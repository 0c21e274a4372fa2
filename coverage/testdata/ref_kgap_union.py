#!/usr/bin/python3
"""Reference values for the merged k-gap outlines (coverage/kcover_merge_test.go).

Input: a JSON file written by the Go test (kgap_union_parts.json, or a
fresh one in the live test) holding, per k-gap, the polygons of its parts
(one per part of an order-k piece, exteriors counter-clockwise, holes
clockwise, closed rings, full precision).

For each gap the union of its parts is computed with GEOS (Debian
python3-shapely, shapely.ops.unary_union), and written back with its area,
its number of polygons and its number of holes. The vertices are first
snapped as sitecover snaps them (to multiples of 2^-40 times the largest
coordinate magnitude rounded up to a power of two, KGapSnapBits): the
parts' shared edges end at points an ulp or two apart, on which GEOS
raises a TopologyException. Holes whose area is below
1e-9 times their squared perimeter are not counted: they are slivers left
between shared edges rounded apart (the same rule as KGapSliverRel).

Usage: ref_kgap_union.py --in PARTS.json --out REF.json
  (default: kgap_union_parts.json -> kgap_union_ref.json beside this script)
"""

import argparse
import json
import math
import os

import shapely
import shapely.geos
from shapely.geometry import MultiPolygon, Polygon
from shapely.ops import unary_union

SLIVER_REL = 1e-9
SNAP_BITS = 40


def polys(geom):
    if geom.is_empty:
        return []
    if isinstance(geom, Polygon):
        return [geom]
    if isinstance(geom, MultiPolygon):
        return list(geom.geoms)
    return [g for g in getattr(geom, "geoms", []) if isinstance(g, Polygon)]


def snapped(parts):
    m = max(abs(c) for p in parts for r in p for pt in r for c in pt)
    step = math.ldexp(1.0, math.frexp(m)[1] - SNAP_BITS)
    return [[[(round(x / step) * step, round(y / step) * step) for x, y in r] for r in p] for p in parts]


def robust_union(parts):
    """GEOS unary_union of the parts; when GEOS raises a TopologyException
    (parts meeting within ulps even after snapping), the union of the parts
    each repaired by buffer(0) (GEOS's usual remedy, which moves nothing on
    a valid polygon), then the parts added one at a time. Returns the union
    and how it was obtained."""
    try:
        return unary_union(parts), "unary_union"
    except Exception:
        pass
    fixed = [p.buffer(0) for p in parts]
    try:
        return unary_union(fixed), "unary_union of buffer(0) parts"
    except Exception:
        pass
    u = fixed[0]
    for p in fixed[1:]:
        u = u.union(p).buffer(0)
    return u, "pairwise union with buffer(0)"


def gap_ref(g):
    parts = [Polygon(p[0], p[1:]) for p in snapped(g["parts"])]
    u, how = robust_union(parts)
    ps = polys(u)
    holes = 0
    out = []
    for p in ps:
        rings = [list(p.exterior.coords)]
        for h in p.interiors:
            hp = Polygon(h)
            if hp.area > SLIVER_REL * h.length ** 2:
                holes += 1
                rings.append(list(h.coords))
        out.append(rings)
    return dict(scene=g["scene"], k=g["k"], id=g["id"], parts=g["parts"], geos_how=how, geos_area=u.area,
                geos_polygons=len(ps), geos_holes=holes, geos_union=out)


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    ap = argparse.ArgumentParser()
    ap.add_argument("--in", dest="inp", default=os.path.join(here, "kgap_union_parts.json"))
    ap.add_argument("--out", default=os.path.join(here, "kgap_union_ref.json"))
    a = ap.parse_args()
    with open(a.inp) as f:
        gaps = json.load(f)["gaps"]
    doc = dict(generator="ref_kgap_union.py (shapely %s / GEOS %s, unary_union)" % (
        shapely.__version__, shapely.geos.geos_version_string), gaps=[gap_ref(g) for g in gaps])
    with open(a.out, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
