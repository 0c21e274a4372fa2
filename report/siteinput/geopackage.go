// GeoPackage inputs (OGC 12-128): a .gpkg given for the sites, the area or
// another input is read through package gpkg and handed on as the GeoJSON
// FeatureCollection of its one suitable layer, so every later check and
// message is the GeoJSON path's. The layer's coordinate system travels as
// a legacy "crs" member (EPSG:n), which the projected-grid reader
// (crs.go) accepts or refuses; EPSG:4326 needs none.
//
// The layer is chosen by the input's role: point layers for sites and
// candidate spots, polygon layers for the area and exclusions, point or
// polygon layers for demand and context. A file with no such layer, or
// with several, is refused, naming its layers. A layer in the undefined
// Cartesian system (local metres) is read only with --planar, and with
// --planar a WGS84 layer meets the degrees-in-planar refusal, so the
// coordinates are never read in the wrong system.

package siteinput

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"github.com/paulmach/orb/geojson"
	"github.com/sitecover/sitecover/report/gpkg"
)

// sqliteMagic starts every SQLite database file, so every GeoPackage.
var sqliteMagic = []byte("SQLite format 3\x00")

// isGeoPackage reports whether the regular file f starts like a
// GeoPackage; it leaves f at its start.
func isGeoPackage(f *os.File) bool {
	head := make([]byte, len(sqliteMagic))
	n, _ := io.ReadFull(f, head)
	f.Seek(0, io.SeekStart)
	return n == len(head) && bytes.Equal(head, sqliteMagic)
}

// layerKinds returns the geometry types a layer may have for the input
// given to flag, and their name in messages.
func layerKinds(flag string) ([]gpkg.GeometryType, string) {
	points := []gpkg.GeometryType{gpkg.Point, gpkg.MultiPoint}
	polys := []gpkg.GeometryType{gpkg.Polygon, gpkg.MultiPolygon}
	switch flag {
	case "--sites", "--candidates":
		return points, "point"
	case "--area", "--exclude":
		return polys, "polygon"
	}
	return append(points, polys...), "point or polygon"
}

// geoPackageAsGeoJSON reads the one layer of the GeoPackage at path that
// suits flag and returns it as a GeoJSON FeatureCollection, with the
// layer's name when its coordinates are local (undefined Cartesian).
func geoPackageAsGeoJSON(path, flag string) (doc []byte, localLayer string, err error) {
	r, err := gpkg.Open(path)
	if err != nil {
		return nil, "", errorf("%s: not a readable GeoPackage: %v", path, gpkgMessage(err, path))
	}
	defer r.Close()
	layers, err := r.Layers()
	if err != nil {
		return nil, "", errorf("%s: %v", path, gpkgMessage(err, path))
	}
	kinds, what := layerKinds(flag)
	var use []gpkg.LayerInfo
	var all []string
	for _, l := range layers {
		all = append(all, fmt.Sprintf("%s (%s)", l.Name, strings.ToLower(string(l.Geometry))))
		for _, k := range kinds {
			if l.Geometry == k {
				use = append(use, l)
			}
		}
	}
	switch {
	case len(use) == 0:
		return nil, "", errorf("%s: no %s layer for %s (layers: %s)", path, what, flag, orNone(all))
	case len(use) > 1:
		var names []string
		for _, l := range use {
			names = append(names, l.Name)
		}
		return nil, "", errorf("%s: %d %s layers (%s): keep the one for %s in its own GeoPackage or GeoJSON file", path, len(use), what, strings.Join(names, ", "), flag)
	}
	l := use[0]
	b, err := layerGeoJSON(r, l)
	if err != nil {
		return nil, "", errorf("%s: %v", path, gpkgMessage(err, path))
	}
	if s := l.SRS; strings.EqualFold(s.Organization, "EPSG") && s.OrgCoordsysID != 4326 {
		crs := fmt.Sprintf(`{"crs":{"type":"name","properties":{"name":"EPSG:%d"}},`, s.OrgCoordsysID)
		b = append([]byte(crs), b[1:]...)
	}
	if l.SRS.ID == gpkg.UndefinedCartesian.ID {
		return b, l.Name, nil
	}
	return b, "", nil
}

// layerGeoJSON reads layer l as a GeoJSON FeatureCollection: each feature
// with a geometry, its FID as the Feature's id and its attributes as
// properties in the layer's column order (the sites' attributes keep it,
// attributes.go). A REAL value that is whole is written with a decimal
// point, so the column stays real when typed from the JSON; a value that
// is not finite is null.
func layerGeoJSON(r *gpkg.Reader, l gpkg.LayerInfo) ([]byte, error) {
	b := []byte(`{"type":"FeatureCollection","features":[`)
	n := 0
	err := r.ReadLayer(l.Name, func(f gpkg.Feature) error {
		if f.Geometry == nil {
			return nil
		}
		g, err := json.Marshal(geojson.NewGeometry(f.Geometry))
		if err != nil {
			return fmt.Errorf("layer %s feature %d: %v", l.Name, f.FID, err)
		}
		if n > 0 {
			b = append(b, ',')
		}
		n++
		b = append(b, `{"type":"Feature","id":`...)
		b = strconv.AppendInt(b, f.FID, 10)
		b = append(b, `,"geometry":`...)
		b = append(b, g...)
		b = append(b, `,"properties":{`...)
		for k, fld := range l.Fields {
			if k > 0 {
				b = append(b, ',')
			}
			key, _ := json.Marshal(fld.Name)
			b = append(b, key...)
			b = append(b, ':')
			b = appendGpkgValue(b, f.Properties[fld.Name])
		}
		b = append(b, "}}"...)
		return nil
	})
	return append(b, "]}"...), err
}

// appendGpkgValue appends one attribute value as JSON (see layerGeoJSON).
func appendGpkgValue(b []byte, v any) []byte {
	if f, ok := v.(float64); ok {
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return append(b, "null"...)
		}
		n := len(b)
		b = strconv.AppendFloat(b, f, 'g', -1, 64)
		if !bytes.ContainsAny(b[n:], ".e") {
			b = append(b, ".0"...)
		}
		return b
	}
	j, err := json.Marshal(v)
	if err != nil {
		return append(b, "null"...)
	}
	return append(b, j...)
}

// gpkgMessage drops the file name package gpkg puts in front of its
// messages (the caller names the file).
func gpkgMessage(err error, path string) string {
	return strings.TrimPrefix(strings.TrimPrefix(err.Error(), path), ": ")
}

// orNone joins names, or says none.
func orNone(names []string) string {
	if len(names) == 0 {
		return "none"
	}
	return strings.Join(names, ", ")
}
