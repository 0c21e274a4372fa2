// The review command: it refuses a non-loopback --listen without
// --allow-remote, serves the page on a free loopback port, and stops
// cleanly when the interrupt hook (Ctrl-C) runs.

package main

import (
	"bytes"
	"io"
	"net/http"
	"regexp"
	"strings"
	"testing"
	"time"
)

func TestReviewUsage(t *testing.T) {
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"remote without consent", []string{"review", "--demo", "--listen", "0.0.0.0:0"}, exitUsage, "--allow-remote"},
		{"bad listen address", []string{"review", "--demo", "--listen", "nonsense"}, exitUsage, "--listen"},
		{"demo with sites", []string{"review", "--demo", "--sites", "x.csv"}, exitUsage, "--demo"},
		{"no range", []string{"review", "--sites", "x.csv"}, exitUsage, "--range"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var out, errb bytes.Buffer
			if code := run(c.args, &out, &errb); code != c.code || !strings.Contains(errb.String(), c.want) {
				t.Errorf("exit %d, stderr %q; want exit %d mentioning %s", code, errb.String(), c.code, c.want)
			}
		})
	}
}

func TestReviewServesAndStops(t *testing.T) {
	b := serveReview(t, "review", "--demo", "--out", t.TempDir())
	if !bytes.Contains(b, []byte(`"coveredFraction"`)) {
		t.Errorf("GET /api/state: %.100s", b)
	}
}

// TestReviewOwnRanges: sites with a range column, or a type column with
// --type-range, are reviewed with their own ranges (no --range needed).
func TestReviewOwnRanges(t *testing.T) {
	dir := t.TempDir()
	area := writeFile(t, dir, "a.geojson", `{"type":"Polygon","coordinates":[[[-50,-50],[260,-50],[260,180],[-50,180],[-50,-50]]]}`)
	mixed := writeFile(t, dir, "mixed.csv", mixedCSV)
	typed := writeFile(t, dir, "typed.csv", "name,x,y,type\ng1,0,0,gateway\ns1,200,0,sensor\ns2,100,120,sensor\ns3,20,10,sensor\n")
	for _, c := range []struct {
		name string
		args []string
	}{
		{"range column", []string{"--sites", mixed}},
		{"type column with --type-range", []string{"--sites", typed, "--type-range", "gateway=150m", "--type-range", "sensor=40m"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			b := serveReview(t, append([]string{"review", "--planar", "--area", area}, c.args...)...)
			// the hidden device s3 (its disk inside g1's) is listed by index
			for _, w := range []string{`"growthM2":0`, `"hidden":[3]`, `"types":["gateway","sensor"]`, `"range":150`} {
				if !bytes.Contains(b, []byte(w)) {
					t.Errorf("state lacks %s: %.300s", w, b)
				}
			}
		})
	}
}

// serveReview runs the review command with args, reads /api/state once the
// URL is printed, stops the server (as Ctrl-C does) and checks that it
// stopped with exit 0; it returns the state.
func serveReview(t *testing.T, args ...string) []byte {
	t.Helper()
	var out, errb syncBuffer
	done := make(chan int, 1)
	go func() {
		done <- run(args, &out, &errb)
	}()
	url := regexp.MustCompile(`http://127\.0\.0\.1:\d+/`)
	var u string
	for deadline := time.Now().Add(20 * time.Second); u == "" && time.Now().Before(deadline); time.Sleep(20 * time.Millisecond) {
		u = url.FindString(out.String())
	}
	if u == "" {
		t.Fatalf("no URL printed: stdout %q, stderr %q", out.String(), errb.String())
	}
	resp, err := http.Get(u + "api/state")
	if err != nil {
		t.Fatal(err)
	}
	b, _ := io.ReadAll(resp.Body)
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Errorf("GET /api/state: %d %.100s", resp.StatusCode, b)
	}
	runInterruptHook()
	select {
	case code := <-done:
		if code != 0 {
			t.Errorf("exit %d after stopping, stderr %q", code, errb.String())
		}
	case <-time.After(10 * time.Second):
		t.Fatal("the review server did not stop")
	}
	if _, err := http.Get(u + "api/state"); err == nil {
		t.Error("the server still answers after stopping")
	}
	return b
}
