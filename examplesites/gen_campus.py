#!/usr/bin/python3
"""Generate the invented Quillmere Science Park demo campus and its reference figures.

Run with the Debian interpreter (python3-shapely, python3-scipy, python3-gudhi,
proj-bin and geographiclib-tools installed):

    /usr/bin/python3 examplesites/gen_campus.py

Everything here is invented: the park, its buildings, pond, quarry and sensor
names do not exist. The campus is designed in local metres (x east, y north)
and placed at an arbitrary point in open country, 44.3771 N 99.8623 W, by the
inverse of a transverse Mercator projection centred there (PROJ `invproj`,
WGS84 ellipsoid, scale 1 on the central meridian). Coordinates are written to
7 decimals (about 1 cm), as RFC 7946 suggests.

Besides the data files, the script writes campus-reference.json with figures
computed OUTSIDE sitecover, for the command's tests:
  - area_m2_geodesic: the geodesic area of the campus less pond and quarry,
    by GeographicLib `Planimeter` on the written lon/lat vertices;
  - everything else (area in the plane, full-cover range, uncovered area,
    gaps, percentiles, holes) by cmd/sitecover/testdata/ref_scene.py with
    GEOS (shapely) and GUDHI; its header states the methods and tolerances.
"""

import json
import math
import os
import subprocess
import sys

from shapely.geometry import Polygon

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "cmd", "sitecover", "testdata"))
from ref_scene import reference  # noqa: E402  (GEOS/GUDHI reference figures)
LAT0, LON0 = 44.3771, -99.8623
TMERC = ["+proj=tmerc", "+lat_0=%r" % LAT0, "+lon_0=%r" % LON0, "+ellps=WGS84", "+k_0=1"]
PLANNED_RANGE = 120.0

# Campus boundary, counter-clockwise, metres. The north-east notch is a
# neighbouring farm that is not part of the park, so the outline is not convex.
BOUNDARY = [(-550, -380), (120, -400), (560, -330), (580, 60), (330, 90),
            (300, 400), (-80, 420), (-420, 380), (-560, 120), (-600, -150)]


def ellipse(cx, cy, a, b, theta_deg, n=18):
    t = math.radians(theta_deg)
    out = []
    for k in range(n):
        u = 2 * math.pi * k / n
        ex, ey = a * math.cos(u), b * math.sin(u)
        out.append((round(cx + ex * math.cos(t) - ey * math.sin(t), 1),
                    round(cy + ex * math.sin(t) + ey * math.cos(t), 1)))
    return out


POND = ellipse(-250, 150, 75, 45, 20)
QUARRY = [(180, -130), (300, -120), (350, -190), (330, -270), (240, -300),
          (170, -250), (150, -180)]

BUILDINGS = [
    ("Hollis Hall", (-380, -180)),
    ("Marren Laboratory", (-120, -180)),
    ("Tansley Library", (-20, 60)),
    ("Oakum Workshop", (380, -60)),
    ("Greave Energy Centre", (420, -250)),
    ("North Lodge", (-40, 380)),
    ("Fenwick Annex", (150, 150)),
    ("Calder Residences", (-380, 300)),
    ("Pellow Sports Hall", (200, 320)),
    ("Visitor Centre", (-480, -300)),
    ("Data Hall", (100, -300)),
]

# Forty sensor sites: a jittered triangular pattern of spacing 145 m (seeded
# numpy draw, then fixed here), with one site on the south fence just outside
# the boundary and none in the pond or quarry.
SENSORS = [
    (-418.7, -362.8), (-244.4, -382.4), (-83.8, -338.9), (52.2, -402.1),
    (209.8, -380.5), (-425.1, -251.2), (-288.8, -276.0), (-89.0, -290.0),
    (-37.2, -230.6), (128.0, -228.0), (421.5, -308.4), (-500.0, -124.9),
    (-361.9, -63.4), (-287.4, -125.7), (-56.0, -73.5), (63.7, -145.3),
    (318.1, -138.1), (494.1, -100.8), (-449.7, 14.6), (-299.3, -13.7),
    (-164.1, -50.3), (-45.3, 32.8), (139.6, 48.4), (222.0, 33.1),
    (383.5, 30.4), (499.2, -12.9), (-538.6, 85.0), (-414.0, 193.8),
    (-61.8, 146.4), (39.9, 120.8), (182.9, 211.3), (-440.6, 283.6),
    (-322.2, 264.3), (-147.6, 251.7), (-14.4, 258.9), (121.5, 243.7),
    (288.5, 262.5), (-63.0, 398.2), (26.7, 398.9), (208.9, 398.0),
]


def compass(x, y):
    ns = "north" if y > 150 else "south" if y < -150 else "central"
    ew = "west" if x < -200 else "east" if x > 200 else ""
    if ns == "central":
        return (ew + " " if ew else "") + "central"
    return ns + ("-" + ew if ew else "")


def sensor_name(i, x, y):
    best, bd = None, 1e18
    for name, (bx, by) in BUILDINGS:
        d = math.hypot(bx - x, by - y)
        if d < bd:
            best, bd = name, d
    where = best if bd < 90 else compass(x, y) + " grounds"
    return "Q%02d %s" % (i + 1, where)


def inverse(points):
    """Local metres -> (lon, lat) by PROJ invproj."""
    text = "".join("%.4f %.4f\n" % p for p in points)
    out = subprocess.run(["invproj"] + TMERC + ["-f", "%.12f"], input=text,
                         capture_output=True, text=True, check=True).stdout
    res = []
    for line in out.strip().splitlines():
        lon, lat = line.split()[:2]
        res.append((round(float(lon), 7), round(float(lat), 7)))
    return res


def forward(lonlat):
    text = "".join("%.12f %.12f\n" % p for p in lonlat)
    out = subprocess.run(["proj"] + TMERC + ["-f", "%.6f"], input=text,
                         capture_output=True, text=True, check=True).stdout
    return [tuple(float(v) for v in line.split()[:2]) for line in out.strip().splitlines()]


def ring_lonlat(ring):
    """Closed lon/lat ring, counter-clockwise as RFC 7946 asks."""
    if Polygon(ring).exterior.is_ccw is False:
        ring = ring[::-1]
    ll = inverse(ring)
    return [list(p) for p in ll] + [list(ll[0])]


def planimeter(ring_ll):
    """Geodesic area (m², positive) of a closed lon/lat ring by GeographicLib."""
    text = "".join("%.7f %.7f\n" % (lat, lon) for lon, lat in ring_ll[:-1])
    out = subprocess.run(["Planimeter"], input=text, capture_output=True,
                         text=True, check=True).stdout
    return abs(float(out.split()[2]))


def write_json(name, obj):
    with open(os.path.join(HERE, name), "w") as f:
        json.dump(obj, f, indent=1, ensure_ascii=False)
        f.write("\n")


def main():
    boundary_ll = ring_lonlat(BOUNDARY)
    pond_ll = ring_lonlat(POND)
    quarry_ll = ring_lonlat(QUARRY)
    sensors_ll = inverse(SENSORS)
    buildings_ll = inverse([p for _, p in BUILDINGS])
    names = [sensor_name(i, x, y) for i, (x, y) in enumerate(SENSORS)]

    write_json("campus-area.geojson", {
        "type": "FeatureCollection",
        "features": [
            {"type": "Feature", "properties": {"name": "Quillmere Science Park"},
             "geometry": {"type": "Polygon", "coordinates": [boundary_ll]}},
            {"type": "Feature", "properties": {"name": "Lintmere Pond", "exclude": True},
             "geometry": {"type": "Polygon", "coordinates": [pond_ll]}},
            {"type": "Feature", "properties": {"name": "Old Sandpit Quarry", "exclude": True},
             "geometry": {"type": "Polygon", "coordinates": [quarry_ll]}},
        ]})
    write_json("campus-sensors.geojson", {
        "type": "FeatureCollection",
        "features": [
            {"type": "Feature", "properties": {"id": "Q%02d" % (i + 1), "name": names[i]},
             "geometry": {"type": "Point", "coordinates": list(sensors_ll[i])}}
            for i in range(len(SENSORS))]})
    with open(os.path.join(HERE, "campus-sensors.csv"), "w") as f:
        f.write("id,name,lat,lon\n")
        for i, (lon, lat) in enumerate(sensors_ll):
            f.write("Q%02d,%s,%.7f,%.7f\n" % (i + 1, names[i], lat, lon))
    write_json("campus-buildings.geojson", {
        "type": "FeatureCollection",
        "features": [
            {"type": "Feature", "properties": {"name": BUILDINGS[i][0]},
             "geometry": {"type": "Point", "coordinates": list(buildings_ll[i])}}
            for i in range(len(BUILDINGS))]})

    # Reference figures from the written (rounded) coordinates, re-projected
    # to the same plane so that rounding is included.
    def plane_ring(ll):
        return forward([tuple(p) for p in ll[:-1]])
    area = Polygon(plane_ring(boundary_ll), [plane_ring(pond_ll), plane_ring(quarry_ll)])
    assert area.is_valid
    sites = forward(sensors_ll)
    ref = reference(area, sites, PLANNED_RANGE)
    ref["area_m2_plane"] = ref.pop("area_m2")
    ref["full_cover_worst_lonlat"] = list(inverse([tuple(ref["full_cover_worst_xy"])])[0])
    for g in ref["gaps"]:
        g["deepest_lonlat"] = list(inverse([tuple(g["deepest_xy"])])[0])
    ref["area_m2_geodesic"] = (planimeter(boundary_ll) - planimeter(pond_ll)
                               - planimeter(quarry_ll))
    ref["sites"] = len(sites)
    ref["planned_range_m"] = PLANNED_RANGE
    ref["source"] = ("examplesites/gen_campus.py with " + ref["source"] +
                     ", GeographicLib Planimeter, PROJ invproj/proj")
    write_json("campus-reference.json", ref)
    print(json.dumps({k: v for k, v in ref.items() if k != "gaps"}, indent=1))


if __name__ == "__main__":
    main()
