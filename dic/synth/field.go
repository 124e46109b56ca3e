package synth

import "math"

// Motion is the displacement of one material point and its gradient, in
// reference coordinates: the point at (x, y) moves to (x+U, y+V), and
// UX = ∂u/∂x, UY = ∂u/∂y, VX = ∂v/∂x, VY = ∂v/∂y.
type Motion struct {
	U, V           float64
	UX, UY, VX, VY float64
}

// Add returns the sum of two motions (superposition of small displacement
// fields).
func (m Motion) Add(o Motion) Motion {
	return Motion{m.U + o.U, m.V + o.V, m.UX + o.UX, m.UY + o.UY, m.VX + o.VX, m.VY + o.VY}
}

// Field is a displacement field over the reference configuration.
type Field interface {
	// At returns the motion of the material point at reference position (x, y).
	At(x, y float64) Motion
}

// Scalable is a field that can be taken at a fraction s of its full
// magnitude (s = 0: no motion; s = 1: as specified). For growing features
// (cracks, bands) s also scales their length.
type Scalable interface {
	Field
	Scaled(s float64) Field
}

// Sum superposes fields. Superposition is exact for the displacement
// definition used here (each component adds its displacement at the same
// material point).
type Sum []Field

// At returns the summed motion.
func (s Sum) At(x, y float64) Motion {
	var m Motion
	for _, f := range s {
		m = m.Add(f.At(x, y))
	}
	return m
}

// Translation is a rigid translation by (U, V) px.
type Translation struct {
	U float64 `json:"u_px"`
	V float64 `json:"v_px"`
}

// At returns the constant motion.
func (t Translation) At(x, y float64) Motion { return Motion{U: t.U, V: t.V} }

// Scaled returns the translation times s.
func (t Translation) Scaled(s float64) Field { return Translation{t.U * s, t.V * s} }

// Rotation is a rigid (finite, exact) rotation by Angle degrees about
// (Cx, Cy). Positive angles turn x towards y, which in image coordinates
// (y down) is clockwise on screen.
type Rotation struct {
	Cx       float64 `json:"cx_px"`
	Cy       float64 `json:"cy_px"`
	AngleDeg float64 `json:"angle_deg"`
}

// At returns the motion of the rotated point.
func (r Rotation) At(x, y float64) Motion {
	s, c := math.Sincos(r.AngleDeg * math.Pi / 180)
	dx, dy := x-r.Cx, y-r.Cy
	return Motion{
		U: c*dx - s*dy - dx, V: s*dx + c*dy - dy,
		UX: c - 1, UY: -s, VX: s, VY: c - 1,
	}
}

// Scaled returns the rotation by s times the angle.
func (r Rotation) Scaled(s float64) Field { r.AngleDeg *= s; return r }

// UniformStrain is a homogeneous pure strain about (Cx, Cy):
// u = Exx·dx + Exy·dy, v = Exy·dx + Eyy·dy, so the displacement gradient is
// the symmetric tensor [[Exx, Exy], [Exy, Eyy]] (Exy is the tensor shear,
// half the engineering shear) and the rotation is zero.
type UniformStrain struct {
	Cx  float64 `json:"cx_px"`
	Cy  float64 `json:"cy_px"`
	Exx float64 `json:"exx"`
	Eyy float64 `json:"eyy"`
	Exy float64 `json:"exy"`
}

// At returns the linear motion.
func (u UniformStrain) At(x, y float64) Motion {
	dx, dy := x-u.Cx, y-u.Cy
	return Motion{
		U: u.Exx*dx + u.Exy*dy, V: u.Exy*dx + u.Eyy*dy,
		UX: u.Exx, UY: u.Exy, VX: u.Exy, VY: u.Eyy,
	}
}

// Scaled returns the strain times s.
func (u UniformStrain) Scaled(s float64) Field {
	u.Exx, u.Eyy, u.Exy = u.Exx*s, u.Eyy*s, u.Exy*s
	return u
}

// SineSweep is a vertical displacement v = A·sin(2π(x−X0)/P(y)) whose period
// P grows geometrically from PeriodMin at the top row (y = 0) to PeriodMax at
// the bottom row (y = Height−1): a spatial-resolution target, in the spirit
// of the sinusoidal images of the DIC Challenge 2.0 (Reu et al. 2022). The
// attenuation of the measured amplitude along a row tells the smallest
// period a setting resolves.
type SineSweep struct {
	Amplitude float64 `json:"amplitude_px"`
	PeriodMin float64 `json:"period_min_px"`
	PeriodMax float64 `json:"period_max_px"`
	X0        float64 `json:"x0_px"`
	Height    float64 `json:"height_px"`
}

// Period returns the period at row y.
func (w SineSweep) Period(y float64) float64 {
	if w.Height <= 1 {
		return w.PeriodMin
	}
	return w.PeriodMin * math.Pow(w.PeriodMax/w.PeriodMin, y/(w.Height-1))
}

// At returns the motion at (x, y).
func (w SineSweep) At(x, y float64) Motion {
	p := w.Period(y)
	dp := 0.0
	if w.Height > 1 {
		dp = p * math.Log(w.PeriodMax/w.PeriodMin) / (w.Height - 1)
	}
	phase := 2 * math.Pi * (x - w.X0) / p
	s, c := math.Sincos(phase)
	return Motion{
		V:  w.Amplitude * s,
		VX: w.Amplitude * c * 2 * math.Pi / p,
		VY: w.Amplitude * c * (-2 * math.Pi * (x - w.X0) * dp / (p * p)),
	}
}

// Scaled returns the sweep with s times the amplitude.
func (w SineSweep) Scaled(s float64) Field { w.Amplitude *= s; return w }
