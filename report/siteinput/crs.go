// Projected coordinate reference systems of the inputs: the EPSG codes of
// the transverse Mercator grids planners' files come in, converted to WGS84
// longitude/latitude before the normal path (local plane, analysis; outputs
// stay RFC 7946 WGS84).
//
// A GeoJSON file names its system in the "crs" member of GeoJSON 2008
// ({"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::32632"}},
// also "EPSG:32632", "http://www.opengis.net/def/crs/EPSG/0/32632" and the
// older {"type":"EPSG","properties":{"code":32632}}); RFC 7946 dropped the
// member, but desktop GIS still writes it. Inputs.CRS (the --crs option)
// applies to every CSV file without lat/lon columns and every GeoJSON file
// without a crs member.
//
// Supported codes, all transverse Mercator (parameters from the EPSG
// registry as printed by PROJ 9 `projinfo -o PROJ EPSG:n`):
//
//	32601–32660  WGS 84 / UTM zone 1N–60N: WGS84, λ₀ = 6z − 183°, φ₀ = 0, k₀ = 0.9996, E₀ = 500 000, N₀ = 0
//	32701–32760  WGS 84 / UTM zone 1S–60S: as above, N₀ = 10 000 000
//	25828–25838  ETRS89 / UTM zone 28N–38N: GRS80, as 326zz
//	4647, 5650   ETRS89 / UTM zone 32N, 33N (zE-N): GRS80, E₀ = 32 500 000, 33 500 000
//	3006         SWEREF99 TM: GRS80, λ₀ = 15°, k₀ = 0.9996, E₀ = 500 000, N₀ = 0
//	3067         ETRS89 / TM35FIN(E,N): GRS80, λ₀ = 27°, k₀ = 0.9996, E₀ = 500 000, N₀ = 0
//	2193         NZGD2000 / New Zealand Transverse Mercator 2000: GRS80, λ₀ = 173°, k₀ = 0.9996, E₀ = 1 600 000, N₀ = 10 000 000
//	2180         ETRS89 / Poland CS92: GRS80, λ₀ = 19°, k₀ = 0.9993, E₀ = 500 000, N₀ = −5 300 000
//	3763         ETRS89 / Portugal TM06: GRS80, φ₀ = 39°40′05.73″N, λ₀ = 8°07′59.19″W, k₀ = 1, E₀ = N₀ = 0
//
// and the geographic systems EPSG:4326 (WGS 84), EPSG:4258 (ETRS89) and
// OGC CRS84, which are longitude/latitude (x = longitude, y = latitude, as
// GeoJSON and GIS exports write them).
//
// Datums: ETRS89, SWEREF99, NZGD2000 and the ETRF-based Polish and
// Portuguese realisations are GRS80 datums that PROJ converts to WGS 84 with
// a null transformation (e.g. EPSG:1149 "ETRS89 to WGS 84 (1)", stated
// accuracy 1 m): their longitude/latitude are taken as WGS84, as PROJ does.
// The projection itself is exact to the Krüger series (planar, Karney 2011)
// and is checked against PROJ's cs2cs to 1 mm (testdata/ref_crs.py).
//
// A projected position is accepted when its easting lies within
// crsMaxEastOffset of the false easting (the series stays accurate far
// beyond that), its longitude lies within 90° of the central meridian (a
// northing beyond the pole maps to the far side of the Earth) and it maps
// back to itself within crsRoundTrip; otherwise it is not a position of
// that grid.

package siteinput

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// GRS80 is the Geodetic Reference System 1980 ellipsoid (Moritz, Bulletin
// Géodésique 1980): a = 6 378 137 m, 1/f = 298.257222101.
var GRS80 = planar.Ellipsoid{A: 6378137, F: 1 / 298.257222101}

// crsMaxEastOffset bounds |E − E₀| of an accepted projected position: 1 500
// km, wider than any grid listed (NZTM spans about ±800 km) and well within
// the 3 900 km where the Krüger series is accurate to nanometres.
const crsMaxEastOffset = 1.5e6

// crsRoundTrip is the largest distance (m) between a projected position and
// the projection of its inverse: beyond it the position is not one the grid
// can hold (1 mm).
const crsRoundTrip = 1e-3

// SupportedCRS lists the accepted coordinate reference systems, for help
// texts and messages.
const SupportedCRS = "EPSG:4326, EPSG:4258, CRS84 (longitude/latitude); EPSG:32601–32660 and 32701–32760 (WGS 84 / UTM), " +
	"25828–25838, 4647, 5650 (ETRS89 / UTM), 3006 (SWEREF99 TM), 3067 (ETRS-TM35FIN), 2193 (NZTM2000), 2180 (Poland CS92), 3763 (Portugal TM06)"

// CRS is a supported coordinate reference system of the inputs.
type CRS struct {
	// Code is "EPSG:n" or "OGC:CRS84"; Name the EPSG name.
	Code, Name string
	// TM projects to the grid; nil for longitude/latitude.
	TM *planar.TransverseMercator
}

// Label is the code and the name, e.g. "EPSG:32632 (WGS 84 / UTM zone 32N)".
func (c *CRS) Label() string { return c.Code + " (" + c.Name + ")" }

// crsCode matches the spellings of an EPSG code.
var crsCode = regexp.MustCompile(`(?i)^(?:EPSG:{1,2}|urn:ogc:def:crs:EPSG:[0-9.]*:|https?://www\.opengis\.net/def/crs/EPSG/[0-9.]+/)([0-9]+)$`)

// crs84 matches the spellings of OGC CRS84.
var crs84 = regexp.MustCompile(`(?i)^(?:urn:ogc:def:crs:OGC:[0-9.]*:|https?://www\.opengis\.net/def/crs/OGC/[0-9.]+/|OGC:)?CRS84$`)

// ParseCRS returns the system named by s ("EPSG:32632",
// "urn:ogc:def:crs:EPSG::32632", ...), or an error listing what is
// supported.
func ParseCRS(s string) (*CRS, error) {
	s = strings.TrimSpace(s)
	if crs84.MatchString(s) {
		return &CRS{Code: "OGC:CRS84", Name: "WGS 84 longitude/latitude"}, nil
	}
	m := crsCode.FindStringSubmatch(s)
	if m == nil {
		return nil, fmt.Errorf("coordinate reference system %q is not an EPSG code (write EPSG:NNNN; supported: %s)", s, SupportedCRS)
	}
	code, err := strconv.Atoi(m[1])
	if err != nil {
		return nil, fmt.Errorf("coordinate reference system %q: bad code", s)
	}
	if c := epsg(code); c != nil {
		return c, nil
	}
	return nil, fmt.Errorf("coordinate reference system EPSG:%d is not supported (supported: %s; convert other grids to one of these or to WGS84 longitude/latitude first)", code, SupportedCRS)
}

// tmGrid is the transverse Mercator definition of a national grid.
type tmGrid struct {
	name                   string
	lon0, lat0, k0, fe, fn float64
}

// nationalGrids are the supported grids other than the UTM zones, all on
// GRS80 (parameters: see the file comment).
var nationalGrids = map[int]tmGrid{
	4647: {"ETRS89 / UTM zone 32N (zE-N)", 9, 0, 0.9996, 32500000, 0},
	5650: {"ETRS89 / UTM zone 33N (zE-N)", 15, 0, 0.9996, 33500000, 0},
	3006: {"SWEREF99 TM", 15, 0, 0.9996, 500000, 0},
	3067: {"ETRS89 / TM35FIN(E,N)", 27, 0, 0.9996, 500000, 0},
	2193: {"NZGD2000 / New Zealand Transverse Mercator 2000", 173, 0, 0.9996, 1600000, 10000000},
	2180: {"ETRS89 / Poland CS92", 19, 0, 0.9993, 500000, -5300000},
	3763: {"ETRS89 / Portugal TM06", -(8 + 7.0/60 + 59.19/3600), 39 + 40.0/60 + 5.73/3600, 1, 0, 0},
}

// epsg returns the definition of a supported EPSG code, else nil.
func epsg(code int) *CRS {
	c := &CRS{Code: "EPSG:" + strconv.Itoa(code)}
	utm := func(name string, e planar.Ellipsoid, zone int, fn float64) {
		c.Name = fmt.Sprintf(name, zone)
		c.TM = planar.NewTransverseMercator(e, float64(6*zone-183), 0, 0.9996, 500000, fn)
	}
	switch {
	case code == 4326:
		c.Name = "WGS 84 longitude/latitude"
	case code == 4258:
		c.Name = "ETRS89 longitude/latitude"
	case code >= 32601 && code <= 32660:
		utm("WGS 84 / UTM zone %dN", planar.WGS84, code-32600, 0)
	case code >= 32701 && code <= 32760:
		utm("WGS 84 / UTM zone %dS", planar.WGS84, code-32700, 10000000)
	case code >= 25828 && code <= 25838:
		utm("ETRS89 / UTM zone %dN", GRS80, code-25800, 0)
	default:
		g, ok := nationalGrids[code]
		if !ok {
			return nil
		}
		c.Name = g.name
		c.TM = planar.NewTransverseMercator(GRS80, g.lon0, g.lat0, g.k0, g.fe, g.fn)
	}
	return c
}

// toLonLat converts one position of the system to WGS84 longitude and
// latitude, or says why it cannot.
func (c *CRS) toLonLat(x, y float64) (orb.Point, string) {
	if c.TM == nil {
		if err := planar.ValidLonLat(x, y); err != nil {
			return orb.Point{}, fmt.Sprintf("%v (%s: x is the longitude, y the latitude)", err, c.Label())
		}
		return orb.Point{x, y}, ""
	}
	fe, _ := c.TM.FalseOrigin()
	if math.Abs(x-fe) > crsMaxEastOffset {
		return orb.Point{}, fmt.Sprintf("easting %s m is %.0f km from the false easting %.0f m of %s: not a position of that grid", fmtMetres(x), math.Abs(x-fe)/1000, fe, c.Label())
	}
	lon, lat := c.TM.Inverse(x, y)
	bx, by := c.TM.Forward(lon, lat)
	beyondPole := math.Abs(math.Remainder(lon-c.TM.CentralMeridian(), 360)) > 90
	if math.IsNaN(lon) || beyondPole || !(math.Hypot(bx-x, by-y) <= crsRoundTrip) {
		return orb.Point{}, fmt.Sprintf("easting %s, northing %s is not a position of %s (northing beyond the pole?)", fmtMetres(x), fmtMetres(y), c.Label())
	}
	return orb.Point{lon, lat}, ""
}

// gjCRS is the GeoJSON 2008 crs member.
type gjCRS struct {
	Type       string `json:"type"`
	Properties struct {
		Name string          `json:"name"`
		Code json.RawMessage `json:"code"`
	} `json:"properties"`
}

// fileCRS returns the system named by the crs member of a GeoJSON
// document (nil when it has none).
func fileCRS(src Source, raw json.RawMessage) (*CRS, error) {
	t := bytes.TrimSpace(raw)
	if len(t) == 0 || string(t) == "null" {
		return nil, nil
	}
	var m gjCRS
	if err := json.Unmarshal(t, &m); err != nil {
		return nil, errorf("%s: member \"crs\" is not a GeoJSON 2008 crs object: %s", src.Name, short(string(t)))
	}
	name := m.Properties.Name
	if strings.EqualFold(m.Type, "EPSG") {
		name = "EPSG:" + strings.Trim(string(bytes.TrimSpace(m.Properties.Code)), `"`)
	} else if !strings.EqualFold(m.Type, "name") {
		return nil, errorf("%s: member \"crs\" of type %q is not supported (give {\"type\":\"name\",\"properties\":{\"name\":\"EPSG:NNNN\"}}, or convert to WGS84 longitude/latitude)", src.Name, m.Type)
	}
	c, err := ParseCRS(name)
	if err != nil {
		return nil, errorf("%s: member \"crs\": %v", src.Name, err)
	}
	return c, nil
}

// fmtMetres formats a grid coordinate in plain decimals.
func fmtMetres(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// short cuts a text for a message.
func short(s string) string {
	if len(s) > 60 {
		return s[:60] + "..."
	}
	return s
}

// sourceCRS decides the system of one input: the crs member of a GeoJSON
// file, else def (the --crs option) unless the file is CSV with lat/lon
// columns. nil means the input is read as Inputs.Planar says (WGS84
// longitude/latitude, or local metres).
func sourceCRS(src Source, def *CRS, planarInput bool) (*CRS, error) {
	f, err := detectFormat(src)
	if err != nil {
		return nil, err
	}
	if f == formatGeoJSON && bytes.Contains(src.Data, []byte(`"crs"`)) {
		var doc struct {
			CRS json.RawMessage `json:"crs"`
		}
		if err := json.Unmarshal(src.Data, &doc); err != nil {
			return nil, jsonError(src, err)
		}
		c, err := fileCRS(src, doc.CRS)
		if err != nil {
			return nil, err
		}
		if c != nil {
			switch {
			case planarInput:
				return nil, errorf("%s: its \"crs\" member names %s, but --planar says local metres: drop --planar", src.Name, c.Label())
			case def != nil && def.Code != c.Code:
				return nil, errorf("%s: its \"crs\" member names %s, but --crs says %s: drop --crs or make them agree", src.Name, c.Label(), def.Code)
			case c.TM == nil:
				return nil, nil // longitude/latitude: the default
			}
			return c, nil
		}
	}
	if def == nil || f == formatGeoJSON && def.TM == nil || f == formatCSV && csvHasLatLon(src) {
		return nil, nil
	}
	return def, nil
}

// csvHasLatLon reports whether the CSV header names latitude and longitude
// columns (which are WGS84 whatever --crs says).
func csvHasLatLon(src Source) bool {
	line := src.Data
	if i := bytes.IndexByte(line, '\n'); i >= 0 {
		line = line[:i]
	}
	lat, lon := false, false
	for _, f := range bytes.FieldsFunc(line, func(r rune) bool { return r == ',' || r == ';' || r == '\t' }) {
		switch csvColumns[strings.ToLower(strings.Trim(strings.TrimSpace(string(f)), `"`))] {
		case "lat":
			lat = true
		case "lon":
			lon = true
		}
	}
	return lat && lon
}

// degreesInGrid refuses grid coordinates that look like degrees.
func (c *CRS) degreesInGrid(name string, pts []orb.Point) error {
	if c.TM == nil {
		return nil
	}
	if b, ok := looksLikeDegrees(pts); ok {
		return errorf("%s: %s coordinates are metres, but these span only %.3g × %.3g around x %.6g, y %.6g, as longitude/latitude degrees do: drop --crs (for x/y in degrees give --crs EPSG:4326)",
			name, c.Label(), b.Max[0]-b.Min[0], b.Max[1]-b.Min[1], b.Center()[0], b.Center()[1])
	}
	return nil
}

// convertSites converts the sites of one input to WGS84 longitude/latitude.
func (c *CRS) convertSites(name string, s *siteSet) error {
	if err := c.degreesInGrid(name, s.Pts); err != nil {
		return err
	}
	for i, p := range s.Pts {
		q, problem := c.toLonLat(p[0], p[1])
		if problem != "" {
			return errorf("%s %s: %s", name, s.label(i), problem)
		}
		s.Pts[i] = q
	}
	return nil
}

// convertPolys converts area polygons to WGS84 longitude/latitude.
func (c *CRS) convertPolys(name string, polys []areaPoly) error {
	var all []orb.Point
	for _, p := range polys {
		for _, r := range p.Rings {
			all = append(all, r...)
		}
	}
	if err := c.degreesInGrid(name, all); err != nil {
		return err
	}
	for i := range polys {
		p := &polys[i]
		p.CRS = c
		p.Grid = make([]orb.Ring, len(p.Rings))
		for k, r := range p.Rings {
			p.Grid[k] = slices.Clone(r)
		}
		for k, r := range p.Rings {
			for v, q := range r {
				ll, problem := c.toLonLat(q[0], q[1])
				if problem != "" {
					return errorf("%s ring %d vertex %d: %s", p.Where, k, v, problem)
				}
				r[v] = ll
			}
		}
	}
	return nil
}

// convertItems converts planning items to WGS84 longitude/latitude.
func (c *CRS) convertItems(name string, it *Items) error {
	if err := c.degreesInGrid(name, it.allVertices()); err != nil {
		return err
	}
	var bad string
	badAt := -1
	for i := range it.Pts {
		it.transformItem(i, func(x, y float64) (float64, float64) {
			q, problem := c.toLonLat(x, y)
			if problem != "" && badAt < 0 {
				bad, badAt = problem, i
			}
			return q[0], q[1]
		})
		if badAt >= 0 {
			return errorf("%s %s: %s", name, it.Where[badAt], bad)
		}
	}
	return nil
}
