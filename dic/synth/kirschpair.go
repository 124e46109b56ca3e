package synth

import (
	"errors"
	"math"
)

// KirschPair is the elastic field around two circular holes in one plate
// under the far-field stresses of Kirsch (Stress vertical, K·Stress
// horizontal, compressive positive): the twin openings of a block test,
// with the pillar between them. It superposes two Kirsch (1898) solutions
// on one far field,
//
//	u = u∞ + (u₁ − u∞₁) + (u₂ − u∞₂),
//
// where u_i is the Kirsch field of hole i alone (Kirsch, centred on it)
// and u∞_i the far field about the same centre (Kirsch with zero radius:
// its potentials φ = Pz/2, ψ = −Qz), so each hole adds only its own
// perturbation, which decays as (a/r)² in stress. u∞ is taken about the
// midpoint of the centres (the midpoint does not move).
//
// For a real block this is an approximation: each hole's perturbation
// leaves a traction of order σ·(a/d)² on the other hole's wall (d the
// distance between them), which the exact two-hole solution (in bipolar
// coordinates; Ling 1948, J. Appl. Phys. 19, from memory) removes, and a
// block is finite. As the synthetic lab's prescribed field it is exact:
// frames are rendered under this very displacement and the truth is this
// field, so it tests measurement, not mechanics.
type KirschPair struct {
	X1          float64 `json:"x1_px"`
	Y1          float64 `json:"y1_px"`
	R1          float64 `json:"r1_px"`
	X2          float64 `json:"x2_px"`
	Y2          float64 `json:"y2_px"`
	R2          float64 `json:"r2_px"`
	Stress      float64 `json:"stress_MPa"`
	K           float64 `json:"k"`
	E           float64 `json:"E_MPa"`
	Nu          float64 `json:"nu"`
	PlaneStress bool    `json:"plane_stress,omitempty"`
}

// Validate reports a pair that is no field: holes that overlap or touch,
// non-positive radii or modulus, or ν outside [0, 0.5).
func (p KirschPair) Validate() error {
	switch {
	case !(p.R1 > 0) || !(p.R2 > 0):
		return errors.New("radii r1_px and r2_px must be positive")
	case !(p.E > 0) || p.Nu < 0 || p.Nu >= 0.5:
		return errors.New("needs E > 0 and 0 ≤ ν < 0.5")
	case !(math.Hypot(p.X2-p.X1, p.Y2-p.Y1) > p.R1+p.R2):
		return errors.New("the holes overlap or touch: no pillar between them")
	}
	return nil
}

// Single returns hole i's (0 or 1) Kirsch field alone.
func (p KirschPair) Single(i int) Kirsch {
	k := Kirsch{Cx: p.X1, Cy: p.Y1, Radius: p.R1, Stress: p.Stress, K: p.K, E: p.E, Nu: p.Nu, PlaneStress: p.PlaneStress}
	if i == 1 {
		k.Cx, k.Cy, k.Radius = p.X2, p.Y2, p.R2
	}
	return k
}

// FarField returns the far field alone, about the midpoint of the centres.
func (p KirschPair) FarField() Kirsch {
	k := p.Single(0)
	k.Cx, k.Cy, k.Radius = (p.X1+p.X2)/2, (p.Y1+p.Y2)/2, 0
	return k
}

// Holes returns the two openings.
func (p KirschPair) Holes() [2]Opening {
	return [2]Opening{Circle(p.X1, p.Y1, p.R1), Circle(p.X2, p.Y2, p.R2)}
}

// Scaled returns the field at s times the far-field stress.
func (p KirschPair) Scaled(s float64) Field { p.Stress *= s; return p }

// At returns the motion of the material point at (x, y).
func (p KirschPair) At(x, y float64) Motion {
	m := p.FarField().At(x, y)
	for i := range 2 {
		k := p.Single(i)
		far := k
		far.Radius = 0
		d := k.At(x, y)
		f := far.At(x, y)
		m = m.Add(Motion{d.U - f.U, d.V - f.V, d.UX - f.UX, d.UY - f.UY, d.VX - f.VX, d.VY - f.VY})
	}
	return m
}
