// Loading device sites from GeoJSON or CSV.
//
// GeoJSON: Point and MultiPoint geometries (also inside a
// GeometryCollection), in file order; a MultiPoint gives one site per
// position. The site name is the "name" property, else the "id" property,
// else the Feature's "id" (a MultiPoint's positions get "#1", "#2", ...).
//
// CSV: a header line, then one site per line. Column names are matched
// case-insensitively after trimming spaces: lat or latitude; lon, lng or
// longitude; x; y; name; id. Geographic input needs lat and lon, --planar
// input needs x and y. The delimiter is the one of ',', ';' and TAB that
// occurs most often in the header line; with ';' or TAB a decimal comma is
// accepted. Line numbers in messages are those of the file (1 = header).
//
// Coordinates are checked one by one (see coordProblem) and never altered.

package siteinput

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
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
		name := featureName(featureProps(f), f.ID)
		if f.Geometry.Type == "Point" {
			// Fast path for the common case; anything unusual falls
			// through to the general decoder and its messages.
			if x, y, ok := fastPosition(f.Geometry.Coordinates); ok && coordProblem(planarInput, x, y) == "" {
				s.Pts = append(s.Pts, orb.Point{x, y})
				s.Names = append(s.Names, name)
				continue
			}
		}
		if err := s.addGeometry(src, fmt.Sprintf("feature %d", i), f.Geometry, name, planarInput); err != nil {
			return nil, err
		}
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

// csvColumns are the recognised CSV header names.
var csvColumns = map[string]string{
	"lat": "lat", "latitude": "lat",
	"lon": "lon", "lng": "lon", "longitude": "lon",
	"x": "x", "y": "y",
	"name": "name", "id": "id",
}

func sitesFromCSV(src Source, planarInput bool) (*siteSet, error) {
	s, _, err := pointsFromCSV(src, planarInput, false)
	return s, err
}

// pointsFromCSV reads points from CSV as described in the file comment.
// With withWeight a "weight" column is recognised too: weights then holds
// one finite weight ≥ 0 per point (nil when the header has no weight
// column); an empty or bad weight field is an error naming its line.
func pointsFromCSV(src Source, planarInput, withWeight bool) (s *siteSet, weights []float64, err error) {
	data := src.Data
	firstLine := data
	if i := bytes.IndexByte(data, '\n'); i >= 0 {
		firstLine = data[:i]
	}
	comma := ','
	best := bytes.Count(firstLine, []byte{','})
	for _, c := range []rune{';', '\t'} {
		if n := bytes.Count(firstLine, []byte(string(c))); n > best {
			comma, best = c, n
		}
	}
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = comma
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	r.ReuseRecord = true
	header, err := r.Read()
	if err != nil {
		return nil, nil, csvError(src, err)
	}
	col := map[string]int{}
	var found []string
	for i, h := range header {
		key, ok := csvColumns[strings.ToLower(strings.TrimSpace(h))]
		if !ok && withWeight && strings.EqualFold(strings.TrimSpace(h), "weight") {
			key, ok = "weight", true
		}
		if !ok {
			continue
		}
		if j, dup := col[key]; dup {
			return nil, nil, errorf("%s line 1: columns %d (%q) and %d (%q) are both %s", src.Name, j+1, header[j], i+1, h, key)
		}
		col[key] = i
		found = append(found, strings.TrimSpace(h))
	}
	_, hasLat := col["lat"]
	_, hasLon := col["lon"]
	_, hasX := col["x"]
	_, hasY := col["y"]
	if !hasLat && !hasLon && !hasX && !hasY {
		return nil, nil, errorf("%s: not GeoJSON or CSV: line 1 has no lat/lon or x/y column header (found %s)", src.Name, quoteList(header))
	}
	xcol, ycol := "lon", "lat"
	xname, yname := "longitude", "latitude"
	if planarInput {
		xcol, ycol, xname, yname = "x", "y", "x", "y"
		if !hasX || !hasY {
			hint := ""
			if hasLat && hasLon {
				hint = "; the lat/lon columns are geographic: drop --planar"
			}
			return nil, nil, errorf("%s line 1: --planar needs x and y columns, found %s%s", src.Name, quoteList(found), hint)
		}
	} else if !hasLat || !hasLon {
		hint := ""
		if hasX && hasY {
			hint = "; for x/y in local metres add --planar"
		}
		return nil, nil, errorf("%s line 1: needs lat and lon columns, found %s%s", src.Name, quoteList(found), hint)
	}
	xi, yi := col[xcol], col[ycol]
	ni, hasName := col["name"]
	if !hasName {
		ni, hasName = col["id"]
	}
	wi, hasWeight := col["weight"]
	decimalComma := comma != ','
	s = &siteSet{}
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, nil, csvError(src, err)
		}
		line, _ := r.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		need := max(xi, yi) + 1
		if hasWeight {
			need = max(need, wi+1)
		}
		if len(rec) < need {
			return nil, nil, errorf("%s line %d: %d fields, the header has %d", src.Name, line, len(rec), len(header))
		}
		x, err := csvNumber(rec[xi], xname, decimalComma)
		var y float64
		if err == nil {
			y, err = csvNumber(rec[yi], yname, decimalComma)
		}
		if err == nil {
			if p := coordProblem(planarInput, x, y); p != "" {
				err = errors.New(p)
			}
		}
		if err != nil {
			return nil, nil, errorf("%s line %d: %v", src.Name, line, err)
		}
		s.Pts = append(s.Pts, orb.Point{x, y})
		name := ""
		if hasName && ni < len(rec) {
			name = strings.TrimSpace(rec[ni])
		}
		s.Names = append(s.Names, name)
		if hasWeight {
			w, err := csvWeight(rec[wi], decimalComma)
			if err != nil {
				return nil, nil, errorf("%s line %d: %v", src.Name, line, err)
			}
			weights = append(weights, w)
		}
	}
	return s, weights, nil
}

// csvWeight parses one weight field: a finite number ≥ 0.
func csvWeight(field string, decimalComma bool) (float64, error) {
	if strings.TrimSpace(field) == "" {
		return 0, errors.New("weight is empty (give a number ≥ 0 on every line, or drop the weight column)")
	}
	w, err := csvNumber(field, "weight", decimalComma)
	if err != nil {
		return 0, err
	}
	if p := weightProblem(w); p != "" {
		return 0, errors.New(p)
	}
	return w, nil
}

// csvNumber parses one coordinate field.
func csvNumber(field, what string, decimalComma bool) (float64, error) {
	f := strings.TrimSpace(field)
	if f == "" {
		return 0, fmt.Errorf("%s is empty", what)
	}
	if decimalComma {
		f = strings.Replace(f, ",", ".", 1)
	}
	v, err := strconv.ParseFloat(f, 64)
	if err != nil {
		var ne *strconv.NumError
		if errors.As(err, &ne) && ne.Err == strconv.ErrRange {
			return 0, fmt.Errorf("%s %s is out of the float64 range", what, field)
		}
		return 0, fmt.Errorf("%s %q is not a number", what, field)
	}
	return v, nil
}

func csvError(src Source, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return errorf("%s line %d: not valid CSV: %v", src.Name, pe.StartLine, pe.Err)
	}
	return errorf("%s: not valid CSV: %v", src.Name, err)
}

func quoteList(xs []string) string {
	if len(xs) == 0 {
		return "none"
	}
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = strconv.Quote(strings.TrimSpace(x))
	}
	return strings.Join(q, ", ")
}
