#!/usr/bin/python3
"""Check every polygon sitecover wrote with GEOS.

Usage: ref_valid.py FOLDER...

Walks each folder for *.geojson layers and sitecover.gpkg files and tests
every Polygon and MultiPolygon feature with GEOS's IsValid (Debian
python3-shapely: shapely.geometry.shape(...).is_valid; GeoPackage layers are
read with GDAL's Python bindings, Debian python3-gdal, and handed to shapely
as WKB). Prints one JSON object: {"checked": n, "invalid": [...]}, each
invalid feature as "file layer feature: reason".
"""
import json
import os
import sys

from shapely import wkb
from shapely.geometry import shape
from shapely.validation import explain_validity


def main():
    checked, invalid = 0, []
    for top in sys.argv[1:]:
        for root, _, files in os.walk(top):
            for f in sorted(files):
                p = os.path.join(root, f)
                if f.endswith(".geojson"):
                    with open(p, encoding="utf-8") as fh:
                        doc = json.load(fh)
                    for i, ft in enumerate(doc.get("features", [])):
                        g = ft["geometry"]
                        if g is None or g["type"] not in ("Polygon", "MultiPolygon"):
                            continue
                        checked += 1
                        s = shape(g)
                        if not s.is_valid:
                            invalid.append("%s feature %d: %s" % (p, i, explain_validity(s)))
                elif f.endswith(".gpkg"):
                    from osgeo import ogr
                    ds = ogr.Open(p)
                    for li in range(ds.GetLayerCount()):
                        layer = ds.GetLayer(li)
                        for ft in layer:
                            g = ft.GetGeometryRef()
                            if g is None or "POLYGON" not in g.GetGeometryName():
                                continue
                            checked += 1
                            s = wkb.loads(bytes(g.ExportToWkb()))
                            if not s.is_valid:
                                invalid.append("%s layer %s fid %d: %s" % (p, layer.GetName(), ft.GetFID(), explain_validity(s)))
    print(json.dumps({"checked": checked, "invalid": invalid}))


if __name__ == "__main__":
    main()
