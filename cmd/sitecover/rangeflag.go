// The --range value: a positive length with an optional unit, parsed by
// siteinput.ParseLength (units m, km, ft, mi; bounds 1 mm to 1000 km), the
// same parser that reads a sites file's range column.

package main

import "github.com/sitecover/sitecover/report/siteinput"

// The accepted range bounds (siteinput.MinRangeMetres, MaxRangeMetres).
const (
	minRangeMetres = siteinput.MinRangeMetres
	maxRangeMetres = siteinput.MaxRangeMetres
)

// parseRange parses a --range value such as "150m", "0.15 km", "500ft",
// "0.1mi" or "150" (metres) and returns metres (siteinput.ParseLength).
func parseRange(s string) (float64, error) {
	return siteinput.ParseLength(s, "--range")
}
