#!/usr/bin/python3
"""Reference areas for report/siteinput/densify.go.

Each case is a polygon given by longitude/latitude vertices whose edges are
straight in longitude/latitude (RFC 7946 section 3.1.1), with three sites
inside it. Its area on the WGS84 ellipsoid comes from GeographicLib's
Planimeter (Debian geographiclib-tools), which joins vertices by geodesics:
every edge is therefore cut into N pieces evenly in longitude/latitude
first. A geodesic piece of length s departs from the lon/lat-straight line
by about s^2 kappa/8 (kappa <= tan(lat)/R), so the area between them is
below L*kappa/(3 N^2) of the area for an edge of length L: with N = 10000,
under 1e-9 for every case here (recorded as "ref_rel_error").

  fixed cases  the three of issue 11: a 100 km edge along 44.55 N, a 3 km
               site near the pole, a 300 km site; plus a triangle across
               the equator and a pentagon at 60 S.
  --random K   K random star-shaped polygons (4-7 vertices, 1-300 km,
               latitudes -80..85) for the live test.

Usage: /usr/bin/python3 ref_areas.py [--seed N] [--random K] [--out FILE]
"""

import argparse
import math
import os
import random
import subprocess

import refjson  # this folder

DEFAULT_SEED = 7946
HERE = os.path.dirname(os.path.abspath(__file__))
N = 10000  # pieces per edge for Planimeter
R = 6371008.8  # mean Earth radius, for the error estimate only


def fixed():
    return [
        ("parallel-100km", [(-100, 44.55), (-98.74, 44.55), (-98.74, 44.75), (-100, 44.75)]),
        ("polar-3km", [(0, 89.9), (15.5, 89.9), (15.5, 89.927), (0, 89.927)]),
        ("large-300km", [(10, 50), (14, 50), (14, 52.7), (10, 52.7)]),
        ("equator-triangle", [(30, -1), (31.8, 0.5), (30.2, 1)]),
        ("pentagon-60S", [(-70, -60), (-68, -60.4), (-66.5, -59.5), (-67.5, -58.8), (-69.5, -59)]),
    ]


def random_poly(rng):
    lat = rng.uniform(-80, 85)
    lon = rng.uniform(-170, 170)
    size = math.exp(rng.uniform(math.log(1), math.log(300)))  # km
    # Angles evenly spaced with jitter: consecutive gaps stay below pi, so
    # the star-shaped polygon is simple whatever the radii.
    n = rng.randint(4, 7)
    step = 2 * math.pi / n
    angles = [k * step + rng.uniform(-0.4, 0.4) * step for k in range(n)]
    pts = []
    for a in angles:
        r = size / 2 * rng.uniform(0.5, 1)
        dlat = r * math.sin(a) / 111.0
        dlon = r * math.cos(a) / (111.0 * math.cos(math.radians(lat)))
        pts.append((lon + dlon, lat + dlat))
    return "random-%.0fkm" % size, pts


def planimeter(ring):
    lines = []
    for i, p in enumerate(ring):
        q = ring[(i + 1) % len(ring)]
        for k in range(N):
            t = k / N
            lines.append("%.15f %.15f" % (p[1] + t * (q[1] - p[1]), p[0] + t * (q[0] - p[0])))
    out = subprocess.run(["Planimeter", "-p", "12"], input="\n".join(lines) + "\n",
                         capture_output=True, text=True, check=True).stdout.split()
    return float(out[1]), abs(float(out[2]))


def case(name, ring):
    perim, area = planimeter(ring)
    lat_max = max(abs(p[1]) for p in ring)
    kappa = math.tan(math.radians(min(lat_max, 89.99))) / R
    longest = max(math.hypot((q[0] - p[0]) * 111e3 * math.cos(math.radians(p[1])), (q[1] - p[1]) * 111e3)
                  for p, q in zip(ring, ring[1:] + ring[:1]))
    ref_rel = (2.0 / 3) * perim * (longest / N) ** 2 * kappa / 8 / area
    clon = sum(p[0] for p in ring) / len(ring)
    clat = sum(p[1] for p in ring) / len(ring)
    dlat = min(abs(p[1] - clat) for p in ring) * 0.1
    dlon = min(abs(p[0] - clon) for p in ring) * 0.1
    sites = [(clon, clat + dlat), (clon - dlon, clat - dlat), (clon + dlon, clat - dlat)]
    return {"name": name, "ring": [list(p) for p in ring], "sites": [list(p) for p in sites],
            "area": area, "perimeter": perim, "ref_rel_error": ref_rel}


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--seed", type=int, default=DEFAULT_SEED)
    ap.add_argument("--random", type=int, default=0)
    ap.add_argument("--out", default=os.path.join(HERE, "areas_ref.json"))
    opt = ap.parse_args()
    rng = random.Random(opt.seed)
    cases = fixed() if opt.random == 0 else [random_poly(rng) for _ in range(opt.random)]
    data = {"generator": "report/siteinput/testdata/ref_areas.py", "seed": opt.seed,
            "planimeter": refjson.tool_version(["Planimeter", "--version"]), "pieces_per_edge": N,
            "cases": [case(n, r) for n, r in cases]}
    refjson.write(data, opt.out)


if __name__ == "__main__":
    main()
