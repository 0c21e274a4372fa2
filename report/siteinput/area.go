// Loading the site area and the zones that need no coverage.
//
// The area is GeoJSON: Polygon and MultiPolygon features (also inside a
// GeometryCollection). The holes of a polygon are zones that need no
// coverage, and so is every polygon of a feature whose "exclude" property
// is true, and every polygon of the --exclude file. Rings may be given
// closed (RFC 7946) or open, in either orientation (planar.NewRegion drops
// the closing repeat and repeated consecutive vertices, and orients the
// rings). Every vertex is checked (see coordProblem), naming the feature,
// polygon, ring and vertex (all 0-based, as in the file).
//
// Assembling the polygons into one region happens after projection (see
// scene.go), where the exclusion zones become holes of the polygon that
// contains them.

package siteinput

import (
	"encoding/json"
	"fmt"
	"strings"

	"github.com/paulmach/orb"
)

// areaPoly is one input polygon.
type areaPoly struct {
	// Rings are the exterior ring then the holes, as given (closed or
	// open), in input coordinates.
	Rings []orb.Ring
	// Where names it in messages, e.g. "area.geojson feature 2 polygon 1".
	Where string
	// Exclude is true for a zone that needs no coverage.
	Exclude bool
	// Name is the feature's "name" property ("" for none).
	Name string
	// Grid holds the rings in the grid coordinates of CRS when the input
	// was in a projected system (Rings then hold them converted to
	// longitude/latitude); the edges are straight in the grid.
	Grid []orb.Ring
	CRS  *CRS
	// Input holds the rings in the file's own coordinates once Rings have
	// been projected (nil before, and for local-metre input, where Rings
	// are the file's coordinates); messages quote vertices from it.
	Input []orb.Ring
	// Orig holds, once the rings are densified and projected, per ring and
	// vertex the input vertex index that starts its edge (densify.go).
	Orig [][]int32
}

// loadArea reads the polygons of src. With excludeAll every polygon is an
// exclusion zone (the --exclude file).
func loadArea(src Source, planarInput, excludeAll bool) ([]areaPoly, error) {
	f, err := detectFormat(src)
	if err != nil {
		return nil, err
	}
	if f != formatGeoJSON {
		return nil, errorf("%s: an area must be GeoJSON with Polygon or MultiPolygon features (CSV holds points only)", src.Name)
	}
	feats, err := decodeGeoJSON(src)
	if err != nil {
		return nil, err
	}
	var out []areaPoly
	for i := range feats {
		ft := &feats[i]
		where := fmt.Sprintf("%s feature %d", src.Name, i)
		if ft.Geometry == nil {
			return nil, errorf("%s: no geometry (null), expected Polygon or MultiPolygon", where)
		}
		props := featureProps(ft)
		exclude := excludeAll
		if raw := props.Exclude; raw != nil {
			var b *bool
			if json.Unmarshal(raw, &b) != nil {
				return nil, errorf("%s: property \"exclude\" must be true or false, got %s", where, strings.TrimSpace(string(raw)))
			}
			if b != nil && *b {
				exclude = true
			}
		}
		name := jsonText(props.Name)
		polys, err := polygonsOf(where, ft.Geometry, planarInput)
		if err != nil {
			return nil, err
		}
		for k := range polys {
			polys[k].Exclude = exclude
			polys[k].Name = name
		}
		out = append(out, polys...)
	}
	if len(out) == 0 {
		return nil, errorf("%s: no Polygon or MultiPolygon features", src.Name)
	}
	return out, nil
}

// polygonsOf decodes the polygons of one geometry.
func polygonsOf(where string, g *gjGeometry, planarInput bool) ([]areaPoly, error) {
	switch g.Type {
	case "Polygon":
		var rings [][][]float64
		if err := decodeCoords(g.Coordinates, &rings); err != nil {
			return nil, errorf("%s: Polygon coordinates: %v", where, err)
		}
		p, err := polygonRings(where, rings, planarInput)
		if err != nil {
			return nil, err
		}
		return []areaPoly{{Rings: p, Where: where}}, nil
	case "MultiPolygon":
		var polys [][][][]float64
		if err := decodeCoords(g.Coordinates, &polys); err != nil {
			return nil, errorf("%s: MultiPolygon coordinates: %v", where, err)
		}
		out := make([]areaPoly, 0, len(polys))
		for k, rings := range polys {
			w := fmt.Sprintf("%s polygon %d", where, k)
			p, err := polygonRings(w, rings, planarInput)
			if err != nil {
				return nil, err
			}
			out = append(out, areaPoly{Rings: p, Where: w})
		}
		return out, nil
	case "GeometryCollection":
		var out []areaPoly
		for k := range g.Geometries {
			p, err := polygonsOf(fmt.Sprintf("%s geometry %d", where, k), &g.Geometries[k], planarInput)
			if err != nil {
				return nil, err
			}
			out = append(out, p...)
		}
		return out, nil
	case "":
		return nil, errorf("%s: geometry has no \"type\"", where)
	default:
		return nil, errorf("%s: geometry type %s, expected Polygon or MultiPolygon (an area is polygons)", where, g.Type)
	}
}

// polygonRings checks the rings of one polygon. Rings are kept exactly as
// given (so vertex indices in later messages match the file); only their
// coordinates and their number of distinct vertices are checked here.
func polygonRings(where string, rings [][][]float64, planarInput bool) ([]orb.Ring, error) {
	if len(rings) == 0 {
		return nil, errorf("%s: polygon has no rings", where)
	}
	out := make([]orb.Ring, 0, len(rings))
	for k, r := range rings {
		ring := make(orb.Ring, 0, len(r))
		for v, pos := range r {
			x, y, problem := position(pos)
			if problem == "" {
				problem = coordProblem(planarInput, x, y)
			}
			if problem != "" {
				return nil, errorf("%s ring %d vertex %d: %s", where, k, v, problem)
			}
			ring = append(ring, orb.Point{x, y})
		}
		distinct := 0
		for v := range ring {
			if v == 0 || ring[v] != ring[v-1] {
				distinct++
			}
		}
		if n := len(ring); distinct > 1 && ring[n-1] == ring[0] {
			distinct-- // the closing repeat
		}
		if distinct < 3 {
			return nil, errorf("%s ring %d: %d distinct vertices, a ring needs at least 3", where, k, distinct)
		}
		out = append(out, ring)
	}
	return out, nil
}
