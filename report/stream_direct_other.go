//go:build !linux

package report

import "os"

// directAlign: direct writes are Linux-only (stream_direct_linux.go).
const directAlign = 4096

// createDirect creates path (O_EXCL) for plain writes.
func createDirect(path string) (*os.File, bool, error) {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	return f, false, err
}

// clearDirect: nothing to clear.
func clearDirect(f *os.File) error { return nil }
