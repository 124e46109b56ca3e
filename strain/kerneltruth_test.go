package strain_test

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/subset"
)

// A uniform strain field through the kernel truth gives exactly that
// strain at every point with a strain, full windows and the one-sided
// ones at an opening and at the edges alike: the least-squares plane (and
// quadratic) fit of a linear field is the field itself, so its slope is
// exact (Savitzky and Golay 1964: the filter differentiates polynomials of
// its order exactly). γmax = √((εxx − εyy)² + 4εxy²) (principal strains of
// a symmetric tensor, common practice, no source).
func TestKernelTruthUniformStrainIsExact(t *testing.T) {
	const ux, uy, vx, vy = 1.2e-3, -0.4e-3, 0.7e-3, -0.9e-3
	want := math.Hypot(ux-vy, uy+vx)
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 20, Rows: 18}
	field := func(scale float64) *dic.Field {
		return fieldAroundOpening(g, 0, 80, 70, 30, func(x, y float64) (u, v float64) {
			return scale * (ux*x + uy*y + 0.3), scale * (vx*x + vy*y - 0.2)
		})
	}
	for _, order := range []int{1, 2} {
		kt, err := strain.Window{Size: 7, Order: order}.KernelTruth([]*dic.Field{nil, field(0.5), field(1)}, strain.MaxShear)
		if err != nil {
			t.Fatal(err)
		}
		n := 0
		for f, scale := range []float64{0, 0.5, 1} {
			for i, v := range kt.Values[f] {
				if math.IsNaN(v) {
					continue
				}
				n++
				if math.Abs(v-scale*want) > 1e-12 {
					t.Fatalf("order %d frame %d point %d: γmax %.15g, want %.15g (exact)", order, f, i, v, scale*want)
				}
			}
			if math.Abs(kt.Max[f]-scale*want) > 1e-12 {
				t.Errorf("order %d frame %d: max %.15g, want %.15g", order, f, kt.Max[f], scale*want)
			}
		}
		measured := 0
		for _, p := range field(1).Points {
			if p.Valid() {
				measured++
			}
		}
		if n < 3*measured*8/10 {
			t.Errorf("order %d: %d points with a strain over 3 frames, want at least 80 %% of the %d measured ones in each", order, n, measured)
		}
		// The noise gain: 1 on a full window (Σw² of the Savitzky–Golay
		// slope, worked in KernelTruth's comment), more on the one-sided
		// windows at the opening and the edges (fewer points, off-centre):
		// at the left edge a plane's window has 4 columns of 7 points, the
		// x-slope the offsets 0…3 only, Σ(x − x̄)² = 7·5 = 35 against 196
		// on a full window, its y-slope 4·28 = 112 against 196; the
		// variances are 196/35 = 5.6 and 196/112 = 1.75 times a full
		// window's and the gain √((5.6 + 1.75)/2) = 1.917 (by hand; more for
		// a quadratic).
		if gi := kt.Gain[g.Index(3, 3)]; math.Abs(gi-1) > 1e-12 {
			t.Errorf("order %d: noise gain %.15g on a full window, want 1", order, gi)
		}
		if ge := kt.Gain[g.Index(0, 8)]; (order == 1 && math.Abs(ge-math.Sqrt((5.6+1.75)/2)) > 1e-9) || !(ge > 1.9) {
			t.Errorf("order %d: noise gain %.6g at the left edge, want %.6g for a plane, more for a quadratic", order, ge, math.Sqrt((5.6+1.75)/2))
		}
		if f := kt.FirstAbove(0.6 * want); f != 2 {
			t.Errorf("order %d: first above %.3g in frame %d, want 2", order, 0.6*want, f)
		}
	}
}

// Worked example (derived by hand, see KernelTruth): the least-squares
// slope over a window of 2h+1 points at step s px is the weighted sum
// Σ_i k_i·(u_{i+1} − u_i)/s with k_i = Σ_{j>i} x_j / Σ_j x_j², so a jump S
// between the window's two middle points reads S·3/(2·(2h+1)·s): for 7
// points at 8 px, S/37.33 px. A straight band (slip S = 2 px along x,
// half-width 1 px, at y = 63 px, across which u = (S/2)·tanh((y − 63)/1))
// lies between the grid rows at 60 and 68 px, 3 and 5 px away; the cell on
// either row reads 2/37.33 = 0.05357 at full growth. The band's profile is
// not quite a jump: each point's u falls short of ±S/2 by
// (S/2)·(1 − tanh(d/h)) at distance d, so the reading is off by at most
// Σ_j |x_j|·(S/2)(1 − tanh(d_j/h)) / (Σ_j x_j²·s), which the test computes
// (4.1e-7 on the row at 60 px, 2.2e-5 on the one at 68 px, whose point 3 px from the band is off the window's centre). The box mean over a 69 px VSG centred on either row holds
// the whole jump too: S/69 = 0.02899 (synth.FeatureBoxGammaOnGrid). The
// band grows linearly from frame 10 (zero) to 30 (full): at a limit of
// 0.02 the kernel is above it from g = 0.373, frame 18 (0.0214; frame 17:
// 0.0188), the box from g = 0.690, frame 24 (0.0203; frame 23: 0.0188).
func TestKernelTruthWorkedBand(t *testing.T) {
	const slip, h, yb, step = 2.0, 1.0, 63.0, 8
	b := synth.ShearBand{X0: -1000, Y0: yb, X1: 1e8, Y1: yb, Slip: slip, HalfWidth: h, Decay: 1e9}
	sc := &synth.Scenario{Name: "kt", Width: 120, Height: 120, Frames: 31, FPS: 1,
		Pattern: synth.Pattern{Radius: 2, Coverage: 0.5, Seed: 1},
		Fields:  []synth.FieldSpec{{Band: &b, Drive: synth.DriveGrowth, StartFrame: 10, FullFrame: 30}}}
	g := dic.Grid{X0: 4, Y0: 4, Step: step, Cols: 14, Rows: 14}
	fields := make([]*dic.Field, sc.Frames)
	for f := range fields {
		var err error
		if fields[f], err = sc.FeatureFieldOnGrid(0, f, g, nil, 0); err != nil {
			t.Fatal(err)
		}
	}
	win := strain.Window{Size: 7}
	kt, err := win.KernelTruth(fields, strain.MaxShear)
	if err != nil {
		t.Fatal(err)
	}
	// The tolerance of a cell on row y: each point's shortfall from the
	// ideal jump, weighted by its offset, over Σx²·step, plus 1e-7 of the
	// reading for the band's taper and decay (not quite 1 over the grid).
	var sxx float64 // Σx² over the window's offsets
	for j := -3; j <= 3; j++ {
		sxx += float64(j * j)
	}
	tolAt := func(y float64, reading float64) float64 {
		var tol float64
		for j := -3; j <= 3; j++ {
			d := math.Abs(y + float64(j*step) - yb)
			tol += math.Abs(float64(j)) * slip / 2 * (1 - math.Tanh(d/h))
		}
		return tol/(sxx*step) + 1e-7*reading
	}
	full := slip * 3 / (2 * 7 * step)
	for _, c := range []struct{ frame, row int }{{20, 7}, {30, 7}, {30, 8}} {
		gf := float64(c.frame-10) / 20
		i := g.Index(5, c.row)
		tol := tolAt(float64(g.Y0+c.row*step), full) * gf
		if got := kt.Values[c.frame][i]; math.Abs(got-full*gf) > tol {
			t.Errorf("frame %d row %d: γmax %.9f, want %.9f ± %.1e (a jump between the window's middle points)", c.frame, c.row, got, full*gf, tol)
		}
	}
	if tol := tolAt(60, full); math.Abs(kt.Max[30]-full) > tol {
		t.Errorf("max at full growth %.9f, want %.9f ± %.1e", kt.Max[30], full, tol)
	}
	if _, r := kt.Peak[30]%g.Cols, kt.Peak[30]/g.Cols; r != 7 && r != 8 {
		t.Errorf("peak on grid row %d, want 7 or 8 (y = 60 or 68)", r)
	}
	if f := kt.FirstAbove(0.02); f != 18 {
		t.Errorf("kernel truth detectable at frame %d, want 18", f)
	}
	// At a run's per-point bar (FirstAboveScale): a scale of 1 is the
	// bare limit, frame 18; 1.8 everywhere is a limit of 0.036, reached at
	// g = 0.672, frame 24 (0.0375; frame 23: 0.0348); 1.8 on the row at
	// 60 px alone leaves the row at 68 px, which reads the same, at frame
	// 18; 1.8 on both leaves the rows at 52 and 76 px, which have the band
	// between offsets 1 and 2 of their windows: k_1 = (2 + 3)/28, a reading
	// of 2·5/(28·8) = 0.0446·g, above 0.02 from g = 0.448, frame 19
	// (0.02009, against a profile error of 2e-5; frame 18: 0.0179); a point
	// without a bar (NaN) never counts.
	at := func(v float64, rows ...int) []float64 {
		sc := make([]float64, g.Len())
		for i := range sc {
			sc[i] = 1
			if len(rows) == 0 || slices.Contains(rows, i/g.Cols) {
				sc[i] = v
			}
		}
		return sc
	}
	for _, c := range []struct {
		name  string
		scale []float64
		want  int
	}{{"1 everywhere", at(1), 18}, {"1.8 everywhere", at(1.8), 24}, {"1.8 on the row at 60 px", at(1.8, 7), 18},
		{"1.8 on both rows", at(1.8, 7, 8), 19}, {"no bar", at(math.NaN()), -1}} {
		f, err := kt.FirstAboveScale(0.02, c.scale)
		if err != nil || f != c.want {
			t.Errorf("scale %s: detectable at frame %d (%v), want %d", c.name, f, err, c.want)
		}
	}
	if _, err := kt.FirstAboveScale(0.02, make([]float64, g.Len()-1)); err == nil {
		t.Error("a scale short of one value a grid point: no error")
	}
	if f, _ := kt.FirstAboveScale(0.02, kt.Gain); f != kt.FirstAboveNoise(0.02) {
		t.Errorf("at the window's gain: frame %d, FirstAboveNoise %d, want the same", f, kt.FirstAboveNoise(0.02))
	}
	box, err := sc.FeatureBoxGammaOnGrid(0, 30, win.VSG(step, 21), g)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := box[g.Index(5, 7)], slip/2*(math.Tanh((63-26)/h)+math.Tanh((95-63)/h))/69; math.Abs(got-want) > 1e-7*want { // the taper and decay, as above
		t.Errorf("box mean at row 60 (window [26, 95] px): %.9f, want (u(95) − u(26))/69 = %.9f", got, want)
	}
	truths, err := sc.FeatureTruthOnGrid(win.VSG(step, 21), 0.02, synth.Placement{X0: g.X0, Y0: g.Y0, Step: g.Step})
	if err != nil {
		t.Fatal(err)
	}
	if truths[0].DetectableFrame != 24 {
		t.Errorf("box truth detectable at frame %d, want 24", truths[0].DetectableFrame)
	}
}

// Decorrelation has no strain: the kernel truth refuses it, and frames
// without any field.
func TestKernelTruthRefuses(t *testing.T) {
	g := dic.Grid{X0: 0, Y0: 0, Step: 8, Cols: 8, Rows: 8}
	f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	if _, err := (strain.Window{Size: 5}).KernelTruth([]*dic.Field{f}, strain.Decorrelation); err == nil {
		t.Error("decorrelation: no error")
	}
	if _, err := (strain.Window{Size: 5}).KernelTruth([]*dic.Field{nil, nil}, strain.MaxShear); err == nil {
		t.Error("no fields: no error")
	}
}

// The zones stage's measured noise scale (Finder.NoiseScale: each point's
// standard deviation of γmax over the calibration frames relative to the
// median point's, at least 1) against the window's theoretical noise gain
// (KernelTruth.Gain) on fields of independent Gaussian displacement noise,
// the case the gain assumes. The window's slope is a weighted sum
// Σ_j w_j·u_j, so its variance is σ²·Σ_j w_j² (the variance of a weighted
// sum of independent variables, textbook). With u and v independent and of
// equal variance, the two components of γmax/2, (εxx − εyy)/2 and εxy,
// both have variance σ²·(Σw_x² + Σw_y²)/4 and are uncorrelated (their
// covariance is σ²·(Σw_x·w_y − Σw_y·w_x)/4 = 0; derived here), so γmax is
// Rayleigh distributed with a scale ∝ Gain, and its standard deviation is
// ∝ Gain at every point.
//
// The measured scale divides by the median of the points' sample standard
// deviations, not by a full window's true one. Over N frames a sample
// standard deviation has a relative standard error se = √((κ − 1)/(4N))
// (large-sample variance of the sample variance, textbook), κ = 3.245 the
// Rayleigh distribution's kurtosis (3 + the excess (−6π² + 24π − 16)/(4 −
// π)², from memory): 0.037 at N = 400. The full windows' sample values
// scatter by se about their true value and the one-sided windows lie
// above them all, so the median is the full windows' quantile q =
// (n/2)/n_full, z_q·se above the truth (order statistics, textbook), and
// the expected scale is max(1, c·Gain), c = 1/(1 + z_q·se) (0.97 here).
// Held: the median point's gain is 1 (a full window); the mean of
// scale/Gain over the one-sided windows (Gain ≥ 1.3, where the scale is
// not clipped at 1) is c within 0.01 (its own standard error is 0.002);
// every point's scale is max(1, c·Gain) within 0.16 of it (4.3 se).
func TestNoiseScaleIsTheGainOnIndependentNoise(t *testing.T) {
	const frames, sigma = 400, 0.02
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 40, Rows: 40}
	rng := rand.New(rand.NewPCG(15, 1))
	field := func(index int, noise bool) *dic.Field {
		return fieldAroundOpening(g, index, 150, 170, 40, func(x, y float64) (u, v float64) {
			if !noise {
				return 0, 0
			}
			return sigma * rng.NormFloat64(), sigma * rng.NormFloat64()
		})
	}
	win := strain.Window{Size: 7, Measure: strain.Engineering}
	ref := field(0, false)
	kt, err := win.KernelTruth([]*dic.Field{ref}, strain.MaxShear)
	if err != nil {
		t.Fatal(err)
	}
	calib := make([]*strain.Field, frames)
	stress := make([]float64, frames)
	for k := range calib {
		if calib[k], err = win.Strain(field(k, true)); err != nil {
			t.Fatal(err)
		}
	}
	finder, err := strain.NewFinder(strain.FinderConfig{Indicators: []strain.Indicator{strain.MaxShear}}, ref, strain.FitBaseline(calib, stress))
	if err != nil {
		t.Fatal(err)
	}
	finder.SetNoise(calib, stress)
	scale := finder.NoiseScale()[strain.MaxShear]
	if len(scale) != g.Len() {
		t.Fatalf("%d noise scales, want one for each of the %d grid points", len(scale), g.Len())
	}
	var gains []float64
	full := 0
	for _, v := range kt.Gain {
		if !math.IsNaN(v) {
			gains = append(gains, v)
			if math.Abs(v-1) < 1e-9 {
				full++
			}
		}
	}
	slices.Sort(gains)
	if med := gains[len(gains)/2]; math.Abs(med-1) > 1e-9 {
		t.Fatalf("median gain %.15g, want 1 (most windows full)", med)
	}
	kurt := 3 + (-6*math.Pi*math.Pi+24*math.Pi-16)/((4-math.Pi)*(4-math.Pi))
	se := math.Sqrt((kurt - 1) / (4 * frames))
	q := float64(len(gains)/2) / float64(full)
	c := 1 / (1 + math.Sqrt2*math.Erfinv(2*q-1)*se)
	var worst, sum float64
	walls := 0
	for i, gi := range kt.Gain {
		if math.IsNaN(gi) {
			continue
		}
		want := math.Max(1, c*gi)
		d := math.Abs(scale[i]/want - 1)
		worst = math.Max(worst, d)
		if d > 0.16 {
			t.Errorf("point (%d, %d): measured scale %.4f, want max(1, %.4f × gain %.4f) = %.4f within 16 %%", i%g.Cols, i/g.Cols, scale[i], c, gi, want)
		}
		if gi >= 1.3 {
			walls++
			sum += scale[i] / gi
		}
	}
	if walls < 100 {
		t.Fatalf("%d points with a gain of at least 1.3, want at least 100 (the edges and the opening's wall)", walls)
	}
	mean := sum / float64(walls)
	if math.Abs(mean-c) > 0.01 {
		t.Errorf("mean measured scale / gain over %d one-sided windows %.4f, want c = %.4f within 0.01", walls, mean, c)
	}
	t.Logf("%d points (%d full windows), %d with gain ≥ 1.3 (largest %.2f); se %.4f, c %.4f; mean scale/gain over the one-sided %.4f, worst point %.3f off", len(gains), full, walls, gains[len(gains)-1], se, c, mean, worst)
}

// fieldAroundOpening is frame index's displacement field on grid g, every
// point converged with displacement disp(x, y) but those inside a
// circular opening of radius r at (cx, cy), masked, so that the strain
// window is one-sided around it.
func fieldAroundOpening(g dic.Grid, index int, cx, cy, r float64, disp func(x, y float64) (u, v float64)) *dic.Field {
	f := &dic.Field{Index: index, Grid: g, Points: make([]dic.Point, g.Len())}
	for i := range f.Points {
		x, y := g.Pos(i)
		p := &f.Points[i]
		p.X, p.Y = x, y
		if math.Hypot(float64(x)-cx, float64(y)-cy) < r {
			p.Status = subset.Masked
			continue
		}
		p.Status, p.ZNCC = subset.Converged, 1
		p.P[subset.PU], p.P[subset.PV] = disp(float64(x), float64(y))
	}
	return f
}
