// The GeoPackage tables this package writes, as SQL, and the coordinate
// reference systems every GeoPackage carries.
//
// The table definitions are those of OGC 12-128 (GeoPackage 1.3), Annex C
// (C.1 gpkg_spatial_ref_sys, C.2 gpkg_contents, C.4 gpkg_geometry_columns,
// C.8 gpkg_extensions), column for column, since readers check the column
// names, types, NOT NULL flags and defaults. The R-tree index and its
// triggers follow Annex F.3 (extension gpkg_rtree_index) in the form GDAL
// 3.6 writes for 1.3 files (triggers insert, update1-update4, delete).

package gpkg

import (
	"fmt"
	"strings"
)

// Version numbers written to the SQLite header (clause 1.1.1.1).
const (
	// ApplicationID is the SQLite application_id of a GeoPackage, "GPKG"
	// in ASCII (Requirement 2).
	ApplicationID = 0x47504B47
	// UserVersion is the SQLite user_version written: 10300 for GeoPackage
	// 1.3 (major, two-digit minor, two-digit patch; Requirement 2).
	UserVersion = 10300
)

const (
	// GeometryColumn is the name of the geometry column of every layer
	// this package writes.
	GeometryColumn = "geom"
	// FIDColumn is the name of the INTEGER PRIMARY KEY column of every
	// layer this package writes.
	FIDColumn = "fid"
)

// SRS is one row of gpkg_spatial_ref_sys: a coordinate reference system.
type SRS struct {
	ID            int32  // srs_id, the key layers refer to
	Name          string // srs_name
	Organization  string // organization, e.g. "EPSG" or "NONE"
	OrgCoordsysID int32  // organization_coordsys_id, e.g. 4326
	Definition    string // WKT (OGC 01-009) or "undefined"
	Description   string // description
}

// WGS84 is EPSG:4326, longitude/latitude in degrees on WGS 84; a
// GeoPackage stores x = longitude, y = latitude whatever the EPSG axis
// order. The row is the one GDAL writes (checked against the file
// `ogr2ogr -f GPKG` made from testdata/gdal_sites.geojson).
var WGS84 = SRS{
	ID: 4326, Name: "WGS 84 geodetic", Organization: "EPSG", OrgCoordsysID: 4326,
	Definition:  `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AXIS["Latitude",NORTH],AXIS["Longitude",EAST],AUTHORITY["EPSG","4326"]]`,
	Description: "longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid",
}

// UndefinedCartesian is srs_id -1, the undefined Cartesian system the
// standard reserves for plane coordinates of no stated system; sitecover's
// local-plane metres use it.
var UndefinedCartesian = SRS{
	ID: -1, Name: "Undefined Cartesian SRS", Organization: "NONE", OrgCoordsysID: -1,
	Definition: "undefined", Description: "undefined Cartesian coordinate reference system",
}

// UndefinedGeographic is srs_id 0, the undefined geographic system.
var UndefinedGeographic = SRS{
	ID: 0, Name: "Undefined geographic SRS", Organization: "NONE", OrgCoordsysID: 0,
	Definition: "undefined", Description: "undefined geographic coordinate reference system",
}

// IsWGS84 reports whether s is EPSG:4326 (by organization and code, not by
// srs_id, which a file may number as it likes).
func (s SRS) IsWGS84() bool {
	return strings.EqualFold(s.Organization, "EPSG") && s.OrgCoordsysID == 4326
}

// String names s for messages, e.g. `srs_id 25832 (EPSG:25832 "ETRS89 /
// UTM zone 32N")`.
func (s SRS) String() string {
	return fmt.Sprintf("srs_id %d (%s:%d %q)", s.ID, s.Organization, s.OrgCoordsysID, s.Name)
}

// requiredSRS are the rows Requirement 11 asks of every GeoPackage.
var requiredSRS = []SRS{UndefinedCartesian, UndefinedGeographic, WGS84}

// baseSchema creates the tables every file this package writes has.
const baseSchema = `
CREATE TABLE gpkg_spatial_ref_sys (
  srs_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL PRIMARY KEY,
  organization TEXT NOT NULL,
  organization_coordsys_id INTEGER NOT NULL,
  definition  TEXT NOT NULL,
  description TEXT
);
CREATE TABLE gpkg_contents (
  table_name TEXT NOT NULL PRIMARY KEY,
  data_type TEXT NOT NULL,
  identifier TEXT UNIQUE,
  description TEXT DEFAULT '',
  last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
  min_x DOUBLE,
  min_y DOUBLE,
  max_x DOUBLE,
  max_y DOUBLE,
  srs_id INTEGER,
  CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id)
);
CREATE TABLE gpkg_geometry_columns (
  table_name TEXT NOT NULL,
  column_name TEXT NOT NULL,
  geometry_type_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL,
  z TINYINT NOT NULL,
  m TINYINT NOT NULL,
  CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name),
  CONSTRAINT uk_gc_table_name UNIQUE (table_name),
  CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
  CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id)
);
`

// extensionsSchema creates gpkg_extensions (Annex C.8), written only when
// a layer has an R-tree index.
const extensionsSchema = `
CREATE TABLE gpkg_extensions (
  table_name TEXT,
  column_name TEXT,
  extension_name TEXT NOT NULL,
  definition TEXT NOT NULL,
  scope TEXT NOT NULL,
  CONSTRAINT ge_tce UNIQUE (table_name, column_name, extension_name)
);
`

// rtreeExtensionDefinition is the definition column of the
// gpkg_rtree_index row in gpkg_extensions (the address of Annex F.3).
const rtreeExtensionDefinition = "http://www.geopackage.org/spec120/#extension_rtree"

// quoteIdent quotes an SQL identifier.
func quoteIdent(s string) string {
	return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
}

// rtreeName is the name Annex F.3 gives the index of table t.
func rtreeName(t string) string { return "rtree_" + t + "_" + GeometryColumn }

// rtreeTriggers returns the six triggers of Annex F.3 that keep the index
// of table t up to date when the table is edited later (by a GIS, which
// supplies the ST_ functions they call).
func rtreeTriggers(t string) []string {
	tq, rq, g, i := quoteIdent(t), quoteIdent(rtreeName(t)), quoteIdent(GeometryColumn), quoteIdent(FIDColumn)
	trig := func(suffix string) string { return quoteIdent(rtreeName(t) + "_" + suffix) }
	bounds := fmt.Sprintf("ST_MinX(NEW.%[1]s), ST_MaxX(NEW.%[1]s), ST_MinY(NEW.%[1]s), ST_MaxY(NEW.%[1]s)", g)
	return []string{
		fmt.Sprintf(`CREATE TRIGGER %s AFTER INSERT ON %s WHEN (new.%s NOT NULL AND NOT ST_IsEmpty(NEW.%s)) BEGIN INSERT OR REPLACE INTO %s VALUES (NEW.%s, %s); END`,
			trig("insert"), tq, g, g, rq, i, bounds),
		fmt.Sprintf(`CREATE TRIGGER %s AFTER UPDATE OF %s ON %s WHEN OLD.%s = NEW.%s AND (NEW.%s NOTNULL AND NOT ST_IsEmpty(NEW.%s)) BEGIN INSERT OR REPLACE INTO %s VALUES (NEW.%s, %s); END`,
			trig("update1"), g, tq, i, i, g, g, rq, i, bounds),
		fmt.Sprintf(`CREATE TRIGGER %s AFTER UPDATE OF %s ON %s WHEN OLD.%s = NEW.%s AND (NEW.%s ISNULL OR ST_IsEmpty(NEW.%s)) BEGIN DELETE FROM %s WHERE id = OLD.%s; END`,
			trig("update2"), g, tq, i, i, g, g, rq, i),
		fmt.Sprintf(`CREATE TRIGGER %s AFTER UPDATE ON %s WHEN OLD.%s != NEW.%s AND (NEW.%s NOTNULL AND NOT ST_IsEmpty(NEW.%s)) BEGIN DELETE FROM %s WHERE id = OLD.%s; INSERT OR REPLACE INTO %s VALUES (NEW.%s, %s); END`,
			trig("update3"), tq, i, i, g, g, rq, i, rq, i, bounds),
		fmt.Sprintf(`CREATE TRIGGER %s AFTER UPDATE ON %s WHEN OLD.%s != NEW.%s AND (NEW.%s ISNULL OR ST_IsEmpty(NEW.%s)) BEGIN DELETE FROM %s WHERE id IN (OLD.%s, NEW.%s); END`,
			trig("update4"), tq, i, i, g, g, rq, i, i),
		fmt.Sprintf(`CREATE TRIGGER %s AFTER DELETE ON %s WHEN old.%s NOT NULL BEGIN DELETE FROM %s WHERE id = OLD.%s; END`,
			trig("delete"), tq, g, rq, i),
	}
}
