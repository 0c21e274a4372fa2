// From input files to a scene in the local plane: sites in metres, the site
// area as a planar.Region, and the report metadata.
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
// With no --area the site area is the convex hull of the sites
// (planar.ConvexHull: exact, collinear hull vertices dropped).

package main

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report"
)

// sceneInputs names the inputs of a run.
type sceneInputs struct {
	sites   source
	area    *source // nil: use the sites' convex hull
	exclude *source // nil: none
	planar  bool
	// candidates and points are the planning inputs (suggest
	// --candidates, assign --points); nil when not given.
	candidates, points *source
}

// scene is a run's input in the local plane.
type scene struct {
	sites  []orb.Point
	region *planar.Region
	meta   report.Meta
	// candidates and demand are the planning inputs in the local plane
	// (nil when not given).
	candidates, demand *pointItems
}

// validLonLat is the geometry kernel's own coordinate check, applied after
// the command's more specific messages (see coordProblem).
func validLonLat(lon, lat float64) error { return planar.ValidLonLat(lon, lat) }

// loadScene reads, checks and projects the inputs.
func loadScene(in sceneInputs) (*scene, error) {
	t0 := time.Now()
	sites, err := loadSites(in.sites, in.planar)
	if err != nil {
		return nil, err
	}
	var polys []areaPoly
	if in.area != nil {
		p, err := loadArea(*in.area, in.planar, false)
		if err != nil {
			return nil, err
		}
		polys = append(polys, p...)
	}
	if in.exclude != nil {
		p, err := loadArea(*in.exclude, in.planar, true)
		if err != nil {
			return nil, err
		}
		if in.area == nil {
			return nil, usageErrorf("--exclude needs --area: exclusion zones are cut out of a given area")
		}
		polys = append(polys, p...)
	}
	sc := &scene{}
	if in.candidates != nil {
		if sc.candidates, err = loadPoints(*in.candidates, in.planar, candidateKind); err != nil {
			return nil, err
		}
	}
	if in.points != nil {
		if sc.demand, err = loadPoints(*in.points, in.planar, demandKind); err != nil {
			return nil, err
		}
	}
	m := &sc.meta
	m.SitesFile = in.sites.name
	if in.area != nil {
		m.AreaFile = in.area.name
	}
	if in.exclude != nil {
		m.ExcludeFile = in.exclude.name
	}
	if in.candidates != nil {
		m.CandidatesFile = in.candidates.name
	}
	if in.points != nil {
		m.PointsFile = in.points.name
	}
	m.SiteNames = sites.Names
	m.Planar = in.planar
	m.Title = defaultTitle(in, polys)
	m.Timings = append(m.Timings, coverage.Timing{Phase: "read inputs", Seconds: time.Since(t0).Seconds()})

	t1 := time.Now()
	sc.sites = sites.Pts
	if !in.planar {
		if err := sc.project(in, sites, polys); err != nil {
			return nil, err
		}
		m.Timings = append(m.Timings, coverage.Timing{Phase: "project", Seconds: time.Since(t1).Seconds()})
	}
	if sc.demand != nil {
		if err := sc.demand.finish(in.points.name); err != nil {
			return nil, err
		}
	}

	t2 := time.Now()
	var mp orb.MultiPolygon
	var names [][]string
	if len(polys) == 0 {
		hull := planar.ConvexHull(sc.sites)
		if len(hull) < 3 {
			return nil, inputErrorf("%s: the sites are all on one line (or fewer than 3 distinct), so they enclose no area: give the site area with --area", in.sites.name)
		}
		mp = orb.MultiPolygon{{hull}}
		names = [][]string{{in.sites.name + ": convex hull of the sites"}}
		m.AreaFromHull = true
	} else {
		var warn []string
		mp, names, warn, err = buildArea(polys)
		if err != nil {
			return nil, err
		}
		m.Warnings = append(m.Warnings, warn...)
	}
	region, err := planar.NewRegion(mp)
	if err != nil {
		return nil, regionError(err, names)
	}
	sc.region = region
	m.Warnings = append(m.Warnings, siteWarnings(sc.sites, sites.Names, region)...)
	m.Timings = append(m.Timings, coverage.Timing{Phase: "build area", Seconds: time.Since(t2).Seconds()})
	return sc, nil
}

// project fits the local plane to sites and area, checks its scale error
// and replaces all coordinates by plane metres.
func (sc *scene) project(in sceneInputs, sites *siteSet, polys []areaPoly) error {
	all := make([]orb.Point, 0, len(sites.Pts)+64)
	all = append(all, sites.Pts...)
	for _, p := range polys {
		for _, r := range p.Rings {
			all = append(all, r...)
		}
	}
	files := in.sites.name
	if in.area != nil {
		files += ", " + in.area.name
	}
	if in.exclude != nil {
		files += ", " + in.exclude.name
	}
	for _, extra := range []struct {
		it  *pointItems
		src *source
	}{{sc.candidates, in.candidates}, {sc.demand, in.points}} {
		if extra.it != nil {
			all = append(all, extra.it.allVertices()...)
			files += ", " + extra.src.name
		}
	}
	b, err := planar.LonLatBound(all)
	if err != nil {
		return inputErrorf("%s: %v", files, err)
	}
	tm, err := planar.NewLocalPlane(all)
	if err != nil {
		return inputErrorf("%s: %v", files, err)
	}
	if err := tm.CheckExtent(b); err != nil {
		return inputErrorf("%s: %s", files, extentMessage(tm, b))
	}
	sc.meta.MaxScaleError = tm.MaxScaleError(b)
	sc.meta.ToLonLat = tm.Inverse
	sc.meta.Projection = describePlane(tm)
	pts := make([]orb.Point, len(sites.Pts))
	for i, p := range sites.Pts {
		x, y := tm.Forward(p[0], p[1])
		pts[i] = orb.Point{x, y}
	}
	sc.sites = pts
	for _, p := range polys {
		for _, r := range p.Rings {
			for k, q := range r {
				x, y := tm.Forward(q[0], q[1])
				r[k] = orb.Point{x, y}
			}
		}
	}
	for _, it := range []*pointItems{sc.candidates, sc.demand} {
		if it != nil {
			it.transform(tm.Forward)
		}
	}
	return nil
}

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
	const meanRadiusKm = 6371.0088 // IUGG mean Earth radius
	ew := w * math.Pi / 180 * meanRadiusKm * math.Cos(latNear*math.Pi/180)
	ns := h * math.Pi / 180 * meanRadiusKm
	scale := "unbounded (the extent reaches 90° from the central meridian)"
	if !math.IsInf(m, 0) {
		scale = fmt.Sprintf("%.2g%%", 100*m)
	}
	return fmt.Sprintf("area too large for one local plane: scale error %s over %.0f km × %.0f km (limit %.1f%%); split the site",
		scale, ew, ns, 100*planar.MaxLocalScaleError)
}

// describePlane is the one-line description of the local plane.
func describePlane(tm *planar.TransverseMercator) string {
	return fmt.Sprintf("local transverse Mercator (WGS84, Krüger series), central meridian %s, origin latitude %s, k0 = %g",
		degrees(tm.CentralMeridian(), "E", "W", 6), degrees(tm.OriginLatitude(), "N", "S", 6), tm.ScaleFactor())
}

// degrees formats an angle with d decimals and a hemisphere letter.
func degrees(v float64, pos, neg string, d int) string {
	h := pos
	if v < 0 {
		h, v = neg, -v
	}
	return fmt.Sprintf("%.*f°%s", d, v, h)
}

// defaultTitle is the area's first name, else the sites file's base name.
func defaultTitle(in sceneInputs, polys []areaPoly) string {
	for _, p := range polys {
		if !p.Exclude && p.Name != "" {
			return p.Name
		}
	}
	base := filepath.Base(in.sites.name)
	return strings.TrimSuffix(base, filepath.Ext(base))
}

// siteWarnings reports sites outside the area (they still serve it) and
// sites at exactly the position of an earlier one (they share its service
// area), listing up to five of each.
func siteWarnings(sites []orb.Point, names []string, region *planar.Region) []string {
	label := func(i int) string {
		if i < len(names) && names[i] != "" {
			return fmt.Sprintf("#%d %s", i, names[i])
		}
		return fmt.Sprintf("#%d", i)
	}
	list := func(idx []string, total int) string {
		s := strings.Join(idx, ", ")
		if total > len(idx) {
			s += fmt.Sprintf(" and %d more", total-len(idx))
		}
		return s
	}
	var warn []string
	ix := region.Index()
	var outside []string
	nOut := 0
	for i, p := range sites {
		if !ix.Contains(p[0], p[1]) {
			nOut++
			if len(outside) < 5 {
				outside = append(outside, label(i))
			}
		}
	}
	if nOut > 0 {
		warn = append(warn, fmt.Sprintf("%d of %d sites lie outside the area (their disks still count where they reach in): %s",
			nOut, len(sites), list(outside, nOut)))
	}
	first := make(map[orb.Point]int, len(sites))
	var dups []string
	nDup := 0
	for i, p := range sites {
		if j, ok := first[p]; ok {
			nDup++
			if len(dups) < 5 {
				dups = append(dups, fmt.Sprintf("%s = %s", label(i), label(j)))
			}
			continue
		}
		first[p] = i
	}
	if nDup > 0 {
		what := "sites repeat the exact position of an earlier site and share its service area"
		if nDup == 1 {
			what = "site repeats the exact position of an earlier site and shares its service area"
		}
		warn = append(warn, fmt.Sprintf("%d %s: %s", nDup, what, list(dups, nDup)))
	}
	return warn
}
