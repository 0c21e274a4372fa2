// Text encoding of the input files.
//
// GeoJSON (RFC 8259 §8.1) and the CSV this package reads are UTF-8. What
// arrives is not always: a spreadsheet on a European Windows machine saves
// "CSV" in Windows-1252, and "Unicode text" exports are UTF-16 with a byte
// order mark. decodeText turns every input into valid UTF-8 before it is
// parsed, so no invalid UTF-8 can reach a name in an output:
//
//   - a UTF-8 byte order mark is dropped;
//   - a UTF-16 byte order mark (FF FE or FE FF) selects UTF-16 LE/BE,
//     decoded with a warning;
//   - valid UTF-8 is kept as it is;
//   - UTF-8 with some invalid bytes (it has valid multi-byte sequences as
//     well) keeps its UTF-8 and has the invalid bytes replaced by U+FFFD,
//     with a warning;
//   - anything else is decoded as Windows-1252 (a superset of ISO 8859-1
//     in the printable range) with a warning naming the first line that is
//     not UTF-8. Windows-1252 leaves five byte values undefined (81, 8D,
//     8F, 90, 9D hex); the decoder replaces them by U+FFFD, which the
//     warning says. Every other byte has a character, so the structure of
//     the file (ASCII delimiters, quotes, digits) is unchanged.

package siteinput

import (
	"bytes"
	"strconv"
	"unicode/utf8"

	"golang.org/x/text/encoding"
	"golang.org/x/text/encoding/charmap"
	"golang.org/x/text/encoding/unicode"
)

// decodeText returns src with its data as valid UTF-8, and a warning when
// the data had to be decoded ("" when it was UTF-8 already).
func decodeText(src Source) (Source, string, error) {
	b := bytes.TrimPrefix(src.Data, []byte("\xef\xbb\xbf"))
	var dec *encoding.Decoder
	what := ""
	switch {
	case bytes.HasPrefix(b, []byte{0xff, 0xfe}):
		dec, what = unicode.UTF16(unicode.LittleEndian, unicode.ExpectBOM).NewDecoder(), "UTF-16 (little-endian, byte order mark)"
	case bytes.HasPrefix(b, []byte{0xfe, 0xff}):
		dec, what = unicode.UTF16(unicode.BigEndian, unicode.ExpectBOM).NewDecoder(), "UTF-16 (big-endian, byte order mark)"
	case utf8.Valid(b):
		src.Data = b
		return src, "", nil
	case hasUTF8Sequence(b):
		// UTF-8 with a few bad bytes: decoding it all as Windows-1252
		// would garble every correct accented letter.
		src.Data = bytes.ToValidUTF8(b, []byte("\uFFFD"))
		return src, src.Name + ": not valid UTF-8 at line " + strconv.Itoa(firstInvalidLine(b)) +
			"; the invalid bytes are replaced by U+FFFD (the rest is UTF-8); check the names in the outputs", nil
	default:
		dec = charmap.Windows1252.NewDecoder()
		what = "Windows-1252, the usual European spreadsheet export (line " + strconv.Itoa(firstInvalidLine(b)) + " is not UTF-8)"
		if bytes.ContainsAny(b, "\x81\x8d\x8f\x90\x9d") {
			what += "; bytes undefined in Windows-1252 are replaced by U+FFFD"
		}
	}
	out, err := dec.Bytes(b)
	if err != nil {
		return src, "", errorf("%s: cannot decode as %s: %v", src.Name, what, err)
	}
	out = bytes.ToValidUTF8(out, []byte("\uFFFD"))
	src.Data = bytes.TrimPrefix(out, []byte("\xef\xbb\xbf"))
	return src, src.Name + ": read as " + what + "; check the names in the outputs (save as UTF-8 to silence this)", nil
}

// firstInvalidLine returns the 1-based line of the first byte of b that is
// not part of valid UTF-8.
func firstInvalidLine(b []byte) int {
	line := 1
	for i := 0; i < len(b); {
		r, n := utf8.DecodeRune(b[i:])
		if r == utf8.RuneError && n <= 1 {
			return line
		}
		if b[i] == '\n' {
			line++
		}
		i += n
	}
	return line
}

// hasUTF8Sequence reports whether b holds a valid multi-byte UTF-8
// sequence: text with one is UTF-8 (Windows-1252 text almost never forms
// one: it would need a lead byte such as Ã followed by a symbol from
// 80–BF hex).
func hasUTF8Sequence(b []byte) bool {
	for i := 0; i < len(b); {
		if b[i] < utf8.RuneSelf {
			i++
			continue
		}
		r, n := utf8.DecodeRune(b[i:])
		if r != utf8.RuneError || n > 1 {
			return true
		}
		i++
	}
	return false
}
