// k-gaps: the connected parts of the site area reached by fewer than k
// devices at the planned range (work in progress: not computed yet).

package coverage

import "github.com/paulmach/orb"

// KGap is one connected part of the site area reached by fewer than k
// devices at the planned range.
type KGap struct {
	// ID numbers the gaps of one k from 1, by decreasing ClosingRange.
	ID int
	// Area is the gap's area (m²).
	Area float64
	// Deepest is the spot of the gap that needs the most range.
	Deepest orb.Point
	// ClosingRange is the k-th nearest distance at Deepest: the common
	// range at which the gap vanishes.
	ClosingRange float64
	// Sites are the input indices of the k devices nearest Deepest,
	// nearest first.
	Sites []int
	// Outline is the gap's outline, arcs replaced by chords.
	Outline orb.MultiPolygon
}

// gaps returns the k-gaps of level k (not computed yet: nil).
func (kc *KCoverage) gaps(l *Layout, k int, tol float64) []KGap { return nil }
