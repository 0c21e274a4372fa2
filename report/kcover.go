// "Reached by k devices": the k-coverage outputs of analyze --reach (the
// computation is coverage.KCover): a section of report.txt, the "reach"
// member of summary.json, two GeoJSON layers (the site in bands by the
// number of devices in reach, 0, 1, …, K−1 and K+, one feature per band;
// the k-gaps) and the
// "devices in reach" map (map_reach.go).
//
// Every figure is copied from the coverage.KCoverage result: shares and
// areas are exact (closed forms), ranges exact up to rounding.

package report

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/gpkg"
)

// Output files of the k-coverage (with Options.Reach set).
const (
	// FileReach is the layer of the site in bands by the number of
	// devices in reach (0, 1, …, K−1, K+), one feature per band.
	FileReach = "reach.geojson"
	// FileReachGaps is the layer of the k-gaps.
	FileReachGaps = "reach-gaps.geojson"
	// FileMapReach is the "devices in reach" map.
	FileMapReach = "map-reach.png"
)

// reachMaxGapRows is the number of k-gaps listed per k in report.txt.
const reachMaxGapRows = 20

// ReachDoc is the "reach" member of summary.json.
type ReachDoc struct {
	// RangeM is the planned range the figures refer to (m).
	RangeM float64 `json:"range_m"`
	// DistinctDevices is the number of distinct device positions
	// (duplicates count once).
	DistinctDevices int `json:"distinct_devices"`
	// Levels holds one entry per k asked for, by increasing k.
	Levels []ReachLevel `json:"levels"`
	// CurveRangesM are the ranges of every level's CoverageCurve (m).
	CurveRangesM []float64 `json:"curve_ranges_m,omitempty"`
}

// ReachLevel is the k-coverage for one k in summary.json.
type ReachLevel struct {
	K int `json:"k"`
	// CoveredAreaM2 is the area reached by at least k devices (m²).
	CoveredAreaM2 float64 `json:"covered_area_m2"`
	// CoveredFraction is CoveredAreaM2 over the site area.
	CoveredFraction float64 `json:"covered_fraction"`
	// CoverRangeM is the smallest common range at which every spot is
	// reached by k devices (m), needed at CoverPoint.
	CoverRangeM float64 `json:"cover_range_m"`
	CoverPoint  Point   `json:"cover_point"`
	// CoverSites are the input indices of the k devices nearest
	// CoverPoint, nearest first.
	CoverSites []int `json:"cover_sites"`
	// OrderKCells is the number of order-k Voronoi cells meeting the area.
	OrderKCells int `json:"order_k_cells"`
	// Gaps are the k-gaps, by decreasing closing range.
	Gaps []ReachGap `json:"gaps"`
	// CoverageCurve is the share reached by at least k devices at each of
	// ReachDoc.CurveRangesM.
	CoverageCurve []float64 `json:"coverage_curve,omitempty"`
}

// ReachGap is one k-gap in summary.json.
type ReachGap struct {
	ID            int     `json:"id"`
	AreaM2        float64 `json:"area_m2"`
	ClosingRangeM float64 `json:"closing_range_m"`
	DeepestPoint  Point   `json:"deepest_point"`
	// Sites are the input indices of the k devices nearest DeepestPoint.
	Sites []int `json:"sites"`
}

// ReachSummary builds the "reach" member of summary.json.
func ReachSummary(kc *coverage.KCoverage, l *coverage.Layout, m Meta) *ReachDoc {
	s := &scene{l: l, m: m}
	return s.reachDoc(kc)
}

// reachFiles lists the k-coverage output files (none without Reach).
func reachFiles(m Meta, opt Options) []string {
	if opt.Reach == nil {
		return nil
	}
	f := []string{LayerFile(FileReach, m.Planar), LayerFile(FileReachGaps, m.Planar)}
	if opt.Maps {
		f = append(f, FileMapReach)
	}
	return f
}

// reachSteps are the steps writing the k-coverage files.
func (s *scene) reachSteps(opt Options) []step {
	kc := opt.Reach
	if kc == nil {
		return nil
	}
	st := s.reachLayerSteps(kc)
	if opt.Maps {
		width := mapWidth(opt)
		st = append(st, step{name: FileMapReach, write: fromBytes(func() ([]byte, error) { return s.reachMap(kc, width) })})
	}
	return st
}

// reachLayerSteps are the steps writing the two k-coverage layers (none
// without kc); the projected copies (outcrs.go) repeat them.
func (s *scene) reachLayerSteps(kc *coverage.KCoverage) []step {
	if kc == nil {
		return nil
	}
	return []step{
		s.layerStep(FileReach, s.reachLayer(kc)),
		s.layerStep(FileReachGaps, s.reachGapsLayer(kc)),
	}
}

func (s *scene) reachDoc(kc *coverage.KCoverage) *ReachDoc {
	if kc == nil {
		return nil
	}
	d := &ReachDoc{RangeM: kc.Range, DistinctDevices: kc.Devices, CurveRangesM: kc.CurveRanges}
	for _, lv := range kc.Levels {
		rl := ReachLevel{
			K: lv.K, CoveredAreaM2: lv.CoveredArea, CoveredFraction: lv.Share,
			CoverRangeM: lv.CoverRange, CoverPoint: s.point(lv.CoverPoint), CoverSites: lv.CoverSites,
			OrderKCells: lv.Cells, Gaps: []ReachGap{}, CoverageCurve: lv.Curve,
		}
		for _, g := range lv.Gaps {
			rl.Gaps = append(rl.Gaps, ReachGap{ID: g.ID, AreaM2: g.Area, ClosingRangeM: g.ClosingRange,
				DeepestPoint: s.point(g.Deepest), Sites: g.Sites})
		}
		d.Levels = append(d.Levels, rl)
	}
	return d
}

// reachText is the REACHED BY k DEVICES section of report.txt.
func (s *scene) reachText(kc *coverage.KCoverage) []byte {
	if kc == nil {
		return nil
	}
	var b strings.Builder
	fmt.Fprintf(&b, "\nREACHED BY k DEVICES (at the planned range %s m; devices at the same spot count once)\n", fmtReach(kc.Range, 2))
	for _, w := range kc.Warnings {
		fmt.Fprintf(&b, "  note: %s\n", w)
	}
	fmt.Fprintf(&b, "  %2s  %10s  %14s  %14s  %s\n", "k", "reached %", "short m²", "k-cover m", "needed at (devices nearest first)")
	for _, lv := range kc.Levels {
		fmt.Fprintf(&b, "  %2d  %10s  %14s  %14s  %s (%s)\n", lv.K, fmtReach(100*lv.Share, 3),
			fmtReach(kc.AreaM2-lv.CoveredArea, 1), fmtReach(lv.CoverRange, 2), s.pointText(lv.CoverPoint), s.reachSites(lv.CoverSites))
	}
	for _, lv := range kc.Levels {
		if len(lv.Gaps) == 0 {
			fmt.Fprintf(&b, "\n  k = %d: every spot is reached by at least %d device(s).\n", lv.K, lv.K)
			continue
		}
		short := fmt.Sprintf("reached by fewer than %d devices", lv.K)
		if lv.K == 1 {
			short = "reached by no device"
		}
		fmt.Fprintf(&b, "\n  k = %d: %d parts %s, by the range that closes them:\n", lv.K, len(lv.Gaps), short)
		fmt.Fprintf(&b, "  %4s  %12s  %11s  %s\n", "gap", "area m²", "closing m", "deepest spot (devices nearest first)")
		for i, g := range lv.Gaps {
			if i == reachMaxGapRows {
				fmt.Fprintf(&b, "  ... and %d more (all in summary.json and %s)\n", len(lv.Gaps)-i, LayerFile(FileReachGaps, s.m.Planar))
				break
			}
			fmt.Fprintf(&b, "  %4d  %12s  %11s  %s (%s)\n", g.ID, fmtReach(g.Area, 1), fmtReach(g.ClosingRange, 2),
				s.pointText(g.Deepest), s.reachSites(g.Sites))
		}
	}
	b.WriteString("\n  Method: order-k Voronoi pieces (Lee, IEEE Trans. Computers 31, 1982); areas exact (closed form),\n" +
		"  the k-cover range is the largest distance from a spot of the area to its k-th nearest device.\n")
	return []byte(b.String())
}

// reachSites names the devices of input indices v as every output does
// (their labels, or #n by input position).
func (s *scene) reachSites(v []int) string {
	p := make([]string, len(v))
	for i, x := range v {
		p[i] = s.label(x)
	}
	return strings.Join(p, ", ")
}

// fmtReach formats v with d decimals.
func fmtReach(v float64, d int) string { return strconv.FormatFloat(v, 'f', d, 64) }

// reachLayer is one feature per band of the number of devices in reach
// (0, 1, …, K−1 and "K+"; coverage.KCoverage.Bands): disjoint polygons
// tiling the site area, with the band's exact area.
func (s *scene) reachLayer(kc *coverage.KCoverage) *layerDef {
	return &layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList("devices_in_reach", gpkg.Integer, "band", gpkg.Text, "area_m2", gpkg.Real, "share", gpkg.Real, "range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			bands, err := kc.Bands(s.l)
			if err != nil {
				return err
			}
			for _, b := range bands {
				out := s.multiPolygon(b.Outline)
				if len(out) == 0 {
					continue
				}
				name := strconv.Itoa(b.Devices)
				if b.OrMore {
					name += "+"
				}
				if err := emit(out, b.Devices, name, b.Area, b.Share, kc.Range); err != nil {
					return err
				}
			}
			return nil
		}}
}

// reachGapsLayer is one feature per k-gap.
func (s *scene) reachGapsLayer(kc *coverage.KCoverage) *layerDef {
	f := append([]any{"k", gpkg.Integer, "id", gpkg.Integer, "area_m2", gpkg.Real, "closing_range_m", gpkg.Real}, s.coordFields("deepest")...)
	return &layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList(append(f, "sites", gpkg.Text, "range_m", gpkg.Real)...),
		each: func(emit emitFunc) error {
			var buf polyBuf
			for _, lv := range kc.Levels {
				for _, g := range lv.Gaps {
					out := s.conservativeInto(&buf, g.Outline, 1)
					if len(out) == 0 {
						continue
					}
					d := s.point(g.Deepest)
					if err := emit(out, lv.K, g.ID, g.Area, g.ClosingRange, d[0], d[1], joinInts(g.Sites), kc.Range); err != nil {
						return err
					}
				}
			}
			return nil
		}}
}
