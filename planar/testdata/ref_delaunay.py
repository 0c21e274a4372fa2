#!/usr/bin/python3
"""Reference Delaunay triangulations from Qhull (scipy.spatial.Delaunay).

Run with the Debian interpreter (/usr/bin/python3, package python3-scipy):

    /usr/bin/python3 planar/testdata/ref_delaunay.py [--seed N] [--small] [--out FILE]

It draws random point sets in general position (several sizes and shapes),
triangulates them with Qhull and writes points and triangles (vertex index
triples, as Qhull numbers the input) as JSON. planar's tests compare the
set of triangles with Triangulate's.

Qhull works in floating point, so before a case is written its triangulation
is checked with exact rational arithmetic (fractions.Fraction): every
triangle counter-clockwise, every interior edge locally Delaunay with a
strict margin (no four points cocircular), every input point a vertex. A
case failing the check is redrawn, so the file holds only inputs whose
Delaunay triangulation is unique and equal to Qhull's.
"""

import argparse
import json
import sys
from fractions import Fraction

import numpy as np
import scipy
from scipy.spatial import Delaunay


def orient(a, b, c):
    return (a[0] - c[0]) * (b[1] - c[1]) - (a[1] - c[1]) * (b[0] - c[0])


def incircle(a, b, c, d):
    adx, ady = a[0] - d[0], a[1] - d[1]
    bdx, bdy = b[0] - d[0], b[1] - d[1]
    cdx, cdy = c[0] - d[0], c[1] - d[1]
    al = adx * adx + ady * ady
    bl = bdx * bdx + bdy * bdy
    cl = cdx * cdx + cdy * cdy
    return (al * (bdx * cdy - cdx * bdy) + bl * (cdx * ady - adx * cdy)
            + cl * (adx * bdy - bdx * ady))


def exact_check(points, tris):
    """True when tris is exactly the unique Delaunay triangulation."""
    q = [(Fraction(float(x)), Fraction(float(y))) for x, y in points]
    if len({p for p in q}) != len(q):
        return False
    used = set()
    edges = {}
    for t in tris:
        a, b, c = (int(v) for v in t)
        used.update((a, b, c))
        if orient(q[a], q[b], q[c]) <= 0:
            return False
        for u, v, w in ((a, b, c), (b, c, a), (c, a, b)):
            edges[(u, v)] = w
    if len(used) != len(q):
        return False
    for (u, v), w in edges.items():
        if (v, u) in edges:
            x = edges[(v, u)]
            # Strictly outside: the triangulation is unique.
            if incircle(q[u], q[v], q[w], q[x]) >= 0:
                return False
    return True


def ccw(points, tris):
    out = []
    for t in tris:
        a, b, c = (int(v) for v in t)
        if orient(points[a], points[b], points[c]) < 0:
            b, c = c, b
        out.append([a, b, c])
    return out


def draw(rng, shape, n):
    if shape == "uniform":
        side = np.sqrt(n) * 10.0
        return rng.uniform(0.0, side, size=(n, 2))
    if shape == "clustered":
        k = max(1, n // 200)
        centres = rng.uniform(0.0, np.sqrt(n) * 10.0, size=(k, 2))
        sizes = rng.uniform(2.0, 40.0, size=k)
        which = rng.integers(0, k, size=n)
        return centres[which] + rng.normal(size=(n, 2)) * sizes[which, None]
    if shape == "offset":
        # Local metres at a false easting/northing of 5e6 m.
        return 5.0e6 + rng.uniform(0.0, np.sqrt(n) * 10.0, size=(n, 2))
    if shape == "thin":
        # A long thin strip: many nearly collinear hull points.
        return np.column_stack([rng.uniform(0.0, n * 10.0, size=n),
                                rng.uniform(0.0, 5.0, size=n)])
    raise ValueError(shape)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20240611)
    ap.add_argument("--small", action="store_true", help="small sizes only (live test)")
    ap.add_argument("--out", default="planar/testdata/delaunay_ref.json")
    args = ap.parse_args()
    rng = np.random.default_rng(args.seed)
    if args.small:
        plan = [("uniform", 50), ("clustered", 200), ("offset", 300), ("uniform", 1000)]
    else:
        plan = [("uniform", 4), ("uniform", 10), ("uniform", 100), ("uniform", 2500),
                ("clustered", 1500), ("offset", 1000), ("thin", 400)]
    cases = []
    for shape, n in plan:
        for attempt in range(20):
            pts = draw(rng, shape, n)
            if shape == "offset":
                # Qhull's floating-point arithmetic misjudges nearly
                # cocircular points this far from the origin (a few edges
                # per thousand points fail the exact check), so it is given
                # the points translated by -5e6, a subtraction that is exact
                # here (Sterbenz); the exact check below uses the original
                # coordinates, and the Delaunay property is invariant under
                # translation.
                tri = Delaunay(pts - 5.0e6)
            else:
                tri = Delaunay(pts)
            if exact_check(pts, tri.simplices):
                break
        else:
            sys.exit("no exactly checkable %s case of %d points" % (shape, n))
        pts_list = [[float(x), float(y)] for x, y in pts]
        q = [(Fraction(x), Fraction(y)) for x, y in pts_list]
        cases.append({
            "name": "%s-%d" % (shape, n),
            "points": pts_list,
            "triangles": ccw(q, tri.simplices),
        })
    doc = {
        "source": "Qhull via scipy.spatial.Delaunay (scipy %s, numpy %s), "
                  "verified exactly with fractions.Fraction" % (scipy.__version__, np.__version__),
        "seed": args.seed,
        "cases": cases,
    }
    with open(args.out, "w") as f:
        json.dump(doc, f, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
