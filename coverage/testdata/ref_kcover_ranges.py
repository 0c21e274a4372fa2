#!/usr/bin/python3
"""Reference values for k-coverage with own ranges (coverage/kcover_power_ref_test.go).

Everything here is computed with outside libraries, never with sitecover:

  * the k-th smallest power pi_i(x) = |x - p_i|^2 - r_i^2 over a fine sample
    of the site area A, by brute force with NumPy (every device, sorted per
    sample point with numpy.partition): per k the largest k-th smallest
    power over the samples and where it is attained. Samples: a square grid
    of spacing h clipped to A plus points every h along each ring (the
    sample of ref_plan.py).
  * the share of A reached by at least k devices at their own ranges by
    Monte Carlo: uniform random points of A, counted when their k-th
    smallest power (NumPy brute force) is <= 0.
  * the area reached by at least k devices with GEOS (Debian
    python3-shapely): the union over all k-subsets of devices of the
    intersection of their disks (each of its own radius), intersected with
    A. Disks are drawn twice: inscribed (buffer(site, r_i, resolution=256),
    a 1024-gon inside the circle) and circumscribed (that polygon scaled by
    1/cos(pi/1024) about the site, which holds the circle), so the exact
    area lies between the two results. Only k-subsets whose disks pairwise
    meet (|p - q| <= r_p + r_q) can have a common point; the others are
    skipped.

Devices at exactly the same spot count once, with the largest range among
them (as in sitecover): the devices are deduplicated so before the powers
and the subsets are computed.

Scenes: an L-shaped site with an exclusion zone and random sites of four
ranges (some outside the area, one duplicated with another range); devices
hidden among the k of smallest power (two small disks inside the union of
two large ones, reaching spots only those two reach); disks nested in a
large one; random clusters of small disks around a large one; equal ranges
(the common-range answer); collinear sites of mixed ranges; three devices
(k up to 3). Coordinates are written with full precision.

Usage: ref_kcover_ranges.py [--seed S] [--out FILE] [--small]
  --seed S   seed of the random scenes (default 20261203, the committed data)
  --out FILE output path (default kcover_ranges_ref.json beside this script)
  --small    smaller samples (for the live test)
"""

import argparse
import itertools
import json
import math
import os

import numpy as np
import shapely
import shapely.geos
from shapely import affinity, vectorized
from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

from ref_plan import samples

RES = 256  # quarter-circle segments: 1024-gons
NSEG = 4 * RES
KMAX = 4


def scenes(rng):
    out = []
    ext = [(0, 0), (120, 0), (120, 50), (70, 50), (70, 90), (0, 90)]
    hole = [(25, 25), (25, 40), (45, 40), (45, 25)]
    pts = [(float(x), float(y)) for x, y in rng.uniform([-10, -10], [130, 100], size=(14, 2))]
    rs = [float(r) for r in rng.choice([14.0, 22.0, 30.0, 42.0], size=14)]
    pts.append(pts[3])  # a duplicate with another range: counts once, the larger
    rs.append(rs[3] + 7.0)
    out.append(dict(name="lshape-mixed", exterior=ext, holes=[hole], sites=pts, ranges=rs))
    hid = [(25.0, 40.0), (55.0, 40.0), (40.0, 40.0), (40.0, 46.0), (40.0, 75.0), (40.0, 5.0)]
    out.append(dict(name="hidden-among-k", exterior=[(0, 0), (80, 0), (80, 80), (0, 80)], holes=[],
                    sites=hid, ranges=[25.0, 25.0, 8.0, 5.0, 22.0, 22.0]))
    nest = [(50.0, 40.0), (47.0, 42.0), (55.0, 37.0), (50.0, 45.0), (15.0, 15.0), (85.0, 65.0)]
    out.append(dict(name="nested", exterior=[(0, 0), (100, 0), (100, 80), (0, 80)], holes=[],
                    sites=nest, ranges=[45.0, 10.0, 14.0, 6.0, 25.0, 25.0]))
    eq = [(float(x), float(y)) for x, y in rng.uniform([0, 0], [90, 70], size=(10, 2))]
    out.append(dict(name="equal-ranges", exterior=[(0, 0), (90, 0), (90, 70), (0, 70)], holes=[],
                    sites=eq, ranges=[24.0] * len(eq)))
    line = [(10.0, 30.0), (24.0, 30.0), (31.0, 30.0), (55.0, 30.0), (80.0, 30.0)]
    out.append(dict(name="collinear-mixed", exterior=[(0, 0), (90, 0), (90, 60), (0, 60)], holes=[],
                    sites=line, ranges=[40.0, 12.0, 30.0, 45.0, 20.0]))
    cl, cr = [], []
    for c in rng.uniform([20, 20], [80, 60], size=(3, 2)):
        cl.append((float(c[0]), float(c[1])))
        cr.append(float(rng.uniform(28, 40)))
        for p in rng.normal(c, 8.0, size=(4, 2)):
            cl.append((float(p[0]), float(p[1])))
            cr.append(float(rng.uniform(5, 12)))
    out.append(dict(name="clustered-nested", exterior=[(0, 0), (100, 0), (100, 80), (0, 80)], holes=[],
                    sites=cl, ranges=cr))
    three = [(20.0, 20.0), (45.0, 30.0), (30.0, 45.0)]
    out.append(dict(name="three-devices", exterior=[(0, 0), (60, 0), (60, 60), (0, 60)], holes=[],
                    sites=three, ranges=[30.0, 20.0, 25.0]))
    return out


def distinct(sites, ranges):
    best = {}
    for p, r in zip(sites, ranges):
        p = tuple(p)
        best[p] = max(r, best.get(p, r))
    keys = sorted(best)
    return np.array(keys, dtype=float), np.array([best[p] for p in keys])


def kth_powers(pts, sites, ranges, kmax):
    d2 = ((pts[:, None, :] - sites[None, :, :]) ** 2).sum(axis=2) - ranges[None, :] ** 2
    return np.sort(d2, axis=1)[:, :kmax]


def disks(sites, ranges, circumscribed):
    out = []
    for p, r in zip(sites, ranges):
        d = Point(p).buffer(r, resolution=RES)
        if circumscribed:
            f = 1 / math.cos(math.pi / NSEG)
            d = affinity.scale(d, xfact=f, yfact=f, origin=Point(p))
        out.append(d)
    return out


def k_area(poly, sites, ranges, k, circumscribed):
    ds = disks(sites, ranges, circumscribed)
    f = 1 / math.cos(math.pi / NSEG)
    n = len(sites)
    meet = [[math.dist(sites[i], sites[j]) <= (ranges[i] + ranges[j]) * f for j in range(n)] for i in range(n)]
    parts = []
    for sub in itertools.combinations(range(n), k):
        if any(not meet[a][b] for a, b in itertools.combinations(sub, 2)):
            continue
        g = ds[sub[0]]
        for j in sub[1:]:
            g = g.intersection(ds[j])
            if g.is_empty:
                break
        if not g.is_empty:
            parts.append(g)
    if not parts:
        return 0.0
    return unary_union(parts).intersection(poly).area


def scene_ref(sc, rng, small):
    poly = Polygon(sc["exterior"], sc["holes"])
    sites, ranges = distinct(sc["sites"], sc["ranges"])
    kmax = min(KMAX, len(sites))
    h = 0.5 if small else 0.2
    sp = samples(poly, h)
    pw = np.vstack([kth_powers(sp[i:i + 20000], sites, ranges, kmax) for i in range(0, len(sp), 20000)])
    minx, miny, maxx, maxy = poly.bounds
    nmc = 40000 if small else 200000
    mc = []
    while sum(len(m) for m in mc) < nmc:
        q = rng.uniform([minx, miny], [maxx, maxy], size=(nmc, 2))
        mc.append(q[vectorized.contains(poly, q[:, 0], q[:, 1])])
    mc = np.vstack(mc)[:nmc]
    pmc = np.vstack([kth_powers(mc[i:i + 20000], sites, ranges, kmax) for i in range(0, len(mc), 20000)])
    levels = []
    for k in range(1, kmax + 1):
        pk = pw[:, k - 1]
        i = int(np.argmax(pk))
        levels.append(dict(
            k=k,
            sample_max=float(pk[i]),
            sample_point=[float(sp[i, 0]), float(sp[i, 1])],
            mc_share=float(np.mean(pmc[:, k - 1] <= 0)),
            mc_n=int(len(mc)),
            geos_inscribed=k_area(poly, sites, ranges, k, False),
            geos_circumscribed=k_area(poly, sites, ranges, k, True),
        ))
    return dict(name=sc["name"], exterior=sc["exterior"], holes=sc["holes"], sites=sc["sites"],
                ranges=sc["ranges"], sample_spacing=h, levels=levels)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "kcover_ranges_ref.json"))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    doc = dict(
        generator="ref_kcover_ranges.py (numpy %s brute force, shapely %s / GEOS %s)" % (
            np.__version__, shapely.__version__, shapely.geos.geos_version_string),
        seed=a.seed, small=a.small, buffer_segments=NSEG,
        scenes=[scene_ref(sc, rng, a.small) for sc in scenes(rng)],
    )
    with open(a.out, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
