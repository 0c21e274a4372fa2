// End-to-end test of the review page in headless Chromium, driven with
// chromedp: load the demo campus, move the range slider, drag a device,
// add one and remove one, and after each step check that the figures the
// page shows equal those coverage.Analyze computes for the same plan.
//
// Chromium is looked up as chromium, chromium-browser or google-chrome on
// PATH (Debian: apt-get install chromium). Without it the test is skipped,
// unless SITECOVER_LIVE=1, when a missing browser is a failure (CI).
// Screenshots at 1600×1000 and 1024×768 go to the test's temporary folder;
// with SITECOVER_README_IMAGES=1 they are written to docs/images/review.png
// and docs/images/review-1024.png for the README.

package review

import (
	"context"
	"fmt"
	"math"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
	"time"

	"github.com/chromedp/cdproto/input"
	"github.com/chromedp/chromedp"
	"github.com/sitecover/sitecover/coverage"
)

// browserTimeout bounds the whole browser test.
const browserTimeout = 60 * time.Second

// findChromium returns the path of a Chromium binary, or "".
func findChromium() string {
	for _, name := range []string{"chromium", "chromium-browser", "google-chrome", "/usr/bin/chromium"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	return ""
}

// pageFigures are the figures as the page shows them.
type pageFigures struct {
	Covered, Uncovered, Gaps, FullCover, Devices, Range string
}

// readFigures reads the figures shown on the page.
const readFigures = `(() => { const t = (id) => document.getElementById(id).textContent;
  return {Covered: t("fig-covered"), Uncovered: t("fig-uncovered"), Gaps: t("fig-gaps"),
          FullCover: t("fig-fullcover"), Devices: t("fig-devices"), Range: t("range-out")}; })()`

// expectFigures formats coverage.Analyze's figures for the session's
// current plan as the page does.
func expectFigures(t *testing.T, sv *Server) pageFigures {
	t.Helper()
	sv.mu.Lock()
	pts, _ := sv.s.activeSites()
	total, r := len(sv.s.devs), sv.s.r
	sv.mu.Unlock()
	a, err := coverage.Analyze(pts, sv.cfg.Region, r, coverage.Options{})
	if err != nil {
		t.Fatal(err)
	}
	gaps := fmt.Sprint(len(a.Gaps))
	if len(a.Gaps) > 0 {
		enclosed := 0
		for _, g := range a.Gaps {
			if !g.TouchesBoundary {
				enclosed++
			}
		}
		gaps = fmt.Sprintf("%d (%d enclosed)", len(a.Gaps), enclosed)
	}
	return pageFigures{
		Covered:   fmt.Sprintf("%.2f %%", 100*a.CoveredFraction),
		Uncovered: fmt.Sprintf("%.1f m²", a.UncoveredArea),
		Gaps:      gaps,
		FullCover: fmt.Sprintf("%.2f m", a.FullCover.Range),
		Devices:   fmt.Sprintf("%d of %d", len(pts), total),
		Range:     fmt.Sprintf("%.2f m", r),
	}
}

// waitIdle waits until the page has no edit in flight and has drawn the
// server's latest state.
func waitIdle(ctx context.Context, sv *Server) error {
	for {
		sv.mu.Lock()
		v := sv.s.version
		sv.mu.Unlock()
		idle, err := chromedp.Run(ctx, chromedp.Evaluate[bool](fmt.Sprintf(`!window.review.pending && !!window.review.state && window.review.state.version === %d`, v)))
		if err != nil || idle {
			return err
		}
		select {
		case <-ctx.Done():
			return ctx.Err()
		case <-time.After(20 * time.Millisecond):
		}
	}
}

// leftDrag is a mouse option: the left button held.
func leftDrag(p *input.DispatchMouseEventParams) {
	p.Button, p.Buttons, p.ClickCount = input.MouseButtonLeft, 1, 1
}

// js runs a script for its effects.
func js(script string) chromedp.Action[chromedp.Void] {
	return chromedp.Func(func(ctx context.Context, t *chromedp.Target) error {
		_, err := chromedp.Evaluate[bool]("(() => {"+script+"; return true; })()")(ctx, t)
		return err
	})
}

// chromiumOrSkip returns Chromium's path; without it the test is skipped,
// or fails with SITECOVER_LIVE=1.
func chromiumOrSkip(t *testing.T) string {
	path := findChromium()
	if path == "" {
		if os.Getenv("SITECOVER_LIVE") == "1" {
			t.Fatal("SITECOVER_LIVE=1 but no Chromium found (install the Debian package chromium)")
		}
		t.Skip("no Chromium found (install the Debian package chromium); SITECOVER_LIVE=1 makes this a failure")
	}
	return path
}

func TestBrowserReviewLive(t *testing.T) {
	path := chromiumOrSkip(t)
	cfg := demoConfig(t)
	cfg.OutDir = filepath.Join(t.TempDir(), "report")
	sv, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	ts := httptest.NewServer(sv.Handler())
	defer ts.Close()

	ctx := startBrowser(t, path)
	check := func(step string) {
		t.Helper()
		if err := waitIdle(ctx, sv); err != nil {
			t.Fatalf("%s: %v", step, err)
		}
		got, err := chromedp.Run(ctx, chromedp.Evaluate[pageFigures](readFigures))
		if err != nil {
			t.Fatalf("%s: %v", step, err)
		}
		if want := expectFigures(t, sv); got != want {
			t.Errorf("%s: the page shows %+v; coverage.Analyze gives %+v", step, got, want)
		}
	}
	screen := func(expr string) (x, y float64) {
		t.Helper()
		p, err := chromedp.Run(ctx, chromedp.Evaluate[[2]float64](expr))
		if err != nil {
			t.Fatal(err)
		}
		return p[0], p[1]
	}

	if err := chromedp.Do(ctx, chromedp.Navigate(ts.URL), chromedp.WaitVisible(chromedp.CSS(`body[data-ready="1"]`))); err != nil {
		t.Fatal(err)
	}
	check("loaded")

	t.Run("slider", func(t *testing.T) {
		err := chromedp.Do(ctx, js(`const r = document.getElementById("range");
			for (const v of [110, 104, 100]) { r.value = v; r.dispatchEvent(new Event("input")); }
			r.dispatchEvent(new Event("change"))`))
		if err != nil {
			t.Fatal(err)
		}
		check("slider at 100 m")
	})

	t.Run("drag", func(t *testing.T) {
		const dev = 12
		sv.mu.Lock()
		before := sv.s.devs[dev]
		sv.mu.Unlock()
		x, y := screen(fmt.Sprintf("window.review.screenOf(%d)", dev))
		acts := []chromedp.Action[chromedp.Void]{chromedp.MouseEvent(input.DispatchMouseEventTypeMousePressed, x, y, leftDrag)}
		for k := 1; k <= 10; k++ {
			acts = append(acts, chromedp.MouseEvent(input.DispatchMouseEventTypeMouseMoved, x+float64(6*k), y+float64(3*k), leftDrag))
		}
		acts = append(acts, chromedp.MouseEvent(input.DispatchMouseEventTypeMouseReleased, x+60, y+30, leftDrag))
		if err := chromedp.Do(ctx, acts...); err != nil {
			t.Fatal(err)
		}
		check("after the drag")
		sv.mu.Lock()
		after := sv.s.devs[dev]
		sv.mu.Unlock()
		if after.X <= before.X || after.Y >= before.Y {
			t.Errorf("device %d moved from (%.1f, %.1f) to (%.1f, %.1f); want right and down the screen", dev, before.X, before.Y, after.X, after.Y)
		}
	})

	t.Run("add", func(t *testing.T) {
		sv.mu.Lock()
		n := len(sv.s.devs)
		deep := sv.s.at.gaps[0].Deepest
		sv.mu.Unlock()
		x, y := screen(fmt.Sprintf("window.review.screenOfPoint(%v, %v)", deep[0], deep[1]))
		if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`#tools [data-tool="add"]`)), chromedp.MouseClickXY(x, y)); err != nil {
			t.Fatal(err)
		}
		check("after adding a device")
		sv.mu.Lock()
		added := len(sv.s.devs) - n
		last := sv.s.devs[len(sv.s.devs)-1]
		sv.mu.Unlock()
		if added != 1 || math.Hypot(last.X-deep[0], last.Y-deep[1]) > 2 {
			t.Errorf("%d devices added, the last at (%.1f, %.1f); want one at the deepest point (%.1f, %.1f)", added, last.X, last.Y, deep[0], deep[1])
		}
	})

	t.Run("remove", func(t *testing.T) {
		sv.mu.Lock()
		n := len(sv.s.devs)
		sv.mu.Unlock()
		x, y := screen("window.review.screenOf(0)")
		if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`#tools [data-tool="remove"]`)), chromedp.MouseClickXY(x, y)); err != nil {
			t.Fatal(err)
		}
		check("after removing device 0")
		sv.mu.Lock()
		removed := n - len(sv.s.devs)
		sv.mu.Unlock()
		if removed != 1 {
			t.Errorf("%d devices removed", removed)
		}
	})

	t.Run("screenshots", func(t *testing.T) { screenshots(t, ctx) })
}

// startBrowser starts headless Chromium at 1600×1000; the browser ends
// with the test.
func startBrowser(t *testing.T, path string) context.Context {
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(path), chromedp.WindowSize(1600, 1000), chromedp.NoSandbox, chromedp.DisableGPU)
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	t.Cleanup(cancelA)
	ctx, cancelB := chromedp.NewContext(actx)
	t.Cleanup(cancelB)
	ctx, cancel := context.WithTimeout(ctx, browserTimeout)
	t.Cleanup(cancel)
	return ctx
}

// screenshots selects the deepest gap, turns the labels on and saves the
// page at 1600×1000 and 1024×768 (see the file comment for where).
func screenshots(t *testing.T, ctx context.Context) {
	shots := t.TempDir()
	if os.Getenv("SITECOVER_README_IMAGES") == "1" {
		shots = filepath.Join("..", "..", "docs", "images")
	}
	err := chromedp.Do(ctx,
		chromedp.Click(chromedp.CSS(`#tools [data-tool="drag"]`)),
		js(`document.getElementById("show-labels").click()`),
		// Select the deepest gap so the detail panel shows its figures.
		js(`document.querySelector("#gaps tbody tr").click()`))
	if err != nil {
		t.Fatal(err)
	}
	status, err := chromedp.Run(ctx, chromedp.Text(chromedp.CSS(`#status`)))
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("page status after the edits: %s", status)
	for _, s := range []struct {
		name string
		w, h int64
	}{{"review.png", 1600, 1000}, {"review-1024.png", 1024, 768}} {
		// The small screenshot shows the service areas instead of the labels.
		toggle := js(`if (innerWidth < 1200) { document.getElementById("show-labels").click(); document.getElementById("show-cells").click(); }`)
		err := chromedp.Do(ctx, chromedp.EmulateViewport(s.w, s.h), chromedp.Sleep(100*time.Millisecond),
			toggle, js(`document.getElementById("fit").click()`), chromedp.Sleep(300*time.Millisecond))
		if err != nil {
			t.Fatal(err)
		}
		png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
		if err != nil {
			t.Fatal(err)
		}
		if len(png) < 10000 {
			t.Fatalf("%s: screenshot of %d bytes", s.name, len(png))
		}
		if err := os.WriteFile(filepath.Join(shots, s.name), png, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// measureEdit is a script that sends one edit from the page and resolves
// to the milliseconds until the page has drawn the answer.
const measureEdit = `new Promise((resolve) => {
  const t0 = performance.now();
  window.review.edit(%s);
  const wait = () => window.review.pending ? setTimeout(wait, 2) :
    requestAnimationFrame(() => resolve(performance.now() - t0));
  wait(); })`

// browserUpdateLimit is a generous bound on one update seen in the
// browser for 10 000 devices: it catches a regression (a quadratic draw)
// without failing on a loaded machine; the times are logged. Headless
// Chromium paints in software: most of an update's time is the paint.
const browserUpdateLimit = 5 * time.Second

// TestBrowserUpdate10kLive times edits in the browser on 10 000 devices: from
// sending the edit to the page having drawn the new plan and figures.
func TestBrowserUpdate10kLive(t *testing.T) {
	path := chromiumOrSkip(t)
	sv := newBenchServer(t, benchDevices)
	ts := httptest.NewServer(sv.Handler())
	defer ts.Close()
	ctx := startBrowser(t, path)
	if err := chromedp.Do(ctx, chromedp.Navigate(ts.URL), chromedp.WaitVisible(chromedp.CSS(`body[data-ready="1"]`))); err != nil {
		t.Fatal(err)
	}
	edits := []struct{ name, edit string }{
		{"range", `{op: "range", range: 60}`},
		{"range back", `{op: "range", range: 55}`},
		{"move", `{op: "move", device: 17, x: 2500, y: 2500}`},
		{"switch off", `{op: "off", device: 99}`},
		{"undo", `{op: "undo"}`},
	}
	for _, e := range edits {
		ms, err := chromedp.Run(ctx, chromedp.Evaluate[float64](fmt.Sprintf(measureEdit, e.edit), chromedp.EvalAwaitPromise))
		if err != nil {
			t.Fatal(err)
		}
		parts, _ := chromedp.Run(ctx, chromedp.Evaluate[[3]float64](`[window.review.fetchMs, window.review.setStateMs, window.review.drawMs]`))
		t.Logf("%-10s %6.0f ms from the edit to the page drawn (request %.0f ms, setState %.0f ms, draw %.0f ms)", e.name, ms, parts[0], parts[1], parts[2])
		if time.Duration(ms*float64(time.Millisecond)) > browserUpdateLimit {
			t.Errorf("%s: %.0f ms, over %v", e.name, ms, browserUpdateLimit)
		}
	}
}
