#!/usr/bin/python3
"""Generate the mixed-range variant of the invented demo campus and its reference figures.

Run with the Debian interpreter (python3-shapely, proj-bin installed):

    /usr/bin/python3 examplesites/gen_mixed.py

The campus, its area and its forty sensors are gen_campus.py's. Here the
sensors are short-range battery sensors (type "sensor", range "80m") and six
invented long-range gateways (type "gateway", range "180m") are mounted on
building roofs. Everything is invented. It writes:

  - campus-mixed-sites.geojson: the 40 sensors then the 6 gateways, each with
    "id", "name", "type" and "range" properties (the range as a string with
    its unit, as the sites file of a planner would hold it);
  - campus-mixed-reference.json: figures computed OUTSIDE sitecover with GEOS
    (shapely), from the written (rounded) coordinates re-projected to the
    same plane as gen_campus.py's reference:
      * uncovered_area_m2: area(A) - area(A n union of disks), each disk an
        inscribed regular polygon of n = 4 QUAD_SEGS sides. Such a polygon of
        radius r misses r^2 (pi - (n/2) sin(2 pi/n)) of its disk (about
        2 pi^3 r^2 / 3n^2); disk_deficit_m2, the sum over all disks, bounds
        how much larger the GEOS uncovered area may be than the true one
        (and it is never smaller);
      * gaps: the number of polygons of A minus the union;
      * hidden: devices whose disk lies inside the union of the other disks
        (disk minus union of others has area below hidden_tol_m2).
"""

import json
import math
import os
import sys

from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
import gen_campus as gc  # noqa: E402

SENSOR_RANGE = 80.0
GATEWAY_RANGE = 180.0
QUAD_SEGS = 1024
HIDDEN_TOL_M2 = 1e-3
GATEWAYS = ["Hollis Hall", "Data Hall", "Tansley Library", "Calder Residences",
            "Oakum Workshop", "Pellow Sports Hall"]


def main():
    buildings = dict(gc.BUILDINGS)
    gw_xy = [buildings[n] for n in GATEWAYS]
    sensors_ll = gc.inverse(gc.SENSORS)
    gateways_ll = gc.inverse(gw_xy)
    names = [gc.sensor_name(i, x, y) for i, (x, y) in enumerate(gc.SENSORS)]
    feats = []
    for i, ll in enumerate(sensors_ll):
        feats.append({"type": "Feature",
                      "properties": {"id": "Q%02d" % (i + 1), "name": names[i], "type": "sensor",
                                     "range": "%gm" % SENSOR_RANGE},
                      "geometry": {"type": "Point", "coordinates": list(ll)}})
    for k, ll in enumerate(gateways_ll):
        feats.append({"type": "Feature",
                      "properties": {"id": "G%d" % (k + 1), "name": "G%d %s gateway" % (k + 1, GATEWAYS[k]),
                                     "type": "gateway", "range": "%gm" % GATEWAY_RANGE},
                      "geometry": {"type": "Point", "coordinates": list(ll)}})
    gc.write_json("campus-mixed-sites.geojson", {"type": "FeatureCollection", "features": feats})

    # The area exactly as gen_campus.py builds it for its reference.
    with open(os.path.join(HERE, "campus-area.geojson")) as f:
        area_doc = json.load(f)
    rings = [gc.forward([tuple(p) for p in ft["geometry"]["coordinates"][0][:-1]])
             for ft in area_doc["features"]]
    area = Polygon(rings[0], rings[1:])
    assert area.is_valid
    sites = gc.forward(sensors_ll + gateways_ll)
    ranges = [SENSOR_RANGE] * len(sensors_ll) + [GATEWAY_RANGE] * len(gateways_ll)
    disks = [Point(p).buffer(r, resolution=QUAD_SEGS) for p, r in zip(sites, ranges)]
    union = unary_union(disks)
    uncovered = area.difference(union)
    parts = list(getattr(uncovered, "geoms", [uncovered])) if not uncovered.is_empty else []
    n = 4 * QUAD_SEGS
    deficit = sum(r * r * (math.pi - n / 2 * math.sin(2 * math.pi / n)) for r in ranges)
    hidden = []
    for i, d in enumerate(disks):
        others = unary_union(disks[:i] + disks[i + 1:])
        if d.difference(others).area < HIDDEN_TOL_M2:
            hidden.append(i)
    ref = {
        "sensor_range_m": SENSOR_RANGE, "gateway_range_m": GATEWAY_RANGE,
        "sites": len(sites), "area_m2_plane": area.area,
        "uncovered_area_m2": uncovered.area, "disk_deficit_m2": deficit,
        "gaps": len(parts), "hidden": hidden, "hidden_tol_m2": HIDDEN_TOL_M2,
        "source": "examplesites/gen_mixed.py with GEOS (shapely %s) buffers of %d segments, PROJ proj/invproj"
                  % (__import__("shapely").__version__, n),
    }
    gc.write_json("campus-mixed-reference.json", ref)
    print(json.dumps(ref, indent=1))


if __name__ == "__main__":
    main()
