//go:build !linux

// Folder locks and the folder exchange where renameat2 is not available.

package report

import (
	"fmt"
	"os"
)

// lockFolder opens dir. Without flock no lock is taken: two runs into one
// folder are not detected on these systems.
func lockFolder(dir string) (*os.File, error) {
	f, err := os.Open(dir)
	if err != nil {
		return nil, fmt.Errorf("output folder %s: cannot open it: %v", dir, unwrapPath(err))
	}
	return f, nil
}

// swapFolders exchanges the folders a and b by two renames.
func swapFolders(a, b string) error { return swapByRenames(a, b) }
