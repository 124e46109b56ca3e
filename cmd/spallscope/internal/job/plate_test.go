package job

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain/strainfile"
)

// plateScenario is a specimen under a uniform strain that follows the
// load (left, x ≤ 180) beside a rigid plate (right), both moving 0.3 mm
// towards a camera 400 mm away over the test: an apparent magnification
// of up to 0.3/399.7 = 751 µε (values of our own).
func plateScenario() *synth.Scenario {
	return &synth.Scenario{
		Name: "plate", Width: 256, Height: 160, Frames: 8, FPS: 1,
		Pattern:  synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 11},
		Camera:   synth.Camera{Depth: 8, Noise: 1, Oversample: 1, Seed: 5},
		Fields:   []synth.FieldSpec{{Strain: &synth.UniformStrain{Cx: 90, Cy: 80, Exx: 3e-4, Eyy: -1.2e-3}, Drive: synth.DriveLoad}},
		Load:     synth.Load{StartFrame: 2, PeakStress: 40, PeakFrame: 7},
		Specimen: synth.Specimen{MMPerPx: 0.1, WidthMM: 18, ThicknessMM: 50},
		OutOfPlane: &synth.OutOfPlane{StandoffMM: 400, TowardMM: 0.3, Drive: synth.DriveRamp,
			Plate: &region.Rect{X0: 200, Y0: 8, X1: 250, Y1: 152}},
	}
}

// runPlate renders sc into dir/synth (once) and runs the job on it with
// the extra YAML, outputs off; it returns the run folder.
func runPlate(t *testing.T, dir string, sc *synth.Scenario, name, extra string) string {
	t.Helper()
	if _, err := os.Stat(filepath.Join(dir, "synth", synth.TruthFile)); err != nil {
		if _, err := synth.Write(sc, filepath.Join(dir, "synth"), nil); err != nil {
			t.Fatal(err)
		}
	}
	body := "name: " + name + `
images: synth/frames
times: {fps: 1}
roi: "rect:0,0,180,159"
correlation: {subset: 21, step: 6}
strain: {window: 5, static_frames: 3}
zones: {calibrate_below: 0.4}
load: {file: synth/loadlog.csv, area_mm2: 900}
outputs: {overlays: false}
` + extra
	tc := writeTest(t, dir, name, body)
	out := filepath.Join(dir, "run-"+name)
	if _, err := Run(context.Background(), tc, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	return out
}

// meanStrainError is the mean of exx − want over a frame's valid points,
// and of eyy − wantY.
func meanStrainError(t *testing.T, out, frame string, wantX, wantY float64) (ex, ey float64) {
	t.Helper()
	sf, err := strainfile.ReadStrain(strainfile.StrainPath(out, frame))
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, p := range sf.Points {
		if p.Valid {
			ex, ey, n = ex+p.Exx-wantX, ey+p.Eyy-wantY, n+1
		}
	}
	if n < 300 {
		t.Fatalf("frame %s: %d valid strain points", frame, n)
	}
	return ex / float64(n), ey / float64(n)
}

// Out-of-plane motion shows as an isotropic strain of w/(Z − w) (Sutton et
// al. 2008, Optics and Lasers in Engineering 46, 746): measured on the
// rigid plate and taken out of the specimen's field, the magnification is
// the exact one to within the strain noise floor in every frame, and the
// specimen's mean strain is the prescribed one to within the noise floor;
// without the plate the mean strain is off by the magnification (more
// than three noise floors at the last frame), and the far-field estimate
// warns of the unloaded frame whose magnification is above the floor.
func TestCompensationPlateRemovesMagnification(t *testing.T) {
	dir := t.TempDir()
	sc := plateScenario()
	with := runPlate(t, dir, sc, "with", "compensation_plate: \"rect:200,8,250,152\"\nstandoff_mm: 400\n")
	without := runPlate(t, dir, sc, "without", "")
	var res strainfile.ResolutionRecord
	if err := runfolder.Section(with, "resolution", &res); err != nil {
		t.Fatal(err)
	}
	floor := noiseFloorIso(&res)
	var rec runfolder.MotionRecord
	if err := runfolder.Section(with, runfolder.MotionSection, &rec); err != nil || len(rec.Frames) != sc.Frames || !rec.Compensated {
		t.Fatalf("motion record %+v (%v)", rec, err)
	}
	worstMag, worstWith, worstWithout := 0.0, 0.0, 0.0
	for k := 0; k < sc.Frames; k++ {
		w, mag := sc.OutOfPlaneAt(k)
		got := rec.Frames[k]
		worstMag = math.Max(worstMag, math.Abs(got.Magnification-mag))
		t.Logf("frame %d: plate %.1f µε ± %.1f, exact %.1f µε", k, 1e6*got.Magnification, 1e6*got.MagnificationSD, 1e6*mag)
		if d := math.Abs(got.Magnification - mag); d > floor {
			t.Errorf("frame %d: plate magnification %.1f µε, exact %.1f µε: off by more than the noise floor %.1f µε", k, 1e6*got.Magnification, 1e6*mag, 1e6*floor)
		}
		if d := math.Abs(rec.TowardCameraMM[k] - w); d > 400*floor {
			t.Errorf("frame %d: %.4f mm towards the camera, exact %.4f mm", k, rec.TowardCameraMM[k], w)
		}
		s := sc.Factor(0, k)
		name := sc.FrameName(k)
		ex, ey := meanStrainError(t, with, name, 3e-4*s, -1.2e-3*s)
		worstWith = math.Max(worstWith, math.Max(math.Abs(ex), math.Abs(ey)))
		if math.Abs(ex) > floor || math.Abs(ey) > floor {
			t.Errorf("frame %d compensated: mean strain off by %.1f, %.1f µε, noise floor %.1f µε", k, 1e6*ex, 1e6*ey, 1e6*floor)
		}
		ux, uy := meanStrainError(t, without, name, 3e-4*s, -1.2e-3*s)
		worstWithout = math.Max(worstWithout, math.Max(math.Abs(ux), math.Abs(uy)))
	}
	t.Logf("noise floor %.1f µε; plate magnification off by at most %.1f µε (exact up to %.0f µε); mean strain off by at most %.1f µε compensated, %.0f µε without the plate",
		1e6*floor, 1e6*worstMag, 1e6*0.3/399.7, 1e6*worstWith, 1e6*worstWithout)
	for _, run := range []string{with, without} {
		if _, err := os.Stat(filepath.Join(run, "plots", "magnification.png")); err != nil {
			t.Errorf("the report has no magnification plot: %v", err)
		}
	}
	if worstWithout < 3*floor {
		t.Errorf("without the plate the strain is off by only %.1f µε; the magnification should show (> 3 × %.1f µε)", 1e6*worstWithout, 1e6*floor)
	}
	var ff runfolder.MotionRecord
	if err := runfolder.Section(without, runfolder.MotionSection, &ff); err != nil || ff.Source != runfolder.MotionFromFarField || ff.Compensated {
		t.Fatalf("far-field record %+v (%v)", ff, err)
	}
	// Frame 2 is still unloaded and magnified by 214 µε: no strain of the
	// specimen's can explain it.
	if !strings.Contains(ff.Warning, "at zero load") || !strings.Contains(ff.Warning, sc.FrameName(2)) || strings.Contains(ff.Warning, sc.FrameName(1)+",") {
		t.Errorf("far-field warning %q: want it to name the unloaded frame 2", ff.Warning)
	}
	refusedPlates(t, dir)
}

// A plate too close to the region of interest, too small, or beyond the
// photos is refused before tracking, naming the key and the problem.
func refusedPlates(t *testing.T, dir string) {
	for plate, want := range map[string]string{
		"rect:185,8,250,152": "within half a subset (11 px)",
		"rect:220,60,228,68": "at least 6 needed",
		"rect:220,60,300,90": "reaches outside the 256x160 photos",
	} {
		path := filepath.Join(dir, "refused.yaml")
		body := "images: synth/frames\nroi: \"rect:0,0,180,159\"\ncorrelation: {subset: 21, step: 6}\ncompensation_plate: \"" + plate + "\"\n"
		if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		tc, err := config.Read(path)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := prepareTrack(tc, tool); err == nil || !strings.Contains(err.Error(), "compensation_plate") || !strings.Contains(err.Error(), want) {
			t.Errorf("plate %s: %v, want it to say %q", plate, err, want)
		}
	}
}

// A run with a plate resumes only after frames whose plate fit is
// recorded (their fields are compensated with it), from the tracker's own
// photo-pixel fields, and keeps the earlier frames' fits.
func TestPlateResume(t *testing.T) {
	dir := t.TempDir()
	sc := plateScenario()
	sc.Frames = 4
	out := runPlate(t, dir, sc, "resume", "compensation_plate: \"rect:200,8,250,152\"\n")
	tc, err := config.Read(filepath.Join(dir, "resume.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	tp, err := prepareTrack(tc, tool)
	if err != nil {
		t.Fatal(err)
	}
	defer tp.in.Seq.Close()
	var rec runfolder.MotionRecord
	if err := runfolder.Section(out, runfolder.MotionSection, &rec); err != nil || len(rec.Frames) != 4 {
		t.Fatalf("motion record of %d frames (%v)", len(rec.Frames), err)
	}
	resume := func() int {
		tracker, err := dic.NewTracker(tp.in.Ref, 0, tp.in.Mask, tp.settings)
		if err != nil {
			t.Fatal(err)
		}
		return tp.resume(out, tracker, 0, 4)
	}
	os.Remove(runfolder.FieldPath(out, sc.FrameName(3)))
	if from := resume(); from != 3 {
		t.Errorf("resume with 3 fields and 4 fits: from frame %d, want 3", from)
	}
	kept := rec
	kept.Truncate(2)
	if err := runfolder.SetSection(out, runfolder.MotionSection, kept); err != nil {
		t.Fatal(err)
	}
	if from := resume(); from != 2 {
		t.Errorf("resume with 3 fields and 2 fits: from frame %d, want 2", from)
	}
	c := tp.compensation(out, 2)
	if len(c.Record.Frames) != 2 || c.Record.Frames[1] != rec.Frames[1] {
		t.Errorf("a run resumed at frame 2 keeps fits %+v, want the first two of %+v", c.Record.Frames, rec.Frames)
	}
	os.Remove(runfolder.PhotoFieldPath(out, sc.FrameName(1)))
	if from := resume(); from != 0 {
		t.Errorf("resume without frame 1's photo-pixel field: from frame %d, want 0", from)
	}
}
