#!/usr/bin/python3
"""Reference values for planar/projection.go.

Calls PROJ (Debian proj-bin: `proj`, `invproj`) and GeographicLib
(Debian geographiclib-tools: `GeodSolve`) on random inputs and writes JSON
that planar/projection_test.go checks:

  forward   PROJ +proj=tmerc +ellps=WGS84 forward projections of random
            points within 3 degrees of several central meridians, latitudes
            -80..80 (proj -f %.6f: micrometre output).
  inverse   PROJ inverse (invproj -f %.12f) of projected points.
  scale     PROJ point scale factors (proj -V, 8 decimals) for a subset.
  geodesic  GeographicLib geodesic distances (GeodSolve -i -p 6) between
            random point pairs in small extents (20 km), some of them
            straddling the antimeridian or at high latitude.
  snyder    PROJ's values for Snyder's worked example (USGS Professional
            Paper 1395, 1987): Clarke 1866, lat 40d30'N, lon 73d30'W,
            lon_0 75W, lat_0 0, k_0 0.9996.

Usage: /usr/bin/python3 ref_projection.py [--seed N] [--out FILE]
"""

import argparse
import json
import math
import os
import random
import re
import subprocess

DEFAULT_SEED = 20110404  # fixed seed for the committed data
HERE = os.path.dirname(os.path.abspath(__file__))


def run(cmd, text):
    res = subprocess.run(cmd, input=text, capture_output=True, text=True, check=True)
    return res.stdout


def tmerc_args(ellps, lon0, lat0, k0):
    return ["+proj=tmerc", "+ellps=" + ellps, "+lon_0=%.17g" % lon0,
            "+lat_0=%.17g" % lat0, "+k_0=%.17g" % k0, "+x_0=0", "+y_0=0"]


def wrap(lon):
    """Reduce a longitude to [-180, 180]."""
    lon = math.fmod(lon + 180.0, 360.0)
    if lon < 0:
        lon += 360.0
    return lon - 180.0


def proj_forward(args, pts):
    text = "".join("%.15f %.15f\n" % (lon, lat) for lon, lat in pts)
    out = run(["proj", "-f", "%.6f"] + args, text)
    res = []
    for line in out.splitlines():
        x, y = line.split()[:2]
        res.append((float(x), float(y)))
    if len(res) != len(pts):
        raise SystemExit("proj returned %d lines for %d points" % (len(res), len(pts)))
    return res


def proj_inverse(args, xy):
    text = "".join("%.6f %.6f\n" % p for p in xy)
    out = run(["invproj", "-f", "%.12f"] + args, text)
    res = []
    for line in out.splitlines():
        lon, lat = line.split()[:2]
        res.append((float(lon), float(lat)))
    if len(res) != len(xy):
        raise SystemExit("invproj returned %d lines for %d points" % (len(res), len(xy)))
    return res


def proj_scale(args, lon, lat):
    out = run(["proj", "-V"] + args, "%.15f %.15f\n" % (lon, lat))
    for line in out.splitlines():
        if line.startswith("Parallel scale (k)"):
            return float(line.split(":")[1].split()[0])
    raise SystemExit("proj -V printed no parallel scale:\n" + out)


def geodesics(pairs):
    text = "".join("%.15f %.15f %.15f %.15f\n" % (p[1], p[0], p[3], p[2]) for p in pairs)
    out = run(["GeodSolve", "-i", "-p", "6"], text)
    res = [float(line.split()[2]) for line in out.splitlines()]
    if len(res) != len(pairs):
        raise SystemExit("GeodSolve returned %d lines for %d pairs" % (len(res), len(pairs)))
    return res


def version(cmd):
    res = subprocess.run(cmd, capture_output=True, text=True)
    return (res.stdout + res.stderr).strip().splitlines()[0]


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--seed", type=int, default=DEFAULT_SEED)
    ap.add_argument("--out", default=os.path.join(HERE, "projection_ref.json"))
    opt = ap.parse_args()
    rng = random.Random(opt.seed)

    data = {
        "generator": "planar/testdata/ref_projection.py",
        "seed": opt.seed,
        "proj": version(["proj"]),
        "geodsolve": version(["GeodSolve", "--version"]),
        "forward": [], "inverse": [], "scale": [], "geodesic": [],
    }

    # Central meridians: fixed ones near the antimeridian and the prime
    # meridian, plus random ones; origin latitudes 0 and random.
    cms = [(-177.0, 0.0), (0.0, 0.0), (179.5, rng.uniform(-60, 60))]
    for _ in range(3):
        cms.append((round(rng.uniform(-180, 180), 4), round(rng.uniform(-70, 70), 4)))
    for lon0, lat0 in cms:
        args = tmerc_args("WGS84", lon0, lat0, 1)
        pts = [(wrap(lon0 + rng.uniform(-3, 3)), rng.uniform(-80, 80)) for _ in range(40)]
        xy = proj_forward(args, pts)
        data["forward"].append({"lon0": lon0, "lat0": lat0,
                                "points": [[p[0], p[1], q[0], q[1]] for p, q in zip(pts, xy)]})
        inv_pts = [(wrap(lon0 + rng.uniform(-3, 3)), rng.uniform(-80, 80)) for _ in range(20)]
        inv_xy = proj_forward(args, inv_pts)
        ll = proj_inverse(args, inv_xy)
        data["inverse"].append({"lon0": lon0, "lat0": lat0,
                                "points": [[q[0], q[1], p[0], p[1]] for q, p in zip(inv_xy, ll)]})
        sc = []
        for lon, lat in pts[:5]:
            sc.append([lon, lat, proj_scale(args, lon, lat)])
        data["scale"].append({"lon0": lon0, "lat0": lat0, "points": sc})

    # Small extents (about 20 km square) for planar vs geodesic distances.
    centres = [("paris", 2.35, 48.85), ("antimeridian", 179.97, -16.5),
               ("north", 25.0, 69.5), ("random", round(rng.uniform(-180, 180), 4),
                                                  round(rng.uniform(-60, 60), 4))]
    for name, clon, clat in centres:
        half = 10000.0  # metres
        dlat = math.degrees(half / 6371000.0)
        dlon = dlat / math.cos(math.radians(clat))
        pairs = []
        for _ in range(25):
            p = [wrap(clon + rng.uniform(-dlon, dlon)), clat + rng.uniform(-dlat, dlat),
                 wrap(clon + rng.uniform(-dlon, dlon)), clat + rng.uniform(-dlat, dlat)]
            pairs.append(p)
        s12 = geodesics(pairs)
        data["geodesic"].append({"name": name,
                                 "pairs": [p + [s] for p, s in zip(pairs, s12)]})

    # Snyder's worked example, evaluated by PROJ.
    args = tmerc_args("clrk66", -75.0, 0.0, 0.9996)
    (x, y), = proj_forward(args, [(-73.5, 40.5)])
    data["snyder"] = {"x": x, "y": y, "k": proj_scale(args, -73.5, 40.5)}

    text = json.dumps(data, indent=1)
    # One point per line: collapse the innermost arrays of numbers.
    text = re.sub(r"\[\s*([-0-9.eE+,\s]+?)\s*\]",
                  lambda m: "[" + ", ".join(v.strip() for v in m.group(1).split(",")) + "]", text)
    with open(opt.out, "w") as f:
        f.write(text + "\n")


if __name__ == "__main__":
    main()
