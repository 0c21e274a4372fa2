// Reading points from CSV.
//
// A header line, then one point per line. Column names are matched
// case-insensitively after trimming spaces; the accepted names are the
// common export names of spreadsheets and desktop GIS:
//
//	latitude     lat, latitude
//	longitude    lon, long, lng, longitude
//	x (east)     x, point_x, easting
//	y (north)    y, point_y, northing
//	WKT point    wkt, wkt_geom, geometry, geom, the_geom: POINT (x y),
//	             POINT Z (x y z), optionally after "SRID=n;"
//	name         name (else id)
//	weight       weight (demand points only)
//	range        range, range_m (sites only: the device's own range, ranges.go)
//	type         type, device_type (sites only: the device type)
//
// Geographic input (the default) reads lat and lon; without them a WKT
// column holds "POINT (lon lat)" (other x/y columns are then ignored).
// x/y and easting/northing are metres: local metres with --planar, a
// projected grid with --crs (and longitude/latitude with --crs EPSG:4326);
// geographic input without lat/lon refuses them with that advice. Planar
// and grid input read x/y (or easting/northing, POINT_X/POINT_Y), else a
// WKT column.
//
// The delimiter is the one of ',', ';' and TAB that occurs most often in the
// header line; with ';' or TAB a decimal comma is accepted. A first line of
// numbers is data, not a header, and is refused listing the accepted
// names. Line numbers in messages are those of the file (1 = header).

package siteinput

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// csvColumns maps each accepted header name to its role.
var csvColumns = map[string]string{
	"lat": "lat", "latitude": "lat",
	"lon": "lon", "long": "lon", "lng": "lon", "longitude": "lon",
	"x": "x", "point_x": "x", "easting": "x",
	"y": "y", "point_y": "y", "northing": "y",
	"wkt": "wkt", "wkt_geom": "wkt", "geometry": "wkt", "geom": "wkt", "the_geom": "wkt",
	"name": "name", "id": "id",
	"range": "range", "range_m": "range", "type": "type", "device_type": "type",
}

// acceptedColumns lists every accepted coordinate header, for messages.
const acceptedColumns = "accepted: lat or latitude with lon, long, lng or longitude; " +
	"x, point_x or easting with y, point_y or northing; " +
	"or one WKT POINT column named wkt, wkt_geom, geometry, geom or the_geom"

func sitesFromCSV(src Source, planarInput bool) (*siteSet, error) {
	s, _, err := pointsFromCSV(src, planarInput, false)
	return s, err
}

// csvLayout is where the coordinates of a CSV file are.
type csvLayout struct {
	xi, yi       int // the columns of x (longitude) and y (latitude); -1 with wkt
	wkt          int // the WKT column, or -1
	xname, yname string
	name         int // the name (else id) column, or -1
	weight       int // the weight column, or -1
	rng, typ     int // the range and type columns, or -1
	// extra are the other columns, the sites' own attributes
	// (attributes.go), and extraNames their headers.
	extra      []int
	extraNames []string
}

// csvHeader finds the columns of the header line (see the file comment).
func csvHeader(src Source, header []string, planarInput, withWeight bool) (*csvLayout, error) {
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
			return nil, errorf("%s line 1: columns %d (%q) and %d (%q) are both %s", src.Name, j+1, header[j], i+1, h, key)
		}
		col[key] = i
		found = append(found, strings.TrimSpace(h))
	}
	_, hasLat := col["lat"]
	_, hasLon := col["lon"]
	_, hasX := col["x"]
	_, hasY := col["y"]
	wi, hasWKT := col["wkt"]
	if !hasLat && !hasLon && !hasX && !hasY && !hasWKT {
		if numericLine(header) {
			return nil, errorf("%s line 1: holds numbers, not column names: the first line must name the columns (%s)", src.Name, acceptedColumns)
		}
		return nil, errorf("%s: not GeoJSON or CSV: line 1 has no lat/lon or x/y column header (found %s; %s)", src.Name, quoteList(header), acceptedColumns)
	}
	l := &csvLayout{xi: -1, yi: -1, wkt: -1, name: -1, weight: -1, rng: -1, typ: -1}
	if i, ok := col["range"]; ok {
		l.rng = i
	}
	if i, ok := col["type"]; ok {
		l.typ = i
	}
	if i, ok := col["name"]; ok {
		l.name = i
	} else if i, ok := col["id"]; ok {
		l.name = i
	}
	if i, ok := col["weight"]; ok {
		l.weight = i
	}
	switch {
	case planarInput && hasX && hasY:
		l.xi, l.yi, l.xname, l.yname = col["x"], col["y"], "x", "y"
	case !planarInput && hasLat && hasLon:
		l.xi, l.yi, l.xname, l.yname = col["lon"], col["lat"], "longitude", "latitude"
	case hasWKT:
		l.wkt = wi
		l.xname, l.yname = "x", "y"
		if !planarInput {
			l.xname, l.yname = "longitude", "latitude"
		}
	case planarInput:
		hint := ""
		if hasLat && hasLon {
			hint = "; the lat/lon columns are geographic: drop --planar"
		}
		return nil, errorf("%s line 1: --planar needs x and y columns, found %s%s (%s)", src.Name, quoteList(found), hint, acceptedColumns)
	default:
		hint := ""
		if hasX && hasY {
			hint = fmt.Sprintf("; %s/%s are metres: for x/y in local metres add --planar, for a projected grid give --crs EPSG:NNNN (for longitude/latitude in x/y: --crs EPSG:4326)", header[col["x"]], header[col["y"]])
		}
		return nil, errorf("%s line 1: needs lat and lon columns, found %s%s (%s)", src.Name, quoteList(found), hint, acceptedColumns)
	}
	for i, h := range header {
		if i != l.xi && i != l.yi && i != l.wkt && i != l.name && i != l.weight && i != l.rng && i != l.typ {
			l.extra = append(l.extra, i)
			l.extraNames = append(l.extraNames, strings.TrimSpace(h))
		}
	}
	return l, nil
}

// numericLine reports whether some field of a line is a number: a line of
// data where a header was expected.
func numericLine(fields []string) bool {
	for _, f := range fields {
		f = strings.TrimSpace(f)
		if _, err := strconv.ParseFloat(strings.Replace(f, ",", ".", 1), 64); err == nil && f != "" {
			return true
		}
	}
	return false
}

// csvPresize is the most rows pointsFromCSV reserves room for before
// reading: 2²⁴ (about 17 million rows, 600 MB of slices, whose fresh
// pages the operating system provides only as they fill); beyond it the
// slices grow as they fill.
const csvPresize = 1 << 24

// pointsFromCSV reads points from CSV as described in the file comment.
// With withWeight a "weight" column is recognised too: weights then holds
// one finite weight ≥ 0 per point (nil when the header has no weight
// column); an empty or bad weight field is an error naming its line.
func pointsFromCSV(src Source, planarInput, withWeight bool) (s *siteSet, weights []float64, err error) {
	data := src.Data
	comma := csvDelimiter(data)
	r := newCSVReader(data, comma)
	header, err := r.Read()
	if err != nil {
		return nil, nil, csvError(src, err)
	}
	l, err := csvHeader(src, header, planarInput, withWeight)
	if err != nil {
		return nil, nil, err
	}
	rr := &csvRowReader{src: src, l: l, comma: comma, fields: len(header),
		need: max(l.xi, l.yi, l.wkt, l.weight) + 1, planar: planarInput}
	off := int(r.InputOffset())
	body := data[off:]
	line0 := bytes.Count(data[:off], []byte{'\n'})
	if s, weights, ok := rr.readParallel(body, line0); ok {
		return s, weights, nil
	}
	// One row per line at most: sized once from the line count (capped at
	// csvPresize rows), the per-site slices are not copied as they grow.
	s = rr.newSet(bytes.Count(body, []byte{'\n'}) + 1)
	if err := rr.read(body, line0, s, &weights); err != nil {
		return nil, nil, err
	}
	return s, weights, nil
}

// newCSVReader returns the reader of every CSV part: fields split at comma,
// any number per record, leading spaces trimmed, the record reused.
func newCSVReader(data []byte, comma rune) *csv.Reader {
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = comma
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	r.ReuseRecord = true
	return r
}

// csvRowReader reads the data records of one CSV file (after its header).
type csvRowReader struct {
	src          Source
	l            *csvLayout
	comma        rune
	fields, need int // header fields; fields a record needs
	planar       bool
}

// newSet returns an empty site set with room for rows sites (capped at
// csvPresize).
func (rr *csvRowReader) newSet(rows int) *siteSet {
	rows = min(rows, csvPresize)
	s := &siteSet{Lines: true}
	s.Pts, s.Names, s.Src = make([]orb.Point, 0, rows), make([]string, 0, rows), make([]int32, 0, rows)
	if rr.l.rng >= 0 {
		s.Ranges = []string{} // a range column is a range source even when empty
	}
	if rr.l.typ >= 0 {
		s.Types = []string{}
	}
	return s
}

// read appends the records of body, whose first line is line line0+1 of
// the file, to s and *weights. An error names the file and line.
func (rr *csvRowReader) read(body []byte, line0 int, s *siteSet, weights *[]float64) error {
	l, src := rr.l, rr.src
	decimalComma := rr.comma != ','
	r := newCSVReader(body, rr.comma)
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				pe.StartLine += line0
			}
			return csvError(src, err)
		}
		line, _ := r.FieldPos(0)
		line += line0
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		if len(rec) < rr.need {
			return errorf("%s line %d: %d fields, the header has %d", src.Name, line, len(rec), rr.fields)
		}
		x, y, err := l.position(rec, decimalComma)
		if err == nil {
			if p := coordProblem(rr.planar, x, y); p != "" {
				err = errors.New(p)
			}
		}
		if err != nil {
			return errorf("%s line %d: %v", src.Name, line, err)
		}
		s.Pts = append(s.Pts, orb.Point{x, y})
		name := ""
		if l.name >= 0 && l.name < len(rec) {
			name = strings.TrimSpace(rec[l.name])
		}
		s.Names = append(s.Names, name)
		s.Src = append(s.Src, int32(line))
		if l.rng >= 0 || l.typ >= 0 {
			s.addRangeType(field(rec, l.rng), field(rec, l.typ))
		}
		if len(l.extra) > 0 {
			s.attrs.addCSV(len(s.Pts), rec, l.extra, l.extraNames)
		}
		if l.weight >= 0 {
			w, err := csvWeight(rec[l.weight], decimalComma)
			if err != nil {
				return errorf("%s line %d: %v", src.Name, line, err)
			}
			*weights = append(*weights, w)
		}
	}
}

// field returns the trimmed field i of rec, "" when i < 0 or the record is
// shorter.
func field(rec []string, i int) string {
	if i < 0 || i >= len(rec) {
		return ""
	}
	return strings.TrimSpace(rec[i])
}

// csvDelimiter is the one of ',', ';' and TAB that occurs most often in
// the first line.
func csvDelimiter(data []byte) rune {
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
	return comma
}

// position reads the coordinates of one record.
func (l *csvLayout) position(rec []string, decimalComma bool) (x, y float64, err error) {
	if l.wkt >= 0 {
		return wktPoint(rec[l.wkt])
	}
	x, err = csvNumber(rec[l.xi], l.xname, decimalComma)
	if err == nil {
		y, err = csvNumber(rec[l.yi], l.yname, decimalComma)
	}
	return x, y, err
}

// wktPoint parses a WKT point: "POINT (x y)", "POINT Z (x y z)",
// "POINT M (...)", "POINT ZM (...)", optionally after "SRID=n;" (EWKT).
// Decimal points only: WKT separates numbers by spaces.
func wktPoint(field string) (x, y float64, err error) {
	f := strings.TrimSpace(field)
	if i := strings.IndexByte(f, ';'); i >= 0 && strings.HasPrefix(strings.ToUpper(f), "SRID=") {
		f = strings.TrimSpace(f[i+1:])
	}
	bad := func(why string) error {
		short := field
		if len(short) > 60 {
			short = short[:60] + "..."
		}
		return fmt.Errorf("WKT %q %s", short, why)
	}
	u := strings.ToUpper(f)
	if !strings.HasPrefix(u, "POINT") {
		if f == "" {
			return 0, 0, errors.New("WKT geometry is empty")
		}
		return 0, 0, bad("is not a POINT (sites and items are points)")
	}
	rest := strings.TrimSpace(f[len("POINT"):])
	for _, dim := range []string{"ZM", "Z", "M"} {
		if strings.HasPrefix(strings.ToUpper(rest), dim) {
			rest = strings.TrimSpace(rest[len(dim):])
			break
		}
	}
	if strings.EqualFold(rest, "EMPTY") {
		return 0, 0, bad("is empty")
	}
	if len(rest) < 2 || rest[0] != '(' || rest[len(rest)-1] != ')' {
		return 0, 0, bad("is not of the form POINT (x y)")
	}
	nums := strings.Fields(rest[1 : len(rest)-1])
	if len(nums) < 2 || len(nums) > 4 {
		return 0, 0, bad(fmt.Sprintf("has %d numbers, expected 2 to 4", len(nums)))
	}
	v := [2]float64{}
	for i := range v {
		v[i], err = strconv.ParseFloat(nums[i], 64)
		if err != nil || strings.ContainsAny(nums[i], "_xXpP") {
			return 0, 0, bad(fmt.Sprintf("coordinate %q is not a number", nums[i]))
		}
	}
	return v[0], v[1], nil
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
