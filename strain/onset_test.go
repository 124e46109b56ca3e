package strain_test

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/strain"
)

// sequence renders, tracks and differentiates a synthetic test frame by
// frame and feeds the zone finder; it returns the finder and the peak.
func sequence(t *testing.T, sc *synth.Scenario, mask *region.Mask, openings []strain.Opening) (*strain.Finder, float64) {
	t.Helper()
	r := trackedSequence(t, sc, mask, openings)
	return r.finder, r.peak
}

// tracked is a synthetic test tracked and fed to the zone finder.
type tracked struct {
	finder      *strain.Finder
	peak        float64
	frames      []strain.Frame // with their fields, for a second pass
	calibration []bool
}

// trackedSequence renders, tracks and differentiates a synthetic test and
// feeds the zone finder, keeping the frames for back-dating.
func trackedSequence(t *testing.T, sc *synth.Scenario, mask *region.Mask, openings []strain.Opening) tracked {
	t.Helper()
	return trackedSequenceStep(t, sc, mask, openings, 6)
}

// trackedSequenceStep is trackedSequence on a grid of the given step.
func trackedSequenceStep(t *testing.T, sc *synth.Scenario, mask *region.Mask, openings []strain.Opening, step int) tracked {
	t.Helper()
	sp, err := synth.NewSpeckles(sc.Pattern, sc.Width, sc.Height)
	if err != nil {
		t.Fatal(err)
	}
	imgs := func(k int) synth.Scene {
		return synth.Scene{Speckles: sp, Field: sc.FieldAt(k), Openings: sc.Openings}
	}
	ref, _ := synth.Render(imgs(0), sc.Camera, sc.Width, sc.Height, 0)
	tr, err := dic.NewTracker(ref, 0, mask, dic.Settings{Subset: 21, Step: step})
	if err != nil {
		t.Fatal(err)
	}
	win := strain.Window{Size: 7}
	var fields []*dic.Field
	var strains []*strain.Field
	peak := 0.0
	for k := 0; k < sc.Frames; k++ {
		img, _ := synth.Render(imgs(k), sc.Camera, sc.Width, sc.Height, k)
		f, err := tr.Track(img, k, sc.FrameName(k))
		if err != nil {
			t.Fatal(err)
		}
		sf, _ := win.Strain(f)
		fields, strains = append(fields, f), append(strains, sf)
		peak = math.Max(peak, sc.Stress(k))
	}
	// Calibrate on the frames up to a fifth of the peak (the elastic start).
	var calib []*strain.Field
	var cs []float64
	r := tracked{peak: peak, calibration: make([]bool, len(strains))}
	for k := range strains {
		if sc.Stress(k) <= 0.2*peak {
			calib, cs = append(calib, strains[k]), append(cs, sc.Stress(k))
			r.calibration[k] = true
		}
	}
	finder, err := strain.NewFinder(strain.FinderConfig{Sectors: strain.Sectors{Openings: openings}, Scale: 0.1}, fields[0], strain.FitBaseline(calib, cs))
	if err != nil {
		t.Fatal(err)
	}
	finder.SetNoise(calib, cs)
	for k := range strains {
		fr := strain.Frame{Index: k, Name: sc.FrameName(k), Time: sc.Time(k), Stress: sc.Stress(k), InSpan: true, Strain: strains[k], Disp: fields[k]}
		if _, err := finder.Add(fr); err != nil {
			t.Fatal(err)
		}
		r.frames = append(r.frames, fr)
	}
	r.finder = finder
	return r
}

// backDated runs the second pass of back-dating over a tracked sequence.
func (r tracked) backDated() []strain.Onset {
	d := r.finder.Dating(r.finder.Onsets(r.peak))
	for _, fr := range r.frames {
		d.Add(fr)
	}
	return d.Onsets(r.calibration, r.peak)
}

// blockWithOpening is a 256 px face with one 32 px opening under a
// vertical load ramped over n frames (our own synthetic specimen).
func blockWithOpening(n int) (*synth.Scenario, *region.Mask, []strain.Opening) {
	const cx, cy, a = 127.5, 127.5, 32.0
	sc := &synth.Scenario{
		Name: "onset", Width: 256, Height: 256, Frames: n, FPS: 1,
		Pattern:  synth.Pattern{Radius: 1.7, Coverage: 0.5, Seed: 5},
		Camera:   synth.Camera{Depth: 8, Noise: 1.5, Seed: 9},
		Openings: []synth.Opening{synth.Circle(cx, cy, a)},
		Load:     synth.Load{PeakStress: 40, PeakFrame: n - 1},
		Specimen: synth.Specimen{MMPerPx: 0.1, WidthMM: 25.6, ThicknessMM: 25},
		Fields:   []synth.FieldSpec{{Kirsch: &synth.Kirsch{Cx: cx, Cy: cy, Radius: a, Stress: 40, K: 0, E: 15000, Nu: 0.2}, Drive: synth.DriveLoad}},
	}
	mask, _ := region.Layout{Exclude: []region.Shape{sc.Openings[0]}}.Rasterise(256, 256)
	return sc, mask, []strain.Opening{{Name: "A", Shape: sc.Openings[0]}}
}

// A shear band appears at the right sidewall at frame k = 20 of 40, at half
// its final length and slip, complete a frame later (the synthetic lab's
// exact field): the localization onset is reported at k
// (±1 frame) at the right sidewall, no onset at the crown comes before k,
// and the stress reported is the load history's stress at that frame.
func TestOnsetOfSidewallBand(t *testing.T) {
	const k = 20
	sc, mask, openings := blockWithOpening(40)
	band := synth.ShearBand{X0: 159.5, Y0: 127.5, X1: 199.5, Y1: 102.5, Slip: 1.0, HalfWidth: 3}
	sc.Fields = append(sc.Fields, synth.FieldSpec{Band: &band, Drive: synth.DriveGrowth, StartFrame: k - 1, FullFrame: k + 1})
	finder, peak := sequence(t, sc, mask, openings)
	onsets := finder.Onsets(peak)
	var side *strain.Onset
	for i, o := range onsets {
		t.Logf("onset: %s %s %s at frame %d (%.2f MPa, %.0f %% of peak), zone %d peak %.0f µε", o.Class, o.Sector, o.Indicator, o.Frame, o.Stress, o.Percent, o.Zone, o.Peak*1e6)
		if o.Class == strain.Localization && o.Sector == strain.RightSidewall && side == nil {
			side = &onsets[i]
		}
		if o.Sector == strain.Crown && o.Frame < k {
			t.Errorf("crown onset at frame %d, before the band appears at %d", o.Frame, k)
		}
	}
	if side == nil {
		t.Fatal("no localization onset at the right sidewall")
	}
	if side.Frame < k-1 || side.Frame > k+1 {
		t.Errorf("right-sidewall onset at frame %d, band appears at %d", side.Frame, k)
	}
	if math.Abs(side.Stress-sc.Stress(side.Frame)) > 1e-9 || math.Abs(side.Percent-100*sc.Stress(side.Frame)/peak) > 1e-9 {
		t.Errorf("onset stress %.4f MPa (%.2f %%), load history %.4f MPa", side.Stress, side.Percent, sc.Stress(side.Frame))
	}
}

// Fifty static frames at realistic noise (σ = 1.5 gray levels, 8-bit):
// nothing localizes, so no onset may be reported.
func TestNoOnsetOnNoise(t *testing.T) {
	sc, mask, openings := blockWithOpening(50)
	sc.Fields = nil
	sc.Load = synth.Load{}
	finder, _ := sequence(t, sc, mask, openings)
	if o := finder.Onsets(0); len(o) != 0 {
		t.Errorf("%d onsets on static noise, first %+v", len(o), o[0])
	}
	t.Logf("static noise: %d zones over 50 frames", len(finder.Zones()))
}

// A tensile crack opening from the crown: the decorrelation (or
// localization) zone is found at the crown, and nothing at the sidewalls.
func TestCrackAtCrown(t *testing.T) {
	sc, mask, openings := blockWithOpening(16)
	crack := synth.Crack{X0: 127.5, Y0: 95.5, X1: 129.5, Y1: 35, Opening: 1.5, Decay: 15}
	sc.Fields = append(sc.Fields, synth.FieldSpec{Crack: &crack, Drive: synth.DriveGrowth, StartFrame: 7, FullFrame: 12})
	finder, peak := sequence(t, sc, mask, openings)
	crown := false
	for _, o := range finder.Onsets(peak) {
		t.Logf("onset: %s %s %s at frame %d", o.Class, o.Sector, o.Indicator, o.Frame)
		switch o.Sector {
		case strain.Crown:
			crown = true
		case strain.LeftSidewall, strain.RightSidewall:
			t.Errorf("onset at the %s for a crack from the crown", o.Sector)
		}
	}
	if !crown {
		t.Error("no onset at the crown")
	}
}
