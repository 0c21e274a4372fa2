// Colour differences: CIEDE2000 against Sharma et al.'s test pairs, the
// colour-vision simulations keep greys, and the map fills that can touch
// stay apart for normal, protan and deutan readers.

package report

import (
	"fmt"
	"image/color"
	"math"
	"testing"
)

func TestDeltaE00(t *testing.T) {
	// Reference: Sharma, Wu & Dalal 2005, Table 1 test pairs 1 and 17
	// (values recalled from memory of the paper's table).
	for _, c := range []struct {
		name string
		p, q lab
		want float64
	}{
		{"pair-1", lab{50, 2.6772, -79.7751}, lab{50, 0, -82.7485}, 2.0425},
		{"pair-17", lab{50, 2.5, 0}, lab{73, 25, -18}, 27.1492},
		{"identical", lab{60, 10, 10}, lab{60, 10, 10}, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := deltaE00(c.p, c.q); math.Abs(got-c.want) > 1e-4 {
				t.Errorf("ΔE00 = %.4f, want %.4f", got, c.want)
			}
		})
	}
}

func TestVisionsKeepGreys(t *testing.T) {
	// Machado et al. 2009 matrices map white to white (rows sum to 1), so a
	// grey keeps its lightness in every simulation.
	for _, c := range []struct {
		name string
		m    vision
	}{{"protan", visionProtan}, {"deutan", visionDeutan}, {"tritan", visionTritan}} {
		t.Run(c.name, func(t *testing.T) {
			for _, g := range []uint8{0x40, 0xC8, 0xFF} {
				grey := color.RGBA{g, g, g, 0xFF}
				if d := deltaE00(labOf(grey, visionNormal), labOf(grey, c.m)); d > 0.01 {
					t.Errorf("grey %#x changes by ΔE00 %.3f", g, d)
				}
			}
		})
	}
}

// TestFillDifferences checks that fills which can touch on a map stay
// apart by minFillDifference (CIEDE2000) for normal, protan and deutan
// readers: any two service-area colours (any two cells may be
// neighbours), each against the exclusion grey, and the coverage and
// failure maps' fills.
func TestFillDifferences(t *testing.T) {
	type pair struct {
		name string
		a, b color.RGBA
	}
	var pairs []pair
	for i := range cellPalette {
		pairs = append(pairs, pair{fmt.Sprintf("cell-%d/exclusion", i), cellPalette[i], colExcluded})
		for j := i + 1; j < len(cellPalette); j++ {
			pairs = append(pairs, pair{fmt.Sprintf("cell-%d/cell-%d", i, j), cellPalette[i], cellPalette[j]})
		}
	}
	pairs = append(pairs,
		pair{"covered/gap", colCovered, colGap},
		pair{"covered/exclusion", colCovered, colExcluded},
		pair{"gap/exclusion", colGap, colExcluded},
		pair{"no-loss/exclusion", colNoLoss, colExcluded})
	for _, v := range viridis {
		pairs = append(pairs, pair{fmt.Sprintf("loss-%02x%02x%02x/no-loss", v.R, v.G, v.B), v, colNoLoss},
			pair{fmt.Sprintf("loss-%02x%02x%02x/exclusion", v.R, v.G, v.B), v, colExcluded})
	}
	for _, p := range pairs {
		t.Run(p.name, func(t *testing.T) {
			if d := fillDifference(p.a, p.b); d < minFillDifference {
				t.Errorf("%v and %v differ by ΔE00 %.1f for some reader, want ≥ %v", p.a, p.b, d, minFillDifference)
			}
		})
	}
}
