// Layout construction, service areas and the uncovered area at one range.
//
// Math: inside the Voronoi cell V_i only site i's disk matters (a point of
// V_i farther than r from p_i is farther than r from every site), so
//
//	uncovered(r) = Σ_i [ area(V_i ∩ A) − area(V_i ∩ A ∩ D(p_i, r)) ],
//
// each polygon–disk term being the closed form summed edge by edge
// (planar.RingDiskArea). A cell whose farthest vertex is within r is covered
// entirely (the clipped cell lies in the convex hull of its vertices and the
// disk is convex), so its term is exactly zero and is skipped; this makes
// the uncovered area exactly 0 at r >= the full-cover range. Each term has
// an absolute rounding error of order 1e-16 times the cell area; the sum is
// taken over fixed chunks in a fixed order, so the result does not depend on
// the number of threads.

package coverage

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// NewLayout triangulates the sites and clips their Voronoi cells to the
// site area. It fails when there are no sites, a site coordinate is not
// finite, the area is nil or has no area, or the geometry kernel rejects the
// input.
func NewLayout(sites []orb.Point, area *planar.Region) (*Layout, error) {
	l, _, _, err := newLayoutTimed(sites, area)
	return l, err
}

// newLayoutTimed is NewLayout returning the seconds spent triangulating and
// clipping.
func newLayoutTimed(sites []orb.Point, area *planar.Region) (*Layout, float64, float64, error) {
	if len(sites) == 0 {
		return nil, 0, 0, errors.New("coverage: no sites")
	}
	if area == nil {
		return nil, 0, 0, errors.New("coverage: no site area (nil region)")
	}
	for i, p := range sites {
		if math.IsNaN(p[0]) || math.IsNaN(p[1]) || math.IsInf(p[0], 0) || math.IsInf(p[1], 0) {
			return nil, 0, 0, fmt.Errorf("coverage: site %d has a non-finite coordinate (%v, %v)", i, p[0], p[1])
		}
	}
	am := area.Area()
	if !(am > 0) || math.IsInf(am, 0) {
		return nil, 0, 0, fmt.Errorf("coverage: site area has no positive finite area (%v m²)", am)
	}
	t0 := time.Now()
	tri, err := planar.Triangulate(sites)
	if err != nil {
		return nil, 0, 0, fmt.Errorf("coverage: triangulating %d sites: %w", len(sites), err)
	}
	t1 := time.Now()
	cells, err := planar.ClipCells(tri, area)
	if err != nil {
		return nil, 0, 0, fmt.Errorf("coverage: clipping Voronoi cells to the site area: %w", err)
	}
	t2 := time.Now()
	l := &Layout{Sites: sites, Area: area, Tri: tri, Cells: cells, AreaM2: am}
	return l, t1.Sub(t0).Seconds(), t2.Sub(t1).Seconds(), nil
}

// numVertices returns the number of triangulation vertices (distinct sites).
func (l *Layout) numVertices() int { return len(l.Cells.SiteStart) - 1 }

// site returns the coordinates of triangulation vertex v.
func (l *Layout) site(v int32) (float64, float64) {
	return l.Tri.Coords[2*v], l.Tri.Coords[2*v+1]
}

// vertexFarthest returns the largest distance from vertex v's site to a
// point of its clipped cell, and that point (-1 distance for an empty cell).
func (l *Layout) vertexFarthest(v int32) (d, x, y float64) {
	c := l.Cells
	cx, cy := l.site(v)
	d = -1
	p0, p1 := c.SiteStart[v], c.SiteStart[v+1]
	if p0 == p1 {
		return d, cx, cy
	}
	k0, k1 := c.PolyStart[p0], c.PolyStart[p1]
	i0, i1 := c.RingStart[k0], c.RingStart[k1]
	xy := c.XY
	for i := i0; i < i1; i++ {
		px, py := xy[2*i], xy[2*i+1]
		dx, dy := px-cx, py-cy
		if e := math.Sqrt(dx*dx + dy*dy); e > d {
			d, x, y = e, px, py
		}
	}
	return d, x, y
}

// ServiceArea returns the entry of ServiceAreas for triangulation vertex
// v, without Merged (the duplicates, which only the whole list gathers).
func (l *Layout) ServiceArea(v int32) ServiceArea {
	d, x, y := l.vertexFarthest(v)
	if d < 0 {
		d = 0
	}
	return ServiceArea{
		Site:          int(l.Tri.Source[v]),
		Vertex:        v,
		Area:          l.Cells.Area[v],
		Share:         l.Cells.Area[v] / l.AreaM2,
		Farthest:      d,
		FarthestPoint: orb.Point{x, y},
	}
}

// UncoveredArea returns the area (m²) of the part of the site area farther
// than r from every site, by the exact closed form summed over cells. r <= 0
// gives the whole area; NaN gives NaN.
func (l *Layout) UncoveredArea(r float64) float64 {
	if math.IsNaN(r) {
		return math.NaN()
	}
	if r <= 0 {
		return l.AreaM2
	}
	return l.uncovered(r, 0, false)
}

// uncovered sums the uncovered area over the cells: each disk of radius r,
// or with perDevice (a layout with per-device ranges) of radius
// √(r_v² + t).
func (l *Layout) uncovered(r, t float64, perDevice bool) float64 {
	weighted := perDevice
	c := l.Cells
	nv := l.numVertices()
	const chunk = 2048
	nc := (nv + chunk - 1) / chunk
	part := make([]float64, nc)
	planar.ParallelChunks(nv, chunk, 0, func(ci, lo, hi int) {
		s := 0.0
		for v := int32(lo); v < int32(hi); v++ {
			a := c.Area[v]
			if a == 0 {
				continue
			}
			rv := r
			if weighted {
				rv = l.grownRadius(v, t)
			}
			d, _, _ := l.vertexFarthest(v)
			if rv >= d {
				continue
			}
			cx, cy := l.site(v)
			cov := 0.0
			if rv > 0 {
				k0, k1 := c.PolyStart[c.SiteStart[v]], c.PolyStart[c.SiteStart[v+1]]
				for k := k0; k < k1; k++ {
					ring := c.XY[2*c.RingStart[k] : 2*c.RingStart[k+1]]
					cov += planar.RingDiskArea(ring, cx, cy, rv)
				}
			}
			u := a - cov
			if u < 0 {
				u = 0
			} else if u > a {
				u = a
			}
			s += u
		}
		part[ci] = s
	})
	s := 0.0
	for _, p := range part {
		s += p
	}
	return s
}

// CoveredFraction returns the fraction of the site area within r of some
// site, in [0, 1].
func (l *Layout) CoveredFraction(r float64) float64 {
	return coveredFromUncovered(l.UncoveredArea(r), l.AreaM2)
}

// coveredFromUncovered converts an uncovered area to a covered fraction,
// clamped to [0, 1].
func coveredFromUncovered(u, area float64) float64 {
	if math.IsNaN(u) {
		return math.NaN()
	}
	f := 1 - u/area
	if f < 0 {
		return 0
	}
	if f > 1 {
		return 1
	}
	return f
}

// ServiceArea is one site's share of the site area: its Voronoi cell
// clipped to the area.
type ServiceArea struct {
	// Site is the input index of the site (the smallest index when several
	// input sites coincide).
	Site int
	// Vertex is the site's triangulation vertex.
	Vertex int32
	// Area is the area of the clipped cell (m²); 0 when the cell misses the
	// site area.
	Area float64
	// Share is Area divided by the site area.
	Share float64
	// Farthest is the largest distance from the site to a point of its
	// clipped cell: the range this site needs to serve its whole share
	// (0 for an empty cell).
	Farthest float64
	// FarthestPoint is a point attaining Farthest (the site itself for an
	// empty cell).
	FarthestPoint orb.Point
	// Merged lists the other input indices at exactly the same position,
	// ascending; nil when there are none.
	Merged []int
}

// ServiceAreas returns one entry per distinct site, ordered by input index.
func (l *Layout) ServiceAreas() []ServiceArea {
	nv := l.numVertices()
	out := make([]ServiceArea, nv)
	planar.ParallelChunks(nv, 4096, 0, func(_, lo, hi int) {
		for v := int32(lo); v < int32(hi); v++ {
			out[v] = l.ServiceArea(v)
		}
	})
	for i, v := range l.Tri.Vertex {
		if v >= 0 && int32(i) != l.Tri.Source[v] {
			out[v].Merged = append(out[v].Merged, i)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Site < out[j].Site })
	return out
}

// FirstServiceAreas returns the first n entries of ServiceAreas (site
// order) and the number of service areas, computing only those n: the
// capped lists of a summary need no more. O(sites) to scan for them and
// their merged duplicates, O(n) cells.
func (l *Layout) FirstServiceAreas(n int) (first []ServiceArea, total int) {
	at := map[int32]int{} // vertex → its index in first
	for i, v := range l.Tri.Vertex {
		if len(first) >= n {
			break
		}
		if v >= 0 && int32(i) == l.Tri.Source[v] {
			at[v] = len(first)
			first = append(first, l.ServiceArea(v))
		}
	}
	for i, v := range l.Tri.Vertex {
		if k, ok := at[v]; ok && int32(i) != l.Tri.Source[v] {
			first[k].Merged = append(first[k].Merged, i)
		}
	}
	return first, l.numVertices()
}
