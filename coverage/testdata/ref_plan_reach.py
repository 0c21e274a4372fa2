#!/usr/bin/python3
"""Reference values for the choice among candidate spots with a k target
(coverage/plan_candidates_reach_test.go).

Everything here is computed with GEOS (Debian python3-shapely), never with
sitecover: for every subset S of the candidate spots, the area of the site
A reached by at least k devices (the existing ones plus S) at range r, as
the union over all k-subsets of devices of the intersection of their
disks, intersected with A. Disks are drawn twice: inscribed
(buffer(site, r, resolution=RES), a 4*RES-gon inside the circle) and
circumscribed (that polygon scaled by 1/cos(pi/(4*RES)) about the site,
which holds the circle), so the exact area lies between the two results
(k_area of ref_kcover.py). Devices at exactly the same spot count once.

From the table a test reads, without sitecover, the fewest candidates that
surely reach every spot k times (inscribed area = area of A) and the fewest
that might (circumscribed area = area of A): an exhaustive search.

Scenes: a square site with an exclusion zone, four existing devices (one near
the centre of each quarter) and
eight candidate spots (six on a jittered grid, one outside the site, one on
an existing device),
k = 2; a rectangle whose five candidates cannot reach every spot 3 times,
k = 3. Coordinates are written with full precision.

Usage: ref_plan_reach.py [--seed S] [--out FILE] [--small]
  --seed S   seed of the random scenes (default 20261203, the committed data)
  --out FILE output path (default plan_reach_ref.json beside this script)
  --small    no candidate outside the site (fewer subsets, for the live test)
"""

import argparse
import json
import os

import numpy as np
import shapely
import shapely.geos
from shapely.geometry import Polygon

import ref_kcover
from ref_kcover import k_area

ref_kcover.RES = 128  # quarter-circle segments: 512-gons
ref_kcover.NSEG = 4 * ref_kcover.RES


def rand_points(rng, lo, hi, n):
    return [(float(x), float(y)) for x, y in rng.uniform(lo, hi, size=(n, 2))]


def scenes(rng, small):
    out = []
    ext = [(0, 0), (100, 0), (100, 80), (0, 80)]
    hole = [(40, 30), (40, 45), (58, 45), (58, 30)]
    sites = [(float(x), float(y)) for x, y in rng.uniform(-8, 8, size=(4, 2)) + [(25, 20), (75, 20), (25, 60), (75, 60)]]
    nx = 3
    cands = [(float(x), float(y)) for x, y in
             rng.uniform(-6, 6, size=(2 * nx, 2)) + [(100 * (i + 0.5) / nx, 80 * (j + 0.5) / 2) for i in range(nx) for j in range(2)]]
    if not small:
        cands.append((float(rng.uniform(101, 110)), float(rng.uniform(10, 70))))  # outside the site
    cands.append(sites[2])  # on an existing device: counts once
    out.append(dict(name="square-hole", exterior=ext, holes=[hole], sites=sites, candidates=cands, k=2, range=46.0))
    ext = [(0, 0), (120, 0), (120, 40), (0, 40)]
    sites = rand_points(rng, [5, 5], [115, 35], 3)
    cands = rand_points(rng, [5, 5], [60, 35], 5)
    out.append(dict(name="rect-unreachable", exterior=ext, holes=[], sites=sites, candidates=cands, k=3, range=30.0))
    return out


def scene_ref(sc):
    poly = Polygon(sc["exterior"], sc["holes"])
    n = len(sc["candidates"])
    subsets = []
    for mask in range(1 << n):
        pts = list(sc["sites"]) + [sc["candidates"][i] for i in range(n) if mask >> i & 1]
        pts = sorted(set(map(tuple, pts)))
        if len(pts) < sc["k"]:
            subsets.append(dict(mask=mask, inscribed=0.0, circumscribed=0.0))
            continue
        subsets.append(dict(mask=mask,
                            inscribed=k_area(poly, pts, sc["range"], sc["k"], False),
                            circumscribed=k_area(poly, pts, sc["range"], sc["k"], True)))
    return dict(sc, area=poly.area, subsets=subsets)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "plan_reach_ref.json"))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    doc = dict(
        generator="ref_plan_reach.py (shapely %s / GEOS %s)" % (shapely.__version__, shapely.geos.geos_version_string),
        seed=a.seed, small=a.small, buffer_segments=ref_kcover.NSEG,
        scenes=[scene_ref(sc) for sc in scenes(rng, a.small)],
    )
    with open(a.out, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
