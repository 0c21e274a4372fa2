package report

import (
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
