#!/usr/bin/python3
"""Reference values for the choice among candidate spots with a range of
their own (coverage/plan_candidates_ranges_test.go), from GEOS via Debian
python3-shapely, never from sitecover.

Each device i at p_i has its own range r_i, and each candidate spot c_j
its own range R_j. For every subset S of the candidate spots the covered
area of the site area A with the devices and the spots of S, area(A &
union of disks), is computed twice: with every disk drawn as the inscribed
polygon Point(p).buffer(r, resolution=RES) (a lower bound of the exact
area) and as the circumscribed one, radius r / cos(pi / (4 RES)) (an upper
bound), as ref_plan_ranges.py does.

Scene: an L-shaped site with an exclusion zone, devices of a range mix
(one outside the area) and seven candidate spots of another mix, one
outside the area and one on a device.

Usage: ref_plan_candranges.py [--seed S] [--out FILE] [--small]
  --seed S   seed of the random scene (default 20261203, the committed data)
  --out FILE output path (default plan_candranges_ref.json beside this script)
  --small    five candidate spots (for the live test)
"""

import argparse
import json
import math
import os

import numpy as np
import shapely
import shapely.geos
from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

RES = 128  # quarter-circle segments: 512-gons
N_SEG = 4 * RES
CIRC = 1 / math.cos(math.pi / N_SEG)
MIX = [12.0, 20.0, 30.0]
CAND_MIX = [10.0, 18.0, 26.0]


def covered(poly, sites, radii, scale):
    return poly.intersection(unary_union([Point(p).buffer(r * scale, resolution=RES) for p, r in zip(sites, radii)])).area


def scene(rng, small):
    ext = [(0, 0), (120, 0), (120, 50), (70, 50), (70, 90), (0, 90)]
    hole = [(25, 25), (25, 40), (45, 40), (45, 25)]
    sites = [(float(x), float(y)) for x, y in rng.uniform([-5, -5], [120, 90], size=(7, 2))]
    ranges = [float(v) for v in rng.choice(MIX, size=len(sites))]
    n = 5 if small else 7
    cands = [(float(x), float(y)) for x, y in rng.uniform([0, 0], [120, 90], size=(n - 2, 2))]
    cands.append((float(rng.uniform(121, 130)), float(rng.uniform(5, 45))))  # outside the area
    cands.append(sites[1])  # on a device
    cranges = [float(v) for v in rng.choice(CAND_MIX, size=n)]
    poly = Polygon(ext, [hole])
    subsets = []
    for mask in range(1 << n):
        pts = sites + [cands[j] for j in range(n) if mask >> j & 1]
        rr = ranges + [cranges[j] for j in range(n) if mask >> j & 1]
        subsets.append(dict(mask=mask, inscribed=covered(poly, pts, rr, 1.0), circumscribed=covered(poly, pts, rr, CIRC)))
    return dict(name="lshape-mixed", exterior=ext, holes=[hole], sites=sites, ranges=ranges,
                candidates=cands, candidate_ranges=cranges, area=poly.area, subsets=subsets)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "plan_candranges_ref.json"))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    doc = dict(
        generator="ref_plan_candranges.py (shapely %s / GEOS %s, %d-gons)" % (
            shapely.__version__, shapely.geos.geos_version_string, N_SEG),
        seed=a.seed, small=a.small, scenes=[scene(rng, a.small)],
    )
    with open(a.out, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
