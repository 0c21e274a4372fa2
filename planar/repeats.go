// Exact repeats in a point list: each point equal to an earlier one, found
// with one open-addressing hash table of point indices (linear probing,
// at most half full), in expected O(n) time and 4·2^⌈log₂ 2n⌉ bytes,
// a fraction of a Go map keyed by points.
//
// Equality is exact floating-point equality of both coordinates, as for
// points used as map keys: −0 equals +0 (both hash as +0), and a NaN
// coordinate equals nothing (such a point is never reported).

package planar

import (
	"math"
	"math/bits"

	"github.com/paulmach/orb"
)

// Repeats calls visit(i, j) for every point pts[i] equal to an earlier
// point, j being the first index holding it, in increasing i.
func Repeats(pts []orb.Point, visit func(i, j int)) {
	n := len(pts)
	if n < 2 {
		return
	}
	size := 1 << bits.Len(uint(2*n-1)) // a power of two ≥ 2n
	mask := uint64(size - 1)
	table := make([]int32, size) // index + 1 of a point, 0 for an empty slot
	for i, p := range pts {
		h := repeatHash(p) & mask
		for {
			k := table[h]
			if k == 0 {
				table[h] = int32(i + 1)
				break
			}
			if q := pts[k-1]; q[0] == p[0] && q[1] == p[1] {
				visit(i, int(k-1))
				break
			}
			h = (h + 1) & mask
		}
	}
}

// repeatHash mixes the bits of both coordinates (−0 taken as +0) with the
// 64-bit finaliser of MurmurHash3 (Appleby, 2011), so that nearby or
// grid-aligned coordinates spread over the table.
func repeatHash(p orb.Point) uint64 {
	x, y := p[0], p[1]
	if x == 0 {
		x = 0 // −0 → +0
	}
	if y == 0 {
		y = 0
	}
	h := math.Float64bits(x) ^ bits.RotateLeft64(math.Float64bits(y), 31)*0x9e3779b97f4a7c15
	h ^= h >> 33
	h *= 0xff51afd7ed558ccd
	h ^= h >> 33
	h *= 0xc4ceb9fe1a85ec53
	h ^= h >> 33
	return h
}
