// Tests of the streamed output files (stream.go): what pipeWriter hands to
// its file, its checksum and count, and its write errors.

package report

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/sitecover/sitecover/report/gpkg"
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
	w := newPipeWriter(f, false)
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

// TestStoreStreamSizes writes files of sizes around the direct-write
// alignment and chunk size (stream_direct_linux.go: whole chunks go
// directly, the last chunk's aligned part too, its rest after O_DIRECT is
// cleared) and checks content, count and checksum; also through a
// pipeWriter told to write directly to a file opened either way.
func TestStoreStreamSizes(t *testing.T) {
	dir := t.TempDir()
	if f, direct, err := createDirect(filepath.Join(dir, "probe")); err == nil {
		t.Logf("O_DIRECT taken by the file system of %s: %v", dir, direct)
		f.Close()
	}
	for _, size := range []int{0, 1, directAlign - 1, directAlign, directAlign + 1, streamChunk - 1, streamChunk,
		streamChunk + 1, streamChunk + directAlign, 3*streamChunk + 12345} {
		want := make([]byte, size)
		for i := range want {
			want[i] = byte(i*31 + i>>11)
		}
		wantSum := sha256.Sum256(want)
		t.Run(fmt.Sprintf("store-%d", size), func(t *testing.T) {
			path := filepath.Join(dir, fmt.Sprintf("s%d", size))
			n, sum, err := storeStream(path, func(w io.Writer) error {
				_, err := w.Write(want)
				return err
			})
			got, rerr := os.ReadFile(path)
			if err != nil || rerr != nil || !bytes.Equal(got, want) || n != int64(size) || sum != hex.EncodeToString(wantSum[:]) {
				t.Errorf("err %v/%v, %d bytes back, count %d, checksum %s", err, rerr, len(got), n, sum)
			}
		})
		t.Run(fmt.Sprintf("direct-pipe-%d", size), func(t *testing.T) {
			path := filepath.Join(dir, fmt.Sprintf("p%d", size))
			f, _, err := createDirect(path)
			if err != nil {
				t.Fatal(err)
			}
			w := newPipeWriter(f, true)
			for b := want; len(b) > 0; {
				k := min(len(b), 100000)
				w.Write(b[:k])
				b = b[k:]
			}
			if err := w.close(); err != nil {
				t.Fatal(err)
			}
			f.Close()
			if got, err := os.ReadFile(path); err != nil || !bytes.Equal(got, want) || w.n != int64(size) {
				t.Errorf("err %v, %d bytes back of %d, count %d", err, len(got), size, w.n)
			}
		})
	}
}

// TestMetricRounding checks which layer fields are lengths or areas and
// their rounding to metricDecimals decimals by round (half away from
// zero, no negative zero, large values kept).
func TestMetricRounding(t *testing.T) {
	fields := fieldList("site", gpkg.Integer, "birth_m", gpkg.Real, "area_m2", gpkg.Real, "share", gpkg.Real,
		"name_m", gpkg.Text, "farthest_x", gpkg.Real)
	if got := metricFields(fields); !slices.Equal(got, []int{1, 2}) {
		t.Errorf("metricFields = %v, want [1 2] (birth_m, area_m2)", got)
	}
	for _, tc := range []struct {
		name    string
		in, out float64
	}{
		{"many decimals", 59.9553401395585, 59.95534},
		{"half up", 0.0000025, 0.000003},
		{"half away from zero", -0.0000025, -0.000003},
		{"tiny negative", -1e-9, 0},
		{"whole", 98, 98},
		{"large area", 9999708385.812345, 9999708385.812345},
		{"huge", 3e15 + 0.5, 3e15 + 0.5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := round(tc.in, metricDecimals)
			if got != tc.out || math.Signbit(got) != math.Signbit(tc.out) {
				t.Errorf("round(%v, metricDecimals) = %v, want %v", tc.in, got, tc.out)
			}
		})
	}
}
