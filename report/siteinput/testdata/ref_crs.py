#!/usr/bin/python3
"""Reference values for report/siteinput/crs.go.

For every supported projected EPSG code, PROJ's own definition
(`projinfo -o PROJ -q EPSG:n`, from PROJ's EPSG database) is run with
`cs2cs` (Debian proj-bin) on random points of the grid's area:

  forward  lon, lat -> E, N   (cs2cs -f %.6f: micrometre output)
  inverse  E, N -> lon, lat   (cs2cs -f %.12f) of the forward output

The geographic side is the grid's own ellipsoid (+proj=longlat +ellps=...),
so the values test the projection alone, not a datum shift (PROJ's shift
between these GRS80 datums and WGS 84 is a null transformation).
The output is JSON checked by crs_test.go to 1 mm.

Usage: /usr/bin/python3 ref_crs.py [--seed N] [--points K] [--out FILE]
"""

import argparse
import os
import random
import re
import subprocess

import refjson  # this folder

DEFAULT_SEED = 32632  # fixed seed for the committed data
HERE = os.path.dirname(os.path.abspath(__file__))

# Code -> (lon range, lat range) of random test points: the grid's area of
# use, roughly (UTM: 3 degrees either side of the central meridian).
NATIONAL = {
    4647: ((6, 12), (47, 56)),
    5650: ((12, 18), (47, 56)),
    3006: ((10, 24.5), (55, 69)),
    3067: ((19, 32), (59, 70)),
    2193: ((166, 179), (-47.5, -34)),
    2180: ((14, 24.2), (49, 55)),
    3763: ((-9.6, -6.1), (36.9, 42.2)),
}


def codes():
    out = []
    for z in range(1, 61):
        lon0 = 6 * z - 183
        out.append((32600 + z, (lon0 - 3, lon0 + 3), (0, 84)))
        out.append((32700 + z, (lon0 - 3, lon0 + 3), (-80, 0)))
    for z in range(28, 39):
        lon0 = 6 * z - 183
        out.append((25800 + z, (lon0 - 3, lon0 + 3), (34, 72)))
    for c, (lo, la) in NATIONAL.items():
        out.append((c, lo, la))
    return out


def run(cmd, text):
    return subprocess.run(cmd, input=text, capture_output=True, text=True, check=True).stdout


def proj_def(code):
    s = run(["projinfo", "-o", "PROJ", "-q", "EPSG:%d" % code], "").strip().splitlines()[-1]
    s = re.sub(r"\+towgs84=\S+\s*", "", s).replace("+type=crs", "").strip()
    s = s.replace("+datum=WGS84", "+ellps=WGS84")
    ellps = re.search(r"\+ellps=(\S+)", s).group(1)
    return s, "+proj=longlat +ellps=%s +no_defs" % ellps


def cs2cs(src, dst, pts, fmt):
    text = "".join("%.15f %.15f\n" % p for p in pts)
    out = run(["cs2cs", "-f", fmt] + src.split() + ["+to"] + dst.split(), text)
    res = [tuple(float(v) for v in line.split()[:2]) for line in out.splitlines()]
    if len(res) != len(pts):
        raise SystemExit("cs2cs returned %d lines for %d points" % (len(res), len(pts)))
    return res


def wrap(lon):
    return (lon + 180.0) % 360.0 - 180.0


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--seed", type=int, default=DEFAULT_SEED)
    ap.add_argument("--points", type=int, default=3)
    ap.add_argument("--out", default=os.path.join(HERE, "crs_ref.json"))
    opt = ap.parse_args()
    rng = random.Random(opt.seed)
    data = {"generator": "report/siteinput/testdata/ref_crs.py", "seed": opt.seed,
            "proj": refjson.tool_version(["cs2cs"]), "codes": []}
    for code, (lo0, lo1), (la0, la1) in codes():
        proj, geo = proj_def(code)
        pts = [(wrap(rng.uniform(lo0, lo1)), rng.uniform(la0, la1)) for _ in range(opt.points)]
        en = cs2cs(geo, proj, pts, "%.6f")
        ll = cs2cs(proj, geo, en, "%.12f")
        data["codes"].append({"code": code, "proj": proj,
                              "forward": [[p[0], p[1], q[0], q[1]] for p, q in zip(pts, en)],
                              "inverse": [[q[0], q[1], r[0], r[1]] for q, r in zip(en, ll)]})
    refjson.write(data, opt.out)


if __name__ == "__main__":
    main()
