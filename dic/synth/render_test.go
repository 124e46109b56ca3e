package synth

import (
	"math"
	"testing"

	"spallscope/subset"
)

func rms(a, b *subset.Image, margin int) (rmsDiff, maxDiff float64) {
	n := 0
	for y := margin; y < a.Height-margin; y++ {
		for x := margin; x < a.Width-margin; x++ {
			d := float64(a.At(x, y) - b.At(x, y))
			rmsDiff += d * d
			maxDiff = math.Max(maxDiff, math.Abs(d))
			n++
		}
	}
	return math.Sqrt(rmsDiff / float64(n)), maxDiff
}

// Shift theorem (standard signal theory): for a periodic, band-limited
// image, translating by (dx, dy) equals multiplying its spectrum by a phase
// ramp. Our analytic renderer moves the spots themselves; gonum's FFT
// (dsp/fourier) shifts the rendered reference. They must agree to a small
// fraction of a gray level. What remains is aliasing (the pattern is not
// strictly band-limited: the ink saturation 1−e^−S adds harmonics to the
// Gaussian spots) plus 16-bit quantisation (RMS 1/√12 level). Measured
// here: R = 3.5 px gives about 0.6 levels RMS of 65535; R = 2.5 px about
// 12, which is why the test uses the larger spots.
func TestTranslationMatchesFourierShift(t *testing.T) {
	p := Pattern{Radius: 3.5, Coverage: 0.5, Seed: 7, Periodic: true}
	sp, err := NewSpeckles(p, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	cam := Camera{Depth: 16, Oversample: 2}
	ref, _ := Render(Scene{Speckles: sp}, cam, 96, 80, 0)
	for _, d := range [][2]float64{{0.37, -0.81}, {3.5, 0.25}, {-7.13, 11.9}} {
		moved, _ := Render(Scene{Speckles: sp, Field: Translation{U: d[0], V: d[1]}}, cam, 96, 80, 0)
		want := FourierShift(ref, d[0], d[1])
		r, m := rms(moved, want, 0)
		// Tolerance: 1.5 gray levels of 65535 RMS, 8 max (2.3e-5 and 1.2e-4 of full scale).
		if r > 1.5 || m > 8 {
			t.Errorf("shift %v: RMS %.3f, max %.2f levels (of 65535) between analytic and Fourier translation", d, r, m)
		}
		t.Logf("shift %v: RMS %.3f max %.2f levels of 65535", d, r, m)
	}
}

// Pattern statistics by Campbell's theorem for Poisson shot noise (e.g.
// Kingman, Poisson Processes, 1993, §3.2): with coverage c(x) = 1 − e^−S,
// S = Σ κ·exp(−|x−xk|²/R²), E[e^−S] = exp(−λπR²·Ein(κ)) and
// E[e^−2S] = exp(−λπR²·Ein(2κ)). So the mean gray level and its standard
// deviation (the pattern's contrast) follow from what was asked.
func TestPatternStatisticsMatchCampbell(t *testing.T) {
	for _, c := range []struct{ r, cov float64 }{{2.5, 0.5}, {4, 0.35}, {3, 0.65}} {
		p := Pattern{Radius: c.r, Coverage: c.cov, Seed: 11}.withDefaults()
		sp, err := NewSpeckles(p, 700, 700)
		if err != nil {
			t.Fatal(err)
		}
		cam := Camera{Depth: 16, Oversample: 1} // point sampling: the theorem is about point values
		img, _ := Render(Scene{Speckles: sp}, cam, 700, 700, 0)
		mean, sq := 0.0, 0.0
		for _, v := range img.Pix {
			g := float64(v) / 65535
			mean += g
			sq += g * g
		}
		n := float64(len(img.Pix))
		mean /= n
		std := math.Sqrt(sq/n - mean*mean)
		lam := p.SpotDensity()
		a := lam * math.Pi * p.Radius * p.Radius
		e1 := math.Exp(-a * Ein(p.Ink))
		e2 := math.Exp(-a * Ein(2*p.Ink))
		wantMean := p.Dark + (p.Paint-p.Dark)*e1
		wantStd := (p.Paint - p.Dark) * math.Sqrt(e2-e1*e1)
		gotCov := (p.Paint - mean) / (p.Paint - p.Dark)
		// Tolerances: sampling error of a 700² image with ~10⁴ spots,
		// about 2 % of the contrast for the mean and 4 % for the spread.
		if math.Abs(gotCov-c.cov) > 0.02 {
			t.Errorf("R=%g: inked fraction %.4f, asked %.4f", c.r, gotCov, c.cov)
		}
		if math.Abs(mean-wantMean) > 0.02*(p.Paint-p.Dark) {
			t.Errorf("R=%g: mean gray %.4f, Campbell %.4f", c.r, mean, wantMean)
		}
		if math.Abs(std-wantStd) > 0.04*wantStd {
			t.Errorf("R=%g: gray std %.4f, Campbell %.4f", c.r, std, wantStd)
		}
		// Spot count is Poisson with mean λ·area (3σ bound).
		wantN := lam * sp.Area()
		if math.Abs(float64(sp.Count())-wantN) > 3*math.Sqrt(wantN) {
			t.Errorf("R=%g: %d spots, expected %.0f ± %.0f", c.r, sp.Count(), wantN, 3*math.Sqrt(wantN))
		}
		t.Logf("R=%g cov %.3f→%.4f mean %.4f (%.4f) std %.4f (%.4f)", c.r, c.cov, gotCov, mean, wantMean, std, wantStd)
	}
}

// Ein against tabulated values: Ein(x) = γ + ln x + E1(x) with E1(1) =
// 0.219383934 and E1(3) = 0.013048381 (Abramowitz & Stegun Table 5.1;
// γ = 0.5772156649).
func TestEin(t *testing.T) {
	const gamma = 0.5772156649015329
	for _, c := range []struct{ x, e1 float64 }{{1, 0.2193839344}, {3, 0.0130483810}} {
		want := gamma + math.Log(c.x) + c.e1
		if got := Ein(c.x); math.Abs(got-want) > 1e-9 {
			t.Errorf("Ein(%g) = %.10f, want %.10f", c.x, got, want)
		}
	}
}

// Openings render untextured at the void level, and the deformed opening
// follows the material: with a uniform strain, a point just inside the
// opening's deformed boundary is void and one just outside is textured
// (continuum kinematics: x = X + ∇u·(X − c)).
func TestOpeningFollowsMaterial(t *testing.T) {
	sp, _ := NewSpeckles(Pattern{Radius: 2, Coverage: 0.5, Seed: 3}, 200, 200)
	hole := Circle(100, 100, 30)
	f := UniformStrain{Cx: 100, Cy: 100, Exx: 0.05, Eyy: -0.1}
	cam := Camera{Depth: 8, Oversample: 1, Void: 0.04}
	img, _ := Render(Scene{Speckles: sp, Field: f, Openings: []Opening{hole}}, cam, 200, 200, 0)
	void := float32(math.Round(0.04 * 255))
	// Deformed hole is an ellipse with semi-axes 30·1.05 = 31.5 and 30·0.9 = 27.
	for _, p := range [][2]int{{100 + 31, 100}, {100, 100 - 26}, {100, 100}} {
		if img.At(p[0], p[1]) != void {
			t.Errorf("pixel %v inside the deformed opening is %v, want void %v", p, img.At(p[0], p[1]), void)
		}
	}
	// Just outside: not exactly void on average over a few pixels.
	n := 0
	for _, p := range [][2]int{{100 + 33, 100}, {100 + 34, 101}, {100, 100 - 29}, {101, 100 - 30}, {100 - 33, 100}, {100, 100 + 29}} {
		if img.At(p[0], p[1]) != void {
			n++
		}
	}
	if n < 4 {
		t.Errorf("only %d of 6 pixels just outside the deformed opening are textured", n)
	}
}

// Inverting the map of a Kirsch field recovers the reference point to the
// Newton tolerance (a fixed point of X + u(X) = x).
func TestInvertKirsch(t *testing.T) {
	f := testKirsch(0.5)
	f.Stress = 400 // strains of 2 % so the map is far from identity
	for _, p := range [][2]float64{{300, 150}, {200, 95}, {140, 210}} {
		m := f.At(p[0], p[1])
		x, y := p[0]+m.U, p[1]+m.V
		X, Y, ok := Invert(f, x, y)
		if !ok || math.Hypot(X-p[0], Y-p[1]) > 1e-7 {
			t.Errorf("invert %v: got (%g,%g) ok=%v", p, X, Y, ok)
		}
	}
	// An open crack leaves a gap with no material.
	c := Crack{X0: 100, Y0: 100, X1: 100, Y1: 40, Opening: 3, Decay: 20}
	if _, _, ok := Invert(c, 100, 80); ok {
		t.Error("a point in the middle of an open crack must have no material")
	}
}

// The opening of a loaded Kirsch frame covers the deformed hole's area:
// the boundary points move to X + u(X), and the shoelace formula gives the
// area they enclose (continuum kinematics). Every pixel whose centre lies
// inside is void, every other one is textured; allow the perimeter's
// partly covered pixels.
func TestKirschFrameOpeningArea(t *testing.T) {
	k := Kirsch{Cx: 128, Cy: 128, Radius: 30, Stress: 300, K: 0.2, E: 20000, Nu: 0.25} // ≈1.5 % strain
	sp, _ := NewSpeckles(Pattern{Radius: 2, Coverage: 0.5, Seed: 9}, 256, 256)
	cam := Camera{Depth: 8, Oversample: 1, Void: 0.04}
	img, _ := Render(Scene{Speckles: sp, Field: k, Openings: []Opening{Circle(128, 128, 30)}}, cam, 256, 256, 0)
	void := float32(math.Round(0.04 * 255))
	n := 0
	for _, v := range img.Pix {
		if v == void {
			n++
		}
	}
	area, perimeter := 0.0, 0.0
	const m = 720
	px, py := 0.0, 0.0
	for i := 0; i <= m; i++ {
		th := 2 * math.Pi * float64(i) / m
		X, Y := 128+30*math.Cos(th), 128+30*math.Sin(th)
		mo := k.At(X, Y)
		x, y := X+mo.U, Y+mo.V
		if i > 0 {
			area += px*y - x*py
			perimeter += math.Hypot(x-px, y-py)
		}
		px, py = x, y
	}
	area = math.Abs(area) / 2
	// A void-coloured textured pixel is rare but possible: allow 1 % extra.
	if math.Abs(float64(n)-area) > perimeter/2+0.01*area {
		t.Errorf("void pixels %d, deformed hole area %.0f px² (perimeter %.0f px)", n, area, perimeter)
	}
	t.Logf("void pixels %d, deformed hole area %.1f px²", n, area)
}
