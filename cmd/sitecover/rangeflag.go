// The --range value: a positive length with an optional unit.
//
// Units: m (metres, the default for a plain number), km (1000 m), ft and mi.
// The foot and the mile are the international ones, exact by definition
// since 1959: 1 ft = 0.3048 m, 1 mi = 5280 ft = 1609.344 m (common
// practice; US survey units differ by 2 ppm and are not offered). The
// conversion is one float64 multiplication, so the metres are correct to
// half an ulp of the product.

package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// rangeUnits maps each accepted unit (lower case) to metres.
var rangeUnits = map[string]float64{
	"m":  1,
	"km": 1000,
	"ft": 0.3048,
	"mi": 1609.344,
}

// parseRange parses a --range value such as "150m", "0.15 km", "500ft",
// "0.1mi" or "150" (metres) and returns metres. The value must be a finite
// number greater than zero.
func parseRange(s string) (float64, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return 0, fmt.Errorf("--range is empty: give a length such as 150m, 0.2km, 500ft or 0.1mi")
	}
	i := len(t)
	for i > 0 {
		c := t[i-1]
		if (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') {
			i--
			continue
		}
		break
	}
	num, unit := strings.TrimSpace(t[:i]), strings.ToLower(t[i:])
	// "Inf", "NaN" and "1e3" end in letters too: a unit is only split off
	// when what precedes it is a number.
	if num == "" || strings.HasSuffix(num, "e") || strings.HasSuffix(num, "E") {
		num, unit = t, ""
	}
	scale := 1.0
	if unit != "" {
		f, ok := rangeUnits[unit]
		if !ok {
			return 0, fmt.Errorf("--range %q: unknown unit %q (use m, km, ft or mi)", s, t[i:])
		}
		scale = f
	}
	v, err := strconv.ParseFloat(num, 64)
	if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange {
		return 0, fmt.Errorf("--range %q: must be greater than 0 and finite", s)
	}
	if err != nil || strings.ContainsAny(strings.ToLower(num), "infax") {
		// ParseFloat also accepts "Inf", "NaN" and hex floats; none is a range.
		return 0, fmt.Errorf("--range %q: not a number with a unit (e.g. 150m, 0.2km, 500ft, 0.1mi)", s)
	}
	m := v * scale
	if !(m > 0) || math.IsInf(m, 0) {
		return 0, fmt.Errorf("--range %q: must be greater than 0 and finite", s)
	}
	return m, nil
}
