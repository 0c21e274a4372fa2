#!/usr/bin/python3
"""Reference values for the planning moves with per-device ranges
(coverage/plan_ranges_ref_test.go), from GEOS via Debian python3-shapely,
never from sitecover.

Each device i at p_i has its own range r_i. A disk is drawn twice, as the
inscribed 1024-gon Point(p).buffer(r, resolution=256) and as the
circumscribed one (radius r / cos(pi / 1024)), so that every area computed
with the inscribed polygons is an upper bound of the exact uncovered area
and every area with the circumscribed ones a lower bound.

  * failures: the uncovered area of the site area A with every device
    working, area(A - union of disks), and with each device out of service
    in turn (the union over the others), both bracketed; and the smallest
    uniform power growth t (every range sqrt(r_i^2 + t)) at which no single
    failure leaves any of A uncovered, found by bisection on t with each
    bracket: t_circumscribed <= t* <= t_inscribed, each to within
    T_TOL m^2 (a configuration counts as covered when the uncovered area
    is below EMPTY_M2).
  * candidates: the covered area a device of range CAND_R at each of a
    few random spots would add, area((A & disk(c)) - union of disks),
    bracketed by the inscribed spot disk minus the circumscribed union
    (a lower bound) and the circumscribed spot disk minus the inscribed
    union (an upper bound).
  * assign: random demand points, each with whether the inscribed and the
    circumscribed union of disks holds it (inscribed => covered => within
    reach of its device; not circumscribed => beyond every device's reach).

Scenes: an L-shaped site with an exclusion zone and random devices of a
range mix, some outside the area; a ring of large devices each with small
ones inside its disk (hidden: they serve only when the large one fails).

Usage: ref_plan_ranges.py [--seed S] [--out FILE]
  --seed S   seed of the random scene and points (default 20261203, the
             committed data)
  --out FILE output path (default plan_ranges_ref.json beside this script)
"""

import argparse
import json
import math
import os

import numpy as np
import shapely
from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

RES = 256  # quarter-circle segments: 1024-gons
N_SEG = 4 * RES
CIRC = 1 / math.cos(math.pi / N_SEG)
T_TOL = 1e-3
EMPTY_M2 = 1e-9
MIX = [12.0, 20.0, 35.0]
CAND_R = 25.0


def disks(sites, radii, scale):
    return unary_union([Point(p).buffer(r * scale, resolution=RES) for p, r in zip(sites, radii)])


def uncovered(poly, sites, radii, scale):
    return poly.difference(disks(sites, radii, scale)).area


def survives(poly, sites, ranges, t, scale):
    radii = [math.sqrt(max(0.0, r * r + t)) for r in ranges]
    for v in range(len(sites)):
        rest = [p for k, p in enumerate(sites) if k != v]
        rr = [r for k, r in enumerate(radii) if k != v]
        if uncovered(poly, rest, rr, scale) > EMPTY_M2:
            return False
    return True


def survive_growth(poly, sites, ranges, scale):
    """Smallest t (within T_TOL) at which every single failure leaves no
    gap, by bisection (survival is monotone in t)."""
    lo = -min(r * r for r in ranges)
    if survives(poly, sites, ranges, lo, scale):
        return lo
    hi = 1.0
    while not survives(poly, sites, ranges, hi, scale):
        lo, hi = hi, 2 * hi
    while hi - lo > T_TOL:
        mid = (lo + hi) / 2
        if survives(poly, sites, ranges, mid, scale):
            hi = mid
        else:
            lo = mid
    return hi


def scene(name, ext, holes, sites, ranges, rng):
    poly = Polygon(ext, holes)
    out = {"name": name, "exterior": ext, "holes": holes, "sites": [list(map(float, p)) for p in sites],
           "ranges": [float(r) for r in ranges]}
    for key, scale in (("inscribed", 1.0), ("circumscribed", CIRC)):
        out["uncovered_" + key] = uncovered(poly, sites, ranges, scale)
        out["without_" + key] = [
            uncovered(poly, [p for k, p in enumerate(sites) if k != v], [r for k, r in enumerate(ranges) if k != v], scale)
            for v in range(len(sites))]
    # t* lies between the circumscribed bisection's lower end and the
    # inscribed one's upper end.
    out["survive_t_inscribed"] = survive_growth(poly, sites, ranges, 1.0)
    out["survive_t_circumscribed"] = survive_growth(poly, sites, ranges, CIRC) - T_TOL
    minx, miny, maxx, maxy = poly.bounds
    pts = np.column_stack([rng.uniform(minx - 10, maxx + 10, 400), rng.uniform(miny - 10, maxy + 10, 400)])
    ins, circ = disks(sites, ranges, 1.0), disks(sites, ranges, CIRC)
    cands = np.column_stack([rng.uniform(minx, maxx, 12), rng.uniform(miny, maxy, 12)])
    out["candidate_range"] = CAND_R
    out["candidates"] = cands.tolist()
    out["gain_low"] = [poly.intersection(Point(c).buffer(CAND_R, resolution=RES)).difference(circ).area for c in cands]
    out["gain_high"] = [poly.intersection(Point(c).buffer(CAND_R * CIRC, resolution=RES)).difference(ins).area
                        for c in cands]
    out["points"] = pts.tolist()
    out["covered_inscribed"] = [bool(ins.covers(Point(p))) for p in pts]
    out["covered_circumscribed"] = [bool(circ.covers(Point(p))) for p in pts]
    return out


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "plan_ranges_ref.json"))
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    ext = [(0, 0), (200, 0), (200, 70), (120, 70), (120, 120), (0, 120)]
    holes = [[(40, 40), (40, 60), (70, 60), (70, 40)]]
    sites = np.column_stack([rng.random(24) * 220 - 10, rng.random(24) * 140 - 10]).tolist()
    ranges = [float(r) for r in rng.choice(MIX, size=len(sites))]
    scenes = [scene("lshape-mixed", ext, holes, sites, ranges, rng)]
    sites, ranges = [], []
    for k in range(6):
        c = (60 + 40 * math.cos(k * math.pi / 3), 60 + 40 * math.sin(k * math.pi / 3))
        off = rng.uniform(-4, 4, size=(2, 2))
        sites += [c, (c[0] + off[0][0], c[1] + off[0][1]), (c[0] + off[1][0], c[1] + off[1][1])]
        ranges += [30.0, 6.0, 10.0]
    scenes.append(scene("ring-hidden", [(0, 0), (120, 0), (120, 120), (0, 120)], [], sites, ranges, rng))
    doc = {
        "generator": "coverage/testdata/ref_plan_ranges.py (GEOS via shapely %s, GEOS %s, buffer resolution %d = %d-gon)"
        % (shapely.__version__, ".".join(str(x) for x in shapely.geos.geos_version), RES, N_SEG),
        "seed": a.seed,
        "buffer_segments": N_SEG,
        "survive_tolerance_m2": T_TOL,
        "scenes": scenes,
    }
    with open(a.out, "w") as f:
        json.dump(doc, f)
        f.write("\n")


if __name__ == "__main__":
    main()
