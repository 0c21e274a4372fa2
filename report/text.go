// report.txt: the human-readable record of a run, plain fixed-width text.
//
// Every number carries its unit. Figures are printed as computed by
// package coverage, rounded for display only: lengths to 0.01 m, areas to
// 0.1 m², shares to 0.001 %, degrees to 7 decimals (about 1 cm). Tables
// show every row, except that the per-site and per-hole tables stop at
// textTableMax rows (the most relevant ones, the rest in the layers);
// free-text columns (names, site lists) come last so the
// numeric columns stay aligned whatever the names are.

package report

import (
	"bytes"
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// maxListed caps lists inside one table cell or line (worst points, nearby
// sites); the full lists are in summary.json.
const maxListed = 6

// textBuf gathers report.txt text and hands it on to w (when not nil)
// whenever more than textFlush bytes are waiting, so a long table is never
// held whole as text (only its cells, see table.go).
type textBuf struct {
	bytes.Buffer
	w   io.Writer
	err error
}

// textFlush is the buffered size at which report.txt text is written on.
const textFlush = 64 << 10

// spill writes the buffered text on once it passes textFlush bytes.
func (b *textBuf) spill() {
	if b.w != nil && b.Len() >= textFlush {
		b.flush()
	}
}

// flush writes the buffered text on and reports the first write error.
func (b *textBuf) flush() error {
	if b.w != nil && b.err == nil {
		_, b.err = b.w.Write(b.Bytes())
		b.Reset()
	}
	return b.err
}

// bufferedText returns the text write produces (for the tests).
func bufferedText(write func(*textBuf)) []byte {
	var b textBuf
	write(&b)
	return b.Bytes()
}

// streamText streams the text write produces to w.
func streamText(w io.Writer, write func(*textBuf)) error {
	b := &textBuf{w: w}
	write(b)
	return b.flush()
}

// text returns the whole report.txt (for the tests).
func (s *scene) text() []byte { return bufferedText(s.writeText) }

// writeTextTo streams report.txt to w.
func (s *scene) writeTextTo(w io.Writer) error { return streamText(w, s.writeText) }

func (s *scene) writeText(b *textBuf) {
	s.textHeader(b)
	if s.m.LifeSafety {
		section(b, "CAUTIONS (LIFE-SAFETY DEVICES)")
		b.WriteString(Cautions() + "\n")
	}
	s.textInputs(b)
	if s.a != nil {
		s.textTerms(b)
		s.textSummary(b)
		s.textGaps(b)
	} else {
		s.textLayoutSummary(b)
	}
	s.textCells(b)
	if s.a != nil {
		s.textHoles(b)
	}
	s.textAccuracy(b)
	s.textClosing(b, reportFileNote)
}

// textClosing writes the sections that close every report: the warnings,
// the output files with note(f) beside each, and the cautions (unless
// they were put first for life-safety devices).
func (s *scene) textClosing(b *textBuf, note func(f string) string) {
	section(b, "WARNINGS")
	if w := s.warnings(); len(w) == 0 {
		b.WriteString("  none\n")
	} else {
		for _, line := range w {
			b.WriteString("  - " + line + "\n")
		}
	}
	section(b, "FILES IN THIS FOLDER")
	for _, f := range s.files {
		b.WriteString("  " + f + strings.Repeat(" ", max(1, 28-len(f))) + note(f) + "\n")
	}
	if !s.m.LifeSafety {
		section(b, "CAUTIONS")
		b.WriteString(Cautions() + "\n")
	}
}

// analysisFileNote is the FILES note of an analysis output file (the
// *-xy.geojson layers share the note of their GeoJSON twin).
func analysisFileNote(f string) string {
	return fileNote[strings.Replace(f, "-xy.geojson", ".geojson", 1)]
}

// reportFileNote is analysisFileNote with report.txt's own note stating
// the row limit of its long tables (textTableMax).
func reportFileNote(f string) string {
	if f == FileReport {
		return reportNote
	}
	return analysisFileNote(f)
}

// reportNote is the FILES note of report.txt in an analysis or cells
// report.
var reportNote = "this report; the service-area and hole tables print at most " + strconv.Itoa(textTableMax) +
	" rows (largest areas, longest-lived holes; every row is in the layers), the gaps table all"

// noteLines writes each line of a notes section, indented.
func noteLines(b *textBuf, lines []string) {
	for _, l := range lines {
		b.WriteString("  " + l + "\n")
	}
}

func section(b *textBuf, title string) {
	b.WriteString("\n" + title + "\n" + strings.Repeat("-", utf8.RuneCountInString(title)) + "\n")
}

func (s *scene) textHeader(b *textBuf) {
	title := "Site coverage report"
	if s.a == nil {
		title = "Service-area report"
	}
	s.textTitle(b, title)
	b.WriteString(numberingNote)
}

// textTitle writes the report's title (base and the report title),
// underlined, and the line naming the program version and command.
func (s *scene) textTitle(b *textBuf, base string) {
	title := s.titled(base)
	b.WriteString(title + "\n" + strings.Repeat("=", utf8.RuneCountInString(title)) + "\n")
	v := s.m.Version
	if v == "" {
		v = "(version not set)"
	}
	fmt.Fprintf(b, "Written by sitecover %s, command %q.\n", v, orDash(s.m.Command))
}

func orDash(v string) string {
	if v == "" {
		return "-"
	}
	return v
}

func (s *scene) textInputs(b *textBuf) {
	section(b, "INPUTS")
	kv := &kvList{}
	kv.add("Sites file", orDash(s.m.SitesFile))
	if s.m.AreaFromHull {
		kv.add("Area file", "none: the convex hull of the sites is the area")
	} else {
		kv.add("Area file", orDash(s.m.AreaFile))
	}
	kv.add("Exclusion file", orDash(s.m.ExcludeFile))
	if s.geographic() {
		kv.add("Coordinates", "WGS84 longitude/latitude, analysed in a local plane (metres)")
	} else {
		kv.add("Coordinates", "local plane x/y in metres, as given (--planar)")
	}
	kv.add("Local plane", orDash(s.projection()))
	if s.geographic() {
		e := s.m.MaxScaleError
		areaErr := 2*e + e*e
		if s.m.AreaRelError > areaErr {
			areaErr = s.m.AreaRelError // with the chords of densified edges
		}
		kv.add("Largest scale error", fmt.Sprintf("|k-1| = %.2g over the extent: plane distances within %.2g %% of the ground, areas within %.2g %%",
			e, 100*e, 100*areaErr))
	} else {
		kv.add("Largest scale error", "none (no projection)")
	}
	n := len(s.l.Sites)
	d := s.duplicates()
	sites := fmt.Sprintf("%d", n)
	if d > 0 {
		sites += fmt.Sprintf(" (%d at the same position as an earlier site, merged: %d distinct positions)", d, n-d)
	}
	kv.add("Sites", sites)
	kv.add("Site area", fmt.Sprintf("%s (%s), exclusion zones removed", m2(s.l.AreaM2), ha(s.l.AreaM2)))
	if s.l.Area != nil {
		holes := s.l.Area.NumRings() - s.l.Area.NumPolygons()
		kv.add("Area outline", Plural(s.l.Area.NumPolygons(), "polygon")+", "+Plural(holes, "exclusion zone"))
	}
	if s.m.AreaNote != "" {
		kv.add("Area built", s.m.AreaNote+" (union of the area polygons minus the union of the exclusion zones)")
	}
	kv.write(b)
}

func (s *scene) textLayoutSummary(b *textBuf) {
	section(b, "SERVICE AREAS IN BRIEF")
	kv := &kvList{}
	var largest float64
	largestSite := -1
	for _, c := range s.cells {
		if c.Farthest > largest || largestSite < 0 {
			largest, largestSite = c.Farthest, c.Site
		}
	}
	if largestSite >= 0 {
		kv.add("Farthest point from its site", fmt.Sprintf("%s, in the service area of %s: the range that covers the whole area",
			metres(largest), s.label(largestSite)))
	}
	kv.write(b)
}

func (s *scene) textSummary(b *textBuf) {
	a := s.a
	section(b, "COVERAGE AT THE PLANNED RANGE")
	kv := &kvList{}
	kv.add("Planned range", metres(a.Range))
	kv.add("Covered", CoveredPercent(a.CoveredFraction, a.UncoveredArea, 3)+" % of the area")
	kv.add("Uncovered", fmt.Sprintf("%s (%s)", m2(a.UncoveredArea), ha(a.UncoveredArea)))
	inner := innerGaps(a.Gaps)
	kv.add("Gaps", fmt.Sprintf("%d (%d at the edge, %d inner; listed below)", len(a.Gaps), len(a.Gaps)-inner, inner))
	kv.add("Pieces of coverage", fmt.Sprintf("%d (separate groups of overlapping disks)", a.Pieces))
	kv.add("Holes open", Plural(a.EnclosedHoles, "hole")+" of the union of disks at this range (see HOLES)")
	kv.write(b)

	section(b, "RANGES")
	kv = &kvList{}
	fc := a.FullCover
	kv.add("Full-cover range", metres(fc.Range)+": the smallest common range that leaves no gap")
	for i, p := range fc.Worst {
		if i == maxListed {
			kv.add("", fmt.Sprintf("... and %d more points at the same distance (all in summary.json)", len(fc.Worst)-maxListed))
			break
		}
		where := s.pointText(p)
		if i < len(fc.WorstSites) {
			where += ", nearest site " + s.label(fc.WorstSites[i])
		}
		key := ""
		if i == 0 {
			key = "  needed at"
		}
		kv.add(key, where)
	}
	pc := s.percentiles()
	kv.add("Range covering 50 %", metres(pc.P50))
	kv.add("Range covering 90 %", metres(pc.P90))
	kv.add("Range covering 95 %", metres(pc.P95))
	kv.add("Range covering 99 %", metres(pc.P99))
	if p := a.Persistence; p != nil {
		kv.add("Link range", metres(p.LinkRange)+": longest edge of the minimum spanning tree; devices linking this far form one mesh")
		kv.add("Connect range", metres(p.ConnectRange)+": at this range all disks form one piece (half the link range)")
	}
	kv.write(b)
}

func (s *scene) textGaps(b *textBuf) {
	a := s.a
	section(b, fmt.Sprintf("GAPS AT %s, BY CLOSING RANGE", metres(a.Range)))
	if len(a.Gaps) == 0 {
		b.WriteString("  none: the whole area is covered at the planned range\n")
		return
	}
	b.WriteString("  Closing range: the range at which the gap vanishes (distance from its deepest\n")
	b.WriteString("  point to the nearest site). Kind: edge or inner (see TERMS).\n\n")
	t := &table{}
	hx, hy := s.pointHeads()
	t.head("Gap", "Area m²", "Closing m", hx, hy, "Kind", "Bordering devices")
	t.left(5, 6)
	t.rows(len(a.Gaps), func(gi int) {
		g := a.Gaps[gi]
		t.int("", g.ID)
		t.num(g.Area, 1)
		t.num(g.ClosingRange, 2)
		s.pointCells(t, s.deepestOut(gi))
		t.str(gapKind(g))
		if t.lastUnmeasured() {
			t.cell()
			return
		}
		for i, site := range g.Sites {
			if i > 0 {
				t.cells = append(t.cells, ", "...)
			}
			if i == maxListed {
				t.cells = append(t.cells, '+')
				t.cells = strconv.AppendInt(t.cells, int64(len(g.Sites)-maxListed), 10)
				t.cells = append(t.cells, " more"...)
				break
			}
			t.cells = s.appendLabel(t.cells, site)
		}
		t.cell()
	})
	t.write(b)
}

func (s *scene) textCells(b *textBuf) {
	if len(s.m.Ranges) > 0 {
		section(b, "SERVICE AREAS (each device's power cell within the area: where its disk reaches deepest, |x−p|² − r² smallest; empty for a hidden device)")
	} else {
		section(b, "SERVICE AREAS (each site's Voronoi cell within the area)")
	}
	if len(s.cells) == 0 {
		b.WriteString("  none\n")
		return
	}
	b.WriteString("  Share: of the whole area. Farthest: the point of the service area farthest\n")
	b.WriteString("  from its site; the site's disk covers its service area at that range.\n")
	order := s.largestCells(textTableMax)
	if order != nil {
		fmt.Fprintf(b, "  The %d largest of the %d service areas, largest first (the rest below).\n", len(order), len(s.cells))
	}
	b.WriteString("\n")
	t := &table{}
	hx, hy := s.pointHeads()
	t.head("Area m²", "Share %", "Farthest m", hx, hy, "Device", "Merged duplicates")
	t.left(5, 6)
	n := len(s.cells)
	if order != nil {
		n = len(order)
	}
	t.rows(n, func(k int) {
		ci := k
		if order != nil {
			ci = int(order[k])
		}
		c := s.cells[ci]
		t.num(c.Area, 1)
		t.num(100*c.Share, 3)
		t.num(c.Farthest, 2)
		s.pointCells(t, s.farthestOut(ci))
		t.str(s.label(c.Site))
		if t.lastUnmeasured() {
			t.cell()
			return
		}
		for k, i := range c.Merged {
			if k > 0 {
				t.cells = append(t.cells, ", "...)
			}
			t.cells = s.appendLabel(t.cells, i)
		}
		t.cell()
	})
	t.write(b)
	if order != nil {
		s.leftOut(b, len(s.cells)-len(order), "smaller service area", FileServiceAreas, len(s.cells))
	}
}

// textTableMax is the most rows report.txt prints of a table with a row
// per service area or per hole, a table meant to be read by people: a
// longer one prints the textTableMax most relevant rows (the largest
// service areas, the longest-lived holes) and says in one line how many
// it left out and which layer holds them all (the GeoJSON layers hold
// every row's figures; summary.json the totals). The gaps table, the
// list of places to act on, is always complete.
const textTableMax = 10000

// largestCells returns the indices into s.cells of the k service areas
// of largest area, largest first (ties in s.cells order), or nil when
// there are no more than k, which are then all printed in their order.
// The k-th largest area is found by sorting a copy of the areas; the
// cells at or above it are then ordered, so the cost is one sort of
// floats and one of max indices.
func (s *scene) largestCells(k int) []int32 {
	n := len(s.cells)
	if n <= k {
		return nil
	}
	areas := make([]float64, n)
	for i, c := range s.cells {
		areas[i] = c.Area
	}
	slices.Sort(areas)
	cut := areas[n-k] // the k-th largest
	order := make([]int32, 0, k)
	for i, c := range s.cells {
		if c.Area > cut {
			order = append(order, int32(i))
		}
	}
	for i, c := range s.cells { // ties at the cut, in order, up to k
		if len(order) == k {
			break
		}
		if c.Area == cut {
			order = append(order, int32(i))
		}
	}
	slices.SortStableFunc(order, func(a, b int32) int { return cmp.Compare(s.cells[b].Area, s.cells[a].Area) })
	return order
}

// leftOut writes the line ending a table cut at textTableMax rows: n rows
// (what, singular noun) left out, and the layer (file, by its GeoJSON
// name) holding all total of them.
func (s *scene) leftOut(b *textBuf, n int, what, file string, total int) {
	fmt.Fprintf(b, "  ... and %s left out here; %s holds all %d.\n", Plural(n, what), LayerFile(file, s.m.Planar), total)
}

func (s *scene) textHoles(b *textBuf) {
	section(b, "HOLES OF THE UNION OF DISKS (persistence of the alpha filtration)")
	p := s.a.Persistence
	if p == nil || len(p.Holes) == 0 {
		b.WriteString("  none: at no range do the disks ring an uncovered hole\n")
		return
	}
	r := s.a.Range
	tol := briefHoleFraction * r
	b.WriteString("  Holes as defined in TERMS, listed by lifetime (closing minus appearance\n")
	b.WriteString("  range), longest first; the closing point is where a hole fills last.\n")
	fmt.Fprintf(b, "  Note \"outside site\": the closing point lies in an exclusion zone or beyond\n")
	fmt.Fprintf(b, "  the site outline, so the part of the hole that lasts longest needs no\n")
	fmt.Fprintf(b, "  coverage. Note \"brief\": the hole lives less than %s (%s of the\n", metresShort(tol), trimFloat(100*briefHoleFraction)+" %")
	fmt.Fprintf(b, "  planned range), too short to matter for planning. Marked holes stay listed.\n")
	open, marked := 0, 0
	for i, h := range p.Holes {
		if h.Birth <= r && r < h.Death {
			open++
			if s.holeNote(i) != "" {
				marked++
			}
		}
	}
	fmt.Fprintf(b, "  At the planned range %s, %d of %s listed %s open (%d of them marked).\n", metres(r), open, Plural(len(p.Holes), "hole"), isAre(open), marked)
	rows := min(len(p.Holes), textTableMax)
	if rows < len(p.Holes) {
		fmt.Fprintf(b, "  The %d longest-lived are printed (the rest below).\n", rows)
	}
	b.WriteString("\n")
	t := &table{}
	hx, hy := s.pointHeads()
	t.head("No", "Appears m", "Closes m", "Lifetime m", hx, hy, "At "+metresShort(r), "Note", "Ringed at appearance by")
	t.left(6, 7, 8)
	t.rows(rows, func(i int) {
		h := p.Holes[i]
		state := "open"
		switch {
		case r < h.Birth:
			state = "not yet"
		case r >= h.Death:
			state = "closed"
		}
		t.int("", i+1)
		t.num(h.Birth, 2)
		t.num(h.Death, 2)
		t.num(h.Death-h.Birth, 2)
		s.pointCells(t, s.closingOut(i))
		t.str(state)
		t.str(orDash(s.holeNote(i)))
		if !t.lastUnmeasured() {
			t.cells = s.appendLabel(t.cells, h.BirthSites[0])
			t.cells = append(t.cells, ", "...)
			t.cells = s.appendLabel(t.cells, h.BirthSites[1])
		}
		t.cell()
	})
	t.write(b)
	if rows < len(p.Holes) {
		s.leftOut(b, len(p.Holes)-rows, "shorter-lived hole", FileHoleClosings, len(p.Holes))
	}
}

// briefHoleFraction is the lifetime, as a fraction of the planned range,
// below which a hole is marked "brief": at 1 % (1.2 m at 120 m) a hole
// closes before any practical change of range or position would notice it.
const briefHoleFraction = 0.01

// textTerms defines, once, the two words the report keeps apart: gaps (of
// the site) and holes (of the union of disks).
func (s *scene) textTerms(b *textBuf) {
	section(b, "TERMS")
	noteLines(b, []string{
		"Gap   a connected part of the site area out of reach of every device at",
		"      the planned range; measured inside the site only. Kind \"edge\": it",
		"      reaches the site outline or an exclusion zone; \"inner\": coverage",
		"      surrounds it on every side.",
		"Hole  a bounded region outside the union of the disks and surrounded by",
		"      them (the topological view, whatever the site): it appears at the",
		"      range where a ring of disks closes around it and closes at the range",
		"      where the disks fill it. A hole may lie partly or wholly outside the",
		"      site; an edge gap may be the part of a hole that the outline cuts.",
	})
}

// CoveredPercent formats a covered share (fraction of the area, 0..1) as
// a percentage with d decimals, never rounding to a whole when it is not:
// when uncoveredM2 > 0 but the share would print as 100 it is written
// "> 99.99" (d = 2), and a positive share that would print as 0 is written
// "< 0.01". A share of exactly full or no cover prints as usual. The "%"
// sign is left to the caller.
func CoveredPercent(fraction, uncoveredM2 float64, d int) string {
	v := 100 * math.Max(0, math.Min(1, fraction))
	s := strconv.FormatFloat(v, 'f', d, 64)
	step := math.Pow(10, -float64(d))
	switch {
	case uncoveredM2 > 0 && s == strconv.FormatFloat(100, 'f', d, 64):
		return "> " + strconv.FormatFloat(100-step, 'f', d, 64)
	case fraction > 0 && s == strconv.FormatFloat(0, 'f', d, 64):
		return "< " + strconv.FormatFloat(step, 'f', d, 64)
	}
	return s
}

// Plural returns a count and its noun, the noun plural unless n is 1
// ("1 gap", "2 gaps"). Every count written in words goes through it.
func Plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// isAre is the verb agreeing with a count n: "is" for 1, "are" otherwise.
func isAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}

// innerGaps counts the gaps surrounded by coverage (not touching the
// site outline or an exclusion zone).
func innerGaps(gaps []coverage.Gap) int {
	n := 0
	for _, g := range gaps {
		if !g.TouchesBoundary {
			n++
		}
	}
	return n
}

// gapKind is a gap's kind as the reports name it: "edge" or "inner".
func gapKind(g coverage.Gap) string {
	if g.TouchesBoundary {
		return "edge"
	}
	return "inner"
}

// holeNote returns the mark of hole i (see textHoles for the rules):
// "outside site" when its closing point is not in the site area, "brief"
// when it lives less than briefHoleFraction of the planned range, both
// joined, or "". The marks are computed once for all holes, with one
// index over the area's edges.
func (s *scene) holeNote(i int) string {
	s.notesOnce.Do(func() {
		holes := s.a.Persistence.Holes
		holes = holes[:s.kept(len(holes))]
		tol := briefHoleFraction * s.a.Range
		var ix *planar.RegionIndex
		if s.l.Area != nil && len(holes) > 0 {
			ix = s.l.Area.Index()
		}
		s.holeNotes = make([]string, len(holes))
		planar.ParallelChunks(len(holes), 1<<14, 0, func(_, lo, hi int) {
			for k := lo; k < hi; k++ {
				s.holeNotes[k] = holeNoteOf(&holes[k], tol, ix)
			}
		})
	})
	return s.holeNotes[i]
}

// holeNoteOf is the note of one hole (holeNote): its closing point
// outside the site area (ix, nil for none), its life shorter than tol.
func holeNoteOf(h *coverage.Hole, tol float64, ix *planar.RegionIndex) string {
	out := ix != nil && !ix.Contains(h.DeathPoint[0], h.DeathPoint[1])
	brief := h.Death-h.Birth < tol
	switch {
	case out && brief:
		return "outside site, brief"
	case out:
		return "outside site"
	case brief:
		return "brief"
	}
	return ""
}

func (s *scene) textAccuracy(b *textBuf) {
	section(b, "ACCURACY AND NOTES")
	lines := []string{
		"Areas, covered share, uncovered area, gap areas, service areas and the",
		"full-cover range are closed-form results (polygon-disk intersections,",
		"Voronoi vertices), exact up to floating-point rounding; they are printed",
		"rounded to 0.1 m², 0.001 % and 0.01 m.",
		"The 50/90/95/99 % ranges are inverted from the exact coverage curve to",
		"within 1e-9 of the full-cover range.",
		fmt.Sprintf("Gap outlines (%s and the coverage map) replace circular arcs by", LayerFile(FileGaps, s.m.Planar)),
		fmt.Sprintf("chords lying inside the disks, sagitta at most %s of the range (%s at", trimFloat(100*s.chordTol())+" %", metresShort(s.chordTol()*s.rangeOrZero())),
		"the planned range): each outline contains its true gap. Gap areas are exact.",
		"Service-area outlines are exact (straight cell edges).",
	}
	if s.a != nil {
		lines = append(lines, s.roundingNote()...)
	}
	if s.geographic() {
		lines = append(lines,
			"Points are WGS84 latitude and longitude in degrees with hemisphere letters,",
			"rounded to 7 decimals (about 1 cm). summary.json and the GeoJSON layers",
			"hold the same points as numbers in RFC 7946 order: longitude first",
			"(negative west and south); polygon exterior rings counter-clockwise,",
			"polygon holes clockwise.")
	} else {
		lines = append(lines,
			"Points are local plane x/y in metres, rounded to 1 mm. The GeoJSON layers",
			"(*-xy.geojson) hold the same x/y metres, not WGS84 longitude/latitude,",
			"so they do not follow RFC 7946; load them in a local CRS.")
	}
	lines = append(lines,
		"Maps are drawn in the local plane with north up: the plane's y axis is",
		"grid north (for geographic input it differs from true north by the",
		"meridian convergence, a fraction of a degree over a site).")
	noteLines(b, lines)
}

// fileNote describes each output file in the FILES section.
var fileNote = map[string]string{
	FileReport:          "this report",
	FileSummary:         "all figures, machine-readable (long lists: first 1000, all in the layers)",
	FileSites:           "device sites (points)",
	FileServiceAreas:    "service areas (polygons) with area, share, farthest point",
	FileGaps:            "gaps at the planned range (polygons) with their figures",
	FileHoleClosings:    "where each hole of the union of disks closes (points)",
	FileCovered:         "covered area at the planned range, one polygon per connected part",
	FileMapServiceAreas: "map of the service areas",
	FileMapCoverage:     "map of coverage and gaps at the planned range",
	FileChartCurve:      "chart: covered share against range",
	FileChartHoles:      "chart: hole appearance against closing range",
	FileGeoPackage:      "every layer above in one GeoPackage (one table each, spatial index)",
	FileManifest:        "which run made this folder: version, command, inputs with checksums, every file",
}

// chordTol is the relative chord tolerance of the gap outlines.
func (s *scene) chordTol() float64 {
	if s.m.ChordTolerance > 0 {
		return s.m.ChordTolerance
	}
	return coverage.DefaultChordTolerance
}

func (s *scene) rangeOrZero() float64 {
	if s.a == nil {
		return 0
	}
	return s.a.Range
}

// The one coordinate format of every text output (stdout, report.txt,
// the planning reports): latitude then longitude in degrees with
// hemisphere letters, 7 decimals (1e-7° is at most 1.1 cm), e.g.
// "44.3807215°N 99.8651782°W", so the order cannot be misread; local plane
// points as "x 12.345 m, y 67.890 m" (1 mm). Tables put the same two
// strings in two columns. summary.json and the GeoJSON layers keep
// numbers in [lon, lat] order as RFC 7946 requires.
const (
	degreeDecimals = 7
	metreDecimals  = 3
)

// FormatPoint formats an output point p of a document whose
// "coordinates" member is kind ("lon_lat" or "x_y") in the one text form.
func FormatPoint(p Point, kind string) string {
	if kind == "lon_lat" {
		b := appendDegrees(nil, p[1], "N", "S")
		b = append(b, ' ')
		return string(appendDegrees(b, p[0], "E", "W"))
	}
	return string(appendXY(nil, p))
}

// appendDegrees appends |v| with degreeDecimals decimals, "°" and the
// hemisphere letter (pos for v ≥ 0, else neg).
func appendDegrees(b []byte, v float64, pos, neg string) []byte {
	h := pos
	if v < 0 {
		h, v = neg, -v
	}
	b = strconv.AppendFloat(b, v, 'f', degreeDecimals, 64)
	b = append(b, "°"...)
	return append(b, h...)
}

// appendXY appends a local point as "x 12.345 m, y 67.890 m".
func appendXY(b []byte, p Point) []byte {
	b = append(b, "x "...)
	b = strconv.AppendFloat(b, p[0], 'f', metreDecimals, 64)
	b = append(b, " m, y "...)
	b = strconv.AppendFloat(b, p[1], 'f', metreDecimals, 64)
	return append(b, " m"...)
}

// pointHeads returns the column heads of a point.
func (s *scene) pointHeads() (string, string) {
	if s.geographic() {
		return "Latitude", "Longitude"
	}
	return "x m", "y m"
}

// pointCols returns a point as two table cells (latitude, longitude or
// x, y).
func (s *scene) pointCols(p orb.Point) (string, string) { return s.outCols(s.point(p)) }

// outCols returns an output point as two table cells (latitude,
// longitude or x, y), as FormatPoint writes them.
func (s *scene) outCols(q Point) (string, string) {
	if s.geographic() {
		return string(appendDegrees(nil, q[1], "N", "S")), string(appendDegrees(nil, q[0], "E", "W"))
	}
	return strconv.FormatFloat(q[0], 'f', metreDecimals, 64), strconv.FormatFloat(q[1], 'f', metreDecimals, 64)
}

// pointCells adds an output point to t as two cells, as outCols formats
// it.
func (s *scene) pointCells(t *table, q Point) {
	if s.geographic() {
		t.cells = appendDegrees(t.cells, q[1], "N", "S")
		t.cell()
		t.cells = appendDegrees(t.cells, q[0], "E", "W")
		t.cell()
		return
	}
	t.num(q[0], metreDecimals)
	t.num(q[1], metreDecimals)
}

// pointText returns a point as text (FormatPoint).
func (s *scene) pointText(p orb.Point) string { return FormatPoint(s.point(p), s.coordKind()) }

func metres(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return fmt.Sprint(v)
	}
	return fmt.Sprintf("%.2f m", v)
}

func m2(v float64) string { return AreaNumber(v, 1) + " m²" }

// AreaNumber formats an area in m² with d decimals, never rounding a
// positive area to zero: an uncovered remnant of 0.01 m² reads "< 0.1"
// (d = 1), not "0.0", in line with CoveredPercent. The unit is left to
// the caller.
func AreaNumber(v float64, d int) string {
	s := strconv.FormatFloat(v, 'f', d, 64)
	if v > 0 && s == strconv.FormatFloat(0, 'f', d, 64) {
		return "< " + strconv.FormatFloat(math.Pow(10, -float64(d)), 'f', d, 64)
	}
	return s
}

func ha(v float64) string { return fmt.Sprintf("%.4f ha", v/1e4) }

// kvList is an aligned list of "key   value" lines.
type kvList struct{ k, v []string }

func (l *kvList) add(k, v string) { l.k = append(l.k, k); l.v = append(l.v, v) }

func (l *kvList) write(b *textBuf) {
	w := 0
	for _, k := range l.k {
		w = max(w, utf8.RuneCountInString(k))
	}
	for i, k := range l.k {
		b.WriteString("  " + k + strings.Repeat(" ", w-utf8.RuneCountInString(k)) + "  " + l.v[i] + "\n")
	}
}
