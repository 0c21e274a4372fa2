// Test of the deferred coverage curve with own ranges: an edit sent with
// "later" answers without the curve (figures.curvePending), and the curve
// GET /api/curve then answers equals both the curve of the same edit
// answered at once and a full recomputation with
// coverage.NewLayoutRanges and Curve.CoveredFraction on the devices in
// service.

package review

import (
	"encoding/json"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
)

func TestRangesCurveDeferred(t *testing.T) {
	cfg := rangedConfig(t)
	sv, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	h := sv.Handler()
	_, now := rangedServer(t) // the same edits, answered with the curve at once
	steps := []struct {
		name, body string
		pending    bool // the layout changed: the curve is left out
	}{
		{"move", `{"op":"move","device":2,"x":10,"y":-20}`, true},
		{"slider", `{"op":"range","range":170}`, false},
		{"off", `{"op":"off","device":1}`, true},
		{"slider while pending", `{"op":"range","range":175}`, true},
		{"device range", `{"op":"device-range","device":4,"range":60}`, true},
		{"add", `{"op":"add","points":[{"x":5,"y":5,"range":75}]}`, true},
		{"undo", `{"op":"undo"}`, true},
	}
	for _, st := range steps {
		t.Run(st.name, func(t *testing.T) {
			if st.name == "slider while pending" {
				editOK(t, h, `{"op":"move","device":3,"x":30,"y":40,"later":true}`)
				editOK(t, now, `{"op":"move","device":3,"x":30,"y":40}`)
			}
			later := strings.Replace(st.body, "{", `{"later":true,`, 1)
			s := editOK(t, h, later)
			if f := s.Figures; f.CurvePending != st.pending || (f.Curve == nil) != st.pending {
				t.Fatalf("curve pending %v with %d points; want pending %v", f.CurvePending, len(f.Curve), st.pending)
			}
			want := editOK(t, now, st.body).Figures.Curve
			var c curveAnswer
			if err := json.Unmarshal(do200(t, h, "/api/curve"), &c); err != nil {
				t.Fatal(err)
			}
			if c.Version != s.Version {
				t.Errorf("curve of version %d; the plan is at %d", c.Version, s.Version)
			}
			if !reflect.DeepEqual(c.Curve, want) {
				t.Errorf("deferred curve %v\nanswered at once %v", c.Curve, want)
			}
			if !st.pending && !reflect.DeepEqual(s.Figures.Curve, want) {
				t.Errorf("curve in the answer %v\nanswered at once %v", s.Figures.Curve, want)
			}
			checkCurveRecomputed(t, getState(t, h), sv.cfg.grid, c.Curve)
		})
	}
}

// checkCurveRecomputed checks the curve c of state s point by point
// against coverage.NewLayoutRanges(...).CurveRanges() on the devices in
// service at their own ranges b_i: at the slider's least value
// √(max b² − min b²) the covered fraction at power −min b², at each sample
// range r of grid above it the one at power r² − max b², and 1 at the
// full-cover range.
func checkCurveRecomputed(t *testing.T, s stateDoc, grid []float64, c [][2]float64) {
	t.Helper()
	var pts []orb.Point
	var ranges []float64
	w2max, w2min := 0.0, math.Inf(1)
	for _, d := range s.Devices {
		if d.On {
			pts = append(pts, orb.Point{d.X, d.Y})
			ranges = append(ranges, d.Range)
			w2max, w2min = max(w2max, d.Range*d.Range), min(w2min, d.Range*d.Range)
		}
	}
	l, err := coverage.NewLayoutRanges(pts, ranges, rangedConfig(t).Region)
	if err != nil {
		t.Fatal(err)
	}
	cv := l.CurveRanges()
	lo := math.Sqrt(w2max - w2min)
	want := [][2]float64{{lo, cv.CoveredFraction(-w2min)}}
	for _, r := range grid {
		if r > lo {
			want = append(want, [2]float64{r, cv.CoveredFraction(r*r - w2max)})
		}
	}
	got := make([][2]float64, 0, len(c))
	for _, p := range c {
		if p[0] == s.Figures.FullCoverRangeM && p[1] == 1 && !slices.Contains(grid, p[0]) {
			continue // the full-cover point
		}
		got = append(got, p)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("curve %v\nrecomputed %v", got, want)
	}
}
