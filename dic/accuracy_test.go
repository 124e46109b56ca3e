package dic_test

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// Interpolation bias: subpixel translations 0.0–1.0 px in 0.1 px steps,
// noise-free 8-bit frames, 21 px subsets, 4 px speckles. The mean error at
// every shift must stay within 0.005 px (bicubic) and 0.002 px
// (biquintic). The frames are exact renderings of the moved pattern, so
// the truth is the prescribed shift (shift theorem: translation moves every
// spot by the same vector).
func TestSubpixelTranslationBias(t *testing.T) {
	sp, _ := synth.NewSpeckles(speckle4, 160, 160)
	cam := synth.Camera{Depth: 8}
	ref, _ := synth.Render(synth.Scene{Speckles: sp}, cam, 160, 160, 0)
	limits := map[subset.Interpolation]float64{subset.Bicubic: 0.005, subset.Biquintic: 0.002}
	worst := map[subset.Interpolation]float64{}
	for k := 0; k <= 10; k++ {
		s := float64(k) / 10
		f := synth.Translation{U: s, V: -0.6 * s}
		def, _ := synth.Render(synth.Scene{Speckles: sp, Field: f}, cam, 160, 160, 0)
		for interp, limit := range limits {
			field := track(t, ref, def, nil, dic.Settings{Subset: 21, Step: 12, Interpolation: interp})
			eu, ev := errorsAgainst(field, f)
			mu, _ := meanStd(eu)
			mv, _ := meanStd(ev)
			if math.Abs(mu) > limit || math.Abs(mv) > limit {
				t.Errorf("%v shift %.1f px: mean error (%.4f, %.4f) px, limit %.3f", interp, s, mu, mv, limit)
			}
			worst[interp] = math.Max(worst[interp], math.Max(math.Abs(mu), math.Abs(mv)))
		}
	}
	t.Logf("worst mean error over shifts: bicubic %.4f px, biquintic %.4f px", worst[subset.Bicubic], worst[subset.Biquintic])
}

// Random error under Gaussian noise σ = 2 gray levels in both frames: the
// standard deviation of u must be within 1.3× the prediction
// σ_u ≈ √2·σ/√SSSIG (Pan et al. 2010, Wang et al. 2009; the √2 accounts
// for noise in both images), evaluated per point with the SSSIG of its
// subset. The effective σ includes 8-bit quantisation (1/√12 level).
func TestNoiseMatchesSSSIGPrediction(t *testing.T) {
	f := synth.Translation{U: 0.35, V: 0.2}
	ref, def := pair(t, 300, 300, f, synth.Camera{Depth: 8, Noise: 2})
	clean, _ := pair(t, 300, 300, nil, synth.Camera{Depth: 8})
	field := track(t, ref, def, nil, dic.Settings{Subset: 21, Step: 21})
	sp := subset.NewSpline(clean, subset.Bicubic)
	sigma := math.Sqrt(4 + 1.0/12)
	var eu, pred []float64
	for i := range field.Points {
		p := &field.Points[i]
		if !p.Valid() {
			continue
		}
		u, _ := p.U()
		eu = append(eu, u-f.U)
		sx, _ := subset.SSSIGXY(sp, p.X, p.Y, 10)
		pred = append(pred, subset.PredictedNoise(sigma, sx))
	}
	_, std := meanStd(eu)
	pm, _ := meanStd(pred)
	if len(eu) < 150 || std > 1.3*pm {
		t.Errorf("σ_u = %.4f px over %d points, predicted %.4f px (ratio %.2f, limit 1.3)", std, len(eu), pm, std/pm)
	}
	t.Logf("noise σ=2: σ_u %.4f px, predicted %.4f px, ratio %.2f over %d points", std, pm, std/pm, len(eu))
}

// The integer search finds the same peak as a brute-force ZNCC over every
// integer shift (our own subset.ZNCC, itself checked against gonum's
// Pearson correlation), and its score is OpenCV matchTemplate's
// TM_CCOEFF_NORMED value, i.e. the ZNCC at that peak.
func TestSearchIntegerAgreesWithBruteForce(t *testing.T) {
	f := synth.Sum{synth.Translation{U: 17.4, V: -9.8}, synth.UniformStrain{Cx: 80, Cy: 80, Exx: 0.01}}
	ref, def := pair(t, 160, 160, f, synth.Camera{Depth: 8, Noise: 3})
	const r, radius = 10, 24
	for _, c := range [][2]int{{60, 60}, {80, 90}, {100, 70}} {
		m, err := dic.SearchInteger(ref, def, c[0], c[1], r, 10, -5, radius)
		if err != nil {
			t.Fatal(err)
		}
		tmpl := window(ref, c[0], c[1], r)
		best, bu, bv := -2.0, 0, 0
		for v := -5 - radius; v <= -5+radius; v++ {
			for u := 10 - radius; u <= 10+radius; u++ {
				if cc := subset.ZNCC(tmpl, window(def, c[0]+u, c[1]+v, r)); cc > best {
					best, bu, bv = cc, u, v
				}
			}
		}
		if m.U != bu || m.V != bv || math.Abs(m.ZNCC-best) > 1e-4 {
			t.Errorf("at %v: search (%d,%d) ZNCC %.5f, brute force (%d,%d) %.5f", c, m.U, m.V, m.ZNCC, bu, bv, best)
		}
		tr := f.At(float64(c[0]), float64(c[1]))
		if math.Abs(float64(m.U)-tr.U) > 0.5+1e-9 || math.Abs(float64(m.V)-tr.V) > 0.5+1e-9 {
			t.Errorf("at %v: integer match (%d,%d), truth (%.2f,%.2f)", c, m.U, m.V, tr.U, tr.V)
		}
	}
}

func window(img *subset.Image, x, y, r int) []float64 {
	out := make([]float64, 0, (2*r+1)*(2*r+1))
	for j := y - r; j <= y+r; j++ {
		for i := x - r; i <= x+r; i++ {
			out = append(out, float64(img.At(i, j)))
		}
	}
	return out
}
