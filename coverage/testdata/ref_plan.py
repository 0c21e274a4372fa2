#!/usr/bin/python3
"""Reference values for the planning tests (coverage/plan_*_test.go).

Everything here is computed with outside libraries, never with sitecover:

  * failures: for each device, the uncovered area of the site area when
    that device is out of service, with GEOS (Debian python3-shapely):
    area(A - union of buffer(site, r, resolution=256)) over the other
    sites, i.e. disks drawn as inscribed 1024-gons; and the second-nearest
    device distance over a fine sample of A with SciPy's k-d tree
    (Debian python3-scipy,
    scipy.spatial.cKDTree(sites).query(samples, k=2)): the largest
    second-nearest distance, where it is attained, and per device the
    largest second-nearest distance over the samples whose nearest device
    it is. Samples: a square grid of spacing h clipped to A
    (shapely.vectorized.contains) plus points every h along each ring.
  * assign: nearest device index and distance of random demand points,
    cKDTree.query(points, k=1).
  * candidates: the covered area each candidate spot would add to the
    existing devices, area((A & disk(c)) - union(existing disks)), with
    GEOS and 1024-gon disks; and, for the first ncand_exh candidates, the
    best covered area over all subsets of size k_exh (exhaustive search).

Scenes: an L-shaped site with an exclusion zone (hole) and random sites,
some outside the area; a 10 x 10 square lattice of spacing 10 m with the
device at (40, 50) removed, area [-5, 95]^2; a triangular lattice of
spacing 10 m with one interior device removed. Coordinates are written
with full precision (repr of float64 round-trips).

An inscribed N-gon of a circle of radius r misses
(pi - (N/2) sin(2 pi / N)) r^2 of the disk; the Go tests derive their
tolerances from that.

Usage: ref_plan.py [--seed S] [--out FILE] [--small]
  --seed S   seed of the random scenes (default 20240612, the committed data)
  --out FILE output path (default plan_ref.json beside this script)
  --small    smaller scenes and coarser samples (for the live test)
"""

import argparse
import itertools
import json
import math
import os

import numpy as np
import scipy
import shapely
from scipy.spatial import cKDTree
from shapely import vectorized
from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

RES = 256  # quarter-circle segments: 1024-gons


def lshape():
    ext = [(0, 0), (200, 0), (200, 70), (120, 70), (120, 120), (0, 120)]
    hole = [(40, 40), (40, 60), (70, 60), (70, 40)]
    return ext, [hole]


def square_region(lo, hi):
    return [(lo, lo), (hi, lo), (hi, hi), (lo, hi)], []


def samples(poly, h):
    minx, miny, maxx, maxy = poly.bounds
    xs = np.arange(minx, maxx + h / 2, h)
    ys = np.arange(miny, maxy + h / 2, h)
    gx, gy = np.meshgrid(xs, ys)
    gx, gy = gx.ravel(), gy.ravel()
    inside = vectorized.contains(poly, gx, gy)
    pts = [np.column_stack([gx[inside], gy[inside]])]
    rings = [poly.exterior] + list(poly.interiors)
    for ring in rings:
        n = max(4, int(math.ceil(ring.length / h)))
        pts.append(np.array([ring.interpolate(i * ring.length / n).coords[0] for i in range(n)]))
    return np.vstack(pts)


def disks(pts, r):
    return unary_union([Point(p).buffer(r, resolution=RES) for p in pts])


def failures_case(name, ext, holes, sites, r, h, per_device=True):
    poly = Polygon(ext, holes)
    sites = np.asarray(sites, dtype=float)
    out = {
        "name": name, "exterior": ext, "holes": holes,
        "sites": sites.tolist(), "range": r, "sample_spacing": h,
    }
    out["uncovered_intact"] = poly.difference(disks(sites, r)).area
    if per_device:
        unc = []
        for v in range(len(sites)):
            rest = np.delete(sites, v, axis=0)
            unc.append(poly.difference(disks(rest, r)).area)
        out["uncovered_without"] = unc
    q = samples(poly, h)
    d, i = cKDTree(sites).query(q, k=2)
    k = int(np.argmax(d[:, 1]))
    out["survive_sample"] = float(d[k, 1])
    out["survive_sample_point"] = q[k].tolist()
    per = np.zeros(len(sites))
    np.maximum.at(per, i[:, 0], d[:, 1])
    out["closing_sample"] = per.tolist()
    out["samples"] = int(len(q))
    return out


def assign_case(rng, nsites, npts):
    side = math.sqrt(nsites) * 10
    sites = rng.random((nsites, 2)) * side
    pts = rng.random((npts, 2)) * side * 1.2 - side * 0.1
    d, i = cKDTree(sites).query(pts, k=1)
    return {
        "name": "uniform-%d-%d" % (nsites, npts),
        "sites": sites.tolist(), "points": pts.tolist(),
        "nearest": i.tolist(), "distance": d.tolist(),
    }


def candidates_case(rng, ncand, ncand_exh, k_exh, r):
    ext, holes = lshape()
    poly = Polygon(ext, holes)
    existing = [(20.0, 20.0), (180.0, 20.0), (60.0, 100.0)]
    cand = np.column_stack([rng.random(ncand) * 220 - 10, rng.random(ncand) * 140 - 10])
    base = disks(existing, r)
    covered0 = poly.intersection(base).area
    gains = []
    for c in cand:
        piece = poly.intersection(Point(c).buffer(r, resolution=RES)).difference(base)
        gains.append(piece.area)
    best, best_set = -1.0, None
    cd = [Point(c).buffer(r, resolution=RES) for c in cand[:ncand_exh]]
    for s in itertools.combinations(range(ncand_exh), k_exh):
        a = poly.intersection(unary_union([base] + [cd[j] for j in s])).area
        if a > best:
            best, best_set = a, list(s)
    return {
        "name": "lshape-candidates", "exterior": ext, "holes": holes,
        "existing": [list(p) for p in existing], "candidates": cand.tolist(),
        "range": r, "covered_existing": covered0, "gains": gains,
        "exhaustive_n": ncand_exh, "exhaustive_k": k_exh,
        "exhaustive_best": best, "exhaustive_set": best_set,
    }


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20240612)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "plan_ref.json"))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    h = 0.5 if not a.small else 1.0
    nsites = 40 if not a.small else 20

    fails = []
    ext, holes = lshape()
    sites = np.column_stack([rng.random(nsites) * 220 - 10, rng.random(nsites) * 140 - 10])
    fails.append(failures_case("lshape-random", ext, holes, sites.tolist(), 18.0, h))
    sq = [(10.0 * i, 10.0 * j) for j in range(10) for i in range(10) if (i, j) != (4, 5)]
    ext, holes = square_region(-5.0, 95.0)
    fails.append(failures_case("square-lattice-missing", ext, holes, sq, 8.0, h / 2, per_device=not a.small))
    tri = []
    for j in range(9):
        for i in range(10):
            if (i, j) == (4, 4):
                continue
            tri.append((10.0 * i + (5.0 if j % 2 else 0.0), j * 10.0 * math.sqrt(3) / 2))
    ext = [(-4.0, -4.0), (99.0, -4.0), (99.0, 73.0), (-4.0, 73.0)]
    fails.append(failures_case("triangular-lattice-missing", ext, [], tri, 7.0, h / 2, per_device=not a.small))

    doc = {
        "generator": "coverage/testdata/ref_plan.py",
        "seed": a.seed,
        "small": a.small,
        "shapely": shapely.__version__,
        "geos": ".".join(str(x) for x in shapely.geos.geos_version),
        "scipy": scipy.__version__,
        "buffer_segments": 4 * RES,
        "failures": fails,
        "assign": [assign_case(rng, 300 if not a.small else 100, 3000 if not a.small else 1000)],
        "candidates": [candidates_case(rng, 25 if not a.small else 12, 10 if not a.small else 8, 3, 25.0)],
    }
    with open(a.out, "w") as f:
        json.dump(doc, f)
        f.write("\n")


if __name__ == "__main__":
    main()
