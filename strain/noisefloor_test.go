package strain_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/subset"
)

// Static frames: the measured displacement noise floor is within 1.3× of
// the SSSIG prediction σ_u ≈ √2·σ/√SSSIG (Pan et al. 2010; Wang et al.
// 2009), and the strain noise floor of a plane-fit window follows from it
// by least-squares error propagation, σ_ε = σ_u/(step·√(N²(N²−1)/12)) for
// a plane fit over N×N points with independent errors (checked exactly in
// TestWindowNoisePropagation). Neighbouring subsets overlap, so their
// errors are positively correlated: fewer independent samples, and the
// measured strain noise sits above that estimate (2.6× here); we require
// a factor between 0.5 and 3.
func TestNoiseFloorOfStaticFrames(t *testing.T) {
	const w, h = 260, 220
	sp, _ := synth.NewSpeckles(speckle4, w, h)
	cam := synth.Camera{Depth: 8, Noise: 2}
	ref, _ := synth.Render(synth.Scene{Speckles: sp}, cam, w, h, 0)
	s := dic.Settings{Subset: 21, Step: 7}
	tr, _ := dic.NewTracker(ref, 0, nil, s)
	win := strain.Window{Size: 7}
	var fields []*dic.Field
	var strains []*strain.Field
	for k := 0; k < 4; k++ {
		img, _ := synth.Render(synth.Scene{Speckles: sp, Field: synth.Translation{U: 0.01 * float64(k)}}, cam, w, h, k)
		f, err := tr.Track(img, k, "static")
		if err != nil {
			t.Fatal(err)
		}
		sf, _ := win.Strain(f)
		fields, strains = append(fields, f), append(strains, sf)
	}
	r, err := strain.NoiseFloor(fields, strains)
	if err != nil {
		t.Fatal(err)
	}
	if r.Frames != 3 {
		t.Errorf("%d static frames used, want 3 (the reference itself has no scatter)", r.Frames)
	}
	clean, _ := synth.Render(synth.Scene{Speckles: sp}, synth.Camera{Depth: 8}, w, h, 0)
	spl := subset.NewSpline(clean, subset.Bicubic)
	var pred float64
	var n int
	for i := range fields[1].Points {
		p := &fields[1].Points[i]
		if p.Valid() {
			sx, _ := subset.SSSIGXY(spl, p.X, p.Y, 10)
			pred += subset.PredictedNoise(math.Sqrt(4+1.0/12), sx)
			n++
		}
	}
	pred /= float64(n)
	if r.U > 1.3*pred || r.U < pred/1.3 {
		t.Errorf("σ_u floor %.4f px, SSSIG prediction %.4f px (ratio %.2f)", r.U, pred, r.U/pred)
	}
	const N = 7.0
	est := r.U / (7 * math.Sqrt(N*N*(N*N-1)/12))
	if r.Exx < 0.5*est || r.Exx > 3*est {
		t.Errorf("εxx floor %.1f µε, error propagation %.1f µε", r.Exx*1e6, est*1e6)
	}
	t.Logf("noise floor: σ_u %.4f px (SSSIG %.4f, ratio %.2f), σ_v %.4f, σ_exx %.0f µε (propagated %.0f), σ_eeq %.0f µε",
		r.U, pred, r.U/pred, r.V, r.Exx*1e6, est*1e6, r.Eeq*1e6)
}

// The strain window is a linear least-squares estimator: with independent
// Gaussian errors σ on u, the fitted slope of a plane over N×N points at
// spacing h has σ = σ_u/(h·√(Σdx²)), Σdx² = N²(N²−1)/12 (ordinary least
// squares, e.g. Draper & Smith, Applied Regression Analysis, §1.4).
func TestWindowNoisePropagation(t *testing.T) {
	g := dic.Grid{Step: 5, Cols: 80, Rows: 80}
	f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	rng := rand.New(rand.NewPCG(1, 2))
	const sigma = 0.01
	for i := range f.Points {
		f.Points[i].X, f.Points[i].Y = g.Pos(i)
		f.Points[i].Status = subset.Converged
		f.Points[i].P[subset.PU] = sigma * rng.NormFloat64()
	}
	const N = 9.0
	sf, err := strain.Window{Size: 9}.Strain(f)
	if err != nil {
		t.Fatal(err)
	}
	var xs []float64
	for _, p := range sf.Points {
		c, r := (p.X)/5, (p.Y)/5
		if p.Valid && c >= 4 && r >= 4 && c < 76 && r < 76 { // full windows only
			xs = append(xs, p.Exx)
		}
	}
	var m, s2 float64
	for _, x := range xs {
		m += x
	}
	m /= float64(len(xs))
	for _, x := range xs {
		s2 += (x - m) * (x - m)
	}
	got := math.Sqrt(s2 / float64(len(xs)-1))
	want := sigma / (5 * math.Sqrt(N*N*(N*N-1)/12))
	// Overlapping windows make the samples correlated; 5184 of them still
	// pin the standard deviation within 10 %.
	if math.Abs(got-want) > 0.1*want {
		t.Errorf("σ_exx = %.3g, least squares %.3g", got, want)
	}
}
