// The holes of the union of disks when devices have their own ranges
// (coverage.PowerPersistence, coverage.HoleClosing): the HOLES section of
// report.txt, the holes of summary.json and the hole-closings layer, every
// figure in metres.
//
// A weighted persistence pair is a pair of uniform power growths t (every
// device's range √(r_i² + t)). One number in metres stands for such a
// growth: the range the reference devices then have, √(r_ref² + t), the
// reference being the devices of the longest planned range (the first
// such group by type). It is never below 0: no growth in the filtration is
// below −r_ref². The coverage curve chart uses the same axis
// (ranges_charts.go). For a hole open at the planned ranges the closing
// adds what each bordering device would need and the single-device fix.
//
// Marks, as for one common range: "outside site" when the closing point
// is not in the site area, "brief" when the reference range changes by
// less than briefHoleFraction of its planned value over the hole's life.

package report

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report/gpkg"
)

// holesMeaning is the sentence report.txt gives on what a hole's figures
// mean with different ranges.
const holesMeaning = "A hole appears and closes as all ranges grow together (each device's r² by\n" +
	"  the same amount), stated as the range the reference devices then have; an\n" +
	"  open hole's fix is the one device whose range alone, raised least, fills it.\n"

// RangesHole is one hole of the union of disks in summary.json.
type RangesHole struct {
	// AppearsRefM and ClosesRefM are the reference devices' range when the
	// hole appears and closes as all ranges grow together
	// (RangesDoc.ReferenceRangeM); AppearsM2 and ClosesM2 the growth of r²
	// (m²) itself.
	AppearsRefM  float64 `json:"appears_ref_range_m"`
	ClosesRefM   float64 `json:"closes_ref_range_m"`
	AppearsM2    float64 `json:"appears_growth_m2"`
	ClosesM2     float64 `json:"closes_growth_m2"`
	ClosingPoint Point   `json:"closing_point"`
	// Open is true when the hole is open at the planned ranges; Note its
	// marks ("outside site", "brief") or "".
	Open bool   `json:"open"`
	Note string `json:"note"`
	// Sites are the bordering devices of an open hole and NeededM the
	// range each would need for it to close as all grow together; FixSite
	// the device whose range alone, raised least, closes it (−1 when not
	// open or too large to search) and FixRangeM that range.
	Sites     []int     `json:"sites"`
	NeededM   []float64 `json:"needed_range_m"`
	FixSite   int       `json:"fix_site"`
	FixLabel  string    `json:"fix_label"`
	FixRangeM float64   `json:"fix_range_m"`
}

// refRange returns the reference devices' range after growth t.
func (rs *rangesScene) refRange(t float64) float64 {
	return math.Sqrt(math.Max(0, rs.refM*rs.refM+t))
}

// refName names the reference devices in text ("gateway devices (150 m)").
func (rs *rangesScene) refName() string {
	if rs.refType == "" {
		return fmt.Sprintf("the %s devices", metresShort(rs.refM))
	}
	return fmt.Sprintf("the %s devices (%s)", rs.refType, metresShort(rs.refM))
}

// rangesHoleNotes returns the mark of every hole (file comment).
func (rs *rangesScene) rangesHoleNotes() []string {
	p := rs.ra.Persistence
	if p == nil {
		return nil
	}
	tol := briefHoleFraction * rs.refM
	var ix *planar.RegionIndex
	if rs.l.Area != nil && len(p.Holes) > 0 {
		ix = rs.l.Area.Index()
	}
	notes := make([]string, len(p.Holes))
	for k, h := range p.Holes {
		var marks []string
		if ix != nil && !ix.Contains(h.DeathPoint[0], h.DeathPoint[1]) {
			marks = append(marks, "outside site")
		}
		if rs.refRange(h.Death)-rs.refRange(h.Birth) < tol {
			marks = append(marks, "brief")
		}
		notes[k] = strings.Join(marks, ", ")
	}
	return notes
}

// holeOrder returns the hole indices by decreasing lifetime in reference
// metres (ties in the order of the persistence pairs).
func (rs *rangesScene) holeOrder() []int {
	holes := rs.ra.Persistence.Holes
	order := make([]int, len(holes))
	life := make([]float64, len(holes))
	for k, h := range holes {
		order[k], life[k] = k, rs.refRange(h.Death)-rs.refRange(h.Birth)
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(life[b], life[a]) })
	return order
}

// holeOpen reports whether hole k is open at the planned ranges.
func (rs *rangesScene) holeOpen(k int) bool {
	h := rs.ra.Persistence.Holes[k]
	return h.Birth <= 0 && 0 < h.Death
}

// summaryHole is hole k with its note and closing in metres.
func (rs *rangesScene) summaryHole(k int, note string) RangesHole {
	h := rs.ra.Persistence.Holes[k]
	out := RangesHole{AppearsRefM: rs.refRange(h.Birth), ClosesRefM: rs.refRange(h.Death), AppearsM2: h.Birth, ClosesM2: h.Death,
		ClosingPoint: rs.point(h.DeathPoint), Open: rs.holeOpen(k), Note: note, Sites: []int{}, NeededM: []float64{}, FixSite: -1}
	if k < len(rs.ra.HoleClosings) {
		if c := rs.ra.HoleClosings[k]; c != nil {
			out.Sites = append(out.Sites, c.Sites...)
			out.NeededM = append(out.NeededM, c.Needed...)
			out.FixSite, out.FixRangeM = c.Device, c.DeviceRange
			if c.Device >= 0 {
				out.FixLabel = rs.label(c.Device)
			}
		}
	}
	return out
}

// summaryHoles returns the first SummaryListMax holes for summary.json and
// the number of holes.
func (rs *rangesScene) summaryHoles() ([]RangesHole, int) {
	p := rs.ra.Persistence
	out := []RangesHole{}
	if p == nil {
		return out, 0
	}
	notes := rs.rangesHoleNotes()
	for _, k := range rs.holeOrder()[:min(len(p.Holes), SummaryListMax)] {
		out = append(out, rs.summaryHole(k, notes[k]))
	}
	return out, len(p.Holes)
}

// textHolesRanges writes the HOLES section: every hole with its
// appearance and closing in reference metres, its closing point and, when
// open at the planned ranges, its fix and closing ranges.
func (rs *rangesScene) textHolesRanges(b *textBuf) {
	section(b, "HOLES OF THE UNION OF DISKS (persistence of the weighted alpha filtration)")
	p := rs.ra.Persistence
	if p == nil || len(p.Holes) == 0 {
		b.WriteString("  none: at no growth do the disks ring an uncovered hole\n")
		return
	}
	b.WriteString("  Holes as defined in TERMS, longest-lived first (lifetime in reference\n")
	b.WriteString("  metres); the closing point is where a hole fills last.\n  " + holesMeaning)
	fmt.Fprintf(b, "  Reference devices: %s.\n", rs.refName())
	fmt.Fprintf(b, "  Notes: \"outside site\": the closing point lies outside the site area;\n")
	fmt.Fprintf(b, "  \"brief\": the reference range changes less than %s while the hole lives.\n", metresShort(briefHoleFraction*rs.refM))
	notes := rs.rangesHoleNotes()
	open := 0
	for k := range p.Holes {
		if rs.holeOpen(k) {
			open++
		}
	}
	fmt.Fprintf(b, "  At the planned ranges %d of %s listed %s open.\n\n", open, Plural(len(p.Holes), "hole"), isAre(open))
	t := &table{}
	hx, hy := rs.pointHeads()
	t.head("No", "Appears ref m", "Closes ref m", hx, hy, "At planned", "Note", "Single-device fix", "Closing ranges (all grow together)")
	t.left(5, 6, 7, 8)
	order := rs.holeOrder()
	t.rows(len(p.Holes), func(i int) {
		k := order[i]
		h := rs.summaryHole(k, notes[k])
		state := "open"
		switch {
		case 0 < p.Holes[k].Birth:
			state = "not yet"
		case p.Holes[k].Death <= 0:
			state = "closed"
		}
		t.int("", i+1)
		t.num(h.AppearsRefM, 2)
		t.num(h.ClosesRefM, 2)
		rs.pointCells(t, h.ClosingPoint)
		t.str(state)
		t.str(orDash(h.Note))
		fix := "-"
		if h.FixSite >= 0 {
			fix = fmt.Sprintf("%s to %s m", h.FixLabel, metresNum(h.FixRangeM))
		}
		t.str(fix)
		t.str(orDash(rs.neededText(h.Sites, h.NeededM)))
	})
	t.write(b)
}

// neededText lists devices with the range each needs ("A 80.00 m, B
// 61.20 m").
func (rs *rangesScene) neededText(sites []int, needed []float64) string {
	var parts []string
	for k, i := range sites {
		if k < len(needed) {
			parts = append(parts, rs.label(i)+" "+metresNum(needed[k])+" m")
		}
	}
	return strings.Join(parts, ", ")
}

// holesLayerRanges is the closing point of each hole with its figures in
// metres.
func (rs *rangesScene) holesLayerRanges() *layerDef {
	return &layerDef{geom: gpkg.Point,
		fields: fieldList("appears_ref_range_m", gpkg.Real, "closes_ref_range_m", gpkg.Real, "appears_growth_m2", gpkg.Real,
			"closes_growth_m2", gpkg.Real, "open", gpkg.Boolean, "note", gpkg.Text, "sites", gpkg.Text,
			"fix_site", gpkg.Integer, "fix_label", gpkg.Text, "fix_range_m", gpkg.Real),
		each: func(emit emitFunc) error {
			p := rs.ra.Persistence
			if p == nil {
				return nil
			}
			notes := rs.rangesHoleNotes()
			for _, k := range rs.holeOrder() {
				h := rs.summaryHole(k, notes[k])
				if err := emit(orb.Point(h.ClosingPoint), values(h.AppearsRefM, h.ClosesRefM, h.AppearsM2, h.ClosesM2, h.Open, h.Note,
					joinInts(h.Sites), h.FixSite, h.FixLabel, h.FixRangeM)...); err != nil {
					return err
				}
			}
			return nil
		}}
}
