// The order-k sets of the k-coverage levels as flat stride-k tuples of
// device indices (each ascending): the order-1 sets, and the sort that
// orders the sets a level finds and removes repeats (a counting sort by
// first member, then a sort per group, of packed keys where they fit).

package coverage

import (
	"slices"

	"github.com/sitecover/sitecover/planar"
)

// kFirstSets returns the order-1 sets: the vertices with a non-empty
// clipped cell.
func kFirstSets(l *Layout) []int32 {
	nv := l.Tri.NumVertices()
	sets := make([]int32, 0, nv)
	for v := int32(0); v < int32(nv); v++ {
		if l.Cells.SiteStart[v] < l.Cells.SiteStart[v+1] {
			sets = append(sets, v)
		}
	}
	return sets
}

// kPackBits is the number of bits per member when the members after the
// first of a tuple are packed into one uint64 key (kUniquePacked): up to
// three members of up to 2^21 − 1 (2 097 151 vertices).
const kPackBits = 21

// kUniqueSets sorts the stride-k tuples of sets (each ascending) and
// removes repeats: a counting sort by the first member, then a sort of
// each (short) group.
func kUniqueSets(sets []int32, k int, nv int) []int32 {
	n := len(sets) / k
	cnt := make([]int32, nv+1)
	for i := 0; i < n; i++ {
		cnt[sets[i*k]+1]++
	}
	for v := 0; v < nv; v++ {
		cnt[v+1] += cnt[v]
	}
	if k-1 <= 64/kPackBits && nv < 1<<kPackBits {
		return kUniquePacked(sets, k, nv, cnt)
	}
	idx := make([]int32, n)
	pos := slices.Clone(cnt[:nv])
	for i := 0; i < n; i++ {
		f := sets[i*k]
		idx[pos[f]] = int32(i)
		pos[f]++
	}
	cmpTup := func(a, b int32) int {
		return slices.Compare(sets[int(a)*k:int(a)*k+k], sets[int(b)*k:int(b)*k+k])
	}
	planar.ParallelFor(nv, 4096, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			slices.SortFunc(idx[cnt[v]:cnt[v+1]], cmpTup)
		}
	})
	out := make([]int32, 0, len(sets)/2)
	for v := 0; v < nv; v++ {
		grp := idx[cnt[v]:cnt[v+1]]
		for j, i := range grp {
			tup := sets[int(i)*k : int(i)*k+k]
			if j > 0 && slices.Equal(tup, out[len(out)-k:]) {
				continue
			}
			out = append(out, tup...)
		}
	}
	return out
}

// kUniquePacked is kUniqueSets with the members after the first packed
// into one uint64 per tuple (most significant first, so the order of the
// keys is the lexicographic order of the tuples): a sort of plain integers
// per group instead of one of tuples. cnt holds the group starts.
func kUniquePacked(sets []int32, k int, nv int, cnt []int32) []int32 {
	n := len(sets) / k
	keys := make([]uint64, n)
	pos := slices.Clone(cnt[:nv])
	for i := 0; i < n; i++ {
		var key uint64
		for _, m := range sets[i*k+1 : i*k+k] {
			key = key<<kPackBits | uint64(m)
		}
		f := sets[i*k]
		keys[pos[f]] = key
		pos[f]++
	}
	planar.ParallelFor(nv, 4096, func(lo, hi int) {
		for v := lo; v < hi; v++ {
			slices.Sort(keys[cnt[v]:cnt[v+1]])
		}
	})
	out := make([]int32, 0, len(sets)/2)
	const mask = 1<<kPackBits - 1
	for v := 0; v < nv; v++ {
		grp := keys[cnt[v]:cnt[v+1]]
		for j, key := range grp {
			if j > 0 && key == grp[j-1] {
				continue
			}
			out = append(out, int32(v))
			out = slices.Grow(out, k-1)[:len(out)+k-1]
			for m := len(out) - 1; m > len(out)-k; m-- {
				out[m] = int32(key & mask)
				key >>= kPackBits
			}
		}
	}
	return out
}
