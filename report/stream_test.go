// Tests of the streamed output files (stream.go): what pipeWriter hands to
// its file, its checksum and count, and its write errors.

package report

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"
)

func TestStoreStream(t *testing.T) {
	// Writes of every size, some larger than a chunk, end up in order.
	var want bytes.Buffer
	for i := range 3000 {
		want.Write(bytes.Repeat([]byte{byte(i)}, (i*7919)%5000))
	}
	want.Write(bytes.Repeat([]byte("x"), 3*streamChunk+17))
	path := filepath.Join(t.TempDir(), "f")
	n, sum, err := storeStream(path, func(w io.Writer) error {
		b := want.Bytes()
		for len(b) > 0 {
			k := min(len(b), 1+len(b)%4099)
			if len(b) > 3*streamChunk {
				k = len(b) // one write of several chunks
			}
			if _, err := w.Write(b[:k]); err != nil {
				return err
			}
			b = b[k:]
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	h := sha256.Sum256(want.Bytes())
	if !bytes.Equal(got, want.Bytes()) || n != int64(want.Len()) || sum != hex.EncodeToString(h[:]) {
		t.Errorf("file of %d bytes (want %d), count %d, checksum %s (want %x)", len(got), want.Len(), n, sum, h)
	}
	if _, _, err := storeStream(path, func(io.Writer) error { return nil }); err == nil {
		t.Error("storeStream overwrote an existing file")
	}
}

func TestPipeWriterError(t *testing.T) {
	// A file that cannot be written: the error comes back from a later
	// Write or from close, never lost.
	f, err := os.Create(filepath.Join(t.TempDir(), "f"))
	if err != nil {
		t.Fatal(err)
	}
	f.Close()
	w := newPipeWriter(f)
	var werr error
	for range 4 {
		if _, werr = w.Write(make([]byte, streamChunk)); werr != nil {
			break
		}
	}
	cerr := w.close()
	if !errors.Is(cerr, os.ErrClosed) || (werr != nil && !errors.Is(werr, os.ErrClosed)) {
		t.Errorf("write error %v, close error %v; want %v", werr, cerr, os.ErrClosed)
	}
}
