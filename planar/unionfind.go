// Union-find (disjoint-set forest) over int32 nodes 0 … n−1, in one flat
// parent slice (Galler & Fischer, "An improved equivalence algorithm",
// CACM 7, 1964; Tarjan, "Efficiency of a good but not linear set union
// algorithm", JACM 22, 1975).
//
// Find halves the path it walks (every node on it is pointed at its
// grandparent), in one pass and without recursion. Two linking rules:
//
//   - Union links by rank (the lower tree under the higher): with path
//     halving, m operations on n nodes take O(m·α(n)) time.
//   - UnionMin links the larger root under the smaller, so every set's root
//     is its smallest node: a canonical representative that does not depend
//     on the order of the unions (used where the representative is
//     observable, e.g. the triangle whose circumcentre a class of
//     cocircular triangles shares). Path halving alone bounds m operations
//     by O(m·log n); on the sparse merges it is used for that is linear in
//     practice.
//
// A caller with its own rule may link one root under another by writing
// Parent directly (the persistence pairing links the younger root under the
// older). Use one rule per forest. Nothing here allocates after NewUnionFind except
// the rank slice, made on the first Union.

package planar

// UnionFind is a disjoint-set forest over the nodes 0 … len(Parent)−1.
// Parent[x] == x marks a root. The zero value is an empty forest; build one
// with NewUnionFind.
type UnionFind struct {
	// Parent holds each node's parent; after Flatten, each node's root.
	Parent []int32
	rank   []uint8
}

// NewUnionFind returns a forest of n singleton sets.
func NewUnionFind(n int) *UnionFind {
	u := &UnionFind{Parent: make([]int32, n)}
	for i := range u.Parent {
		u.Parent[i] = int32(i)
	}
	return u
}

// Find returns the root of x's set, halving the path on the way.
func (u *UnionFind) Find(x int32) int32 {
	par := u.Parent
	for par[x] != x {
		g := par[par[x]]
		par[x] = g
		x = g
	}
	return x
}

// Union joins the sets of a and b, linking by rank, and reports whether
// they were distinct.
func (u *UnionFind) Union(a, b int32) bool {
	ra, rb := u.Find(a), u.Find(b)
	if ra == rb {
		return false
	}
	if u.rank == nil {
		u.rank = make([]uint8, len(u.Parent))
	}
	switch ka, kb := u.rank[ra], u.rank[rb]; {
	case ka < kb:
		u.Parent[ra] = rb
	case ka > kb:
		u.Parent[rb] = ra
	default:
		u.Parent[rb] = ra
		u.rank[ra]++
	}
	return true
}

// UnionMin joins the sets of a and b, linking the larger root under the
// smaller so that every root is the smallest node of its set, and reports
// whether they were distinct.
func (u *UnionFind) UnionMin(a, b int32) bool {
	ra, rb := u.Find(a), u.Find(b)
	switch {
	case ra < rb:
		u.Parent[rb] = ra
	case rb < ra:
		u.Parent[ra] = rb
	default:
		return false
	}
	return true
}

// Flatten points every node directly at its root and returns Parent, which
// then maps each node to its set's representative.
func (u *UnionFind) Flatten() []int32 {
	for i := range u.Parent {
		u.Parent[i] = u.Find(int32(i))
	}
	return u.Parent
}
