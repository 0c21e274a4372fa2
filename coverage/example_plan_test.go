// Runnable examples of the planners on a 5 × 5 square grid of devices
// 100 m apart inside the square [−50, 450]² (invented layout). The grid's
// covering radius is 100/√2 ≈ 70.71 m (Kershner 1939); with the centre
// device missing, the point farthest from every device is the missing
// spot, 100 m from its four neighbours (elementary geometry). At a range
// of 75 m the gap there is the closed form of plan_failures_test.go,
// 8·half(100, 75) ≈ 2904 m², 1.16% of the 250 000 m² area.

package coverage_test

import (
	"fmt"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// planExampleLayout returns the grid with the centre device missing when
// missing is true.
func planExampleLayout(missing bool) *coverage.Layout {
	area, err := planar.NewRegion(orb.MultiPolygon{{{{-50, -50}, {450, -50}, {450, 450}, {-50, 450}, {-50, -50}}}})
	if err != nil {
		panic(err)
	}
	var sites []orb.Point
	for j := 0; j < 5; j++ {
		for i := 0; i < 5; i++ {
			if missing && i == 2 && j == 2 {
				continue
			}
			sites = append(sites, orb.Point{float64(100 * i), float64(100 * j)})
		}
	}
	l, err := coverage.NewLayout(sites, area)
	if err != nil {
		panic(err)
	}
	return l
}

func ExampleSuggestAdditions() {
	l := planExampleLayout(true)
	s, err := coverage.SuggestAdditions(l, 1, coverage.SuggestOptions{Range: 75})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, st := range s.Steps {
		fmt.Printf("add at (%.1f, %.1f): full cover %.2f → %.2f m, covered at 75 m %.2f%% → %.2f%%, uncovered %.0f → %.0f m²\n",
			st.Added[0], st.Added[1], st.FullCoverBefore, st.FullCoverAfter,
			100*st.CoveredBefore, 100*st.CoveredAfter, st.UncoveredBefore, st.UncoveredAfter)
	}
	// Output:
	// add at (200.0, 200.0): full cover 100.00 → 70.71 m, covered at 75 m 98.84% → 100.00%, uncovered 2904 → 0 m²
}

func ExampleFailures() {
	l := planExampleLayout(false)
	rep, err := coverage.Failures(l, 75)
	if err != nil {
		fmt.Println(err)
		return
	}
	// The corner devices fail worst: the area's corner is then
	// √(150² + 50²) ≈ 158.11 m from the nearest remaining device.
	for _, d := range rep.Devices[:1] {
		fmt.Printf("device %d out: %.0f m² newly uncovered, deepest gap %.2f m at (%.0f, %.0f), backup device %d\n",
			d.Site, d.AddedUncovered, d.ClosingRange, d.Deepest[0], d.Deepest[1], d.Backup)
	}
	fmt.Printf("survives any single failure from %.2f m\n", rep.SurviveRange)
	// Output:
	// device 0 out: 6326 m² newly uncovered, deepest gap 158.11 m at (-50, -50), backup device 1
	// survives any single failure from 158.11 m
}

func ExampleChooseCandidates() {
	l := planExampleLayout(true)
	spots := []orb.Point{{150, 150}, {200, 200}, {250, 260}, {500, 500}}
	ch, err := coverage.ChooseCandidates(l, spots, 75, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("picked %v adding %.0f m², complete %v\n", ch.Picked, ch.Gains[0], ch.Complete)
	// Output:
	// picked [1] adding 2904 m², complete true
}

func ExampleAssign() {
	l := planExampleLayout(false)
	homes := []orb.Point{{10, 20}, {190, 260}, {440, 440}}
	a, err := coverage.Assign(l, homes, []float64{3, 1, 2}, 75)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range homes {
		fmt.Printf("point %d → device %d at %.1f m (within range: %v)\n", i, a.Device[i], a.Distance[i], a.Within[i])
	}
	fmt.Printf("served weight %.0f, unserved %.0f\n", a.ServedWeight, a.UnservedWeight)
	// Output:
	// point 0 → device 0 at 22.4 m (within range: true)
	// point 1 → device 17 at 41.2 m (within range: true)
	// point 2 → device 24 at 56.6 m (within range: true)
	// served weight 6, unserved 0
}
