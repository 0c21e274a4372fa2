// Fuzz target: the range parser returns a length within the stated bounds or an
// error for any input, never panics.
//
//	go test -run '^$' -fuzz '^FuzzParseRange$' -fuzztime 20s ./cmd/sitecover

package main

import "testing"

func FuzzParseRange(f *testing.F) {
	for _, s := range []string{"150m", "0.1mi", "1e3", "-1", "NaN", "5 km", "ft"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		m, err := parseRange(s)
		if err == nil && !(m >= minRangeMetres && m <= maxRangeMetres) {
			t.Fatalf("parseRange(%q) = %g", s, m)
		}
	})
}
