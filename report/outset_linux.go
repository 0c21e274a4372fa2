// Folder locks and the atomic folder exchange on Linux.

package report

import (
	"errors"
	"fmt"
	"os"

	"golang.org/x/sys/unix"
)

// lockFolder opens dir and takes an exclusive, non-blocking flock on it.
// The lock lasts until the returned file is closed (or the process ends).
func lockFolder(dir string) (*os.File, error) {
	f, err := os.Open(dir)
	if err != nil {
		return nil, fmt.Errorf("output folder %s: cannot open it: %v", dir, unwrapPath(err))
	}
	if err := unix.Flock(int(f.Fd()), unix.LOCK_EX|unix.LOCK_NB); err != nil {
		f.Close()
		if errors.Is(err, unix.EWOULDBLOCK) {
			return nil, fmt.Errorf("output folder %s is in use by another sitecover run: wait for it to finish or choose another --out folder", dir)
		}
		return nil, fmt.Errorf("output folder %s: cannot lock it: %v", dir, err)
	}
	return f, nil
}

// swapFolders exchanges the folders a and b in one atomic rename
// (renameat2 RENAME_EXCHANGE). Where the file system cannot exchange, it
// falls back to swapByRenames.
func swapFolders(a, b string) error {
	err := unix.Renameat2(unix.AT_FDCWD, a, unix.AT_FDCWD, b, unix.RENAME_EXCHANGE)
	if errors.Is(err, unix.EINVAL) || errors.Is(err, unix.ENOSYS) || errors.Is(err, unix.EOPNOTSUPP) {
		return swapByRenames(a, b)
	}
	return err
}
