// Input limits (issue 14): binary data, /dev/zero, oversized files and a
// header followed by garbage are refused at once, without reading the
// rest; ordinary files of every form still load.

package siteinput

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// refuseFast bounds the time a refusal may take (issue 14: "within a
// second or two").
const refuseFast = 2 * time.Second

func TestReadLimits(t *testing.T) {
	dir := t.TempDir()
	sparse := func(name, head string, size int64) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(head), 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.Truncate(p, size); err != nil { // a sparse tail of NUL bytes
			t.Fatal(err)
		}
		return p
	}
	// fifo returns a named pipe fed with head and then garbage without end
	// (until the reader closes it).
	fifo := func(name, head, garbage string) string {
		p := filepath.Join(dir, name)
		if err := syscall.Mkfifo(p, 0o644); err != nil {
			t.Skip("no named pipes here:", err)
		}
		go func() {
			w, err := os.OpenFile(p, os.O_WRONLY, 0)
			if err != nil {
				return
			}
			defer w.Close()
			if _, err := w.WriteString(head); err != nil {
				return
			}
			block := []byte(strings.Repeat(garbage, 1+(1<<16)/len(garbage)))
			for {
				if _, err := w.Write(block); err != nil {
					return // the reader is gone
				}
			}
		}()
		return p
	}
	cases := []struct {
		name, path string
		want       []string
	}{
		{"/dev/zero", "/dev/zero", []string{"/dev/zero: not GeoJSON or CSV (binary data): a NUL byte at offset 0"}},
		{"3 GiB of NUL bytes", sparse("zeros.csv", "", 3<<30), []string{"zeros.csv: not GeoJSON or CSV (binary data): a NUL byte at offset 0"}},
		{"header then NUL bytes", sparse("nuls.csv", "lat,lon\n52.5,13.4\n", 3<<30), []string{"nuls.csv: not GeoJSON or CSV (binary data): a NUL byte at offset 18"}},
		{"over the size limit", sparse("huge.geojson", "{", 5<<30), []string{"huge.geojson: 5 GiB, more than the 4 GiB an input may have"}},
		{"CSV header then text garbage, endless", fifo("garbage.csv", "lat,lon\n", "xq7%kW!zz\n"), []string{"garbage.csv line 2: no number in any coordinate column (\"lat\", \"lon\")"}},
		{"CSV header then one endless line", fifo("longline.csv", "lat,lon\n", "abcdefgh"), []string{"longline.csv line 2: longer than 64 KiB"}},
		{"GeoJSON then garbage, endless", fifo("garbage.geojson", `{"type":"FeatureCollection","features":[`+"\n", "@#garbage "), []string{"garbage.geojson line 2: not valid JSON"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t0 := time.Now()
			_, err := ReadFile(c.path, "--sites")
			if d := time.Since(t0); d > refuseFast {
				t.Errorf("took %v", d)
			}
			if err == nil {
				t.Fatal("accepted")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%q lacks %q", err, w)
				}
			}
		})
	}
	// Ordinary files, small and over 1 MiB, still read whole.
	var big strings.Builder
	big.WriteString("name;lat;lon\n")
	for big.Len() < 3<<20 {
		big.WriteString("Gebäude;52,5;13,4\n")
	}
	for _, c := range []struct{ name, data string }{
		{"big CSV", big.String()},
		{"UTF-16 CSV", utf16le("\ufefflat,lon\n1,2\n")},
		{"GeoJSON", `{"type":"Point","coordinates":[1,2]}`},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "_"))
			if err := os.WriteFile(p, []byte(c.data), 0o644); err != nil {
				t.Fatal(err)
			}
			s, err := ReadFile(p, "--sites")
			if err != nil || string(s.Data) != c.data {
				t.Errorf("read %d bytes of %d: %v", len(s.Data), len(c.data), err)
			}
		})
	}
}
