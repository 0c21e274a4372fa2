// Package gpkg writes and reads OGC GeoPackage files (OGC 12-128, the
// GeoPackage Encoding Standard, version 1.3: user_version 10300, the newest
// version GDAL 3.6 writes and reads without a "partially supported"
// warning) holding vector feature layers, in pure Go on the
// modernc.org/sqlite driver (no cgo).
//
// What is implemented, by clause of the standard:
//   - the SQLite container (clause 1.1.1): application_id 0x47504B47
//     ("GPKG") and user_version 10300;
//   - gpkg_spatial_ref_sys with its three required rows (srs_id 4326 = EPSG
//     WGS 84 lon/lat, -1 = undefined Cartesian, 0 = undefined geographic)
//     and any further coordinate reference system the caller defines
//     (clause 1.1.2);
//   - gpkg_contents with each layer's bounding box (clause 1.1.3);
//   - feature tables with an INTEGER PRIMARY KEY "fid", one geometry
//     column "geom" registered in gpkg_geometry_columns, and TEXT, INTEGER,
//     REAL, BOOLEAN, DATE and DATETIME attribute columns (clause 2.1);
//   - geometries as GeoPackageBinary blobs: the "GP" header with version 0,
//     a flags byte, the srs_id and an envelope [minx, maxx, miny, maxy]
//     (omitted for points, whose envelope is the point itself), followed by
//     ISO WKB, little-endian, 2-D (clause 2.1.3);
//   - optionally the R-tree spatial index extension (gpkg_rtree_index,
//     Annex F.3), packed by Sort-Tile-Recursive and written at Close; its
//     triggers, which call the ST_ functions a GeoPackage reader supplies,
//     are created after the last feature so that writing needs no such
//     functions.
//
// The writer streams: each feature is one prepared INSERT inside a single
// transaction, so memory does not grow with the number of features (an
// indexed layer keeps 24 bytes a feature for its R-tree until Close). The
// reader lists the feature layers, reports each layer's coordinate
// reference system (so a caller can refuse what it cannot project) and
// decodes the features into orb geometries and attribute maps; every error
// names the file, the layer and the feature id.
package gpkg
