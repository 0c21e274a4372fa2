// The review server: one page (embedded assets) and a small JSON API over
// one review session, standard library net/http only.
//
//	GET  /                     the page (assets under /assets/)
//	GET  /api/scene            what never changes: area, exclusions, context, cautions
//	GET  /api/state            devices, range and figures
//	POST /api/edit             one edit (see Edit); answers the new state (its
//	                           device list as a patch when Edit.Patch; with own
//	                           ranges the coverage curve deferred when Edit.Later)
//	GET  /api/curve            the coverage curve now, with the version
//	GET  /api/device/{i}       one device's figures (served area, loss if it fails)
//	GET  /api/cells            service areas (clipped Voronoi cells) for drawing
//	GET  /api/export/{format}  the edited plan as sites GeoJSON or CSV (a download)
//	POST /api/report           write the full report for this plan into the output folder
//
// Robustness: request bodies are limited to MaxBody bytes and decoded
// strictly (unknown fields refused); every number is checked (finite,
// within reach of the area); a refused request answers a 4xx JSON error
// {"error": "..."} and leaves the session unchanged. One mutex serialises
// every access to the session. POSTs need Content-Type application/json
// (a cross-site form cannot send it) and, unless Config.AnyHost, the Host
// header must name a loopback address or localhost (DNS rebinding). The
// server reads no file and writes only the report folder Config.OutDir.

package review

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"net"
	"net/http"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/report"
)

// MaxBody is the largest request body accepted, in bytes.
const MaxBody = 1 << 20

// Config is what a review session starts from. Coordinates are local
// metres (x east, y north).
type Config struct {
	// Sites and Names are the devices as loaded, in input order.
	Sites []orb.Point
	Names []string
	// Region is the site area with its exclusions.
	Region *planar.Region
	// Range is the planned range to start from (metres).
	Range float64
	// Ranges holds each device's own range (m) by input index when the
	// devices have their own (nil: one common range, Range; see ranges.go).
	// Types holds each device's type ("" for none; nil without a type
	// column).
	Ranges []float64
	Types  []string
	// Context holds drawing-only layers (buildings, paths): polygons and
	// points, in local metres.
	Context []orb.MultiPolygon
	// ContextPoints are drawing-only points.
	ContextPoints []orb.Point
	// Meta is the report metadata (title, input files, life safety) used
	// by the page and the full report. Meta.ToLonLat maps the local plane
	// back to longitude/latitude for the saved plan (nil: planar input).
	Meta report.Meta
	// OutDir is the folder "write the full report" writes into; "" turns
	// that off.
	OutDir string
	// AnyHost accepts any Host header (the server listens beyond
	// loopback).
	AnyHost bool
	// ChordTolerance is the outline tolerance of the full report (0:
	// coverage.DefaultChordTolerance). The page's gap outlines use
	// drawChordTolerance.
	ChordTolerance float64

	// reach is how far outside the area's bounding box a device may stand;
	// maxRange the largest range accepted.
	bound    orb.Bound
	reach    float64
	maxRange float64
	// grid is the curve's sample ranges, fixed by the first layout.
	grid []float64
	// typeList is the sorted distinct device types (nil: none).
	typeList []string
}

// Server serves one review session.
type Server struct {
	cfg      Config
	mu       sync.Mutex // guards s
	s        *session
	reportMu sync.Mutex // one report write at a time
	scene    []byte     // the /api/scene answer
}

// New starts a session on cfg and returns its server.
func New(cfg Config) (*Server, error) {
	if cfg.Region == nil {
		return nil, errors.New("review: no site area")
	}
	cfg.bound = cfg.Region.Bound()
	diag := math.Hypot(cfg.bound.Max[0]-cfg.bound.Min[0], cfg.bound.Max[1]-cfg.bound.Min[1])
	cfg.reach = max(diag, minReach)
	cfg.maxRange = max(rangeFactor*diag, minReach)
	if err := cfg.checkRanges(); err != nil {
		return nil, fmt.Errorf("review: %v", err)
	}
	for i, p := range cfg.Sites {
		if err := cfg.checkPoint(p[0], p[1]); err != nil {
			return nil, fmt.Errorf("review: site %d: %v", i, err)
		}
	}
	s, err := newSession(cfg.Sites, cfg.Names, cfg.Range, &cfg)
	if err != nil {
		return nil, fmt.Errorf("review: %v", err)
	}
	sv := &Server{cfg: cfg, s: s}
	if sv.scene, err = json.Marshal(sv.sceneDoc()); err != nil {
		return nil, err
	}
	return sv, nil
}

// Validation bounds.
const (
	// minReach is the least distance (m) outside the area's bounding box
	// a device may stand, and the least range accepted as maximum.
	minReach = 100
	// rangeFactor times the bounding box diagonal is the largest range
	// accepted: far beyond any full-cover range.
	rangeFactor = 10
)

// checkPoint refuses a non-finite point or one far outside the area.
func (c *Config) checkPoint(x, y float64) error {
	if math.IsNaN(x) || math.IsNaN(y) || math.IsInf(x, 0) || math.IsInf(y, 0) {
		return refuse(400, "coordinate (%v, %v) is not finite", x, y)
	}
	b := c.bound
	if x < b.Min[0]-c.reach || x > b.Max[0]+c.reach || y < b.Min[1]-c.reach || y > b.Max[1]+c.reach {
		return refuse(422, "point (%.1f, %.1f) m is more than %.0f m outside the site area's bounding box", x, y, c.reach)
	}
	return nil
}

// checkRange refuses a range that is not positive, finite and plausible.
func (c *Config) checkRange(r float64) error {
	if !(r > 0) || math.IsInf(r, 0) {
		return refuse(400, "range %v m is not a positive finite number", r)
	}
	if r > c.maxRange {
		return refuse(422, "range %.1f m is beyond %.0f m (ten times the site's extent)", r, c.maxRange)
	}
	return nil
}

// checkRanges checks the range, or the devices' own ranges and types; with
// own ranges Range becomes the largest (the slider's start).
func (c *Config) checkRanges() error {
	if c.Types != nil && len(c.Types) != len(c.Sites) {
		return fmt.Errorf("%d types for %d sites", len(c.Types), len(c.Sites))
	}
	for _, t := range c.Types {
		if t != "" && !slices.Contains(c.typeList, t) {
			c.typeList = append(c.typeList, t)
		}
	}
	slices.Sort(c.typeList)
	if c.Ranges == nil {
		return c.checkRange(c.Range)
	}
	if len(c.Ranges) != len(c.Sites) {
		return fmt.Errorf("%d ranges for %d sites", len(c.Ranges), len(c.Sites))
	}
	c.Range = 0
	for i, r := range c.Ranges {
		if err := c.checkRange(r); err != nil {
			return fmt.Errorf("site %d: %v", i, err)
		}
		c.Range = max(c.Range, r)
	}
	return nil
}

// Handler returns the HTTP handler of the page and the API.
func (sv *Server) Handler() http.Handler {
	mux := http.NewServeMux()
	mux.HandleFunc("GET /{$}", sv.page)
	mux.Handle("GET /assets/", http.StripPrefix("/assets/", http.FileServerFS(assetFS())))
	mux.HandleFunc("GET /api/scene", func(w http.ResponseWriter, r *http.Request) {
		writeRaw(w, http.StatusOK, "application/json", sv.scene)
	})
	mux.HandleFunc("GET /api/state", sv.state)
	mux.HandleFunc("POST /api/edit", sv.edit)
	mux.HandleFunc("GET /api/device/{i}", sv.device)
	mux.HandleFunc("GET /api/curve", sv.curve)
	mux.HandleFunc("GET /api/cells", sv.cells)
	mux.HandleFunc("GET /api/export/{format}", sv.export)
	mux.HandleFunc("POST /api/report", sv.writeReport)
	return sv.guard(mux)
}

// guard checks the Host header and the content type of POSTs and sets the
// response headers common to every answer.
func (sv *Server) guard(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("X-Frame-Options", "DENY")
		h.Set("Cache-Control", "no-store")
		h.Set("Content-Security-Policy", "default-src 'self'; img-src 'self' data:; object-src 'none'; frame-ancestors 'none'")
		if !sv.cfg.AnyHost && !loopbackHost(r.Host) {
			writeError(w, http.StatusForbidden, "host %q is not a loopback address", r.Host)
			return
		}
		if r.Method == http.MethodPost {
			ct := r.Header.Get("Content-Type")
			if mt, _, _ := strings.Cut(ct, ";"); strings.TrimSpace(mt) != "application/json" {
				writeError(w, http.StatusUnsupportedMediaType, "POST bodies must be application/json")
				return
			}
			r.Body = http.MaxBytesReader(w, r.Body, MaxBody)
		}
		next.ServeHTTP(w, r)
	})
}

// loopbackHost reports whether a Host header names localhost or a
// loopback address.
func loopbackHost(hostport string) bool {
	host := hostport
	if h, _, err := net.SplitHostPort(hostport); err == nil {
		host = h
	}
	host = strings.Trim(host, "[]")
	if strings.EqualFold(host, "localhost") {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}

// page serves the page.
func (sv *Server) page(w http.ResponseWriter, r *http.Request) {
	writeRaw(w, http.StatusOK, "text/html; charset=utf-8", pageHTML())
}

// state answers the current state.
func (sv *Server) state(w http.ResponseWriter, r *http.Request) {
	sv.mu.Lock()
	d := sv.stateDoc(0, true, false)
	b, err := d.encode()
	sv.mu.Unlock()
	if err != nil {
		writeError(w, http.StatusInternalServerError, "%v", err)
		return
	}
	writeRaw(w, http.StatusOK, "application/json", b)
}

// edit applies one edit and answers the new state.
func (sv *Server) edit(w http.ResponseWriter, r *http.Request) {
	var e Edit
	if status, err := decodeBody(r, &e); err != nil {
		writeError(w, status, "%v", err)
		return
	}
	sv.mu.Lock()
	t0 := time.Now()
	err := sv.s.apply(&e, &sv.cfg)
	var b []byte
	if err == nil {
		d := sv.stateDoc(time.Since(t0), e.Op != "range", e.Later)
		if e.Patch {
			d.patch(sv.s)
		}
		b, err = d.encode()
	}
	sv.mu.Unlock()
	if err != nil {
		writeFailure(w, err)
		return
	}
	writeRaw(w, http.StatusOK, "application/json", b)
}

// decodeBody decodes one JSON value strictly; the status is 413 for a
// body over MaxBody, else 400.
func decodeBody(r *http.Request, v any) (int, error) {
	dec := json.NewDecoder(r.Body)
	dec.DisallowUnknownFields()
	err := dec.Decode(v)
	if err == nil {
		if _, err = dec.Token(); err == io.EOF {
			return 0, nil
		} else if err == nil {
			err = errors.New("more than one value in the body")
		}
	}
	var mb *http.MaxBytesError
	if errors.As(err, &mb) {
		return http.StatusRequestEntityTooLarge, fmt.Errorf("request body over %d bytes", MaxBody)
	}
	return http.StatusBadRequest, fmt.Errorf("bad JSON: %v", err)
}

// writeFailure answers a refused edit (*editError) with its status, any
// other error with 500.
func writeFailure(w http.ResponseWriter, err error) {
	var ee *editError
	if errors.As(err, &ee) {
		writeError(w, ee.status, "%s", ee.msg)
		return
	}
	writeError(w, http.StatusInternalServerError, "%v", err)
}

// curve answers the coverage curve of the plan now, with its version
// (the page applies it only to the state of that version).
func (sv *Server) curve(w http.ResponseWriter, r *http.Request) {
	sv.mu.Lock()
	doc := curveAnswer{Version: sv.s.version, Curve: sv.curveNow()}
	sv.mu.Unlock()
	writeJSON(w, http.StatusOK, doc)
}

// device answers one device's figures.
func (sv *Server) device(w http.ResponseWriter, r *http.Request) {
	i, err := strconv.Atoi(r.PathValue("i"))
	if err != nil {
		writeError(w, http.StatusBadRequest, "device index %q is not a number", r.PathValue("i"))
		return
	}
	sv.mu.Lock()
	doc, err := sv.deviceDoc(i)
	sv.mu.Unlock()
	if err != nil {
		writeFailure(w, err)
		return
	}
	writeJSON(w, http.StatusOK, doc)
}

// cells answers the service areas of the devices in service.
func (sv *Server) cells(w http.ResponseWriter, r *http.Request) {
	sv.mu.Lock()
	doc := sv.cellsDoc()
	sv.mu.Unlock()
	writeJSON(w, http.StatusOK, doc)
}

// writeJSON answers v as JSON.
func writeJSON(w http.ResponseWriter, status int, v any) {
	b, err := json.Marshal(v)
	if err != nil {
		writeError(w, http.StatusInternalServerError, "%v", err)
		return
	}
	writeRaw(w, status, "application/json", b)
}

// writeRaw answers b with the content type ct.
func writeRaw(w http.ResponseWriter, status int, ct string, b []byte) {
	w.Header().Set("Content-Type", ct)
	w.Header().Set("Content-Length", strconv.Itoa(len(b)))
	w.WriteHeader(status)
	w.Write(b)
}

// writeError answers {"error": message}.
func writeError(w http.ResponseWriter, status int, format string, args ...any) {
	var buf bytes.Buffer
	json.NewEncoder(&buf).Encode(map[string]string{"error": fmt.Sprintf(format, args...)})
	writeRaw(w, status, "application/json", buf.Bytes())
}

// activeSites returns the positions and labels of the devices in service.
func (s *session) activeSites() ([]orb.Point, []string) {
	p := s.plan()
	return p.pts, p.names
}

// plan is the devices in service: positions, labels, and with own ranges
// their ranges now (√(b² + t)) and types.
type plan struct {
	pts    []orb.Point
	names  []string
	ranges []float64 // nil: one common range
	types  []string  // nil: no types
}

// plan returns the devices in service.
func (s *session) plan() plan {
	var p plan
	for _, d := range s.devs {
		if !d.On {
			continue
		}
		p.pts = append(p.pts, orb.Point{d.X, d.Y})
		p.names = append(p.names, d.Label)
		if s.ranged {
			p.ranges = append(p.ranges, grown(d.R, s.t))
		}
		p.types = append(p.types, d.Type)
	}
	if !slices.ContainsFunc(p.types, func(t string) bool { return t != "" }) {
		p.types = nil
	}
	return p
}

// deviceIndex maps layout input indices to device indices.
func (g *geometry) deviceIndex(sites []int) []int {
	out := make([]int, len(sites))
	for k, s := range sites {
		out[k] = int(g.active[s])
	}
	return slices.Clip(out)
}

// coveredFraction is 1 − uncovered/area clamped to [0, 1], as
// coverage.Analysis.CoveredFraction.
func coveredFraction(uncovered, area float64) float64 {
	return min(1, max(0, 1-uncovered/area))
}
