// Package siteinput reads the inputs of a coverage run and puts them in one
// local plane: device sites, the site area with the zones that need no
// coverage, and the planning inputs (candidate mounting spots, demand
// points or polygons with optional weights).
//
// It reads GeoJSON (RFC 7946: FeatureCollection, Feature or a bare
// geometry; GeometryCollections member by member) and CSV (a header line
// naming lat/lon, x/y, Easting/Northing, POINT_X/POINT_Y or a WKT point
// column, delimiter ',', ';' or TAB; csv.go), in UTF-8, Windows-1252 or
// UTF-16 (encoding.go). Geographic input is WGS84 longitude/latitude, or a
// supported projected grid converted to it (EPSG codes, crs.go); it is
// projected onto a local transverse Mercator plane (planar.NewLocalPlane)
// whose scale error over the inputs must stay within
// planar.MaxLocalScaleError, with longitudes unwrapped across the
// antimeridian (antimeridian.go) and area edges densified so that they
// stay straight in longitude/latitude (densify.go); planar input is local
// metres already. Inputs that would give a wrong answer silently (degrees
// read as metres, sliver hulls, areas in other units) are refused
// (sanity.go), and so are far-off or swapped positions, by name
// (outliers.go). Polygons of the area are assembled into one
// planar.Region: holes and exclusion zones become its holes, overlaps are
// refused, and the ring relations are decided exactly (planar.PointInRing,
// planar.SegmentsCross, closed boundary convention).
//
// Every coordinate is checked; only the conversions above alter it. Every
// problem with the data is an *Error whose message names the file and the
// feature, polygon, ring and vertex (0-based) or the line (1-based), so a
// front end can show it as it is.
//
// Load is the entry point: Inputs in, a Scene of plain slices out.
package siteinput
