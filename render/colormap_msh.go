package render

import "math"

// The end colours of Moreland's cool-to-warm map, sRGB in [0, 1]: the first
// and last rows of his published table CoolWarmFloat33 (K. Moreland,
// "Diverging Color Maps for Scientific Visualization", Advances in Visual
// Computing, ISVC 2009, LNCS 5876, pp. 92–103); in 8 bits (59, 76, 192) and
// (180, 4, 38).
var (
	coolEnd = [3]float64{0.2298057, 0.298717966, 0.753683153}
	warmEnd = [3]float64{0.705673158, 0.01555616, 0.150232812}
)

// coolWarmTable builds the 256 entries of the diverging map by Moreland's
// construction: each end colour is taken to Msh (the polar form of CIELAB:
// M = |Lab|, s = the angle from the L axis, h = the hue angle), each half of
// the map runs linearly in Msh from its end to an unsaturated middle of
// M = max(M_cool, M_warm, 88) (a light gray, L* = 88), and the hue of the
// middle is spun so the two halves meet without a hue jump.
func coolWarmTable() [256][3]float64 {
	var t [256][3]float64
	a, b := srgbToMsh(coolEnd), srgbToMsh(warmEnd)
	for i := range t {
		t[i] = mshToSRGB(divergingMsh(a, b, float64(i)/float64(len(t)-1)))
	}
	return t
}

// divergingMsh interpolates between two saturated Msh colours of distant
// hues through an unsaturated middle at x = 0.5 (Moreland 2009, section 5).
func divergingMsh(a, b [3]float64, x float64) [3]float64 {
	if a[1] > 0.05 && b[1] > 0.05 && hueDistance(a[2], b[2]) > math.Pi/3 {
		mid := math.Max(math.Max(a[0], b[0]), 88)
		if x < 0.5 {
			b, x = [3]float64{mid, 0, 0}, 2*x
		} else {
			a, x = [3]float64{mid, 0, 0}, 2*x-1
		}
	}
	switch {
	case a[1] < 0.05 && b[1] > 0.05:
		a[2] = adjustHue(b, a[0])
	case b[1] < 0.05 && a[1] > 0.05:
		b[2] = adjustHue(a, b[0])
	}
	var m [3]float64
	for k := range m {
		m[k] = (1-x)*a[k] + x*b[k]
	}
	return m
}

// hueDistance is the angle between two hues, in [0, π].
func hueDistance(h1, h2 float64) float64 {
	d := math.Abs(h1 - h2)
	if d > math.Pi {
		d = 2*math.Pi - d
	}
	return d
}

// adjustHue returns the hue an unsaturated colour of magnitude m should take
// next to the saturated colour c so the hue changes evenly (Moreland 2009).
func adjustHue(c [3]float64, m float64) float64 {
	if c[0] >= m {
		return c[2]
	}
	spin := c[1] * math.Sqrt(m*m-c[0]*c[0]) / (c[0] * math.Sin(c[1]))
	if c[2] > -math.Pi/3 {
		return c[2] + spin
	}
	return c[2] - spin
}

// D65 reference white (CIE 1931 2°), scaled to Y = 1.
var d65 = [3]float64{0.95047, 1, 1.08883}

// srgbToMsh converts sRGB in [0, 1] to Msh through linear RGB, CIE XYZ
// (sRGB primaries, IEC 61966-2-1) and CIELAB relative to D65.
func srgbToMsh(c [3]float64) [3]float64 {
	var l [3]float64
	for k, v := range c {
		if v <= 0.04045 {
			l[k] = v / 12.92
		} else {
			l[k] = math.Pow((v+0.055)/1.055, 2.4)
		}
	}
	x := 0.4124564*l[0] + 0.3575761*l[1] + 0.1804375*l[2]
	y := 0.2126729*l[0] + 0.7151522*l[1] + 0.0721750*l[2]
	z := 0.0193339*l[0] + 0.1191920*l[1] + 0.9503041*l[2]
	f := func(t float64) float64 {
		if t > 216.0/24389 {
			return math.Cbrt(t)
		}
		return (24389.0/27*t + 16) / 116
	}
	fx, fy, fz := f(x/d65[0]), f(y/d65[1]), f(z/d65[2])
	L, A, B := 116*fy-16, 500*(fx-fy), 200*(fy-fz)
	m := math.Sqrt(L*L + A*A + B*B)
	return [3]float64{m, math.Acos(L / m), math.Atan2(B, A)}
}

// mshToSRGB is the inverse of srgbToMsh, clamping to the sRGB gamut.
func mshToSRGB(c [3]float64) [3]float64 {
	L := c[0] * math.Cos(c[1])
	A := c[0] * math.Sin(c[1]) * math.Cos(c[2])
	B := c[0] * math.Sin(c[1]) * math.Sin(c[2])
	fy := (L + 16) / 116
	fx, fz := fy+A/500, fy-B/200
	inv := func(f float64) float64 {
		if f*f*f > 216.0/24389 {
			return f * f * f
		}
		return (116*f - 16) * 27 / 24389
	}
	x, y, z := d65[0]*inv(fx), d65[1]*inv(fy), d65[2]*inv(fz)
	lin := [3]float64{
		3.2404542*x - 1.5371385*y - 0.4985314*z,
		-0.9692660*x + 1.8760108*y + 0.0415560*z,
		0.0556434*x - 0.2040259*y + 1.0572252*z,
	}
	var s [3]float64
	for k, v := range lin {
		if v <= 0.0031308 {
			s[k] = 12.92 * v
		} else {
			s[k] = 1.055*math.Pow(v, 1/2.4) - 0.055
		}
		s[k] = math.Min(1, math.Max(0, s[k]))
	}
	return s
}
