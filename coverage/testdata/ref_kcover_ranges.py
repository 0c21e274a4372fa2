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

import numpy as np
import shapely
import shapely.geos
from shapely.geometry import Polygon

# The area sample of the planning references; the GEOS k-covered area (one
# radius per site) and the Monte Carlo points of the common-range k
# references.
from ref_plan import samples
from ref_kcover import KMAX, level_ref, mc_points, run


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


def scene_ref(sc, rng, small):
    poly = Polygon(sc["exterior"], sc["holes"])
    sites, ranges = distinct(sc["sites"], sc["ranges"])
    kmax = min(KMAX, len(sites))
    h = 0.5 if small else 0.2
    sp = samples(poly, h)
    pw = np.vstack([kth_powers(sp[i:i + 20000], sites, ranges, kmax) for i in range(0, len(sp), 20000)])
    mc = mc_points(poly, rng, 40000 if small else 200000)
    pmc = np.vstack([kth_powers(mc[i:i + 20000], sites, ranges, kmax) for i in range(0, len(mc), 20000)])
    levels = [level_ref(k, pw[:, k - 1], sp, pmc[:, k - 1] <= 0, poly, sites, list(ranges))
              for k in range(1, kmax + 1)]
    return dict(name=sc["name"], exterior=sc["exterior"], holes=sc["holes"], sites=sc["sites"],
                ranges=sc["ranges"], sample_spacing=h, levels=levels)


def main():
    run("kcover_ranges_ref.json", "ref_kcover_ranges.py (numpy %s brute force, shapely %s / GEOS %s)" % (
        np.__version__, shapely.__version__, shapely.geos.geos_version_string), scenes, scene_ref)


if __name__ == "__main__":
    main()
