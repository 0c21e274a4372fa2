// Ellipsoidal transverse Mercator projection by the Krüger series, following
// Karney, "Transverse Mercator with an accuracy of a few nanometers",
// J. Geodesy 85 (2011) 475–485.
//
// With third flattening n = f/(2−f), eccentricity e = √(f(2−f)) and
// rectifying radius A = a/(1+n)·(1 + n²/4 + n⁴/64 + n⁶/256):
//
//  1. Conformal latitude: τ = tan φ, σ = sinh(e·atanh(e·τ/√(1+τ²))),
//     τ′ = τ√(1+σ²) − σ√(1+τ²)  (Karney eq. 7–9).
//  2. Spherical (Gauss–Schreiber) transverse Mercator of the conformal
//     sphere, λ measured from the central meridian:
//     ξ′ = atan2(τ′, cos λ), η′ = asinh(sin λ / √(τ′² + cos² λ)).
//  3. Krüger's series with ζ = ξ + iη:
//     ζ = ζ′ + Σⱼ αⱼ sin(2jζ′),  j = 1..6,  x = k₀Aη, y = k₀Aξ,
//     and for the inverse ζ′ = ζ − Σⱼ βⱼ sin(2jζ), then τ′ = sin ξ′ /
//     √(sinh² η′ + cos² ξ′), λ = atan2(sinh η′, cos ξ′); the latitude φ
//     from the conformal latitude χ = atan τ′ by the series
//     φ = χ + Σⱼ δⱼ sin(2jχ), j = 1..6, to order n⁶ (the classical series
//     in n, coefficients recalled from memory and checked: evaluated in 40
//     digits its truncation error is below 1e-17 rad, 0.1 nm, for WGS84 and
//     Clarke 1866, and the tests compare it with Newton's inversion of the
//     exact τ′(τ) of step 1, Karney eq. 19–21). It needs no iteration and
//     no transcendental function beyond χ's atan2.
//  4. Point scale: k = k₀ (A/a) |1 + Σⱼ 2jαⱼ cos(2jζ′)| ·
//     √(1 − e² sin² φ) √(1+τ²) / √(τ′² + cos² λ)  (Karney eq. 25–28).
//
// The coefficients αⱼ, βⱼ are Krüger's series to order n⁶ (Karney eq. 35
// and 36; checked against the same values in PROJ's Poder/Engsager tmerc).
// The sums are evaluated by Clenshaw's recurrence in complex arithmetic.
//
// Error bound: Karney reports that the sixth-order series is accurate to
// about 5 nm within 3900 km of the central meridian (value recalled from
// memory); the tests here confirm agreement with PROJ to well below a
// millimetre within 3° of the central meridian. Float64 rounding adds a
// few nanometres on a 10⁷ m northing. The series is not meant for points
// far from the central meridian (it diverges towards λ = ±90° on the
// equator); this package only uses it for local planes, where the point
// scale stays within MaxLocalScaleError of 1.
//
// The origin latitude lat0 works like PROJ's +lat_0: y is measured from the
// meridian arc at lat0 (the series value of ξ at (lat0, λ = 0)).
package planar

import (
	"errors"
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// Ellipsoid is a reference ellipsoid of revolution.
type Ellipsoid struct {
	// A is the semi-major axis in metres.
	A float64
	// F is the flattening (a − b)/a.
	F float64
}

// WGS84 is the World Geodetic System 1984 ellipsoid (NIMA TR8350.2).
var WGS84 = Ellipsoid{A: 6378137, F: 1 / 298.257223563}

// Clarke1866 is the Clarke 1866 ellipsoid (a = 6378206.4 m, b = 6356583.8
// m), as used by Snyder's worked examples.
var Clarke1866 = Ellipsoid{A: 6378206.4, F: 1 / 294.978698214}

// MaxLocalScaleError is the largest point-scale error |k − 1| accepted over
// an area mapped to one local plane: 0.1 %. With k₀ = 1 it is reached about
// 285 km from the central meridian, so one plane serves an area up to about
// 570 km wide.
const MaxLocalScaleError = 0.001

const krugerOrder = 6

// TransverseMercator is an ellipsoidal transverse Mercator projection. It is
// immutable after construction and safe for concurrent use.
type TransverseMercator struct {
	ell        Ellipsoid
	lon0, lat0 float64 // degrees
	k0, fe, fn float64
	err        error // non-nil for invalid parameters

	e2, e      float64 // eccentricity squared, eccentricity
	ka         float64 // k0 * A
	scaleConst float64 // k0 * A / a
	y0         float64 // k0 * A * ξ at (lat0, λ = 0)
	alpha      [krugerOrder + 1]float64
	beta       [krugerOrder + 1]float64
	delta      [krugerOrder + 1]float64 // conformal to geodetic latitude
}

// NewTransverseMercator returns the transverse Mercator projection of
// ellipsoid e with central meridian lon0 and origin latitude lat0 (degrees),
// central scale factor k0 and false easting and northing (metres).
//
// Invalid parameters (a non-positive or non-finite semi-major axis, a
// flattening outside [0, 1), a non-positive scale factor, an origin
// outside the valid longitude/latitude range) do not panic: the result's
// Err method reports the problem and its Forward, Inverse and Scale return
// NaN.
func NewTransverseMercator(e Ellipsoid, lon0, lat0, k0, falseEasting, falseNorthing float64) *TransverseMercator {
	tm := &TransverseMercator{ell: e, lon0: lon0, lat0: lat0, k0: k0, fe: falseEasting, fn: falseNorthing}
	switch {
	case !(e.A > 0) || math.IsInf(e.A, 0):
		tm.err = fmt.Errorf("planar: ellipsoid semi-major axis %v is not a positive finite number", e.A)
	case !(e.F >= 0 && e.F < 1):
		tm.err = fmt.Errorf("planar: ellipsoid flattening %v is outside [0, 1)", e.F)
	case !(k0 > 0) || math.IsInf(k0, 0):
		tm.err = fmt.Errorf("planar: scale factor %v is not a positive finite number", k0)
	case math.IsNaN(falseEasting) || math.IsInf(falseEasting, 0) || math.IsNaN(falseNorthing) || math.IsInf(falseNorthing, 0):
		tm.err = fmt.Errorf("planar: false easting/northing %v, %v are not finite", falseEasting, falseNorthing)
	default:
		if err := ValidLonLat(lon0, lat0); err != nil {
			tm.err = fmt.Errorf("planar: projection origin: %w", err)
		}
	}
	if tm.err != nil {
		return tm
	}

	f := e.F
	n := f / (2 - f)
	tm.e2 = f * (2 - f)
	tm.e = math.Sqrt(tm.e2)
	n2 := n * n
	rect := e.A / (1 + n) * (1 + n2/4 + n2*n2/64 + n2*n2*n2/256)
	tm.ka = k0 * rect
	tm.scaleConst = k0 * rect / e.A

	// Krüger's coefficients to order n⁶ (Karney 2011, eq. 35 and 36).
	n3, n4, n5, n6 := n2*n, n2*n2, n2*n2*n, n2*n2*n2
	tm.alpha = [krugerOrder + 1]float64{0,
		n/2 - 2*n2/3 + 5*n3/16 + 41*n4/180 - 127*n5/288 + 7891*n6/37800,
		13*n2/48 - 3*n3/5 + 557*n4/1440 + 281*n5/630 - 1983433*n6/1935360,
		61*n3/240 - 103*n4/140 + 15061*n5/26880 + 167603*n6/181440,
		49561*n4/161280 - 179*n5/168 + 6601661*n6/7257600,
		34729*n5/80640 - 3418889*n6/1995840,
		212378941 * n6 / 319334400,
	}
	tm.beta = [krugerOrder + 1]float64{0,
		n/2 - 2*n2/3 + 37*n3/96 - n4/360 - 81*n5/512 + 96199*n6/604800,
		n2/48 + n3/15 - 437*n4/1440 + 46*n5/105 - 1118711*n6/3870720,
		17*n3/480 - 37*n4/840 - 209*n5/4480 + 5569*n6/90720,
		4397*n4/161280 - 11*n5/504 - 830251*n6/7257600,
		4583*n5/161280 - 108847*n6/3991680,
		20648693 * n6 / 638668800,
	}
	tm.delta = [krugerOrder + 1]float64{0,
		2*n - 2*n2/3 - 2*n3 + 116*n4/45 + 26*n5/45 - 2854*n6/675,
		7*n2/3 - 8*n3/5 - 227*n4/45 + 2704*n5/315 + 2323*n6/945,
		56*n3/15 - 136*n4/35 - 1262*n5/105 + 73814*n6/2835,
		4279*n4/630 - 332*n5/35 - 399572*n6/14175,
		4174*n5/315 - 144838*n6/6237,
		601676 * n6 / 22275,
	}

	xi0, _, _ := tm.series(0, lat0)
	tm.y0 = tm.ka * xi0
	return tm
}

// Err reports why the projection's parameters are invalid, or nil.
func (tm *TransverseMercator) Err() error { return tm.err }

// Ellipsoid returns the projection's ellipsoid.
func (tm *TransverseMercator) Ellipsoid() Ellipsoid { return tm.ell }

// CentralMeridian returns the longitude of the central meridian in degrees.
func (tm *TransverseMercator) CentralMeridian() float64 { return tm.lon0 }

// OriginLatitude returns the latitude of origin in degrees: Forward gives
// y = false northing on the central meridian there.
func (tm *TransverseMercator) OriginLatitude() float64 { return tm.lat0 }

// ScaleFactor returns k₀, the point scale on the central meridian.
func (tm *TransverseMercator) ScaleFactor() float64 { return tm.k0 }

// FalseOrigin returns the false easting and false northing in metres.
func (tm *TransverseMercator) FalseOrigin() (easting, northing float64) { return tm.fe, tm.fn }

// sincos2 returns sin and cos of 2ξ + 2iη. sinh and cosh of 2η come from
// one expm1: with m = e^{2η} − 1, sinh = m(m + 2)/(2(m + 1)) (no
// cancellation for small η) and cosh = ((m + 1) + 1/(m + 1))/2.
func sincos2(xi, eta float64) (s, c complex128) {
	s2, c2 := math.Sincos(2 * xi)
	m := math.Expm1(2 * eta)
	e := m + 1
	sh, ch := m*(m+2)/(2*e), (e+1/e)/2
	if math.IsInf(m, 1) { // |η| beyond any point of the plane: keep the limits
		sh, ch = math.Sinh(2*eta), math.Cosh(2*eta)
	}
	return complex(s2*ch, c2*sh), complex(c2*ch, -s2*sh)
}

// clenshaw returns Σⱼ c[j] sin(2jζ) and 1 + Σⱼ 2j c[j] cos(2jζ), j = 1..6,
// for ζ = ξ + iη, by Clenshaw's recurrence with the shared 2cos(2ζ).
func clenshaw(c *[krugerOrder + 1]float64, xi, eta float64) (sum, deriv complex128) {
	s, co := sincos2(xi, eta)
	two := 2 * co
	var b1, b2, d1, d2 complex128 // b_{k+1}, b_{k+2} and the derivative's
	for j := krugerOrder; j >= 1; j-- {
		b1, b2 = complex(c[j], 0)+two*b1-b2, b1
		d1, d2 = complex(2*float64(j)*c[j], 0)+two*d1-d2, d1
	}
	return b1 * s, 1 + d1*co - d2
}

// clenshawSumAt is the sum of clenshaw alone (the inverse needs no
// derivative), from s = sin 2ζ and co = cos 2ζ.
func clenshawSumAt(c *[krugerOrder + 1]float64, s, co complex128) complex128 {
	two := 2 * co
	var b1, b2 complex128
	for j := krugerOrder; j >= 1; j-- {
		b1, b2 = complex(c[j], 0)+two*b1-b2, b1
	}
	return b1 * s
}

// hypot1 returns √(1 + x²) (math.Hypot(1, x) without its scaling: x² only
// overflows beyond 1e154, where the result is |x| to the last bit).
func hypot1(x float64) float64 {
	if ax := math.Abs(x); ax >= 1e150 {
		return ax
	}
	return math.Sqrt(1 + x*x)
}

// taupf returns τ′, the tangent of the conformal latitude, for τ = tan φ.
func taupf(tau, e float64) float64 {
	tau1 := hypot1(tau)
	sig := math.Sinh(e * math.Atanh(e*tau/tau1))
	return hypot1(sig)*tau - sig*tau1
}

// geodeticLatitude returns the latitude φ (radians) whose conformal
// latitude χ has sin χ ∝ s and cos χ ∝ r (r ≥ 0, not both zero), with
// h = √(s² + r²) given, by the series φ = χ + Σⱼ δ[j] sin(2jχ) (file
// comment), summed by Clenshaw's recurrence from sin 2χ and cos 2χ
// computed from s, r and h directly.
func geodeticLatitude(delta *[krugerOrder + 1]float64, s, r, h float64) float64 {
	chi := math.Atan2(s, r)
	sc, cc := s/h, r/h // sin χ, cos χ
	sin2, cos2 := 2*sc*cc, (cc-sc)*(cc+sc)
	two := 2 * cos2
	var b1, b2 float64
	for j := krugerOrder; j >= 1; j-- {
		b1, b2 = delta[j]+two*b1-b2, b1
	}
	return chi + b1*sin2
}

const deg = math.Pi / 180

// series evaluates the forward series at longitude lam (degrees from the
// central meridian) and latitude lat (degrees), returning ξ, η and the
// point scale k.
func (tm *TransverseMercator) series(lam, lat float64) (xi, eta, k float64) {
	phi := lat * deg
	// At the poles math.Tan(±π/2 rounded) is about ±1.6e16, finite, and
	// the formulas below reach the correct limits (ξ′ = ±π/2, η′ = 0).
	tau := math.Tan(phi)
	sinl, cosl := math.Sincos(lam * deg)
	taup := taupf(tau, tm.e)
	hyp := math.Hypot(taup, cosl)
	xip := math.Atan2(taup, cosl)
	etap := math.Asinh(sinl / hyp)
	sum, der := clenshaw(&tm.alpha, xip, etap)
	sphi := math.Sin(phi)
	kp := math.Sqrt(1-tm.e2*sphi*sphi) * math.Hypot(1, tau) / hyp
	return xip + real(sum), etap + imag(sum), tm.scaleConst * math.Hypot(real(der), imag(der)) * kp
}

// lambda returns lon − lon0 reduced to [−180, 180].
func (tm *TransverseMercator) lambda(lon float64) float64 {
	return math.Remainder(lon-tm.lon0, 360)
}

// Forward projects longitude and latitude (degrees) to easting x and
// northing y (metres). Inputs outside the valid range (see ValidLonLat)
// give NaN.
func (tm *TransverseMercator) Forward(lon, lat float64) (x, y float64) {
	if tm.err != nil || ValidLonLat(lon, lat) != nil {
		return math.NaN(), math.NaN()
	}
	xi, eta, _ := tm.series(tm.lambda(lon), lat)
	return tm.fe + tm.ka*eta, tm.fn + tm.ka*xi - tm.y0
}

// Scale returns the point scale factor k at longitude and latitude
// (degrees): the ratio of a short distance in the plane to the same
// distance on the ellipsoid. Inputs outside the valid range give NaN.
func (tm *TransverseMercator) Scale(lon, lat float64) float64 {
	if tm.err != nil || ValidLonLat(lon, lat) != nil {
		return math.NaN()
	}
	_, _, k := tm.series(tm.lambda(lon), lat)
	return k
}

// Inverse maps easting x and northing y (metres) back to longitude and
// latitude (degrees); longitude is reduced to [−180, 180]. Non-finite input
// gives NaN.
//
// The correction ζ − ζ′ = Σⱼ βⱼ sin(2jζ) is small (|β₁| ≈ n/2 ≈ 8.4e-4 for
// WGS84, so below 1e-3 anywhere on a local plane), and ξ′, η′ are reached
// from ξ, η by it without new transcendental functions: sin ξ′ and cos ξ′
// by the angle difference with the sine and cosine of the correction from
// their Taylor series, e^{η′} − 1 from e^η − 1 and the series of e^{−Δη} − 1
// (inverseSmall, whose truncation is far below the rounding of the
// evaluation). cosh η′ is √(sinh² η′ + cos² ξ′ + sin² ξ′), so the
// conformal latitude's hypotenuse needs no hypot call. A larger
// correction (far off the central meridian, outside any local plane)
// takes the direct route, inverseDirect.
func (tm *TransverseMercator) Inverse(x, y float64) (lon, lat float64) {
	if tm.err != nil || math.IsNaN(x) || math.IsInf(x, 0) || math.IsNaN(y) || math.IsInf(y, 0) {
		return math.NaN(), math.NaN()
	}
	xi := (y - tm.fn + tm.y0) / tm.ka
	eta := (x - tm.fe) / tm.ka
	sx, cx := math.Sincos(xi)
	m := math.Expm1(eta) // e^η − 1
	m2 := m * (m + 2)    // e^{2η} − 1
	e2 := m2 + 1
	sh2, ch2 := m2*(m2+2)/(2*e2), (e2+1/e2)/2 // sinh 2η, cosh 2η
	s2, c2 := 2*sx*cx, (cx-sx)*(cx+sx)        // sin 2ξ, cos 2ξ
	sum := clenshawSumAt(&tm.beta, complex(s2*ch2, c2*sh2), complex(c2*ch2, -s2*sh2))
	dxi, deta := real(sum), imag(sum)
	if !(math.Abs(dxi) < smallCorrection && math.Abs(deta) < smallCorrection) || math.IsInf(e2, 0) {
		return tm.inverseDirect(xi-dxi, eta-deta)
	}
	sd, cd, ed := inverseSmall(dxi, -deta)
	s := sx*cd - cx*sd  // sin ξ′
	c := cx*cd + sx*sd  // cos ξ′
	mp := m*(ed+1) + ed // e^{η′} − 1
	ep := mp + 1
	sh, ch := mp*(mp+2)/(2*ep), (ep+1/ep)/2 // sinh η′, cosh η′
	return tm.lonLat(s, c, sh, ch)
}

// smallCorrection bounds the Krüger correction for which Inverse uses
// the Taylor series of inverseSmall.
const smallCorrection = 1.0 / 64

// inverseSmall returns sin d, cos d and e^g − 1 for |d|, |g| <
// smallCorrection by their Taylor series (Horner form, coefficients
// 1/k! rounded: a relative error of 1e-16 in a term below 1e-6) through
// d⁷, d⁶ and g⁷. The first omitted terms are at most (1/64)⁹/9! ≈ 1.8e-22,
// (1/64)⁸/8! ≈ 7e-20 and (1/64)⁸/8! ≈ 7e-20, far below the rounding of
// the sums (on a local plane, where |d|, |g| < 1e-3, below 1e-28).
func inverseSmall(d, g float64) (sd, cd, eg float64) {
	const (
		f2 = 1.0 / 2
		f3 = 1.0 / 6
		f4 = 1.0 / 24
		f5 = 1.0 / 120
		f6 = 1.0 / 720
		f7 = 1.0 / 5040
	)
	d2 := d * d
	sd = d + d*d2*(-f3+d2*(f5-d2*f7))
	cd = 1 + d2*(-f2+d2*(f4-d2*f6))
	eg = g + g*g*(f2+g*(f3+g*(f4+g*(f5+g*(f6+g*f7)))))
	return sd, cd, eg
}

// inverseDirect finishes Inverse from ξ′, η′ with their sine, cosine and
// hyperbolic sine computed directly.
func (tm *TransverseMercator) inverseDirect(xip, etap float64) (lon, lat float64) {
	s, c := math.Sincos(xip)
	sh := math.Sinh(etap)
	return tm.lonLat(s, c, sh, math.Cosh(etap))
}

// lonLat returns longitude and latitude (degrees) from sin ξ′, cos ξ′,
// sinh η′ and cosh η′: λ = atan2(sinh η′, cos ξ′) and the conformal
// latitude χ with sin χ ∝ sin ξ′, cos χ ∝ √(sinh² η′ + cos² ξ′), whose
// hypotenuse is cosh η′.
func (tm *TransverseMercator) lonLat(s, c, sh, ch float64) (lon, lat float64) {
	r := math.Sqrt(sh*sh + c*c)
	if math.IsInf(sh*sh, 0) {
		r = math.Hypot(sh, c)
	}
	var phi, lam float64
	if r != 0 {
		phi = geodeticLatitude(&tm.delta, s, r, ch)
		lam = math.Atan2(sh, c)
	} else { // a pole
		phi = math.Copysign(math.Pi/2, s)
	}
	lon = tm.lon0 + lam/deg
	// lon0 ∈ [−180, 180] and λ ∈ [−π, π]: one turn at most brings lon into
	// [−180, 180], exactly (Sterbenz), as math.Remainder(lon, 360) would.
	if lon > 180 {
		lon -= 360
	} else if lon < -180 {
		lon += 360
	}
	return lon, phi / deg
}

// ProjectPoints appends the projections of lonlat to dst as interleaved
// x, y pairs and returns the extended slice. A point outside the valid
// range is an error naming its index; dst is then returned unchanged.
func (tm *TransverseMercator) ProjectPoints(dst []float64, lonlat []orb.Point) ([]float64, error) {
	if tm.err != nil {
		return dst, tm.err
	}
	n0 := len(dst)
	for i, p := range lonlat {
		if err := ValidLonLat(p[0], p[1]); err != nil {
			return dst[:n0], fmt.Errorf("point %d: %w", i, err)
		}
		x, y := tm.Forward(p[0], p[1])
		dst = append(dst, x, y)
	}
	return dst, nil
}

// ValidLonLat returns nil when lon is a finite longitude in [−180, 180]
// and lat a finite latitude in [−90, 90] (degrees), and otherwise an error
// saying which coordinate is wrong and why.
func ValidLonLat(lon, lat float64) error {
	switch {
	case math.IsNaN(lon) || math.IsInf(lon, 0):
		return fmt.Errorf("longitude %v is not a finite number", lon)
	case math.IsNaN(lat) || math.IsInf(lat, 0):
		return fmt.Errorf("latitude %v is not a finite number", lat)
	case lon < -180 || lon > 180:
		return fmt.Errorf("longitude %v is outside [-180, 180] degrees", lon)
	case lat < -90 || lat > 90:
		return fmt.Errorf("latitude %v is outside [-90, 90] degrees", lat)
	}
	return nil
}

// LonLatBound returns the longitude/latitude bounding box of lonlat. When
// the points lie closer together across the antimeridian than around the
// prime meridian (for example longitudes 179.9 and −179.9), the box runs
// eastwards from Min.X across ±180° to Max.X, and Min.X > Max.X. Whenever the
// points fit in half a turn of longitude this is the narrowest box. An
// empty input or an invalid point (with its index) is an error.
func LonLatBound(lonlat []orb.Point) (orb.Bound, error) {
	if len(lonlat) == 0 {
		return orb.Bound{}, errors.New("no points: cannot centre a local plane on empty data")
	}
	minX, maxX := math.Inf(1), math.Inf(-1) // plain longitudes
	minS, maxS := math.Inf(1), math.Inf(-1) // longitudes shifted to [0, 360)
	minY, maxY := math.Inf(1), math.Inf(-1)
	neg, nonneg := false, false
	for i, p := range lonlat {
		if err := ValidLonLat(p[0], p[1]); err != nil {
			return orb.Bound{}, fmt.Errorf("point %d: %w", i, err)
		}
		lon, lat := p[0], p[1]
		minX, maxX = math.Min(minX, lon), math.Max(maxX, lon)
		s := lon
		if s < 0 {
			s += 360
			neg = true
		} else {
			nonneg = true
		}
		minS, maxS = math.Min(minS, s), math.Max(maxS, s)
		minY, maxY = math.Min(minY, lat), math.Max(maxY, lat)
	}
	b := orb.Bound{Min: orb.Point{minX, minY}, Max: orb.Point{maxX, maxY}}
	if neg && nonneg && maxS-minS < maxX-minX {
		// Across the antimeridian: minS is the least non-negative
		// longitude, in [0, 180], and maxS is in [180, 360).
		b.Min[0], b.Max[0] = minS, maxS-360
	}
	return b, nil
}

// boundWidth returns the eastward longitude extent of b in degrees.
func boundWidth(b orb.Bound) float64 {
	w := b.Max[0] - b.Min[0]
	if w < 0 {
		w += 360
	}
	return w
}

// NewLocalPlane returns a WGS84 transverse Mercator projection centred on
// the data: the central meridian and origin latitude are the centre of the
// data's longitude/latitude bounding box (see LonLatBound for data that
// straddles the antimeridian), k₀ = 1 and there are no false offsets, so
// local coordinates are small numbers in metres, and distances in the plane
// are true to within MaxScaleError of the box. It does not reject large
// extents; call CheckExtent for that.
func NewLocalPlane(lonlat []orb.Point) (*TransverseMercator, error) {
	b, err := LonLatBound(lonlat)
	if err != nil {
		return nil, err
	}
	lon0 := math.Remainder(b.Min[0]+boundWidth(b)/2, 360)
	lat0 := (b.Min[1] + b.Max[1]) / 2
	tm := NewTransverseMercator(WGS84, lon0, lat0, 1, 0, 0)
	return tm, tm.err
}

// MaxScaleError returns the largest |k − 1| over the longitude/latitude
// rectangle b (degrees; Min.X > Max.X means the rectangle crosses the
// antimeridian eastwards, as returned by LonLatBound). It returns +Inf when
// the rectangle reaches 90° or more from the central meridian, where the
// projection is unusable, and NaN for an invalid rectangle.
//
// Where the extremes are: for |λ| < 90° the point scale k grows strictly
// with the distance |λ| from the central meridian at fixed latitude (on the
// sphere k = 1/√(1 − cos²φ sin²λ); the ellipsoidal series differs from this
// by terms of order e²), is even in λ, and equals k₀ on the central
// meridian. So k has no critical point inside the rectangle off the central
// meridian, and on each parallel it is extreme at the rectangle's
// meridian edges or on the central meridian. The maximum of k therefore
// lies on the meridian edge farthest from the central meridian and the
// minimum on the nearest one (k₀ if the rectangle contains the central
// meridian). Along each of those two edges k is a function of latitude
// alone, largest nearest the equator; to avoid relying on that, it is
// sampled at 65 latitudes plus the equator when inside, and the best
// sample refined by golden-section search. Since k is continuous, |k − 1| is
// largest at the maximum or the minimum of k.
func (tm *TransverseMercator) MaxScaleError(b orb.Bound) float64 {
	if tm.err != nil {
		return math.NaN()
	}
	for _, v := range [4]float64{b.Min[0], b.Min[1], b.Max[0], b.Max[1]} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return math.NaN()
		}
	}
	if ValidLonLat(b.Min[0], b.Min[1]) != nil || ValidLonLat(b.Max[0], b.Max[1]) != nil || b.Min[1] > b.Max[1] {
		return math.NaN()
	}
	lo := tm.lambda(b.Min[0])
	hi := lo + boundWidth(b)
	if lo <= -90 || hi >= 90 {
		return math.Inf(1)
	}
	far := math.Max(math.Abs(lo), math.Abs(hi))
	near := math.Min(math.Abs(lo), math.Abs(hi))
	if lo <= 0 && hi >= 0 {
		near = 0
	}
	kmax := tm.edgeExtreme(far, b.Min[1], b.Max[1], 1)
	kmin := -tm.edgeExtreme(near, b.Min[1], b.Max[1], -1)
	return math.Max(math.Abs(kmax-1), math.Abs(kmin-1))
}

// edgeExtreme returns the maximum of sgn·k(lam, φ) for φ in [lat0, lat1].
func (tm *TransverseMercator) edgeExtreme(lam, lat0, lat1, sgn float64) float64 {
	f := func(lat float64) float64 {
		_, _, k := tm.series(lam, lat)
		return sgn * k
	}
	const samples = 64
	best, bestLat := f(lat0), lat0
	if lat0 < 0 && lat1 > 0 {
		if v := f(0); v > best {
			best, bestLat = v, 0
		}
	}
	step := (lat1 - lat0) / samples
	for i := 1; i <= samples; i++ {
		lat := lat0 + float64(i)*step
		if i == samples {
			lat = lat1
		}
		if v := f(lat); v > best {
			best, bestLat = v, lat
		}
	}
	if step == 0 {
		return best
	}
	// Golden-section refinement on the bracket around the best sample.
	a, c := math.Max(lat0, bestLat-step), math.Min(lat1, bestLat+step)
	const g = 0.6180339887498949
	x1, x2 := c-g*(c-a), a+g*(c-a)
	f1, f2 := f(x1), f(x2)
	for i := 0; i < 60 && c-a > 1e-12; i++ {
		if f1 < f2 {
			a, x1, f1 = x1, x2, f2
			x2 = a + g*(c-a)
			f2 = f(x2)
		} else {
			c, x2, f2 = x2, x1, f1
			x1 = c - g*(c-a)
			f1 = f(x1)
		}
	}
	return math.Max(best, math.Max(f1, f2))
}

// CheckExtent returns nil when the largest point-scale error over the
// longitude/latitude rectangle b is at most MaxLocalScaleError, and
// otherwise an error stating the measured scale error and the extent.
func (tm *TransverseMercator) CheckExtent(b orb.Bound) error {
	if tm.err != nil {
		return tm.err
	}
	m := tm.MaxScaleError(b)
	w, h := boundWidth(b), b.Max[1]-b.Min[1]
	if math.IsNaN(m) {
		return fmt.Errorf("invalid extent: longitude %v..%v, latitude %v..%v", b.Min[0], b.Max[0], b.Min[1], b.Max[1])
	}
	if m <= MaxLocalScaleError {
		return nil
	}
	// Approximate ground size: east-west at the latitude nearest the
	// equator, north-south along a meridian (mean radius 6371 km).
	latNear := 0.0
	if b.Min[1] > 0 {
		latNear = b.Min[1]
	} else if b.Max[1] < 0 {
		latNear = b.Max[1]
	}
	const r = 6371.0
	ew := w * deg * r * math.Cos(latNear*deg)
	ns := h * deg * r
	scale := fmt.Sprintf("%.3g%%", 100*m)
	if math.IsInf(m, 1) {
		scale = "unbounded (the extent reaches 90° from the central meridian)"
	}
	return fmt.Errorf("extent too large for one local plane: longitude %.6f..%.6f, latitude %.6f..%.6f (about %.0f km east-west by %.0f km north-south) has a scale error of %s, above the %.1f%% limit",
		b.Min[0], b.Max[0], b.Min[1], b.Max[1], ew, ns, scale, 100*MaxLocalScaleError)
}
