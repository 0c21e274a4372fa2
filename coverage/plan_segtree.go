// A segment tree of maxima over slots, for the planners' running maxima
// (plan_overlay.go): the full-cover range is the largest radius over the
// current cells, and the reach of a planned device's cell the largest
// radius over the planned devices' cells. Each recomputed cell updates its
// slot in O(log n); the maximum is read in O(1). The tree is a complete
// binary tree in one flat slice (node i has children 2i and 2i + 1, leaves
// from n on), so there is no pointer per node. No arithmetic but max: the
// maximum is exact.

package coverage

import "math"

// planMaxTree is a segment tree of maxima over slots (−1 when empty),
// growing on demand.
type planMaxTree struct {
	n int // leaves, a power of two
	v []float64
}

// init sets up the tree with the first len(vals) slots from vals (nb of
// them), the rest empty.
func (t *planMaxTree) init(nb int, vals []float64) {
	t.n = 1
	for t.n < nb+16 {
		t.n *= 2
	}
	t.v = make([]float64, 2*t.n)
	for i := range t.v {
		t.v[i] = -1
	}
	copy(t.v[t.n:], vals[:nb])
	for i := t.n - 1; i >= 1; i-- {
		t.v[i] = math.Max(t.v[2*i], t.v[2*i+1])
	}
}

// set stores x in slot i (−1 empties it), growing the tree when i is beyond
// its leaves, and updates the maxima above it.
func (t *planMaxTree) set(i int, x float64) {
	if i >= t.n {
		old := t.v[t.n:]
		n := t.n
		for n <= i {
			n *= 2
		}
		vals := make([]float64, n)
		for k := range vals {
			vals[k] = -1
		}
		copy(vals, old)
		t.init(n, vals)
	}
	i += t.n
	t.v[i] = x
	for i > 1 {
		i >>= 1
		t.v[i] = math.Max(t.v[2*i], t.v[2*i+1])
	}
}

// max returns the largest value stored (−1 when every slot is empty).
func (t *planMaxTree) max() float64 { return t.v[1] }
