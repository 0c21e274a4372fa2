// Bands of the site area by the number of devices in reach at the planned
// range: 0, 1, …, K−1 and "K or more", disjoint and tiling the area.
//
// With G_k the k-gaps of level k (the part reached by fewer than k
// devices; G_1 ⊂ G_2 ⊂ … ⊂ G_K), the band of exactly j < K devices is
// G_{j+1} \ G_j (G_0 = ∅) and the band of K or more is A \ G_K. Its exact
// area comes from the closed forms of KCover:
//
//	area(band j) = covered(j) − covered(j+1),  covered(0) = area(A),
//	area(band K+) = covered(K).
//
// Outlines. The k-gap outlines replace arcs by chords (sagitta at most
// chordTol·r), so they nest only up to that; the bands are therefore built
// from cumulative unions, U_k = (U_{k−1} ∪ G_k) ∩ A (planar.Union and
// planar.Intersection, exact overlay), band j = U_{j+1} \ U_j and band K+ =
// A \ U_K (planar.Difference; each band's difference runs in parallel with
// the next union). They are disjoint and their areas add up to
// area(A) up to the rounded crossing points of the overlay (a few ulps of
// the coordinates times the perimeters; KBandAreaRel). A band outline
// differs from the exact band by at most the chord sagitta along its arcs,
// plus any k-gap part whose chord outline the overlay refuses even after
// repair (see kgUnionSimple; none in the tests): it is left out, and its
// area goes to the next band.
//
// Near-degenerate overlays. Where a k-gap's chord outline and the one of
// the level below run within a few ulps of each other (arcs of one circle
// traced by two constructions, as with own ranges, whose level 1 comes
// from the power-cell gaps), the exact overlay may refuse its operands
// (planar.NearDegenerateError). The overlay (the union U_k as well as the
// intersections and differences) is then retried with its operands snapped to a coarser grid, KBandSnapBits[i] bits below the
// largest coordinate magnitude (kgCleanRing: exact power-of-two snapping,
// spikes and repeats removed); a vertex moves by at most that step, far
// below the chord sagitta, so the outlines stay within the bound above.

package coverage

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// KBandAreaRel bounds the relative difference between the sum of the
// band outlines' areas and the site area: the overlay's rounded crossing
// points move edges by a few ulps (2^−52 relative) of the coordinates, so
// the areas change by that times the perimeters; for sites of up to 1e6
// edges in coordinates of up to 1e6 m this stays far below 1e-9 of the
// area.
const KBandAreaRel = 1e-9

// KBandSnapBits are the snapping grids of the overlay retries (see the
// file comment): 2^−32 and 2^−24 of the largest coordinate magnitude
// (2e-7 and 6e-5 m at 1000 m), coarse enough to merge vertices a few ulps
// apart, fine against the chord sagitta (DefaultChordTolerance).
var KBandSnapBits = [...]int{32, 24}

// KBand is the part of the site area reached by exactly Devices devices
// at the planned range (Devices or more for the last band).
type KBand struct {
	// Devices is the number of devices in reach.
	Devices int
	// OrMore is set on the last band: Devices or more.
	OrMore bool
	// Area is the band's exact area (m², from the closed forms).
	Area float64
	// Share is Area divided by the site area.
	Share float64
	// Outline is the band as disjoint polygons (arcs as chords; see the
	// file comment), disjoint from the other bands' and together tiling
	// the site area.
	Outline orb.MultiPolygon
}

// ErrBandsNeedLevels is returned (wrapped) by Bands when the levels 1 … K
// were not all computed with their gaps.
var ErrBandsNeedLevels = errors.New("the bands need every level 1 … K computed with its gaps")

// Bands returns the bands of the site area by the number of devices in
// reach, 0 … K−1 and K or more, K the largest level computed. It needs
// KCover run with Gaps and every level from 1 to K (MaxK, or Levels
// listing them all).
func (kc *KCoverage) Bands(l *Layout) ([]KBand, error) {
	K := len(kc.Levels)
	if K == 0 || !kc.hasGaps {
		return nil, fmt.Errorf("coverage: Bands: %w", ErrBandsNeedLevels)
	}
	for i, lv := range kc.Levels {
		if lv.K != i+1 {
			return nil, fmt.Errorf("coverage: Bands: level %d missing: %w", i+1, ErrBandsNeedLevels)
		}
	}
	site := l.Area.MultiPolygon()
	outlines, err := kbCumulative(kc, site)
	if err != nil {
		return nil, err
	}
	bands := make([]KBand, 0, K+1)
	for k := 1; k <= K; k++ {
		hi := kc.AreaM2
		if k > 1 {
			hi = kc.Levels[k-2].CoveredArea
		}
		bands = append(bands, kbBand(kc, k-1, false, hi-kc.Levels[k-1].CoveredArea, outlines[k-1]))
	}
	return append(bands, kbBand(kc, K, true, kc.Levels[K-1].CoveredArea, outlines[K])), nil
}

// kbLevelGaps returns the outlines of the k-gaps of every level, by level.
func kbLevelGaps(kc *KCoverage) []orb.MultiPolygon {
	gs := make([]orb.MultiPolygon, len(kc.Levels))
	for i, lv := range kc.Levels {
		for _, gp := range lv.Gaps {
			gs[i] = append(gs[i], gp.Outline...)
		}
	}
	return gs
}

// kbCumulative returns the band outlines from the cumulative unions (see
// the file comment): U_k = (U_{k−1} ∪ G_k) ∩ A, band j = U_{j+1} \ U_j,
// band K+ = A \ U_K, with kgUnionSimple's repairs and kbOverlay's retries
// on snapped operands. Only the chain of unions is sequential: each band's
// difference runs beside the next union (the same overlays on the same
// operands as one after the other, so the same outlines).
func kbCumulative(kc *KCoverage, site orb.MultiPolygon) ([]orb.MultiPolygon, error) {
	K := len(kc.Levels)
	gs := kbLevelGaps(kc)
	out := make([]orb.MultiPolygon, K+1)
	errs := make([]error, K+1) // of the differences
	var wg sync.WaitGroup
	var prev orb.MultiPolygon // U_{k−1}
	for k := 1; k <= K; k++ {
		u, err := kbUnion(append(prev[:len(prev):len(prev)], gs[k-1]...), site)
		if err != nil {
			wg.Wait()
			// A band before k that failed came first.
			if e := kbFirstError(errs[:k-1]); e != nil {
				return nil, e
			}
			return nil, fmt.Errorf("coverage: Bands: k = %d: %w", k, err)
		}
		lower := prev
		wg.Go(func() {
			if out[k-1], errs[k-1] = kbOverlay(planar.Difference, u, lower); errs[k-1] != nil {
				errs[k-1] = fmt.Errorf("coverage: Bands: k = %d: %w", k, errs[k-1])
			}
		})
		prev = u
	}
	top, err := kbOverlay(planar.Difference, site, prev)
	wg.Wait()
	if err != nil {
		errs[K] = fmt.Errorf("coverage: Bands: K or more: %w", err)
	}
	if e := kbFirstError(errs); e != nil {
		return nil, e
	}
	out[K] = top
	return out, nil
}

// kbFirstError returns the first non-nil error of errs (nil if none).
func kbFirstError(errs []error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

// kbBand makes one band; the exact area is clamped at 0 (the difference
// of two covered areas may round below it).
func kbBand(kc *KCoverage, j int, orMore bool, area float64, outline orb.MultiPolygon) KBand {
	area = math.Max(0, area)
	return KBand{Devices: j, OrMore: orMore, Area: area, Share: area / kc.AreaM2, Outline: outline}
}

// kbUnion returns (⋃ mp) ∩ site; polygons the overlay refuses even after
// repair are left out (kgUnionSimple).
func kbUnion(mp, site orb.MultiPolygon) (orb.MultiPolygon, error) {
	u, err := kbOverlay(func(a, _ orb.MultiPolygon) (orb.MultiPolygon, error) {
		u, _, err := kgUnionSimple(a)
		return u, err
	}, mp, nil)
	if err != nil {
		return nil, err
	}
	return kbOverlay(planar.Intersection, u, site)
}

// kbOverlay returns op(a, b), retried on operands snapped to the grids of
// KBandSnapBits when the overlay refuses them as near-degenerate (b may be
// nil for an operation of one operand).
func kbOverlay(op func(a, b orb.MultiPolygon) (orb.MultiPolygon, error), a, b orb.MultiPolygon) (orb.MultiPolygon, error) {
	out, err := op(a, b)
	var nd *planar.NearDegenerateError
	for _, bits := range KBandSnapBits {
		if err == nil || !errors.As(err, &nd) {
			break
		}
		_, e := math.Frexp(max(kgMaxAbs(a), kgMaxAbs(b)))
		step := math.Ldexp(1, e-bits)
		out, err = op(kbSnap(a, step), kbSnap(b, step))
	}
	return out, err
}

// kbSnap returns mp with every polygon cleaned on the grid of the step
// (kgCleanPolygon); polygons that vanish are dropped.
func kbSnap(mp orb.MultiPolygon, step float64) orb.MultiPolygon {
	out := make(orb.MultiPolygon, 0, len(mp))
	for _, pg := range mp {
		if q := kgCleanPolygon(pg, step); q != nil {
			out = append(out, q)
		}
	}
	return out
}
