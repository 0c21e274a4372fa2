// The scene of a run: the inputs read, checked and projected by package
// siteinput, and the report metadata filled from them. Problems with the
// input data (*siteinput.Error) are bad input, exit 1.

package main

import (
	"errors"
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
)

// scene is a run's input in the local plane.
type scene struct {
	sites  []orb.Point
	region *planar.Region
	meta   report.Meta
	// candidates and demand are the planning inputs in the local plane
	// (nil when not given).
	candidates, demand *siteinput.Items
	// ranges holds each device's range when they differ (nil when all
	// are rangeM); types each device's type (nil without a type column).
	ranges []float64
	rangeM float64
	types  []string
}

// fromInput gives a *siteinput.Error its exit code, bad input; other
// errors are returned as they are.
func fromInput(err error) error {
	var ie *siteinput.Error
	if errors.As(err, &ie) {
		return &exitError{code: exitInput, msg: err.Error()}
	}
	return err
}

// readSource reads the file given to flag (e.g. "--sites"). A large file
// first has the heap advised for huge pages (hugepages_linux.go).
func readSource(path, flag string) (siteinput.Source, error) {
	adviseHugePagesForFile(path)
	s, err := siteinput.ReadFile(path, flag)
	return s, fromInput(err)
}

// loadScene reads, checks and projects the inputs and fills the report
// metadata that comes from them.
func loadScene(in siteinput.Inputs) (*scene, error) {
	if in.Exclude != nil && in.Area == nil {
		return nil, usageErrorf("--exclude needs --area: exclusion zones are cut out of a given area")
	}
	s, err := siteinput.Load(in)
	if errors.Is(err, siteinput.ErrNoRange) {
		return nil, usageErrorf("required flag --range is missing: give --range LENGTH, a range column in %s, or --type-range with a type column", in.Sites.Name)
	}
	if err != nil {
		return nil, fromInput(err)
	}
	sc := &scene{sites: s.Sites, region: s.Region, candidates: s.Candidates, demand: s.Demand,
		ranges: s.Ranges, rangeM: s.Range, types: s.Types}
	m := &sc.meta
	m.SitesFile = in.Sites.Name
	if in.Area != nil {
		m.AreaFile = in.Area.Name
	}
	if in.Exclude != nil {
		m.ExcludeFile = in.Exclude.Name
	}
	if in.Candidates != nil {
		m.CandidatesFile = in.Candidates.Name
	}
	if in.Points != nil {
		m.PointsFile = in.Points.Name
	}
	if in.Context != nil {
		m.ContextFile = in.Context.Name
	}
	m.InputSums = inputSums(in)
	if tr := in.TypeRanges; tr != nil && tr.Sum.SHA256 != "" {
		m.RangeTableFile = tr.Source
	}
	m.SiteNames = s.Names
	m.SiteAttributes = s.Attributes
	m.OutCRS = s.OutCRS
	m.Ranges, m.Types = s.Ranges, s.Types
	m.Planar = in.Planar
	m.Title = s.Title
	m.AreaFromHull = s.AreaFromHull
	m.AreaNote = s.AreaNote
	m.AreaRelError = s.AreaRelError
	if c := s.Context; c != nil {
		for i, p := range c.Pts {
			if c.Polys[i] != nil {
				m.Context = append(m.Context, c.Polys[i]...)
			} else {
				m.ContextPoints = append(m.ContextPoints, p)
			}
		}
	}
	m.Warnings = s.Warnings
	m.Timings = s.Timings
	if tm := s.Projection; tm != nil {
		m.MaxScaleError = s.MaxScaleError
		m.ToLonLat = tm.Inverse
		m.Projection = describePlane(tm)
	}
	return sc, nil
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

// inputSums returns, by name, the checksums of the inputs read from files
// (siteinput.ReadFile, ReadRangeTable) for the run's manifest.
func inputSums(in siteinput.Inputs) map[string]siteinput.Checksum {
	sums := make(map[string]siteinput.Checksum)
	for _, s := range []*siteinput.Source{&in.Sites, in.Area, in.Exclude, in.Candidates, in.Points, in.Context} {
		if s != nil && s.Sum.SHA256 != "" {
			sums[s.Name] = s.Sum
		}
	}
	if tr := in.TypeRanges; tr != nil && tr.Sum.SHA256 != "" {
		sums[tr.Source] = tr.Sum
	}
	return sums
}
