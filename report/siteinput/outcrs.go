// The output system on request (Inputs.OutCRS, the CLI's --out-crs): the
// layers are always written in WGS84 longitude/latitude (RFC 7946), and
// with OutCRS also in a projected system of crs.go, either the input's
// ("input": the system of the first input given in one, sites first, then
// area, exclusions and the planning inputs) or one named by its EPSG code.
//
// Points go from the local plane to longitude/latitude (the local
// transverse Mercator's inverse) and on to the grid (the grid's forward
// series), both Krüger series of planar/projection.go exact to
// nanometres, so a site read from the grid is written back to within the
// output rounding (1 mm); the forward series is checked against PROJ's
// cs2cs to 1 mm (testdata/ref_crs.py, and report's outcrs tests).

package siteinput

import (
	"strings"

	"github.com/paulmach/orb"
)

// FromLonLat converts WGS84 longitude/latitude to the system's x/y
// (easting/northing in metres; longitude/latitude unchanged for a
// geographic system).
func (c *CRS) FromLonLat(lon, lat float64) (x, y float64) {
	if c.TM == nil {
		return lon, lat
	}
	return c.TM.Forward(lon, lat)
}

// resolveOutCRS sets sc.OutCRS from in.OutCRS: "" for none, "input" for
// the first projected system of the inputs (inputCRS), else an EPSG code.
// The sites (WGS84 longitude/latitude) must be positions of that system.
func (sc *Scene) resolveOutCRS(in Inputs, inputCRS *CRS, sites []orb.Point) error {
	v := strings.TrimSpace(in.OutCRS)
	if v == "" {
		return nil
	}
	if in.Planar {
		return errorf("--out-crs: with --planar the coordinates are local metres in no coordinate reference system: drop --out-crs")
	}
	c := inputCRS
	if strings.EqualFold(v, "input") {
		if c == nil {
			return errorf("--out-crs input: every input is in WGS84 longitude/latitude, which the layers are written in anyway (give --out-crs EPSG:NNNN for a projected copy)")
		}
	} else {
		var err error
		if c, err = ParseCRS(v); err != nil {
			return errorf("--out-crs: %v", err)
		}
		if c.TM == nil {
			return errorf("--out-crs: %s is longitude/latitude, which the layers are written in anyway: name a projected system (%s)", c.Label(), SupportedCRS)
		}
	}
	for i, p := range sites {
		x, y := c.FromLonLat(p[0], p[1])
		if _, problem := c.toLonLat(x, y); problem != "" {
			return errorf("--out-crs %s: site %s (%.7f°, %.7f°) is outside that grid: %s", c.Code, DeviceLabel(sc.Names, i), p[1], p[0], problem)
		}
	}
	sc.OutCRS = c
	return nil
}
