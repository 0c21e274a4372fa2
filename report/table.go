// Fixed-width text tables for report.txt.
//
// A table holds its body cells as one byte slice with the end offset of
// each cell (row-major), so a table of 10⁵ rows costs two allocations
// that grow, not one string per cell. A long table (one row per site, gap
// or hole) is given as a row count and a function filling row i (rows):
// it is then filled twice, once to measure the column widths and once to
// write, one row in memory at a time, so its size never matters. In the
// measuring pass numbers are not formatted: each column keeps its extreme
// values, whose text is the widest (numExtremes). Column widths are
// counted in runes (UTF-8 code points), which is the display width for the
// names sitecover prints (Latin, Greek, Cyrillic); wide East Asian
// characters would need two columns each and are not measured specially.

package report

import (
	"bytes"
	"math"
	"strconv"
	"unicode/utf8"
)

// table is a fixed-width table: numeric columns right-aligned, the
// columns named by left() left-aligned. The last column is not padded and
// trailing spaces are trimmed from every line.
//
// Cells are added row by row, either whole rows with row() or one cell at
// a time with str, num, int and cell; every row has len(heads) cells
// (missing trailing cells of a row() call are empty).
type table struct {
	heads  []string
	isLeft []bool
	// cells is the text of every body cell, concatenated in row-major
	// order; ends[k] is the end offset of cell k in cells.
	cells []byte
	ends  []int
	// n and fill, when fill is set, give the body instead: fill(i) adds
	// the cells of row i (see rows).
	n    int
	fill func(i int)
	// measuring is set while write fills rows only to measure widths;
	// ext then gathers, per column, the numbers num was given (see num).
	measuring bool
	ext       []numExtremes
}

// numExtremes are the largest and the most negative finite number given
// to num in one column, all with decimals prec. The text of a number with
// a fixed count of decimals grows with its magnitude (the correctly
// rounded integer part can only gain digits), within each sign (−0 prints
// "-0.00" as any negative does), so the widest such text in a column is
// that of one of the two: widths are measured from them instead of
// formatting every number of a long table twice.
type numExtremes struct {
	set, hasPos, hasNeg bool
	prec                int
	pos, neg            float64
}

// keep records v (finite, prec ≥ 0) and reports true, or reports false
// when the column already holds numbers with other decimals.
func (e *numExtremes) keep(v float64, prec int) bool {
	if e.set && e.prec != prec {
		return false
	}
	e.set, e.prec = true, prec
	if math.Signbit(v) {
		if !e.hasNeg || v < e.neg {
			e.neg, e.hasNeg = v, true
		}
	} else if !e.hasPos || v > e.pos {
		e.pos, e.hasPos = v, true
	}
	return true
}

// width returns the widest text of the numbers kept.
func (e *numExtremes) width() int {
	w := 0
	var buf [32]byte
	if e.hasPos {
		w = len(strconv.AppendFloat(buf[:0], e.pos, 'f', e.prec, 64))
	}
	if e.hasNeg {
		w = max(w, len(strconv.AppendFloat(buf[:0], e.neg, 'f', e.prec, 64)))
	}
	return w
}

// lastUnmeasured reports whether fill is being called only to measure the
// column widths and the last column is left-aligned: no line pads that
// column, so its width is not needed and a fill may leave its last cell
// empty (ending it with cell) instead of formatting it twice, e.g. a
// list of device names.
func (t *table) lastUnmeasured() bool {
	return t.measuring && t.isLeft[len(t.isLeft)-1]
}

// rows gives the body as n rows, fill(i) adding the cells of row i with
// str, num, int and cell; write formats each row twice (widths, then
// text) and keeps one row at a time.
func (t *table) rows(n int, fill func(i int)) {
	t.n, t.fill = n, fill
}

// fillRow replaces the body by row i of a table given with rows.
func (t *table) fillRow(i int) {
	t.cells, t.ends = t.cells[:0], t.ends[:0]
	t.fill(i)
}

// head sets the column headings; it must be called before any cell.
func (t *table) head(h ...string) {
	t.heads = h
	t.isLeft = make([]bool, len(h))
}

// left marks columns as left-aligned.
func (t *table) left(cols ...int) {
	for _, c := range cols {
		t.isLeft[c] = true
	}
}

// row adds a whole row.
func (t *table) row(c ...string) {
	for _, s := range c {
		t.str(s)
	}
	for len(t.ends)%len(t.heads) != 0 {
		t.cell()
	}
}

// cell ends the cell whose text was appended to t.cells since the last
// cell ended.
func (t *table) cell() { t.ends = append(t.ends, len(t.cells)) }

// str adds a text cell.
func (t *table) str(s string) {
	t.cells = append(t.cells, s...)
	t.cell()
}

// num adds v with prec decimals, as fmt's %.{prec}f would print it. While
// the table is only being measured, a finite v is kept among its column's
// extremes (numExtremes) and its cell left empty.
func (t *table) num(v float64, prec int) {
	if t.measuring && prec >= 0 && !math.IsNaN(v) && !math.IsInf(v, 0) {
		if t.ext[len(t.ends)].keep(v, prec) {
			t.cell()
			return
		}
	}
	t.cells = strconv.AppendFloat(t.cells, v, 'f', prec, 64)
	t.cell()
}

// int adds prefix followed by v in decimal ("#12", "+3", "7").
func (t *table) int(prefix string, v int) {
	t.cells = append(t.cells, prefix...)
	t.cells = strconv.AppendInt(t.cells, int64(v), 10)
	t.cell()
}

// body returns body cell k.
func (t *table) body(k int) []byte {
	start := 0
	if k > 0 {
		start = t.ends[k-1]
	}
	return t.cells[start:t.ends[k]]
}

// write writes the headings, a rule of dashes under them and the rows.
func (t *table) write(b *textBuf) {
	n := len(t.heads)
	if n == 0 {
		return
	}
	w := make([]int, n)
	for i, h := range t.heads {
		w[i] = utf8.RuneCountInString(h)
	}
	measure := func() {
		for k := range t.ends {
			w[k%n] = max(w[k%n], utf8.RuneCount(t.body(k)))
		}
	}
	rows := len(t.ends) / n
	if t.fill != nil {
		rows = t.n
		t.measuring = true
		t.ext = make([]numExtremes, n)
		for i := range t.n {
			t.fillRow(i)
			measure()
		}
		t.measuring = false
		for i := range t.ext {
			w[i] = max(w[i], t.ext[i].width())
		}
	} else {
		measure()
	}
	lineLen := 3 // indent and newline
	for _, wi := range w {
		lineLen += wi + 2
	}
	b.Grow(min(lineLen*(2+rows), textFlush)) // lines are written on every textFlush bytes

	row := make([][]byte, n)
	for i, h := range t.heads {
		row[i] = []byte(h)
	}
	t.line(b, w, row)
	for i := range row {
		k := w[i]
		if i == n-1 && t.isLeft[i] {
			k = utf8.RuneCountInString(t.heads[i])
		}
		row[i] = bytes.Repeat([]byte{'-'}, k)
	}
	t.line(b, w, row)
	if t.fill == nil {
		for k := 0; k+n <= len(t.ends); k += n {
			for i := range row {
				row[i] = t.body(k + i)
			}
			t.line(b, w, row)
		}
		return
	}
	for r := range t.n {
		t.fillRow(r)
		for i := range row {
			row[i] = t.body(i)
		}
		t.line(b, w, row)
	}
}

// line writes one line of cells padded to the widths w.
func (t *table) line(b *textBuf, w []int, cells [][]byte) {
	start := b.Len()
	b.WriteString("  ")
	for i, c := range cells {
		pad := w[i] - utf8.RuneCount(c)
		last := i == len(cells)-1
		switch {
		case t.isLeft[i] && last:
			b.Write(c)
		case t.isLeft[i]:
			b.Write(c)
			spaces(b, pad)
		default:
			spaces(b, pad)
			b.Write(c)
		}
		if !last {
			b.WriteString("  ")
		}
	}
	trimmed := bytes.TrimRight(b.Bytes()[start:], " ")
	b.Truncate(start + len(trimmed))
	b.WriteByte('\n')
	b.spill()
}

// spaces writes n spaces (none when n <= 0).
func spaces(b *textBuf, n int) {
	const blank = "                                                                "
	for n > 0 {
		k := min(n, len(blank))
		b.WriteString(blank[:k])
		n -= k
	}
}
