// Command sitecover plans and reviews the coverage of fixed devices that
// each serve a radius (wireless gateways, sensors, sirens, alarm call
// points, defibrillator cabinets) across a site: the share covered at a
// planned range, the gaps and the range that closes each, the range that
// closes all of them, and each device's service area; and plans where to
// add devices, which devices are critical, and which device serves each
// demand point.
//
// Usage:
//
//	sitecover analyze --sites FILE [--area FILE] [--exclude FILE] --range 150m [--out DIR] [--json]
//	sitecover gaps    --sites FILE [--area FILE] --range 150m
//	sitecover cells   --sites FILE [--area FILE]
//	sitecover demo    [--out DIR]
//	sitecover suggest --sites FILE [--area FILE] --add K [--range 150m]
//	sitecover suggest --sites FILE [--area FILE] --range 150m
//	sitecover suggest --sites FILE [--area FILE] --candidates FILE --range 150m [--add K]
//	sitecover failures --sites FILE [--area FILE] --range 150m
//	sitecover assign  --sites FILE [--area FILE] --points FILE [--range 150m]
//	sitecover completion bash|zsh|fish|powershell
//	sitecover --version
//
// Exit codes: 0 success, 1 bad input (one line on stderr naming the file,
// the feature or CSV line, and the problem), 2 bad usage, 3 internal error.
// See README.md for the input formats and the outputs.
package main

import "os"

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}
