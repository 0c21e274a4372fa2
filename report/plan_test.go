// Tests of the planning reports on square lattices, whose answers are
// known in closed form (elementary geometry, derived beside each check):
// the files written, the summary.json members of each move, the CSV
// tables, and the pixels of the maps where the figures say they must be.

package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// lattice returns the n×n square lattice of spacing s with devices at
// cell centres ((i+½)s, (j+½)s) in the square [0, ns]², without the
// devices listed in skip (as [i, j]).
func lattice(n int, s float64, skip ...[2]int) []orb.Point {
	var pts []orb.Point
	for j := range n {
		for i := range n {
			if slices.Contains(skip, [2]int{i, j}) {
				continue
			}
			pts = append(pts, orb.Point{(float64(i) + 0.5) * s, (float64(j) + 0.5) * s})
		}
	}
	return pts
}

func newLayout(t testing.TB, sites []orb.Point, a float64) *coverage.Layout {
	t.Helper()
	l, err := coverage.NewLayout(sites, region(t, square(a)))
	if err != nil {
		t.Fatal(err)
	}
	return l
}

// latticePlan builds a plan of the given move on a 6×6 lattice of spacing
// 10 m with the device at (2, 3) missing, at range r, the way the CLI
// does.
func latticePlan(t testing.TB, move Move, r float64) *Plan {
	t.Helper()
	sites := lattice(6, 10, [2]int{2, 3})
	l := newLayout(t, sites, 60)
	p := &Plan{Move: move, Layout: l, Range: r, RangeGiven: true, FullCover: l.FullCover(), Uncovered: l.UncoveredArea(r)}
	var err error
	switch move {
	case MoveAdd, MoveFewest:
		p.GapsBefore = l.Gaps(r, 0)
		if move == MoveAdd {
			p.Requested = 1
			p.Suggestion, err = coverage.SuggestAdditions(l, 1, coverage.SuggestOptions{Range: r})
		} else {
			p.Suggestion, err = coverage.FewestAdditions(l, r, coverage.SuggestOptions{})
		}
		if err != nil {
			t.Fatal(err)
		}
		l2 := newLayout(t, append(slices.Clone(sites), p.Suggestion.Added...), 60)
		p.GapsAfter = l2.Gaps(r, 0)
	case MoveCandidates:
		p.GapsBefore = l.Gaps(r, 0)
		p.Candidates = []orb.Point{{5, 5}, {25, 35}, {80, 80}}
		p.CandidateNames = []string{"corner post", "the missing spot", "far away"}
		if p.Choice, err = coverage.ChooseCandidates(l, p.Candidates, r, 0); err != nil {
			t.Fatal(err)
		}
	case MoveFailures:
		if p.Failures, err = coverage.Failures(l, r); err != nil {
			t.Fatal(err)
		}
	case MoveAssign:
		p.Demand = []orb.Point{{25, 35}, {3, 3}, {59, 1}, {100, 100}}
		p.DemandNames = []string{"hall", "shed", "", "far barn"}
		p.DemandPolygons = make([]orb.MultiPolygon, 4)
		p.Weighted = true
		if p.Assignment, err = coverage.Assign(l, p.Demand, []float64{5, 1, 2, 0.5}, r); err != nil {
			t.Fatal(err)
		}
	}
	return p
}

var allMoves = []Move{MoveAdd, MoveFewest, MoveCandidates, MoveFailures, MoveAssign}

func TestWritePlanFiles(t *testing.T) {
	for _, planarOut := range []bool{true, false} {
		for _, mv := range allMoves {
			p := latticePlan(t, mv, 10/math.Sqrt2)
			m := Meta{Planar: planarOut, Title: "Lattice", Command: "test"}
			if !planarOut {
				// A stand-in inverse projection: metres to degrees near
				// (8°E, 47°N); only order and rounding are checked here.
				m.ToLonLat = func(x, y float64) (float64, float64) { return 8 + x*1e-5, 47 + y*1e-5 }
			}
			dir := t.TempDir()
			opt := Options{Maps: true, MapWidth: 800}
			written, err := WritePlan(dir, p, m, opt)
			if err != nil {
				t.Fatalf("%s: %v", mv, err)
			}
			want := PlanFiles(mv, m, opt)
			var got []string
			for _, w := range written {
				got = append(got, filepath.Base(w))
			}
			if !slices.Equal(got, want) {
				t.Errorf("%s: wrote %v, want %v", mv, got, want)
			}
			ents, _ := os.ReadDir(dir)
			if len(ents) != len(want) {
				t.Errorf("%s: folder holds %d entries, want %d (no temporary files)", mv, len(ents), len(want))
			}
			for _, f := range want {
				if strings.HasSuffix(f, ".geojson") && strings.Contains(f, "-xy") != planarOut {
					t.Errorf("%s: layer %s with Planar=%v", mv, f, planarOut)
				}
			}
			txt, _ := os.ReadFile(filepath.Join(dir, FileReport))
			if !bytes.Contains(txt, []byte(Cautions())) || !bytes.Contains(txt, []byte(moveTitle[mv]+": Lattice")) {
				t.Errorf("%s: report.txt lacks its title or the cautions", mv)
			}
		}
	}
	if _, err := WritePlan(t.TempDir(), &Plan{Move: MoveFailures, Layout: latticePlan(t, MoveAdd, 5).Layout}, Meta{}, Options{}); err == nil {
		t.Error("a plan without its result was written")
	}
	if _, err := WritePlan(t.TempDir(), &Plan{Move: "teleport", Layout: latticePlan(t, MoveAdd, 5).Layout}, Meta{}, Options{}); err == nil {
		t.Error("an unknown move was written")
	}
}

func TestPlanSummaryMembers(t *testing.T) {
	// Each move writes its own member(s) and none of the others'.
	members := map[Move][]string{
		MoveAdd:        {"suggestions"},
		MoveFewest:     {"suggestions"},
		MoveCandidates: {"candidates"},
		MoveFailures:   {"failures", "survive_any_single_failure_m", "survive_point", "survive_site"},
		MoveAssign:     {"assignment"},
	}
	common := []string{"command", "move", "version", "sites", "area_m2", "range_m", "full_cover_range_m",
		"full_cover_worst_point", "covered_fraction", "uncovered_area_m2", "projection", "coordinates", "warnings", "timings"}
	for _, mv := range allMoves {
		d, err := PlanSummary(latticePlan(t, mv, 10/math.Sqrt2), Meta{Planar: true})
		if err != nil {
			t.Fatal(err)
		}
		b, err := d.MarshalIndent()
		if err != nil {
			t.Fatal(err)
		}
		var keys map[string]json.RawMessage
		if err := json.Unmarshal(b, &keys); err != nil {
			t.Fatal(err)
		}
		for _, k := range common {
			if _, ok := keys[k]; !ok {
				t.Errorf("%s: summary lacks %q", mv, k)
			}
		}
		for other, ks := range members {
			for _, k := range ks {
				_, ok := keys[k]
				if want := slices.Contains(members[mv], k); ok != want {
					t.Errorf("%s: member %q present %v (of move %s)", mv, k, ok, other)
				}
			}
		}
	}
}

func TestPlanFiguresOnLattice(t *testing.T) {
	const s = 10.0
	r := s / math.Sqrt2
	// Without the device at (2, 3) its cell, a square of side s, is served
	// by the four neighbours at distance s; each disk of radius s/√2 cuts
	// off a circular segment at distance s/2 from its centre, of area
	// r²·acos((s/2)/r) − (s/2)·√(r² − s²/4) = s²(π/8 − 1/4), and the
	// diagonal neighbours only touch the corners. Uncovered: s²(2 − π/2).
	// Reference: elementary geometry.
	wantUnc := s * s * (2 - math.Pi/2)
	p := latticePlan(t, MoveAdd, r)
	d, _ := PlanSummary(p, Meta{Planar: true})
	sg := d.Suggestions
	if !near(sg.UncoveredBeforeM2, wantUnc, 1e-9) || !near(*d.UncoveredAreaM2, wantUnc, 1e-9) {
		t.Errorf("uncovered before %v / %v, want s²(2 − π/2) = %v", sg.UncoveredBeforeM2, *d.UncoveredAreaM2, wantUnc)
	}
	// The one addition goes back to the missing spot (25, 35): full cover
	// s/√2 (every cell a square of side s around its device), nothing
	// uncovered; before it the missing spot was s from its neighbours.
	a := sg.Added[0]
	if len(sg.Added) != 1 || math.Hypot(a.Point[0]-25, a.Point[1]-35) > 1e-6*s {
		t.Errorf("added %v, want the missing spot (25, 35)", sg.Added)
	}
	if !near(sg.FullCoverRangeBeforeM, s, 1e-12) || !near(sg.FullCoverRangeAfterM, r, 1e-9) || sg.UncoveredAfterM2 > 1e-9 {
		t.Errorf("full cover %v -> %v (want %v -> %v), uncovered after %v", sg.FullCoverRangeBeforeM, sg.FullCoverRangeAfterM, s, r, sg.UncoveredAfterM2)
	}
	if len(sg.GapsBefore) != 1 || len(sg.GapsAfter) != 0 || !near(sg.GapsBefore[0].AreaM2, wantUnc, 1e-9) {
		t.Errorf("gaps %d -> %d, area %v", len(sg.GapsBefore), len(sg.GapsAfter), sg.GapsBefore)
	}

	// Fewest additions: one, and the hexagonal estimate area/((3√3/2)r²)
	// = 3600 / (3√3/2 · 50). Reference: Kershner, "The number of circles
	// covering a set", Amer. J. Math. 61 (1939).
	d, _ = PlanSummary(latticePlan(t, MoveFewest, r), Meta{Planar: true})
	f := d.Suggestions
	hex := 3600 / (1.5 * math.Sqrt(3) * r * r)
	if len(f.Added) != 1 || !f.Reached || f.TotalDevices != 36 || !near(f.HexEstimate, hex, 1e-12) || !near(f.HexRatio, 36/hex, 1e-12) {
		t.Errorf("fewest: %d added, reached %v, total %d, hex %v (want %v), ratio %v", len(f.Added), f.Reached, f.TotalDevices, f.HexEstimate, hex, f.HexRatio)
	}

	// Candidates: the spot at the missing position closes the only gap,
	// adding exactly its area. Reference: elementary geometry, as above.
	d, _ = PlanSummary(latticePlan(t, MoveCandidates, r), Meta{Planar: true})
	c := d.Candidates
	if len(c.Picked) != 1 || c.Picked[0].Candidate != 1 || c.Picked[0].Name != "the missing spot" || !c.Complete ||
		!near(c.Picked[0].GainM2, wantUnc, 1e-9) || !near(c.Picked[0].CoveredFractionAfter, 1, 1e-12) || len(c.Remaining) != 0 {
		t.Errorf("candidates: %+v", c)
	}

	// Reference: brute-force nearest device over the 35 devices.
	p = latticePlan(t, MoveAssign, r)
	d, _ = PlanSummary(p, Meta{Planar: true})
	as := d.Assignment
	for i, q := range p.Demand {
		best, bd := -1, math.Inf(1)
		for k, st := range p.Layout.Sites {
			if dd := math.Hypot(q[0]-st[0], q[1]-st[1]); dd < bd {
				best, bd = k, dd
			}
		}
		e := as.Assignments[i]
		if e.Device != best || !near(e.DistanceM, bd, 1e-12) || *e.WithinRange != (bd <= r) {
			t.Errorf("item %d: device %d at %v within %v, brute force %d at %v", i, e.Device, e.DistanceM, *e.WithinRange, best, bd)
		}
	}
	// Within s/√2: the shed (2.83 m) and item 2 (5.66 m); the hall at the
	// missing spot is s from its nearest device, the barn far outside.
	if *as.Served != 2 || *as.Unserved != 2 || *as.ServedWeight != 3 || *as.UnservedWeight != 5.5 {
		t.Errorf("served %d/%d weights %v/%v", *as.Served, *as.Unserved, *as.ServedWeight, *as.UnservedWeight)
	}
}

func TestPlanCSV(t *testing.T) {
	dir := t.TempDir()
	p := latticePlan(t, MoveAssign, 10/math.Sqrt2)
	if _, err := WritePlan(dir, p, Meta{Planar: true}, Options{}); err != nil {
		t.Fatal(err)
	}
	read := func(name string) [][]string {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		return rows
	}
	rows := read(FileAssignmentCSV)
	if h := strings.Join(rows[0], ","); h != "point,name,device,device_name,distance_m,within_range,weight,x,y" {
		t.Errorf("assignment.csv header %q", h)
	}
	if len(rows) != 5 || rows[4][1] != "far barn" || rows[4][5] != "false" || rows[1][5] != "false" || rows[2][5] != "true" || rows[1][6] != "5" || rows[2][4] != "2.8284271247461903" {
		t.Errorf("assignment.csv rows %v", rows)
	}
	load := read(FileDeviceLoadCSV)
	if len(load) != 36 || strings.Join(load[0], ",") != "device,device_name,count,weight,in_range,in_range_weight,x,y" {
		t.Errorf("device-load.csv: %d rows, header %v", len(load), load[0])
	}
	total := 0
	for _, r := range load[1:] {
		var n int
		json.Unmarshal([]byte(r[2]), &n)
		total += n
	}
	if total != 4 {
		t.Errorf("device-load.csv counts sum to %d, want the 4 items", total)
	}
	// Without a range the within-range cells are empty.
	p.Range, p.RangeGiven = 0, false
	if _, err := WritePlan(dir, p, Meta{Planar: true}, Options{}); err != nil {
		t.Fatal(err)
	}
	rows = read(FileAssignmentCSV)
	if rows[2][5] != "" || read(FileDeviceLoadCSV)[1][4] != "" {
		t.Errorf("within_range without a range: %q", rows[2][5])
	}

	dir = t.TempDir()
	if _, err := WritePlan(dir, latticePlan(t, MoveFailures, 10/math.Sqrt2), Meta{Planar: true}, Options{}); err != nil {
		t.Fatal(err)
	}
	fr := read(FileFailuresCSV)
	if len(fr) != 36 || fr[0][0] != "rank" || fr[1][0] != "1" {
		t.Errorf("failures.csv: %d rows, %v", len(fr), fr[:2])
	}
}

func TestLossClasses(t *testing.T) {
	// 25 losses of a 5×5 lattice: 9 interior, 12 edge, 4 corner devices.
	// Quintiles at ranks 5, 10, 15, 20, 25 (1-based) are 42.92, 57.19,
	// 57.19, 57.19, 71.46; rounded up to two digits: 43, 58, 72.
	var l []float64
	for range 9 {
		l = append(l, 42.92)
	}
	for range 12 {
		l = append(l, 57.19)
	}
	for range 4 {
		l = append(l, 71.46)
	}
	l = append(l, 0, 0)
	ub := lossClasses(l)
	if !slices.Equal(ub, []float64{43, 58, 72}) {
		t.Errorf("classes %v, want [43 58 72]", ub)
	}
	if lossClass(0, ub) != -1 || lossClass(42.92, ub) != 0 || lossClass(57.19, ub) != 1 || lossClass(71.46, ub) != 2 {
		t.Error("lossClass")
	}
	if lossClasses([]float64{0, 0}) != nil || roundUp2(0.0123) != 0.013 || roundUp2(2500) != 2500 {
		t.Errorf("edge cases: %v %v", roundUp2(0.0123), roundUp2(2500))
	}
}

func rgb(c color.RGBA) [3]uint8 { return [3]uint8{c.R, c.G, c.B} }

func TestPlanMapPixels(t *testing.T) {
	const s = 10.0
	// Suggestions at r = 0.6 s: the new device at the missing spot
	// (25, 35) closes the point (28.5, 38.5), 0.495 s from it but 0.738 s
	// from the nearest neighbour (35, 35); the lattice corners, s/√2 from
	// their four devices, stay uncovered.
	p := latticePlan(t, MoveAdd, 0.6*s)
	ps := newPlanScene(p, Meta{Planar: true})
	c, err := ps.drawBeforeAfter(1600, beforeAfter{title: "t", before: p.GapsBefore, after: p.GapsAfter,
		added: p.Suggestion.Added, labels: []string{"+1"}, closed: "closed"})
	if err != nil {
		t.Fatal(err)
	}
	img := c.dc.Image()
	x, y := c.px(p.Suggestion.Added[0])
	if !anyColour(img, x, y, 2, rgb(colNew)) {
		t.Error("no new-device mark at the added device")
	}
	if x, y := c.px(orb.Point{28.5, 38.5}); !anyColour(img, x, y, 2, rgb(colClosed)) {
		t.Error("no closed-gap colour where the new device closes the gap")
	}
	if x, y := c.px(orb.Point{40, 20}); !anyColour(img, x, y, 3, rgb(colGap)) {
		t.Error("no gap-left colour at a lattice corner")
	}

	// Failures on a 5×5 lattice at s/√2: interior devices lose s²(2 − π/2),
	// edge ones s²(7/4 − 3π/8), corner ones s²(3/2 − π/4) (three and two
	// circular segments instead of four, see TestPlanFiguresOnLattice):
	// three quintile classes, the corner cells darkest.
	l := newLayout(t, lattice(5, s), 50)
	fr, err := coverage.Failures(l, s/math.Sqrt2)
	if err != nil {
		t.Fatal(err)
	}
	fp := &Plan{Move: MoveFailures, Layout: l, Range: s / math.Sqrt2, RangeGiven: true, Failures: fr, FullCover: l.FullCover()}
	c, err = newPlanScene(fp, Meta{Planar: true}).drawFailureMap(1600)
	if err != nil {
		t.Fatal(err)
	}
	img = c.dc.Image()
	// The legend has "No loss" exactly when some device loses nothing.
	noLoss := false
	for _, d := range fr.Devices {
		noLoss = noLoss || !(d.AddedUncovered > 0)
	}
	if hasLegend(c.legendLabels, "No loss") != noLoss {
		t.Errorf("failure map legend %q: no-loss entry, want %v", c.legendLabels, noLoss)
	}
	for _, tc := range []struct {
		at  orb.Point
		col color.RGBA
	}{{orb.Point{2, 2}, viridis[4]}, {orb.Point{22, 2}, viridis[2]}, {orb.Point{22, 22}, viridis[0]}} {
		t.Run(fmt.Sprintf("failure-map-at-%v,%v", tc.at[0], tc.at[1]), func(t *testing.T) {
			x, y := c.px(tc.at)
			if !isColour(img, int(x), int(y), rgb(tc.col)) {
				t.Errorf("failure map at %v: %v, want %v", tc.at, img.At(int(x), int(y)), tc.col)
			}
		})
	}

	// Assignment: squares within range, triangles beyond, in their colours.
	ap := latticePlan(t, MoveAssign, s/math.Sqrt2)
	ap.Demand[3] = orb.Point{58, 58} // on the map, beyond range
	a, err := coverage.Assign(ap.Layout, ap.Demand, nil, ap.Range)
	if err != nil {
		t.Fatal(err)
	}
	ap.Assignment, ap.Weighted = a, false
	c, err = newPlanScene(ap, Meta{Planar: true}).drawAssignmentMap(1600)
	if err != nil {
		t.Fatal(err)
	}
	img = c.dc.Image()
	for i, q := range ap.Demand {
		want := colWithin
		if !a.Within[i] {
			want = colBeyond
		}
		x, y := c.px(q)
		if !anyColour(img, x, y, 1, rgb(want)) {
			t.Errorf("demand %d at %v (within %v): not drawn in %v", i, q, a.Within[i], want)
		}
	}
}

func TestPlanLifeSafetyAndLongAssignments(t *testing.T) {
	// With Meta.LifeSafety the cautions open the planning report too.
	p := latticePlan(t, MoveFailures, 10/math.Sqrt2)
	txt := string(newPlanScene(p, Meta{Planar: true, LifeSafety: true}).planText())
	if i, j := strings.Index(txt, Cautions()), strings.Index(txt, "INPUTS"); i < 0 || j < 0 || i > j {
		t.Errorf("life-safety cautions not before the inputs (at %d, inputs at %d)", i, j)
	}
	// Beyond MaxListedAssignments items summary.json lists none one by
	// one (assignment.csv holds them) but keeps the totals and the
	// farthest item.
	l := p.Layout
	n := MaxListedAssignments + 1
	pts := make([]orb.Point, n)
	for i := range pts {
		pts[i] = orb.Point{float64(i%600) / 10, float64(i/600) / 300}
	}
	a, err := coverage.Assign(l, pts, nil, 5)
	if err != nil {
		t.Fatal(err)
	}
	ap := &Plan{Move: MoveAssign, Layout: l, Range: 5, RangeGiven: true, Assignment: a, Demand: pts,
		DemandNames: make([]string, n), DemandPolygons: make([]orb.MultiPolygon, n)}
	d, err := PlanSummary(ap, Meta{Planar: true})
	if err != nil {
		t.Fatal(err)
	}
	as := d.Assignment
	if as.AssignmentsListed || len(as.Assignments) != 0 || as.Points != n || *as.Served+*as.Unserved != n || as.Farthest == nil {
		t.Errorf("long assignment: listed %v (%d), %d points, farthest %v", as.AssignmentsListed, len(as.Assignments), as.Points, as.Farthest)
	}
	far := 0.0
	for _, v := range a.Distance {
		far = math.Max(far, v)
	}
	if as.Farthest.DistanceM != far {
		t.Errorf("farthest %v, want %v", as.Farthest.DistanceM, far)
	}
}

// ownRangesPlan builds a plan of the given move on the lattice of
// latticePlan with its own ranges: every device 6 m except a 13 m one at
// (25, 25), whose disk holds the whole disk of a 4 m device added at
// (26, 24) (√2 + 4 < 13), which is hidden; added devices and spots get
// 9 m. Built the way the CLI does.
func ownRangesPlan(t testing.TB, move Move) *Plan {
	t.Helper()
	sites := append(lattice(6, 10, [2]int{2, 3}), orb.Point{26, 24})
	ranges := make([]float64, len(sites))
	for i, q := range sites {
		ranges[i] = 6
		if q == (orb.Point{25, 25}) {
			ranges[i] = 13
		}
	}
	ranges[len(ranges)-1] = 4
	l, err := coverage.NewLayoutRanges(sites, ranges, region(t, square(60)))
	if err != nil {
		t.Fatal(err)
	}
	if len(l.Hidden) != 1 {
		t.Fatalf("hidden %v, want the 4 m device", l.Hidden)
	}
	fc := l.FullCoverRanges()
	p := &Plan{Move: move, Layout: l, RangeGiven: true, FullCoverRanges: &fc, Uncovered: l.UncoveredAreaGrown(0), NewRange: 9, NewType: "gateway"}
	switch move {
	case MoveAdd:
		p.Requested = 2
		p.Suggestion, err = coverage.SuggestAdditionsRanges(l, 2, 9)
	case MoveFewest:
		p.Suggestion, err = coverage.FewestAdditionsRanges(l, 9, coverage.SuggestOptions{})
	case MoveCandidates:
		p.Candidates = []orb.Point{{5, 5}, {25, 35}, {80, 80}}
		p.CandidateNames = []string{"corner post", "the missing spot", "far away"}
		p.Choice, err = coverage.ChooseCandidatesRanges(l, p.Candidates, 9, 0)
	case MoveFailures:
		p.Failures, err = coverage.FailuresRanges(l)
	case MoveAssign:
		p.Demand = []orb.Point{{25, 35}, {26, 24}, {1, 1}, {80, 5}}
		p.DemandNames = make([]string, len(p.Demand))
		p.DemandPolygons = make([]orb.MultiPolygon, len(p.Demand))
		p.Assignment, err = coverage.AssignPowerCells(l, p.Demand, nil)
	}
	if err != nil {
		t.Fatal(err)
	}
	if p.Suggestion != nil {
		p.GapsBefore, p.GapsAfter = l.GapsRanges(0, 0), l.GapsRanges(0, 0)
	}
	return p
}

// TestPlanOwnRanges: every move with per-device ranges and a hidden device
// writes its files (maps included) with no common range assumed: range_m
// null, each device's range listed, the hidden device named.
func TestPlanOwnRanges(t *testing.T) {
	for _, move := range []Move{MoveAdd, MoveFewest, MoveCandidates, MoveFailures, MoveAssign} {
		t.Run(string(move), func(t *testing.T) {
			p := ownRangesPlan(t, move)
			dir := t.TempDir()
			if _, err := WritePlan(dir, p, Meta{Planar: true}, Options{Maps: true, MapWidth: 800, GeoPackage: true}); err != nil {
				t.Fatal(err)
			}
			var doc struct {
				RangeM      *float64     `json:"range_m"`
				RangeGroups []RangeGroup `json:"range_groups"`
				Hidden      []int        `json:"hidden"`
			}
			b, err := os.ReadFile(filepath.Join(dir, FileSummary))
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(b, &doc); err != nil {
				t.Fatal(err)
			}
			if doc.RangeM != nil || len(doc.RangeGroups) != 3 || !slices.Equal(doc.Hidden, []int{35}) {
				t.Errorf("range %v groups %v hidden %v", doc.RangeM, doc.RangeGroups, doc.Hidden)
			}
			text, _ := os.ReadFile(filepath.Join(dir, FileReport))
			for _, w := range []string{"each device's own", "#36"} {
				if !strings.Contains(string(text), w) {
					t.Errorf("report.txt lacks %q", w)
				}
			}
			if strings.Contains(string(text), "NaN") || strings.Contains(string(text), "Inf") {
				t.Errorf("report.txt prints a non-finite number")
			}
		})
	}
}
