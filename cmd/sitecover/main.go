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
//	sitecover review  --sites FILE [--area FILE] --range 150m [--listen 127.0.0.1:0] [--out DIR]
//	sitecover completion bash|zsh|fish|powershell
//	sitecover --version
//
// Exit codes: 0 success, 1 bad input (one line on stderr naming the file,
// the feature or CSV line, and the problem), 2 bad usage, 3 internal error.
// See README.md for the input formats and the outputs.
package main

import (
	"fmt"
	"os"
	"os/signal"
	"syscall"

	"github.com/sitecover/sitecover/report"
)

func main() {
	if os.Getenv(supervisedEnv) == "" {
		if code, ok := supervise(os.Args[1:]); ok {
			os.Exit(code)
		}
	}
	injectFault()
	sig := make(chan os.Signal, 1)
	signal.Notify(sig, os.Interrupt, syscall.SIGTERM)
	go exitOnSignal(sig)
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// exitOnSignal waits for Ctrl-C (SIGINT) or SIGTERM. While the review
// command serves its page, the first signal only stops its server
// (runInterruptHook) and the command returns normally. Otherwise it
// removes the staging folders of report writes in progress (the output
// folders keep their previous set, see report.AbortWrites), says so in one
// line and exits with 130 (128 + SIGINT, the shell convention; 143 for
// SIGTERM).
func exitOnSignal(sig <-chan os.Signal) {
	for s := range sig {
		if runInterruptHook() {
			continue
		}
		report.AbortWrites()
		fmt.Fprintln(os.Stderr, "sitecover: interrupted: output folders left as they were (or complete, if already written)")
		if s == syscall.SIGTERM {
			os.Exit(143)
		}
		os.Exit(130)
	}
}
