#!/usr/bin/python3
"""Reference persistence diagrams of the alpha filtration, for coverage tests.

Computes, for several site layouts, the H0 and H1 persistence diagrams of
the alpha complex with GUDHI (Debian python3-gudhi,
gudhi.AlphaComplex(points, precision='exact').create_simplex_tree(),
compute_persistence(), persistence_intervals_in_dimension(0/1)), and the
Euclidean minimum spanning tree with SciPy
(scipy.sparse.csgraph.minimum_spanning_tree on the full distance matrix,
Debian python3-scipy). For the 'uniform-600' layout it also lists every
edge and triangle of the alpha complex with its GUDHI filtration value.

precision='exact' makes GUDHI (CGAL) evaluate every filtration value in
exact arithmetic before rounding it to a double.

GUDHI's filtration values are SQUARED radii; they are written as given
(keys ending in _sq) and the Go test takes square roots. GUDHI's infinite
H0 bar is dropped. compute_persistence() with its default min_persistence=0
keeps only pairs with death > birth, so zero-length pairs are not listed.
MST edge lengths are written as lengths (metres).

Layouts: random uniform in a square of side sqrt(n)*10 m, gaussian clusters,
a square grid of spacing 10 m (cocircular quadruples everywhere), a square
grid jittered by 1e-6 m, a square grid rotated by 30 degrees (nearly
cocircular after rounding), rings of sites on regular polygons (nearly
cocircular too), and a triangular lattice of spacing 10 m. Points
are written out with full precision (repr of float64 round-trips exactly).

Usage: ref_persistence.py [--seed S] [--out FILE] [--small]
  --seed S   seed of the random layouts (default 20240611, the committed data)
  --out FILE output path (default persistence_ref.json beside this script)
  --small    only the small layouts (for the live test)
"""

import argparse
import json
import math
import os
import sys

import gudhi
import numpy as np
import scipy
from scipy.sparse.csgraph import minimum_spanning_tree
from scipy.spatial.distance import cdist


def uniform(rng, n):
    side = math.sqrt(n) * 10
    return rng.random((n, 2)) * side


def clustered(rng, n):
    side = math.sqrt(n) * 10
    nc = 1 + int(math.sqrt(n) / 4)
    centres = rng.random((nc, 2)) * side
    lo, hi = math.log(2), math.log(max(2.5, side / 10))
    sd = np.exp(lo + rng.random(nc) * (hi - lo))
    w = np.exp(rng.random(nc) * math.log(100))
    c = rng.choice(nc, size=n, p=w / w.sum())
    return centres[c] + rng.standard_normal((n, 2)) * sd[c][:, None]


def grid(k, spacing=10.0):
    return np.array([[i * spacing, j * spacing] for j in range(k) for i in range(k)], dtype=float)


def tri_lattice(rows, cols, s=10.0):
    # Same formula as TriangularLattice in planar/sitegen/sitegen.go.
    h = s * math.sqrt(3) / 2
    pts = []
    for j in range(rows):
        off = s / 2 if j % 2 == 1 else 0.0
        for i in range(cols):
            pts.append([i * s + off, j * h])
    return np.array(pts, dtype=float)


def rotated(pts, degrees):
    # Rotation about the origin; the rounded coordinates leave each unit
    # square only nearly cocircular.
    a = math.radians(degrees)
    c, s = math.cos(a), math.sin(a)
    return np.array([[c * x - s * y, s * x + c * y] for x, y in pts], dtype=float)


def rings(k):
    # k regular polygons of 5 to 24 sites placed with cos/sin (nearly
    # cocircular after rounding), centres 100 m apart, radii 10 to 33.5 m.
    pts = []
    sizes = [5, 6, 8, 12, 24, 7]
    for i in range(k):
        n = sizes[i % len(sizes)]
        cx, cy = (i % 8) * 100.0 + 0.25 * i, (i // 8) * 100.0 - 0.5 * i
        r = 10 + 0.5 * i
        for j in range(n):
            a = j * 2 * math.pi / n
            pts.append([cx + r * math.cos(a), cy + r * math.sin(a)])
    return np.array(pts, dtype=float)


def case(name, pts, simplices=False, mst=True):
    pts = np.asarray(pts, dtype=float)
    ac = gudhi.AlphaComplex(points=pts, precision='exact')
    st = ac.create_simplex_tree()
    st.compute_persistence()
    h0 = sorted(float(d) for b, d in st.persistence_intervals_in_dimension(0) if math.isfinite(d))
    h1 = sorted([float(b), float(d)] for b, d in st.persistence_intervals_in_dimension(1))
    out = {
        "name": name,
        "points": [[float(x), float(y)] for x, y in pts],
        "h0_death_sq": h0,
        "h1_sq": h1,
    }
    if mst:
        d = cdist(pts, pts)
        t = minimum_spanning_tree(d).tocoo()
        out["mst_lengths"] = sorted(float(v) for v in t.data)
        if len(out["mst_lengths"]) != len(pts) - 1:
            sys.exit(f"{name}: MST has {len(out['mst_lengths'])} edges for {len(pts)} points (duplicates?)")
    if simplices:
        edges, tris = [], []
        for s, f in st.get_filtration():
            # GUDHI vertex i is input point i (no duplicates in these layouts).
            if len(s) == 2:
                edges.append(sorted(s) + [float(f)])
            elif len(s) == 3:
                tris.append(sorted(s) + [float(f)])
        edges.sort()
        tris.sort()
        out["edges_sq"] = edges
        out["triangles_sq"] = tris
    return out


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20240611)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "persistence_ref.json"))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    cases = [
        case("uniform-600", uniform(rng, 600), simplices=True),
        case("clustered-800", clustered(rng, 800)),
        case("grid-20x20", grid(20)),
        case("trilattice-25x30", tri_lattice(25, 30)),
        case("rotated-grid-20x20", rotated(grid(20), 30.0)),
        case("rings-48", rings(48)),
    ]
    if not a.small:
        jit = grid(30) + rng.uniform(-1e-6, 1e-6, size=(900, 2))
        cases += [
            case("uniform-3000", uniform(rng, 3000)),
            case("clustered-2500", clustered(rng, 2500)),
            case("jittered-grid-30x30", jit),
        ]
    doc = {
        "generator": "coverage/testdata/ref_persistence.py",
        "seed": a.seed,
        "gudhi": gudhi.__version__,
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "precision": "exact",
        "cases": cases,
    }
    with open(a.out, "w") as fh:
        json.dump(doc, fh, separators=(",", ":"))
        fh.write("\n")


if __name__ == "__main__":
    main()
