package job

import (
	"strings"
	"testing"

	"spallscope/dic/runfolder"
	"spallscope/dic/similarity"
	"spallscope/strain/strainfile"
)

// The far-field warning names the unloaded frames whose magnification
// moved from the first frame's by more than the noise floor, and the
// loaded frames that left the elastic line by more than it; a
// magnification on the line, however large, is no warning (the onset
// detection takes such a line out of every point). Numbers of our own,
// checked by hand: floor 100 µε, line 50 + 20·σ µε.
func TestMagnificationWarning(t *testing.T) {
	rec := &runfolder.MotionRecord{Baseline: &runfolder.MotionBaseline{Intercept: 50e-6, PerMPa: 20e-6, Frames: 3,
		Stress: []float64{0, 0, 0, 10, 20, 30}}}
	for k, m := range []float64{0, 40e-6, 130e-6, 250e-6, 560e-6, 800e-6} {
		rec.Frames = append(rec.Frames, similarity.Motion{Frame: string(rune('a' + k)), Magnification: m})
	}
	res := &strainfile.ResolutionRecord{}
	res.Exx, res.Eyy = 90e-6, 110e-6
	got := magnificationWarning(rec, res)
	// c: 130 µε at zero load (> 100); e: 560 against 450 (110 > 100);
	// d: 250 on the line; f: 800 against 650 (150).
	for _, want := range []string{"up to 130 µε (frame c) at zero load", "in 1 frame(s): c —", "by up to 150 µε (frame f)", "in 2 frame(s): e, f —", "noise floor of 100 µε"} {
		if !strings.Contains(got, want) {
			t.Errorf("warning %q lacks %q", got, want)
		}
	}
	rec.Frames[2].Magnification, rec.Frames[4].Magnification, rec.Frames[5].Magnification = 90e-6, 500e-6, 700e-6
	if got := magnificationWarning(rec, res); got != "" {
		t.Errorf("within the floor: %q", got)
	}
}
