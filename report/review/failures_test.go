// Tests of the loss if a device fails with own ranges (failures.go: one
// device's failure computed alone, coverage.RangesFailures.Device, checked
// against coverage.FailuresRanges on the layout at the ranges now) and of a device-range edit on a common-range plan
// (the session switches to own ranges; undo returns exactly).

package review

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"net/http"
	"testing"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar"
)

// checkDeviceFailures compares every device's /api/device failure figures
// with coverage.FailuresRanges on all devices in service at their ranges
// now, and returns how many took over through a hidden device.
func checkDeviceFailures(t *testing.T, h http.Handler, cfg Config) (hiddenBackups int) {
	t.Helper()
	s := getState(t, h)
	g := *s.Figures.GrowthM2
	pts, ranges, idx := inService(s, g)
	l, err := coverage.NewLayoutRanges(pts, ranges, cfg.Region)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := coverage.FailuresRanges(l)
	if err != nil {
		t.Fatal(err)
	}
	w2max := 0.0
	for _, r := range ranges {
		w2max = max(w2max, r*r)
	}
	hidden := map[int]bool{}
	for _, k := range l.Hidden {
		hidden[k] = true
	}
	scale := l.AreaM2
	for _, want := range rep.Devices {
		i := idx[want.Site]
		var d deviceDoc
		if err := json.Unmarshal(do200(t, h, fmt.Sprintf("/api/device/%d", i)), &d); err != nil {
			t.Fatal(err)
		}
		if d.Hidden != want.Hidden {
			t.Errorf("device %d: hidden %v; FailuresRanges: %v", i, d.Hidden, want.Hidden)
			continue
		}
		if d.FailAddedUncoveredM2 == nil || !near(*d.FailAddedUncoveredM2, want.AddedUncovered, scale) {
			t.Errorf("device %d: failure adds %v m²; FailuresRanges: %v", i, ptrText(d.FailAddedUncoveredM2), want.AddedUncovered)
		}
		if want.Hidden {
			continue
		}
		if math.IsInf(want.ClosingPower, 0) {
			if d.FailClosingRangeM != nil {
				t.Errorf("device %d: closes at %v; FailuresRanges: closing power %v", i, *d.FailClosingRangeM, want.ClosingPower)
			}
			continue
		}
		closing := math.Sqrt(max(0, w2max+want.ClosingPower))
		if d.FailClosingRangeM == nil || !near(*d.FailClosingRangeM, closing, closing) || d.FailBackupRangeM == nil {
			t.Errorf("device %d: closes at %v, backup needs %v; FailuresRanges: %v, %v", i,
				ptrText(d.FailClosingRangeM), ptrText(d.FailBackupRangeM), closing, want.ClosingRange)
			continue
		}
		// The backup owns the deepest point after the failure. Where that
		// point is a corner of two new pieces (a power vertex) both owners
		// have the closing power there and either is right: the layouts at
		// the planned and at the grown ranges may order their candidates
		// differently, so the check is the backup's power at the deepest
		// point.
		if want.Backup < 0 {
			continue
		}
		if d.FailBackup == nil || d.FailDeepest == nil {
			t.Errorf("device %d: no backup; FailuresRanges: %d", i, idx[want.Backup])
			continue
		}
		bd := s.Devices[*d.FailBackup]
		dist := math.Hypot(d.FailDeepest[0]-bd.X, d.FailDeepest[1]-bd.Y)
		rb := grown(bd.Range, g)
		if pow := dist*dist - rb*rb; !near(pow, want.ClosingPower, w2max) || !near(dist, *d.FailBackupRangeM, dist) {
			t.Errorf("device %d: backup %d has power %v at the deepest point, distance %v (said %v); FailuresRanges: closing power %v (backup %d)",
				i, *d.FailBackup, pow, dist, *d.FailBackupRangeM, want.ClosingPower, idx[want.Backup])
		}
		if hidden[slicesIndex(idx, *d.FailBackup)] {
			hiddenBackups++
		}
	}
	return hiddenBackups
}

// slicesIndex is the position of v in s (−1: absent).
func slicesIndex(s []int, v int) int {
	for k, x := range s {
		if x == v {
			return k
		}
	}
	return -1
}

// ptrText formats a pointer's value ("absent" for nil).
func ptrText[T any](p *T) string {
	if p == nil {
		return "absent"
	}
	return fmt.Sprint(*p)
}

func TestRangesDeviceFailures(t *testing.T) {
	t.Run("demo", func(t *testing.T) {
		cfg, h := rangedServer(t)
		checkDeviceFailures(t, h, cfg)
		editOK(t, h, `{"op":"range","range":170}`) // at a growth t > 0
		checkDeviceFailures(t, h, cfg)
	})
	t.Run("equal ranges, two devices on one spot", func(t *testing.T) {
		// all ranges equal: coverage.FailuresRanges is Failures, and the
		// failure of a device sharing its spot costs nothing
		cfg := demoConfig(t)
		cfg.Sites[1] = cfg.Sites[0]
		cfg.Ranges = make([]float64, len(cfg.Sites))
		for i := range cfg.Ranges {
			cfg.Ranges[i] = 120
		}
		sv, err := New(cfg)
		if err != nil {
			t.Fatal(err)
		}
		h := sv.Handler()
		checkDeviceFailures(t, h, cfg)
		var d deviceDoc
		if err := json.Unmarshal(do200(t, h, "/api/device/1"), &d); err != nil {
			t.Fatal(err)
		}
		if !d.Shared || d.FailAddedUncoveredM2 == nil || *d.FailAddedUncoveredM2 != 0 || d.FailBackup == nil || *d.FailBackup != 0 {
			t.Errorf("device 1 on device 0's spot: shared %v, failure adds %v, backup %v", d.Shared, ptrText(d.FailAddedUncoveredM2), ptrText(d.FailBackup))
		}
	})
	t.Run("hidden devices take over", func(t *testing.T) {
		// 300 devices of ranges 35–75 m on a 600 m square: many hidden
		// devices, some of which take over when a neighbour fails
		const n, side = 300, 600.0
		rng := rand.New(rand.NewPCG(5, 6))
		cfg := Config{Sites: make([]orb.Point, n), Ranges: make([]float64, n)}
		for i := range cfg.Sites {
			cfg.Sites[i] = orb.Point{rng.Float64() * side, rng.Float64() * side}
			cfg.Ranges[i] = 35 + 40*rng.Float64()
		}
		var err error
		if cfg.Region, err = planar.NewRegion(orb.MultiPolygon{{{{0, 0}, {side, 0}, {side, side}, {0, side}, {0, 0}}}}); err != nil {
			t.Fatal(err)
		}
		sv, err := New(cfg)
		if err != nil {
			t.Fatal(err)
		}
		h := sv.Handler()
		if k := checkDeviceFailures(t, h, cfg); k == 0 {
			t.Error("no failure taken over by a hidden device: the case is not exercised")
		}
	})
}

// TestRangesFromCommon: setting one device's range on a common-range plan
// switches the session to own ranges, every other device keeping the
// common range; undo returns to the common-range state exactly; bad values
// are refused with the session unchanged.
func TestRangesFromCommon(t *testing.T) {
	cfg := demoConfig(t)
	t.Run("switch and undo", func(t *testing.T) {
		_, h := testServer(t)
		s0 := getState(t, h)
		s1 := editOK(t, h, `{"op":"range","range":130}`)
		s := editOK(t, h, `{"op":"device-range","device":3,"range":200}`)
		if s.Figures.GrowthM2 == nil || *s.Figures.GrowthM2 != 0 || s.Figures.RangeM != 200 {
			t.Fatalf("after the switch: growth %v, largest range %v", ptrText(s.Figures.GrowthM2), s.Figures.RangeM)
		}
		for i, d := range s.Devices {
			if want := map[bool]float64{true: 200, false: 130}[i == 3]; d.Range != want {
				t.Errorf("device %d at %v m; want %v", i, d.Range, want)
			}
		}
		checkRangedFigures(t, cfg, s)
		var d deviceDoc
		if err := json.Unmarshal(do200(t, h, "/api/device/3"), &d); err != nil {
			t.Fatal(err)
		}
		if d.RangeM == nil || *d.RangeM != 200 || d.FailAddedUncoveredM2 == nil {
			t.Errorf("device 3 after the switch: %+v", d)
		}
		editOK(t, h, `{"op":"range","range":210}`) // the slider, now uniform power growth
		s = editOK(t, h, `{"op":"undo"}`)
		s = editOK(t, h, `{"op":"undo"}`)
		if s.Figures.GrowthM2 != nil || s.Figures.RangeM != 130 {
			t.Errorf("after undoing the switch: growth %v, range %v", ptrText(s.Figures.GrowthM2), s.Figures.RangeM)
		}
		a, _ := json.Marshal(s.Figures)
		b, _ := json.Marshal(s1.Figures)
		if !bytes.Equal(a, b) {
			t.Error("undoing the switch does not give the common-range state before it")
		}
		checkFigures(t, cfg, s)
		checkUndoAll(t, h, s0)
	})
	t.Run("type range", func(t *testing.T) {
		c := demoConfig(t)
		c.Types = make([]string, len(c.Sites))
		c.Types[2], c.Types[5] = "gateway", "gateway"
		sv, err := New(c)
		if err != nil {
			t.Fatal(err)
		}
		h := sv.Handler()
		if s := getState(t, h); s.Figures.Types != nil {
			t.Errorf("types %v offered on a common-range plan", s.Figures.Types)
		}
		s := editOK(t, h, `{"op":"type-range","type":"gateway","range":180}`)
		if s.Devices[2].Range != 180 || s.Devices[5].Range != 180 || s.Devices[0].Range != c.Range || fmt.Sprint(s.Figures.Types) != "[gateway]" {
			t.Errorf("ranges %v %v %v, types %v", s.Devices[2].Range, s.Devices[5].Range, s.Devices[0].Range, s.Figures.Types)
		}
		checkRangedFigures(t, c, s)
	})
	t.Run("bad values", func(t *testing.T) {
		_, h := testServer(t)
		editOK(t, h, `{"op":"range","range":125}`)
		checkRefused(t, h, append(badDeviceRanges,
			refusal{"stale version", `{"op":"device-range","device":1,"range":50,"version":0}`, 409, "changed"}))
	})
}
