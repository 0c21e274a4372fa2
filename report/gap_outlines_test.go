package report

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// The gap outlines converted ahead on helpers are those converted in one
// goroutine, in the same order, planar and geographic; an error from the
// caller's function stops the conversion and is returned.
func TestGapOutlinesHelpers(t *testing.T) {
	const n = 20_000
	an := analyze(t, sitegen.Uniform(n, 3), region(t, square(math.Sqrt(n)*10)), 6)
	if len(an.Gaps) < 4*gapBatch {
		t.Fatalf("%d gaps: too few to use helpers (want ≥ %d)", len(an.Gaps), 4*gapBatch)
	}
	tm := planar.NewTransverseMercator(planar.WGS84, 11, 48, 1, 0, 0)
	for _, mode := range []struct {
		name string
		m    Meta
	}{
		{"planar", Meta{Planar: true}},
		{"geographic", Meta{ToLonLat: tm.Inverse}},
	} {
		s := newScene(an.Layout, an, mode.m)
		render := func(helpers int) string {
			var b strings.Builder
			err := s.gapOutlinesWith(helpers, an.Gaps, func(gi int, mp orb.MultiPolygon) error {
				fmt.Fprintf(&b, "%d %v\n", gi, mp)
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			return b.String()
		}
		want := render(1)
		for _, h := range []int{2, 3, 8} {
			t.Run(fmt.Sprintf("%s/helpers-%d", mode.name, h), func(t *testing.T) {
				if got := render(h); got != want {
					t.Errorf("outlines differ from those converted in one goroutine (%d vs %d bytes)", len(got), len(want))
				}
			})
		}
		t.Run(mode.name+"/stop", func(t *testing.T) {
			stop := errors.New("stop here")
			calls := 0
			err := s.gapOutlinesWith(2, an.Gaps, func(gi int, mp orb.MultiPolygon) error {
				if calls++; calls == 700 {
					return stop
				}
				return nil
			})
			if err != stop || calls != 700 {
				t.Errorf("err %v after %d calls, want %v after 700", err, calls, stop)
			}
		})
	}
}
