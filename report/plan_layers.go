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
	"bytes"
	"encoding/csv"
	"math"
	"slices"
	"strconv"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// gapLayer is a gaps layer for the given gaps at the plan's range.
func (s *planScene) gapLayer(gaps []coverage.Gap) []byte {
	l := s.newLayer()
	for _, g := range gaps {
		mp := s.multiPolygon(g.Outline)
		if len(mp) == 0 {
			continue
		}
		l.feature(mp, func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "id", true), int64(g.ID), 10)
			b = appendNum(kv(b, "area_m2", false), g.Area)
			b = appendNum(kv(b, "closing_range_m", false), g.ClosingRange)
			b = appendPos(kv(b, "deepest_point", false), orb.Point(s.point(g.Deepest)))
			b = strconv.AppendBool(kv(b, "touches_boundary", false), g.TouchesBoundary)
			b = appendInts(kv(b, "sites", false), g.Sites)
			return appendNum(kv(b, "range_m", false), s.p.Range)
		})
	}
	return l.bytes()
}

func (s *planScene) proposedLayer() ([]byte, error) {
	l := s.newLayer()
	sg := s.p.Suggestion
	for j, st := range sg.Steps {
		l.feature(orb.Point(s.point(st.Added)), func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "n", true), int64(j+1), 10)
			b = appendNum(kv(b, "full_cover_before_m", false), st.FullCoverBefore)
			b = appendNum(kv(b, "full_cover_after_m", false), st.FullCoverAfter)
			b = appendNum(kv(b, "covered_fraction_before", false), st.CoveredBefore)
			b = appendNum(kv(b, "covered_fraction_after", false), st.CoveredAfter)
			b = appendNum(kv(b, "uncovered_before_m2", false), st.UncoveredBefore)
			b = appendNum(kv(b, "uncovered_after_m2", false), st.UncoveredAfter)
			return appendNum(kv(b, "range_m", false), sg.Range)
		})
	}
	return l.bytes(), nil
}

func (s *planScene) candidatesLayer() ([]byte, error) {
	p, ch := s.p, s.p.Choice
	order := make([]int, len(p.Candidates))
	gain := make([]float64, len(p.Candidates))
	for i := range order {
		order[i], gain[i] = -1, math.NaN()
	}
	for j, c := range ch.Picked {
		order[c], gain[c] = j+1, ch.Gains[j]
	}
	l := s.newLayer()
	for i, c := range p.Candidates {
		l.feature(orb.Point(s.point(c)), func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "candidate", true), int64(i), 10)
			b = appendStr(kv(b, "name", false), p.CandidateNames[i])
			b = strconv.AppendBool(kv(b, "picked", false), order[i] > 0)
			b = strconv.AppendInt(kv(b, "order", false), int64(order[i]), 10)
			b = appendNum(kv(b, "gain_m2", false), gain[i])
			return appendNum(kv(b, "range_m", false), ch.Range)
		})
	}
	return l.bytes(), nil
}

func (s *planScene) failuresLayer() ([]byte, error) {
	fr := s.p.Failures
	l := s.newLayer()
	for k, d := range fr.Devices {
		l.feature(orb.Point(s.point(s.l.Sites[d.Site])), func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "rank", true), int64(k+1), 10)
			b = strconv.AppendInt(kv(b, "site", false), int64(d.Site), 10)
			b = appendStr(kv(b, "name", false), s.name(d.Site))
			b = strconv.AppendBool(kv(b, "shared", false), d.Shared)
			b = appendNum(kv(b, "service_area_m2", false), d.ServiceArea)
			b = appendNum(kv(b, "added_uncovered_m2", false), d.AddedUncovered)
			b = appendNum(kv(b, "uncovered_area_m2", false), d.Uncovered)
			b = appendNum(kv(b, "closing_range_m", false), d.ClosingRange)
			b = appendPos(kv(b, "deepest_point", false), orb.Point(s.point(d.Deepest)))
			b = strconv.AppendInt(kv(b, "backup", false), int64(d.Backup), 10)
			b = appendNum(kv(b, "full_cover_range_m", false), d.FullCover)
			return appendNum(kv(b, "range_m", false), fr.Range)
		})
	}
	return l.bytes(), nil
}

func (s *planScene) assignmentLayer() ([]byte, error) {
	p, a := s.p, s.p.Assignment
	ranged := s.hasRange()
	l := s.newLayer()
	l.b = slices.Grow(l.b, 260*len(p.Demand)) // one feature is about 250 bytes
	for i, q := range p.Demand {
		dev := s.l.Sites[a.Device[i]]
		line := orb.LineString{orb.Point(s.point(q)), orb.Point(s.point(dev))}
		l.feature(line, func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "point", true), int64(i), 10)
			b = appendStr(kv(b, "name", false), s.demandName(i))
			b = strconv.AppendInt(kv(b, "device", false), int64(a.Device[i]), 10)
			b = appendStr(kv(b, "device_name", false), s.name(a.Device[i]))
			b = appendNum(kv(b, "distance_m", false), a.Distance[i])
			b = kv(b, "within_range", false)
			if ranged {
				b = strconv.AppendBool(b, a.Within[i])
			} else {
				b = append(b, "null"...)
			}
			return appendNum(kv(b, "weight", false), a.Weight[i])
		})
	}
	return l.bytes(), nil
}

func (s *planScene) loadLayer() ([]byte, error) {
	a := s.p.Assignment
	ranged := s.hasRange()
	l := s.newLayer()
	for i, ld := range a.Load {
		l.feature(orb.Point(s.point(s.l.Sites[i])), func(b []byte) []byte {
			b = strconv.AppendInt(kv(b, "device", true), int64(i), 10)
			b = appendStr(kv(b, "name", false), s.name(i))
			b = strconv.AppendInt(kv(b, "count", false), int64(ld.Count), 10)
			b = appendNum(kv(b, "weight", false), ld.Weight)
			if ranged {
				b = strconv.AppendInt(kv(b, "in_range", false), int64(ld.InRange), 10)
				return appendNum(kv(b, "in_range_weight", false), ld.InRangeWeight)
			}
			b = append(kv(b, "in_range", false), "null"...)
			return append(kv(b, "in_range_weight", false), "null"...)
		})
	}
	return l.bytes(), nil
}

// csvTable collects the rows of one CSV file.
type csvTable struct {
	b bytes.Buffer
	w *csv.Writer
}

func newCSV(head ...string) *csvTable {
	t := &csvTable{}
	t.w = csv.NewWriter(&t.b)
	t.w.Write(head)
	return t
}

func (t *csvTable) row(cells ...string) { t.w.Write(cells) }

func (t *csvTable) bytes() ([]byte, error) {
	t.w.Flush()
	return t.b.Bytes(), t.w.Error()
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

func (s *planScene) failuresCSV() ([]byte, error) {
	fr := s.p.Failures
	head := append([]string{"rank", "site", "name", "shared", "service_area_m2", "uncovered_area_m2", "added_uncovered_m2",
		"closing_range_m", "backup", "backup_name", "full_cover_range_m", "range_m"}, s.coordHeads("deepest_")...)
	t := newCSV(head...)
	for k, d := range fr.Devices {
		backup := ""
		if d.Backup >= 0 {
			backup = strconv.Itoa(d.Backup)
		}
		t.row(append([]string{strconv.Itoa(k + 1), strconv.Itoa(d.Site), s.name(d.Site), strconv.FormatBool(d.Shared),
			csvNum(d.ServiceArea), csvNum(d.Uncovered), csvNum(d.AddedUncovered), csvNum(d.ClosingRange),
			backup, s.name(d.Backup), csvNum(d.FullCover), csvNum(fr.Range)}, s.coordCells(d.Deepest)...)...)
	}
	return t.bytes()
}

func (s *planScene) assignmentCSV() ([]byte, error) {
	p, a := s.p, s.p.Assignment
	ranged := s.hasRange()
	t := newCSV(append([]string{"point", "name", "device", "device_name", "distance_m", "within_range", "weight"}, s.coordHeads("")...)...)
	for i, q := range p.Demand {
		in := ""
		if ranged {
			in = strconv.FormatBool(a.Within[i])
		}
		t.row(append([]string{strconv.Itoa(i), s.demandName(i), strconv.Itoa(a.Device[i]), s.name(a.Device[i]),
			csvNum(a.Distance[i]), in, csvNum(a.Weight[i])}, s.coordCells(q)...)...)
	}
	return t.bytes()
}

func (s *planScene) loadCSV() ([]byte, error) {
	a := s.p.Assignment
	ranged := s.hasRange()
	t := newCSV(append([]string{"device", "device_name", "count", "weight", "in_range", "in_range_weight"}, s.coordHeads("")...)...)
	for i, ld := range a.Load {
		in, inw := "", ""
		if ranged {
			in, inw = strconv.Itoa(ld.InRange), csvNum(ld.InRangeWeight)
		}
		t.row(append([]string{strconv.Itoa(i), s.name(i), strconv.Itoa(ld.Count), csvNum(ld.Weight), in, inw}, s.coordCells(s.l.Sites[i])...)...)
	}
	return t.bytes()
}
