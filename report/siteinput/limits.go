// Input size and garbage limits (issue 14): an input is read in chunks,
// and its beginning is checked before the rest is read, so a file that is
// not GeoJSON or CSV text is refused in milliseconds whatever its size.
//
//   - maxInputBytes = 4 GiB per input. Ten million sites as CSV are about
//     0.5 GB, as GeoJSON about 1.2 GB; a larger file is refused before
//     reading (regular files) or when the limit is passed (pipes, devices).
//   - A NUL byte anywhere is binary data, never GeoJSON or CSV text
//     (unless the file starts with a UTF-16 byte order mark, whose text has
//     NUL bytes in every ASCII character); each chunk is searched as it
//     arrives, so /dev/zero and a file of NUL bytes stop at the first one.
//   - The first earlyCheckBytes = 1 MiB are parsed before the rest is read:
//     GeoJSON as a stream of JSON tokens (a syntax error stops it, naming
//     the line), CSV line by line: a header naming a coordinate column,
//     lines shorter than maxCSVLineBytes, valid quoting, and in each data line a
//     number (or a WKT point) in some coordinate column. The full loader
//     checks all of this again; this pass only refuses what it would
//     refuse, and early.

package siteinput

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
)

// maxInputBytes is the largest input file read (file comment).
const maxInputBytes = 4 << 30

// earlyCheckBytes is how much of an input is checked before the rest is
// read (file comment).
const earlyCheckBytes = 1 << 20

// maxCSVLineBytes bounds a CSV line in the early check: 64 KiB, a hundred
// times a site line with a long name and a WKT point.
const maxCSVLineBytes = 64 << 10

// readLimited reads f (about size bytes expected) in chunks, refusing NUL
// bytes and more than maxInputBytes, and checks the first earlyCheckBytes
// (earlyCheck) before reading on.
func readLimited(name string, f *os.File, size int64) ([]byte, error) {
	// The first chunk only, until it is checked: a huge file of garbage
	// must not cost a huge allocation.
	buf := make([]byte, 0, min(max(size, 512), earlyCheckBytes)+1)
	utf16 := false
	checked := false
	for {
		if len(buf) == cap(buf) {
			buf = append(buf, 0)[:len(buf)] // grow
		}
		chunk := buf[len(buf):min(cap(buf), len(buf)+earlyCheckBytes)]
		n, err := f.Read(chunk)
		start := len(buf)
		buf = buf[:start+n]
		if start == 0 && n >= 2 && (bytes.HasPrefix(buf, []byte{0xff, 0xfe}) || bytes.HasPrefix(buf, []byte{0xfe, 0xff})) {
			utf16 = true
		}
		if !utf16 {
			if i := bytes.IndexByte(buf[start:], 0); i >= 0 {
				return nil, errorf("%s: not GeoJSON or CSV (binary data): a NUL byte at offset %d", name, start+i)
			}
		}
		if len(buf) > maxInputBytes {
			return nil, errorf("%s: more than the %s an input may have: split it", name, byteSize(maxInputBytes))
		}
		eof := errors.Is(err, io.EOF)
		if err != nil && !eof {
			return nil, errorf("%s: cannot read: %v", name, unwrapPathErr(err))
		}
		if !checked && !utf16 && (len(buf) >= earlyCheckBytes || eof) {
			checked = true
			if err := earlyCheck(Source{Name: name, Data: buf}, eof); err != nil {
				return nil, err
			}
			if want := min(size, maxInputBytes) + 1; int64(cap(buf)) < want {
				buf = append(make([]byte, 0, want), buf...)
			}
		}
		if eof {
			return buf, nil
		}
	}
}

// earlyCheck refuses the beginning of an input that cannot start GeoJSON
// or CSV (file comment); complete is true when src holds the whole file.
func earlyCheck(src Source, complete bool) error {
	src.Data = bytes.TrimPrefix(src.Data, []byte("\xef\xbb\xbf"))
	if len(bytes.TrimSpace(src.Data)) == 0 {
		return nil // empty: ReadFile says so
	}
	f, err := detectFormat(src)
	if err != nil {
		return err
	}
	if f == formatGeoJSON {
		dec := json.NewDecoder(bytes.NewReader(src.Data))
		for {
			_, err := dec.Token()
			if err == nil {
				continue
			}
			var se *json.SyntaxError
			if errors.As(err, &se) {
				return errorf("%s line %d: not valid JSON: %v", src.Name, lineAt(src.Data, dec.InputOffset()), se)
			}
			return nil // the end of the prefix (or of the file)
		}
	}
	data := src.Data
	line, start := 1, 0
	for i, c := range data {
		if c == '\n' {
			line, start = line+1, i+1
		} else if i-start >= maxCSVLineBytes {
			return errorf("%s line %d: longer than %s: not CSV site data", src.Name, line, byteSize(maxCSVLineBytes))
		}
	}
	if !complete {
		data = data[:start] // complete lines only
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil
	}
	return csvPrefixCheck(Source{Name: src.Name, Data: data}, complete)
}

// csvPrefixCheck checks complete CSV lines: a coordinate column in the
// header, valid quoting, and a coordinate in each data line. In a prefix
// (complete false) a quoting error may be a quoted field that goes on past
// the prefix, so it ends the check instead of refusing.
func csvPrefixCheck(src Source, complete bool) error {
	r := csv.NewReader(bytes.NewReader(src.Data))
	r.Comma = csvDelimiter(src.Data)
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	header, err := r.Read()
	if err != nil {
		return csvError(src, err)
	}
	var cols []int
	for i, h := range header {
		switch csvColumns[strings.ToLower(strings.TrimSpace(h))] {
		case "lat", "lon", "x", "y", "wkt":
			cols = append(cols, i)
		}
	}
	if len(cols) == 0 {
		// The loader names what is missing (or that there is no header).
		_, err := csvHeader(src, header, false, false)
		return err
	}
	decimalComma := r.Comma != ','
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			if !complete {
				return nil
			}
			return csvError(src, err)
		}
		line, _ := r.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		ok := false
		for _, c := range cols {
			if c >= len(rec) {
				continue
			}
			if _, err := csvNumber(rec[c], "", decimalComma); err == nil {
				ok = true
			} else if _, _, err := wktPoint(rec[c]); err == nil {
				ok = true
			}
		}
		if !ok {
			return errorf("%s line %d: no number in any coordinate column (%s): not CSV site data", src.Name, line, quoteList(pick(header, cols)))
		}
	}
}

// pick returns the fields of xs at the indices idx.
func pick(xs []string, idx []int) []string {
	out := make([]string, len(idx))
	for i, k := range idx {
		out[i] = xs[k]
	}
	return out
}

// byteSize formats a size in bytes.
func byteSize(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.3g GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.3g MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.3g KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}
