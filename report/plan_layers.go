// GeoJSON layers and CSV tables of the planning moves.
//
// Layers follow geojson.go: RFC 7946 WGS84 [lon, lat] rounded to 7
// decimals (or local x/y metres to 1 mm in "-xy.geojson" files with
// Meta.Planar), polygon exteriors counter-clockwise and holes clockwise
// after rounding; a value that does not exist (the gain of a spot not
// picked, a range with no device left, within-range without a range) is
// null. The CSV tables (RFC 4180, comma-separated, a header line) carry
// the same figures at full float64 precision (shortest round-trip form),
// booleans as true/false, a missing value as an empty field, and the
// point coordinates last: lon,lat (WGS84 degrees, 7 decimals) or x,y
// (metres, 3 decimals).

package report

import (
	"encoding/csv"
	"io"
	"math"
	"strconv"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report/gpkg"
)

// planGapLayer is a gaps layer for the given gaps at the plan's range
// (range_m null with per-device ranges).
func (s *planScene) planGapLayer(gaps []coverage.Gap) *layerDef {
	r := s.p.Range
	if s.p.own() {
		r = math.NaN() // each device's own range: range_m null
	}
	return s.gapLayer(gaps, r, func(i int) Point { return s.point(gaps[i].Deepest) })
}

// proposedLayer is each added device, in the order added.
func (s *planScene) proposedLayer() *layerDef {
	sg := s.p.Suggestion
	return &layerDef{geom: gpkg.Point,
		fields: fieldList("n", gpkg.Integer, "full_cover_before_m", gpkg.Real, "full_cover_after_m", gpkg.Real,
			"covered_fraction_before", gpkg.Real, "covered_fraction_after", gpkg.Real,
			"uncovered_before_m2", gpkg.Real, "uncovered_after_m2", gpkg.Real, "range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			for j, st := range sg.Steps {
				if err := emit(orb.Point(s.point(st.Added)), values(j+1, st.FullCoverBefore, st.FullCoverAfter,
					st.CoveredBefore, st.CoveredAfter, st.UncoveredBefore, st.UncoveredAfter, sg.Range)...); err != nil {
					return err
				}
			}
			return nil
		}}
}

// candidatesLayer is every candidate spot; pick_order is its place among
// the picked ones (−1 and a null gain for a spot not picked).
func (s *planScene) candidatesLayer() *layerDef {
	p, ch := s.p, s.p.Choice
	return &layerDef{geom: gpkg.Point,
		fields: fieldList("candidate", gpkg.Integer, "name", gpkg.Text, "picked", gpkg.Boolean, "pick_order", gpkg.Integer,
			"gain_m2", gpkg.Real, "range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			order := make([]int, len(p.Candidates))
			gain := make([]float64, len(p.Candidates))
			for i := range order {
				order[i], gain[i] = -1, math.NaN()
			}
			for j, c := range ch.Picked {
				order[c], gain[c] = j+1, ch.Gains[j]
			}
			for i, c := range p.Candidates {
				if err := emit(orb.Point(s.point(c)), values(i, p.CandidateNames[i], order[i] > 0, order[i], gain[i], ch.Range)...); err != nil {
					return err
				}
			}
			return nil
		}}
}

// failuresLayer is each device ranked by the effect of its failure.
func (s *planScene) failuresLayer() *layerDef {
	fr := s.p.Failures
	f := append([]any{"rank", gpkg.Integer, "site", gpkg.Integer, "name", gpkg.Text, "shared", gpkg.Boolean,
		"service_area_m2", gpkg.Real, "added_uncovered_m2", gpkg.Real, "uncovered_area_m2", gpkg.Real,
		"closing_range_m", gpkg.Real}, s.coordFields("deepest")...)
	f = append(f, "backup", gpkg.Integer, "full_cover_range_m", gpkg.Real, "range_m", gpkg.Real)
	own := fr.Ranges != nil
	if own {
		f = append(f, "hidden", gpkg.Boolean)
	}
	return s.withAttributes(&layerDef{geom: gpkg.Point,
		fields: fieldList(f...),
		each: func(emit emitFunc) error {
			for k, d := range fr.Devices {
				dp := s.point(d.Deepest)
				vals := []any{k + 1, d.Site, s.name(d.Site), d.Shared,
					d.ServiceArea, d.AddedUncovered, d.Uncovered, d.ClosingRange, dp[0], dp[1],
					d.Backup, d.FullCover, s.failureRange(d.Site)}
				if own {
					vals = append(vals, d.Hidden)
				}
				if err := emit(orb.Point(s.point(s.l.Sites[d.Site])), values(vals...)...); err != nil {
					return err
				}
			}
			return nil
		}}, 1)
}

// failureRange is the planned range of device i in the failures outputs:
// its own with per-device ranges, else the common one.
func (s *planScene) failureRange(i int) float64 {
	if s.p.Failures.Ranges != nil {
		return s.p.Failures.Ranges[i]
	}
	return s.p.Failures.Range
}

// assignmentLayer is a line from each demand point to its device.
func (s *planScene) assignmentLayer() *layerDef {
	p, a := s.p, s.p.Assignment
	ranged := s.hasRange()
	return &layerDef{geom: gpkg.LineString,
		fields: fieldList("point", gpkg.Integer, "name", gpkg.Text, "device", gpkg.Integer, "device_name", gpkg.Text,
			"distance_m", gpkg.Real, "within_range", gpkg.Boolean, "weight", gpkg.Real),
		each: func(emit emitFunc) error {
			for i, q := range p.Demand {
				dev := s.l.Sites[a.Device[i]]
				line := orb.LineString{orb.Point(s.point(q)), orb.Point(s.point(dev))}
				var within any
				if ranged {
					within = a.Within[i]
				}
				if err := emit(line, values(i, s.demandName(i), a.Device[i], s.name(a.Device[i]), a.Distance[i], within, a.Weight[i])...); err != nil {
					return err
				}
			}
			return nil
		}}
}

// loadLayer is each device with the demand assigned to it.
func (s *planScene) loadLayer() *layerDef {
	a := s.p.Assignment
	ranged, own := s.hasRange(), s.p.own()
	f := []any{"device", gpkg.Integer, "name", gpkg.Text, "count", gpkg.Integer, "weight", gpkg.Real,
		"in_range", gpkg.Integer, "in_range_weight", gpkg.Real}
	if own {
		f = append(f, "range_m", gpkg.Real, "hidden", gpkg.Boolean)
	}
	return s.withAttributes(&layerDef{geom: gpkg.Point,
		fields: fieldList(f...),
		each: func(emit emitFunc) error {
			for i, ld := range a.Load {
				var in, inw any
				if ranged {
					in, inw = ld.InRange, ld.InRangeWeight
				}
				vals := []any{i, s.name(i), ld.Count, ld.Weight, in, inw}
				if own {
					vals = append(vals, s.rangeOf(i), s.hidden(i))
				}
				if err := emit(orb.Point(s.point(s.l.Sites[i])), values(vals...)...); err != nil {
					return err
				}
			}
			return nil
		}}, 0)
}

// csvTable writes the rows of one CSV file to a stream.
type csvTable struct {
	w *csv.Writer
}

func newCSV(out io.Writer, head ...string) *csvTable {
	t := &csvTable{w: csv.NewWriter(out)}
	t.w.Write(head)
	return t
}

func (t *csvTable) row(cells ...string) { t.w.Write(cells) }

func (t *csvTable) close() error {
	t.w.Flush()
	return t.w.Error()
}

// csvNum formats a number at full precision ("" when not finite).
func csvNum(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// coordHeads are the CSV heads of a point's coordinates.
func (s *planScene) coordHeads(prefix string) []string {
	if s.geographic() {
		return []string{prefix + "lon", prefix + "lat"}
	}
	return []string{prefix + "x", prefix + "y"}
}

// coordCells are a point's coordinates as CSV cells.
func (s *planScene) coordCells(p orb.Point) []string {
	q := s.point(p)
	return []string{csvNum(q[0]), csvNum(q[1])}
}

func (s *planScene) failuresCSV(out io.Writer) error {
	fr := s.p.Failures
	head := append([]string{"rank", "site", "name", "shared", "service_area_m2", "uncovered_area_m2", "added_uncovered_m2",
		"closing_range_m", "backup", "backup_name", "full_cover_range_m", "range_m"}, s.coordHeads("deepest_")...)
	own := fr.Ranges != nil
	if own {
		head = append(head, "hidden")
	}
	t := newCSV(out, head...)
	for k, d := range fr.Devices {
		backup := ""
		if d.Backup >= 0 {
			backup = strconv.Itoa(d.Backup)
		}
		row := append([]string{strconv.Itoa(k + 1), strconv.Itoa(d.Site), s.name(d.Site), strconv.FormatBool(d.Shared),
			csvNum(d.ServiceArea), csvNum(d.Uncovered), csvNum(d.AddedUncovered), csvNum(d.ClosingRange),
			backup, s.name(d.Backup), csvNum(d.FullCover), csvNum(s.failureRange(d.Site))}, s.coordCells(d.Deepest)...)
		if own {
			row = append(row, strconv.FormatBool(d.Hidden))
		}
		t.row(row...)
	}
	return t.close()
}

func (s *planScene) assignmentCSV(out io.Writer) error {
	p, a := s.p, s.p.Assignment
	ranged := s.hasRange()
	t := newCSV(out, append([]string{"point", "name", "device", "device_name", "distance_m", "within_range", "weight"}, s.coordHeads("")...)...)
	for i, q := range p.Demand {
		in := ""
		if ranged {
			in = strconv.FormatBool(a.Within[i])
		}
		t.row(append([]string{strconv.Itoa(i), s.demandName(i), strconv.Itoa(a.Device[i]), s.name(a.Device[i]),
			csvNum(a.Distance[i]), in, csvNum(a.Weight[i])}, s.coordCells(q)...)...)
	}
	return t.close()
}

func (s *planScene) loadCSV(out io.Writer) error {
	a := s.p.Assignment
	ranged := s.hasRange()
	head := append([]string{"device", "device_name", "count", "weight", "in_range", "in_range_weight"}, s.coordHeads("")...)
	own := s.p.own()
	if own {
		head = append(head, "range_m", "hidden")
	}
	t := newCSV(out, head...)
	for i, ld := range a.Load {
		in, inw := "", ""
		if ranged {
			in, inw = strconv.Itoa(ld.InRange), csvNum(ld.InRangeWeight)
		}
		row := append([]string{strconv.Itoa(i), s.name(i), strconv.Itoa(ld.Count), csvNum(ld.Weight), in, inw}, s.coordCells(s.l.Sites[i])...)
		if own {
			row = append(row, csvNum(s.rangeOf(i)), strconv.FormatBool(s.hidden(i)))
		}
		t.row(row...)
	}
	return t.close()
}
