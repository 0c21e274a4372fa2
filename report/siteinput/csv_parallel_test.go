package siteinput

import (
	"fmt"
	"reflect"
	"runtime"
	"strings"
	"testing"
)

// readCSVBoth reads data with one processor (sequentially) and with two
// (in parallel parts when it qualifies) and returns both results.
func readCSVBoth(t *testing.T, data string, planar, withWeight bool) (seq, par struct {
	s   *siteSet
	w   []float64
	err error
}) {
	t.Helper()
	src := Source{Name: "big.csv", Data: []byte(data)}
	old := runtime.GOMAXPROCS(1)
	seq.s, seq.w, seq.err = pointsFromCSV(src, planar, withWeight)
	runtime.GOMAXPROCS(max(2, old))
	par.s, par.w, par.err = pointsFromCSV(src, planar, withWeight)
	runtime.GOMAXPROCS(old)
	return seq, par
}

// TestCSVParallelSameAsSequential checks that a CSV body read in parallel
// parts gives exactly the site set of one sequential read: positions,
// names, source lines, ranges, types, attribute columns and weights, with
// blank lines and CRLF line ends; and that a bad line, a quoted field and
// a small file are read (or refused) exactly as sequentially, the error
// naming the same line.
func TestCSVParallelSameAsSequential(t *testing.T) {
	body := func(rows int, bad int, crlf bool) string {
		var b strings.Builder
		eol := "\n"
		if crlf {
			eol = "\r\n"
		}
		b.WriteString("x,y,name,range,type,owner,weight" + eol)
		for i := range rows {
			if i%1000 == 17 {
				b.WriteString(eol) // a blank line
			}
			x := fmt.Sprintf("%d.%03d", i%5000, i%997)
			if i == bad {
				x = "12a"
			}
			rng := ""
			if i%3 == 0 {
				rng = fmt.Sprint(50 + i%40)
			}
			fmt.Fprintf(&b, "%s, %d.5,site-%d,%s,t%d,team %d,%d%s", x, i/5000, i, rng, i%4, i%7, i%9, eol)
		}
		return b.String()
	}
	for _, tc := range []struct {
		name     string
		data     string
		weight   bool
		parallel bool // the body qualifies for parallel parts
	}{
		{"lf", body(60000, -1, false), true, true},
		{"crlf", body(60000, -1, true), false, true},
		{"bad line late", body(60000, 59000, false), true, true},
		{"bad line early", body(60000, 3, false), false, true},
		{"quoted field", strings.Replace(body(60000, -1, false), "site-9,", `"site,9",`, 1), false, false},
		{"small", body(200, -1, false), true, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := len(tc.data) >= parallelCSVBytes && !strings.Contains(tc.data, `"`); got != tc.parallel {
				t.Fatalf("case qualifies for parallel parts: %v, want %v", got, tc.parallel)
			}
			seq, par := readCSVBoth(t, tc.data, true, tc.weight)
			if fmt.Sprint(seq.err) != fmt.Sprint(par.err) {
				t.Fatalf("errors differ: sequential %v, parallel %v", seq.err, par.err)
			}
			if seq.err != nil {
				if !strings.Contains(seq.err.Error(), "line ") {
					t.Errorf("error %q names no line", seq.err)
				}
				return
			}
			if !reflect.DeepEqual(seq.s, par.s) || !reflect.DeepEqual(seq.w, par.w) {
				a, b := *seq.s, *par.s
				t.Fatalf("site sets differ: sequential %d sites, parallel %d; pts %v names %v src %v ranges %v types %v attrs %v tagged %v weights %v",
					len(a.Pts), len(b.Pts), reflect.DeepEqual(a.Pts, b.Pts), reflect.DeepEqual(a.Names, b.Names), reflect.DeepEqual(a.Src, b.Src),
					reflect.DeepEqual(a.Ranges, b.Ranges), reflect.DeepEqual(a.Types, b.Types), reflect.DeepEqual(a.attrs, b.attrs), a.tagged == b.tagged, reflect.DeepEqual(seq.w, par.w))
			}
			if n := len(seq.s.Pts); n < 200 || seq.s.attrs.done != n || len(seq.s.Ranges) != n {
				t.Fatalf("%d sites, %d with attributes, %d ranges", n, seq.s.attrs.done, len(seq.s.Ranges))
			}
		})
	}
}

// TestCSVParts checks the cut of a body into parts at newlines.
func TestCSVParts(t *testing.T) {
	for _, tc := range []struct {
		name string
		body string
		k    int
		want []string
	}{
		{"even", "a\nb\nc\nd\n", 2, []string{"a\nb\n", "c\nd\n"}},
		{"one long line", "abcdefgh\n", 3, []string{"abcdefgh\n", ""}},
		{"no final newline", "a\nbb\nccc", 3, []string{"a\n", "bb\n", "ccc"}},
		{"single", "a\nb\n", 1, []string{"a\nb\n"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var got []string
			for _, p := range csvParts([]byte(tc.body), tc.k) {
				got = append(got, string(p))
			}
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("csvParts(%q, %d) = %q, want %q", tc.body, tc.k, got, tc.want)
			}
		})
	}
}
