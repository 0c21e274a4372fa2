// From input files to a scene in the local plane: sites in metres, the site
// area as a planar.Region, the planning inputs, warnings and a title.
//
// Geographic input is projected with planar.NewLocalPlane, a WGS84
// transverse Mercator (Krüger series, Karney 2011) centred on the bounding
// box of the sites AND the area, k₀ = 1. The largest point-scale error
// |k − 1| over that box is measured (TransverseMercator.MaxScaleError) and
// must not exceed planar.MaxLocalScaleError = 0.1%: lengths in the plane
// are then true to 0.1% and areas to 0.2% at worst (both are far smaller
// for a site of a few km: |k − 1| ≈ x²/2R² is 1.2e-8 at 1 km from the
// central meridian). Larger extents are refused (planar.CheckExtent).
//
// With no area the site area is the convex hull of the sites
// (planar.ConvexHull: exact, collinear hull vertices dropped).

package siteinput

import (
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// Inputs names the inputs of a run. Every input shares one coordinate kind:
// WGS84 longitude/latitude degrees, or local metres when Planar is true.
type Inputs struct {
	// Sites holds the device sites (GeoJSON Point/MultiPoint, or CSV).
	Sites Source
	// Area holds the site area (GeoJSON Polygon/MultiPolygon); nil: the
	// convex hull of the sites.
	Area *Source
	// Exclude holds zones that need no coverage: every polygon in it is
	// cut out of the area, whatever its "exclude" property. It needs Area.
	Exclude *Source
	// Candidates holds candidate mounting spots (points); nil when none.
	Candidates *Source
	// Points holds demand points or polygons, optionally weighted; nil
	// when none.
	Points *Source
	// Context is an optional drawing-only layer (buildings, paths): points
	// or polygons shown on the maps under the coverage, never analysed.
	Context *Source
	// Planar is true when the coordinates are local metres (x, y), not
	// longitude/latitude.
	Planar bool
	// CRS names the coordinate reference system ("EPSG:32632", see
	// ParseCRS) of every CSV input without lat/lon columns and every
	// GeoJSON input without a "crs" member; "" for WGS84
	// longitude/latitude. It excludes Planar.
	CRS string
	// OutCRS asks for a copy of the layers in a projected system
	// (outcrs.go): "input" for the inputs' own, or an EPSG code; "" for
	// none.
	OutCRS string
	// Range is the common range (m) of the devices without one of their
	// own (--range); 0 when not given.
	Range float64
	// TypeRanges is a table of ranges per device type (--type-range or
	// --range-table); nil when not given. See ranges.go.
	TypeRanges *TypeRanges
	// RangeRequired makes Load return ErrNoRange when no source gives a
	// range (the commands that need one).
	RangeRequired bool
}

// Scene is the inputs in the local plane, ready for package coverage.
type Scene struct {
	// Sites holds the site positions in local metres, in input order: the
	// index of a site here is its input index (0-based order in the file;
	// a MultiPoint gives one site per position). Exact repeats are kept.
	Sites []orb.Point
	// Names holds a name per site ("" for none), by input index.
	Names []string
	// Ranges holds each device's range (m) by input index; nil when every
	// device has the same range, Range (see ranges.go).
	Ranges []float64
	// Range is the common range (m) when Ranges is nil (0 when no source
	// gave one); with Ranges, Inputs.Range (0 when not given).
	Range float64
	// Types holds each device's type ("" for none) by input index; nil
	// when the sites have no type column or property.
	Types []string
	// Attributes are the sites' own attributes (every column or property
	// sitecover does not read itself; attributes.go), each with one value
	// per site by input index; nil when there are none.
	Attributes []Attribute
	// Region is the site area with its holes (zones that need no
	// coverage).
	Region *planar.Region
	// AreaFromHull is true when no area was given and Region is the convex
	// hull of the sites.
	AreaFromHull bool
	// AreaNote says in one line what building the area merged or clipped
	// (e.g. "2 area polygons merged into 1; 1 exclusion clipped to the
	// area"); "" when the polygons were used as given.
	AreaNote string
	// Projection maps longitude/latitude to the local plane
	// (Projection.Forward) and back (Projection.Inverse); nil for planar
	// input.
	Projection *planar.TransverseMercator
	// MaxScaleError is the largest point-scale error |k − 1| of Projection
	// over the inputs' bounding box (0 for planar input).
	MaxScaleError float64
	// Candidates and Demand are the planning inputs in local metres (nil
	// when not given).
	Candidates, Demand *Items
	// Context is the drawing-only context layer in local metres (nil
	// without Inputs.Context).
	Context *Items
	// Title is the name of the first area polygon to cover that has one,
	// else the sites file's base name without its extension.
	Title string
	// Warnings are problems that do not stop a run: an input that was not
	// UTF-8 and was decoded (see decodeText), sites outside the area, repeated sites, exclusion zones that were ignored or dropped.
	Warnings []string
	// EdgeAreaError bounds the relative difference between the area of
	// the densified, projected area polygons and the area of the polygons
	// the files mean, whose edges are straight in longitude/latitude (RFC
	// 7946 §3.1.1) or in the input's grid (densify.go); 0 for planar input
	// and for the convex hull.
	EdgeAreaError float64
	// AreaRelError bounds the relative difference between the site area in
	// the local plane and its area on the WGS84 ellipsoid: (1 + m)² − 1 for
	// the point scale k within 1 ± m (m = MaxScaleError) plus
	// EdgeAreaError. 0 for planar input.
	AreaRelError float64
	edgeArea     float64 // the absolute bound behind EdgeAreaError, m²
	inputCRS     *CRS    // the first projected system of the inputs
	// OutCRS is the projected system the layers are also written in
	// (Inputs.OutCRS); nil for none.
	OutCRS *CRS
	// Converted says which inputs were converted from a projected system
	// to WGS84 longitude/latitude, e.g. "sites.csv: EPSG:32632 (WGS 84 /
	// UTM zone 32N) converted to WGS84 longitude/latitude".
	Converted []string
	// Timings holds the wall time of reading, projecting and building the
	// area.
	Timings []coverage.Timing
}

// Load reads, checks and projects the inputs. Every problem with the data
// is an *Error naming the file and the place in it.
func Load(in Inputs) (*Scene, error) {
	t0 := time.Now()
	if !in.Planar {
		for _, src := range []*Source{&in.Sites, in.Area, in.Exclude, in.Candidates, in.Points, in.Context} {
			if src != nil && src.LocalLayer != "" {
				return nil, errorf("%s: layer %s has local coordinates (undefined Cartesian system), not longitude/latitude: add --planar", src.Name, src.LocalLayer)
			}
		}
	}
	textWarn, err := decodeInputs(&in)
	if err != nil {
		return nil, err
	}
	sc := &Scene{Warnings: textWarn}
	sites, polys, err := sc.read(in)
	if err != nil {
		return nil, err
	}
	if err := sc.resolveOutCRS(in, sc.inputCRS, sites.Pts); err != nil {
		return nil, err
	}
	sc.Title = defaultTitle(in, polys)
	sc.Timings = append(sc.Timings, coverage.Timing{Phase: "read inputs", Seconds: time.Since(t0).Seconds()})

	t1 := time.Now()
	sc.Sites = sites.Pts
	if in.Planar {
		if err := degreesInPlanar(inputFiles(in), allInputPoints(sc, sites, polys)); err != nil {
			return nil, err
		}
	} else {
		if err := sc.project(in, sites, polys); err != nil {
			return nil, err
		}
		sc.Timings = append(sc.Timings, coverage.Timing{Phase: "project", Seconds: time.Since(t1).Seconds()})
	}
	if err := tooSmall(inputFiles(in), sc, polys); err != nil {
		return nil, err
	}
	if sc.Demand != nil {
		if err := sc.Demand.finish(in.Points.Name); err != nil {
			return nil, err
		}
	}

	t2 := time.Now()
	repeats := startRepeats(sc.Sites, sites.Names)
	var region *planar.Region
	if len(polys) == 0 {
		hull := planar.ConvexHull(sc.Sites)
		if len(hull) < 3 {
			return nil, errorf("%s: the sites are all on one line (or fewer than 3 distinct), so they enclose no area: give the site area with --area", in.Sites.Name)
		}
		if err := sliverHull(in.Sites.Name, hull, sc.Sites); err != nil {
			return nil, err
		}
		if region, err = planar.NewRegion(orb.MultiPolygon{{hull}}); err != nil {
			return nil, errorf("%s: convex hull of the sites: %v", in.Sites.Name, err)
		}
		sc.AreaFromHull = true
	} else {
		var warn []string
		region, sc.AreaNote, warn, err = buildArea(polys)
		if err != nil {
			return nil, err
		}
		sc.Warnings = append(sc.Warnings, warn...)
	}
	if !sc.AreaFromHull {
		if err := tinyArea(inputFiles(in), region.Area(), sc.Sites); err != nil {
			return nil, err
		}
	}
	if sc.Projection != nil {
		if a := region.Area(); a > 0 {
			sc.EdgeAreaError = sc.edgeArea / a
		}
		m := sc.MaxScaleError
		sc.AreaRelError = (1+m)*(1+m) - 1 + sc.EdgeAreaError
	}
	sc.Region = region
	sc.Warnings = append(sc.Warnings, siteWarnings(sc.Sites, sites.Names, region, repeats)...)
	sc.Timings = append(sc.Timings, coverage.Timing{Phase: "build area", Seconds: time.Since(t2).Seconds()})
	return sc, nil
}

// read reads every input, each in its own coordinate system (see crs.go),
// converting projected ones to WGS84 longitude/latitude; it sets the
// scene's names, planning items and Converted.
func (sc *Scene) read(in Inputs) (*siteSet, []areaPoly, error) {
	var err error
	var def *CRS
	if strings.TrimSpace(in.CRS) != "" {
		if in.Planar {
			return nil, nil, errorf("--crs names a coordinate reference system, --planar says local metres: give one of them")
		}
		if def, err = ParseCRS(in.CRS); err != nil {
			return nil, nil, errorf("--crs: %v", err)
		}
	}
	system := func(src Source) (*CRS, bool, error) {
		c, err := sourceCRS(src, def, in.Planar)
		if c != nil {
			sc.Converted = append(sc.Converted, src.Name+": "+c.Label()+" converted to WGS84 longitude/latitude")
			if sc.inputCRS == nil {
				sc.inputCRS = c
			}
		}
		return c, in.Planar || c != nil, err
	}
	c, metric, err := system(in.Sites)
	if err != nil {
		return nil, nil, err
	}
	sites, err := loadSites(in.Sites, metric)
	if err != nil {
		return nil, nil, err
	}
	if c != nil {
		if err := c.convertSites(in.Sites.Name, sites); err != nil {
			return nil, nil, err
		}
	}
	sc.Names = sites.Names
	sc.Attributes = sites.attrs.finish(len(sites.Pts))
	if err := sc.resolveRanges(in, sites); err != nil {
		return nil, nil, err
	}
	var polys []areaPoly
	for _, a := range []struct {
		src     *Source
		exclude bool
	}{{in.Area, false}, {in.Exclude, true}} {
		if a.src == nil {
			continue
		}
		if in.Area == nil {
			return nil, nil, errorf("--exclude needs --area: exclusion zones are cut out of a given area")
		}
		c, metric, err := system(*a.src)
		if err != nil {
			return nil, nil, err
		}
		p, err := loadArea(*a.src, metric, a.exclude)
		if err != nil {
			return nil, nil, err
		}
		if c != nil {
			if err := c.convertPolys(a.src.Name, p); err != nil {
				return nil, nil, err
			}
		}
		polys = append(polys, p...)
	}
	for _, it := range []struct {
		src  *Source
		dst  **Items
		kind pointKind
	}{{in.Candidates, &sc.Candidates, candidateKind}, {in.Points, &sc.Demand, demandKind}, {in.Context, &sc.Context, contextKind}} {
		if it.src == nil {
			continue
		}
		c, metric, err := system(*it.src)
		if err != nil {
			return nil, nil, err
		}
		if *it.dst, err = loadItems(*it.src, metric, it.kind); err != nil {
			return nil, nil, err
		}
		if it.kind.ranges {
			if err := (*it.dst).resolveCandidateRanges(it.src.Name, (*it.dst).rangeSrc, in.TypeRanges); err != nil {
				return nil, nil, err
			}
		}
		if c != nil {
			if err := c.convertItems(it.src.Name, *it.dst); err != nil {
				return nil, nil, err
			}
		}
	}
	return sites, polys, nil
}

// decodeInputs makes every input valid UTF-8 (decodeText) and returns the
// warnings about the inputs that had to be decoded.
func decodeInputs(in *Inputs) ([]string, error) {
	var warn []string
	decode := func(s Source) (Source, error) {
		d, w, err := decodeText(s)
		if w != "" {
			warn = append(warn, w)
		}
		return d, err
	}
	var err error
	if in.Sites, err = decode(in.Sites); err != nil {
		return nil, err
	}
	// The optional inputs are copied, never changed where the caller
	// keeps them.
	for _, p := range []**Source{&in.Area, &in.Exclude, &in.Candidates, &in.Points, &in.Context} {
		if *p == nil {
			continue
		}
		d, err := decode(**p)
		if err != nil {
			return nil, err
		}
		*p = &d
	}
	return warn, nil
}

// project fits the local plane to every input, checks its scale error and
// replaces all coordinates by plane metres.
func (sc *Scene) project(in Inputs, sites *siteSet, polys []areaPoly) error {
	all := allInputPoints(sc, sites, polys)
	files := inputFiles(in)
	b, err := planar.LonLatBound(all)
	if err != nil {
		return errorf("%s: %v", files, err)
	}
	tm, err := planar.NewLocalPlane(all)
	if err != nil {
		return errorf("%s: %v", files, err)
	}
	if err := tm.CheckExtent(b); err != nil {
		if far, n := farInputs(in.Sites.Name, sites, polys); n > 0 {
			them := "it"
			if n > 1 {
				them = "them"
			}
			return errorf("%s; correct or remove %s (with %[2]s the inputs span an %s)", far, them,
				strings.TrimSuffix(extentMessage(tm, b), "; split the site"))
		}
		return errorf("%s: %s", files, extentMessage(tm, b))
	}
	sc.MaxScaleError = tm.MaxScaleError(b)
	sc.Projection = tm
	f := newLonFrame(tm, b)
	pts := make([]orb.Point, len(sites.Pts))
	planar.ParallelFor(len(pts), 1<<14, func(lo, hi int) {
		for i, p := range sites.Pts[lo:hi] {
			x, y := f.forward(p[0], p[1])
			pts[lo+i] = orb.Point{x, y}
		}
	})
	sc.Sites = pts
	sc.edgeArea = densifyPolys(polys, f)
	for _, it := range []*Items{sc.Candidates, sc.Demand, sc.Context} {
		if it != nil {
			it.transform(f.forward)
		}
	}
	return nil
}

// allInputPoints returns every input position: sites, area vertices and
// the planning items' points and vertices.
func allInputPoints(sc *Scene, sites *siteSet, polys []areaPoly) []orb.Point {
	all := make([]orb.Point, 0, len(sites.Pts)+64)
	all = append(all, sites.Pts...)
	for _, p := range polys {
		for _, r := range p.Rings {
			all = append(all, r...)
		}
	}
	for _, it := range []*Items{sc.Candidates, sc.Demand} {
		if it != nil {
			all = append(all, it.allVertices()...)
		}
	}
	return all
}

// inputFiles lists the names of the given inputs, for messages about all
// of them.
func inputFiles(in Inputs) string {
	files := in.Sites.Name
	for _, s := range []*Source{in.Area, in.Exclude, in.Candidates, in.Points, in.Context} {
		if s != nil {
			files += ", " + s.Name
		}
	}
	return files
}

// meanRadiusKm is the IUGG mean Earth radius R₁ (Moritz, "Geodetic
// Reference System 1980", Bulletin Géodésique 1980), used only to state an
// extent in km in a message.
const meanRadiusKm = 6371.0088

// extentMessage says why an extent is refused, in the form
// "area too large for one local plane: scale error 0.23% over 410 km ×
// 380 km; split the site".
func extentMessage(tm *planar.TransverseMercator, b orb.Bound) string {
	m := tm.MaxScaleError(b)
	w := b.Max[0] - b.Min[0]
	if w < 0 {
		w += 360 // across the antimeridian (planar.LonLatBound)
	}
	h := b.Max[1] - b.Min[1]
	latNear := 0.0 // the parallel nearest the equator is the widest
	if b.Min[1] > 0 {
		latNear = b.Min[1]
	} else if b.Max[1] < 0 {
		latNear = b.Max[1]
	}
	ew := w * math.Pi / 180 * meanRadiusKm * math.Cos(latNear*math.Pi/180)
	ns := h * math.Pi / 180 * meanRadiusKm
	scale := "unbounded (the extent reaches 90° from the central meridian)"
	if !math.IsInf(m, 0) {
		scale = fmt.Sprintf("%.2g%%", 100*m)
	}
	return fmt.Sprintf("area too large for one local plane: scale error %s over %.0f km × %.0f km (limit %.1f%%); split the site",
		scale, ew, ns, 100*planar.MaxLocalScaleError)
}

// defaultTitle is the area's first name, else the sites file's base name.
func defaultTitle(in Inputs, polys []areaPoly) string {
	for _, p := range polys {
		if !p.Exclude && p.Name != "" {
			return p.Name
		}
	}
	base := filepath.Base(in.Sites.Name)
	return strings.TrimSuffix(base, filepath.Ext(base))
}

// siteWarnings reports sites outside the area (they still serve it) and
// sites at exactly the position of an earlier one (they share its service
// area), listing up to five of each. The repeats are looked for beside
// the area's construction (startRepeats), the outside sites in parallel
// parts.
func siteWarnings(sites []orb.Point, names []string, region *planar.Region, repeats <-chan string) []string {
	var warn []string
	if w := outsideWarning(sites, names, region); w != "" {
		warn = append(warn, w)
	}
	if w := <-repeats; w != "" {
		warn = append(warn, w)
	}
	return warn
}

// warnList joins up to five labels, saying how many more there are.
func warnList(idx []string, total int) string {
	s := strings.Join(idx, ", ")
	if total > len(idx) {
		s += fmt.Sprintf(" and %d more", total-len(idx))
	}
	return s
}

// outsideWarning reports the sites outside the area, or "". The sites are
// tested in parallel parts; the first five outside, in input order, are
// named.
func outsideWarning(sites []orb.Point, names []string, region *planar.Region) string {
	ix := region.Index()
	const chunk = 1 << 16
	parts := (len(sites) + chunk - 1) / chunk
	count := make([]int, parts)
	first := make([][]int, parts)
	planar.ParallelChunks(len(sites), chunk, 0, func(ci, lo, hi int) {
		for i := lo; i < hi; i++ {
			if p := sites[i]; !ix.Contains(p[0], p[1]) {
				count[ci]++
				if len(first[ci]) < 5 {
					first[ci] = append(first[ci], i)
				}
			}
		}
	})
	nOut := 0
	var outside []string
	for ci := range parts {
		nOut += count[ci]
		for _, i := range first[ci] {
			if len(outside) < 5 {
				outside = append(outside, DeviceLabel(names, i))
			}
		}
	}
	if nOut == 0 {
		return ""
	}
	return fmt.Sprintf("%d of %d sites lie outside the area (their disks still count where they reach in): %s",
		nOut, len(sites), warnList(outside, nOut))
}

// startRepeats looks for sites at the position of an earlier one in a
// goroutine of its own and sends the warning (or "") on the channel it
// returns.
func startRepeats(sites []orb.Point, names []string) <-chan string {
	out := make(chan string, 1)
	go func() { out <- repeatWarning(sites, names) }()
	return out
}

// repeatWarning reports the sites at exactly the position of an earlier
// one, or "".
func repeatWarning(sites []orb.Point, names []string) string {
	label := func(i int) string { return DeviceLabel(names, i) }
	var dups []string
	nDup := 0
	planar.Repeats(sites, func(i, j int) {
		nDup++
		if len(dups) < 5 {
			a, b := label(i), label(j)
			if a == b { // two devices of one name: tell them apart by input position
				a, b = fmt.Sprintf("%s (#%d)", a, i+1), fmt.Sprintf("%s (#%d)", b, j+1)
			}
			dups = append(dups, a+" = "+b)
		}
	})
	if nDup == 0 {
		return ""
	}
	what := "sites repeat the exact position of an earlier site and share its service area"
	if nDup == 1 {
		what = "site repeats the exact position of an earlier site and shares its service area"
	}
	return fmt.Sprintf("%d %s: %s", nDup, what, warnList(dups, nDup))
}

// DeviceLabel returns how every text output and map names input site i
// (0-based): its own label names[i] or, when it has none, "#n" with n =
// i+1, its position in the input (the first site is #1).
func DeviceLabel(names []string, i int) string {
	if i >= 0 && i < len(names) && names[i] != "" {
		return names[i]
	}
	return "#" + strconv.Itoa(i+1)
}
