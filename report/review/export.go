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
	pts, names := sv.s.activeSites()
	sv.mu.Unlock()
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
		b, ct = sitesGeoJSON(xs, names), "application/geo+json"
	} else {
		b, ct = sitesCSV(xs, names, sv.cfg.Meta.ToLonLat == nil), "text/csv; charset=utf-8"
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
	Type       string            `json:"type"`
	Properties map[string]string `json:"properties"`
	Geometry   gjPoint           `json:"geometry"`
}

// gjPoint is a GeoJSON Point.
type gjPoint struct {
	Type        string     `json:"type"`
	Coordinates [2]float64 `json:"coordinates"`
}

// sitesGeoJSON writes the sites as a FeatureCollection.
func sitesGeoJSON(xs [][2]float64, names []string) []byte {
	fs := make([]gjFeature, len(xs))
	for i, p := range xs {
		props := map[string]string{}
		if names[i] != "" {
			props["name"] = names[i]
		}
		fs[i] = gjFeature{Type: "Feature", Properties: props, Geometry: gjPoint{Type: "Point", Coordinates: p}}
	}
	b, _ := json.MarshalIndent(map[string]any{"type": "FeatureCollection", "features": fs}, "", " ")
	return append(b, '\n')
}

// sitesCSV writes the sites as CSV: name,lat,lon (name,x,y when planar).
func sitesCSV(xs [][2]float64, names []string, planarOut bool) []byte {
	var buf bytes.Buffer
	cw := csv.NewWriter(&buf)
	if planarOut {
		cw.Write([]string{"name", "x", "y"})
	} else {
		cw.Write([]string{"name", "lat", "lon"})
	}
	for i, p := range xs {
		a, b := p[0], p[1]
		if !planarOut {
			a, b = p[1], p[0]
		}
		cw.Write([]string{names[i], strconv.FormatFloat(a, 'f', -1, 64), strconv.FormatFloat(b, 'f', -1, 64)})
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
	pts, names := sv.s.activeSites()
	rng := sv.s.r
	sv.mu.Unlock()
	if !sv.reportMu.TryLock() {
		writeError(w, http.StatusConflict, "a report is being written; try again when it is done")
		return
	}
	defer sv.reportMu.Unlock()
	a, err := coverage.Analyze(pts, sv.cfg.Region, rng, coverage.Options{ChordTolerance: sv.cfg.ChordTolerance})
	if err != nil {
		writeError(w, http.StatusUnprocessableEntity, "%v", err)
		return
	}
	m := sv.cfg.Meta
	m.SiteNames = names
	written, err := report.WriteAnalysis(sv.cfg.OutDir, a, m, report.Options{Maps: true, Charts: true})
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
