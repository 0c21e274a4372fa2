#!/usr/bin/python3
"""Reference persistence of the weighted alpha filtration (devices with
their own ranges), for coverage tests.

For several layouts of devices with ranges drawn from the mix 40/60/120/150
m, computes with GUDHI (Debian python3-gudhi 3.7.1):
gudhi.AlphaComplex(points, weights=[r_i^2], precision='exact')
.create_simplex_tree(), compute_persistence(),
persistence_intervals_in_dimension(0/1). Filtration values are POWERS t
(the disks have radius sqrt(r_i^2 + t)); vertices enter at -r_i^2. Points
whose power cell is empty (hidden) are not vertices of the complex and are
listed under "hidden". compute_persistence() with its default
min_persistence=0 keeps only pairs with death > birth; the infinite H0 bars
are dropped.

Layouts: uniform in a square of side sqrt(n)*100 m (about one device per
100 m x 100 m), gaussian clusters, a triangular lattice of spacing 100 m, a
square grid of spacing 100 m (many exact degeneracies with equal ranges
among neighbours), and a dense uniform layout (spacing 30 m, many hidden
devices). Points are written with full precision.

Usage: ref_weighted_persistence.py [--seed S] [--out FILE] [--small]
  --seed S   seed (default 20261203, the committed data)
  --out FILE output path (default weighted_persistence_ref.json beside this
             script)
  --small    only the small layouts (for the live test)
"""

import argparse
import json
import math
import os

import gudhi
import numpy as np

MIX = [40.0, 60.0, 120.0, 150.0]


def uniform(rng, n, spacing=100.0):
    side = math.sqrt(n) * spacing
    return rng.random((n, 2)) * side


def clustered(rng, n):
    side = math.sqrt(n) * 100.0
    nc = 1 + int(math.sqrt(n) / 4)
    centres = rng.random((nc, 2)) * side
    sd = 50.0 + rng.random(nc) * 200.0
    c = rng.integers(0, nc, size=n)
    return centres[c] + rng.standard_normal((n, 2)) * sd[c][:, None]


def tri_lattice(rows, cols, s=100.0):
    h = s * math.sqrt(3) / 2
    return np.array([[i * s + (s / 2 if j % 2 else 0.0), j * h] for j in range(rows) for i in range(cols)], dtype=float)


def grid(k, s=100.0):
    return np.array([[i * s, j * s] for j in range(k) for i in range(k)], dtype=float)


def case(name, rng, pts):
    pts = np.asarray(pts, dtype=float)
    ranges = rng.choice(MIX, size=len(pts))
    ac = gudhi.AlphaComplex(points=pts, weights=[float(r * r) for r in ranges], precision='exact')
    st = ac.create_simplex_tree()
    st.compute_persistence()
    h0 = sorted([float(b), float(d)] for b, d in st.persistence_intervals_in_dimension(0) if math.isfinite(d))
    h1 = sorted([float(b), float(d)] for b, d in st.persistence_intervals_in_dimension(1))
    present = set()
    for s, _ in st.get_skeleton(0):
        present.add(s[0])
    hidden = [i for i in range(len(pts)) if i not in present]
    return {
        "name": name,
        "points": [[float(x), float(y)] for x, y in pts],
        "ranges": [float(r) for r in ranges],
        "h0": h0,
        "h1": h1,
        "hidden": hidden,
    }


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "weighted_persistence_ref.json"))
    ap.add_argument("--small", action="store_true")
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    cases = [
        case("uniform-400", rng, uniform(rng, 400)),
        case("clustered-500", rng, clustered(rng, 500)),
        case("trilattice-15x15", rng, tri_lattice(15, 15)),
        case("grid-15x15", rng, grid(15)),
        case("dense-300", rng, uniform(rng, 300, 30.0)),
    ]
    if not a.small:
        cases += [
            case("uniform-3000", rng, uniform(rng, 3000)),
            case("clustered-2000", rng, clustered(rng, 2000)),
        ]
    doc = {
        "generator": "coverage/testdata/ref_weighted_persistence.py",
        "seed": a.seed,
        "gudhi": gudhi.__version__,
        "numpy": np.__version__,
        "precision": "exact",
        "cases": cases,
    }
    with open(a.out, "w") as fh:
        json.dump(doc, fh, separators=(",", ":"))
        fh.write("\n")


if __name__ == "__main__":
    main()
