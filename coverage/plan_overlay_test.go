// Tests of the incremental cells (plan_overlay.go) against a from-scratch
// rebuild: after every edit the full-cover range and the uncovered area of
// the plan must equal those of NewLayout on all devices (triangulation and
// clipping from scratch, FullCover and UncoveredArea), and the gain of a
// hypothetical device must equal the drop in uncovered area of the rebuilt
// layouts. These are two independent computations of the same definitions
// (full-cover range max_{q∈A} min_i |q − p_i|, uncovered area
// area(A ∖ ∪_i D(p_i, r))); the rebuild shares no code with the clipping
// used here.

package coverage

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// planTestRegion returns the square [0, side]² with a square exclusion zone
// of side side/5 centred at (0.4 side, 0.6 side).
func planTestRegion(t testing.TB, side float64) *planar.Region {
	t.Helper()
	h0, h1 := 0.3*side, 0.5*side
	v0, v1 := 0.5*side, 0.7*side
	reg, err := planar.NewRegion(orb.MultiPolygon{{
		{{0, 0}, {side, 0}, {side, side}, {0, side}, {0, 0}},
		{{h0, v0}, {h0, v1}, {h1, v1}, {h1, v0}, {h0, v0}},
	}})
	if err != nil {
		t.Fatal(err)
	}
	return reg
}

func planRebuild(t testing.TB, base []orb.Point, extra []orb.Point, reg *planar.Region) *Layout {
	t.Helper()
	all := append(append([]orb.Point(nil), base...), extra...)
	l, err := NewLayout(all, reg)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func TestPlanOverlayMatchesRebuild(t *testing.T) {
	const side = 150.0
	// Many sites (cells cut the exclusion zone), plus a few outside the
	// area.
	base := sitegen.Uniform(225, 3) // square of side 150
	base = append(base, orb.Point{-20, 40}, orb.Point{side + 5, side + 5})
	planOverlayScene(t, "uniform", planTestRegion(t, side), base, side, []float64{6, 11})
	// Few sites: the exclusion zone lies inside one cell, and pieces of an
	// L-shaped area have notches.
	planOverlayScene(t, "zone-in-cell", planTestRegion(t, side), []orb.Point{{20, 20}, {130, 30}, {75, 140}}, side, []float64{25, 45})
	lreg := planPolyRegion(t, [][2]float64{{0, 0}, {150, 0}, {150, 40}, {40, 40}, {40, 150}, {0, 150}}, nil)
	planOverlayScene(t, "L", lreg, []orb.Point{{100, 100}, {20, 20}, {140, 10}}, side, []float64{25, 45})
}

func planOverlayScene(t *testing.T, name string, reg *planar.Region, base []orb.Point, side float64, ranges []float64) {
	rng := rand.New(rand.NewPCG(7, 11))
	l := planRebuild(t, base, nil, reg)
	for _, r := range ranges {
		o := newPlanOverlay(l, r)
		var ids []int32
		check := func(step string) {
			t.Helper()
			ext := o.positions()
			lr := planRebuild(t, base, ext, reg)
			fc := lr.FullCover().Range
			if got := o.fullCover(); math.Abs(got-fc) > 1e-9*fc {
				t.Fatalf("%s r=%g %s: full cover %.15g, rebuild %.15g", name, r, step, got, fc)
			}
			unc := lr.UncoveredArea(r)
			if got := o.uncovered(); math.Abs(got-unc) > 1e-9*l.AreaM2 {
				t.Fatalf("%s r=%g %s: uncovered %.15g, rebuild %.15g", name, r, step, got, unc)
			}
			// Every cell's radius: the rebuilt site's farthest point.
			for k, id := range o.liveIDs() {
				in := len(base) + k
				v := lr.Tri.Vertex[in]
				if int(lr.Tri.Source[v]) != in {
					continue // shares a spot with an earlier device
				}
				d, _, _ := lr.vertexFarthest(v)
				if got := o.devRho(id); math.Abs(got-math.Max(d, 0)) > 1e-9*math.Max(1, d) {
					t.Fatalf("%s r=%g %s: device %d radius %.15g, rebuild %.15g", name, r, step, id, got, d)
				}
			}
			for u := range o.cur {
				c := o.cur[u]
				if c < 0 {
					continue
				}
				in := int(l.Tri.Source[u])
				v := lr.Tri.Vertex[in]
				d, _, _ := lr.vertexFarthest(v)
				if got := o.cells[c].rho; math.Abs(got-math.Max(d, 0)) > 1e-9*math.Max(1, d) {
					t.Fatalf("%s r=%g %s: site %d radius %.15g, rebuild %.15g", name, r, step, in, got, d)
				}
			}
			// Worst point: attains the range in the rebuilt layout.
			rng0, w := o.worst()
			v := lr.Tri.Nearest(w[0], w[1], -1)
			d := math.Hypot(w[0]-lr.Tri.Coords[2*v], w[1]-lr.Tri.Coords[2*v+1])
			if math.Abs(d-rng0) > 1e-9*rng0 {
				t.Fatalf("%s r=%g %s: worst point %v at %.15g from its nearest device, range %.15g", name, r, step, w, d, rng0)
			}
		}
		check("base")
		for step := 0; step < 40; step++ {
			op := rng.IntN(10)
			switch {
			case op < 5 || len(ids) == 0:
				var x, y float64
				switch rng.IntN(6) {
				case 0: // exactly on a base site
					p := base[rng.IntN(len(base))]
					x, y = p[0], p[1]
				case 1: // exactly on another planned device
					if len(ids) > 0 {
						x, y = o.pos(ids[rng.IntN(len(ids))])
						break
					}
					fallthrough
				default:
					x, y = rng.Float64()*(side+20)-10, rng.Float64()*(side+20)-10
				}
				id, _ := o.add(x, y)
				ids = append(ids, id)
			case op < 8:
				id := ids[rng.IntN(len(ids))]
				px, py := o.pos(id)
				o.move(id, px+rng.NormFloat64()*8, py+rng.NormFloat64()*8)
			default:
				k := rng.IntN(len(ids))
				o.remove(ids[k])
				ids = append(ids[:k], ids[k+1:]...)
			}
			check("after edit")
			// Gain of a hypothetical device vs the rebuilt layouts.
			if step%4 == 0 {
				c := orb.Point{rng.Float64() * side, rng.Float64() * side}
				ext := o.positions()
				u0 := planRebuild(t, base, ext, reg).UncoveredArea(r)
				u1 := planRebuild(t, base, append(ext, c), reg).UncoveredArea(r)
				var sc planScratch
				if g := o.gain(c[0], c[1], &sc); math.Abs(g-(u0-u1)) > 1e-9*l.AreaM2 {
					t.Fatalf("%s r=%g: gain at %v %.15g, rebuild %.15g", name, r, c, g, u0-u1)
				}
			}
		}
	}
}
