// Colour difference of map fills, to keep neighbouring fills apart for
// every reader.
//
// A colour is converted from sRGB (IEC 61966-2-1: the piecewise gamma,
// D65 white) to linear RGB, to CIE XYZ and to CIELAB (CIE 15:2004), and
// two colours are compared by the CIEDE2000 difference ΔE00 (Sharma, Wu &
// Dalal, "The CIEDE2000 color-difference formula: implementation notes,
// supplementary test data, and mathematical observations", Color Research
// & Application 30(1), 2005). ΔE00 ≈ 1 is a just-noticeable difference;
// fills that must be told apart at a glance on a map need several times
// that.
//
// Colour-vision deficiency is simulated with the matrices of Machado,
// Oliveira & Fernandes, "A physiologically-based model for simulation of
// color vision deficiency", IEEE TVCG 15(6), 2009, at severity 1
// (protanopia, deuteranopia, tritanopia), applied to linear RGB and
// clamped to [0, 1]. Together about 8 % of men see with a red-green
// (protan or deutan) deficiency.

package report

import (
	"image/color"
	"math"
)

// lab is a CIELAB colour (D65 white).
type lab struct{ L, a, b float64 }

// vision is a 3×3 matrix on linear RGB simulating a colour vision.
type vision [3][3]float64

// The visions a map is checked for: normal and the three dichromacies of
// Machado et al. 2009, severity 1.0 (matrix values recalled from memory
// of the paper's table; each row sums to 1 within 1e-6, so white and
// greys are kept, which the test checks).
var (
	visionNormal = vision{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	visionProtan = vision{
		{0.152286, 1.052583, -0.204868},
		{0.114503, 0.786281, 0.099216},
		{-0.003882, -0.048116, 1.051998}}
	visionDeutan = vision{
		{0.367322, 0.860646, -0.227968},
		{0.280085, 0.672501, 0.047413},
		{-0.011820, 0.042940, 0.968881}}
	visionTritan = vision{
		{1.255528, -0.076749, -0.178779},
		{-0.078411, 0.930809, 0.147602},
		{0.004733, 0.691367, 0.303900}}
)

// srgbLinear converts an 8-bit sRGB channel to linear light (IEC 61966-2-1).
func srgbLinear(v uint8) float64 {
	c := float64(v) / 255
	if c <= 0.04045 {
		return c / 12.92
	}
	return math.Pow((c+0.055)/1.055, 2.4)
}

// labOf returns the CIELAB colour of c as seen with vision m.
func labOf(c color.RGBA, m vision) lab {
	r, g, b := srgbLinear(c.R), srgbLinear(c.G), srgbLinear(c.B)
	var rgb [3]float64
	for i := range 3 {
		rgb[i] = math.Max(0, math.Min(1, m[i][0]*r+m[i][1]*g+m[i][2]*b))
	}
	// linear sRGB → XYZ (D65), IEC 61966-2-1
	x := 0.4124564*rgb[0] + 0.3575761*rgb[1] + 0.1804375*rgb[2]
	y := 0.2126729*rgb[0] + 0.7151522*rgb[1] + 0.0721750*rgb[2]
	z := 0.0193339*rgb[0] + 0.1191920*rgb[1] + 0.9503041*rgb[2]
	const xn, yn, zn = 0.95047, 1.0, 1.08883
	f := func(t float64) float64 {
		const d = 6.0 / 29
		if t > d*d*d {
			return math.Cbrt(t)
		}
		return t/(3*d*d) + 4.0/29
	}
	fx, fy, fz := f(x/xn), f(y/yn), f(z/zn)
	return lab{116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)}
}

// deltaE00 is the CIEDE2000 colour difference of two CIELAB colours
// (kL = kC = kH = 1), following Sharma et al. 2005 step by step.
func deltaE00(p, q lab) float64 {
	rad := math.Pi / 180
	c1, c2 := math.Hypot(p.a, p.b), math.Hypot(q.a, q.b)
	cm := (c1 + c2) / 2
	cm7 := math.Pow(cm, 7)
	g := 0.5 * (1 - math.Sqrt(cm7/(cm7+math.Pow(25, 7))))
	a1, a2 := (1+g)*p.a, (1+g)*q.a
	c1p, c2p := math.Hypot(a1, p.b), math.Hypot(a2, q.b)
	hue := func(b, a float64) float64 {
		if a == 0 && b == 0 {
			return 0
		}
		h := math.Atan2(b, a) / rad
		if h < 0 {
			h += 360
		}
		return h
	}
	h1, h2 := hue(p.b, a1), hue(q.b, a2)
	dL := q.L - p.L
	dC := c2p - c1p
	dh := 0.0
	if c1p*c2p != 0 {
		dh = h2 - h1
		switch {
		case dh > 180:
			dh -= 360
		case dh < -180:
			dh += 360
		}
	}
	dH := 2 * math.Sqrt(c1p*c2p) * math.Sin(dh/2*rad)
	Lm := (p.L + q.L) / 2
	cmp := (c1p + c2p) / 2
	hm := h1 + h2
	if c1p*c2p != 0 {
		switch {
		case math.Abs(h1-h2) <= 180:
			hm /= 2
		case h1+h2 < 360:
			hm = (h1 + h2 + 360) / 2
		default:
			hm = (h1 + h2 - 360) / 2
		}
	}
	t := 1 - 0.17*math.Cos((hm-30)*rad) + 0.24*math.Cos(2*hm*rad) + 0.32*math.Cos((3*hm+6)*rad) - 0.20*math.Cos((4*hm-63)*rad)
	dTheta := 30 * math.Exp(-math.Pow((hm-275)/25, 2))
	cmp7 := math.Pow(cmp, 7)
	rc := 2 * math.Sqrt(cmp7/(cmp7+math.Pow(25, 7)))
	sl := 1 + 0.015*(Lm-50)*(Lm-50)/math.Sqrt(20+(Lm-50)*(Lm-50))
	sc := 1 + 0.045*cmp
	sh := 1 + 0.015*cmp*t
	rt := -math.Sin(2*dTheta*rad) * rc
	return math.Sqrt((dL/sl)*(dL/sl) + (dC/sc)*(dC/sc) + (dH/sh)*(dH/sh) + rt*(dC/sc)*(dH/sh))
}

// minFillDifference is the smallest CIEDE2000 difference the map fills
// that can touch keep under normal, protan and deutan vision: about 13
// just-noticeable differences, the best a six-colour palette of light
// Okabe–Ito tints reaches together with the exclusion grey.
const minFillDifference = 12

// fillDifference is the smallest ΔE00 between colours a and b over the
// normal, protan and deutan visions (the red-green deficiencies, by far
// the commonest).
func fillDifference(a, b color.RGBA) float64 {
	d := math.Inf(1)
	for _, m := range []vision{visionNormal, visionProtan, visionDeutan} {
		d = math.Min(d, deltaE00(labOf(a, m), labOf(b, m)))
	}
	return d
}
