package model_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/strain/model"
)

// The synthetic test of this file: a 320 px face (0.1 mm/px, so 32 mm)
// with a 40 px (4 mm) opening at its centre under 30 MPa vertical
// compression with lateral ratio 0.25, E = 15 GPa, ν = 0.25 (invented).
const (
	kw, kcx, kcy, ka = 320, 160.0, 160.0, 40.0
	kscale           = 0.1 // mm/px
)

var kirsch = synth.Kirsch{Cx: kcx, Cy: kcy, Radius: ka, Stress: 30, K: 0.25, E: 15000, Nu: 0.25}

// measurement is one tracked and differentiated loaded frame of the
// Kirsch specimen with its resolution from static frames.
type measurement struct {
	mask   *region.Mask
	field  *dic.Field
	strain *strain.Field
	res    strain.Resolution
}

var kirschRun *measurement

// measureKirsch renders the reference, three static frames (camera noise
// only) and one loaded frame, tracks them against the reference and
// differentiates them; the result is shared by the tests of this file.
func measureKirsch(t *testing.T) *measurement {
	t.Helper()
	if kirschRun != nil {
		return kirschRun
	}
	hole := synth.Circle(kcx, kcy, ka)
	mask, err := region.Layout{Exclude: []region.Shape{hole}}.Rasterise(kw, kw)
	if err != nil {
		t.Fatal(err)
	}
	sp, err := synth.NewSpeckles(synth.Pattern{Radius: 1.7, Coverage: 0.5, Seed: 1}, kw, kw)
	if err != nil {
		t.Fatal(err)
	}
	cam := synth.Camera{Depth: 8, Noise: 1}
	ref, err := synth.Render(synth.Scene{Speckles: sp, Openings: []synth.Opening{hole}}, cam, kw, kw, 0)
	if err != nil {
		t.Fatal(err)
	}
	tr, err := dic.NewTracker(ref, 0, mask, dic.Settings{Subset: 21, Step: 6})
	if err != nil {
		t.Fatal(err)
	}
	win := strain.Window{Size: 7}
	var static []*dic.Field
	var staticStrain []*strain.Field
	m := &measurement{mask: mask}
	for k := 1; k <= 4; k++ {
		sc := synth.Scene{Speckles: sp, Openings: []synth.Opening{hole}}
		if k == 4 {
			sc.Field = kirsch
		}
		img, err := synth.Render(sc, cam, kw, kw, k)
		if err != nil {
			t.Fatal(err)
		}
		f, err := tr.Track(img, k, fmt.Sprintf("frame%d", k))
		if err != nil {
			t.Fatal(err)
		}
		sf, err := win.Strain(f)
		if err != nil {
			t.Fatal(err)
		}
		if k == 4 {
			m.field, m.strain = f, sf
		} else {
			static, staticStrain = append(static, f), append(staticStrain, sf)
		}
	}
	if m.res, err = strain.NoiseFloor(static, staticStrain); err != nil {
		t.Fatal(err)
	}
	kirschRun = m
	return m
}

// modelFile writes the analytic Kirsch field (Kirsch 1898, displacements
// as in synth.Kirsch) as our own model file: a regular 0.5 mm grid over
// the face outside the opening, origin at the opening's centre, y up, mm,
// tension positive. The conversion from the image frame is written out
// here rather than taken from the package under test. flipV writes v (and
// the shear) in the y-down sense while the coordinates stay y up: a model
// with a wrong sign convention.
func modelFile(t *testing.T, dir string, flipV bool, extra ...string) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("# Kirsch plate, invented test specimen\nx,y,u,v,exx,eyy,exy\n")
	for j := -31; j <= 31; j++ {
		for i := -31; i <= 31; i++ {
			xm, ym := 0.5*float64(i), 0.5*float64(j)
			if math.Hypot(xm, ym) < ka*kscale {
				continue
			}
			px, py := kcx+xm/kscale, kcy-ym/kscale
			mo := kirsch.At(px, py)
			um, vm, exy := mo.U*kscale, -mo.V*kscale, -(mo.UY+mo.VX)/2
			if flipV {
				vm, exy = -vm, -exy
			}
			fmt.Fprintf(&b, "%g,%g,%.9g,%.9g,%.9g,%.9g,%.9g\n", xm, ym, um, vm, mo.UX, mo.VY, exy)
		}
	}
	for _, e := range extra {
		b.WriteString(e + "\n")
	}
	path := filepath.Join(dir, "kirsch-model.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// kirschFormat is how the model file of modelFile is read.
var kirschFormat = model.Format{Units: model.MM, Scale: kscale, OriginX: kcx, OriginY: kcy, YUp: true}

// The main check. A synthetic Kirsch test (the measurement) is held
// against a model file written from the analytic Kirsch solution (Kirsch
// 1898) on the same specimen: the difference must be of the order of the
// measurement's own resolution, measured on static frames
// (strain.NoiseFloor). The displacement RMS is allowed 3× the displacement
// resolution: the difference holds the loaded frame's noise (1× by
// itself), the bias of the affine subset shape function where the field
// curves near the opening, and the bilinear interpolation of a 0.5 mm
// model grid. There is no rigid-body offset to remove: both fields are
// displacements from the unloaded reference with the opening's centre
// fixed, so the mean difference (bias) must be below one resolution.
// Strains are compared away from the wall — beyond half the virtual
// strain gauge (7-point window, step 6, subset 21: 57 px) from the
// opening, where the gauge averages over the opening's steepest gradients
// — and allowed 3× their noise floor each. The measured pattern is the
// model's: Pearson correlation over 0.9 for u and v.
func TestKirschWithinResolution(t *testing.T) {
	m := measureKirsch(t)
	dir := t.TempDir()
	mf, err := model.Read(modelFile(t, dir, false), kirschFormat)
	if err != nil {
		t.Fatal(err)
	}
	c, err := model.Compare(m.field, m.strain, mf, model.Options{Mask: m.mask, Resolution: &m.res})
	if err != nil {
		t.Fatal(err)
	}
	if !c.Regular || math.Abs(c.Radius-10) > 1e-9 {
		t.Errorf("0.5 mm model grid: regular %v, radius %.3f px; want a regular grid and twice its 5 px spacing", c.Regular, c.Radius)
	}
	checkDisplacement(t, "regular grid, bilinear", c, m.res)
	if err := model.Write(dir, c); err != nil {
		t.Fatal(err)
	}

	vsg := strain.Window{Size: 7}.VSG(6, 21)
	away := model.Options{Mask: m.mask, Resolution: &m.res, Exclude: []region.Shape{region.Circle(kcx, kcy, ka+float64(vsg)/2)}}
	cs, err := model.Compare(m.field, m.strain, mf, away)
	if err != nil {
		t.Fatal(err)
	}
	for _, q := range []model.Quantity{model.Exx, model.Eyy, model.Exy} {
		s, ok := cs.Stat(q)
		if !ok || s.Count < 1500 || !(s.RMS <= 3*s.Resolution) {
			t.Errorf("%s beyond %.1f px of the wall: %d points, RMS %.1f µε, noise floor %.1f µε (limit 3×)", q, float64(vsg)/2, s.Count, s.RMS*1e6, s.Resolution*1e6)
		}
		t.Logf("%s beyond %.1f px of the wall: %d points, RMS %.1f µε = %.2f× the noise floor, bias %.1f µε, model RMS %.0f µε, correlation %.3f",
			q, float64(vsg)/2, s.Count, s.RMS*1e6, s.Ratio(), s.Bias*1e6, s.ModelRMS*1e6, s.Correlation)
	}

	// The same analytic field at scattered points, as a mesh's nodes
	// would be, goes through the moving-least-squares path with the same
	// outcome for the displacements.
	sc, err := model.Read(scatteredModelFile(t, dir), kirschFormat)
	if err != nil {
		t.Fatal(err)
	}
	c2, err := model.Compare(m.field, nil, sc, model.Options{Mask: m.mask, Resolution: &m.res})
	if err != nil {
		t.Fatal(err)
	}
	if c2.Regular || len(c2.Quantities) != 2 {
		t.Errorf("scattered model: regular %v, quantities %v; want scattered, u and v only (no strain field given)", c2.Regular, c2.Quantities)
	}
	checkDisplacement(t, "scattered, moving least squares", c2, m.res)
}

// checkDisplacement applies the displacement limits of the main check.
func checkDisplacement(t *testing.T, what string, c *model.Comparison, res strain.Resolution) {
	t.Helper()
	for _, q := range []model.Quantity{model.U, model.V} {
		s, ok := c.Stat(q)
		switch {
		case !ok || s.Count < 2000:
			t.Errorf("%s: %s compared at %d points, want at least 2000", what, q, s.Count)
		case !(s.RMS <= 3*s.Resolution):
			t.Errorf("%s: %s RMS difference %.4f px, resolution %.4f px (limit 3×)", what, q, s.RMS, s.Resolution)
		case !(math.Abs(s.Bias) <= s.Resolution):
			t.Errorf("%s: %s bias %.4f px, resolution %.4f px (limit 1×)", what, q, s.Bias, s.Resolution)
		case !(s.Correlation > 0.9):
			t.Errorf("%s: %s correlation %.4f, want over 0.9", what, q, s.Correlation)
		}
		t.Logf("%s: %s at %d points (%d bilinear): RMS %.4f px = %.2f× the resolution, bias %.5f px, max %.4f px, correlation %.4f",
			what, q, s.Count, s.Bilinear, s.RMS, s.Ratio(), s.Bias, s.MaxAbs, s.Correlation)
	}
}

// scatteredModelFile writes the analytic Kirsch displacements (Kirsch
// 1898) at an irregular cloud of points — each 0.5 mm cell's point moved
// by up to a third of the cell, invented — in the format of modelFile,
// without strains.
func scatteredModelFile(t *testing.T, dir string) string {
	t.Helper()
	rng := rand.New(rand.NewPCG(3, 7))
	var b strings.Builder
	b.WriteString("x,y,u,v\n")
	for j := -31; j <= 31; j++ {
		for i := -31; i <= 31; i++ {
			xm := 0.5*float64(i) + (rng.Float64()-0.5)/3
			ym := 0.5*float64(j) + (rng.Float64()-0.5)/3
			if math.Hypot(xm, ym) < ka*kscale {
				continue
			}
			mo := kirsch.At(kcx+xm/kscale, kcy-ym/kscale)
			fmt.Fprintf(&b, "%.6f,%.6f,%.9g,%.9g\n", xm, ym, mo.U*kscale, -mo.V*kscale)
		}
	}
	path := filepath.Join(dir, "kirsch-scattered.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// A model whose v (and shear) follow y down while its coordinates are y
// up — a sign mistake of the model's export — is caught: v correlates
// strongly negatively with the measurement while u still agrees.
//
// Reading a whole file with the wrong y direction is a different matter:
// points and displacements flip together, and since the Kirsch field is
// mirror-symmetric about the opening's horizontal axis (Kirsch 1898) the
// mirrored model is the same field — a mistaken YUp with the origin on
// that axis cannot be seen in the comparison, and must agree as well as
// the right one (which also checks that points and v are flipped
// together).
func TestWrongSignConvention(t *testing.T) {
	m := measureKirsch(t)
	dir := t.TempDir()
	bad, err := model.Read(modelFile(t, dir, true), kirschFormat)
	if err != nil {
		t.Fatal(err)
	}
	c, err := model.Compare(m.field, m.strain, bad, model.Options{Mask: m.mask, Resolution: &m.res})
	if err != nil {
		t.Fatal(err)
	}
	u, _ := c.Stat(model.U)
	v, _ := c.Stat(model.V)
	if !(v.Correlation < -0.9) || !(u.Correlation > 0.9) || !(v.RMS > 10*v.Resolution) {
		t.Errorf("v in the wrong sense: v correlation %.4f (want below −0.9), RMS %.4f px = %.0f× the resolution (want over 10×); u correlation %.4f (want over 0.9)",
			v.Correlation, v.RMS, v.Ratio(), u.Correlation)
	}
	t.Logf("v in the wrong sense: v correlation %.4f, RMS %.3f px (%.0f× the resolution); u correlation %.4f", v.Correlation, v.RMS, v.Ratio(), u.Correlation)

	down := kirschFormat
	down.YUp = false
	mirrored, err := model.Read(modelFile(t, dir, false), down)
	if err != nil {
		t.Fatal(err)
	}
	cm, err := model.Compare(m.field, m.strain, mirrored, model.Options{Mask: m.mask, Resolution: &m.res})
	if err != nil {
		t.Fatal(err)
	}
	checkDisplacement(t, "whole file read y down, symmetric field", cm, m.res)
}

// Model points outside the measured region — in the opening or beyond the
// face — are counted and named by line, not dropped silently, against the
// run's mask; a model read in the wrong units (px for mm) lands in the
// opening and is refused with the count.
func TestOutsideCounted(t *testing.T) {
	m := measureKirsch(t)
	dir := t.TempDir()
	planted := [][2]float64{{0, 0}, {1, 1}, {20, 0}, {-20, 5}, {0, 17}} // mm: two in the opening, three off the 32 mm face
	var extra []string
	for _, p := range planted {
		extra = append(extra, fmt.Sprintf("%g,%g,0,0,0,0,0", p[0], p[1]))
	}
	path := modelFile(t, dir, false, extra...)
	mf, err := model.Read(path, kirschFormat)
	if err != nil {
		t.Fatal(err)
	}
	c, err := model.Compare(m.field, m.strain, mf, model.Options{Mask: m.mask})
	if err != nil {
		t.Fatal(err)
	}
	text, _ := os.ReadFile(path)
	lines := strings.Split(string(text), "\n")
	if c.Outside.Count != len(planted) || c.Outside.Total != len(mf.Points) || len(c.Outside.First) != len(planted) {
		t.Fatalf("outside: %d of %d named %d, want the %d planted points of %d", c.Outside.Count, c.Outside.Total, len(c.Outside.First), len(planted), len(mf.Points))
	}
	for k, o := range c.Outside.First {
		if o.ModelX != planted[k][0] || o.ModelY != planted[k][1] || lines[o.Line-1] != extra[k] {
			t.Errorf("outside point %d: line %d (%g, %g) mm, holding %q; want the planted (%g, %g) on its own line", k, o.Line, o.ModelX, o.ModelY, lines[o.Line-1], planted[k][0], planted[k][1])
		}
	}
	w := c.Warnings()
	if len(w) != 1 || !strings.Contains(w[0], fmt.Sprintf("%d of %d model points", len(planted), len(mf.Points))) || !strings.Contains(w[0], fmt.Sprintf("line %d ", c.Outside.First[0].Line)) {
		t.Errorf("warnings %q, want one naming the count and the lines", w)
	}
	t.Log(w)

	px := kirschFormat
	px.Units = model.PX
	wrong, err := model.Read(path, px)
	if err != nil {
		t.Fatal(err)
	}
	_, err = model.Compare(m.field, m.strain, wrong, model.Options{Mask: m.mask})
	if err == nil || !strings.Contains(err.Error(), fmt.Sprintf("%d of %d model points lie outside", len(wrong.Points), len(wrong.Points))) {
		t.Errorf("model in px instead of mm: %v; want an error counting every point outside", err)
	}
}
