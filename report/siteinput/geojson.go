// Decoding GeoJSON (RFC 7946) and checking coordinates.
//
// A GeoJSON input may be a FeatureCollection, a single Feature or a bare
// geometry; GeometryCollections are walked member by member. Positions are
// [x, y] or [x, y, z] arrays of JSON numbers (z is ignored): with
// geographic input x is the longitude and y the latitude in WGS84 degrees
// (RFC 7946 §3.1.1), with planar input (--planar) they are local metres. Every error names
// the file and, where it applies, the feature index (0-based, the order in
// the file), the ring and vertex, or the JSON line.
//
// JSON has no NaN or infinity literal, so a non-finite coordinate in a
// GeoJSON file is a JSON syntax error, reported with its line.

package siteinput

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/sitecover/sitecover/planar"
)

// gjGeometry is a GeoJSON geometry object with its coordinates undecoded.
type gjGeometry struct {
	Type        string          `json:"type"`
	Coordinates json.RawMessage `json:"coordinates"`
	Geometries  []gjGeometry    `json:"geometries"`
}

// gjProps are the Feature properties sitecover reads; others are skipped
// by the decoder without being stored.
type gjProps struct {
	Name    json.RawMessage `json:"name"`
	ID      json.RawMessage `json:"id"`
	Exclude json.RawMessage `json:"exclude"`
	// Weight is read from demand points (assign --points) only.
	Weight json.RawMessage `json:"weight"`
	// Range and Type are read from sites only (ranges.go).
	Range json.RawMessage `json:"range"`
	Type  json.RawMessage `json:"type"`
	// raw is the whole properties object, for the sites' own attributes
	// (attributes.go).
	raw []byte
}

// UnmarshalJSON decodes the members sitecover reads (each copied; a key
// matches ignoring case, and the last of repeated members counts, as
// encoding/json matches struct fields) in one pass over the object, which
// encoding/json has already checked, and keeps a copy of the whole object
// in raw when it has other members (possible attributes of sites). A value
// that is not an object is refused with errNotObject, whose place
// decodeGeoJSON finds (see there).
func (p *gjProps) UnmarshalJSON(b []byte) error {
	t := bytes.TrimSpace(b)
	if len(t) == 0 || t[0] != '{' {
		return errNotObject
	}
	other := false
	eachMember(t, func(key string, val json.RawMessage) {
		var dst *json.RawMessage
		switch {
		case strings.EqualFold(key, "name"):
			dst = &p.Name
		case strings.EqualFold(key, "range"):
			dst = &p.Range
		case strings.EqualFold(key, "type"):
			dst = &p.Type
		case strings.EqualFold(key, "id"):
			dst, other = &p.ID, true
		case strings.EqualFold(key, "exclude"):
			dst, other = &p.Exclude, true
		case strings.EqualFold(key, "weight"):
			dst, other = &p.Weight, true
		default:
			other = true
			return
		}
		*dst = bytes.Clone(val)
	})
	if other {
		p.raw = bytes.Clone(t)
	}
	return nil
}

// errNotObject is gjProps.UnmarshalJSON's refusal of a properties member
// that is not an object; encoding/json gives it no offset.
var errNotObject = errors.New("properties is not an object")

// propsPlaces has the properties members of a GeoJSON document as plain
// objects, so that decoding it reports where one is not an object.
type propsPlaces struct {
	Features []struct {
		Properties *struct{} `json:"properties"`
	} `json:"features"`
	Properties *struct{} `json:"properties"`
}

// shortJSON is a JSON value for a message, cut after 40 bytes.
func shortJSON(raw json.RawMessage) string {
	s := string(bytes.TrimSpace(raw))
	if len(s) > 40 {
		s = s[:40] + "..."
	}
	return s
}

// gjFeature is a GeoJSON Feature.
type gjFeature struct {
	Type       string          `json:"type"`
	ID         json.RawMessage `json:"id"`
	Properties *gjProps        `json:"properties"`
	Geometry   *gjGeometry     `json:"geometry"`
}

// gjDoc is any GeoJSON object: a FeatureCollection, a Feature or a
// geometry.
type gjDoc struct {
	Type        string          `json:"type"`
	Features    []gjFeature     `json:"features"`
	ID          json.RawMessage `json:"id"`
	Properties  *gjProps        `json:"properties"`
	Geometry    *gjGeometry     `json:"geometry"`
	Coordinates json.RawMessage `json:"coordinates"`
	Geometries  []gjGeometry    `json:"geometries"`
}

// decodeGeoJSON parses src and returns its features in file order.
func decodeGeoJSON(src Source) ([]gjFeature, error) {
	var d gjDoc
	if err := json.Unmarshal(src.Data, &d); err != nil {
		if errors.Is(err, errNotObject) {
			// The first error is a properties member that is not an
			// object: decoding the members alone says where.
			if perr := json.Unmarshal(src.Data, &propsPlaces{}); perr != nil {
				err = perr
			}
		}
		return nil, jsonError(src, err)
	}
	switch d.Type {
	case "FeatureCollection":
		for i, f := range d.Features {
			if f.Type != "Feature" {
				return nil, errorf("%s feature %d: type %q, expected \"Feature\"", src.Name, i, f.Type)
			}
		}
		return d.Features, nil
	case "Feature":
		return []gjFeature{{Type: d.Type, ID: d.ID, Properties: d.Properties, Geometry: d.Geometry}}, nil
	case "Point", "MultiPoint", "LineString", "MultiLineString", "Polygon", "MultiPolygon", "GeometryCollection":
		g := &gjGeometry{Type: d.Type, Coordinates: d.Coordinates, Geometries: d.Geometries}
		return []gjFeature{{Type: "Feature", Geometry: g}}, nil
	case "":
		return nil, errorf("%s: not GeoJSON (the top-level object has no \"type\")", src.Name)
	default:
		return nil, errorf("%s: not GeoJSON (unknown type %q)", src.Name, d.Type)
	}
}

// jsonError turns an encoding/json error into a message with a line.
func jsonError(src Source, err error) error {
	var se *json.SyntaxError
	var te *json.UnmarshalTypeError
	switch {
	case errors.As(err, &se):
		return errorf("%s line %d: not valid JSON: %v", src.Name, lineAt(src.Data, se.Offset), se)
	case errors.As(err, &te):
		what := te.Field
		if what == "" {
			what = "the top-level value"
		} else {
			what = "member \"" + what + "\""
		}
		if te.Value == "number" || strings.HasPrefix(te.Value, "number ") {
			if te.Type.Kind().String() == "float64" {
				return errorf("%s line %d: %s is not a finite float64 number", src.Name, lineAt(src.Data, te.Offset), te.Value)
			}
		}
		return errorf("%s line %d: not GeoJSON: %s is a JSON %s, expected %s", src.Name,
			lineAt(src.Data, te.Offset), what, te.Value, jsonKind(te.Type.Kind().String()))
	default:
		return errorf("%s: not valid JSON: %v", src.Name, err)
	}
}

func jsonKind(goKind string) string {
	switch goKind {
	case "slice", "array":
		return "an array"
	case "struct", "map", "ptr":
		return "an object"
	case "string":
		return "a string"
	case "float64":
		return "a number"
	}
	return goKind
}

// lineAt returns the 1-based line of byte offset off.
func lineAt(b []byte, off int64) int {
	if off > int64(len(b)) {
		off = int64(len(b))
	}
	if off < 0 {
		off = 0
	}
	return 1 + bytes.Count(b[:off], []byte{'\n'})
}

// featureProps returns the properties of f (empty when null or absent).
func featureProps(f *gjFeature) gjProps {
	if f.Properties == nil {
		return gjProps{}
	}
	return *f.Properties
}

// featureName returns the "name" property, else the "id" property, else
// the Feature's "id" member, as text ("" when none).
func featureName(props gjProps, id json.RawMessage) string {
	for _, raw := range []json.RawMessage{props.Name, props.ID, id} {
		if s := jsonText(raw); s != "" {
			return s
		}
	}
	return ""
}

// jsonText renders a JSON string or number as text; other values give "".
func jsonText(raw json.RawMessage) string {
	raw = bytes.TrimSpace(raw)
	if len(raw) == 0 {
		return ""
	}
	if raw[0] == '"' {
		var s string
		if json.Unmarshal(raw, &s) == nil {
			return strings.TrimSpace(s)
		}
		return ""
	}
	if _, err := strconv.ParseFloat(string(raw), 64); err == nil {
		return string(raw)
	}
	return ""
}

// position decodes one GeoJSON position.
func position(p []float64) (x, y float64, problem string) {
	if len(p) < 2 {
		return 0, 0, fmt.Sprintf("a position needs 2 numbers, got %d", len(p))
	}
	return p[0], p[1], ""
}

// lonLatHint returns what a longitude/latitude pair (x, y) out of range
// probably is, for the error message, or "".
func lonLatHint(x, y float64) string {
	switch {
	case math.Abs(x) > 1000 || math.Abs(y) > 1000:
		return " (local metres? add --planar; a projected grid? give --crs EPSG:NNNN)"
	case math.Abs(x) <= 90 && math.Abs(y) <= 180:
		return fmt.Sprintf(" (latitude and longitude swapped? read the other way round, latitude %s and longitude %s are valid; GeoJSON positions are [longitude, latitude])", fmtCoord(x), fmtCoord(y))
	}
	return ""
}

// coordProblem checks one coordinate pair: with geographic input a WGS84
// longitude and latitude, with planar input finite local metres. It
// returns "" when the pair is usable, else the problem.
func coordProblem(planarInput bool, x, y float64) string {
	if planarInput {
		for _, v := range [...]struct {
			name string
			v    float64
		}{{"x", x}, {"y", y}} {
			switch {
			case math.IsNaN(v.v):
				return v.name + " is NaN"
			case math.IsInf(v.v, 0):
				return v.name + " is infinite"
			case math.Abs(v.v) > maxPlanarCoord:
				return fmt.Sprintf("%s %g m is beyond ±%g m: not local metres", v.name, v.v, maxPlanarCoord)
			case v.v != 0 && math.Abs(v.v) < minCoordMagnitude:
				return fmt.Sprintf("%s %g m is not 0 but below %g in magnitude: write 0, or check the units", v.name, v.v, minCoordMagnitude)
			}
		}
		return ""
	}
	switch {
	case math.IsNaN(x):
		return "longitude is NaN"
	case math.IsInf(x, 0):
		return "longitude is infinite"
	case math.IsNaN(y):
		return "latitude is NaN"
	case math.IsInf(y, 0):
		return "latitude is infinite"
	}
	if x < -180 || x > 180 {
		return fmt.Sprintf("longitude %s is outside -180..180%s", fmtCoord(x), lonLatHint(x, y))
	}
	if y < -90 || y > 90 {
		return fmt.Sprintf("latitude %s is outside -90..90%s", fmtCoord(y), lonLatHint(x, y))
	}
	if err := planar.ValidLonLat(x, y); err != nil {
		return err.Error()
	}
	for _, v := range [...]struct {
		name string
		v    float64
	}{{"longitude", x}, {"latitude", y}} {
		if v.v != 0 && math.Abs(v.v) < minCoordMagnitude {
			return fmt.Sprintf("%s %g is not 0 but below %g in magnitude: write 0", v.name, v.v, minCoordMagnitude)
		}
	}
	return ""
}

// minCoordMagnitude is the least magnitude of a non-zero coordinate
// (metres or degrees): 1e-30. Below it a value is noise or garbage (5e-324,
// 1e-300), and the exact predicates, which square and multiply coordinate
// differences up to the fourth degree, would underflow: differences of
// coordinates that are 0 or at least 1e-30 are at least 1e-46 (the spacing
// of doubles near 1e-30), whose fourth power 1e-184 is far above the
// smallest normal double (2.2e-308).
const minCoordMagnitude = 1e-30

// maxPlanarCoord bounds local-plane coordinates: 20 000 km, half the
// Earth's circumference; anything larger is not a site plan in metres.
const maxPlanarCoord = 2e7

func fmtCoord(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
