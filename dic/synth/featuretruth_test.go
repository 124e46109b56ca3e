package synth

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/sector"
	"spallscope/subset"
)

// straightBand is a band along x through y = 60 whose taper and decay are
// negligible over the image: about 10⁸ px long (at a fifth of its growth
// the cos² taper is 1 − 8·10⁻⁹ at x = 120), decay 10⁹ px. Across it
// u = (S/2)·tanh((y − 60)/h).
func straightBand(slip, h float64) ShearBand {
	return ShearBand{X0: -1000, Y0: 60, X1: 1e8, Y1: 60, Slip: slip, HalfWidth: h, Decay: 1e9}
}

func flatScenario(fields ...FieldSpec) *Scenario {
	return &Scenario{Name: "ft", Width: 120, Height: 120, Frames: 31, FPS: 1,
		Pattern: Pattern{Radius: 2, Coverage: 0.5, Seed: 1}, Fields: fields}
}

// Worked example (by hand; the mean of a derivative over an interval is
// the difference of the end values over its length, the fundamental
// theorem of calculus). A band of slip S = 2 px and half-width h = 2 px
// grows linearly from frame 10 (zero) to frame 30 (full). Over a window of
// side V = 40 px centred on the band, the mean of ∂u/∂y is
// (u(+20) − u(−20))/40 = S·tanh(10)/40 = 0.05 at full growth, and γmax =
// |∂u/∂y| (the only gradient component) = 0.05·g at growth g = (f −
// 10)/20. With a limit of 0.0115: frame 14 gives 0.0100, frame 15 gives
// 0.0125 — detectable at frame 15; the hidden start is frame 11 (first
// g > 0). Pointwise, γmax at the band's centre line is S/(2h) = 0.5·g.
func TestFeatureTruthWorkedBand(t *testing.T) {
	b := straightBand(2, 2)
	sc := flatScenario(FieldSpec{Band: &b, Drive: DriveGrowth, StartFrame: 10, FullFrame: 30})
	truth, err := sc.FeatureTruth(40, 0.0115)
	if err != nil {
		t.Fatal(err)
	}
	if len(truth) != 1 {
		t.Fatalf("%d features, want 1", len(truth))
	}
	ft := truth[0]
	if ft.Kind != FeatureBand || ft.Feature != "band 0" || ft.HiddenStart != 11 || ft.DetectableFrame != 15 {
		t.Errorf("%s (%s): hidden start %d, detectable %d; want band 0, 11, 15", ft.Feature, ft.Kind, ft.HiddenStart, ft.DetectableFrame)
	}
	for _, c := range []struct {
		frame     int
		vsg, gmax float64
	}{{10, 0, 0}, {14, 0.01, 0.1}, {15, 0.0125, 0.125}, {20, 0.025, 0.25}, {30, 0.05, 0.5}} {
		if got := ft.VSGGamma[c.frame]; math.Abs(got-c.vsg) > 1e-6 {
			t.Errorf("frame %d: VSG γmax %.7f, want %.7f (worked by hand)", c.frame, got, c.vsg)
		}
		if got := ft.MaxGamma[c.frame]; math.Abs(got-c.gmax) > 1e-6 {
			t.Errorf("frame %d: pointwise γmax %.7f, want %.7f", c.frame, got, c.gmax)
		}
	}
	// The window of largest mean is centred on the band.
	if math.Abs(ft.PeakY-60) > 0.5 {
		t.Errorf("peak window centred at y = %g, want 60", ft.PeakY)
	}
	// Another limit on the same curve: 0.026 is first exceeded at g =
	// 0.55, frame 21 (0.0275); 0.06 never.
	if f := ft.FirstAbove(0.026); f != 21 {
		t.Errorf("FirstAbove(0.026) = %d, want 21", f)
	}
	if f := ft.FirstAbove(0.06); f != -1 {
		t.Errorf("FirstAbove(0.06) = %d, want −1 (never)", f)
	}
	if ft.Sector != sector.Other || ft.Opening != -1 {
		t.Errorf("no openings: sector %s opening %d, want other −1", ft.Sector, ft.Opening)
	}
}

// Worked example (by hand, as above) of the truth on a measurement grid:
// the same band, V = 40 px, windows centred on the points of a grid at
// 0, 40, 80 px (step 40). The windows inside the image are centred at
// y = 40 and 80: [20, 60] and [60, 100], each ending on the band's centre
// line, so the mean of ∂u/∂y is (u(60) − u(20))/40 = (S/2)·tanh(10)/40 =
// 0.025·g, half the best-placed window's. With the limit 0.0115 that is
// first exceeded at g = 0.5 → frame 20 (0.0125), five frames after the
// every-pixel truth's frame 15.
func TestFeatureTruthOnGridWorkedBand(t *testing.T) {
	b := straightBand(2, 2)
	sc := flatScenario(FieldSpec{Band: &b, Drive: DriveGrowth, StartFrame: 10, FullFrame: 30})
	truth, err := sc.FeatureTruthOnGrid(40, 0.0115, Placement{X0: 0, Y0: 0, Step: 40})
	if err != nil {
		t.Fatal(err)
	}
	ft := truth[0]
	if ft.DetectableFrame != 20 || ft.Grid == nil || ft.Grid.Step != 40 {
		t.Errorf("detectable %d (grid %v), want frame 20 on the step-40 grid", ft.DetectableFrame, ft.Grid)
	}
	for _, c := range []struct {
		frame int
		vsg   float64
	}{{15, 0.00625}, {20, 0.0125}, {30, 0.025}} {
		if got := ft.VSGGamma[c.frame]; math.Abs(got-c.vsg) > 1e-6 {
			t.Errorf("frame %d: VSG γmax on the grid %.7f, want %.7f (worked by hand)", c.frame, got, c.vsg)
		}
	}
	// A step of 1 px is every pixel.
	every, err := sc.FeatureTruth(40, 0.0115)
	if err != nil {
		t.Fatal(err)
	}
	one, err := sc.FeatureTruthOnGrid(40, 0.0115, Placement{Step: 1})
	if err != nil {
		t.Fatal(err)
	}
	if one[0].DetectableFrame != every[0].DetectableFrame || math.Abs(one[0].VSGGamma[30]-every[0].VSGGamma[30]) > 1e-12 {
		t.Errorf("step-1 grid: detectable %d, γ %g; every pixel %d, %g", one[0].DetectableFrame, one[0].VSGGamma[30], every[0].DetectableFrame, every[0].VSGGamma[30])
	}
	if _, err := sc.FeatureTruthOnGrid(40, 0.0115, Placement{Step: 0}); err == nil {
		t.Error("grid step 0 accepted")
	}
}

// Worked example: a displacement jump w across a window of side V
// averages to a mean gradient of w/V (the end-value difference over the
// length, as above, with the jump between the ends). An opening crack
// along y = 60 whose faces move apart by w = 1.6 px (profile and decay
// negligible: about 10⁸ px long, decay 10⁹ px), growing linearly from
// frame 0 (zero) to frame 30:
// over V = 40 px, γmax = |∂v/∂y| = 1.6/40 = 0.04 at the last frame; the
// faces themselves do not strain, so the pointwise γmax is ~0.
func TestFeatureTruthWorkedCrackJump(t *testing.T) {
	c := Crack{X0: -1000, Y0: 60, X1: 1e8, Y1: 60, Opening: 1.6, Decay: 1e9}
	sc := flatScenario(FieldSpec{Crack: &c, Drive: DriveGrowth, StartFrame: 0, FullFrame: 30})
	truth, err := sc.FeatureTruth(40, 0.02)
	if err != nil {
		t.Fatal(err)
	}
	ft := truth[0]
	if got := ft.VSGGamma[30]; math.Abs(got-0.04) > 1e-6 {
		t.Errorf("VSG γmax of a 1.6 px jump over 40 px: %.7f, want 0.04", got)
	}
	if ft.MaxGamma[30] > 1e-6 {
		t.Errorf("pointwise γmax of the faces %.3g, want ~0", ft.MaxGamma[30])
	}
	// 0.04·g > 0.02 first at g = 0.5333 (frame 16): g(15) = 0.5 exactly
	// gives 0.02, not above.
	if ft.HiddenStart != 1 || ft.DetectableFrame != 16 {
		t.Errorf("hidden start %d, detectable %d; want 1, 16", ft.HiddenStart, ft.DetectableFrame)
	}
}

// Openings are no rock: a window over an opening averages only the links
// with both ends in rock, so an embedded band wholly inside an opening
// (radius 30 px) is invisible; the sector of a notch starting at an
// opening's right wall is its right sidewall; a spall is detectable at
// its own frame.
func TestFeatureTruthOpeningsAndSectors(t *testing.T) {
	b := ShearBand{X0: 40, Y0: 60, X1: 80, Y1: 60, Slip: 2, HalfWidth: 2, Decay: 2, Embedded: true}
	n := Notch{X0: 90, Y0: 60, X1: 115, Y1: 45, X2: 115, Y2: 75, Slip: 1, HalfWidth: 2}
	sc := flatScenario(FieldSpec{Band: &b, Drive: DriveRamp}, FieldSpec{Notch: &n, Drive: DriveRamp})
	sc.Openings = []Opening{Circle(60, 60, 30)}
	sc.Spalls = []Spall{{Region: Opening{Cx: 96, Cy: 60, Rx: 5, Ry: 10}, Frame: 25}}
	truth, err := sc.FeatureTruth(20, 1e-3)
	if err != nil {
		t.Fatal(err)
	}
	if len(truth) != 3 {
		t.Fatalf("%d features, want 3", len(truth))
	}
	// The embedded band's motion dies out within a few decay lengths of
	// its line, deep inside the hole: its windows over rock see (almost)
	// nothing. At y = 60 ± 30 (the rim above and below) the band is 30 px
	// away: e^(−30/2) = 3·10⁻⁷ of its slip.
	if g := truth[0].VSGGamma[30]; g > 1e-5 {
		t.Errorf("band inside the opening: VSG γmax %.3g, want ~0", g)
	}
	if ft := truth[1]; ft.Kind != FeatureNotch || ft.Opening != 0 || ft.Sector != sector.RightSidewall || ft.DetectableFrame < 1 {
		t.Errorf("notch: %+v, want opening 0 right-sidewall, detectable", ft)
	}
	if ft := truth[2]; ft.Kind != FeatureSpall || ft.HiddenStart != 25 || ft.DetectableFrame != 25 || ft.Sector != sector.RightSidewall {
		t.Errorf("spall: %+v, want right-sidewall, hidden start = detectable = 25", ft)
	}
	if _, err := sc.FeatureTruth(1, 1e-3); err == nil {
		t.Error("a 1 px VSG was accepted")
	}
	if _, err := sc.FeatureTruth(20, 0); err == nil {
		t.Error("a zero limit was accepted")
	}
}

// A feature's own displacement on a grid (FeatureFieldOnGrid), worked by
// hand on the straight band (u = (S/2)·tanh((y − 60)/h) along x): point
// samples are the profile itself; a 21 px subset's mean on the centre line
// is 0 (an odd profile over a symmetric subset), and 5 px off it the terms
// at y − 60 = −5…5 cancel, leaving (S/2)·Σ_{d=−15}^{−6} tanh(d/h) / 21.
// Points flagged unmeasured, and a frame before the band moves, give
// masked points and zero displacement.
func TestFeatureFieldOnGrid(t *testing.T) {
	const slip, h = 2.0, 2.0
	b := straightBand(slip, h)
	sc := flatScenario(FieldSpec{Band: &b, Drive: DriveGrowth, StartFrame: 10, FullFrame: 30})
	g := dic.Grid{X0: 20, Y0: 20, Step: 5, Cols: 16, Rows: 16} // rows at 20, 25, …, 95
	measured := make([]bool, g.Len())
	for i := range measured {
		measured[i] = i%7 != 0
	}
	row := func(y int) int { return g.Index(3, (y-20)/5) }
	pts, err := sc.FeatureFieldOnGrid(0, 30, g, measured, 0)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := pts.Points[row(55)].P[subset.PU], slip/2*math.Tanh(-5/h); math.Abs(got-want) > 1e-6 {
		t.Errorf("point sample at y = 55: u %.9f, want %.9f", got, want)
	}
	mean, err := sc.FeatureFieldOnGrid(0, 30, g, measured, 21)
	if err != nil {
		t.Fatal(err)
	}
	var tail float64
	for d := -15; d <= -6; d++ {
		tail += math.Tanh(float64(d) / h)
	}
	for _, c := range []struct {
		y    int
		want float64
	}{{60, 0}, {55, slip / 2 * tail / 21}} {
		if got := mean.Points[row(c.y)].P[subset.PU]; math.Abs(got-c.want) > 1e-6 {
			t.Errorf("21 px subset mean at y = %d: u %.9f, want %.9f", c.y, got, c.want)
		}
	}
	for i, p := range mean.Points {
		if p.Valid() != measured[i] {
			t.Fatalf("point %d valid %v, want %v (the measured flags)", i, p.Valid(), measured[i])
		}
	}
	before, err := sc.FeatureFieldOnGrid(0, 5, g, nil, 21)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range before.Points {
		if p.P[subset.PU] != 0 || p.P[subset.PV] != 0 || !p.Valid() {
			t.Fatalf("frame 5, before the band moves: %+v, want a measured point at rest", p)
		}
	}
	if _, err := sc.FeatureFieldOnGrid(0, 30, g, measured, 20); err == nil {
		t.Error("an even subset: no error")
	}
	if _, err := sc.FeatureFieldOnGrid(0, 30, g, measured[:3], 0); err == nil {
		t.Error("3 measured flags for 256 points: no error")
	}
}
