// Saving the edited plan: the devices in service as a sites file in the
// input formats (GeoJSON Point features with a "name" property, or CSV
// with name and lat/lon columns; x/y for planar input), and the full
// report of the plan written by report.WriteAnalysis, the files analyze
// writes. Geographic output maps the local plane back with Meta.ToLonLat
// (the scene's planar.TransverseMercator.Inverse, the inverse Krüger
// series: round trips agree to well under a millimetre over a site's
// extent).
// Devices switched off are left out: the saved plan is the one in service.

package review

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"net/http"
	"path/filepath"
	"strconv"

	"github.com/sitecover/sitecover/coverage"
	"github.com/sitecover/sitecover/report"
)

// export answers the plan as a download.
func (sv *Server) export(w http.ResponseWriter, r *http.Request) {
	format := r.PathValue("format")
	if format != "geojson" && format != "csv" {
		writeError(w, http.StatusNotFound, "unknown format %q: use geojson or csv", format)
		return
	}
	sv.mu.Lock()
	p := sv.s.plan()
	sv.mu.Unlock()
	pts := p.pts
	xs := make([][2]float64, len(pts))
	for i, p := range pts {
		xs[i] = p
		if inv := sv.cfg.Meta.ToLonLat; inv != nil {
			lon, lat := inv(p[0], p[1])
			xs[i] = [2]float64{roundDegrees(lon), roundDegrees(lat)}
		}
	}
	var b []byte
	var ct string
	if format == "geojson" {
		b, ct = sitesGeoJSON(xs, p), "application/geo+json"
	} else {
		b, ct = sitesCSV(xs, p, sv.cfg.Meta.ToLonLat == nil), "text/csv; charset=utf-8"
	}
	name := "sites-reviewed." + format
	if sv.cfg.Meta.ToLonLat == nil {
		name = "sites-reviewed-xy." + format
	}
	w.Header().Set("Content-Disposition", `attachment; filename="`+name+`"`)
	writeRaw(w, http.StatusOK, ct, b)
}

// degreeScale rounds saved longitudes and latitudes to 1e-9°, about
// 0.1 mm on the ground: far below any survey, and it keeps the inverse
// projection's last-bit noise (44.37383490000001) out of the file.
const degreeScale = 1e9

// roundDegrees rounds an angle to 1/degreeScale degrees.
func roundDegrees(v float64) float64 { return math.Round(v*degreeScale) / degreeScale }

// gjFeature is one GeoJSON point feature of the saved plan.
type gjFeature struct {
	Type       string         `json:"type"`
	Properties map[string]any `json:"properties"`
	Geometry   gjPoint        `json:"geometry"`
}

// rangeDecimals writes saved ranges to the millimetre.
const rangeDecimals = 3

// savedRange is a saved range: metres rounded to rangeDecimals.
func savedRange(r float64) string { return strconv.FormatFloat(r, 'f', rangeDecimals, 64) }

// gjPoint is a GeoJSON Point.
type gjPoint struct {
	Type        string     `json:"type"`
	Coordinates [2]float64 `json:"coordinates"`
}

// sitesGeoJSON writes the sites as a FeatureCollection, with "range"
// (metres) and "type" properties when the plan has them.
func sitesGeoJSON(xs [][2]float64, pl plan) []byte {
	fs := make([]gjFeature, len(xs))
	for i, p := range xs {
		props := map[string]any{}
		if pl.names[i] != "" {
			props["name"] = pl.names[i]
		}
		if pl.ranges != nil {
			props["range"] = json.Number(savedRange(pl.ranges[i]))
		}
		if pl.types != nil && pl.types[i] != "" {
			props["type"] = pl.types[i]
		}
		fs[i] = gjFeature{Type: "Feature", Properties: props, Geometry: gjPoint{Type: "Point", Coordinates: p}}
	}
	b, _ := json.MarshalIndent(map[string]any{"type": "FeatureCollection", "features": fs}, "", " ")
	return append(b, '\n')
}

// sitesCSV writes the sites as CSV: name,lat,lon (name,x,y when planar),
// then range (metres) and type columns when the plan has them.
func sitesCSV(xs [][2]float64, pl plan, planarOut bool) []byte {
	var buf bytes.Buffer
	cw := csv.NewWriter(&buf)
	head := []string{"name", "lat", "lon"}
	if planarOut {
		head = []string{"name", "x", "y"}
	}
	if pl.ranges != nil {
		head = append(head, "range")
	}
	if pl.types != nil {
		head = append(head, "type")
	}
	cw.Write(head)
	for i, p := range xs {
		a, b := p[0], p[1]
		if !planarOut {
			a, b = p[1], p[0]
		}
		row := []string{pl.names[i], strconv.FormatFloat(a, 'f', -1, 64), strconv.FormatFloat(b, 'f', -1, 64)}
		if pl.ranges != nil {
			row = append(row, savedRange(pl.ranges[i]))
		}
		if pl.types != nil {
			row = append(row, pl.types[i])
		}
		cw.Write(row)
	}
	cw.Flush()
	return buf.Bytes()
}

// reportDoc is the /api/report answer.
type reportDoc struct {
	Dir   string   `json:"dir"`
	Files []string `json:"files"`
}

// writeReport writes the full report of the plan in service into
// Config.OutDir: coverage.Analyze on the devices in service at the range,
// then report.WriteAnalysis.
func (sv *Server) writeReport(w http.ResponseWriter, r *http.Request) {
	var none struct{}
	if status, err := decodeBody(r, &none); err != nil {
		writeError(w, status, "%v", err)
		return
	}
	if sv.cfg.OutDir == "" {
		writeError(w, http.StatusForbidden, "no output folder was given (--out)")
		return
	}
	sv.mu.Lock()
	p := sv.s.plan()
	rng := sv.s.r
	sv.mu.Unlock()
	if !sv.reportMu.TryLock() {
		writeError(w, http.StatusConflict, "a report is being written; try again when it is done")
		return
	}
	defer sv.reportMu.Unlock()
	m := sv.cfg.Meta
	m.SiteNames = p.names
	m.Ranges, m.Types = p.ranges, p.types
	opt := coverage.Options{ChordTolerance: sv.cfg.ChordTolerance}
	var written []string
	var err error
	if p.ranges != nil {
		// own ranges: the files analyze writes for a range column
		var a *coverage.RangesAnalysis
		if a, err = coverage.AnalyzeRanges(p.pts, p.ranges, sv.cfg.Region, opt); err != nil {
			writeError(w, http.StatusUnprocessableEntity, "%v", err)
			return
		}
		written, err = report.WriteRangesAnalysis(sv.cfg.OutDir, a, m, report.Options{Maps: true, Charts: true})
	} else {
		var a *coverage.Analysis
		if a, err = coverage.Analyze(p.pts, sv.cfg.Region, rng, opt); err != nil {
			writeError(w, http.StatusUnprocessableEntity, "%v", err)
			return
		}
		written, err = report.WriteAnalysis(sv.cfg.OutDir, a, m, report.Options{Maps: true, Charts: true})
	}
	if err != nil {
		writeError(w, http.StatusInternalServerError, "%v", err)
		return
	}
	doc := reportDoc{Dir: sv.cfg.OutDir}
	for _, p := range written {
		doc.Files = append(doc.Files, filepath.Base(p))
	}
	writeJSON(w, http.StatusOK, doc)
}
