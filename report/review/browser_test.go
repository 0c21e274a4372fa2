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
	"reflect"
	"slices"
	"strconv"
	"strings"
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

// figureCheck returns a check of one step: once the page is idle, the
// figures it shows must equal expect's (made by the function named by
// source).
func figureCheck(t *testing.T, ctx context.Context, sv *Server, expect func(*testing.T, *Server) pageFigures, source string) func(step string) {
	return func(step string) {
		t.Helper()
		if err := waitIdle(ctx, sv); err != nil {
			t.Fatalf("%s: %v", step, err)
		}
		got, err := chromedp.Run(ctx, chromedp.Evaluate[pageFigures](readFigures))
		if err != nil {
			t.Fatalf("%s: %v", step, err)
		}
		if want := expect(t, sv); got != want {
			t.Errorf("%s: the page shows %+v; %s gives %+v", step, got, source, want)
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
func chromiumOrSkip(t testing.TB) string {
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
	sv := newWithOut(t, demoConfig(t))
	ts := httptest.NewServer(sv.Handler())
	defer ts.Close()

	ctx := startBrowser(t, path)
	check := figureCheck(t, ctx, sv, expectFigures, "coverage.Analyze")
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

	t.Run("click a gap", func(t *testing.T) {
		// the deepest point of an enclosed gap lies inside it (farther than
		// the range from every device); the gaps are on a canvas, found by
		// the page's hit test
		sv.mu.Lock()
		id, deep := -1, [2]float64{}
		for _, g := range sv.s.at.gaps {
			if !g.TouchesBoundary {
				id, deep = g.ID, g.Deepest
				break
			}
		}
		sv.mu.Unlock()
		if id < 0 {
			t.Skip("no enclosed gap")
		}
		x, y := screen(fmt.Sprintf("window.review.screenOfPoint(%v, %v)", deep[0], deep[1]))
		if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`#tools [data-tool="drag"]`)), chromedp.MouseClickXY(x, y)); err != nil {
			t.Fatal(err)
		}
		h, err := chromedp.Run(ctx, chromedp.Text(chromedp.CSS(`#detail h3`)))
		if want := fmt.Sprintf("Gap %d ", id); err != nil || !strings.HasPrefix(h, want) {
			t.Errorf("detail after clicking gap %d: %q, %v", id, h, err)
		}
	})

	t.Run("screenshots", func(t *testing.T) { screenshots(t, ctx) })
}

// expectRangedFigures formats coverage.AnalyzeRanges's figures for the
// session's current plan with own ranges as the page does.
func expectRangedFigures(t *testing.T, sv *Server) pageFigures {
	t.Helper()
	sv.mu.Lock()
	p := sv.s.plan()
	total := len(sv.s.devs)
	sv.mu.Unlock()
	a, err := coverage.AnalyzeRanges(p.pts, p.ranges, sv.cfg.Region, coverage.Options{})
	if err != nil {
		t.Fatal(err)
	}
	w2max := 0.0
	for _, r := range p.ranges {
		w2max = max(w2max, r*r)
	}
	enclosed := 0
	for _, g := range a.Gaps {
		if !g.TouchesBoundary {
			enclosed++
		}
	}
	gaps := fmt.Sprint(len(a.Gaps))
	if len(a.Gaps) > 0 {
		gaps = fmt.Sprintf("%d (%d enclosed)", len(a.Gaps), enclosed)
	}
	return pageFigures{
		Covered:   fmt.Sprintf("%.2f %%", 100*a.CoveredFraction),
		Uncovered: fmt.Sprintf("%.1f m²", a.UncoveredArea),
		Gaps:      gaps,
		FullCover: fmt.Sprintf("%.2f m", math.Sqrt(max(0, w2max+a.FullCover.Power))),
		Devices:   fmt.Sprintf("%d of %d", len(p.pts), total),
		Range:     fmt.Sprintf("%.2f m", math.Sqrt(w2max)),
	}
}

// TestBrowserRangesLive reviews the demo with devices of their own ranges
// and types: the figures shown equal AnalyzeRanges's after the slider (all
// ranges grown together), the selected device's range control and a
// type's range control.
func TestBrowserRangesLive(t *testing.T) {
	sv, ctx := openPage(t, rangedConfig(t))
	check := figureCheck(t, ctx, sv, expectRangedFigures, "coverage.AnalyzeRanges")
	check("loaded")
	err := chromedp.Do(ctx, js(`const r = document.getElementById("range"); r.value = 165;
		r.dispatchEvent(new Event("input")); r.dispatchEvent(new Event("change"))`))
	if err != nil {
		t.Fatal(err)
	}
	check("slider at 165 m")
	// select device 4 (a click without a drag) and set its range
	p, err := chromedp.Run(ctx, chromedp.Evaluate[[2]float64](`window.review.screenOf(4)`))
	if err != nil {
		t.Fatal(err)
	}
	err = chromedp.Do(ctx, chromedp.MouseClickXY(p[0], p[1]), chromedp.WaitVisible(chromedp.CSS(`#dev-range-set`)))
	if err != nil {
		t.Fatal(err)
	}
	checkFailShown(t, ctx, 4)
	// hovering shows the loss too
	var tip string
	for try := 0; try < 50 && !strings.Contains(tip, "if it fails, uncovered +"); try++ {
		err = chromedp.Do(ctx, chromedp.MouseEvent(input.DispatchMouseEventTypeMouseMoved, p[0]+float64(try%2), p[1]), chromedp.Sleep(20*time.Millisecond))
		if err != nil {
			t.Fatal(err)
		}
		if tip, err = chromedp.Run(ctx, chromedp.Text(chromedp.CSS(`#tip`))); err != nil {
			t.Fatal(err)
		}
	}
	if !strings.Contains(tip, "Device #4") || !strings.Contains(tip, "if it fails, uncovered +") {
		t.Errorf("tooltip over device 4: %q", tip)
	}
	err = chromedp.Do(ctx, js(`document.getElementById("dev-range").value = "60"; document.getElementById("dev-range-set").click()`))
	if err != nil {
		t.Fatal(err)
	}
	check("device 4 at 60 m")
	checkCurveLoaded(t, ctx, sv)
	sv.mu.Lock()
	r4, t4 := sv.s.devs[4].R, sv.s.t
	sv.mu.Unlock()
	if r4 != 60 || t4 != 0 {
		t.Errorf("device 4 has range %v at growth %v; want 60 at 0", r4, t4)
	}
	err = chromedp.Do(ctx, js(`const f = document.querySelector("#type-ranges input"); f.value = "110";
		document.querySelector("#type-ranges button").click()`))
	if err != nil {
		t.Fatal(err)
	}
	check("every beacon at 110 m")
	sv.mu.Lock()
	defer sv.mu.Unlock()
	for i, d := range sv.s.devs {
		if d.Type == "beacon" && d.R != 110 {
			t.Errorf("beacon %d at %v m", i, d.R)
		}
	}
}

// checkCurveLoaded checks that the page fetched the coverage curve the
// answer of its last edit left out (Edit.Later) and drew it: once loaded,
// the page's curve equals the server's for the plan now.
func checkCurveLoaded(t *testing.T, ctx context.Context, sv *Server) {
	t.Helper()
	if err := waitIdle(ctx, sv); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(10 * time.Second)
	for {
		loaded, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`!window.review.state.figures.curvePending && !window.review.curveLoading`))
		if err != nil {
			t.Fatal(err)
		}
		if loaded {
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("the page did not load the deferred coverage curve")
		}
		time.Sleep(20 * time.Millisecond)
	}
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[][2]float64](`window.review.state.figures.curve`))
	if err != nil {
		t.Fatal(err)
	}
	path, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.querySelector("#curve .curve-line").getAttribute("d")`))
	if err != nil {
		t.Fatal(err)
	}
	sv.mu.Lock()
	want := sv.curveNow()
	sv.mu.Unlock()
	if !reflect.DeepEqual(got, want) {
		t.Errorf("page's curve %v; server's %v", got, want)
	}
	if strings.Count(path, "L") < len(want)-1 {
		t.Errorf("curve drawn as %q for %d points", path, len(want))
	}
}

// checkFailShown checks that the detail panel shows device i's loss if it
// fails with own ranges (the closing as a largest range), waiting up to
// a second for the panel's request.
func checkFailShown(t *testing.T, ctx context.Context, i int) {
	t.Helper()
	var text string
	for try := 0; try < 50; try++ {
		var err error
		if text, err = chromedp.Run(ctx, chromedp.Text(chromedp.CSS(`#detail`))); err != nil {
			t.Fatal(err)
		}
		if strings.Contains(text, "Device #"+strconv.Itoa(i)) && strings.Contains(text, "if it fails: uncovered +") &&
			strings.Contains(text, "largest range ") {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Errorf("detail panel of device %d: %q", i, text)
}

// TestBrowserSwitchToRangesLive: on the common-range demo, setting one
// device's range from its detail panel switches the plan to own ranges
// (figures as AnalyzeRanges's), and undo returns to the common range.
func TestBrowserSwitchToRangesLive(t *testing.T) {
	sv, ctx := openPage(t, demoConfig(t))
	p, err := chromedp.Run(ctx, chromedp.Evaluate[[2]float64](`window.review.screenOf(4)`))
	if err != nil {
		t.Fatal(err)
	}
	err = chromedp.Do(ctx, chromedp.MouseClickXY(p[0], p[1]), chromedp.WaitVisible(chromedp.CSS(`#dev-range-set`)),
		js(`document.getElementById("dev-range").value = "200"; document.getElementById("dev-range-set").click()`))
	if err != nil {
		t.Fatal(err)
	}
	figureCheck(t, ctx, sv, expectRangedFigures, "coverage.AnalyzeRanges")("device 4 at 200 m")
	checkFailShown(t, ctx, 4)
	checkSlider(t, ctx, "Largest range", "", "after the switch")
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`#undo`))); err != nil {
		t.Fatal(err)
	}
	figureCheck(t, ctx, sv, expectFigures, "coverage.Analyze")("undone")
	checkSlider(t, ctx, "Range", "0.5", "after the undo")
}

// checkSlider checks the range slider's label and, unless min is "", its
// least value.
func checkSlider(t *testing.T, ctx context.Context, label, min, step string) {
	t.Helper()
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[2]string](`[document.getElementById("range-label").textContent,
		document.getElementById("range").min]`))
	if err != nil {
		t.Fatal(err)
	}
	if got[0] != label || min != "" && got[1] != min {
		t.Errorf("%s: slider label %q, least value %q; want %q, %q", step, got[0], got[1], label, min)
	}
}

// openPage starts a server on cfg and the browser on its page, loaded;
// both end with the test.
func openPage(t *testing.T, cfg Config) (*Server, context.Context) {
	path := chromiumOrSkip(t)
	sv, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	ts := httptest.NewServer(sv.Handler())
	t.Cleanup(ts.Close)
	ctx := startBrowser(t, path)
	if err := chromedp.Do(ctx, chromedp.Navigate(ts.URL), chromedp.WaitVisible(chromedp.CSS(`body[data-ready="1"]`))); err != nil {
		t.Fatal(err)
	}
	return sv, ctx
}

// startBrowser starts headless Chromium at 1600×1000; the browser ends
// with the test.
func startBrowser(t testing.TB, path string) context.Context {
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
// to the page's timing record of it (app.js, window.review.timing): from
// sending the edit (totalMs) and from its answer arriving (redrawMs) to
// the frame with the new plan and figures painted, with the server's
// compute time, the JSON parse and the drawing calls.
const measureEdit = `new Promise((res) => { const s = window.review.edit(%s);
  const w = () => (window.review.timing && window.review.timing.seq === s) ? res(window.review.timing) : setTimeout(w, 2);
  w(); })`

// editTiming is the page's timing record of one edit (milliseconds).
type editTiming struct {
	Op         string  `json:"op"`
	TotalMs    float64 `json:"totalMs"`
	FetchMs    float64 `json:"fetchMs"`
	ServerMs   float64 `json:"serverMs"`
	ParseMs    float64 `json:"parseMs"`
	SetStateMs float64 `json:"setStateMs"`
	DrawMs     float64 `json:"drawMs"`
	FrameWait  float64 `json:"frameWaitMs"`
	PaintMs    float64 `json:"paintMs"`
	RedrawMs   float64 `json:"redrawMs"`
}

// browserEdits is the number of edits timed per round (odd, so that the
// median is one of them). The redraw target of the review page, the
// median time from an edit's answer arriving to the page painted at
// 10 000 devices within 100 ms, is measured by BenchmarkBrowserUpdate10k
// (metric ms-redraw-median), not asserted by a test: machines are shared.
// The server's part of an update (decode, recompute, encode) is
// BenchmarkReviewUpdate10k.
const browserEdits = 11

// browserTimedEdits are the edits timed on the 10 000-device plan: range
// and device edits alike.
var browserTimedEdits = []string{
	`{op: "range", range: 60}`, `{op: "range", range: 55}`, `{op: "range", range: 52}`,
	`{op: "move", device: 17, x: 2500, y: 2500}`, `{op: "off", device: 99}`, `{op: "on", device: 99}`,
	`{op: "add", points: [{x: 1000, y: 1200}]}`, `{op: "remove", device: 5}`, `{op: "undo"}`,
	`{op: "range", range: 58}`, `{op: "move", device: 400, x: 100, y: 4900}`,
}

// openBenchPage serves a plan of n devices and opens it in headless
// Chromium, returning the browser context once the page is ready.
func openBenchPage(t testing.TB, n int) context.Context {
	path := chromiumOrSkip(t)
	sv := newBenchServer(t, n)
	ts := httptest.NewServer(sv.Handler())
	t.Cleanup(ts.Close)
	ctx := startBrowser(t, path)
	if err := chromedp.Do(ctx, chromedp.Navigate(ts.URL), chromedp.WaitVisible(chromedp.CSS(`body[data-ready="1"]`))); err != nil {
		t.Fatal(err)
	}
	return ctx
}

// timeBrowserEdits applies browserTimedEdits once in the page and returns
// the median time from each answer arriving to the page painted and from
// each edit sent, in ms. Each step is logged.
func timeBrowserEdits(tb testing.TB, ctx context.Context) (redrawMs, totalMs float64) {
	var redraw, total []float64
	for _, e := range browserTimedEdits {
		tm, err := chromedp.Run(ctx, chromedp.Evaluate[editTiming](fmt.Sprintf(measureEdit, e), chromedp.EvalAwaitPromise))
		if err != nil {
			tb.Fatal(err)
		}
		tb.Logf("%-7s total %4.0f ms: request %3.0f (server %3.0f), parse %2.0f, setState %3.0f (drawing calls %3.0f), wait for the frame %2.0f, paint %3.0f; answer to painted %4.0f ms",
			tm.Op, tm.TotalMs, tm.FetchMs, tm.ServerMs, tm.ParseMs, tm.SetStateMs, tm.DrawMs, tm.FrameWait, tm.PaintMs, tm.RedrawMs)
		if !(tm.RedrawMs >= 0 && tm.TotalMs >= tm.RedrawMs && !math.IsInf(tm.TotalMs, 0)) {
			tb.Fatalf("edit %s: timings %+v are not a painted answer", e, tm)
		}
		redraw, total = append(redraw, tm.RedrawMs), append(total, tm.TotalMs)
	}
	slices.Sort(redraw)
	slices.Sort(total)
	return redraw[len(redraw)/2], total[len(total)/2]
}

// TestBrowserUpdate10kLive applies range and device edits in the browser
// on 10 000 devices and checks that each is answered and painted, with
// the disks near the site's edge drawn; it logs the timings
// (BenchmarkBrowserUpdate10k measures them).
func TestBrowserUpdate10kLive(t *testing.T) {
	if len(browserTimedEdits) != browserEdits {
		t.Fatalf("%d edits listed; browserEdits is %d", len(browserTimedEdits), browserEdits)
	}
	ctx := openBenchPage(t, benchDevices)
	mr, mt := timeBrowserEdits(t, ctx)
	t.Logf("median of %d edits: %.0f ms from the answer to the page painted, %.0f ms from the edit sent", browserEdits, mr, mt)
	disks, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`window.review.diskCount`))
	if err != nil {
		t.Fatal(err)
	}
	if !(disks > 0 && disks < benchDevices) {
		t.Errorf("%v disks drawn as circles; want some, fewer than the %d devices (only those near the site's edge)", disks, benchDevices)
	}
}

// BenchmarkBrowserUpdate10k measures the review page's redraw on 10 000
// devices in headless Chromium: per iteration, the 11 edits of
// browserTimedEdits; the metrics are the medians over the iteration's
// edits of the time from the answer arriving to the page painted
// (target: 100 ms) and from the edit sent. Run with
//
//	go test -run '^$' -bench BrowserUpdate10k -count 5 ./report/review
func BenchmarkBrowserUpdate10k(b *testing.B) {
	ctx := openBenchPage(b, benchDevices)
	var mrs, mts []float64
	for b.Loop() {
		mr, mt := timeBrowserEdits(b, ctx)
		mrs, mts = append(mrs, mr), append(mts, mt)
	}
	slices.Sort(mrs)
	slices.Sort(mts)
	b.ReportMetric(mrs[len(mrs)/2], "ms-redraw-median")
	b.ReportMetric(mts[len(mts)/2], "ms-edit-median")
}
