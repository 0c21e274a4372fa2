// "Reached by k devices": the k-coverage outputs of analyze --reach (the
// computation is coverage.KCover): a section of report.txt, the "reach"
// member of summary.json, two GeoJSON layers (the site in bands by the
// number of devices in reach, 0, 1, …, K−1 and K+, one feature per band;
// the k-gaps) and the
// "devices in reach" map (map_reach.go).
//
// Every figure is copied from the coverage.KCoverage result: shares and
// areas are exact (closed forms), ranges exact up to rounding.
//
// With own ranges (coverage.KCoverRanges, ranges not all equal) there is
// no common range: the k-cover figure and each k-gap's closing are a
// uniform power growth t, reported in metres as the range each group of
// devices (type and planned range) would need, √(r² + t), as the
// full-cover figure of the own-range report is; the coverage-depth curves
// are sampled against the longest-range devices' range under that growth
// (coverage.KCoverRanges); the "devices in reach" map is titled "at their
// own ranges" and gives those ranges (kcover_map.go).

package report

import (
	"fmt"
	"math"
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
	// With own ranges: the range R of the longest-range devices (the
	// largest planned range of RangeGroups, r_max) when every r² grows
	// alike by t = R² − r_max², every other group then at √(r² + t).
	CurveRangesM []float64 `json:"curve_ranges_m,omitempty"`
	// OwnRanges is set when the devices have their own ranges, not all
	// equal: RangeM is then 0 and each level and gap gives the ranges
	// needed per group of devices (cover_ranges, closing_ranges).
	OwnRanges bool `json:"own_ranges,omitempty"`
	// RangeGroups (own ranges) are the groups of devices by type and
	// planned range, in the order of every cover_ranges and
	// closing_ranges list.
	RangeGroups []RangeGroup `json:"range_groups,omitempty"`
}

// ReachLevel is the k-coverage for one k in summary.json.
type ReachLevel struct {
	K int `json:"k"`
	// CoveredAreaM2 is the area reached by at least k devices (m²).
	CoveredAreaM2 float64 `json:"covered_area_m2"`
	// CoveredFraction is CoveredAreaM2 over the site area.
	CoveredFraction float64 `json:"covered_fraction"`
	// CoverRangeM is the smallest common range at which every spot is
	// reached by k devices (m), needed at CoverPoint. With own ranges: the
	// distance from CoverPoint to its k-th device (smallest power first).
	CoverRangeM float64 `json:"cover_range_m"`
	// CoverPowerM2 (own ranges) is the uniform power growth t (m²) at
	// which every spot is reached by k devices: the largest k-th smallest
	// power |x − p_i|² − r_i² over the area, at CoverPoint (≤ 0: reached
	// already at the planned ranges).
	CoverPowerM2 *float64 `json:"cover_power_m2,omitempty"`
	// CoverRanges (own ranges) are the ranges each group of devices (type
	// and planned range) needs for that, √(r² + t) (m).
	CoverRanges []RangeGroup `json:"cover_ranges,omitempty"`
	CoverPoint  Point        `json:"cover_point"`
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
	// Sites are the input indices of the k devices nearest DeepestPoint
	// (with own ranges: smallest power first).
	Sites []int `json:"sites"`
	// ClosingPowerM2 (own ranges) is the uniform power growth (m²) at
	// which the gap vanishes; ClosingRanges the ranges each group of
	// devices needs for that (m). ClosingRangeM is then the distance from
	// DeepestPoint to its k-th device.
	ClosingPowerM2 *float64     `json:"closing_power_m2,omitempty"`
	ClosingRanges  []RangeGroup `json:"closing_ranges,omitempty"`
}

// ReachSummary builds the "reach" member of summary.json.
func ReachSummary(kc *coverage.KCoverage, l *coverage.Layout, m Meta) *ReachDoc {
	if reachOwn(kc) && m.Ranges == nil {
		m.Ranges = l.InputRanges
	}
	s := &scene{l: l, m: m}
	return s.reachDoc(kc)
}

// reachOwn reports whether kc is for devices with their own ranges, not
// all equal (no common range; see the file comment).
func reachOwn(kc *coverage.KCoverage) bool { return kc != nil && kc.OwnRanges && kc.Range == 0 }

// reachNeeded returns, per group of devices (type and planned range), the
// range needed under the uniform power growth t: √(r² + t), 0 where that
// is not real (coverage.Layout.GrownRanges).
func (s *scene) reachNeeded(t float64) []RangeGroup {
	rs := &rangesScene{scene: s}
	return rs.groups(func(i int) float64 {
		r := s.rangeOf(i)
		return math.Sqrt(math.Max(0, r*r+t))
	})
}

// reachNeededText is reachNeeded as text: "TYPE (planned m) → needed m"
// per group.
func (s *scene) reachNeededText(t float64) string {
	return ReachNeededText((&rangesScene{scene: s}).groups(nil), s.reachNeeded(t))
}

// ReachNeededText writes the ranges needed per group of devices, paired
// with the planned groups (ReachDoc.RangeGroups, in the same order): "TYPE
// (planned m) → needed m", the type left out for devices without one.
func ReachNeededText(planned, needed []RangeGroup) string {
	var p []string
	for k, g := range needed {
		head := metresNum(planned[k].RangeM) + " m"
		if g.Type != "" {
			head = g.Type + " (" + head + ")"
		}
		p = append(p, head+" → "+metresNum(g.RangeM)+" m")
	}
	return strings.Join(p, ", ")
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
	own := reachOwn(kc)
	d := &ReachDoc{RangeM: kc.Range, DistinctDevices: kc.Devices, CurveRangesM: kc.CurveRanges, OwnRanges: own}
	if own {
		d.RangeGroups = (&rangesScene{scene: s}).groups(nil)
	}
	for _, lv := range kc.Levels {
		rl := ReachLevel{
			K: lv.K, CoveredAreaM2: lv.CoveredArea, CoveredFraction: lv.Share,
			CoverRangeM: lv.CoverRange, CoverPoint: s.point(lv.CoverPoint), CoverSites: lv.CoverSites,
			OrderKCells: lv.Cells, Gaps: []ReachGap{}, CoverageCurve: lv.Curve,
		}
		if own {
			rl.CoverPowerM2, rl.CoverRanges = &lv.CoverPower, s.reachNeeded(lv.CoverPower)
		}
		for _, g := range lv.Gaps {
			rg := ReachGap{ID: g.ID, AreaM2: g.Area, ClosingRangeM: g.ClosingRange,
				DeepestPoint: s.point(g.Deepest), Sites: g.Sites}
			if own {
				p := g.ClosingPower
				rg.ClosingPowerM2, rg.ClosingRanges = &p, s.reachNeeded(p)
			}
			rl.Gaps = append(rl.Gaps, rg)
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
	if reachOwn(kc) {
		return s.reachTextOwn(kc)
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
		s.reachGapRows(&b, &lv, "range", fmt.Sprintf("  %4s  %12s  %11s  %s\n", "gap", "area m²", "closing m", "deepest spot (devices nearest first)"),
			func(g *coverage.KGap) string {
				return fmt.Sprintf("  %4d  %12s  %11s  %s (%s)\n", g.ID, fmtReach(g.Area, 1), fmtReach(g.ClosingRange, 2),
					s.pointText(g.Deepest), s.reachSites(g.Sites))
			})
	}
	b.WriteString("\n  Method: order-k Voronoi pieces (Lee, IEEE Trans. Computers 31, 1982); areas exact (closed form),\n" +
		"  the k-cover range is the largest distance from a spot of the area to its k-th nearest device.\n")
	return []byte(b.String())
}

// reachTextOwn is the REACHED BY k DEVICES section for devices with their
// own ranges: the figures to plan with are ranges per group of devices
// under uniform growth.
func (s *scene) reachTextOwn(kc *coverage.KCoverage) []byte {
	var b strings.Builder
	b.WriteString("\nREACHED BY k DEVICES (each device at its own planned range; devices at the same spot count once)\n")
	for _, w := range kc.Warnings {
		fmt.Fprintf(&b, "  note: %s\n", w)
	}
	fmt.Fprintf(&b, "  %2s  %10s  %14s  %s\n", "k", "reached %", "short m²", "spot needing the most (devices, smallest power first)")
	for _, lv := range kc.Levels {
		fmt.Fprintf(&b, "  %2d  %10s  %14s  %s (%s)\n", lv.K, fmtReach(100*lv.Share, 3),
			fmtReach(kc.AreaM2-lv.CoveredArea, 1), s.pointText(lv.CoverPoint), s.reachSites(lv.CoverSites))
	}
	b.WriteString("\n  Ranges at which every spot is reached by k devices (all ranges grow together):\n")
	for _, lv := range kc.Levels {
		fmt.Fprintf(&b, "  k = %d: %s\n", lv.K, s.reachNeededText(lv.CoverPower))
	}
	for _, lv := range kc.Levels {
		s.reachGapRows(&b, &lv, "growth", fmt.Sprintf("  %4s  %12s  %s; %s\n", "gap", "area m²", "deepest spot (devices)", "closing ranges (all grow together)"),
			func(g *coverage.KGap) string {
				return fmt.Sprintf("  %4d  %12s  %s (%s); %s\n", g.ID, fmtReach(g.Area, 1),
					s.pointText(g.Deepest), s.reachSites(g.Sites), s.reachNeededText(g.ClosingPower))
			})
	}
	b.WriteString("\n  Method: order-k power diagram (Aurenhammer, SIAM J. Comput. 16, 1987; Lee's construction, IEEE Trans.\n" +
		"  Computers 31, 1982); areas exact (closed form). A spot is reached by k devices when its k-th smallest\n" +
		"  power |x − p|² − r² is at most 0; the ranges above are √(r² + t) for the largest such power t over the\n" +
		"  area (or over the part).\n")
	return []byte(b.String())
}

// reachGapRows writes the k-gaps of one level: a line saying there are
// none, or how many (ordered by the range or growth, how, that closes
// them), the table head and one row per gap up to reachMaxGapRows.
func (s *scene) reachGapRows(b *strings.Builder, lv *coverage.KLevel, how, head string, row func(g *coverage.KGap) string) {
	if len(lv.Gaps) == 0 {
		fmt.Fprintf(b, "\n  k = %d: every spot is reached by at least %d device(s).\n", lv.K, lv.K)
		return
	}
	short := fmt.Sprintf("reached by fewer than %d devices", lv.K)
	if lv.K == 1 {
		short = "reached by no device"
	}
	fmt.Fprintf(b, "\n  k = %d: %d parts %s, by the %s that closes them:\n", lv.K, len(lv.Gaps), short, how)
	b.WriteString(head)
	for i := range lv.Gaps {
		if i == reachMaxGapRows {
			fmt.Fprintf(b, "  ... and %d more (all in summary.json and %s)\n", len(lv.Gaps)-i, LayerFile(FileReachGaps, s.m.Planar))
			break
		}
		b.WriteString(row(&lv.Gaps[i]))
	}
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
// tiling the site area, with the band's exact area and the common range
// (with own ranges, not all equal, range_m is left out).
func (s *scene) reachLayer(kc *coverage.KCoverage) *layerDef {
	f := []any{"devices_in_reach", gpkg.Integer, "band", gpkg.Text, "area_m2", gpkg.Real, "share", gpkg.Real}
	own := reachOwn(kc)
	if !own {
		f = append(f, "range_m", gpkg.Real)
	}
	return &layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList(f...),
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
				v := []any{b.Devices, name, b.Area, b.Share}
				if !own {
					v = append(v, kc.Range)
				}
				if err := emit(out, values(v...)...); err != nil {
					return err
				}
			}
			return nil
		}}
}

// reachGapsLayer is one feature per k-gap; with own ranges (not all
// equal) range_m gives way to closing_power_m2 and closing_ranges (the
// ranges per group of devices that close the gap, as text).
func (s *scene) reachGapsLayer(kc *coverage.KCoverage) *layerDef {
	f := append([]any{"k", gpkg.Integer, "id", gpkg.Integer, "area_m2", gpkg.Real, "closing_range_m", gpkg.Real}, s.coordFields("deepest")...)
	f = append(f, "sites", gpkg.Text)
	own := reachOwn(kc)
	if own {
		f = append(f, "closing_power_m2", gpkg.Real, "closing_ranges", gpkg.Text)
	} else {
		f = append(f, "range_m", gpkg.Real)
	}
	return &layerDef{geom: gpkg.MultiPolygon,
		fields: fieldList(f...),
		each: func(emit emitFunc) error {
			var buf polyBuf
			for _, lv := range kc.Levels {
				for _, g := range lv.Gaps {
					out := s.conservativeInto(&buf, g.Outline, 1)
					if len(out) == 0 {
						continue
					}
					d := s.point(g.Deepest)
					v := []any{lv.K, g.ID, g.Area, g.ClosingRange, d[0], d[1], joinInts(g.Sites)}
					if own {
						v = append(v, g.ClosingPower, s.reachNeededText(g.ClosingPower))
					} else {
						v = append(v, kc.Range)
					}
					if err := emit(out, values(v...)...); err != nil {
						return err
					}
				}
			}
			return nil
		}}
}
