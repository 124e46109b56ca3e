package strain_test

import (
	"testing"

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
	r := trackedSequence(t, sc, mask, openings)
	if o := r.backDated(); len(o) != 0 {
		t.Errorf("%d onsets on an elastic ramp, first %s %s at frame %d (peak %g)", len(o), o[0].Sector, o[0].Indicator, o[0].Frame, o[0].Peak)
	}
	t.Logf("noise floors %v", r.finder.Floor())
}
