// Least-significant-digit radix sort of 64-bit words by their upper 32
// bits (Knuth, TAOCP vol. 3, §5.2.5), used to order points by quantised
// distance from the sweep centre. Each pass is a stable counting sort on an
// 11- or 10-bit digit, so words with equal keys keep their input order (the
// lower 32 bits hold the point index): the order is deterministic. No
// rounding is involved.

package planar

import (
	"slices"
	"unsafe"
)

// radixSortHigh sorts keys by their upper 32 bits, stably, using buf (same
// length) as scratch. The sorted words end up in buf, which is returned;
// keys is left in an unspecified order.
func radixSortHigh(keys, buf []uint64) []uint64 {
	n := len(keys)
	buf = buf[:n]
	if n < 256 {
		copy(buf, keys)
		slices.Sort(buf) // the index bits make every word distinct
		return buf
	}
	const (
		b0, b1, b2 = 11, 11, 10
		s0, s1, s2 = 32, 32 + b0, 32 + b0 + b1
	)
	var c0 [1 << b0]int
	var c1 [1 << b1]int
	var c2 [1 << b2]int
	for _, k := range keys {
		c0[(k>>s0)&(1<<b0-1)]++
		c1[(k>>s1)&(1<<b1-1)]++
		c2[k>>s2]++
	}
	prefix := func(c []int) {
		sum := 0
		for i, v := range c {
			c[i] = sum
			sum += v
		}
	}
	prefix(c0[:])
	prefix(c1[:])
	prefix(c2[:])
	for _, k := range keys {
		d := (k >> s0) & (1<<b0 - 1)
		buf[c0[d]] = k
		c0[d]++
	}
	for _, k := range buf {
		d := (k >> s1) & (1<<b1 - 1)
		keys[c1[d]] = k
		c1[d]++
	}
	for _, k := range keys {
		d := k >> s2
		buf[c2[d]] = k
		c2[d]++
	}
	return buf
}

// unsafeInt32 reinterprets the memory of u (8-byte aligned) as 2·len(u)
// int32 values, so the sort buffers can be reused for hull links.
func unsafeInt32(u []uint64) []int32 {
	return unsafe.Slice((*int32)(unsafe.Pointer(&u[0])), 2*len(u))
}
