#!/bin/sh
# Makes gdal_sites.gpkg, the GeoPackage written by GDAL that the reader is
# tested on (TestReadGDALFile), from the GeoJSON files beside it, with
# Debian gdal-bin's ogr2ogr (GDAL 3.6.2 made the committed file):
#   sites     points in EPSG:4326, fields String, Integer64, Real, Date, String
#   area      a Polygon and a MultiPolygon, declared MULTIPOLYGON (-nlt)
#   sites_utm the sites projected to EPSG:25832 (ETRS89 / UTM zone 32N)
# Run from this folder: sh make_gdal_gpkg.sh
set -eu
rm -f gdal_sites.gpkg
ogr2ogr -f GPKG gdal_sites.gpkg gdal_sites.geojson -nln sites
ogr2ogr -f GPKG -update gdal_sites.gpkg gdal_area.geojson -nln area -nlt MULTIPOLYGON
ogr2ogr -f GPKG -update gdal_sites.gpkg gdal_sites.geojson -nln sites_utm -t_srs EPSG:25832
