// Inputs across the antimeridian.
//
// RFC 7946 §3.1.9 asks a writer to cut a geometry that crosses the
// antimeridian into parts that meet at longitude 180 and −180, and sites
// near it come with longitudes of both signs. The local plane is centred
// on the data (planar.LonLatBound finds the box across ±180°), and each
// longitude reaches the projection as λ = lon − lon₀ reduced to ±180°; but
// the rounding of that reduction differs between lon = 180 and lon = −180,
// so the two copies of a cut edge would land a few ulps apart and the parts
// would overlap or leave a sliver between them.
//
// lonFrame removes that: when the data straddle the antimeridian, every
// longitude is first unwrapped to [0, 360) (lon + 360 for lon < 0, so −180
// becomes exactly 180) and then shifted by −180 into [−180, 180), where the
// shift is exact for the unwrapped values near 180 (Sterbenz: a − b is
// exact for b/2 ≤ a ≤ 2b). The projection used for these shifted
// longitudes is the local plane with its central meridian moved by −180 as
// well, which is the same map. Both copies of a cut vertex thus have
// bit-identical longitudes before projection and identical plane
// coordinates after it.
//
// Merging the adjacent parts into one area is polygon union (planar); until
// then a region made of parts that share an edge is refused by
// planar.NewRegion with its "touch" message.

package siteinput

import (
	"math"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/planar"
)

// lonFrame projects input longitudes/latitudes onto the local plane,
// unwrapping longitudes across the antimeridian (see the file comment).
type lonFrame struct {
	tm    *planar.TransverseMercator // used on the (shifted) longitudes
	shift bool                       // the data straddle ±180°
}

// newLonFrame returns the frame for the local plane tm fitted to data with
// the bound b (planar.LonLatBound: Min.X > Max.X across the antimeridian).
func newLonFrame(tm *planar.TransverseMercator, b orb.Bound) lonFrame {
	if b.Min[0] <= b.Max[0] {
		return lonFrame{tm: tm}
	}
	lon0 := math.Remainder(tm.CentralMeridian()-180, 360)
	return lonFrame{tm: planar.NewTransverseMercator(planar.WGS84, lon0, tm.OriginLatitude(), tm.ScaleFactor(), 0, 0), shift: true}
}

// lon returns the longitude as the frame's projection takes it.
func (f lonFrame) lon(lon float64) float64 {
	if !f.shift {
		return lon
	}
	if lon < 0 {
		lon += 360
	}
	return lon - 180
}

// forward projects one input position to the local plane.
func (f lonFrame) forward(lon, lat float64) (x, y float64) {
	return f.tm.Forward(f.lon(lon), lat)
}
