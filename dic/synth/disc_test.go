package synth

import (
	"math"
	"testing"
)

// testDisc is a 50 mm granite-like disc, 25 mm thick, at 0.05 mm/px
// (radius 500 px), loaded to 20 kN, with E = 30 GPa and ν = 0.25: our own
// example values, giving σt = 2P/(πDt) ≈ 10.19 MPa and strains of order
// 1e-3.
func testDisc(planeStrain bool) BrazilianDisc {
	return BrazilianDisc{Cx: 640, Cy: 512, Radius: 500, Load: 20000, Thickness: 25,
		MMPerPx: 0.05, E: 30000, Nu: 0.25, PlaneStrain: planeStrain}
}

// relClose reports whether got is within tol of want, relative to
// max(|want|, scale).
func relClose(got, want, scale, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(math.Abs(want), scale)
}

// ISRM suggested method (1978); Hondros (1959) in the limit of a vanishing
// loading arc: at the centre of a disc under diametral compression P,
// σxx = 2P/(πDt) and σyy = −6P/(πDt). The stresses are computed by Hooke's
// law from the displacement gradient of At, so the check tests the
// displacements. The hand value 2·20000/(π·50·25) = 10.18592 MPa fixes the
// unit conversions.
func TestBrazilianCentreStress(t *testing.T) {
	for _, ps := range []bool{false, true} {
		d := testDisc(ps)
		D := 2 * d.Radius * d.MMPerPx
		st := 2 * d.Load / (math.Pi * D * d.Thickness)
		if math.Abs(st-10.18592) > 1e-5 {
			t.Fatalf("2P/(πDt) = %.6f MPa, want 10.18592", st)
		}
		sxx, syy, sxy := d.HookeStress(d.At(d.Cx, d.Cy))
		if !relClose(sxx, st, 0, 1e-6) || !relClose(syy, -3*st, 0, 1e-6) || math.Abs(sxy) > 1e-6*st {
			t.Errorf("plane strain %v: centre (σxx, σyy, σxy) = (%.7f, %.7f, %.2g) MPa, want (%.7f, %.7f, 0)",
				ps, sxx, syy, sxy, st, -3*st)
		}
		cx, cy := d.CentreStress()
		if !relClose(cx, st, 0, 1e-12) || !relClose(cy, -3*st, 0, 1e-12) {
			t.Errorf("CentreStress = (%g, %g), want (%g, %g)", cx, cy, st, -3*st)
		}
	}
}

// Stresses along the two diameters, Timoshenko & Goodier §41 (formulas
// written from memory, re-derived here from the Flamant superposition):
//
// loaded (vertical) diameter, y from the centre:
//
//	σxx = 2P/(πDt),  σyy = −(2P/(πt))[2/(D−2y) + 2/(D+2y) − 1/D],  σxy = 0;
//
// horizontal diameter, x from the centre:
//
//	σxx = (2P/(πDt))[(D²−4x²)/(D²+4x²)]²,
//	σyy = −(2P/(πDt))[4D⁴/(D²+4x²)² − 1],  σxy = 0.
//
// Both are compared with Hooke's law on At's gradient, 1e-6 relative to
// max(|σ|, 2P/(πDt)), in plane stress and plane strain (the stresses of a
// simply connected body under given loads do not depend on the elastic
// constants, so both must agree).
func TestBrazilianDiameterStresses(t *testing.T) {
	for _, ps := range []bool{false, true} {
		d := testDisc(ps)
		s := d.MMPerPx
		D := 2 * d.Radius * s
		st := 2 * d.Load / (math.Pi * D * d.Thickness)
		line := 2 * d.Load / (math.Pi * d.Thickness)
		for _, f := range []float64{-0.95, -0.8, -0.5, -0.2, 0, 0.1, 0.3, 0.6, 0.9, 0.95} {
			// Loaded diameter.
			ypx := f * d.Radius
			y := ypx * s
			sxx, syy, sxy := d.HookeStress(d.At(d.Cx, d.Cy+ypx))
			wyy := -line * (2/(D-2*y) + 2/(D+2*y) - 1/D)
			if !relClose(sxx, st, st, 1e-6) || !relClose(syy, wyy, st, 1e-6) || math.Abs(sxy) > 1e-6*st {
				t.Errorf("plane strain %v, loaded diameter y=%.2fR: (%.6f, %.6f, %.2g), want (%.6f, %.6f, 0)",
					ps, f, sxx, syy, sxy, st, wyy)
			}
			// Horizontal diameter, out to the rim.
			xpx := f * d.Radius
			x := xpx * s
			sxx, syy, sxy = d.HookeStress(d.At(d.Cx+xpx, d.Cy))
			q := (D*D - 4*x*x) / (D*D + 4*x*x)
			wxx := st * q * q
			wyy = -st * (4*D*D*D*D/((D*D+4*x*x)*(D*D+4*x*x)) - 1)
			if !relClose(sxx, wxx, st, 1e-6) || !relClose(syy, wyy, st, 1e-6) || math.Abs(sxy) > 1e-6*st {
				t.Errorf("plane strain %v, horizontal diameter x=%.2fR: (%.6f, %.6f, %.2g), want (%.6f, %.6f, 0)",
					ps, f, sxx, syy, sxy, wxx, wyy)
			}
		}
	}
}

// The closed-form Stress agrees with Hooke's law on the displacement
// gradient everywhere inside the disc (r ≤ 0.95R) and a few pixels from the
// load points: the displacements are an exact elastic solution with the
// published stresses, 1e-6 relative to max(|σ|, 2P/(πDt)).
func TestBrazilianStressFieldFromDisplacements(t *testing.T) {
	for _, ps := range []bool{false, true} {
		d := testDisc(ps)
		st := d.TensileStress()
		pts := [][2]float64{{0, -d.Radius + 3}, {2, d.Radius - 4}, {-3, -d.Radius + 5}}
		for r := 0.05; r <= 0.951; r += 0.1 {
			for th := 0.0; th < 2*math.Pi; th += 0.41 {
				pts = append(pts, [2]float64{r * d.Radius * math.Cos(th), r * d.Radius * math.Sin(th)})
			}
		}
		for _, p := range pts {
			x, y := d.Cx+p[0], d.Cy+p[1]
			hx, hy, hxy := d.HookeStress(d.At(x, y))
			wx, wy, wxy := d.Stress(x, y)
			if !relClose(hx, wx, st, 1e-6) || !relClose(hy, wy, st, 1e-6) || !relClose(hxy, wxy, st, 1e-6) {
				t.Errorf("plane strain %v at (%+.1f, %+.1f) px: Hooke (%.6f, %.6f, %.6f), closed form (%.6f, %.6f, %.6f)",
					ps, p[0], p[1], hx, hy, hxy, wx, wy, wxy)
			}
		}
	}
}

// Away from the loads the rim is free: σrr = σrθ = 0 (the boundary
// condition of the problem). For concentrated loads the hoop stress vanishes
// too, because on the rim the two Flamant stresses are equal uniaxial
// compressions 2P/(πDt) along perpendicular chords (Thales), cancelled by
// the uniform tension (Timoshenko & Goodier §41). Stresses from At's
// gradient, 1e-6 of 2P/(πDt), at angles more than 20° from the load axis.
func TestBrazilianRimTractionFree(t *testing.T) {
	for _, ps := range []bool{false, true} {
		d := testDisc(ps)
		st := d.TensileStress()
		n := 0
		for deg := 0.0; deg < 360; deg += 5 {
			fromAxis := math.Abs(math.Mod(deg, 180) - 90) // angle from the vertical load axis
			if fromAxis <= 20 {
				continue
			}
			th := deg * math.Pi / 180
			sxx, syy, sxy := d.HookeStress(d.At(d.Cx+d.Radius*math.Cos(th), d.Cy+d.Radius*math.Sin(th)))
			srr, stt, srt := toPolar(sxx, syy, sxy, th)
			if math.Abs(srr) > 1e-6*st || math.Abs(srt) > 1e-6*st || math.Abs(stt) > 1e-6*st {
				t.Errorf("plane strain %v, rim at %g°: (σrr, σθθ, σrθ) = (%.2g, %.2g, %.2g) MPa, want 0", ps, deg, srr, stt, srt)
			}
			n++
		}
		if n != 54 {
			t.Fatalf("checked %d rim points, want 54", n)
		}
	}
}

// Horizontal diametral expansion, plane stress: integrating
// εxx = (σxx − νσyy)/E along the horizontal diameter with the Timoshenko &
// Goodier stresses above gives ΔD = (P/(πEt))(4 − π + πν), using
// ∫₋₁¹((1−s²)/(1+s²))² ds = 4 − π and ∫₋₁¹(4/(1+s²)² − 1) ds = π (our
// integration). In plane strain E → E/(1−ν²), ν → ν/(1−ν). This checks the
// displacement itself, not only its gradient: ΔD = u(R, 0) − u(−R, 0), to
// 1e-9 relative; a composite Simpson quadrature of the same strains must
// agree to 1e-9 relative.
func TestBrazilianDiametralExpansion(t *testing.T) {
	for _, ps := range []bool{false, true} {
		d := testDisc(ps)
		e, nu := d.E, d.Nu
		if ps {
			e, nu = e/(1-nu*nu), nu/(1-nu)
		}
		want := d.Load / (math.Pi * e * d.Thickness) * (4 - math.Pi + math.Pi*nu) // mm
		got := (d.At(d.Cx+d.Radius, d.Cy).U - d.At(d.Cx-d.Radius, d.Cy).U) * d.MMPerPx
		if !relClose(got, want, 0, 1e-9) {
			t.Errorf("plane strain %v: ΔD = %.9g mm, want (P/πEt)(4−π+πν) = %.9g mm", ps, got, want)
		}
		// Simpson over x ∈ [−R, R] of the textbook horizontal-diameter strains.
		D := 2 * d.Radius * d.MMPerPx
		st := d.TensileStress()
		exx := func(x float64) float64 {
			q := (D*D - 4*x*x) / (D*D + 4*x*x)
			sxx := st * q * q
			syy := -st * (4*D*D*D*D/((D*D+4*x*x)*(D*D+4*x*x)) - 1)
			return (sxx - nu*syy) / e
		}
		const n = 2000
		h := D / n
		sum := exx(-D/2) + exx(D/2)
		for i := 1; i < n; i++ {
			w := 2.0
			if i%2 == 1 {
				w = 4
			}
			sum += w * exx(-D/2+float64(i)*h)
		}
		if quad := sum * h / 3; !relClose(quad, want, 0, 1e-9) {
			t.Errorf("plane strain %v: Simpson ΔD = %.9g mm, closed form %.9g mm", ps, quad, want)
		}
	}
}

// The analytic gradient agrees with a central finite difference of the
// displacement (calculus; step 1e-3 px, truncation O(h²)), 1e-6 relative to
// the larger of the gradient entry and the centre strain |εyy|, inside the
// disc and a few pixels from the loads.
func TestBrazilianGradientMatchesFiniteDifference(t *testing.T) {
	for _, ps := range []bool{false, true} {
		d := testDisc(ps)
		scale := math.Abs(d.At(d.Cx, d.Cy).VY)
		const h = 1e-3
		pts := [][2]float64{{0, 0}, {5, -d.Radius + 4}, {-6, d.Radius - 5}, {0, d.Radius - 3}}
		for r := 0.1; r <= 0.951; r += 0.15 {
			for th := 0.2; th < 2*math.Pi; th += 0.7 {
				pts = append(pts, [2]float64{r * d.Radius * math.Cos(th), r * d.Radius * math.Sin(th)})
			}
		}
		for _, p := range pts {
			x, y := d.Cx+p[0], d.Cy+p[1]
			m := d.At(x, y)
			px, mx := d.At(x+h, y), d.At(x-h, y)
			py, my := d.At(x, y+h), d.At(x, y-h)
			fd := [4]float64{(px.U - mx.U) / (2 * h), (py.U - my.U) / (2 * h), (px.V - mx.V) / (2 * h), (py.V - my.V) / (2 * h)}
			an := [4]float64{m.UX, m.UY, m.VX, m.VY}
			for i := range fd {
				if !relClose(fd[i], an[i], scale, 1e-6) {
					t.Errorf("plane strain %v at (%+.1f, %+.1f) px: gradient %d analytic %.10g, finite difference %.10g",
						ps, p[0], p[1], i, an[i], fd[i])
				}
			}
		}
	}
}

// Mirror symmetry of the problem about both diameters: u is odd in x and
// even in y, v odd in y and even in x (offsets from the centre); the centre
// does not move or rotate. Tolerance 1e-12 px on displacements of order
// 0.1 px, 1e-15 on the centre rotation.
func TestBrazilianSymmetry(t *testing.T) {
	d := testDisc(false)
	c := d.At(d.Cx, d.Cy)
	if math.Abs(c.U) > 1e-12 || math.Abs(c.V) > 1e-12 || math.Abs(c.VX-c.UY) > 1e-15 {
		t.Errorf("centre motion (%g, %g) px, rotation %g, want 0", c.U, c.V, (c.VX-c.UY)/2)
	}
	var peak float64
	for _, p := range [][2]float64{{100, 37}, {250, -180}, {31, 400}, {420, 120}, {5, -470}} {
		m := d.At(d.Cx+p[0], d.Cy+p[1])
		mx := d.At(d.Cx-p[0], d.Cy+p[1])
		my := d.At(d.Cx+p[0], d.Cy-p[1])
		if math.Abs(m.U+mx.U) > 1e-12 || math.Abs(m.U-my.U) > 1e-12 {
			t.Errorf("(%g, %g): u = %g, u(−x) = %g, u(−y) = %g; want odd in x, even in y", p[0], p[1], m.U, mx.U, my.U)
		}
		if math.Abs(m.V+my.V) > 1e-12 || math.Abs(m.V-mx.V) > 1e-12 {
			t.Errorf("(%g, %g): v = %g, v(−y) = %g, v(−x) = %g; want odd in y, even in x", p[0], p[1], m.V, my.V, mx.V)
		}
		peak = math.Max(peak, math.Hypot(m.U, m.V))
	}
	// The field must not be trivially zero: the displacements above reach
	// a tenth of a pixel or more (strains ~1e-3 over 500 px).
	if peak < 0.1 {
		t.Errorf("largest displacement %.3g px, want ≥ 0.1", peak)
	}
}

// Scaled multiplies the load: the field is linear in P (superposition), so
// half the load gives half the motion, 1e-12 relative.
func TestBrazilianScaled(t *testing.T) {
	d := testDisc(false)
	h := d.Scaled(0.5)
	for _, p := range [][2]float64{{120, -90}, {-300, 200}, {10, 460}} {
		x, y := d.Cx+p[0], d.Cy+p[1]
		m, mh := d.At(x, y), h.At(x, y)
		got := [6]float64{mh.U, mh.V, mh.UX, mh.UY, mh.VX, mh.VY}
		full := [6]float64{m.U, m.V, m.UX, m.UY, m.VX, m.VY}
		for i := range got {
			if !relClose(got[i], full[i]/2, 1e-12, 1e-12) {
				t.Errorf("(%g, %g) component %d: scaled %g, want %g", p[0], p[1], i, got[i], full[i]/2)
			}
		}
	}
}

// Exactly at a load point the field is singular; At nudges the point by
// 1e-9 R so that rendering, which may evaluate every pixel, never sees NaN
// or Inf (documented behaviour of At).
func TestBrazilianLoadPointFinite(t *testing.T) {
	d := testDisc(false)
	for _, y := range []float64{d.Cy - d.Radius, d.Cy + d.Radius} {
		m := d.At(d.Cx, y)
		for i, v := range [6]float64{m.U, m.V, m.UX, m.UY, m.VX, m.VY} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("load point y=%g: component %d = %g, want finite", y, i, v)
			}
		}
	}
}
