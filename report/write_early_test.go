package report

import (
	"bytes"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// TestAnalysisWriter checks the two-part write of an analysis: the layers
// started from the layout alone (StartAnalysis, while the analysis would
// still runs) and the rest written by Finish give the same files, byte for byte, as WriteAnalysis of the completed analysis, the
// service areas as WriteCells writes them from the layout's list; Abort
// leaves the previous set and no staging folder; Finish refuses an
// analysis of another layout.
func TestAnalysisWriter(t *testing.T) {
	sites := sitegen.Uniform(3000, 5)
	sites = append(sites, sites[7], sites[100], sites[7]) // merged duplicates
	area := region(t, square(550))
	m := Meta{Planar: true, Command: "analyze"}
	whole := filepath.Join(t.TempDir(), "whole")
	an := analyze(t, sites, area, 8)
	if _, err := WriteAnalysis(whole, an, m, Options{}); err != nil {
		t.Fatal(err)
	}

	t.Run("start then finish", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "split")
		var aw *AnalysisWriter
		var startErr error
		a, err := coverage.Analyze(sites, area, 8, coverage.Options{LayoutReady: func(l *coverage.Layout) {
			aw, startErr = StartAnalysis(dir, l, 8, m, Options{})
		}})
		if err != nil || startErr != nil {
			t.Fatal(err, startErr)
		}
		written, err := aw.Finish(a)
		if err != nil {
			t.Fatal(err)
		}
		names := Files(false, m, Options{})
		if len(written) != len(names) {
			t.Errorf("wrote %v, want %v", written, names)
		}
		for _, f := range names {
			if f == FileManifest || f == FileSummary { // both record the time of the run
				continue
			}
			got, err1 := os.ReadFile(filepath.Join(dir, f))
			want, err2 := os.ReadFile(filepath.Join(whole, f))
			if err1 != nil || err2 != nil || !bytes.Equal(got, want) {
				t.Errorf("%s differs from the whole write (%v, %v)", f, err1, err2)
			}
		}
	})
	t.Run("service areas as the cells report lists them", func(t *testing.T) {
		// Reference: WriteCells, whose layer reads the service-area list
		// (Layout.ServiceAreas) instead of deriving each from the layout.
		dir := filepath.Join(t.TempDir(), "cells")
		if _, err := WriteCells(dir, an.Layout, m, Options{}); err != nil {
			t.Fatal(err)
		}
		f := LayerFile(FileServiceAreas, true)
		got, err1 := os.ReadFile(filepath.Join(whole, f))
		want, err2 := os.ReadFile(filepath.Join(dir, f))
		if err1 != nil || err2 != nil || !bytes.Equal(got, want) {
			t.Errorf("%s differs from the cells report's (%v, %v)", f, err1, err2)
		}
		if !bytes.Contains(got, []byte(`"merged":"3000;3002"`)) {
			t.Errorf("%s lacks the merged duplicates", f)
		}
	})
	t.Run("abort keeps the previous set", func(t *testing.T) {
		before := listDir(t, whole)
		aw, err := StartAnalysis(whole, an.Layout, an.Range, m, Options{})
		if err != nil {
			t.Fatal(err)
		}
		aw.Abort()
		if after := listDir(t, whole); !slices.Equal(before, after) {
			t.Errorf("folder holds %v after the abort, had %v", after, before)
		}
	})
	t.Run("finish refuses another analysis", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "other")
		aw, err := StartAnalysis(dir, an.Layout, an.Range, m, Options{})
		if err != nil {
			t.Fatal(err)
		}
		other := analyze(t, sites, area, 9)
		if _, err := aw.Finish(other); err == nil {
			t.Errorf("Finish accepted the analysis of another layout")
		}
		listDir(t, dir) // no staging debris
	})
}
