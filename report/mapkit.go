// The map kit every PNG map shares, analysis and planning alike: the page
// laid out over an extent with the legend (mapKey, layoutMap), the frame,
// scale bar, north arrow and legend drawn last (finish), titles and the
// notes on orientation and density, and the text forms of lengths and
// areas used on maps.
//
// Site density decides what a map can show: the mean spacing of the sites
// on the page is √(A k² / n) px for a site area of A m², n distinct sites
// and k px/m. Marks shrink, and labels, disk outlines and cell edges are
// dropped, as the spacing falls below a few layout units.

package report

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// mapKey is what a map's legend shows: its items, its notes and a small
// table below them (first row the heads; numeric columns right-aligned).
type mapKey struct {
	items []legendItem
	notes []string
	table [][]string
}

// layoutMap closes key with the area legend and, when the sites are too
// dense to tell apart at this width, a note that dense (what cannot be
// told apart) is best seen in a GIS; it then lays out the page over ext
// and returns it with the site density on it.
func (s *scene) layoutMap(ext orb.Bound, width int, key *mapKey, dense string) (*canvas, density, error) {
	key.items = append(key.items, s.areaLegend()...)
	if n := s.denseNote(width, dense); n != "" {
		key.notes = append(key.notes, n)
	}
	c, err := layoutCanvas(ext, width, key.items, key.notes, len(key.table))
	if err != nil {
		return nil, density{}, err
	}
	return c, s.density(c), nil
}

// finish draws what frames every map: the frame, the scale bar, the
// north arrow and the legend of key.
func (c *canvas) finish(key mapKey) {
	c.frame()
	c.scaleBar()
	c.northArrow()
	c.legend(key.items)
	c.keyTable(key.table)
}

// encodeMap encodes a drawn map as PNG, or passes on the drawing error.
func encodeMap(c *canvas, err error) ([]byte, error) {
	if err != nil {
		return nil, err
	}
	return c.encode()
}

// titled returns a map or report title: base, then the report title if
// any.
func (s *scene) titled(base string) string {
	if s.m.Title != "" {
		return base + ": " + s.m.Title
	}
	return base
}

// northNote is the map note on orientation and the plane drawn in.
func (s *scene) northNote() string {
	return "North up: the y axis of the local plane (grid north). " + s.planeNote()
}

func (s *scene) planeNote() string {
	if s.geographic() {
		p := s.projection()
		if p == "" {
			return "Drawn in the local plane."
		}
		return "Local plane: " + p + "."
	}
	return "Coordinates: local plane x/y in metres, as given."
}

// areaLegend returns the legend items that close every map legend: the
// site area outline and, when there are any, the exclusion zones.
func (s *scene) areaLegend() []legendItem {
	items := []legendItem{{"Site area outline", swatchLine(colInk, 2.2)}}
	if ar := s.l.Area; ar != nil && ar.NumRings() > ar.NumPolygons() {
		items = append(items, legendItem{"Exclusion zone (no coverage needed)", swatchHatch})
	}
	return items
}

func haText(m2 float64) string {
	if m2 >= 1e6 {
		return fmt.Sprintf("%.3f km² (%.1f ha)", m2/1e6, m2/1e4)
	}
	return fmt.Sprintf("%.0f m² (%.2f ha)", m2, m2/1e4)
}

func metresShort(v float64) string {
	if v >= 10000 {
		return trimFloat(math.Round(v/10)/100) + " km"
	}
	return trimFloat(math.Round(v*100)/100) + " m"
}

// density describes how crowded the sites are on the page.
type density struct {
	spacing float64 // mean site spacing in px
}

func (s *scene) density(c *canvas) density { return s.densityAt(c.k) }

// densityAt returns the site density at scale k px/m.
func (s *scene) densityAt(k float64) density {
	n := 1
	if s.l.Tri != nil {
		n = max(s.l.Tri.NumVertices(), 1)
	} else if len(s.l.Sites) > 0 {
		n = len(s.l.Sites)
	}
	// spacing over the area actually drawn
	a := s.l.AreaM2 * k * k
	if !(a > 0) {
		return density{spacing: math.Inf(1)}
	}
	return density{spacing: math.Sqrt(a / float64(n))}
}

func (d density) siteRadius(u float64) float64 {
	switch {
	case d.spacing >= 30*u:
		return 4.5 * u
	case d.spacing >= 10*u:
		return 2.5 * u
	default:
		return math.Max(0.8, math.Min(1.5*u, d.spacing/5))
	}
}

// denseNote returns a map note when the sites are too dense to show one
// by one at this width, or "".
func (s *scene) denseNote(width int, what string) string {
	u := float64(width) / 1600
	k, _ := frameScale(s.extent(), float64(width)-56*u)
	d := s.densityAt(k)
	if d.spacing >= 8*u {
		return ""
	}
	return fmt.Sprintf("Sites are %.1f px apart on average at this width: %s cannot be told apart here; use %s in a GIS.", d.spacing, what, "the GeoJSON layers")
}
