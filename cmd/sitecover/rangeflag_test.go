// Tests of --range parsing against the exact unit definitions.

package main

import (
	"strconv"
	"strings"
	"testing"
)

// rangeRelTol is the relative tolerance of a parsed range: a unit factor
// and a decimal conversion, each correctly rounded, differ from the exact
// product by a few ulps (2⁻⁵² ≈ 2.2e-16 each), far below 1e-12.
const rangeRelTol = 1e-12

func TestParseRange(t *testing.T) {
	// Reference: the international yard and pound (1959 agreement; NIST
	// Handbook 44 Appendix C): 1 ft = 0.3048 m and 1 mi = 5280 ft =
	// 1609.344 m exactly.
	ok := []struct {
		in   string
		want float64
	}{
		{"150m", 150},
		{"0.15km", 150},
		{"500ft", 152.4},
		{"0.1mi", 160.9344},
		{"150", 150},
		{"150 m", 150},
		{" 150M ", 150},
		{"2KM", 2000},
		{"1e2m", 100},
		{"1e2", 100},
		{"1mi", 1609.344},
		{"1ft", 0.3048},
		{"5280ft", 1609.344},
		{".5km", 500},
	}
	for _, c := range ok {
		t.Run("ok "+strconv.Quote(c.in), func(t *testing.T) {
			got, err := parseRange(c.in)
			if err != nil {
				t.Fatalf("parseRange(%q): %v", c.in, err)
			}
			if d := got - c.want; d > rangeRelTol*c.want || d < -rangeRelTol*c.want {
				t.Errorf("parseRange(%q) = %.15g, want %.15g", c.in, got, c.want)
			}
		})
	}
	bad := []struct{ in, msg string }{
		{"", "empty"},
		{"   ", "empty"},
		{"0", "greater than 0"},
		{"0m", "greater than 0"},
		{"-5m", "greater than 0"},
		{"-0.1mi", "greater than 0"},
		{"abc", "not a number"},
		{"NaN", "not a positive number"},
		{"Inf", "not a positive number"},
		{"infm", "not a positive number"},
		{"0x10", "not a number"},
		{"1,5km", "not a number"},
		{"5yd", `unknown unit "yd"`},
		{"150mm", `unknown unit "mm"`},
		{"1e999", "finite"},
		{"1_20", "not a number"},
		{"1_2_0km", "not a number"},
		{"1e300", "between 1 mm and 1000 km"},
		{"1e-300", "between 1 mm and 1000 km"},
		{"0.5mm", `unknown unit "mm"`},
		{"1001km", "between 1 mm and 1000 km"},
		{"-Inf", "not a positive number"},
		{"+inf", "not a positive number"},
		{"1e", `unknown unit "e"`},
		{"1.2.3", "not a number"},
		{"5 m2", "not a number"},
	}
	for _, c := range bad {
		t.Run("bad "+strconv.Quote(c.in), func(t *testing.T) {
			_, err := parseRange(c.in)
			if err == nil {
				t.Fatalf("parseRange(%q): no error", c.in)
			}
			if !strings.Contains(err.Error(), c.msg) || !strings.Contains(err.Error(), "--range") {
				t.Errorf("parseRange(%q) error %q, want it to mention --range and %q", c.in, err, c.msg)
			}
		})
	}
}
