package strain_test

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/strain"
)

// Brazilian disc (Hondros 1959; ISRM suggested method 1978): at the centre
// of a disc loaded along a diameter, σxx = 2P/(πDt) in tension and
// σyy = −6P/(πDt), so in plane stress εxx = (σxx − ν·σyy)/E. The measured
// horizontal strain at the disc centre must be within 5 % of that value.
func TestBrazilianDiscCentreStrain(t *testing.T) {
	const w, cx, cy, r = 440, 220, 220, 200.0
	disc := synth.BrazilianDisc{Cx: cx, Cy: cy, Radius: r, Load: 12000, Thickness: 20, MMPerPx: 0.1, E: 15000, Nu: 0.25}
	sx, sy := disc.CentreStress()
	d := 2 * r * disc.MMPerPx
	if want := 2 * disc.Load / (math.Pi * d * disc.Thickness); math.Abs(sx-want) > 1e-9*want {
		t.Fatalf("centre tensile stress %g MPa, ISRM 2P/(πDt) = %g", sx, want)
	}
	want := (sx - disc.Nu*sy) / disc.E
	roi := region.Layout{ROI: []region.Shape{region.Circle(cx, cy, 60)}}
	mask, _ := roi.Rasterise(w, w)
	field := trackPair(t, w, w, disc, synth.Camera{Depth: 8, Noise: 1}, mask, dic.Settings{Subset: 21, Step: 5})
	sf, err := strain.Window{Size: 9}.Strain(field)
	if err != nil {
		t.Fatal(err)
	}
	// Mean over the points within 6 px of the centre (noise averaging).
	var sum float64
	n := 0
	for _, p := range sf.Points {
		if p.Valid && math.Hypot(float64(p.X)-cx, float64(p.Y)-cy) <= 6 {
			sum += p.Exx
			n++
		}
	}
	if n == 0 {
		t.Fatal("no valid strain at the disc centre")
	}
	got := sum / float64(n)
	if math.Abs(got-want) > 0.05*want {
		t.Errorf("εxx at the centre %.0f µε, Hondros/ISRM %.0f µε (limit 5 %%)", got*1e6, want*1e6)
	}
	t.Logf("disc centre: εxx %.1f µε vs %.1f µε analytic (%.2f %%), %d points", got*1e6, want*1e6, 100*(got-want)/want, n)
}
