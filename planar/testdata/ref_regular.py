#!/usr/bin/python3
"""Reference regular (weighted Delaunay) triangulations from GUDHI.

Run with the Debian interpreter (/usr/bin/python3, package python3-gudhi,
GUDHI 3.7.1):

    /usr/bin/python3 planar/testdata/ref_regular.py [--seed N] [--small] [--out FILE]

It draws weighted point sets (device positions with ranges drawn from
40/60/120/150 m, weights = range squared) in several shapes, builds
gudhi.AlphaComplex(points=..., weights=...) and takes the triangles of its
simplex tree: the complex at filtration +inf is the regular triangulation,
and hidden points are not vertices of it. Points and triangles (input index
triples) are written as JSON; planar's tests compare the triangle sets with
TriangulateRegular's and the hidden inputs with the points GUDHI left out.

GUDHI works through CGAL with its own symbolic perturbation, so before a
case is written it is checked with exact rational arithmetic
(fractions.Fraction): every triangle counter-clockwise, every interior edge
strictly locally regular, every hull edge free of collinear points, and
every left-out point strictly above the lifted triangle holding it. A case
failing the check is redrawn, so the file holds only inputs whose regular
triangulation is unique and equal to GUDHI's.
"""

import argparse
import json
import random
import sys
from fractions import Fraction

import gudhi

RANGES = [40.0, 60.0, 120.0, 150.0]


def orient(a, b, c):
    return (a[0] - c[0]) * (b[1] - c[1]) - (a[1] - c[1]) * (b[0] - c[0])


def power(a, b, c, d):
    """Positive when d is in conflict with the ccw triangle abc."""
    rows = []
    for p in (a, b, c):
        dx, dy = p[0] - d[0], p[1] - d[1]
        rows.append((dx, dy, dx * dx + dy * dy - (p[2] - d[2])))
    (ax, ay, al), (bx, by, bl), (cx, cy, cl) = rows
    return (al * (bx * cy - cx * by) + bl * (cx * ay - ax * cy)
            + cl * (ax * by - bx * ay))


def exact_check(points, weights, tris):
    q = [(Fraction(x), Fraction(y), Fraction(w)) for (x, y), w in zip(points, weights)]
    if len({(p[0], p[1]) for p in q}) != len(q):
        return False
    edges = {}
    used = set()
    for t in tris:
        a, b, c = t
        used.update(t)
        if orient(q[a], q[b], q[c]) <= 0:
            return False
        for u, v, w in ((a, b, c), (b, c, a), (c, a, b)):
            edges[(u, v)] = w
    for (u, v), w in edges.items():
        x = edges.get((v, u))
        if x is None:
            # Hull edge: no other point on its closed segment's line
            # between (keeps the hull free of degenerate choices).
            for k in range(len(q)):
                if k in (u, v):
                    continue
                if orient(q[u], q[v], q[k]) == 0:
                    return False
            continue
        if power(q[u], q[v], q[w], q[x]) >= 0:
            return False
    for k in range(len(q)):
        if k in used:
            continue
        holder = None
        for t in tris:
            a, b, c = t
            if orient(q[a], q[b], q[k]) >= 0 and orient(q[b], q[c], q[k]) >= 0 and orient(q[c], q[a], q[k]) >= 0:
                holder = t
                break
        if holder is None or power(q[holder[0]], q[holder[1]], q[holder[2]], q[k]) >= 0:
            return False
    return True


def draw(rng, shape, n):
    side = (n * 100.0 * 100.0) ** 0.5  # about one device per 100 m x 100 m
    pts = []
    if shape == "uniform":
        pts = [(rng.uniform(0, side), rng.uniform(0, side)) for _ in range(n)]
    elif shape == "clustered":
        centres = [(rng.uniform(0, side), rng.uniform(0, side), rng.uniform(20, side / 6)) for _ in range(5)]
        for _ in range(n):
            cx, cy, s = rng.choice(centres)
            pts.append((rng.gauss(cx, s), rng.gauss(cy, s)))
    elif shape == "dense":
        # Ten times the density: many hidden devices.
        side /= 10 ** 0.5
        pts = [(rng.uniform(0, side), rng.uniform(0, side)) for _ in range(n)]
    elif shape == "utm":
        pts = [(500000 + rng.uniform(0, side), 5300000 + rng.uniform(0, side)) for _ in range(n)]
    weights = [rng.choice(RANGES) ** 2 for _ in range(n)]
    return pts, weights


def gudhi_triangles(pts, weights):
    ac = gudhi.AlphaComplex(points=[list(p) for p in pts], weights=weights)
    st = ac.create_simplex_tree()
    tris = []
    for s, _ in st.get_simplices():
        if len(s) == 3:
            a, b, c = s
            if orient(pts[a], pts[b], pts[c]) < 0:
                b, c = c, b
            tris.append([a, b, c])
    return tris


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=12)
    ap.add_argument("--small", action="store_true")
    ap.add_argument("--out", default="planar/testdata/regular_ref.json")
    args = ap.parse_args()
    rng = random.Random(args.seed)
    sizes = [40, 150] if args.small else [40, 150, 400]
    cases = []
    for shape in ("uniform", "clustered", "dense", "utm"):
        for n in sizes:
            for attempt in range(20):
                pts, weights = draw(rng, shape, n)
                tris = gudhi_triangles(pts, weights)
                if exact_check(pts, weights, tris):
                    break
            else:
                sys.exit(f"{shape}-{n}: no case passed the exact check")
            cases.append({"name": f"{shape}-{n}", "points": pts, "weights": weights, "triangles": tris})
    with open(args.out, "w") as f:
        json.dump({"source": f"GUDHI {gudhi.__version__} AlphaComplex(points, weights)", "seed": args.seed, "cases": cases}, f)


if __name__ == "__main__":
    main()
