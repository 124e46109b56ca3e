package job

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"spallscope/dic/lens"
	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain/strainfile"
)

// realLens is a barrel lens for 320×240 photos: at the frame's corners
// points sit 3.7 % nearer the centre than a perfect lens puts them
// (values of our own).
var realLens = lens.Model{Width: 320, Height: 240, Fx: 400, Fy: 400, Cx: 159.5, Cy: 119.5, K1: -0.15}

// realCameraScenarios are the repository's band fixture (a Kirsch field
// around one opening, a band growing from frame 6) widened to 320 px with
// a rigid plate on the right, once shot by an ideal camera (PNG frames,
// steady light, still) and once by a real one: through realLens, as JPEGs
// stamped with the camera's clock, under a lamp that dims by 30 %, falls
// off by 20 % across the face and flickers by ±3 levels, with the face
// and plate moving 0.3 mm towards the camera 400 mm away over the test.
func realCameraScenarios(t *testing.T) (ideal, real *synth.Scenario) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "band_small.json"))
	if err != nil {
		t.Fatal(err)
	}
	var sc synth.Scenario
	if err := json.Unmarshal(data, &sc); err != nil {
		t.Fatal(err)
	}
	sc.Width = 320
	sc.OutOfPlane = &synth.OutOfPlane{StandoffMM: 400, Drive: synth.DriveRamp, Plate: &region.Rect{X0: 258, Y0: 4, X1: 318, Y1: 236}}
	ideal = &sc
	r := sc
	m := realLens
	op := *sc.OutOfPlane
	op.TowardMM = 0.3
	r.Lens, r.OutOfPlane, r.Format = &m, &op, "jpg"
	r.Exif = &synth.ExifClock{Start: "2026:05:04 09:30:00", Offset: "+02:00"}
	r.Lighting = &synth.Lighting{Exposure: 0.85, Drift: -0.3, Gradient: 0.2, Flicker: 3}
	return ideal, &r
}

// realCameraRun renders sc into dir/name and runs the job on it from a
// YAML config as the run command does, with the extra keys. Both cameras'
// configs name the plate, so that their grids agree point for point (the
// ideal camera's plate measures no magnification, to its noise).
func realCameraRun(t *testing.T, dir, name string, sc *synth.Scenario, extra string) (string, *Summary) {
	t.Helper()
	if _, err := synth.Write(sc, filepath.Join(dir, name), nil); err != nil {
		t.Fatal(err)
	}
	body := fmt.Sprintf(`name: %[1]s
images: %[1]s/frames
scale: {mm_per_px: 0.1}
roi: "rect:0,0,239,239"
openings: [{name: A, shape: "circle:119.5,119.5,40"}]
compensation_plate: "rect:266,14,306,226"
correlation: {subset: 21, step: 5}
strain: {window: 5, static_frames: 3}
zones: {calibrate_below: 0.35}
load: {file: %[1]s/loadlog.csv, area_mm2: 480, clock_offset_s: 2}
outputs: {overlays: false, report: false}
`, name) + extra
	tc := writeTest(t, dir, name, body)
	out := filepath.Join(dir, "run-"+name)
	sum, err := Run(context.Background(), tc, out, tool, nil)
	if err != nil {
		t.Fatal(err)
	}
	return out, sum
}

// A test shot by a real camera — lens distortion, EXIF times, a
// magnification drift and a lighting drift — run end to end from its YAML
// config with its lens file and compensation plate gives, frame by frame,
// the strain of the same test shot by an ideal camera: the mean
// difference of exx and eyy over the face within the ideal run's noise
// floor (its static frames' scatter), the RMS difference within 2 noise
// floors (two runs' independent noise, √2 floors, plus the lens's
// resampling of the speckles), and the onsets at the same frames. The
// truth is the ideal run, itself checked against the exact field by the
// other tests; the exact magnification is w/(Z − w) (Sutton et al. 2008,
// Optics and Lasers in Engineering 46, 746).
func TestRealCameraMatchesIdealCamera(t *testing.T) {
	dir := t.TempDir()
	ideal, real := realCameraScenarios(t)
	idealOut, idealSum := realCameraRun(t, dir, "ideal", ideal, "times: {fps: 1}\n")
	if err := runfolder.WriteJSON(filepath.Join(dir, "lens.json"), lens.FileOf(realLens)); err != nil {
		t.Fatal(err)
	}
	realOut, realSum := realCameraRun(t, dir, "real", real, "times: {exif: true}\nlens: lens.json\nstandoff_mm: 400\n")
	if idealSum.Resolution == nil {
		t.Fatal("the ideal run has no noise floor")
	}
	floor := noiseFloorIso(idealSum.Resolution)
	names, err := runfolder.Frames(realOut)
	if err != nil {
		t.Fatal(err)
	}
	var rec runfolder.MotionRecord
	if err := runfolder.Section(realOut, runfolder.MotionSection, &rec); err != nil || len(rec.Frames) != len(names) {
		t.Fatalf("motion record of %d frames (%v)", len(rec.Frames), err)
	}
	var tr runfolder.TrackRecord
	if err := runfolder.Section(realOut, "track", &tr); err != nil {
		t.Fatal(err)
	}
	worstMean, worstRMS, worstMag := 0.0, 0.0, 0.0
	for k, name := range names {
		if math.Abs(tr.Times[k]-real.Time(k)) > 0.0005 {
			t.Errorf("frame %d: EXIF time %g s, want %g", k, tr.Times[k], real.Time(k))
		}
		_, mag := real.OutOfPlaneAt(k)
		worstMag = math.Max(worstMag, math.Abs(rec.Frames[k].Magnification-mag))
		a, err := strainfile.ReadStrain(strainfile.StrainPath(idealOut, ideal.FrameName(k)))
		if err != nil {
			t.Fatal(err)
		}
		b, err := strainfile.ReadStrain(strainfile.StrainPath(realOut, name))
		if err != nil {
			t.Fatal(err)
		}
		if len(a.Points) != len(b.Points) {
			t.Fatalf("frame %d: %d strain points ideal, %d real", k, len(a.Points), len(b.Points))
		}
		var sx, sy, ss float64
		n := 0
		for i := range a.Points {
			p, q := a.Points[i], b.Points[i]
			if !p.Valid || !q.Valid {
				continue
			}
			if p.X != q.X || p.Y != q.Y {
				t.Fatalf("frame %d point %d at (%d, %d) ideal, (%d, %d) real", k, i, p.X, p.Y, q.X, q.Y)
			}
			dx, dy := q.Exx-p.Exx, q.Eyy-p.Eyy
			sx, sy, ss, n = sx+dx, sy+dy, ss+dx*dx+dy*dy, n+1
		}
		if n < 500 {
			t.Fatalf("frame %d: %d points valid in both runs", k, n)
		}
		mean := math.Max(math.Abs(sx), math.Abs(sy)) / float64(n)
		rms := math.Sqrt(ss / float64(2*n))
		worstMean, worstRMS = math.Max(worstMean, mean), math.Max(worstRMS, rms)
		if mean > floor || rms > 2*floor {
			t.Errorf("frame %d: strain differs from the ideal camera's by %.1f µε on average, %.1f µε RMS; noise floor %.1f µε", k, 1e6*mean, 1e6*rms, 1e6*floor)
		}
	}
	t.Logf("noise floor %.1f µε; real against ideal camera: mean strain difference up to %.1f µε, RMS up to %.1f µε; plate magnification off the exact one by up to %.1f µε (exact up to %.0f µε)",
		1e6*floor, 1e6*worstMean, 1e6*worstRMS, 1e6*worstMag, 1e6*0.3/399.7)
	if worstMag > floor {
		t.Errorf("plate magnification off by up to %.1f µε, noise floor %.1f µε", 1e6*worstMag, 1e6*floor)
	}
	onsetFrames := func(s *Summary) []string {
		var out []string
		for _, o := range s.Onsets {
			out = append(out, fmt.Sprintf("%s/%s@%d", o.Sector, o.Indicator, o.Frame))
		}
		slices.Sort(out)
		return out
	}
	a, b := onsetFrames(idealSum), onsetFrames(realSum)
	t.Logf("onsets: ideal %v, real %v", a, b)
	if len(a) == 0 || !slices.Equal(a, b) {
		t.Errorf("onsets of the ideal camera %v, of the real one %v: want the same, and some", a, b)
	}
}
