package strain_test

import (
	"testing"

	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/strain"
)

// A shear band grows at the right sidewall from frame 14 of 40 (slip and
// length both grow linearly from zero there to full at frame 34; the
// synthetic lab's exact field). The per-frame threshold, which rises with
// the load's scatter, confirms it only at frame 32; back-dating from the
// history of its cells puts the onset well before the trigger (at least 5
// frames), never later, never in the calibration frames, and never before
// the band exists (frame 15 is its first move).
func TestBackDatingOfGrowingBand(t *testing.T) {
	const start = 14
	sc, mask, openings := blockWithOpening(40)
	band := synth.ShearBand{X0: 159.5, Y0: 127.5, X1: 199.5, Y1: 102.5, Slip: 1.0, HalfWidth: 3}
	sc.Fields = append(sc.Fields, synth.FieldSpec{Band: &band, Drive: synth.DriveGrowth, StartFrame: start, FullFrame: start + 20})
	r := trackedSequence(t, sc, mask, openings)
	lastCalib := 0
	for k, c := range r.calibration {
		if c {
			lastCalib = k
		}
	}
	var side *strain.Onset
	onsets := r.backDated()
	for i, o := range onsets {
		iv := o.Interval
		t.Logf("%s %s %s: trigger %d, onset %d, interval %d–%d (%s, log LR %.0f)", o.Class, o.Sector, o.Indicator, o.TriggerFrame, o.Frame, iv.FirstFrame, iv.LastFrame, iv.Model, iv.LogLik)
		if o.Frame > o.TriggerFrame || o.Frame <= lastCalib || iv.FirstFrame > o.Frame || iv.LastFrame < o.Frame {
			t.Errorf("%s: onset %d, trigger %d, interval %d–%d, calibration up to %d", o.Sector, o.Frame, o.TriggerFrame, iv.FirstFrame, iv.LastFrame, lastCalib)
		}
		if o.Class == strain.Localization && o.Sector == strain.RightSidewall && side == nil {
			side = &onsets[i]
		}
	}
	if side == nil {
		t.Fatal("no localization onset at the right sidewall")
	}
	if side.Frame > side.TriggerFrame-5 || side.Frame < start+1 {
		t.Errorf("onset %d, trigger %d: want at least 5 frames before the trigger and not before the band's first move at %d", side.Frame, side.TriggerFrame, start+1)
	}
}

// A purely elastic ramp on a fine grid with the default settings: the
// noise floor keeps round-off off the threshold, and nothing is confirmed
// (before the floor, such a run could report an onset at the reference
// frame at 0 MPa from a zone whose peak was about 1e-19).
func TestElasticRampHasNoOnset(t *testing.T) {
	sc, mask, openings := blockWithOpening(30)
	sc.Camera.Noise = 0
	r := trackedSequenceStep(t, sc, mask, openings, 3)
	if o := r.backDated(); len(o) != 0 {
		t.Errorf("%d onsets on an elastic ramp, first %s %s at frame %d (peak %g)", len(o), o[0].Sector, o[0].Indicator, o[0].Frame, o[0].Peak)
	}
	t.Logf("noise floors %v", r.finder.Floor())
}

// One physical event, one onset: a tensile crack grows from the right
// sidewall of a 160 px plate (our own small case, loaded to 30 MPa over 24
// frames, calibrated on the first fifth of the load). The crack is
// reported at the right sidewall, and the left sidewall, which the crack
// never reaches, reports nothing.
func TestCrackFromOneSidewallFiresOnlyThere(t *testing.T) {
	const cx, cy, a = 79.5, 79.5, 20.0
	sc := &synth.Scenario{
		Name: "plate", Width: 160, Height: 160, Frames: 24, FPS: 1,
		Pattern:  synth.Pattern{Radius: 1.6, Coverage: 0.5, Seed: 11},
		Camera:   synth.Camera{Depth: 8, Noise: 1.5, Seed: 12},
		Openings: []synth.Opening{synth.Circle(cx, cy, a)},
		Load:     synth.Load{PeakStress: 30, PeakFrame: 23},
		Specimen: synth.Specimen{MMPerPx: 0.1, WidthMM: 16, ThicknessMM: 16},
		Fields: []synth.FieldSpec{
			{Kirsch: &synth.Kirsch{Cx: cx, Cy: cy, Radius: a, Stress: 30, K: 0, E: 15000, Nu: 0.2}, Drive: synth.DriveLoad},
			{Crack: &synth.Crack{X0: cx + a, Y0: cy, X1: cx + a + 45, Y1: cy - 4, Opening: 0.8, Decay: 10}, Drive: synth.DriveGrowth, StartFrame: 10, FullFrame: 22},
		},
	}
	mask, _ := region.Layout{Exclude: []region.Shape{sc.Openings[0]}}.Rasterise(160, 160)
	r := trackedSequence(t, sc, mask, []strain.Opening{{Name: "A", Shape: sc.Openings[0]}})
	right := false
	for _, o := range r.backDated() {
		t.Logf("%s %s %s: trigger %d, onset %d", o.Class, o.Sector, o.Indicator, o.TriggerFrame, o.Frame)
		switch o.Sector {
		case strain.LeftSidewall:
			t.Errorf("left sidewall fired (%s, trigger %d): the crack is at the right", o.Indicator, o.TriggerFrame)
		case strain.RightSidewall:
			right = true
		}
	}
	if !right {
		t.Error("no onset at the right sidewall")
	}
}

// Round-off is not a fracture: frames that do not deform at all, under a
// rising load, noise-free, give strain fields of round-off (about 1e-19).
// Without a floor the threshold sits on that round-off and the finder
// confirms "zones" from the reference frame on; with the floor of 1 µε
// (MinFloor) nothing is marked and no onset is reported.
func TestRoundOffIsNoOnset(t *testing.T) {
	sc, mask, openings := blockWithOpening(12)
	sc.Fields, sc.Camera.Noise = nil, 0
	r := trackedSequence(t, sc, mask, openings)
	if n := len(r.finder.Zones()); n != 0 {
		t.Errorf("%d zones marked on round-off", n)
	}
	if o := r.backDated(); len(o) != 0 {
		t.Errorf("%d onsets on round-off, first at frame %d", len(o), o[0].Frame)
	}
	if f := r.finder.Floor()[strain.MaxPrincipal]; f != strain.MinFloor {
		t.Errorf("e1 floor %g, want the least floor %g on a run with no noise", f, strain.MinFloor)
	}
}
