package synth

import "math"

// Crack is a displacement jump (an opening crack) along the straight segment
// from the mouth (X0, Y0) to the tip (X1, Y1). The two faces move apart
// along the segment's normal by ±w(ξ)/2, and the motion decays with the
// distance ρ from the crack as exp(−ρ/Decay), so the rock beside the crack
// unloads smoothly while the jump stays sharp.
//
// Opening profile w(ξ) over the length L: an edge crack whose mouth lies on
// a free surface (an opening's wall or the specimen edge) opens as
// w = Opening·√(1−(ξ/L)²), widest at the mouth; behind the mouth (ξ < 0,
// where the opening is) ρ is the distance to the mouth, so the rock beside
// the mouth moves with its face and the motion dies out radially. An
// Embedded crack has both ends closed and the elliptical Griffith profile
// w = Opening·√(1−(2ξ/L−1)²) (the opening shape of a Griffith crack under
// uniform tension, e.g. Anderson, Fracture Mechanics, §2.5).
//
// Scaled(g) grows the crack: the tip advances to g of the length and the
// opening is g times Opening.
type Crack struct {
	X0       float64 `json:"x0_px"`
	Y0       float64 `json:"y0_px"`
	X1       float64 `json:"x1_px"`
	Y1       float64 `json:"y1_px"`
	Opening  float64 `json:"opening_px"`
	Decay    float64 `json:"decay_px"`
	Embedded bool    `json:"embedded,omitempty"`

	seg *segment // cached geometry, set by Scaled
}

// Scaled returns the crack grown to fraction g.
func (c Crack) Scaled(g float64) Field {
	c.X1, c.Y1 = scaledTip(c.X0, c.Y0, c.X1, c.Y1, g)
	c.Opening *= g
	seg := newSegment(c.X0, c.Y0, c.X1, c.Y1)
	c.seg = &seg
	return c
}

func (c Crack) segment() segment {
	if c.seg != nil {
		return *c.seg
	}
	return newSegment(c.X0, c.Y0, c.X1, c.Y1)
}

// profile returns w(ξ)/Opening and its derivative with respect to ξ.
func (c Crack) profile(xi, l float64) (w, dw float64) {
	if c.Embedded {
		if xi <= 0 || xi >= l {
			return 0, 0
		}
		s := 2*xi/l - 1
		r := math.Sqrt(1 - s*s)
		return r, -s / r * 2 / l
	}
	if xi < 0 {
		return 1, 0 // behind the mouth: as at the mouth, fading with ρ
	}
	if xi >= l {
		return 0, 0
	}
	s := xi / l
	r := math.Sqrt(1 - s*s)
	return r, -s / r / l
}

// At returns the motion at (x, y). Points exactly on the crack line
// (d = 0) belong to the face on the normal's side.
func (c Crack) At(x, y float64) Motion {
	seg := c.segment()
	if seg.length == 0 || c.Opening == 0 {
		return Motion{}
	}
	xi, d := seg.local(x, y)
	p, dp := c.profile(xi, seg.length)
	if p == 0 {
		return Motion{}
	}
	decay := c.Decay
	if decay <= 0 {
		decay = seg.length / 2
	}
	rho, rx, rd := seg.distance(xi, d)
	if rho > 40*decay { // e^−40: nothing left
		return Motion{}
	}
	sgn := 1.0
	if d < 0 {
		sgn = -1
	}
	e := math.Exp(-rho / decay)
	a := c.Opening / 2 * p * e // |displacement| of this point
	// Displacement U = sgn·a·n with a = (W/2)·p(ξ)·e^(−ρ/L):
	// ∇(sgn·a) = sgn·[(W/2)p′e − a·ρ_ξ/L]·t − sgn·a·ρ_d/L·n.
	daXi := sgn * (c.Opening/2*dp*e - a*rx/decay)
	daD := -sgn * a * rd / decay
	gx := daXi*seg.tx + daD*seg.nx
	gy := daXi*seg.ty + daD*seg.ny
	return Motion{
		U: sgn * a * seg.nx, V: sgn * a * seg.ny,
		UX: seg.nx * gx, UY: seg.nx * gy,
		VX: seg.ny * gx, VY: seg.ny * gy,
	}
}

// ShearBand is a continuous band of localized shear along the segment from
// (X0, Y0) to (X1, Y1): material on the two sides slides past each other
// along the band by up to Slip,
// u = (Slip/2)·tanh(d/HalfWidth)·exp(−ρ/Decay)·p(ξ)·t, so the shear strain
// inside the band is about Slip/(2·HalfWidth) and the slip fades with the
// distance ρ from the band over Decay (default a quarter of the length).
// The taper p is smooth: cos²(πξ/2L) from a mouth on a free surface (behind
// it, where the opening is, p = 1 and ρ is the distance to the mouth, so
// the rock beside the mouth moves with its side), or sin²(πξ/L) for an
// Embedded band.
// Scaled(g) grows the band's length and slip by g.
type ShearBand struct {
	X0        float64 `json:"x0_px"`
	Y0        float64 `json:"y0_px"`
	X1        float64 `json:"x1_px"`
	Y1        float64 `json:"y1_px"`
	Slip      float64 `json:"slip_px"`
	HalfWidth float64 `json:"half_width_px"`
	Decay     float64 `json:"decay_px,omitempty"`
	Embedded  bool    `json:"embedded,omitempty"`

	seg *segment // cached geometry, set by Scaled
}

// Scaled returns the band grown to fraction g.
func (b ShearBand) Scaled(g float64) Field {
	b.X1, b.Y1 = scaledTip(b.X0, b.Y0, b.X1, b.Y1, g)
	b.Slip *= g
	seg := newSegment(b.X0, b.Y0, b.X1, b.Y1)
	b.seg = &seg
	return b
}

func (b ShearBand) segment() segment {
	if b.seg != nil {
		return *b.seg
	}
	return newSegment(b.X0, b.Y0, b.X1, b.Y1)
}

func (b ShearBand) taper(xi, l float64) (p, dp float64) {
	switch {
	case b.Embedded && (xi <= 0 || xi >= l), xi >= l:
		return 0, 0
	case b.Embedded:
		s, c := math.Sincos(math.Pi * xi / l)
		return s * s, 2 * s * c * math.Pi / l
	case xi < 0:
		return 1, 0
	}
	s, c := math.Sincos(math.Pi * xi / (2 * l))
	return c * c, -2 * c * s * math.Pi / (2 * l)
}

// At returns the motion at (x, y).
func (b ShearBand) At(x, y float64) Motion {
	seg := b.segment()
	if seg.length == 0 || b.Slip == 0 || b.HalfWidth <= 0 {
		return Motion{}
	}
	xi, d := seg.local(x, y)
	p, dp := b.taper(xi, seg.length)
	if p == 0 {
		return Motion{}
	}
	decay := b.Decay
	if decay <= 0 {
		decay = seg.length / 4
	}
	rho, rx, rd := seg.distance(xi, d)
	if rho > 40*decay {
		return Motion{}
	}
	th := math.Tanh(d / b.HalfWidth)
	e := math.Exp(-rho / decay)
	// a = (Slip/2)·tanh(d/h)·e^(−ρ/L)·p(ξ); its derivatives along t and n
	// (continuous where d = 0, where tanh vanishes).
	a := b.Slip / 2 * th * e * p
	daXi := b.Slip / 2 * th * e * (dp - p*rx/decay)
	daD := b.Slip / 2 * p * e * ((1-th*th)/b.HalfWidth - th*rd/decay)
	gx := daXi*seg.tx + daD*seg.nx
	gy := daXi*seg.ty + daD*seg.ny
	return Motion{
		U: a * seg.tx, V: a * seg.ty,
		UX: seg.tx * gx, UY: seg.tx * gy,
		VX: seg.ty * gx, VY: seg.ty * gy,
	}
}
