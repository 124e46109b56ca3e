package job

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic"
	"spallscope/dic/lens"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain/strainfile"
)

// strongLens is a barrel lens strong enough that, uncorrected, it biases a
// uniform strain at the frame's corners by more than 300 µε (values of our
// own: 512 px frame, f = 700 px, k1 = −0.4: 12 % less magnification at the
// corners than at the centre).
var strongLens = lens.Model{Width: 512, Height: 512, Fx: 700, Fy: 700, Cx: 255.5, Cy: 255.5, K1: -0.4}

// lensPhotos renders a uniform 0.1 % equibiaxial strain about the centre
// through strongLens (synth.Scenario.Lens: the field is exact in ideal
// pixels) and writes the true lens file beside the photos. The frames are
// 16-bit and noise-free, so that what is measured is the lens and not
// the quantisation of 8-bit levels (which alone leaves about 30 µε at this
// strain window).
func lensPhotos(t *testing.T) string {
	t.Helper()
	lensFixture.once.Do(func() { lensFixture.dir, lensFixture.err = writeLensPhotos() })
	if lensFixture.err != nil {
		t.Fatal(lensFixture.err)
	}
	dir := t.TempDir() // each test's configs and runs in a folder of its own
	for _, sub := range []string{"synth", "lens.json"} {
		if err := os.Symlink(filepath.Join(lensFixture.dir, sub), filepath.Join(dir, sub)); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// lensFixture is lensPhotos' rendering, once per test binary.
var lensFixture struct {
	once sync.Once
	dir  string
	err  error
}

func writeLensPhotos() (string, error) {
	dir, err := os.MkdirTemp("", "job-lens-")
	if err != nil {
		return "", err
	}
	sc := &synth.Scenario{
		Name: "lens", Width: 512, Height: 512, Frames: 2, FPS: 1,
		Pattern:  synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 7},
		Camera:   synth.Camera{Depth: 16, Oversample: 2},
		Fields:   []synth.FieldSpec{{Strain: &synth.UniformStrain{Cx: 255.5, Cy: 255.5, Exx: 1e-3, Eyy: 1e-3}, Drive: synth.DriveRamp}},
		Specimen: synth.Specimen{MMPerPx: 0.1},
		Lens:     &strongLens,
	}
	if _, err := synth.Write(sc, filepath.Join(dir, "synth"), nil); err != nil {
		return dir, err
	}
	return dir, runfolder.WriteJSON(filepath.Join(dir, "lens.json"), lens.FileOf(strongLens))
}

// strainErrors tracks (25 px subsets, 8 px step, biquintic) and
// differentiates (15-point strain window, a 137 px VSG) the photos of dir
// with the extra YAML and returns the worst |exx − 1e-3|, |eyy − 1e-3| and |exy| over all
// valid points of the strained frame and over those in the frame's four
// corner regions (the outer eighth of the width and height), in strain.
func strainErrors(t *testing.T, dir, name, extra string) (all, corners float64, valid int) {
	t.Helper()
	body := "name: " + name + "\nimages: synth/frames\ncorrelation: {subset: 25, step: 8, interpolation: quintic}\nstrain: {window: 15}\n" + extra
	tc := writeTest(t, dir, name, body)
	out := filepath.Join(dir, "run-"+name)
	if _, err := Track(context.Background(), tc, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	if _, _, err := Strain(context.Background(), tc, out, 0, nil); err != nil {
		t.Fatal(err)
	}
	sf, err := strainfile.ReadStrain(strainfile.StrainPath(out, "lens_0001"))
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range sf.Points {
		if !p.Valid {
			continue
		}
		valid++
		e := math.Max(math.Abs(p.Exx-1e-3), math.Max(math.Abs(p.Eyy-1e-3), math.Abs(p.Exy)))
		all = math.Max(all, e)
		if (p.X < 64 || p.X > 447) && (p.Y < 64 || p.Y > 447) {
			corners = math.Max(corners, e)
		}
	}
	return all, corners, valid
}

// A uniform 0.1 % strain shot through a strong barrel lens: tracked
// without correction the strain is off by more than 300 µε at the frame's
// corners (measured 393 µε); with the lens file, within 30 µε everywhere
// (measured 3 µε). The truth is the rendered field, exact in ideal pixels.
func TestLensCorrectionRemovesStrainBias(t *testing.T) {
	dir := lensPhotos(t)
	rawAll, rawCorners, rawN := strainErrors(t, dir, "raw", "")
	corAll, corCorners, corN := strainErrors(t, dir, "corrected", "lens: lens.json\n")
	t.Logf("uncorrected: worst %.0f µε, at the corners %.0f µε (%d points); corrected: worst %.1f µε, at the corners %.1f µε (%d points)",
		1e6*rawAll, 1e6*rawCorners, rawN, 1e6*corAll, 1e6*corCorners, corN)
	if rawCorners <= 300e-6 {
		t.Errorf("uncorrected strain at the corners is off by only %.0f µε; the lens should bias it by more than 300 µε", 1e6*rawCorners)
	}
	if corAll > 30e-6 {
		t.Errorf("corrected strain is off by up to %.1f µε, want within 30 µε everywhere", 1e6*corAll)
	}
	if corN < rawN*9/10 {
		t.Errorf("%d corrected strain points, %d uncorrected", corN, rawN)
	}
	var rec runfolder.TrackRecord
	if err := runfolder.Section(filepath.Join(dir, "run-corrected"), "track", &rec); err != nil || rec.Lens == nil || rec.Lens.SHA256 == "" {
		t.Errorf("track record %+v (%v): want the lens file and its hash", rec.Lens, err)
	}
	if _, err := os.Stat(runfolder.PhotoFieldPath(filepath.Join(dir, "run-corrected"), "lens_0001")); err != nil {
		t.Errorf("the tracker's own field is not kept: %v", err)
	}
}

// The track stage's fingerprint holds the lens file's hash: a lens file
// with other coefficients, or none, makes tracking stale (the stage
// table's rule); a resumed run with a lens continues from the tracker's
// own photo-pixel fields, and starts again when they are gone.
func TestLensFingerprintAndResume(t *testing.T) {
	dir := lensPhotos(t)
	write := func(name, body string) *config.Test {
		path := filepath.Join(dir, name+".yaml")
		if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		tc, err := config.Read(path)
		if err != nil {
			t.Fatal(err)
		}
		return tc
	}
	base := "images: synth/frames\ncorrelation: {subset: 25, step: 16}\n"
	with := write("with", base+"lens: lens.json\n")
	fp := func(tc *config.Test) string {
		s, err := TrackFingerprint(tc, tool)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	a, none := fp(with), fp(write("none", base))
	other := strongLens
	other.K1 = -0.39
	if err := runfolder.WriteJSON(filepath.Join(dir, "lens2.json"), lens.FileOf(other)); err != nil {
		t.Fatal(err)
	}
	b := fp(write("other", base+"lens: lens2.json\n"))
	if a == none || a == b || b == none {
		t.Errorf("fingerprints with the lens %s, another lens %s and none %s: want three different ones", a[:8], b[:8], none[:8])
	}

	out := filepath.Join(dir, "run-resume")
	if _, err := Track(context.Background(), with, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	tp, err := prepareTrack(with, tool)
	if err != nil {
		t.Fatal(err)
	}
	defer tp.in.Seq.Close()
	os.Remove(runfolder.FieldPath(out, "lens_0001"))
	resume := func() int {
		tracker, err := dic.NewTracker(tp.in.Ref, 0, tp.in.Mask, tp.settings)
		if err != nil {
			t.Fatal(err)
		}
		return tp.resume(out, tracker, 0, 2)
	}
	if from := resume(); from != 1 {
		t.Errorf("resume with both fields of frame 0 kept: from frame %d, want 1", from)
	}
	os.Remove(runfolder.PhotoFieldPath(out, "lens_0000"))
	if from := resume(); from != 0 {
		t.Errorf("resume without frame 0's photo-pixel field: from frame %d, want 0 (start again)", from)
	}
}

// A lens file for photos of another size, and a lens file that is not
// one, are refused before tracking, naming the file.
func TestLensFileRefused(t *testing.T) {
	dir := lensPhotos(t)
	small := strongLens
	small.Width, small.Height, small.Cx, small.Cy = 320, 240, 160, 120
	runfolder.WriteJSON(filepath.Join(dir, "small.json"), lens.FileOf(small))
	os.WriteFile(filepath.Join(dir, "junk.json"), []byte(`{"kind": "something else"}`), 0o644)
	for name, want := range map[string]string{"small.json": "calibrated for 320x240 px photos, these are 512x512 px", "junk.json": "kind \"something else\""} {
		path := filepath.Join(dir, "t.yaml")
		os.WriteFile(path, []byte("images: synth/frames\nlens: "+name+"\n"), 0o644)
		tc, err := config.Read(path)
		if err != nil {
			t.Fatal(err)
		}
		_, err = prepareTrack(tc, tool)
		if err == nil || !strings.Contains(err.Error(), name) || !strings.Contains(err.Error(), want) {
			t.Errorf("lens %s: error %v, want it to name the file and say %q", name, err, want)
		}
	}
}

// The zones stage refuses a run whose lens file was changed after
// tracking, naming the file, and accepts it again once the file is back.
func TestZonesRefuseChangedLens(t *testing.T) {
	dir := lensPhotos(t)
	body, err := os.ReadFile(filepath.Join(dir, "lens.json"))
	if err != nil {
		t.Fatal(err)
	}
	own := filepath.Join(dir, "own-lens.json") // a copy: the fixture's file is shared
	if err := os.WriteFile(own, body, 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "t.yaml")
	if err := os.WriteFile(path, []byte("images: synth/frames\ncorrelation: {subset: 25, step: 16}\nlens: own-lens.json\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	tc, err := config.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "run")
	if _, err := Track(context.Background(), tc, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	var tr runfolder.TrackRecord
	if err := runfolder.Section(out, "track", &tr); err != nil || tr.Lens == nil {
		t.Fatalf("track record %+v, %v: want a lens record", tr, err)
	}
	if err := tr.Lens.Unchanged(tr.Lens.File); err != nil {
		t.Errorf("unchanged lens file: %v", err)
	}
	other := strongLens
	other.K1 = -0.39
	if err := runfolder.WriteJSON(own, lens.FileOf(other)); err != nil {
		t.Fatal(err)
	}
	_, _, err = Zones(&config.Test{}, out, tool)
	if err == nil || !strings.Contains(err.Error(), "own-lens.json") || !strings.Contains(err.Error(), "changed since tracking") {
		t.Errorf("zones after the lens file changed: error %v, want it to name own-lens.json and say it changed since tracking", err)
	}
	if err := os.WriteFile(own, body, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := tr.Lens.Unchanged(tr.Lens.File); err != nil {
		t.Errorf("lens file restored: %v", err)
	}
}
