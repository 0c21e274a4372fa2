// Tests of the review API over httptest: every edit (figures checked
// against coverage.Analyze on the same devices and range), bad requests
// (clear 4xx JSON error, session unchanged), saving, the full report, and
// concurrent edits (run with -race).

package review

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report/siteinput"
)

// testHost is the Host header of the test requests (a loopback address).
const testHost = "127.0.0.1:8080"

// demoConfig loads the demo campus like `sitecover review --demo`.
func demoConfig(t testing.TB) Config {
	t.Helper()
	sites, area, r, title := examplesites.Campus()
	sc, err := siteinput.Load(siteinput.Inputs{
		Sites:  siteinput.Source{Name: "campus-sensors.geojson", Data: sites},
		Area:   &siteinput.Source{Name: "campus-area.geojson", Data: area},
		Points: &siteinput.Source{Name: "campus-buildings.geojson", Data: examplesites.BuildingsGeoJSON()},
	})
	if err != nil {
		t.Fatal(err)
	}
	cfg := Config{Sites: sc.Sites, Names: sc.Names, Region: sc.Region, Range: r}
	cfg.Meta.Title = title
	cfg.Meta.SitesFile = "campus-sensors.geojson"
	cfg.Meta.SiteNames = sc.Names
	cfg.Meta.ToLonLat = sc.Projection.Inverse
	cfg.Meta.Command = "review"
	cfg.ContextPoints = sc.Demand.Pts
	return cfg
}

// testServer starts a server on the demo.
func testServer(t testing.TB) (*Server, http.Handler) {
	t.Helper()
	sv, err := New(demoConfig(t))
	if err != nil {
		t.Fatal(err)
	}
	return sv, sv.Handler()
}

// do sends one request to h and returns the status and body.
func do(t testing.TB, h http.Handler, method, path, body string) (int, []byte) {
	t.Helper()
	req := httptest.NewRequest(method, path, strings.NewReader(body))
	req.Host = testHost
	if method == http.MethodPost {
		req.Header.Set("Content-Type", "application/json")
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec.Code, rec.Body.Bytes()
}

// editOK sends an edit that must succeed and returns the new state.
func editOK(t testing.TB, h http.Handler, body string) stateDoc {
	t.Helper()
	code, b := do(t, h, http.MethodPost, "/api/edit", body)
	if code != http.StatusOK {
		t.Fatalf("edit %s: status %d: %s", body, code, b)
	}
	var s stateDoc
	if err := json.Unmarshal(b, &s); err != nil {
		t.Fatal(err)
	}
	return s
}

// getState reads the current state.
func getState(t testing.TB, h http.Handler) stateDoc {
	t.Helper()
	code, b := do(t, h, http.MethodGet, "/api/state", "")
	if code != http.StatusOK {
		t.Fatalf("state: status %d: %s", code, b)
	}
	var s stateDoc
	if err := json.Unmarshal(b, &s); err != nil {
		t.Fatal(err)
	}
	return s
}

// checkFigures compares the state's figures with coverage.Analyze on the
// devices in service at the state's range: the same functions on the same
// input, so the figures must be equal, not merely close.
func checkFigures(t testing.TB, cfg Config, s stateDoc) {
	t.Helper()
	var pts []orb.Point
	var idx []int
	for i, d := range s.Devices {
		if d.On {
			pts = append(pts, orb.Point{d.X, d.Y})
			idx = append(idx, i)
		}
	}
	f := s.Figures
	a, err := coverage.Analyze(pts, cfg.Region, f.RangeM, coverage.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if f.CoveredFraction != a.CoveredFraction || f.UncoveredM2 != a.UncoveredArea || f.FullCoverRangeM != a.FullCover.Range {
		t.Errorf("covered %v uncovered %v full cover %v; Analyze: %v %v %v",
			f.CoveredFraction, f.UncoveredM2, f.FullCoverRangeM, a.CoveredFraction, a.UncoveredArea, a.FullCover.Range)
	}
	if len(f.Gaps) != len(a.Gaps) {
		t.Fatalf("%d gaps; Analyze: %d", len(f.Gaps), len(a.Gaps))
	}
	for k, g := range a.Gaps {
		p := f.Gaps[k]
		if p.ID != g.ID || p.AreaM2 != g.Area || p.ClosingRangeM != g.ClosingRange || p.Deepest != [2]float64(g.Deepest) {
			t.Errorf("gap %d: %+v; Analyze: %+v", k, p, g)
		}
		for j, site := range g.Sites {
			if p.Devices[j] != idx[site] {
				t.Errorf("gap %d bordering device %d: %d; Analyze: %d", g.ID, j, p.Devices[j], idx[site])
			}
		}
	}
	if pieces, holes := a.Persistence.Betti(f.RangeM); pieces != f.Pieces || holes != f.OpenHoles {
		t.Errorf("pieces/holes %d/%d; Analyze: %d/%d", f.Pieces, f.OpenHoles, pieces, holes)
	}
}

func TestEdits(t *testing.T) {
	cfg := demoConfig(t)
	_, h := testServer(t)
	s0 := getState(t, h)
	checkFigures(t, cfg, s0)
	d5 := s0.Devices[5]
	steps := []struct {
		name, body string
		check      func(t *testing.T, s stateDoc)
	}{
		{"range", `{"op":"range","range":100}`, func(t *testing.T, s stateDoc) {
			if s.Figures.RangeM != 100 {
				t.Errorf("range %v", s.Figures.RangeM)
			}
		}},
		{"move", fmt.Sprintf(`{"op":"move","device":5,"x":%v,"y":%v}`, d5.X+40, d5.Y-25), func(t *testing.T, s stateDoc) {
			if s.Devices[5].X != d5.X+40 || s.Devices[5].Y != d5.Y-25 {
				t.Errorf("device 5 at %v, %v", s.Devices[5].X, s.Devices[5].Y)
			}
		}},
		{"add", `{"op":"add","points":[{"x":10,"y":20,"label":"new pole"},{"x":-50,"y":60}]}`, func(t *testing.T, s stateDoc) {
			if n := len(s.Devices); n != len(s0.Devices)+2 || s.Devices[n-2].Label != "new pole" {
				t.Errorf("%d devices, last two %+v", n, s.Devices[n-2:])
			}
		}},
		{"remove", `{"op":"remove","device":0}`, func(t *testing.T, s stateDoc) {
			if len(s.Devices) != len(s0.Devices)+1 || s.Devices[0].Label != s0.Devices[1].Label {
				t.Errorf("%d devices, first %q", len(s.Devices), s.Devices[0].Label)
			}
		}},
		{"off", `{"op":"off","device":3}`, func(t *testing.T, s stateDoc) {
			if s.Devices[3].On || s.Figures.DevicesOn != len(s.Devices)-1 {
				t.Errorf("device 3 on %v, %d in service", s.Devices[3].On, s.Figures.DevicesOn)
			}
		}},
		{"on", `{"op":"on","device":3}`, func(t *testing.T, s stateDoc) {
			if !s.Devices[3].On {
				t.Error("device 3 still off")
			}
		}},
		{"undo", `{"op":"undo"}`, func(t *testing.T, s stateDoc) {
			if s.Devices[3].On {
				t.Error("undo did not switch device 3 back off")
			}
		}},
	}
	prev := s0.Version
	for _, st := range steps {
		t.Run(st.name, func(t *testing.T) {
			s := editOK(t, h, st.body)
			if s.Version != prev+1 {
				t.Errorf("version %d after %d", s.Version, prev)
			}
			prev = s.Version
			if s.Devices == nil {
				s.Devices = getState(t, h).Devices
			}
			st.check(t, s)
			checkFigures(t, cfg, s)
		})
	}
	t.Run("undo-all", func(t *testing.T) { checkUndoAll(t, h, s0) })
}

// checkUndoAll undoes every edit and requires the first state s0 again.
func checkUndoAll(t *testing.T, h http.Handler, s0 stateDoc) {
	var s stateDoc
	for s = getState(t, h); s.CanUndo; {
		s = editOK(t, h, `{"op":"undo"}`)
	}
	s.Version, s0.Version, s.ComputeMs = 0, 0, 0
	a, _ := json.Marshal(s)
	b, _ := json.Marshal(s0)
	if !bytes.Equal(a, b) {
		t.Error("undoing every edit does not give the first state")
	}
}

func TestGestureIsOneUndoStep(t *testing.T) {
	_, h := testServer(t)
	s0 := getState(t, h)
	d := s0.Devices[7]
	for k := 1; k <= 5; k++ {
		editOK(t, h, fmt.Sprintf(`{"op":"move","device":7,"x":%v,"y":%v,"gesture":3}`, d.X+float64(k), d.Y))
	}
	editOK(t, h, `{"op":"range","range":90,"gesture":4}`)
	editOK(t, h, `{"op":"range","range":95,"gesture":4}`)
	s := editOK(t, h, `{"op":"undo"}`)
	if s.Figures.RangeM != s0.Figures.RangeM || s.Devices[7].X != d.X+5 {
		t.Errorf("after one undo: range %v, device 7 x %v; want %v, %v", s.Figures.RangeM, s.Devices[7].X, s0.Figures.RangeM, d.X+5)
	}
	s = editOK(t, h, `{"op":"undo"}`)
	if s.Devices[7].X != d.X || s.CanUndo {
		t.Errorf("after two undos: device 7 x %v (want %v), can undo %v", s.Devices[7].X, d.X, s.CanUndo)
	}
}

func TestBadRequests(t *testing.T) {
	_, h := testServer(t)
	many := make([]string, MaxAddPerEdit+1)
	for i := range many {
		many[i] = `{"x":1,"y":2}`
	}
	huge := `{"op":"add","points":[` + strings.Repeat(`{"x":1,"y":2},`, MaxBody/14) + `{"x":1,"y":2}]}`
	cases := []struct {
		name, method, path, body, ctype, host string
		status                                int
	}{
		{name: "nan literal", body: `{"op":"move","device":1,"x":NaN,"y":0}`, status: 400},
		{name: "overflowing number", body: `{"op":"move","device":1,"x":1e999,"y":0}`, status: 400},
		{name: "far outside", body: `{"op":"move","device":1,"x":1e7,"y":0}`, status: 422},
		{name: "missing y", body: `{"op":"move","device":1,"x":3}`, status: 400},
		{name: "no such device", body: `{"op":"remove","device":400}`, status: 404},
		{name: "negative device", body: `{"op":"off","device":-1}`, status: 404},
		{name: "no device", body: `{"op":"off"}`, status: 400},
		{name: "unknown op", body: `{"op":"explode","device":1}`, status: 400},
		{name: "no op", body: `{"device":1}`, status: 400},
		{name: "unknown field", body: `{"op":"range","range":50,"colour":"red"}`, status: 400},
		{name: "two values", body: `{"op":"range","range":50}{"op":"undo"}`, status: 400},
		{name: "not json", body: `op=range&range=50`, status: 400},
		{name: "too many added", body: `{"op":"add","points":[` + strings.Join(many, ",") + `]}`, status: 413},
		{name: "added point outside", body: `{"op":"add","points":[{"x":0,"y":0},{"x":0,"y":-9e6}]}`, status: 422},
		{name: "long label", body: `{"op":"add","points":[{"x":0,"y":0,"label":"` + strings.Repeat("x", maxLabel+1) + `"}]}`, status: 400},
		{name: "body over limit", body: huge, status: 413},
		{name: "zero range", body: `{"op":"range","range":0}`, status: 400},
		{name: "negative range", body: `{"op":"range","range":-5}`, status: 400},
		{name: "absurd range", body: `{"op":"range","range":1e9}`, status: 422},
		{name: "range missing", body: `{"op":"range"}`, status: 400},
		{name: "stale version", body: `{"op":"range","range":50,"version":99}`, status: 409},
		{name: "nothing to undo", body: `{"op":"undo"}`, status: 409},
		{name: "form post", body: `{"op":"range","range":50}`, ctype: "application/x-www-form-urlencoded", status: 415},
		{name: "foreign host", body: `{"op":"range","range":50}`, host: "attacker.example:80", status: 403},
		{name: "bad device path", method: "GET", path: "/api/device/abc", status: 400},
		{name: "device out of range", method: "GET", path: "/api/device/99", status: 404},
		{name: "unknown export", method: "GET", path: "/api/export/shp", status: 404},
		{name: "report without out", path: "/api/report", body: `{}`, status: 403},
	}
	before := do200(t, h, "/api/state")
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			method, path := c.method, c.path
			if method == "" {
				method = http.MethodPost
			}
			if path == "" {
				path = "/api/edit"
			}
			req := httptest.NewRequest(method, path, strings.NewReader(c.body))
			req.Host = testHost
			if method == http.MethodPost {
				ct := c.ctype
				if ct == "" {
					ct = "application/json"
				}
				req.Header.Set("Content-Type", ct)
			}
			if c.host != "" {
				req.Host = c.host
			}
			rec := httptest.NewRecorder()
			h.ServeHTTP(rec, req)
			if rec.Code != c.status {
				t.Errorf("status %d, want %d: %s", rec.Code, c.status, rec.Body.Bytes())
			}
			var e struct{ Error string }
			if err := json.Unmarshal(rec.Body.Bytes(), &e); err != nil || e.Error == "" {
				t.Errorf("answer is not a JSON error: %q", rec.Body.Bytes())
			}
			if after := do200(t, h, "/api/state"); !bytes.Equal(before, after) {
				t.Error("the session changed")
			}
		})
	}
	t.Run("all devices off", func(t *testing.T) {
		s := getState(t, h)
		for i := 0; i < len(s.Devices)-1; i++ {
			editOK(t, h, fmt.Sprintf(`{"op":"off","device":%d}`, i))
		}
		mid := do200(t, h, "/api/state")
		code, b := do(t, h, http.MethodPost, "/api/edit", fmt.Sprintf(`{"op":"off","device":%d}`, len(s.Devices)-1))
		if code != 409 {
			t.Errorf("switching off the last device: status %d: %s", code, b)
		}
		if !bytes.Equal(mid, do200(t, h, "/api/state")) {
			t.Error("the session changed")
		}
	})
}

// do200 GETs path and requires 200.
func do200(t testing.TB, h http.Handler, path string) []byte {
	t.Helper()
	code, b := do(t, h, http.MethodGet, path, "")
	if code != http.StatusOK {
		t.Fatalf("GET %s: status %d: %s", path, code, b)
	}
	return b
}

func TestPageAndAssets(t *testing.T) {
	_, h := testServer(t)
	for _, p := range []string{"/", "/assets/app.js", "/assets/style.css", "/api/scene", "/api/cells", "/api/device/4"} {
		t.Run(p, func(t *testing.T) {
			if b := do200(t, h, p); len(b) == 0 {
				t.Error("empty answer")
			}
		})
	}
	t.Run("device figures", func(t *testing.T) {
		cfg := demoConfig(t)
		var d deviceDoc
		json.Unmarshal(do200(t, h, "/api/device/4"), &d)
		l, _ := coverage.NewLayout(cfg.Sites, cfg.Region)
		fr, _ := coverage.Failures(l, cfg.Range)
		for _, f := range fr.Devices {
			if f.Site == 4 && (d.FailAddedUncoveredM2 == nil || *d.FailAddedUncoveredM2 != f.AddedUncovered || *d.ServedM2 != f.ServiceArea) {
				t.Errorf("device 4: %+v; Failures: %+v", d, f)
			}
		}
	})
}

// newWithOut starts a server on cfg whose reports go into a new folder
// "out" of the test's temporary folder.
func newWithOut(t testing.TB, cfg Config) *Server {
	t.Helper()
	cfg.OutDir = filepath.Join(t.TempDir(), "out")
	sv, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return sv
}

func TestSaveAndReport(t *testing.T) {
	cfg := demoConfig(t)
	sv := newWithOut(t, cfg)
	h := sv.Handler()
	editOK(t, h, `{"op":"add","points":[{"x":15,"y":-30,"label":"pole, east"}]}`)
	editOK(t, h, `{"op":"off","device":2}`)
	s := getState(t, h)
	for _, format := range []string{"geojson", "csv"} {
		t.Run(format, func(t *testing.T) {
			b := do200(t, h, "/api/export/"+format)
			sc, err := siteinput.Load(siteinput.Inputs{Sites: siteinput.Source{Name: "saved." + format, Data: b}, Area: &siteinput.Source{Name: "area", Data: examplesites.AreaGeoJSON()}})
			if err != nil {
				t.Fatal(err)
			}
			// The saved file is re-projected on a plane fitted to it; compare
			// distances between devices, which do not depend on the plane.
			var want []deviceRow
			for _, d := range s.Devices {
				if d.On {
					want = append(want, d)
				}
			}
			if len(sc.Sites) != len(want) {
				t.Fatalf("%d sites saved, want %d", len(sc.Sites), len(want))
			}
			for i := range want {
				if sc.Names[i] != want[i].Label {
					t.Errorf("site %d named %q, want %q", i, sc.Names[i], want[i].Label)
				}
				j := (i + 7) % len(want)
				got := math.Hypot(sc.Sites[i][0]-sc.Sites[j][0], sc.Sites[i][1]-sc.Sites[j][1])
				w := math.Hypot(want[i].X-want[j].X, want[i].Y-want[j].Y)
				// 1e-9° rounding (0.1 mm) and the two planes' scale (1e-6).
				if math.Abs(got-w) > 1e-3 {
					t.Errorf("distance %d-%d: %v m, want %v m", i, j, got, w)
				}
			}
		})
	}
	t.Run("report", func(t *testing.T) {
		b := do200ish(t, h, "/api/report")
		var r reportDoc
		json.Unmarshal(b, &r)
		sum, err := os.ReadFile(filepath.Join(sv.cfg.OutDir, "summary.json"))
		if err != nil || len(r.Files) < 6 {
			t.Fatalf("report: %s, %v", b, err)
		}
		var doc struct {
			CoveredFraction float64 `json:"covered_fraction"`
			Sites           int     `json:"sites"`
		}
		json.Unmarshal(sum, &doc)
		if doc.Sites != s.Figures.DevicesOn {
			t.Errorf("summary.json: %d sites, want %d", doc.Sites, s.Figures.DevicesOn)
		}
	})
}

// do200ish POSTs {} to path and requires 200.
func do200ish(t testing.TB, h http.Handler, path string) []byte {
	t.Helper()
	code, b := do(t, h, http.MethodPost, path, `{}`)
	if code != http.StatusOK {
		t.Fatalf("POST %s: status %d: %s", path, code, b)
	}
	return b
}

func TestConcurrentEdits(t *testing.T) {
	cfg := demoConfig(t)
	_, h := testServer(t)
	const workers, each = 6, 8
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for k := 0; k < each; k++ {
				var body string
				switch (w + k) % 5 {
				case 0:
					body = fmt.Sprintf(`{"op":"range","range":%d}`, 90+w+k)
				case 1:
					body = fmt.Sprintf(`{"op":"add","points":[{"x":%d,"y":%d}]}`, 10*w-30, 7*k-20)
				case 2:
					body = fmt.Sprintf(`{"op":"move","device":%d,"x":%d,"y":%d}`, w+k, 5*w, -5*k)
				case 3:
					body = fmt.Sprintf(`{"op":"off","device":%d}`, w)
				default:
					body = `{"op":"undo"}`
				}
				code, b := do(t, h, http.MethodPost, "/api/edit", body)
				if code != 200 && code != 409 {
					t.Errorf("%s: status %d: %s", body, code, b)
				}
				do(t, h, http.MethodGet, "/api/state", "")
				do(t, h, http.MethodGet, fmt.Sprintf("/api/device/%d", k), "")
			}
		}(w)
	}
	wg.Wait()
	checkFigures(t, cfg, getState(t, h))
}
