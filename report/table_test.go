package report

import (
	"math"
	"testing"
)

// TestTable checks the fixed-width layout: right-aligned numbers, left
// columns padded except the last, widths in runes (non-ASCII names),
// trailing spaces trimmed (an empty last cell), and the cell-by-cell
// builders giving the same text as whole rows.
func TestTable(t *testing.T) {
	const want = "" +
		"  No  Area m2  Name   Notes\n" +
		"  --  -------  -----  -----\n" +
		"   1     12.5  Nørd   a, b\n" +
		"  10  12345.0  Ö\n" +
		"  #3      0.1  Weird  x\n"
	whole := &table{}
	whole.head("No", "Area m2", "Name", "Notes")
	whole.left(2, 3)
	whole.row("1", "12.5", "Nørd", "a, b")
	whole.row("10", "12345.0", "Ö")
	whole.row("#3", "0.1", "Weird", "x")

	cells := &table{}
	cells.head("No", "Area m2", "Name", "Notes")
	cells.left(2, 3)
	cells.int("", 1)
	cells.num(12.5, 1)
	cells.str("Nørd")
	cells.cells = append(cells.cells, "a, b"...)
	cells.cell()
	cells.int("", 10)
	cells.num(12345, 1)
	cells.str("Ö")
	cells.str("")
	cells.int("#", 3)
	cells.num(0.05000001, 1)
	cells.str("Weird")
	cells.str("x")

	for _, tc := range []struct {
		name string
		tb   *table
	}{{"rows", whole}, {"cells", cells}} {
		t.Run(tc.name, func(t *testing.T) {
			var b textBuf
			tc.tb.write(&b)
			if b.String() != want {
				t.Errorf("%s:\n%s\nwant\n%s", tc.name, b.String(), want)
			}
		})
	}
}

// TestTableMeasuredNumbers checks that a table given by rows (widths
// measured from each column's extreme numbers, numExtremes) lays out
// exactly as the same cells added one by one (every number formatted and
// measured): rounding that gains a digit, negative zero, tiny negatives,
// a column mixing decimals, and non-finite values.
func TestTableMeasuredNumbers(t *testing.T) {
	cases := []struct {
		name string
		vals []float64
		prec []int
	}{
		{"rounding gains a digit", []float64{9.994, 99.996, 5}, []int{2, 2, 2}},
		{"negative zero", []float64{math.Copysign(0, -1), 1, 2}, []int{2, 2, 2}},
		{"tiny negative prints -0", []float64{-0.001, 3.5, 12}, []int{2, 2, 2}},
		{"wide negative", []float64{-12345.678, 99.5, 0}, []int{1, 1, 1}},
		{"mixed decimals", []float64{1.5, 2.25, 1234.5}, []int{1, 3, 0}},
		{"non-finite", []float64{math.NaN(), math.Inf(-1), 7}, []int{2, 2, 2}},
		{"no decimals", []float64{0.5, 1.5, -2.5}, []int{0, 0, 0}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			fill := func(tb *table, i int) {
				tb.int("", i+1)
				tb.num(c.vals[i], c.prec[i])
				tb.num(-c.vals[i], c.prec[i])
				tb.str("end")
			}
			all := &table{}
			all.head("No", "A", "B", "Note")
			all.left(3)
			for i := range c.vals {
				fill(all, i)
			}
			byRows := &table{}
			byRows.head("No", "A", "B", "Note")
			byRows.left(3)
			byRows.rows(len(c.vals), func(i int) { fill(byRows, i) })
			var want, got textBuf
			all.write(&want)
			byRows.write(&got)
			if got.String() != want.String() {
				t.Errorf("by rows:\n%s\nwant\n%s", got.String(), want.String())
			}
		})
	}
}
