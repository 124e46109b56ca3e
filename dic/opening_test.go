package dic_test

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// Plate with a circular opening under vertical compression (Kirsch 1898;
// Jaeger, Cook & Zimmerman §8.4, through the synthetic lab's exact field):
// every point whose subset overlaps the opening is either within 0.02 px
// of the truth or flagged; none is silently wrong. Subsets overlapping the
// opening use only their measured pixels (at least MinValidFraction of the
// subset), so points close to the wall are still measured.
func TestKirschPointsNearOpening(t *testing.T) {
	const w, cx, cy, a = 256, 127.5, 127.5, 40.0
	k := synth.Kirsch{Cx: cx, Cy: cy, Radius: a, Stress: 40, K: 0.25, E: 15000, Nu: 0.2}
	hole := synth.Circle(cx, cy, a)
	ref, def := pair(t, w, w, k, synth.Camera{Depth: 8, Noise: 1}, hole)
	mask, err := region.Layout{Exclude: []region.Shape{hole}}.Rasterise(w, w)
	if err != nil {
		t.Fatal(err)
	}
	field := track(t, ref, def, mask, dic.Settings{Subset: 21, Step: 5})
	near, measured, worst := 0, 0, 0.0
	for i := range field.Points {
		p := &field.Points[i]
		d := math.Hypot(float64(p.X)-cx, float64(p.Y)-cy)
		if d < a || d > a+10*math.Sqrt2 {
			continue
		}
		near++
		if !p.Valid() {
			continue
		}
		measured++
		m := k.At(float64(p.X), float64(p.Y))
		u, v := p.U()
		e := math.Hypot(u-m.U, v-m.V)
		worst = math.Max(worst, e)
		if e > 0.02 {
			t.Errorf("point (%d,%d) at %.1f px from the centre: error %.4f px and not flagged", p.X, p.Y, d, e)
		}
	}
	if measured < near/2 {
		t.Errorf("only %d of %d points next to the opening measured", measured, near)
	}
	t.Logf("next to the opening: %d points, %d measured, worst error %.4f px", near, measured, worst)
	// Points whose subset is mostly inside the opening are reported masked.
	for i := range field.Points {
		p := &field.Points[i]
		if math.Hypot(float64(p.X)-cx, float64(p.Y)-cy) < a-2 && p.Status != subset.Masked {
			t.Fatalf("point (%d,%d) inside the opening has status %v, want masked", p.X, p.Y, p.Status)
		}
	}
}

// A crack opening across the field: points whose subsets straddle it are
// flagged (their subset no longer deforms like a shape function), points
// on either side are measured, and nothing is forced across.
func TestCrackIsFlaggedNotForced(t *testing.T) {
	crack := synth.Crack{X0: 100, Y0: -20, X1: 100, Y1: 220, Opening: 2.5, Decay: 60, Embedded: true}
	ref, def := pair(t, 200, 200, crack, synth.Camera{Depth: 8, Noise: 1})
	field := track(t, ref, def, nil, dic.Settings{Subset: 21, Step: 6})
	straddle, flagged, far, farOK := 0, 0, 0, 0
	for i := range field.Points {
		p := &field.Points[i]
		if p.Y < 30 || p.Y > 170 {
			continue
		}
		d := math.Abs(float64(p.X) - 100)
		switch {
		case d <= 6:
			straddle++
			if !p.Valid() {
				flagged++
			}
		case d >= 12 && p.X >= 10 && p.X <= 189:
			far++
			if p.Valid() {
				m := crack.At(float64(p.X), float64(p.Y))
				if u, v := p.U(); math.Hypot(u-m.U, v-m.V) < 0.02 {
					farOK++
				}
			}
		}
	}
	if flagged < straddle*9/10 {
		t.Errorf("%d of %d points straddling the crack flagged", flagged, straddle)
	}
	if farOK < far*95/100 {
		t.Errorf("%d of %d points clear of the crack within 0.02 px", farOK, far)
	}
	t.Logf("crack: %d/%d straddling flagged, %d/%d clear points accurate", flagged, straddle, farOK, far)
}
