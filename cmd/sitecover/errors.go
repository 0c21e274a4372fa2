// Errors and exit codes.
//
// The command prints at most one line per failure on stderr,
// "sitecover: <what is wrong, and where>", and exits with
//
//	0  success
//	1  bad input: a file that is missing, unreadable or malformed, a
//	   coordinate out of range, an unparseable range, an area too large
//	   for one local plane, an output folder that cannot be written, or an
//	   analysis that refuses the input
//	2  bad usage: unknown command or flag, missing required flag, extra
//	   arguments, a flag value of the wrong type
//	3  internal error: a panic, turned into one line (a bug to report)
//
// Errors raised while running a command are wrapped in *exitError with their
// code; anything else cobra returns (flag parsing, argument checks, unknown
// commands) is bad usage.

package main

import (
	"errors"
	"fmt"
	"io/fs"
	"strings"
)

// Exit codes of the sitecover command.
const (
	exitOK       = 0
	exitInput    = 1
	exitUsage    = 2
	exitInternal = 3
)

// exitError is an error with the exit code it causes.
type exitError struct {
	code int
	msg  string
}

func (e *exitError) Error() string { return e.msg }

// inputErrorf reports bad input (exit 1).
func inputErrorf(format string, args ...any) error {
	return &exitError{code: exitInput, msg: fmt.Sprintf(format, args...)}
}

// usageErrorf reports bad usage (exit 2).
func usageErrorf(format string, args ...any) error {
	return &exitError{code: exitUsage, msg: fmt.Sprintf(format, args...)}
}

// asInput marks any error as bad input (exit 1) unless it already carries a
// code.
func asInput(err error) error {
	if err == nil {
		return nil
	}
	var e *exitError
	if errors.As(err, &e) {
		return err
	}
	return &exitError{code: exitInput, msg: err.Error()}
}

// exitCode returns the exit code for an error returned by the root command.
func exitCode(err error) int {
	if err == nil {
		return exitOK
	}
	var e *exitError
	if errors.As(err, &e) {
		return e.code
	}
	return exitUsage
}

// errorLine formats err as the single stderr line "sitecover: ...". Line
// breaks inside the message are folded so the output stays one line.
func errorLine(err error) string {
	msg := strings.TrimSpace(err.Error())
	msg = strings.TrimPrefix(msg, "sitecover: ")
	// cobra's suggestion block: "\n\nDid you mean this?\n\tanalyze\n".
	if i := strings.Index(msg, "\n\nDid you mean this?"); i >= 0 {
		alts := strings.Fields(msg[i+len("\n\nDid you mean this?"):])
		msg = msg[:i] + "; did you mean " + strings.Join(alts, " or ") + "?"
	}
	msg = strings.Join(strings.Fields(strings.ReplaceAll(msg, "\n", " ")), " ")
	if exitCode(err) == exitUsage && !strings.Contains(msg, "--help") {
		msg += " (see 'sitecover --help')"
	}
	return "sitecover: " + msg
}

// unwrapPathErr drops the operation and path of an *fs.PathError, which
// the messages already name.
func unwrapPathErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
