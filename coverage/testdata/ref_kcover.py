#!/usr/bin/python3
"""Reference values for the k-coverage tests (coverage/kcover_ref_test.go).

Everything here is computed with outside libraries, never with sitecover:

  * k-th nearest device distances over a fine sample of the site area A
    with SciPy's k-d tree (Debian python3-scipy,
    scipy.spatial.cKDTree(sites).query(samples, k=K)): per k the largest
    k-th nearest distance over the samples and where it is attained.
    Samples: a square grid of spacing h clipped to A
    (shapely.vectorized.contains) plus points every h along each ring.
  * the share of A reached by at least k devices at range r by Monte Carlo:
    uniform random points of A (rejection sampling in the bounding box),
    counted when their k-th nearest distance (cKDTree) is <= r.
  * the area reached by at least k devices with GEOS (Debian
    python3-shapely): the union over all k-subsets of devices of the
    intersection of their disks, intersected with A. Disks are drawn twice:
    inscribed (buffer(site, r, resolution=256), a 1024-gon inside the
    circle) and circumscribed (that polygon scaled by 1/cos(pi/1024) about
    the site, which holds the circle), so the exact area lies between the
    two results. Only k-subsets whose disks pairwise meet (|p - q| <= 2r)
    can have a common point; the others are skipped.

Devices at exactly the same spot count once (as in sitecover): the sites
are deduplicated before the k-d tree and the subsets are built.

Scenes: an L-shaped site with an exclusion zone and random sites (some
outside the area, one duplicated); a 5 x 5 square lattice of spacing 10 m
in the square of its cells (many cocircular sites); collinear sites in a
rectangle; clustered sites. Coordinates are written with full precision.

Usage: ref_kcover.py [--seed S] [--out FILE] [--small]
  --seed S   seed of the random scenes (default 20261203, the committed data)
  --out FILE output path (default kcover_ref.json beside this script)
  --small    smaller samples (for the live test)
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
import shapely.geos
from shapely import affinity, vectorized
from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

# The area sample (grid of spacing h inside the area plus points every h
# along its rings) is the one of the planning references.
from ref_plan import samples

RES = 256  # quarter-circle segments: 1024-gons
NSEG = 4 * RES
KMAX = 4


def scenes(rng):
    out = []
    ext = [(0, 0), (120, 0), (120, 50), (70, 50), (70, 90), (0, 90)]
    hole = [(25, 25), (25, 40), (45, 40), (45, 25)]
    pts = [(float(x), float(y)) for x, y in rng.uniform([-10, -10], [130, 100], size=(14, 2))]
    pts.append(pts[3])  # a duplicate: counts once
    out.append(dict(name="lshape-random", exterior=ext, holes=[hole], sites=pts, range=30.0))
    lat = [(10.0 * i, 10.0 * j) for i in range(5) for j in range(5)]
    out.append(dict(name="square-lattice-5x5", exterior=[(-5, -5), (45, -5), (45, 45), (-5, 45)], holes=[],
                    sites=lat, range=12.0))
    line = [(10.0, 30.0), (24.0, 30.0), (31.0, 30.0), (55.0, 30.0), (80.0, 30.0)]
    out.append(dict(name="collinear", exterior=[(0, 0), (90, 0), (90, 60), (0, 60)], holes=[],
                    sites=line, range=35.0))
    cl = []
    for c in rng.uniform([15, 15], [85, 65], size=(3, 2)):
        for p in rng.normal(c, 6.0, size=(4, 2)):
            cl.append((float(p[0]), float(p[1])))
    out.append(dict(name="clustered", exterior=[(0, 0), (100, 0), (100, 80), (0, 80)], holes=[],
                    sites=cl, range=25.0))
    return out


def radii(sites, r):
    """One radius per site: r itself when it is a list or array, else r for every site."""
    if isinstance(r, (list, tuple, np.ndarray)):
        return list(r)
    return [r] * len(sites)


def disks(sites, r, circumscribed):
    out = []
    for p, rp in zip(sites, radii(sites, r)):
        d = Point(p).buffer(rp, resolution=RES)
        if circumscribed:
            f = 1 / math.cos(math.pi / NSEG)
            d = affinity.scale(d, xfact=f, yfact=f, origin=Point(p))
        out.append(d)
    return out


def k_area(poly, sites, r, k, circumscribed):
    """Area of poly reached by at least k of the disks (r: one radius, or one per site)."""
    ds = disks(sites, r, circumscribed)
    rs = radii(sites, r)
    f = 1 / math.cos(math.pi / NSEG)
    n = len(sites)
    near = [[j for j in range(n) if j != i and math.dist(sites[i], sites[j]) <= (rs[i] + rs[j]) * f] for i in range(n)]
    parts = []
    for sub in itertools.combinations(range(n), k):
        if any(b not in near[a] for a, b in itertools.combinations(sub, 2)):
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


def mc_points(poly, rng, nmc):
    """nmc uniform random points of poly (rejection sampling in its bounding box)."""
    minx, miny, maxx, maxy = poly.bounds
    mc = []
    while sum(len(m) for m in mc) < nmc:
        q = rng.uniform([minx, miny], [maxx, maxy], size=(nmc, 2))
        mc.append(q[vectorized.contains(poly, q[:, 0], q[:, 1])])
    return np.vstack(mc)[:nmc]


def level_ref(k, vals, sp, reached, poly, sites, r):
    """The reference values of one k: vals holds the k-th value at each
    sample point of sp, reached whether each Monte Carlo point is reached by
    k devices; r the radius (one, or one per site)."""
    i = int(np.argmax(vals))
    return dict(
        k=k,
        sample_max=float(vals[i]),
        sample_point=[float(sp[i, 0]), float(sp[i, 1])],
        mc_share=float(np.mean(reached)),
        mc_n=int(len(reached)),
        geos_inscribed=k_area(poly, sites, r, k, False),
        geos_circumscribed=k_area(poly, sites, r, k, True),
    )


def run(out_name, generator, scenes, scene_ref):
    """Parses --seed, --out and --small and writes the document of the scenes."""
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), out_name))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    doc = dict(
        generator=generator, seed=a.seed, small=a.small, buffer_segments=NSEG,
        scenes=[scene_ref(sc, rng, a.small) for sc in scenes(rng)],
    )
    with open(a.out, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


def scene_ref(sc, rng, small):
    poly = Polygon(sc["exterior"], sc["holes"])
    sites = sorted(set(map(tuple, sc["sites"])))
    tree = cKDTree(np.array(sites))
    h = 0.5 if small else 0.2
    sp = samples(poly, h)
    dist, _ = tree.query(sp, k=KMAX)
    mc = mc_points(poly, rng, 40000 if small else 200000)
    dmc, _ = tree.query(mc, k=KMAX)
    levels = [level_ref(k, dist[:, k - 1], sp, dmc[:, k - 1] <= sc["range"], poly, sites, sc["range"])
              for k in range(1, KMAX + 1)]
    return dict(name=sc["name"], exterior=sc["exterior"], holes=sc["holes"], sites=sc["sites"],
                range=sc["range"], sample_spacing=h, levels=levels)


def main():
    run("kcover_ref.json", "ref_kcover.py (scipy %s cKDTree, shapely %s / GEOS %s)" % (
        scipy.__version__, shapely.__version__, shapely.geos.geos_version_string), scenes, scene_ref)


if __name__ == "__main__":
    main()
