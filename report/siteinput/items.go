// Loading the point inputs of the planning commands: candidate mounting
// spots (suggest --candidates) and demand points or polygons (assign
// --points).
//
// Both are read like --sites: GeoJSON Point and MultiPoint features (one
// item per position; a MultiPoint's positions are named "name#1", ...), or
// CSV with lat/lon (x/y with --planar), name and id columns. Demand may
// also be Polygon and MultiPolygon features (buildings, yards): each feature
// is one demand item, placed at a representative point of the polygon (of
// its largest part, for a MultiPolygon) by coverage.RepresentativePoint
// once projected — the area centroid when the polygon holds it, else a
// point on the polygon (point-on-surface, common GIS practice). Demand
// items may carry a weight (people, assets, load): the "weight" property
// (a JSON number) or a "weight" CSV column; it must be finite and ≥ 0, and
// an item without one weighs 1. Every message names the file and the
// feature index (0-based) or CSV line.
//
// Areas used to pick the largest part of a MultiPolygon are shoelace areas
// in the local plane (exact to rounding; the choice only matters between
// parts of different size).

package siteinput

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// Items are the items of a candidates or demand file, in file order; in a
// Scene every coordinate is in local metres.
type Items struct {
	// Pts holds one position per item. For a polygon item it is the
	// representative point of its largest part (coverage.RepresentativePoint).
	Pts []orb.Point
	// Names holds a name per item ("" for none).
	Names []string
	// Polys holds per item its polygon parts, rings as given (nil for a
	// point item).
	Polys []orb.MultiPolygon
	// Where names each item in messages ("feature 3", "line 7").
	Where []string
	// Weights holds one weight per item; nil when no item has a weight.
	Weights []float64
	// NumPolygons counts the polygon items.
	NumPolygons int
	// Ranges holds, for candidate spots, each spot's own range (m; 0 for a
	// spot without one); nil when no spot has one (candidate_ranges.go).
	Ranges []float64

	rangeSrc candidateRangeSource // range texts and types while reading
}

// pointKind says what a point file holds, for reading and messages.
type pointKind struct {
	// what is the plural noun used in messages ("candidate spots").
	what string
	// polygons allows Polygon and MultiPolygon items; weights reads the
	// weight property or column; ranges reads the range and type
	// (candidate_ranges.go).
	polygons, weights, ranges bool
}

var (
	candidateKind = pointKind{what: "candidate spots", ranges: true}
	demandKind    = pointKind{what: "demand points", polygons: true, weights: true}
	contextKind   = pointKind{what: "context features", polygons: true}
)

// expected is the geometry list of the messages.
func (k pointKind) expected() string {
	if k.polygons {
		return "Point, MultiPoint, Polygon or MultiPolygon (" + k.what + " are points or polygons)"
	}
	return "Point or MultiPoint (" + k.what + " are points)"
}

// loadItems reads a candidates or demand file.
func loadItems(src Source, planarInput bool, kind pointKind) (*Items, error) {
	f, err := detectFormat(src)
	if err != nil {
		return nil, err
	}
	var it *Items
	if f == formatGeoJSON {
		it, err = pointItemsFromGeoJSON(src, planarInput, kind)
	} else {
		var s *siteSet
		var w []float64
		s, w, err = pointsFromCSV(src, planarInput, kind.weights)
		if err == nil {
			it = &Items{Pts: s.Pts, Names: s.Names, Polys: make([]orb.MultiPolygon, len(s.Pts)), Weights: w}
			it.Where = make([]string, len(s.Pts))
			for i := range it.Where {
				it.Where[i] = fmt.Sprintf("line %d", s.Src[i])
			}
			if kind.ranges {
				it.rangeSrc = candidateRangeSource{ranges: s.Ranges, types: s.Types}
			}
		}
	}
	if err != nil {
		return nil, err
	}
	if len(it.Pts) == 0 {
		what := "no Point or MultiPoint features"
		if kind.polygons {
			what = "no Point, MultiPoint, Polygon or MultiPolygon features"
		}
		if f == formatCSV {
			what = "a header but no data lines"
		}
		return nil, errorf("%s: no %s (%s)", src.Name, kind.what, what)
	}
	return it, nil
}

func pointItemsFromGeoJSON(src Source, planarInput bool, kind pointKind) (*Items, error) {
	feats, err := decodeGeoJSON(src)
	if err != nil {
		return nil, err
	}
	it := &Items{}
	weighted := false
	for i := range feats {
		f := &feats[i]
		where := fmt.Sprintf("feature %d", i)
		if f.Geometry == nil {
			return nil, errorf("%s %s: no geometry (null), expected %s", src.Name, where, kind.expected())
		}
		props := featureProps(f)
		name := featureName(props, f.ID)
		w := 1.0
		if kind.weights {
			var ok bool
			if w, ok, err = jsonWeight(props.Weight); err != nil {
				return nil, errorf("%s %s: %v", src.Name, where, err)
			}
			weighted = weighted || ok
		}
		rangeText, typ := "", ""
		if kind.ranges {
			var ok bool
			if rangeText, ok = jsonLength(props.Range); !ok {
				return nil, errorf("%s %s: range %s is not a length (give metres as a number, or a string such as \"150m\")", src.Name, where, shortJSON(props.Range))
			}
			typ = jsonText(props.Type)
		}
		n0 := len(it.Pts)
		if err := it.addGeometry(src, where, f.Geometry, name, planarInput, kind); err != nil {
			return nil, err
		}
		for range len(it.Pts) - n0 {
			it.Weights = append(it.Weights, w)
			if kind.ranges {
				it.rangeSrc.ranges = append(it.rangeSrc.ranges, rangeText)
				it.rangeSrc.types = append(it.rangeSrc.types, typ)
			}
		}
	}
	if !weighted {
		it.Weights = nil
	}
	// A property counts as a range or type source when some feature has
	// it (as for sites: addRangeType).
	for _, p := range []*[]string{&it.rangeSrc.ranges, &it.rangeSrc.types} {
		if !slices.ContainsFunc(*p, func(v string) bool { return v != "" }) {
			*p = nil
		}
	}
	return it, nil
}

func (it *Items) add(p orb.Point, name, where string, poly orb.MultiPolygon) {
	it.Pts = append(it.Pts, p)
	it.Names = append(it.Names, name)
	it.Polys = append(it.Polys, poly)
	it.Where = append(it.Where, where)
	if poly != nil {
		it.NumPolygons++
	}
}

func (it *Items) addGeometry(src Source, where string, g *gjGeometry, name string, planarInput bool, kind pointKind) error {
	switch g.Type {
	case "Point", "MultiPoint":
		if g.Type == "Point" {
			if x, y, ok := fastPosition(g.Coordinates); ok && coordProblem(planarInput, x, y) == "" {
				it.add(orb.Point{x, y}, name, where, nil)
				return nil
			}
		}
		return pointGeometry(src, where, g, name, planarInput, func(p orb.Point, label, name string) {
			it.add(p, name, where+label, nil)
		})
	case "Polygon", "MultiPolygon":
		if !kind.polygons {
			break
		}
		polys, err := polygonsOf(src.Name+" "+where, g, planarInput)
		if err != nil {
			return err
		}
		mp := make(orb.MultiPolygon, len(polys))
		for k, p := range polys {
			mp[k] = orb.Polygon(p.Rings)
		}
		// The position is set by finish, after projection.
		it.add(orb.Point{math.NaN(), math.NaN()}, name, where, mp)
		return nil
	case "GeometryCollection":
		for k := range g.Geometries {
			if err := it.addGeometry(src, fmt.Sprintf("%s geometry %d", where, k), &g.Geometries[k], name, planarInput, kind); err != nil {
				return err
			}
		}
		return nil
	case "":
		return errorf("%s %s: geometry has no \"type\"", src.Name, where)
	}
	return errorf("%s %s: geometry type %s, expected %s", src.Name, where, g.Type, kind.expected())
}

// allVertices returns every input position of the items (points and
// polygon vertices), for fitting the local plane.
func (it *Items) allVertices() []orb.Point {
	var out []orb.Point
	for i, p := range it.Pts {
		if it.Polys[i] == nil {
			out = append(out, p)
			continue
		}
		for _, poly := range it.Polys[i] {
			for _, r := range poly {
				out = append(out, r...)
			}
		}
	}
	return out
}

// transform maps every position and vertex in place.
func (it *Items) transform(f func(x, y float64) (float64, float64)) {
	for i := range it.Pts {
		it.transformItem(i, f)
	}
}

// transformItem maps the position of item i, or the vertices of its
// polygon, in place.
func (it *Items) transformItem(i int, f func(x, y float64) (float64, float64)) {
	if it.Polys[i] == nil {
		x, y := f(it.Pts[i][0], it.Pts[i][1])
		it.Pts[i] = orb.Point{x, y}
		return
	}
	for _, poly := range it.Polys[i] {
		for _, r := range poly {
			for k, q := range r {
				x, y := f(q[0], q[1])
				r[k] = orb.Point{x, y}
			}
		}
	}
}

// finish sets the position of every polygon item to the representative
// point of its largest part (in the local plane).
func (it *Items) finish(file string) error {
	for i, mp := range it.Polys {
		if mp == nil {
			continue
		}
		best, bestArea := 0, -1.0
		for k, poly := range mp {
			if a := polygonArea(poly); a > bestArea {
				best, bestArea = k, a
			}
		}
		p, err := coverage.RepresentativePoint(mp[best])
		if err != nil {
			part := ""
			if len(mp) > 1 {
				part = fmt.Sprintf(" polygon %d", best)
			}
			return errorf("%s %s%s: %s: not a usable building outline", file, it.Where[i], part, strings.TrimPrefix(err.Error(), "coverage: "))
		}
		it.Pts[i] = p
	}
	return nil
}

// polygonArea is the shoelace area of the exterior less the holes.
func polygonArea(p orb.Polygon) float64 {
	a := 0.0
	for k, r := range p {
		ra := math.Abs(planar.RingArea(planar.FlatRing(r)))
		if k == 0 {
			a += ra
		} else {
			a -= ra
		}
	}
	return a
}

// jsonWeight decodes the "weight" property: absent or null gives 1 and
// ok false; otherwise a JSON number, finite and ≥ 0.
func jsonWeight(raw json.RawMessage) (w float64, ok bool, err error) {
	t := bytes.TrimSpace(raw)
	if len(t) == 0 || string(t) == "null" {
		return 1, false, nil
	}
	if err := json.Unmarshal(t, &w); err != nil {
		return 0, false, fmt.Errorf("property \"weight\" must be a number ≥ 0, got %s", t)
	}
	if p := weightProblem(w); p != "" {
		return 0, false, fmt.Errorf("property \"weight\": %s", p)
	}
	return w, true, nil
}

// weightProblem checks one weight; "" when usable.
func weightProblem(w float64) string {
	switch {
	case math.IsNaN(w) || math.IsInf(w, 0):
		return fmt.Sprintf("weight %v is not a finite number", w)
	case w < 0:
		return fmt.Sprintf("weight %s is negative; weights must be ≥ 0", fmtCoord(w))
	}
	return ""
}
