// Tests of the review API with devices of their own ranges: the figures
// against coverage.AnalyzeRanges on the same devices and ranges, the range
// controls (one device, one type, the slider as uniform power growth),
// bad values refused with the session unchanged, saving with the range
// column, the full report, and concurrent edits (run with -race).

package review

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"strings"
	"sync"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

// rangedTypes are the demo's devices' types in turn, with their ranges.
var rangedTypes = []struct {
	name string
	r    float64
}{{"sensor", 90}, {"gateway", 150}, {"beacon", 120}}

// rangedConfig is the demo campus with devices of three types and ranges.
func rangedConfig(t testing.TB) Config {
	cfg := demoConfig(t)
	cfg.Ranges = make([]float64, len(cfg.Sites))
	cfg.Types = make([]string, len(cfg.Sites))
	for i := range cfg.Sites {
		k := rangedTypes[i%len(rangedTypes)]
		cfg.Ranges[i], cfg.Types[i] = k.r, k.name
	}
	return cfg
}

// rangedServer starts a server on rangedConfig.
func rangedServer(t testing.TB) (Config, http.Handler) {
	cfg := rangedConfig(t)
	sv, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return cfg, sv.Handler()
}

// rangesTolerance is the relative agreement required when the state is at
// a growth t ≠ 0 and AnalyzeRanges is run on the grown ranges √(b² + t):
// the power diagram is the same, but the weights (√(b² + t))² differ from
// b² + t in the last bits, which moves cell vertices by ulps of the
// coordinates; the areas and ranges then agree to about 1e-12 relative.
const rangesTolerance = 1e-9

// near reports whether a and b agree to rangesTolerance relative to scale.
func near(a, b, scale float64) bool { return math.Abs(a-b) <= rangesTolerance*scale }

// inService returns the devices in service of state s: positions, ranges
// at growth g (√(b² + g)) and device indices.
func inService(s stateDoc, g float64) (pts []orb.Point, ranges []float64, idx []int) {
	for i, d := range s.Devices {
		if d.On {
			pts = append(pts, orb.Point{d.X, d.Y})
			ranges = append(ranges, grown(d.Range, g))
			idx = append(idx, i)
		}
	}
	return pts, ranges, idx
}

// checkRangedFigures compares the state's figures with
// coverage.AnalyzeRanges on the devices in service at their ranges now:
// equal at growth 0 (the same functions on the same input), within
// rangesTolerance otherwise.
func checkRangedFigures(t testing.TB, cfg Config, s stateDoc) {
	t.Helper()
	f := s.Figures
	if f.GrowthM2 == nil {
		t.Fatal("no growthM2 in the state of a plan with own ranges")
	}
	g := *f.GrowthM2
	pts, ranges, idx := inService(s, g)
	a, err := coverage.AnalyzeRanges(pts, ranges, cfg.Region, coverage.Options{})
	if err != nil {
		t.Fatal(err)
	}
	exact := g == 0
	same := func(what string, got, want, scale float64) {
		t.Helper()
		if exact && got != want || !exact && !near(got, want, scale) {
			t.Errorf("%s %v; AnalyzeRanges: %v", what, got, want)
		}
	}
	area := a.Layout.AreaM2
	same("uncovered", f.UncoveredM2, a.UncoveredArea, area)
	same("covered", f.CoveredFraction, a.CoveredFraction, 1)
	w2max := 0.0
	for _, r := range ranges {
		w2max = max(w2max, r*r)
	}
	same("full cover at largest range", f.FullCoverRangeM, math.Sqrt(max(0, w2max+a.FullCover.Power)), f.FullCoverRangeM)
	if len(f.Gaps) != len(a.Gaps) {
		t.Fatalf("%d gaps; AnalyzeRanges: %d", len(f.Gaps), len(a.Gaps))
	}
	for k, gp := range a.Gaps {
		p := f.Gaps[k]
		same(fmt.Sprintf("gap %d area", gp.ID), p.AreaM2, gp.Area, area)
		same(fmt.Sprintf("gap %d closing", gp.ID), p.ClosingRangeM, math.Sqrt(w2max+gp.Closing.Power), p.ClosingRangeM)
	}
	var hidden []int
	for _, k := range a.Hidden {
		hidden = append(hidden, idx[k])
	}
	if fmt.Sprint(hidden) != fmt.Sprint(f.Hidden) {
		t.Errorf("hidden %v; AnalyzeRanges: %v", f.Hidden, hidden)
	}
	if exact && (f.Pieces != a.Pieces || f.OpenHoles != a.EnclosedHoles) {
		t.Errorf("pieces/holes %d/%d; AnalyzeRanges: %d/%d", f.Pieces, f.OpenHoles, a.Pieces, a.EnclosedHoles)
	}
}

func TestRangesEdits(t *testing.T) {
	cfg, h := rangedServer(t)
	s0 := getState(t, h)
	checkRangedFigures(t, cfg, s0)
	if s0.Figures.RangeM != 150 || fmt.Sprint(s0.Figures.Types) != "[beacon gateway sensor]" {
		t.Errorf("largest range %v, types %v", s0.Figures.RangeM, s0.Figures.Types)
	}
	steps := []struct {
		name, body string
		check      func(t *testing.T, s stateDoc)
	}{
		{"slider", `{"op":"range","range":170}`, func(t *testing.T, s stateDoc) {
			// uniform power growth: every range √(b² + t), t = 170² − 150²
			if g := *s.Figures.GrowthM2; g != 170*170-150*150 || s.Figures.RangeM != 170 {
				t.Errorf("growth %v, largest range %v", g, s.Figures.RangeM)
			}
		}},
		{"one device", `{"op":"device-range","device":4,"range":60}`, func(t *testing.T, s stateDoc) {
			// the grown ranges became the devices' own, then device 4's was set
			if *s.Figures.GrowthM2 != 0 || s.Devices[4].Range != 60 || s.Devices[0].Range != grown(90, 170*170-150*150) {
				t.Errorf("growth %v, ranges %v %v", *s.Figures.GrowthM2, s.Devices[4].Range, s.Devices[0].Range)
			}
		}},
		{"one type", `{"op":"type-range","type":"Sensor","range":100}`, func(t *testing.T, s stateDoc) {
			for i, d := range s.Devices {
				if d.Type == "sensor" && d.Range != 100 {
					t.Errorf("sensor %d at %v m", i, d.Range)
				}
			}
		}},
		{"move", `{"op":"move","device":2,"x":10,"y":-20}`, nil},
		{"add", `{"op":"add","points":[{"x":5,"y":5},{"x":-40,"y":30,"range":75,"type":"beacon"}]}`, func(t *testing.T, s stateDoc) {
			n := len(s.Devices)
			if s.Devices[n-1].Range != 75 || s.Devices[n-2].Range != s.Figures.RangeM {
				t.Errorf("added at %v and %v m; want 75 and the largest %v", s.Devices[n-1].Range, s.Devices[n-2].Range, s.Figures.RangeM)
			}
		}},
		{"off", `{"op":"off","device":1}`, nil},
		{"slider down", `{"op":"range","range":165}`, nil},
		{"undo", `{"op":"undo"}`, nil},
	}
	for _, st := range steps {
		t.Run(st.name, func(t *testing.T) {
			s := editOK(t, h, st.body)
			if s.Devices == nil {
				s.Devices = getState(t, h).Devices
			}
			if st.check != nil {
				st.check(t, s)
			}
			checkRangedFigures(t, cfg, s)
		})
	}
	t.Run("device figures", func(t *testing.T) {
		var d deviceDoc
		if err := json.Unmarshal(do200(t, h, "/api/device/4"), &d); err != nil {
			t.Fatal(err)
		}
		if d.RangeM == nil || *d.RangeM != 60 || d.Type == "" {
			t.Errorf("device 4: %+v", d)
		}
	})
	t.Run("undo all", func(t *testing.T) { checkUndoAll(t, h, s0) })
}

// TestRangesBadValues: bad ranges are refused with a clear error and the
// session unchanged.
func TestRangesBadValues(t *testing.T) {
	_, h := rangedServer(t)
	editOK(t, h, `{"op":"range","range":160}`) // a growth t > 0
	checkRefused(t, h, append(badDeviceRanges,
		refusal{"infinite", `{"op":"device-range","device":1,"range":1e999}`, 400, "bad JSON"},
		refusal{"type zero", `{"op":"type-range","type":"sensor","range":0}`, 400, "not a positive"},
		refusal{"slider below least", `{"op":"range","range":100}`, 422, "shrink"},
		refusal{"added negative", `{"op":"add","points":[{"x":0,"y":0,"range":-1}]}`, 400, "added point 0"},
		refusal{"added absurd", `{"op":"add","points":[{"x":0,"y":0,"range":1e8}]}`, 422, "added point 0"},
	))
	t.Run("common range plan", func(t *testing.T) {
		// an added device's own range needs a plan with ranges per device
		// (a device-range edit switches a common-range plan to one:
		// TestRangesFromCommon)
		_, hc := testServer(t)
		body := `{"op":"add","points":[{"x":0,"y":0,"range":50}]}`
		if code, b := do(t, hc, http.MethodPost, "/api/edit", body); code != 409 {
			t.Errorf("%s on a common-range plan: status %d: %s", body, code, b)
		}
	})
}

// refusal is an edit that must be refused: its body, the status and a
// part of the error message.
type refusal struct {
	name, body string
	status     int
	want       string
}

// badDeviceRanges are device-range and type-range edits refused on any
// plan (own ranges or one common range).
var badDeviceRanges = []refusal{
	{"nan", `{"op":"device-range","device":1,"range":NaN}`, 400, "bad JSON"},
	{"zero", `{"op":"device-range","device":1,"range":0}`, 400, "not a positive"},
	{"negative", `{"op":"device-range","device":1,"range":-3}`, 400, "not a positive"},
	{"absurd", `{"op":"device-range","device":1,"range":1e9}`, 422, "beyond"},
	{"no range", `{"op":"device-range","device":1}`, 400, "needs \"range\""},
	{"no device", `{"op":"device-range","range":50}`, 400, "needs \"device\""},
	{"no such device", `{"op":"device-range","device":999,"range":50}`, 404, "no device 999"},
	{"negative device", `{"op":"device-range","device":-1,"range":50}`, 404, "no device -1"},
	{"unknown type", `{"op":"type-range","type":"siren","range":50}`, 404, "no device of type"},
}

// checkRefused sends each refused edit to h and checks the status, the
// message and that the session is unchanged.
func checkRefused(t *testing.T, h http.Handler, cases []refusal) {
	t.Helper()
	before := do200(t, h, "/api/state")
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, b := do(t, h, http.MethodPost, "/api/edit", c.body)
			var e struct{ Error string }
			json.Unmarshal(b, &e)
			if code != c.status || !strings.Contains(e.Error, c.want) {
				t.Errorf("status %d, error %q; want %d mentioning %q", code, e.Error, c.status, c.want)
			}
			if !bytes.Equal(before, do200(t, h, "/api/state")) {
				t.Error("the session changed")
			}
		})
	}
}

// TestRangesSave: the saved plan carries the range and type columns, and
// the full report is the one analyze writes for own ranges.
func TestRangesSave(t *testing.T) {
	cfg := rangedConfig(t)
	h := newWithOut(t, cfg).Handler()
	editOK(t, h, `{"op":"range","range":170}`)
	csvOut := string(do200(t, h, "/api/export/csv"))
	lines := strings.Split(strings.TrimSpace(csvOut), "\n")
	if lines[0] != "name,lat,lon,range,type" || len(lines) != len(cfg.Sites)+1 {
		t.Fatalf("CSV header %q, %d lines", lines[0], len(lines))
	}
	// device 0 is a sensor of 90 m, grown to √(90² + 170² − 150²)
	if want := "," + savedRange(grown(90, 170*170-150*150)) + ",sensor"; !strings.HasSuffix(lines[1], want) {
		t.Errorf("first row %q; want it to end %q", lines[1], want)
	}
	var fc struct {
		Features []struct {
			Properties map[string]any `json:"properties"`
		} `json:"features"`
	}
	if err := json.Unmarshal(do200(t, h, "/api/export/geojson"), &fc); err != nil {
		t.Fatal(err)
	}
	if p := fc.Features[1].Properties; p["range"] != 170.0 || p["type"] != "gateway" {
		t.Errorf("second feature's properties %v", p)
	}
	code, b := do(t, h, http.MethodPost, "/api/report", `{}`)
	if code != 200 || !bytes.Contains(b, []byte("summary.json")) {
		t.Errorf("report: status %d: %s", code, b)
	}
}

// TestRangesConcurrentEdits sends range, device-range and move edits from
// several goroutines (run with -race).
func TestRangesConcurrentEdits(t *testing.T) {
	cfg, h := rangedServer(t)
	var wg sync.WaitGroup
	for w := 0; w < 4; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for k := 0; k < 6; k++ {
				var body string
				switch (w + k) % 4 {
				case 0:
					body = fmt.Sprintf(`{"op":"range","range":%d}`, 150+5*k)
				case 1:
					body = fmt.Sprintf(`{"op":"device-range","device":%d,"range":%d}`, w+k, 80+10*w)
				case 2:
					body = fmt.Sprintf(`{"op":"move","device":%d,"x":%d,"y":%d}`, w, 5*w, -5*k)
				default:
					body = `{"op":"undo"}`
				}
				if code, b := do(t, h, http.MethodPost, "/api/edit", body); code != 200 && code != 409 {
					t.Errorf("%s: status %d: %s", body, code, b)
				}
				do(t, h, http.MethodGet, fmt.Sprintf("/api/device/%d", k), "")
			}
		}(w)
	}
	wg.Wait()
	checkRangedFigures(t, cfg, getState(t, h))
}

// TestRangesCurveClipped: with own ranges the coverage curve starts at the
// slider's least value, with the exact covered share there, and has no
// point below it.
func TestRangesCurveClipped(t *testing.T) {
	_, h := rangedServer(t)
	for _, body := range []string{"", `{"op":"range","range":170}`, `{"op":"device-range","device":0,"range":40}`} {
		s := getState(t, h)
		if body != "" {
			s = editOK(t, h, body)
		}
		f := s.Figures
		c := f.Curve
		if len(c) == 0 || c[0][0] != *f.LeastRangeM {
			t.Fatalf("after %q: curve starts at %v; least range %v", body, c[0], *f.LeastRangeM)
		}
		for _, p := range c {
			if p[0] < *f.LeastRangeM {
				t.Errorf("after %q: curve point %v below the least range %v", body, p, *f.LeastRangeM)
			}
		}
		if c[1][0] <= c[0][0] || c[0][1] > c[1][1] {
			t.Errorf("after %q: curve opens %v, %v", body, c[0], c[1])
		}
	}
}
