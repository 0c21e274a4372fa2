#!/usr/bin/python3
"""Reference uncovered areas, gaps and single-device closings from GEOS when
devices have their own ranges, for the coverage tests.

The scenes of ref_gaps.py (an L-shaped area with a hole, a two-part area, a
fence with duplicates), plus a dense scene where some disks lie inside
others, get one range per device drawn from a mix. For each uniform power
growth t the ranges are sqrt(r_i^2 + t), and GEOS via Debian
python3-shapely computes the uncovered part

    area.difference(unary_union([Point(p_i).buffer(R_i, resolution=256)]))

with, as in ref_gaps.py, inscribed (R_i = r_i) and circumscribed
(R_i = r_i / cos(pi/1024)) 1024-gons bracketing each disk: the true
uncovered area, and every gap's area, lie between the two results.

Per gap it also writes, for every device i, the farthest distance from p_i
to the gap (the largest distance to a vertex of its exterior ring, the
distance being convex): far_circumscribed[i] <= true <= far_inscribed[i],
since the circumscribed gap lies inside the true one and the inscribed gap
contains it. That is the range device i alone needs to close the gap.

Usage: ref_weighted_gaps.py [--seed S] [--out FILE]
  --seed S   seed of the sites and ranges (default 20261204: the committed
             data)
  --out FILE output path (default weighted_gaps_ref.json beside this
             script; '-' for standard output)
"""

import argparse
import math
import os
import sys

import numpy as np
import shapely

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from ref_gaps import N_SEG, RES, bracket, region_of, scene_fence, scene_lshape, scene_two_parts, write_json  # noqa: E402

MIX = [20.0, 30.0, 45.0, 60.0]
GROWTH = [0.0, 600.0]


def scene_dense(rng):
    ext = [(0, 0), (300, 0), (300, 300), (0, 300)]
    hole = [(120, 120), (120, 180), (180, 180), (180, 120)]
    sites = rng.uniform(-10, 310, size=(70, 2))
    return {"name": "dense-hidden", "area": [[ext, hole]], "sites": sites.tolist(), "ranges": []}


def farthest(comp, p):
    xs, ys = comp.exterior.coords.xy
    return max(math.hypot(x - p[0], y - p[1]) for x, y in zip(xs, ys))


def case(region, sites, ranges, t):
    radii = [math.sqrt(r * r + t) for r in ranges]
    b = bracket(region, sites, radii, lambda c, q: {
        "far_circumscribed": [farthest(c, p) for p in sites],
        "far_inscribed": [farthest(q, p) for p in sites],
    })
    return None if b is None else dict({"t": t}, **b)


def build(seed):
    rng = np.random.default_rng(seed)
    scenes = []
    for make in (scene_lshape, scene_two_parts, scene_fence, scene_dense):
        sc = make(rng)
        sc.pop("ranges")
        region = region_of(sc["area"])
        sc["area_m2"] = region.area
        sc["device_ranges"] = [float(r) for r in rng.choice(MIX, size=len(sc["sites"]))]
        sc["cases"] = []
        for t in GROWTH:
            c = case(region, sc["sites"], sc["device_ranges"], t)
            if c is not None:
                sc["cases"].append(c)
            else:
                print("note: %s t=%g skipped (brackets disagree)" % (sc["name"], t), file=sys.stderr)
        sc["area"] = [[[list(map(float, p)) for p in ring] for ring in poly] for poly in sc["area"]]
        sc["sites"] = [[float(x), float(y)] for x, y in sc["sites"]]
        scenes.append(sc)
    return {
        "generator": "coverage/testdata/ref_weighted_gaps.py (GEOS via shapely %s, buffer resolution %d = %d-gon)"
        % (shapely.__version__, RES, N_SEG),
        "seed": seed,
        "segments": N_SEG,
        "scenes": scenes,
    }


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261204)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "weighted_gaps_ref.json"))
    a = ap.parse_args()
    write_json(build(a.seed), a.out)


if __name__ == "__main__":
    main()
