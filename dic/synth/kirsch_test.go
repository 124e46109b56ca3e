package synth

import (
	"math"
	"testing"
)

func testKirsch(k float64) Kirsch {
	// Mortar-like elastic constants (E = 20 GPa, ν = 0.2) and a 40 MPa
	// vertical load are our own example values.
	return Kirsch{Cx: 200, Cy: 150, Radius: 50, Stress: 40, K: k, E: 20000, Nu: 0.2}
}

// toPolar rotates Cartesian stresses to polar components at angle θ.
func toPolar(sxx, syy, sxy, theta float64) (srr, stt, srt float64) {
	c, s := math.Cos(theta), math.Sin(theta)
	srr = sxx*c*c + syy*s*s + 2*sxy*s*c
	stt = sxx*s*s + syy*c*c - 2*sxy*s*c
	srt = (syy-sxx)*s*c + sxy*(c*c-s*s)
	return
}

// Kirsch (1898), Jaeger, Cook & Zimmerman §8.4: under uniaxial far-field
// compression σ the tangential stress at the hole boundary is −3σ
// (compressive, 3σ in magnitude) at the springline (θ = 0, the sidewall,
// perpendicular to the load) and +σ (tensile) at the crown (θ = 90°).
// The check goes through the displacement gradient of our truth field and
// Hooke's law, so it tests the displacements, not a formula against itself.
func TestKirschBoundaryStressFromDisplacements(t *testing.T) {
	for _, plane := range []bool{false, true} {
		f := testKirsch(0)
		f.PlaneStress = plane
		sigma := f.Stress
		cases := []struct {
			name  string
			theta float64
			want  float64
		}{
			{"springline", 0, -3 * sigma},
			{"crown", -math.Pi / 2, sigma}, // crown is above the hole: y up on screen is −y
			{"invert", math.Pi / 2, sigma},
			{"other springline", math.Pi, -3 * sigma},
		}
		for _, c := range cases {
			x := f.Cx + f.Radius*math.Cos(c.theta)
			y := f.Cy + f.Radius*math.Sin(c.theta)
			sxx, syy, sxy := f.HookeStress(f.At(x, y))
			srr, stt, srt := toPolar(sxx, syy, sxy, c.theta)
			if math.Abs(stt-c.want) > 1e-9*sigma {
				t.Errorf("plane stress %v %s: σθθ = %.6f MPa, want %.6f", plane, c.name, stt, c.want)
			}
			// Traction-free boundary: σrr = σrθ = 0 (Kirsch 1898).
			if math.Abs(srr) > 1e-9*sigma || math.Abs(srt) > 1e-9*sigma {
				t.Errorf("plane stress %v %s: boundary traction σrr=%g σrθ=%g, want 0", plane, c.name, srr, srt)
			}
		}
	}
}

// The whole stress field implied by our displacements agrees with the
// published Kirsch stresses (Jaeger, Cook & Zimmerman eqs. 8.4.9–8.4.11),
// with lateral confinement K = 0.5, at points from the boundary outwards.
func TestKirschStressFieldMatchesPublished(t *testing.T) {
	f := testKirsch(0.5)
	for _, r := range []float64{50, 57, 75, 120, 400} {
		for th := 0.0; th < 2*math.Pi; th += 0.37 {
			x := f.Cx + r*math.Cos(th)
			y := f.Cy + r*math.Sin(th)
			sxx, syy, sxy := f.HookeStress(f.At(x, y))
			srr, stt, srt := toPolar(sxx, syy, sxy, th)
			wrr, wtt, wrt := f.PolarStress(r, th)
			if math.Abs(srr-wrr) > 1e-9*f.Stress || math.Abs(stt-wtt) > 1e-9*f.Stress || math.Abs(srt-wrt) > 1e-9*f.Stress {
				t.Fatalf("r=%g θ=%.2f: (σrr,σθθ,σrθ) = (%.5f,%.5f,%.5f), published (%.5f,%.5f,%.5f)", r, th, srr, stt, srt, wrr, wtt, wrt)
			}
		}
	}
	// With K = 1 (hydrostatic) σθθ = 2p all round the boundary (Jaeger,
	// Cook & Zimmerman §8.4, the equal-biaxial case).
	f = testKirsch(1)
	for th := 0.0; th < 2*math.Pi; th += 0.5 {
		_, stt, _ := f.PolarStress(f.Radius, th)
		if math.Abs(stt+2*f.Stress) > 1e-12 {
			t.Errorf("K=1 θ=%.1f: σθθ=%g, want %g", th, stt, -2*f.Stress)
		}
	}
}

// Far from the hole the field tends to the uniform plane-strain solution
// εxx = [(1−ν²)Sx − ν(1+ν)Sy]/E, εyy = [(1−ν²)Sy − ν(1+ν)Sx]/E
// (Hooke's law in plane strain, any elasticity text); the hole's
// perturbation of the displacement decays as a²/r relative to εr.
func TestKirschFarFieldTendsToUniform(t *testing.T) {
	f := testKirsch(0.3)
	sx, sy := -f.K*f.Stress, -f.Stress
	nu, e := f.Nu, f.E
	exx := ((1-nu*nu)*sx - nu*(1+nu)*sy) / e
	eyy := ((1-nu*nu)*sy - nu*(1+nu)*sx) / e
	for _, r := range []float64{1000, 3000} {
		for th := 0.1; th < 2*math.Pi; th += 0.9 {
			dx, dy := r*math.Cos(th), r*math.Sin(th)
			m := f.At(f.Cx+dx, f.Cy+dy)
			ru := math.Hypot(m.U-exx*dx, m.V-eyy*dy) / (math.Max(math.Abs(exx), math.Abs(eyy)) * r)
			limit := 4 * (f.Radius * f.Radius) / (r * r) // a²/r² relative decay, factor 4 for the angular terms
			if ru > limit {
				t.Errorf("r=%g θ=%.1f: relative departure from uniform %.2e > %.2e", r, th, ru, limit)
			}
			if math.Abs(m.UX-exx) > limit*math.Abs(eyy) || math.Abs(m.VY-eyy) > limit*math.Abs(eyy) {
				t.Errorf("r=%g: gradient (%.3e,%.3e) far from uniform (%.3e,%.3e)", r, m.UX, m.VY, exx, eyy)
			}
		}
	}
}

// The analytic gradient agrees with a central finite difference of the
// displacement (calculus; step 1e-3 px, truncation O(h²)).
func TestFieldGradientsMatchFiniteDifferences(t *testing.T) {
	fields := map[string]Field{
		"kirsch":   testKirsch(0.4),
		"rotation": Rotation{Cx: 10, Cy: 20, AngleDeg: 3},
		"strain":   UniformStrain{Cx: 5, Cy: 5, Exx: 1e-3, Eyy: -2e-3, Exy: 4e-4},
		"sweep":    SineSweep{Amplitude: 0.5, PeriodMin: 10, PeriodMax: 200, X0: 100, Height: 300},
		"crack":    Crack{X0: 100, Y0: 100, X1: 100, Y1: 40, Opening: 2, Decay: 15},
		"band":     ShearBand{X0: 150, Y0: 150, X1: 220, Y1: 80, Slip: 1.5, HalfWidth: 4},
		"embedded": Crack{X0: 300, Y0: 100, X1: 340, Y1: 120, Opening: 1, Decay: 10, Embedded: true},
	}
	const h = 1e-3
	for name, f := range fields {
		for _, p := range [][2]float64{{117, 83}, {90, 70}, {180, 130}, {260, 190}, {320, 104}, {330, 120}, {95, 110}, {140, 160}, {106, 103}} {
			x, y := p[0], p[1]
			m := f.At(x, y)
			px, mx := f.At(x+h, y), f.At(x-h, y)
			py, my := f.At(x, y+h), f.At(x, y-h)
			fd := [4]float64{(px.U - mx.U) / (2 * h), (py.U - my.U) / (2 * h), (px.V - mx.V) / (2 * h), (py.V - my.V) / (2 * h)}
			an := [4]float64{m.UX, m.UY, m.VX, m.VY}
			for i := range fd {
				if math.Abs(fd[i]-an[i]) > 1e-6 {
					t.Errorf("%s at (%g,%g): gradient %d analytic %.9f, finite difference %.9f", name, x, y, i, an[i], fd[i])
				}
			}
		}
	}
}
