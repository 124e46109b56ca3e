package strain_test

import (
	"math"
	"testing"

	"spallscope/dic/synth"
	"spallscope/strain"
)

// The boundary-stress factors agree with the Kirsch stresses of the
// synthetic lab (Kirsch 1898; Jaeger, Cook & Zimmerman §8.4): for K = 0,
// 3 at the springline and −1 (tension) at the crown; with confinement
// K = 0.4, 2.6 and 0.2.
func TestKirschFactors(t *testing.T) {
	for _, k := range []float64{0, 0.4} {
		f := synth.Kirsch{Radius: 1, Stress: 10, K: k, E: 1, Nu: 0.25}
		_, side, _ := f.PolarStress(1, 0)           // springline: θ = 0
		_, crown, _ := f.PolarStress(1, -math.Pi/2) // crown: above the opening
		fs, _ := strain.KirschFactor(strain.RightSidewall, k)
		fc, _ := strain.KirschFactor(strain.Crown, k)
		// PolarStress is tension positive; the factors are compression positive.
		if math.Abs(fs*10+side) > 1e-12 || math.Abs(fc*10+crown) > 1e-12 {
			t.Errorf("K=%g: factors (%g, %g), Kirsch hoop stresses (%g, %g) MPa for 10 MPa", k, fs, fc, side, crown)
		}
	}
	if f, _ := strain.KirschFactor(strain.RightSidewall, 0); f != 3 {
		t.Errorf("sidewall factor %g, want 3", f)
	}
	if f, _ := strain.KirschFactor(strain.Crown, 0); f != -1 {
		t.Errorf("crown factor %g, want −1", f)
	}
	c, _ := strain.NewContext(strain.LeftSidewall, 10, 0.25, 68.75)
	if math.Abs(c.BoundaryStress-27.5) > 1e-12 || math.Abs(c.RatioToUCS-0.4) > 1e-12 {
		t.Errorf("context %+v: want 27.5 MPa and 0.4 UCS", c)
	}
}
