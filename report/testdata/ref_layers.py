#!/usr/bin/python3
"""Reference figures for the report's GeoJSON layers, from PROJ and GEOS.

Run with the Debian python (python3-shapely, proj-bin):

  /usr/bin/python3 report/testdata/ref_layers.py make
      writes report/testdata/ref_layers.json: a small campus given in WGS84
      (four sites, an area with one exclusion zone, a range) and, for it,
      the uncovered area and the area of every gap computed independently:
      the inputs are projected by PROJ (cs2cs, transverse Mercator on WGS84
      centred on the data's lon/lat box, k0 = 1: the same plane as
      planar.NewLocalPlane), the disks are GEOS buffers with 1024 segments
      per quarter circle, and the gaps are the components of
      area − union(disks).

  /usr/bin/python3 report/testdata/ref_layers.py live SCENE.json LAYERDIR
      reads a scene in the same format, prints the same figures as JSON,
      and checks the layers written in LAYERDIR (gaps.geojson,
      service-areas.geojson) with GEOS: every polygon valid, exterior rings
      counter-clockwise and holes clockwise in lon/lat, at most 7 decimals.

A scene: {"sites": [[lon, lat], ...], "area": [exterior, hole, ...] with
rings as [[lon, lat], ...], "range_m": r}.
"""
import json
import os
import subprocess
import sys

from shapely.geometry import Point, Polygon, shape
from shapely.ops import unary_union

QUAD_SEGS = 1024


def lonlat_box(points):
    lons = [p[0] for p in points]
    lats = [p[1] for p in points]
    return min(lons), min(lats), max(lons), max(lats)


def project(points, lon0, lat0):
    """Transverse Mercator on WGS84 (PROJ cs2cs), k0 = 1, no false origin."""
    text = "".join("%.12f %.12f\n" % (p[0], p[1]) for p in points)
    out = subprocess.run(
        ["cs2cs", "+proj=longlat", "+ellps=WGS84", "+to", "+proj=tmerc",
         "+lat_0=%.12f" % lat0, "+lon_0=%.12f" % lon0, "+k=1", "+x_0=0",
         "+y_0=0", "+ellps=WGS84", "-f", "%.9f"],
        input=text, capture_output=True, text=True, check=True).stdout
    xy = []
    for line in out.strip().splitlines():
        f = line.split()
        xy.append((float(f[0]), float(f[1])))
    return xy


def reference(scene):
    pts = list(scene["sites"])
    for ring in scene["area"]:
        pts += ring
    x0, y0, x1, y1 = lonlat_box(pts)
    lon0, lat0 = (x0 + x1) / 2, (y0 + y1) / 2
    sites = project(scene["sites"], lon0, lat0)
    rings = [project(r, lon0, lat0) for r in scene["area"]]
    area = Polygon(rings[0], rings[1:])
    r = scene["range_m"]
    disks = unary_union([Point(p).buffer(r, resolution=QUAD_SEGS) for p in sites])
    gaps = area.difference(disks)
    parts = list(getattr(gaps, "geoms", [gaps])) if not gaps.is_empty else []
    areas = sorted((g.area for g in parts if g.area > 0), reverse=True)
    return {
        "lon0": lon0, "lat0": lat0,
        "area_m2": area.area,
        "uncovered_m2": gaps.area,
        "gap_areas_m2": areas,
    }


def decimals(coords):
    """Largest number of decimals of the shortest round-trip form of any
    coordinate (Python repr, like Go's strconv 'f', -1)."""
    if isinstance(coords, (int, float)):
        s = repr(float(coords))
        if "e" in s or "E" in s:
            mant, exp = s.lower().split("e")
            d = len(mant.split(".")[1]) if "." in mant else 0
            return max(0, d - int(exp))
        d = s.split(".")[1] if "." in s else ""
        return 0 if d == "0" else len(d)
    return max((decimals(c) for c in coords), default=0)


def check_layers(layerdir):
    problems = []
    worst = 0
    for name in ("gaps.geojson", "service-areas.geojson"):
        path = os.path.join(layerdir, name)
        with open(path) as f:
            text = f.read()
        doc = json.loads(text)
        if "crs" in doc:
            problems.append("%s: crs member" % name)
        for i, feat in enumerate(doc["features"]):
            worst = max(worst, decimals(feat["geometry"]["coordinates"]))
            geom = shape(feat["geometry"])
            if not geom.is_valid:
                problems.append("%s feature %d: invalid geometry" % (name, i))
            for k, poly in enumerate(getattr(geom, "geoms", [geom])):
                if not poly.exterior.is_ccw:
                    problems.append("%s feature %d polygon %d: exterior not counter-clockwise" % (name, i, k))
                for h, hole in enumerate(poly.interiors):
                    if hole.is_ccw:
                        problems.append("%s feature %d polygon %d hole %d: not clockwise" % (name, i, k, h))
    return problems, worst


def fixed_scene():
    lon0, lat0 = 8.54, 47.37
    dlon, dlat = 0.004, 0.003
    sites = [[lon0 + 0.2 * dlon, lat0 + 0.3 * dlat], [lon0 + 0.75 * dlon, lat0 + 0.2 * dlat],
             [lon0 + 0.5 * dlon, lat0 + 0.8 * dlat], [lon0 + 0.1 * dlon, lat0 + 0.9 * dlat]]
    outer = [[lon0, lat0], [lon0 + dlon, lat0], [lon0 + dlon, lat0 + dlat], [lon0, lat0 + dlat]]
    zone = [[lon0 + 0.4 * dlon, lat0 + 0.4 * dlat], [lon0 + 0.4 * dlon, lat0 + 0.6 * dlat],
            [lon0 + 0.6 * dlon, lat0 + 0.6 * dlat], [lon0 + 0.6 * dlon, lat0 + 0.4 * dlat]]
    return {"sites": sites, "area": [outer, zone], "range_m": 70.0}


def main():
    if len(sys.argv) >= 2 and sys.argv[1] == "make":
        scene = fixed_scene()
        out = {"source": "report/testdata/ref_layers.py (PROJ cs2cs + GEOS via shapely %s)" % __import__("shapely").__version__,
               "scene": scene, "reference": reference(scene)}
        path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "ref_layers.json")
        with open(path, "w") as f:
            json.dump(out, f, indent=1)
            f.write("\n")
        return
    if len(sys.argv) == 4 and sys.argv[1] == "live":
        with open(sys.argv[2]) as f:
            scene = json.load(f)
        ref = reference(scene)
        ref["problems"], ref["max_decimals"] = check_layers(sys.argv[3])
        json.dump(ref, sys.stdout)
        return
    sys.exit("usage: ref_layers.py make | live SCENE.json LAYERDIR")


if __name__ == "__main__":
    main()
