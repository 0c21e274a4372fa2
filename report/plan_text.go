// report.txt of the planning moves: the same plain fixed-width layout as
// the analysis report (header, inputs, the existing layout, the move's
// sections, accuracy notes, warnings, files, cautions), figures rounded
// for display only — lengths to 0.01 m, areas to 0.1 m², shares to
// 0.001 %, degrees to 7 decimals.

package report

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"

	"github.com/sitecover/sitecover/coverage"
)

// maxDemandRows is the largest number of demand items listed one by one
// in report.txt; beyond it only the items out of range are listed (all
// items are in assignment.csv and summary.json).
const maxDemandRows = 200

// moveTitle is the report title of a move.
var moveTitle = map[Move]string{
	MoveAdd:        "Suggested additions",
	MoveFewest:     "Fewest additions for full cover",
	MoveCandidates: "Choice among candidate spots",
	MoveFailures:   "Device failures",
	MoveAssign:     "Assignment of demand to devices",
}

// planText returns the whole report.txt (for the tests).
func (s *planScene) planText() []byte { return bufferedText(s.writePlanText) }

// writePlanTextTo streams report.txt to w.
func (s *planScene) writePlanTextTo(w io.Writer) error { return streamText(w, s.writePlanText) }

func (s *planScene) writePlanText(b *textBuf) {
	s.textTitle(b, moveTitle[s.p.Move])
	b.WriteString(numberingNote)
	if s.m.LifeSafety {
		section(b, "CAUTIONS (LIFE-SAFETY DEVICES)")
		b.WriteString(Cautions() + "\n")
	}
	s.textInputs(b)
	s.planInputs(b)
	s.textTerms(b)
	s.textExisting(b)
	switch s.p.Move {
	case MoveAdd, MoveFewest:
		s.textSuggestion(b)
	case MoveCandidates:
		s.textCandidates(b)
	case MoveFailures:
		s.textFailures(b)
	case MoveAssign:
		s.textAssignment(b)
	}
	s.textPlanNotes(b)
	s.textClosing(b, planFileNote)
}

// planInputs adds the move's own inputs under INPUTS.
func (s *planScene) planInputs(b *textBuf) {
	kv := &kvList{}
	switch s.p.Move {
	case MoveCandidates:
		kv.add("Candidates file", fmt.Sprintf("%s (%d candidate spots)", orDash(s.m.CandidatesFile), len(s.p.Candidates)))
	case MoveAssign:
		polys := 0
		for _, p := range s.p.DemandPolygons {
			if p != nil {
				polys++
			}
		}
		what := Plural(len(s.p.Demand), "demand item")
		if polys > 0 {
			what += fmt.Sprintf(" (%s, each placed at a point on it)", Plural(polys, "polygon"))
		}
		if s.p.Weighted {
			what += ", weighted"
		} else {
			what += ", no weights (each counts 1)"
		}
		kv.add("Demand file", orDash(s.m.PointsFile)+": "+what)
	}
	if len(kv.k) > 0 {
		kv.write(b)
	}
}

// rangeText describes the range of the figures.
func (s *planScene) rangeText() string {
	if !s.hasRange() {
		return "none given: distances only, no within-range figures"
	}
	if s.p.own() {
		return "each device's own: " + groupsText(s.rangeGroups(nil))
	}
	t := metres(s.p.Range)
	if !s.p.RangeGiven && s.p.RangeNote != "" {
		t += " (no range given: " + s.p.RangeNote + ")"
	}
	return t
}

func (s *planScene) textExisting(b *textBuf) {
	p := s.p
	section(b, "THE EXISTING LAYOUT")
	kv := &kvList{}
	kv.add("Range of the figures", s.rangeText())
	if s.hasRange() {
		kv.add("Covered", CoveredPercent(s.fraction(p.Uncovered), p.Uncovered, 3)+" % of the area")
		kv.add("Uncovered", fmt.Sprintf("%s (%s)", m2(p.Uncovered), ha(p.Uncovered)))
	}
	if p.Move == MoveAdd || p.Move == MoveFewest || p.Move == MoveCandidates {
		kv.add("Gaps", fmt.Sprintf("%d at %s", len(p.GapsBefore), s.atText(false)))
	}
	if fc := p.FullCoverRanges; fc != nil {
		s.textFullCoverRanges(kv, fc)
		kv.write(b)
		return
	}
	fc := metres(p.FullCover.Range) + ": the smallest common range that leaves no gap"
	kv.add("Full-cover range", fc)
	if len(p.FullCover.Worst) > 0 {
		w := s.pointText(p.FullCover.Worst[0])
		if len(p.FullCover.WorstSites) > 0 {
			w += ", nearest site " + s.label(p.FullCover.WorstSites[0])
		}
		kv.add("  needed at", w)
	}
	kv.write(b)
}

// atText names the range of the covered figures: the common range, or the
// planned ranges (upper case for a section title).
func (s *planScene) atText(upper bool) string {
	switch {
	case !s.p.own():
		return metres(s.p.Range)
	case upper:
		return "THE PLANNED RANGES"
	}
	return "the planned ranges"
}

// newText describes the added devices' range with per-device ranges:
// "range 150.00 m", with their type when given.
func (s *planScene) newText() string {
	t := "range " + metres(s.p.NewRange)
	if s.p.NewType != "" {
		t = s.p.NewType + " " + t
	}
	return t
}

// fullCoverKey is the label of the full-cover figures of suggest and
// candidates.
func (s *planScene) fullCoverKey() string {
	if s.p.CandidateRanges != nil && s.p.Choice != nil {
		return "Device of " + metres(s.p.Choice.NewRange) + " needs (r² grown alike)"
	}
	if s.p.own() {
		return "New device needs (r² grown alike)"
	}
	return "Full-cover range"
}

// textFullCoverRanges adds the full-cover figure of devices with their own
// ranges and the hidden devices to kv.
func (s *planScene) textFullCoverRanges(kv *kvList, fc *coverage.RangesFullCover) {
	if fc.Covered {
		kv.add("Full-cover ranges", "the planned ranges: no gap")
	} else {
		kv.add("Full-cover ranges", GroupsText(s.rangeGroups(nil), s.rangeGroups(func(i int) float64 { return s.grownRange(fc.Needed, false, i) })))
		kv.add("", "(every device's r² grown by the same amount until no gap is left)")
		if len(fc.Worst) > 0 && len(fc.WorstSites) > 0 {
			kv.add("  needed at", s.pointText(fc.Worst[0])+", in the service area of "+s.label(fc.WorstSites[0]))
		}
	}
	kv.add("Redundant (hidden)", s.hiddenText())
}

// hiddenText lists the hidden devices ("none" when there is none).
func (s *planScene) hiddenText() string {
	if len(s.l.Hidden) == 0 {
		return "none"
	}
	return (&rangesScene{scene: s.scene}).labels(s.l.Hidden, "none") + ": the others cover their whole disk"
}

// groupsText lists device groups as "type 150.00 m (3 devices)" (without
// a type: "150.00 m (3 devices)").
func groupsText(gs []RangeGroup) string {
	var parts []string
	for _, g := range gs {
		t := metres(g.RangeM) + " (" + Plural(g.Devices, "device") + ")"
		if g.Type != "" {
			t = g.Type + " " + t
		}
		parts = append(parts, t)
	}
	return strings.Join(parts, ", ")
}

// GroupsText lists the range each group of devices needs, grown[k] being
// group planned[k] (the same grouping: PlanDoc.RangeGroups with
// FullCoverRanges or SurviveAnySingleFailureRanges), as "gateway (150 m):
// 197.60 m", or "40 m devices: 80.00 m" without a type.
func GroupsText(planned, grown []RangeGroup) string {
	var parts []string
	for k, g := range grown {
		name := trimFloat(planned[k].RangeM) + " m devices"
		if g.Type != "" {
			name = g.Type + " (" + trimFloat(planned[k].RangeM) + " m)"
		}
		parts = append(parts, name+": "+metres(g.RangeM))
	}
	return strings.Join(parts, ", ")
}

func (s *planScene) textSuggestion(b *textBuf) {
	p, sg := s.p, s.p.Suggestion
	switch {
	case p.Move == MoveAdd && p.own():
		section(b, fmt.Sprintf("%d SUGGESTED DEVICES OF %s (free placement)", len(sg.Added), strings.ToUpper(s.newText())))
		b.WriteString("  Each new device goes to the point that needs the largest growth of every r²\n")
		b.WriteString("  to be covered (farthest-point insertion with powers |x - p|² - r²), the\n")
		b.WriteString("  power cells recomputed after each. Existing devices stay where they are.\n")
		b.WriteString("  Full cover: the range a new device would need with every r² grown alike\n")
		b.WriteString("  until no gap is left. Figures before and after each addition, in order:\n\n")
	case p.Move == MoveAdd:
		section(b, fmt.Sprintf("%d SUGGESTED DEVICES (free placement)", len(sg.Added)))
		b.WriteString("  Each new device goes to the point farthest from every device (farthest-point\n")
		b.WriteString("  insertion, Gonzalez 1985), then moves to the centre of the smallest circle\n")
		b.WriteString("  enclosing its service area while the full-cover range falls. Existing devices\n")
		b.WriteString("  stay where they are. Figures before and after each addition, in order:\n\n")
	default:
		title := fmt.Sprintf("FEWEST ADDITIONS FOR NO GAP AT %s", s.atText(true))
		if p.own() {
			title = fmt.Sprintf("FEWEST ADDITIONS OF %s FOR NO GAP AT THE PLANNED RANGES", strings.ToUpper(s.newText()))
		}
		section(b, title)
		kv := &kvList{}
		switch {
		case len(sg.Added) == 0 && sg.Reached:
			kv.add("Additions needed", "none: no gap at this range")
		case sg.Reached:
			kv.add("Additions needed", fmt.Sprintf("%d (by %s), %s in all", len(sg.Added), sg.Method, Plural(sg.TotalDevices, "device")))
		default:
			kv.add("Additions", fmt.Sprintf("%d placed, and gaps remain: the search stopped at its cap (%s)", len(sg.Added), sg.Method))
		}
		kv.add("Hexagonal estimate", fmt.Sprintf("%.2f devices (%d): area / ((3*sqrt(3)/2) r²), the thinnest covering of", sg.HexEstimate, sg.HexDevices))
		kv.add("", "the plane by equal disks (Kershner 1939); boundaries make real sites need more")
		if sg.HexEstimate > 0 {
			kv.add("Plan against estimate", fmt.Sprintf("%s = %.2f times the estimate (1 is the unreachable ideal)", Plural(sg.TotalDevices, "device"), sg.HexRatio))
		}
		kv.write(b)
		if len(sg.Added) == 0 {
			return
		}
		b.WriteString("\n  The new devices, in the order placed, with the figures before and after each:\n\n")
	}
	t := &table{}
	hx, hy := s.pointHeads()
	full := "Full cover m"
	if p.own() {
		full = "New needs m"
	}
	t.head("New", hx, hy, full, "after m", "Covered %", "after %", "Uncovered m²", "after m²")
	for j, st := range sg.Steps {
		px, py := s.pointCols(st.Added)
		t.row(fmt.Sprintf("+%d", j+1), px, py,
			fmt.Sprintf("%.2f", st.FullCoverBefore), fmt.Sprintf("%.2f", st.FullCoverAfter),
			CoveredPercent(st.CoveredBefore, st.UncoveredBefore, 3), CoveredPercent(st.CoveredAfter, st.UncoveredAfter, 3),
			fmt.Sprintf("%.1f", st.UncoveredBefore), fmt.Sprintf("%.1f", st.UncoveredAfter))
	}
	t.write(b)
	section(b, "BEFORE AND AFTER")
	kv := &kvList{}
	kv.add("Devices", fmt.Sprintf("%d existing + %d new = %d", sg.Existing, len(sg.Added), sg.Existing+len(sg.Added)))
	kv.add(s.fullCoverKey(), fmt.Sprintf("%s -> %s", metres(sg.FullCoverBefore), metres(sg.FullCoverAfter)))
	kv.add("Covered at "+s.atText(false), CoveredPercent(sg.CoveredBefore, sg.UncoveredBefore, 3)+" % -> "+CoveredPercent(sg.CoveredAfter, sg.UncoveredAfter, 3)+" %")
	kv.add("Uncovered", fmt.Sprintf("%s -> %s", m2(sg.UncoveredBefore), m2(sg.UncoveredAfter)))
	kv.add("Gaps", fmt.Sprintf("%d -> %d", len(p.GapsBefore), len(p.GapsAfter)))
	kv.write(b)
	s.textGapList(b, "GAPS LEFT WITH THE NEW DEVICES", p.GapsAfter, "none: the new layout leaves no gap at this range")
}

// textGapList writes a table of gaps (id, area, closing range, deepest
// point, kind).
func (s *planScene) textGapList(b *textBuf, title string, gaps []coverage.Gap, none string) {
	section(b, fmt.Sprintf("%s AT %s", title, s.atText(true)))
	if len(gaps) == 0 {
		b.WriteString("  " + none + "\n")
		return
	}
	t := &table{}
	hx, hy := s.pointHeads()
	t.head("Gap", "Area m²", "Closing m", hx, hy, "Kind")
	t.left(5)
	total := 0.0
	for _, g := range gaps {
		total += g.Area
	}
	t.rows(len(gaps), func(i int) {
		g := gaps[i]
		px, py := s.pointCols(g.Deepest)
		t.row(fmt.Sprint(g.ID), fmt.Sprintf("%.1f", g.Area), fmt.Sprintf("%.2f", g.ClosingRange), px, py, gapKind(g))
	})
	t.write(b)
	fmt.Fprintf(b, "  %s, %s in all.\n", Plural(len(gaps), "gap"), m2(total))
}

func (s *planScene) textCandidates(b *textBuf) {
	p, ch := s.p, s.p.Choice
	if p.Requested > 0 {
		section(b, fmt.Sprintf("CHOICE OF %d AMONG %d CANDIDATE SPOTS AT %s", p.Requested, len(p.Candidates), s.atText(true)))
	} else {
		section(b, fmt.Sprintf("FEWEST CANDIDATE SPOTS FOR NO GAP AT %s", s.atText(true)))
	}
	switch {
	case p.CandidateRanges != nil:
		b.WriteString("  At each picked spot a device of the spot's own range (else " + s.newText() + "); gains and\n")
		b.WriteString("  figures from the power cells (where |x - p|² - r² is smallest), recomputed after each\n")
		b.WriteString("  pick; the full-cover figure is stated for a device of the largest spot range, " + metres(ch.NewRange) + ".\n")
	case p.own():
		b.WriteString("  A device of " + s.newText() + " at each picked spot; gains and figures from the\n")
		b.WriteString("  power cells (where |x - p|² - r² is smallest), recomputed after each pick.\n")
	}
	b.WriteString("  Greedy choice: each pick is the spot that adds the most covered area, exact\n")
	b.WriteString("  marginal areas with lazy re-evaluation. For K picks the added area is at least\n")
	b.WriteString("  (1 - 1/e) = 63.2 % of the best possible (Nemhauser, Wolsey & Fisher 1978).\n\n")
	if len(ch.Picked) == 0 {
		b.WriteString("  No spot picked: ")
		if ch.UncoveredBefore == 0 {
			b.WriteString("the existing devices leave no gap.\n")
		} else {
			b.WriteString("no candidate adds covered area.\n")
		}
	} else {
		t := &table{}
		hx, hy := s.pointHeads()
		cum := cumulative(ch)
		if ch.Ranges != nil {
			t.head("Pick", hx, hy, "Range m", "Adds m²", "Covered %", "Candidate")
			t.left(6)
		} else {
			t.head("Pick", hx, hy, "Adds m²", "Covered %", "Candidate")
			t.left(5)
		}
		for j, c := range ch.Picked {
			px, py := s.pointCols(p.Candidates[c])
			cells := []string{fmt.Sprint(j + 1), px, py}
			if ch.Ranges != nil {
				cells = append(cells, fmt.Sprintf("%.2f", ch.Ranges[j]))
			}
			t.row(append(cells, fmt.Sprintf("%.1f", ch.Gains[j]),
				CoveredPercent(cum[j]/s.l.AreaM2, pickUncovered(ch, j), 3), ItemLabel(p.CandidateNames[c], "candidate", c))...)
		}
		t.write(b)
		b.WriteString("  Candidate: its name, or its position in the candidates file (candidate 1 first).\n")
	}
	section(b, "BEFORE AND AFTER")
	kv := &kvList{}
	kv.add("Spots picked", fmt.Sprintf("%d of %d", len(ch.Picked), len(p.Candidates)))
	kv.add(s.fullCoverKey(), fmt.Sprintf("%s -> %s", metres(ch.FullCoverBefore), metres(ch.FullCoverAfter)))
	kv.add("Covered at "+s.atText(false), CoveredPercent(ch.FractionBefore, ch.UncoveredBefore, 3)+" % -> "+CoveredPercent(ch.FractionAfter, ch.UncoveredAfter, 3)+" %")
	kv.add("Uncovered", fmt.Sprintf("%s -> %s", m2(ch.UncoveredBefore), m2(ch.UncoveredAfter)))
	kv.add("Gaps", fmt.Sprintf("%d -> %d", len(p.GapsBefore), len(ch.Remaining)))
	switch {
	case ch.Complete:
		kv.add("Result", "full cover: no gap remains at this range")
	case ch.Exhausted:
		kv.add("Result", fmt.Sprintf("FULL COVER CANNOT BE REACHED from these candidates: no remaining spot adds covered area; %s remain uncovered in %s",
			m2(ch.UncoveredAfter), Plural(len(ch.Remaining), "gap")))
	default:
		kv.add("Result", fmt.Sprintf("%s leave %s uncovered in %s; more picks may close them", Plural(len(ch.Picked), "pick"), m2(ch.UncoveredAfter), Plural(len(ch.Remaining), "gap")))
	}
	kv.write(b)
	s.textGapList(b, "GAPS LEFT WITH THE PICKS", ch.Remaining, "none: the picks leave no gap at this range")
}

func (s *planScene) textFailures(b *textBuf) {
	fr := s.p.Failures
	if fr.Ranges != nil {
		s.textFailuresRanges(b)
		return
	}
	section(b, "SURVIVING ANY SINGLE FAILURE")
	kv := &kvList{}
	if math.IsInf(fr.SurviveRange, 0) {
		kv.add("Range", "none: with a single device nothing remains when it fails")
	} else {
		kv.add("Range", metres(fr.SurviveRange)+": whichever one device fails, the others")
		kv.add("", "still cover the whole area at this range (the largest distance")
		kv.add("", "from a point of the area to its second-nearest device)")
		kv.add("  needed at", fmt.Sprintf("%s, when %s fails", s.pointText(fr.SurvivePoint), s.label(fr.SurviveSite)))
		kv.add("Against the planned range", fmt.Sprintf("%s is %.2f times %s", metres(fr.SurviveRange), fr.SurviveRange/fr.Range, metres(fr.Range)))
	}
	kv.write(b)

	section(b, fmt.Sprintf("DEVICES RANKED BY WHAT THEIR FAILURE UNCOVERS AT %s", metres(fr.Range)))
	b.WriteString("  Loss: uncovered area added when the device is out of service (the others\n")
	b.WriteString("  working). Closing: the range the others need to cover what it served, the depth\n")
	b.WriteString("  of the deepest new gap; at that point the backup device is the nearest one left.\n")
	b.WriteString("  Ranked by loss, then closing range.\n\n")
	s.textFailureTable(b)
}

// textFailureTable writes the failures ranking: the last figure is the
// full-cover range without the device, or with per-device ranges the
// device's own range.
func (s *planScene) textFailureTable(b *textBuf) {
	fr := s.p.Failures
	own := fr.Ranges != nil
	last := "Full cover m"
	if own {
		last = "Range m"
	}
	t := &table{}
	hx, hy := s.pointHeads()
	t.head("Rank", "Loss m²", "Uncovered m²", "Closing m", hx, hy, last, "Device", "Backup")
	t.left(7, 8)
	rows := min(len(fr.Devices), textTableMax) // ranked: the first are the ones that matter
	t.rows(rows, func(k int) {
		d := fr.Devices[k]
		px, py := s.pointCols(d.Deepest)
		name := s.label(d.Site)
		closing, lastCol := metresCol(d.ClosingRange), metresCol(d.FullCover)
		switch {
		case d.Shared:
			name += " (shares its spot: its failure changes nothing)"
		case d.Hidden:
			name += " (hidden: its failure costs nothing)"
			px, py, closing = "-", "-", "-"
		case own && math.IsInf(d.ClosingPower, -1):
			px, py, closing = "-", "-", "-"
		}
		if own {
			lastCol = fmt.Sprintf("%.2f", s.rangeOf(d.Site))
		}
		backup := "-"
		if d.Backup >= 0 {
			backup = s.label(d.Backup)
		}
		t.row(fmt.Sprint(k+1), fmt.Sprintf("%.1f", d.AddedUncovered), fmt.Sprintf("%.1f", d.Uncovered),
			closing, px, py, lastCol, name, backup)
	})
	t.write(b)
	if rows < len(fr.Devices) {
		s.leftOut(b, len(fr.Devices)-rows, "lower-ranked device", FileFailures, len(fr.Devices))
	}
}

// survivesMeaning is the one sentence report.txt gives on the
// single-failure ranges when devices have their own ranges.
const survivesMeaning = "  These are the ranges at which the area stays covered whichever one device\n" +
	"  fails, when every device's r² grows by the same amount (r' = sqrt(r² + t)),\n" +
	"  keeping the differences between device types as planned.\n"

// textFailuresRanges writes the failures sections for devices with their
// own ranges.
func (s *planScene) textFailuresRanges(b *textBuf) {
	fr := s.p.Failures
	section(b, "SURVIVING ANY SINGLE FAILURE")
	kv := &kvList{}
	switch {
	case math.IsInf(fr.SurvivePower, 1):
		kv.add("Ranges", "none: with a single device nothing remains when it fails")
	case fr.SurvivePower <= 0:
		kv.add("Ranges", "the planned ranges: no single failure opens a gap")
	default:
		kv.add("Ranges", GroupsText(s.rangeGroups(nil), s.rangeGroups(func(i int) float64 { return fr.SurviveRanges[i] })))
		kv.add("  needed at", fmt.Sprintf("%s, when %s fails (%s then needs %s to reach it)",
			s.pointText(fr.SurvivePoint), s.label(fr.SurviveSite), s.backupLabel(fr.SurviveSite), metres(fr.SurviveRange)))
	}
	kv.write(b)
	if !math.IsInf(fr.SurvivePower, 1) && fr.SurvivePower > 0 {
		b.WriteString("\n" + survivesMeaning)
	}

	section(b, "DEVICES RANKED BY WHAT THEIR FAILURE UNCOVERS AT THEIR OWN RANGES")
	b.WriteString("  Loss: uncovered area added when the device is out of service (the others\n")
	b.WriteString("  working, each at its own range). Closing: the range the backup device (the\n")
	b.WriteString("  one that takes over the deepest point of the new gap) needs to reach that\n")
	b.WriteString("  point. A hidden device's failure costs nothing: the others cover its disk.\n")
	b.WriteString("  Ranked by loss, then by the growth that closes the new gap.\n\n")
	s.textFailureTable(b)
}

// backupLabel names the backup of the failure of device site.
func (s *planScene) backupLabel(site int) string {
	for _, d := range s.p.Failures.Devices {
		if d.Site == site && d.Backup >= 0 {
			return s.label(d.Backup)
		}
	}
	return "no device"
}

// pickUncovered is the area left uncovered after pick j: positive before
// the last pick (a later pick still adds area), UncoveredAfter after it.
func pickUncovered(ch *coverage.Choice, j int) float64 {
	if j < len(ch.Picked)-1 {
		return math.Inf(1)
	}
	return ch.UncoveredAfter
}

// metresCol formats a length for a table cell ("none" when infinite).
func metresCol(v float64) string {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return "none"
	}
	return fmt.Sprintf("%.2f", v)
}

// weightText formats a weight compactly.
func weightText(w float64) string {
	if w == math.Trunc(w) && math.Abs(w) < 1e15 {
		return fmt.Sprintf("%.0f", w)
	}
	return trimFloat(w)
}

func (s *planScene) textAssignment(b *textBuf) {
	p, a := s.p, s.p.Assignment
	ranged := s.hasRange()
	section(b, "DEMAND SERVED")
	kv := &kvList{}
	kv.add("Demand items", fmt.Sprint(len(p.Demand)))
	switch {
	case p.own():
		kv.add("Within reach", fmt.Sprintf("%d (weight %s): inside their device's own range", a.Served, weightText(a.ServedWeight)))
		kv.add("Beyond reach", fmt.Sprintf("%d (weight %s): no device's range reaches them", a.Unserved, weightText(a.UnservedWeight)))
	case ranged:
		kv.add("Within range", fmt.Sprintf("%d (weight %s)", a.Served, weightText(a.ServedWeight)))
		kv.add("Beyond range", fmt.Sprintf("%d (weight %s): nearest device farther than %s", a.Unserved, weightText(a.UnservedWeight), metres(p.Range)))
	}
	far, farI := -1.0, -1
	for i, d := range a.Distance {
		if d > far {
			far, farI = d, i
		}
	}
	if farI >= 0 {
		kv.add("Farthest from its device", fmt.Sprintf("%s: %s from %s", s.demandLabel(farI), metres(far), s.label(a.Device[farI])))
	}
	kv.write(b)

	section(b, "LOAD PER DEVICE")
	if p.own() {
		b.WriteString("  Each demand item is served by the device whose service area (power cell:\n")
		b.WriteString("  where |x - p|² - r² is smallest) holds it, and is within reach when inside\n")
		b.WriteString("  that device's own range - exactly when some device covers it. A hidden\n")
		b.WriteString("  device serves nothing (the others cover its disk). Devices serving nothing\n")
		b.WriteString("  are listed too.\n\n")
	} else {
		b.WriteString("  Each demand item is served by its nearest device (the one whose service area\n")
		b.WriteString("  holds it). Devices serving nothing are listed too.\n\n")
	}
	t := &table{}
	if ranged {
		t.head("Items", "Weight", "In range", "Weight in range", "Device")
		t.left(4)
	} else {
		t.head("Items", "Weight", "Device")
		t.left(2)
	}
	order := largestLoads(a.Load, textTableMax)
	rows := len(a.Load)
	if order != nil {
		rows = len(order)
		fmt.Fprintf(b, "  The %d devices with the largest weight served are printed, largest first.\n", rows)
	}
	t.rows(rows, func(i int) {
		if order != nil {
			i = int(order[i])
		}
		ld := a.Load[i]
		if ranged {
			name := s.label(i)
			if s.hidden(i) {
				name += " (hidden)"
			}
			t.row(fmt.Sprint(ld.Count), weightText(ld.Weight), fmt.Sprint(ld.InRange), weightText(ld.InRangeWeight), name)
		} else {
			t.row(fmt.Sprint(ld.Count), weightText(ld.Weight), s.label(i))
		}
	})
	t.write(b)
	if order != nil {
		fmt.Fprintf(b, "  ... and %s left out here; %s and %s hold all %d.\n", Plural(len(a.Load)-rows, "device"),
			FileDeviceLoadCSV, LayerFile(FileDeviceLoad, s.m.Planar), len(a.Load))
	}

	all := len(p.Demand) <= maxDemandRows
	if all {
		section(b, "DEMAND ITEMS AND THEIR DEVICES")
	} else {
		section(b, "DEMAND ITEMS BEYOND RANGE (all items are in "+FileAssignmentCSV+")")
	}
	t = &table{}
	hx, hy := s.pointHeads()
	t.head(hx, hy, "Distance m", "In range", "Weight", "Item", "Device")
	t.left(5, 6)
	var shown []int32 // the items listed (4 bytes each: the rows are formatted when written)
	for i := range p.Demand {
		if all || (ranged && !a.Within[i]) {
			shown = append(shown, int32(i))
		}
	}
	t.rows(len(shown), func(k int) {
		i := int(shown[k])
		in := "-"
		if ranged {
			in = "yes"
			if !a.Within[i] {
				in = "NO"
			}
		}
		px, py := s.pointCols(p.Demand[i])
		t.row(px, py, fmt.Sprintf("%.2f", a.Distance[i]), in,
			weightText(a.Weight[i]), s.demandLabel(i), s.label(a.Device[i]))
	})
	if len(shown) == 0 {
		b.WriteString("  none\n")
		return
	}
	t.write(b)
}

// demandLabel names demand item i (ItemLabel: its name, or "item n").
func (s *planScene) demandLabel(i int) string { return ItemLabel(s.demandName(i), "item", i) }

func (s *planScene) textPlanNotes(b *textBuf) {
	section(b, "ACCURACY AND NOTES")
	var lines []string
	switch s.p.Move {
	case MoveAdd, MoveFewest, MoveCandidates:
		lines = append(lines,
			"Areas, covered shares and full-cover ranges are closed-form results for the",
			"disk model (polygon-disk intersections, Voronoi vertices), exact up to",
			"floating-point rounding; printed rounded to 0.1 m², 0.001 % and 0.01 m.",
			"Gap outlines in the GeoJSON layers replace arcs by chords inside the disks",
			"(sagitta at most 0.2 % of the range); gap areas are exact.")
		lines = append(lines, s.roundingNote()...)
		lines = append(lines,
			"Positions are proposals for the disk model: check on site that a device can",
			"be mounted there and reaches its range before committing.")
	case MoveFailures:
		if s.p.own() {
			lines = append(lines,
				"Each failure is computed locally: only the failed device's power cell",
				"changes hands, shared by the power diagram of its regular-triangulation",
				"neighbours and of any hidden device that then serves (Aurenhammer 1987).",
				"Areas and ranges are closed-form results for the disk model, exact up to",
				"rounding.")
			break
		}
		lines = append(lines,
			"Each failure is computed locally: only the failed device's service area",
			"changes hands, shared among its Delaunay neighbours (Devillers 2002). Areas",
			"and ranges are closed-form results for the disk model, exact up to rounding.")
	case MoveAssign:
		lines = append(lines,
			"Distances are straight lines in the local plane, exact up to rounding; a",
			"polygon is placed at its area centroid, or at a point on it when the centroid",
			"falls outside (point on surface). Assignment follows the disk model, not",
			"measured signal strength.")
	}
	if s.geographic() {
		lines = append(lines,
			"Points are WGS84 latitude/longitude in degrees, rounded to 7 decimals",
			"(about 1 cm); GeoJSON layers are RFC 7946 (longitude first, exterior rings",
			"counter-clockwise).")
	} else {
		lines = append(lines,
			"Points are local plane x/y in metres, rounded to 1 mm; the *-xy.geojson",
			"layers hold the same x/y metres (not RFC 7946 longitude/latitude).")
	}
	noteLines(b, lines)
}

// planFileNotes describes the planning outputs in the FILES section.
var planFileNotes = map[string]string{
	FileProposed:      "proposed devices (points) with figures before and after each",
	FileGapsBefore:    "gaps of the existing layout (polygons)",
	FileGapsAfter:     "gaps left after the additions (polygons)",
	FileCandidates:    "every candidate spot (points), picked or not, with its gain",
	FileFailures:      "devices (points) with the effect of their failure and rank",
	FileFailuresCSV:   "the failure ranking as a table",
	FileAssignment:    "lines from each demand item to its serving device",
	FileAssignmentCSV: "each demand item: device, distance, within range, weight",
	FileDeviceLoad:    "devices (points) with the demand each serves",
	FileDeviceLoadCSV: "demand served per device (count, weight)",
	FileMapSuggest:    "map: proposed devices, gaps before and after",
	FileMapCandidates: "map: candidate spots, picks, gaps before and after",
	FileMapFailures:   "map: devices coloured by the loss their failure causes",
	FileMapAssignment: "map: demand items and their serving devices",
}

func planFileNote(f string) string {
	f = strings.Replace(f, "-xy.geojson", ".geojson", 1)
	if n, ok := planFileNotes[f]; ok {
		return n
	}
	if f == FileSites {
		return "existing device sites (points)"
	}
	return fileNote[f]
}

// largestLoads returns the indices of the k devices serving the largest
// weight, largest first (ties by index), or nil when there are no more
// than k, which are then all printed in device order (textTableMax).
func largestLoads(load []coverage.DeviceLoad, k int) []int32 {
	if len(load) <= k {
		return nil
	}
	order := make([]int32, len(load))
	for i := range order {
		order[i] = int32(i)
	}
	slices.SortStableFunc(order, func(a, b int32) int { return cmp.Compare(load[b].Weight, load[a].Weight) })
	return order[:k]
}
