// Lengths with units: the --range value, a sites file's range column or
// property, and the ranges of a device-type table (ranges.go).
//
// Units: m (metres, the default for a plain number), km (1000 m), ft and mi.
// The foot and the mile are the international ones, exact by definition
// since 1959: 1 ft = 0.3048 m, 1 mi = 5280 ft = 1609.344 m (common
// practice; US survey units differ by 2 ppm and are not offered). The
// conversion is one float64 multiplication, so the metres are correct to
// half an ulp of the product.

package siteinput

import (
	"errors"
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

// Sane bounds for a device range, inclusive. A range below a millimetre or
// beyond a thousand kilometres is a unit mistake, not a device: the lower
// bound keeps every printed range (to 0.01 m) meaningful, the upper one keeps
// disks inside one local plane (see planar.MaxLocalScaleError).
const (
	// MinRangeMetres is the smallest accepted range (1 mm).
	MinRangeMetres = 1e-3
	// MaxRangeMetres is the largest accepted range (1000 km).
	MaxRangeMetres = 1e6
)

// ParseLength parses a length such as "150m", "0.15 km", "500ft", "0.1mi"
// or "150" (metres) and returns metres. The number is plain decimal
// (digits, an optional fraction, an optional exponent; no digit
// separators, hex, Inf or NaN) and the result must lie in
// [MinRangeMetres, MaxRangeMetres]. what names the value in the messages
// (a flag such as "--range", or a file's line and column); the error is a
// plain error starting with what, for the caller to classify.
func ParseLength(s, what string) (float64, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return 0, fmt.Errorf("%s is empty: give a length such as 150m, 0.2km, 500ft or 0.1mi", what)
	}
	n := decimalPrefix(t)
	num, unit := t[:n], strings.TrimSpace(t[n:])
	if num == "" || num == "+" || num == "-" {
		if low := strings.ToLower(strings.TrimLeft(t, "+-")); strings.HasPrefix(low, "inf") || strings.HasPrefix(low, "nan") {
			return 0, fmt.Errorf("%s %q: not a positive number (give a length such as 150m)", what, s)
		}
		return 0, fmt.Errorf("%s %q: not a number with a unit (e.g. 150m, 0.2km, 500ft, 0.1mi)", what, s)
	}
	scale := 1.0
	if unit != "" {
		f, ok := rangeUnits[strings.ToLower(unit)]
		if !ok {
			if strings.IndexFunc(unit, func(r rune) bool { return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z') }) >= 0 {
				return 0, fmt.Errorf("%s %q: not a number with a unit (e.g. 150m, 0.2km, 500ft, 0.1mi)", what, s)
			}
			return 0, fmt.Errorf("%s %q: unknown unit %q (use m, km, ft or mi)", what, s, unit)
		}
		scale = f
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return 0, fmt.Errorf("%s %q: not a number with a unit (e.g. 150m, 0.2km, 500ft, 0.1mi)", what, s)
	}
	m := v * scale
	if !(m > 0) {
		return 0, fmt.Errorf("%s %q: must be greater than 0", what, s)
	}
	if m < MinRangeMetres || m > MaxRangeMetres || math.IsInf(m, 0) {
		return 0, fmt.Errorf("%s %q: must be finite and between 1 mm and 1000 km", what, s)
	}
	return m, nil
}

// decimalPrefix returns the length of the longest prefix of s that is a
// plain decimal number: an optional sign, digits with at most one '.', and
// an optional exponent (e or E, optional sign, digits). An exponent marker
// not followed by digits is left to the unit (so "1e" is refused there).
func decimalPrefix(s string) int {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits, dot := 0, false
	for ; i < len(s); i++ {
		c := s[i]
		if c >= '0' && c <= '9' {
			digits++
		} else if c == '.' && !dot {
			dot = true
		} else {
			break
		}
	}
	if digits == 0 {
		return 0
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j {
			i = k
		}
	}
	return i
}
