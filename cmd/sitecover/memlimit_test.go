package main

import (
	"os"
	"runtime/debug"
	"testing"
)

// TestSetMemoryLimitGCPercent checks the collector's growth target a run
// sets: 50 % from gcLargeSites sites, the default 100 % below, and a GOGC
// from the environment left as it is.
func TestSetMemoryLimitGCPercent(t *testing.T) {
	t.Setenv("SITECOVER_HUGEPAGES", "off") // no heap block in the test process
	t.Setenv("GOMEMLIMIT", "off")          // keep the test process's own limit
	cases := []struct {
		name  string
		gogc  string // "" : unset
		sites int
		want  int
	}{
		{"large run", "", 1_000_000, gcPercentLarge},
		{"threshold", "", gcLargeSites, gcPercentLarge},
		{"small run", "", gcLargeSites - 1, 100},
		{"GOGC set", "80", 1_000_000, 77}, // 77: the value before the call, untouched
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if c.gogc != "" {
				t.Setenv("GOGC", c.gogc)
			} else if v, ok := os.LookupEnv("GOGC"); ok {
				t.Setenv("GOGC", v)
				os.Unsetenv("GOGC")
			}
			prev := debug.SetGCPercent(77)
			setMemoryLimit(c.sites)
			if got := debug.SetGCPercent(prev); got != c.want {
				t.Errorf("growth target after a run on %d sites: %d %%, want %d %%", c.sites, got, c.want)
			}
		})
	}
}
