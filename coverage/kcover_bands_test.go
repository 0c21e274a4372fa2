// Tests of KCoverage.Bands (kcover_bands.go): the bands are disjoint and
// tile the site area, their exact areas add up to it, their outlines match
// those areas up to the chords, and brute-force samples lie in the band of
// their number of devices in reach.

package coverage

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"reflect"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// kBandChordArea bounds, relative to r times the outline's perimeter, the
// difference between a band outline's area and its exact area: chords of
// sagitta s = DefaultChordTolerance·r cut off at most (2/3)·s per unit of
// arc length (a circular segment's area is below (2/3)·chord·sagitta), and
// the perimeter is longer than the arcs.
const kBandChordArea = DefaultChordTolerance

func TestKCoverBands(t *testing.T) {
	for _, sc := range kTestScenes(t) {
		for _, r := range []float64{9, 14} {
			t.Run(fmt.Sprintf("%s/r%v", sc.name, r), func(t *testing.T) {
				K := min(4, len(kDistinct(sc.l)))
				kc, err := KCover(sc.l, r, KOptions{MaxK: K, Gaps: true})
				if err != nil {
					t.Fatal(err)
				}
				bands, err := kc.Bands(sc.l)
				if err != nil {
					t.Fatal(err)
				}
				if len(bands) != K+1 || !bands[K].OrMore || bands[K].Devices != K {
					t.Fatalf("%d bands, last %+v", len(bands), bands[len(bands)-1])
				}
				exact, poly := 0.0, 0.0
				for j, b := range bands {
					a := coveredPolyArea(b.Outline)
					exact += b.Area
					poly += a
					per := 0.0
					for _, pg := range b.Outline {
						for _, ring := range pg {
							for i := 1; i < len(ring); i++ {
								per += math.Hypot(ring[i][0]-ring[i-1][0], ring[i][1]-ring[i-1][1])
							}
						}
					}
					if math.Abs(a-b.Area) > kBandChordArea*r*per+KBandAreaRel*sc.l.AreaM2 {
						t.Errorf("band %d: outline area %.9g, exact %.9g (perimeter %.4g)", j, a, b.Area, per)
					}
				}
				if math.Abs(poly-sc.l.AreaM2) > KBandAreaRel*sc.l.AreaM2 {
					t.Errorf("band outlines sum to %.12g, site area %.12g", poly, sc.l.AreaM2)
				}
				if math.Abs(exact-sc.l.AreaM2) > 1e-9*sc.l.AreaM2 {
					t.Errorf("exact band areas sum to %.12g, site area %.12g", exact, sc.l.AreaM2)
				}
				kBandSamples(t, sc.l, r, bands)
				kBandsSerialCheck(t, kc, sc.l, bands)
			})
		}
	}
}

// kBandSamples checks that brute-force samples whose number of devices in
// reach is clear (every distance farther than the chord sagitta from r)
// lie in exactly one band outline, the band of that number.
func kBandSamples(t *testing.T, l *Layout, r float64, bands []KBand) {
	t.Helper()
	pts := kDistinct(l)
	K := len(bands) - 1
	margin := 2 * DefaultChordTolerance * r
	bad := 0
	kForSamples(l, 2.3, func(x, y float64) {
		n, clear := 0, true
		for _, p := range pts {
			d := math.Hypot(p[0]-x, p[1]-y)
			if math.Abs(d-r) < margin {
				clear = false
			}
			if d <= r {
				n++
			}
		}
		if !clear {
			return
		}
		want := min(n, K)
		in, got := 0, -1
		for j, bd := range bands {
			if gapsOutlineContains(bd.Outline, orb.Point{x, y}) {
				in++
				got = j
			}
		}
		if in != 1 || got != want {
			bad++
			if bad <= 3 {
				t.Errorf("(%v, %v): %d devices in reach, in %d bands (last %d)", x, y, n, in, got)
			}
		}
	})
}

func TestKCoverBandsNeedLevels(t *testing.T) {
	sc := kTestScenes(t)[0]
	for _, c := range []struct {
		name string
		opt  KOptions
	}{
		{"no-gaps", KOptions{MaxK: 2}},
		{"level-missing", KOptions{Levels: []int{1, 3}, Gaps: true}},
	} {
		t.Run(c.name, func(t *testing.T) {
			kc, err := KCover(sc.l, 10, c.opt)
			if err != nil {
				t.Fatal(err)
			}
			if _, err := kc.Bands(sc.l); !errors.Is(err, ErrBandsNeedLevels) {
				t.Errorf("err %v, want ErrBandsNeedLevels", err)
			}
		})
	}
}

// kBandsSerialCheck checks that the bands' outlines are exactly those of
// the same overlays run one after the other (Bands runs each band's
// difference beside the next union; kcover_bands.go before that change).
func kBandsSerialCheck(t *testing.T, kc *KCoverage, l *Layout, bands []KBand) {
	t.Helper()
	site := l.Area.MultiPolygon()
	var want []orb.MultiPolygon
	var prev orb.MultiPolygon
	for _, g := range kbLevelGaps(kc) {
		u, err := kbUnion(append(prev[:len(prev):len(prev)], g...), site)
		if err != nil {
			t.Fatal(err)
		}
		band, err := kbOverlay(planar.Difference, u, prev)
		if err != nil {
			t.Fatal(err)
		}
		want = append(want, band)
		prev = u
	}
	top, err := kbOverlay(planar.Difference, site, prev)
	if err != nil {
		t.Fatal(err)
	}
	want = append(want, top)
	for j, b := range bands {
		if !reflect.DeepEqual(b.Outline, want[j]) {
			t.Errorf("band %d: outline differs from the serial overlays'", j)
		}
	}
}
