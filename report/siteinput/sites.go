// Loading device sites from GeoJSON or CSV.
//
// GeoJSON: Point and MultiPoint geometries (also inside a
// GeometryCollection), in file order; a MultiPoint gives one site per
// position. The site name is the "name" property, else the "id" property,
// else the Feature's "id" (a MultiPoint's positions get "#1", "#2", ...).
//
// CSV: see csv.go.
//
// Coordinates are checked one by one (see coordProblem) and never altered.

package siteinput

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// siteSet is the sites of one input, in input order.
type siteSet struct {
	// Pts are [lon, lat] degrees, or [x, y] metres with --planar.
	Pts []orb.Point
	// Names holds a name per site ("" for none).
	Names []string
	// Src holds per site its CSV line (1-based) or GeoJSON feature
	// (0-based), for messages; Lines tells which.
	Src   []int32
	Lines bool
	// Ranges holds per site the text of its own range ("" for none); nil
	// when the input has no range column or property (ranges.go).
	Ranges []string
	// Types holds per site its device type ("" for none); nil when the
	// input has no type column or property.
	Types []string
	// tagged counts the sites given their range and type so far.
	tagged int
	// attrs gathers the sites' own attributes (attributes.go).
	attrs attrBuilder
}

// addRangeType appends the range text and type of the sites added since
// the last call (a feature's positions share its properties), creating
// Ranges or Types at the first non-empty value (the earlier sites then
// have none).
func (s *siteSet) addRangeType(rangeText, typ string) {
	s.Ranges = appendUpTo(s.Ranges, rangeText, s.tagged, len(s.Pts))
	s.Types = appendUpTo(s.Types, typ, s.tagged, len(s.Pts))
	s.tagged = len(s.Pts)
}

// appendUpTo extends xs to n entries with v, after "" up to done; a nil xs
// stays nil while v is "".
func appendUpTo(xs []string, v string, done, n int) []string {
	if xs == nil && v == "" {
		return nil
	}
	if xs == nil {
		xs = make([]string, done, n)
	}
	for len(xs) < n {
		xs = append(xs, v)
	}
	return xs
}

// label names site i in messages: "line 7" or "feature 3", with its name.
func (s *siteSet) label(i int) string {
	w := fmt.Sprintf("feature %d", s.Src[i])
	if s.Lines {
		w = fmt.Sprintf("line %d", s.Src[i])
	}
	if s.Names[i] != "" {
		w += fmt.Sprintf(" (%q)", s.Names[i])
	}
	return w
}

// loadSites reads sites from src (GeoJSON or CSV).
func loadSites(src Source, planarInput bool) (*siteSet, error) {
	f, err := detectFormat(src)
	if err != nil {
		return nil, err
	}
	var s *siteSet
	if f == formatGeoJSON {
		s, err = sitesFromGeoJSON(src, planarInput)
	} else {
		s, err = sitesFromCSV(src, planarInput)
	}
	if err != nil {
		return nil, err
	}
	if len(s.Pts) == 0 {
		what := "no Point or MultiPoint features"
		if f == formatCSV {
			what = "a header but no data lines"
		}
		return nil, errorf("%s: no sites (%s)", src.Name, what)
	}
	return s, nil
}

func sitesFromGeoJSON(src Source, planarInput bool) (*siteSet, error) {
	feats, err := decodeGeoJSON(src)
	if err != nil {
		return nil, err
	}
	s := &siteSet{Pts: make([]orb.Point, 0, len(feats)), Names: make([]string, 0, len(feats))}
	for i := range feats {
		f := &feats[i]
		if f.Geometry == nil {
			return nil, errorf("%s feature %d: no geometry (null), expected Point or MultiPoint", src.Name, i)
		}
		props := featureProps(f)
		name := featureName(props, f.ID)
		rangeText, ok := jsonLength(props.Range)
		if !ok {
			return nil, errorf("%s feature %d: range %s is not a length (give metres as a number, or a string such as \"150m\")", src.Name, i, shortJSON(props.Range))
		}
		typ := jsonText(props.Type)
		idGaveName := jsonText(props.Name) == "" && jsonText(props.ID) != ""
		if f.Geometry.Type == "Point" {
			// Fast path for the common case; anything unusual falls
			// through to the general decoder and its messages.
			if x, y, ok := fastPosition(f.Geometry.Coordinates); ok && coordProblem(planarInput, x, y) == "" {
				s.Pts = append(s.Pts, orb.Point{x, y})
				s.Names = append(s.Names, name)
				s.Src = append(s.Src, int32(i))
				s.addRangeType(rangeText, typ)
				s.attrs.addJSON(len(s.Pts), props.raw, idGaveName)
				continue
			}
		}
		if err := s.addGeometry(src, fmt.Sprintf("feature %d", i), f.Geometry, name, planarInput); err != nil {
			return nil, err
		}
		for len(s.Src) < len(s.Pts) {
			s.Src = append(s.Src, int32(i))
		}
		s.addRangeType(rangeText, typ)
		s.attrs.addJSON(len(s.Pts), props.raw, idGaveName)
	}
	return s, nil
}

func (s *siteSet) addGeometry(src Source, where string, g *gjGeometry, name string, planarInput bool) error {
	switch g.Type {
	case "Point", "MultiPoint":
		return pointGeometry(src, where, g, name, planarInput, func(p orb.Point, _, name string) {
			s.Pts = append(s.Pts, p)
			s.Names = append(s.Names, name)
		})
	case "GeometryCollection":
		for k := range g.Geometries {
			if err := s.addGeometry(src, fmt.Sprintf("%s geometry %d", where, k), &g.Geometries[k], name, planarInput); err != nil {
				return err
			}
		}
		return nil
	case "":
		return errorf("%s %s: geometry has no \"type\"", src.Name, where)
	default:
		return errorf("%s %s: geometry type %s, expected Point or MultiPoint (sites are points)", src.Name, where, g.Type)
	}
}

// pointGeometry decodes the Point or MultiPoint geometry g (of where in
// src), checks each position with coordProblem and calls add with it, its
// label after where (" point k" for position k of a MultiPoint) and its
// name (the positions of a named MultiPoint of several are "name#1",
// "name#2", ...). The first bad position stops it with an input error.
func pointGeometry(src Source, where string, g *gjGeometry, name string, planarInput bool, add func(p orb.Point, label, name string)) error {
	point := func(p []float64, label, name string) error {
		x, y, problem := position(p)
		if problem == "" {
			problem = coordProblem(planarInput, x, y)
		}
		if problem != "" {
			return errorf("%s %s%s: %s", src.Name, where, label, problem)
		}
		add(orb.Point{x, y}, label, name)
		return nil
	}
	if g.Type == "Point" {
		var p []float64
		if err := decodeCoords(g.Coordinates, &p); err != nil {
			return errorf("%s %s: Point coordinates: %v", src.Name, where, err)
		}
		return point(p, "", name)
	}
	var ps [][]float64
	if err := decodeCoords(g.Coordinates, &ps); err != nil {
		return errorf("%s %s: MultiPoint coordinates: %v", src.Name, where, err)
	}
	for k, p := range ps {
		n := name
		if n != "" && len(ps) > 1 {
			n = fmt.Sprintf("%s#%d", name, k+1)
		}
		if err := point(p, fmt.Sprintf(" point %d", k), n); err != nil {
			return err
		}
	}
	return nil
}

// fastPosition parses a plain position "[x, y]" or "[x, y, z]" of JSON
// numbers without reflection. ok is false for anything else.
func fastPosition(raw []byte) (x, y float64, ok bool) {
	t := bytes.TrimSpace(raw)
	if len(t) < 5 || t[0] != '[' || t[len(t)-1] != ']' {
		return 0, 0, false
	}
	parts := bytes.Split(t[1:len(t)-1], []byte{','})
	if len(parts) < 2 || len(parts) > 3 {
		return 0, 0, false
	}
	var v [3]float64
	for i, p := range parts {
		p = bytes.TrimSpace(p)
		// JSON numbers only: ParseFloat also takes "Inf", "0x1p3", "_".
		for _, c := range p {
			if !(c >= '0' && c <= '9' || c == '-' || c == '+' || c == '.' || c == 'e' || c == 'E') {
				return 0, 0, false
			}
		}
		f, err := strconv.ParseFloat(string(p), 64)
		if err != nil {
			return 0, 0, false
		}
		v[i] = f
	}
	return v[0], v[1], true
}

// decodeCoords decodes a "coordinates" member into v with a short error.
func decodeCoords(raw []byte, v any) error {
	if len(bytes.TrimSpace(raw)) == 0 || string(bytes.TrimSpace(raw)) == "null" {
		return errors.New("missing")
	}
	if err := json.Unmarshal(raw, v); err != nil {
		var te *json.UnmarshalTypeError
		if errors.As(err, &te) && strings.HasPrefix(te.Value, "number ") {
			return fmt.Errorf("coordinate %s is not a finite float64 number", strings.TrimPrefix(te.Value, "number "))
		}
		return errors.New("not an array of numbers of the right depth")
	}
	return nil
}
