#!/usr/bin/python3
"""Generate campus-candidates.geojson: invented mounting spots for the demo campus.

Run with the Debian interpreter (proj-bin installed):

    /usr/bin/python3 examplesites/gen_candidates.py

The spots are where a new sensor could be mounted on the invented Quillmere
Science Park (gen_campus.py): lamp posts, roofs, walls and fence posts. They
are laid out in the campus's local metres (x east, y north) and placed on the
Earth by the same inverse transverse Mercator as the rest of the campus
(PROJ `invproj`, WGS84, centred at 44.3771 N 99.8623 W, scale 1 on the
central meridian), written to 7 decimals. Two spots stand just outside the
boundary (a farm-lane post and a post beyond the south fence): a device
there still serves the area within its reach. All names are invented.
"""

import json
import os
import subprocess

HERE = os.path.dirname(os.path.abspath(__file__))
LAT0, LON0 = 44.3771, -99.8623
TMERC = ["+proj=tmerc", "+lat_0=%r" % LAT0, "+lon_0=%r" % LON0, "+ellps=WGS84", "+k_0=1"]

# (id, name, (x, y) metres)
SPOTS = [
    ("C01", "North Lodge west lamp post", (-200, 360)),
    ("C02", "Calder Residences roof", (-380, 300)),
    ("C03", "Lintmere Pond boathouse wall", (-230, 90)),
    ("C04", "West gate pole", (-560, -260)),
    ("C05", "Data Hall roof", (100, -300)),
    ("C06", "Quarry lookout post", (180, -90)),
    ("C07", "Marren Laboratory roof", (-120, -180)),
    ("C08", "Farm-lane fence post", (340, 112)),
    ("C09", "Greave Energy Centre wall", (420, -250)),
    ("C10", "East car park lamp", (520, -190)),
    ("C11", "Quarry south gate", (290, -320)),
    ("C12", "Pond west bench post", (-330, 100)),
    ("C13", "West hedge pole", (-575, -30)),
    ("C14", "Tansley Library roof", (-20, 60)),
    ("C15", "Oakum Workshop roof", (380, -60)),
    ("C16", "Pellow Sports Hall roof", (200, 320)),
    ("C17", "Fenwick Annex wall", (150, 150)),
    ("C18", "Hollis Hall roof", (-380, -180)),
    ("C19", "Visitor Centre mast", (-480, -300)),
    ("C20", "Main avenue lamp 3", (0, -50)),
    ("C21", "North meadow pole", (100, 380)),
    ("C22", "South fence post", (-100, -400)),
]


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


def main():
    ll = inverse([p for _, _, p in SPOTS])
    doc = {
        "type": "FeatureCollection",
        "features": [
            {"type": "Feature", "properties": {"id": sid, "name": "%s %s" % (sid, name)},
             "geometry": {"type": "Point", "coordinates": list(ll[i])}}
            for i, (sid, name, _) in enumerate(SPOTS)],
    }
    with open(os.path.join(HERE, "campus-candidates.geojson"), "w") as f:
        json.dump(doc, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    main()
