// Bulk loading of the R-tree spatial index (extension gpkg_rtree_index,
// OGC 12-128 Annex F.3) by Sort-Tile-Recursive packing (Leutenegger,
// Lopez and Edgington, "STR: a simple and efficient algorithm for R-tree
// packing", ICDE 1997).
//
// Inserting the features one at a time through SQLite's rtree module costs
// about four times as much as writing the features themselves (its
// ChooseLeaf and node splits run per row). Instead each layer keeps its
// features' envelopes (24 bytes a feature: the fid and four float32) and
// Close writes the finished tree straight into the shadow tables of the
// rtree virtual table, as GDAL does for its own GeoPackages:
//
//	<name>_node   (nodeno INTEGER PRIMARY KEY, data BLOB)
//	<name>_rowid  (rowid INTEGER PRIMARY KEY, nodeno)   leaf of each entry
//	<name>_parent (nodeno INTEGER PRIMARY KEY, parentnode) for non-root nodes
//
// A node blob (SQLite's rtree.c format) is: a 2-byte big-endian depth
// (the root's tree depth, 0 when the root is a leaf; unused elsewhere), a
// 2-byte big-endian cell count, then cells of an 8-byte big-endian id (the
// fid in a leaf, the child's nodeno above) and minx, maxx, miny, maxy as
// big-endian float32, zero-padded to the node size the module chose when
// the table was created (the length of the root blob). Node 1 is the
// root. float32 bounds are rounded outward (min down, max up) so that
// every box contains its geometry, as the module itself does.
//
// STR: with capacity M and n boxes, the boxes are sorted by centre x, cut
// into ceil(sqrt(ceil(n/M))) vertical slices of equal count, each slice
// sorted by centre y and cut into nodes of M; the nodes' boxes form the
// next level, until one node remains. The tests check the result with
// SQLite's rtreecheck() and GDAL's spatial filter.

package gpkg

import (
	"database/sql"
	"encoding/binary"
	"fmt"
	"math"
	"slices"
	"strings"
)

// R-tree node layout constants (SQLite rtree.c, 2-D REAL tree).
const (
	rtreeNodeHeader = 4             // depth and cell count
	rtreeCellBytes  = 8 + 4*4       // id and four float32
	rtreeMaxDepth   = math.MaxInt16 // depth is a 16-bit field
)

// rtreeEntries are the index entries of one layer: ids[i] with box
// box[4i:4i+4] = minx, maxx, miny, maxy.
type rtreeEntries struct {
	ids []int64
	box []float32
}

// add records fid with its envelope rounded outward to float32.
func (r *rtreeEntries) add(fid int64, e envelope) {
	r.ids = append(r.ids, fid)
	r.box = append(r.box, down32(e.minX), up32(e.maxX), down32(e.minY), up32(e.maxY))
}

// down32 is the largest float32 not above v; up32 the smallest not below.
func down32(v float64) float32 {
	f := float32(v)
	if float64(f) > v {
		f = math.Nextafter32(f, float32(math.Inf(-1)))
	}
	return f
}

func up32(v float64) float32 {
	f := float32(v)
	if float64(f) < v {
		f = math.Nextafter32(f, float32(math.Inf(1)))
	}
	return f
}

// rtreeNode is a packed node: its cells (indices into the level below) and
// its box.
type rtreeNode struct {
	first, count int // cells are entries first..first+count-1 of the level below, in order
	box          [4]float32
}

// strLevel packs one level: the boxes of the level below (4 per entry)
// are reordered in place together with ids, and the nodes returned each
// cover a run of consecutive entries.
func strLevel(ids []int64, box []float32, m int) []rtreeNode {
	n := len(ids)
	order := make([]int32, n)
	for i := range order {
		order[i] = int32(i)
	}
	centre := func(i int32, axis int) float32 { return box[4*i+2*int32(axis)] + box[4*i+2*int32(axis)+1] }
	byAxis := func(axis int) func(a, b int32) int {
		return func(a, b int32) int {
			ca, cb := centre(a, axis), centre(b, axis)
			switch {
			case ca < cb:
				return -1
			case ca > cb:
				return 1
			}
			return int(a - b)
		}
	}
	slices.SortFunc(order, byAxis(0))
	leaves := (n + m - 1) / m
	slabs := int(math.Ceil(math.Sqrt(float64(leaves))))
	per := slabs * m // entries per vertical slice
	for s := 0; s < n; s += per {
		slices.SortFunc(order[s:min(s+per, n)], byAxis(1))
	}
	// Apply the permutation to ids and box.
	newIDs := make([]int64, n)
	newBox := make([]float32, 4*n)
	for i, o := range order {
		newIDs[i] = ids[o]
		copy(newBox[4*i:4*i+4], box[4*o:4*o+4])
	}
	copy(ids, newIDs)
	copy(box, newBox)
	var nodes []rtreeNode
	for s := 0; s < n; s += per {
		end := min(s+per, n)
		for f := s; f < end; f += m {
			nd := rtreeNode{first: f, count: min(m, end-f)}
			nd.box = [4]float32{box[4*f], box[4*f+1], box[4*f+2], box[4*f+3]}
			for i := f + 1; i < f+nd.count; i++ {
				nd.box[0] = min(nd.box[0], box[4*i])
				nd.box[1] = max(nd.box[1], box[4*i+1])
				nd.box[2] = min(nd.box[2], box[4*i+2])
				nd.box[3] = max(nd.box[3], box[4*i+3])
			}
			nodes = append(nodes, nd)
		}
	}
	return nodes
}

// writeRtree packs r and writes it into the shadow tables of the rtree
// table name, created empty by CREATE VIRTUAL TABLE.
func writeRtree(tx *sql.Tx, name string, r *rtreeEntries) error {
	if len(r.ids) == 0 {
		return nil // the empty root the module made is the whole tree
	}
	var nodeSize int
	if err := tx.QueryRow("SELECT length(data) FROM " + quoteIdent(name+"_node") + " WHERE nodeno = 1").Scan(&nodeSize); err != nil {
		return fmt.Errorf("R-tree root: %w", err)
	}
	m := (nodeSize - rtreeNodeHeader) / rtreeCellBytes
	if m < 2 {
		return fmt.Errorf("R-tree node of %d bytes holds %d cells", nodeSize, m)
	}
	w, err := newRtreeWriter(tx, name, nodeSize)
	if err != nil {
		return err
	}
	defer w.close()
	// Levels bottom-up: ids are fids at the leaves and node numbers
	// above. The root is numbered 1; other nodes from 2 on.
	ids, box := r.ids, r.box
	next := int64(2)
	for depth := 0; ; depth++ {
		if depth > rtreeMaxDepth {
			return fmt.Errorf("R-tree deeper than %d", rtreeMaxDepth)
		}
		nodes := strLevel(ids, box, m)
		root := len(nodes) == 1
		upIDs := make([]int64, len(nodes))
		upBox := make([]float32, 4*len(nodes))
		for i, nd := range nodes {
			nodeno := next
			if root {
				nodeno = 1
			} else {
				next++
			}
			upIDs[i] = nodeno
			copy(upBox[4*i:], nd.box[:])
			if err := w.node(nodeno, depth, root, ids[nd.first:nd.first+nd.count], box[4*nd.first:4*(nd.first+nd.count)]); err != nil {
				return err
			}
		}
		if root {
			return nil
		}
		ids, box = upIDs, upBox
	}
}

// rtreeWriter fills the shadow tables: one statement per node for the
// node's blob, and one multi-row INSERT per node for its cells' _rowid
// (leaf) or _parent (inner node) rows, which costs a fraction of one
// statement per cell.
type rtreeWriter struct {
	tx      *sql.Tx
	setNode *sql.Stmt
	name    string
	blob    []byte
	args    []any
	inserts map[[2]int]string // SQL by (level > 0, cell count)
}

func newRtreeWriter(tx *sql.Tx, name string, nodeSize int) (*rtreeWriter, error) {
	w := &rtreeWriter{tx: tx, name: name, blob: make([]byte, nodeSize), inserts: map[[2]int]string{}}
	var err error
	w.setNode, err = tx.Prepare("INSERT OR REPLACE INTO " + quoteIdent(name+"_node") + " (nodeno, data) VALUES (?, ?)")
	return w, err
}

func (w *rtreeWriter) close() {
	if w.setNode != nil {
		w.setNode.Close()
	}
}

// cellsSQL is the INSERT of count cell rows into _rowid (a leaf's cells)
// or _parent (an inner node's children).
func (w *rtreeWriter) cellsSQL(inner bool, count int) string {
	key := [2]int{0, count}
	table, cols := w.name+"_rowid", " (rowid, nodeno)"
	if inner {
		key[0] = 1
		table, cols = w.name+"_parent", " (nodeno, parentnode)"
	}
	q, ok := w.inserts[key]
	if !ok {
		q = "INSERT INTO " + quoteIdent(table) + cols + " VALUES (?, ?)" + strings.Repeat(", (?, ?)", count-1)
		w.inserts[key] = q
	}
	return q
}

// node writes node nodeno at the given level (0 = leaf) with cells ids
// and their boxes, and records it as the parent of its cells.
func (w *rtreeWriter) node(nodeno int64, level int, root bool, ids []int64, box []float32) error {
	clear(w.blob)
	if root {
		binary.BigEndian.PutUint16(w.blob[0:], uint16(level))
	}
	binary.BigEndian.PutUint16(w.blob[2:], uint16(len(ids)))
	w.args = w.args[:0]
	for i, id := range ids {
		c := w.blob[rtreeNodeHeader+i*rtreeCellBytes:]
		binary.BigEndian.PutUint64(c, uint64(id))
		for k := 0; k < 4; k++ {
			binary.BigEndian.PutUint32(c[8+4*k:], math.Float32bits(box[4*i+k]))
		}
		w.args = append(w.args, id, nodeno)
	}
	if _, err := w.setNode.Exec(nodeno, w.blob); err != nil {
		return err
	}
	_, err := w.tx.Exec(w.cellsSQL(level > 0, len(ids)), w.args...)
	return err
}
