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
	var out, errb syncBuffer
	done := make(chan int, 1)
	go func() {
		done <- run([]string{"review", "--demo", "--out", t.TempDir()}, &out, &errb)
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
	if resp.StatusCode != http.StatusOK || !bytes.Contains(b, []byte(`"coveredFraction"`)) {
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
}
