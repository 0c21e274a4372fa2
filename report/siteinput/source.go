// Input files: reading one, telling GeoJSON from CSV, and the error type
// every bad input is reported with.

package siteinput

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// Source is the bytes of one input with the name its messages use.
type Source struct {
	// Name is the path as given, or a label for embedded data; every
	// message about this input starts with it.
	Name string
	// Data is the file's content, without a UTF-8 byte order mark.
	Data []byte
	// LocalLayer names the GeoPackage layer Data came from when that layer
	// says its coordinates are local (the undefined Cartesian system,
	// srs_id −1): such an input is read only with Inputs.Planar.
	LocalLayer string
	// Sum identifies the file's bytes as ReadFile read them (before a byte
	// order mark is dropped), so that a run's record names the data it
	// used even if the file changes while it runs; zero for data not read
	// from a file.
	Sum Checksum
}

// Checksum identifies the bytes of an input file: their number and their
// SHA-256 digest (FIPS 180-4) in lower-case hexadecimal, as sha256sum
// prints it.
type Checksum struct {
	Bytes  int64
	SHA256 string
}

// ChecksumOf returns the checksum of b. It takes O(len(b)) time.
func ChecksumOf(b []byte) Checksum {
	d := sha256.Sum256(b)
	return Checksum{Bytes: int64(len(b)), SHA256: hex.EncodeToString(d[:])}
}

// checksumFile returns the checksum of f's bytes from its start.
func checksumFile(f *os.File) (Checksum, error) {
	if _, err := f.Seek(0, io.SeekStart); err != nil {
		return Checksum{}, err
	}
	h := sha256.New()
	n, err := io.Copy(h, f)
	if err != nil {
		return Checksum{}, err
	}
	return Checksum{Bytes: n, SHA256: hex.EncodeToString(h.Sum(nil))}, nil
}

// Error is a problem with the input data: a file that is missing,
// unreadable or malformed, a coordinate out of range, an area that cannot
// be assembled or is too large for one local plane. Its message names the
// file and, where it applies, the feature, polygon, ring and vertex
// (0-based) or the line (1-based), and says what is wrong.
type Error struct {
	msg string
}

// Error returns the message.
func (e *Error) Error() string { return e.msg }

// errorf returns an *Error with the formatted message.
func errorf(format string, args ...any) error {
	return &Error{msg: fmt.Sprintf(format, args...)}
}

// ReadFile reads the input file at path; flag names where the path was
// given (e.g. "--sites") in the messages about a missing file or a folder.
// A leading UTF-8 byte order mark is dropped; an empty file is an *Error.
//
// Limits (see limits.go): a file larger than maxInputBytes is refused
// before it is read, and the first earlyCheckBytes are checked before the
// rest is read, so binary data (a NUL byte), /dev/zero and a header
// followed by garbage are refused at once; the rest is read in chunks up to
// maxInputBytes, each checked for NUL bytes.
func ReadFile(path, flag string) (Source, error) {
	fi, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return Source{}, errorf("%s: no such file (given to %s)", path, flag)
	case err != nil:
		return Source{}, errorf("%s: cannot read: %v", path, unwrapPathErr(err))
	case fi.IsDir():
		return Source{}, errorf("%s: is a folder, not a file (given to %s)", path, flag)
	case fi.Mode().IsRegular() && fi.Size() > maxInputBytes:
		return Source{}, errorf("%s: %s, more than the %s an input may have: split it", path, byteSize(fi.Size()), byteSize(maxInputBytes))
	}
	f, err := os.Open(path)
	if err != nil {
		return Source{}, errorf("%s: cannot read: %v", path, unwrapPathErr(err))
	}
	defer f.Close()
	if fi.Mode().IsRegular() && isGeoPackage(f) { // a pipe cannot be rewound
		// The database is read through its own handle; its checksum is
		// taken just before.
		sum, err := checksumFile(f)
		if err != nil {
			return Source{}, errorf("%s: cannot read: %v", path, unwrapPathErr(err))
		}
		b, local, err := geoPackageAsGeoJSON(path, flag)
		if err != nil {
			return Source{}, err
		}
		return Source{Name: path, Data: b, LocalLayer: local, Sum: sum}, nil
	}
	size := int64(earlyCheckBytes)
	if fi.Mode().IsRegular() {
		size = fi.Size()
	}
	b, err := readLimited(path, f, size)
	if err != nil {
		return Source{}, err
	}
	sum := ChecksumOf(b)
	b = bytes.TrimPrefix(b, []byte("\xef\xbb\xbf")) // UTF-8 byte order mark
	if len(bytes.TrimSpace(b)) == 0 {
		return Source{}, errorf("%s: file is empty", path)
	}
	return Source{Name: path, Data: b, Sum: sum}, nil
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

// inputFormat is how a file is to be read.
type inputFormat int

const (
	formatGeoJSON inputFormat = iota
	formatCSV
)

// sniffLen is how many leading bytes are searched for a NUL byte, the mark
// of binary data.
const sniffLen = 4096

// detectFormat decides GeoJSON or CSV from the extension, or else from the
// content (JSON starts with '{' or '[').
func detectFormat(src Source) (inputFormat, error) {
	switch strings.ToLower(filepath.Ext(src.Name)) {
	case ".geojson", ".json":
		return formatGeoJSON, nil
	case ".csv", ".tsv":
		return formatCSV, nil
	}
	if bytes.IndexByte(src.Data[:min(len(src.Data), sniffLen)], 0) >= 0 {
		return 0, errorf("%s: not GeoJSON or CSV (binary data)", src.Name)
	}
	if t := bytes.TrimSpace(src.Data); t[0] == '{' || t[0] == '[' {
		return formatGeoJSON, nil
	}
	return formatCSV, nil
}
