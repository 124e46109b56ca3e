package synth

// Notch is a V-shaped notch at an opening's wall (the breakout shape of
// sidewall spalling): two shear bands (see ShearBand) from one apex
// (X0, Y0) on the wall to the tips (X1, Y1) and (X2, Y2), with the same
// slip, half-width and decay, their mouths on the free surface. Its motion
// is the sum of the two bands'; Scaled(g) grows both arms and their slip
// by g. As one field it is one damage feature in the truth (FeatureTruth).
type Notch struct {
	X0        float64 `json:"x0_px"`
	Y0        float64 `json:"y0_px"`
	X1        float64 `json:"x1_px"`
	Y1        float64 `json:"y1_px"`
	X2        float64 `json:"x2_px"`
	Y2        float64 `json:"y2_px"`
	Slip      float64 `json:"slip_px"`
	HalfWidth float64 `json:"half_width_px"`
	Decay     float64 `json:"decay_px,omitempty"`
}

// Arms returns the notch's two bands.
func (n Notch) Arms() (ShearBand, ShearBand) {
	a := ShearBand{X0: n.X0, Y0: n.Y0, X1: n.X1, Y1: n.Y1, Slip: n.Slip, HalfWidth: n.HalfWidth, Decay: n.Decay}
	b := a
	b.X1, b.Y1 = n.X2, n.Y2
	return a, b
}

// Scaled returns the notch grown to fraction g.
func (n Notch) Scaled(g float64) Field {
	a, b := n.Arms()
	return Sum{a.Scaled(g), b.Scaled(g)}
}

// At returns the motion at (x, y): the sum of the arms'.
func (n Notch) At(x, y float64) Motion {
	a, b := n.Arms()
	return a.At(x, y).Add(b.At(x, y))
}
