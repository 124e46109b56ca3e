package strain_test

import (
	"math"
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
		f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
		for i := range f.Points {
			x, y := g.Pos(i)
			p := &f.Points[i]
			p.X, p.Y = x, y
			if math.Hypot(float64(x)-80, float64(y)-70) < 30 { // an opening: one-sided windows around it
				p.Status = subset.Masked
				continue
			}
			p.Status, p.ZNCC = subset.Converged, 1
			p.P[subset.PU] = scale * (ux*float64(x) + uy*float64(y) + 0.3)
			p.P[subset.PV] = scale * (vx*float64(x) + vy*float64(y) - 0.2)
		}
		return f
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
