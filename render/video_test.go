package render

import (
	"bufio"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gocv.io/x/gocv"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/strain/strainfile"
	"spallscope/subset"
)

// readBack opens a video with OpenCV and returns the frame count it states,
// the frames it decodes and the frame size.
func readBack(t *testing.T, path string) (stated, decoded, width, height int) {
	t.Helper()
	vc, err := gocv.VideoCaptureFile(path)
	if err != nil {
		t.Fatalf("OpenCV cannot open %s: %v", path, err)
	}
	defer vc.Close()
	stated = int(vc.Get(gocv.VideoCaptureFrameCount))
	width, height = int(vc.Get(gocv.VideoCaptureFrameWidth)), int(vc.Get(gocv.VideoCaptureFrameHeight))
	m := gocv.NewMat()
	defer m.Close()
	for vc.Read(&m) && !m.Empty() {
		decoded++
	}
	return
}

// A video written in either format opens with OpenCV (VideoCapture), which
// states and decodes as many frames as were written, at the written size
// (an odd size padded to the next even one).
func TestVideoReadBackByOpenCV(t *testing.T) {
	for _, format := range []string{VideoMP4, VideoAVI} {
		path := filepath.Join(t.TempDir(), "check."+format)
		const w, h, n = 101, 61, 7
		v, err := CreateVideo(path, format, 5, w, h)
		if err != nil {
			t.Fatal(err)
		}
		if v.Note != "" {
			t.Logf("%s: %s", format, v.Note)
		}
		for k := 0; k < n; k++ {
			m := gocv.NewMatWithSize(h, w, gocv.MatTypeCV8UC3)
			m.SetTo(gocv.NewScalar(float64(30*k), 128, 200, 0))
			if err := v.Write(m, fmt.Sprint(k)); err != nil {
				t.Fatal(err)
			}
			m.Close()
		}
		if err := v.Close(); err != nil {
			t.Fatal(err)
		}
		if _, err := os.Stat(v.tmp); err == nil {
			t.Errorf("%s: the partial file %s is left", format, v.tmp)
		}
		stated, decoded, gw, gh := readBack(t, v.Path())
		if stated != n || decoded != n || gw != w+1 || gh != h+1 {
			t.Errorf("%s (%s): OpenCV reads %d frames stated, %d decoded, %dx%d; expected %d of %dx%d",
				format, v.Format(), stated, decoded, gw, gh, n, w+1, h+1)
		}
	}
}

// A frame of the wrong size is refused, naming the frame.
func TestVideoRefusesOtherSizes(t *testing.T) {
	v, err := CreateVideo(filepath.Join(t.TempDir(), "v.avi"), VideoAVI, 5, 40, 30)
	if err != nil {
		t.Fatal(err)
	}
	defer v.Abort()
	m := gocv.NewMatWithSize(31, 40, gocv.MatTypeCV8UC3)
	defer m.Close()
	if err := v.Write(m, "frame_0007"); err == nil || !strings.Contains(err.Error(), "frame_0007") {
		t.Errorf("a 40x31 frame for a 40x30 video: error %v, expected one naming frame_0007", err)
	}
}

// synthRun writes a run folder for a small test from the synthetic lab: a
// block with a circular opening under the Kirsch field, photos rendered by
// the lab, and as the run's displacement and strain the lab's exact field
// on a grid (points within 3 px of the opening invalid, as the tracker
// leaves them), with the track and timeline records and an onset first
// seen at frame 1.
func synthRun(t *testing.T, frames int) (string, *synth.Scenario) {
	t.Helper()
	sc, err := synth.Simple{Field: "kirsch", Width: 128, Height: 96, Frames: frames, Radius: 14}.Scenario()
	if err != nil {
		t.Fatal(err)
	}
	root := t.TempDir()
	if _, err := synth.Write(sc, filepath.Join(root, "synth"), nil); err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(root, "run")
	for _, d := range []string{runfolder.FieldsDir, strainfile.StrainDir} {
		if err := os.MkdirAll(filepath.Join(dir, d), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	hole := sc.Openings[0]
	g := dic.Grid{X0: 4, Y0: 3, Step: 6, Cols: 21, Rows: 16}
	scale := dic.Scale(sc.Specimen.MMPerPx)
	rec := runfolder.TrackRecord{Images: filepath.Join(root, "synth", synth.FramesDir), Reference: "0", Grid: g, MMPerPx: scale,
		Exclude: []string{fmt.Sprintf("circle:%g,%g,%g", hole.Cx, hole.Cy, hole.Rx)}}
	var tl strainfile.TimelineRecord
	for k := 0; k < frames; k++ {
		name := sc.FrameName(k)
		field := sc.FieldAt(k)
		df := &dic.Field{Index: k, Name: name, Grid: g, Points: make([]dic.Point, g.Len())}
		sf := &strain.Field{Index: k, Name: name, Grid: g, Points: make([]strain.Point, g.Len()), Window: 1}
		for i := range df.Points {
			x, y := g.Pos(i)
			var m synth.Motion
			if field != nil { // nil: undeformed
				m = field.At(float64(x), float64(y))
			}
			df.Points[i] = dic.Point{X: x, Y: y, ZNCC: 1, Status: subset.Converged,
				P: subset.Params{subset.PU: m.U, subset.PV: m.V, subset.PUx: m.UX, subset.PUy: m.UY, subset.PVx: m.VX, subset.PVy: m.VY}}
			exx, eyy, exy := m.UX, m.VY, (m.UY+m.VX)/2
			c, r := (exx+eyy)/2, math.Hypot((exx-eyy)/2, exy)
			sf.Points[i] = strain.Point{X: x, Y: y, Exx: exx, Eyy: eyy, Exy: exy, E1: c + r, E2: c - r, GammaMax: 2 * r, Valid: true}
			if math.Hypot(float64(x)-hole.Cx, float64(y)-hole.Cy) < hole.Rx+3 {
				df.Points[i].Status = subset.Diverged
				sf.Points[i].Valid = false
			}
		}
		if err := runfolder.WriteField(runfolder.FieldPath(dir, name), df, scale); err != nil {
			t.Fatal(err)
		}
		if err := strainfile.WriteStrain(strainfile.StrainPath(dir, name), sf, scale); err != nil {
			t.Fatal(err)
		}
		rec.Frames = append(rec.Frames, name)
		rec.Times = append(rec.Times, sc.Time(k))
		tl.Frames, tl.Times = append(tl.Frames, name), append(tl.Times, sc.Time(k))
		tl.Stress, tl.InSpan = append(tl.Stress, sc.Stress(k)), append(tl.InSpan, true)
	}
	if err := runfolder.SetSection(dir, "track", rec); err != nil {
		t.Fatal(err)
	}
	if err := runfolder.SetSection(dir, "timeline", tl); err != nil {
		t.Fatal(err)
	}
	onset := strainfile.OnsetReport{Peak: strainfile.PeakRecord{Stress: sc.Stress(frames - 1)}, Onsets: []strainfile.OnsetRecord{{
		Onset:       strain.Onset{Opening: 0, Sector: "left-sidewall", Class: strain.Localization, Frame: 1, Name: sc.FrameName(1), Stress: sc.Stress(1), InSpan: true, Cx: 30, Cy: 48},
		OpeningName: "A"}}}
	err = runfolder.WriteAtomic(filepath.Join(dir, strainfile.OnsetJSON), func(w *bufio.Writer) error { return json.NewEncoder(w).Encode(onset) })
	if err != nil {
		t.Fatal(err)
	}
	return dir, sc
}

// Run over a run folder writes one overlay PNG per frame (read back by
// OpenCV at one size) and a side-by-side video that OpenCV opens with one
// frame per overlay at the raw frame's width plus the overlay's (padded
// even); the onset badge's mark appears from its frame on; the sequence's
// limits of a signed field are symmetric.
func TestVideoOfRunFolder(t *testing.T) {
	const n = 4
	dir, sc := synthRun(t, n)
	var done int
	res, err := Run(context.Background(), dir, Options{Field: "exx", Video: true, SideBySide: true, FPS: 4, Progress: func(d, _ int) { done = d }})
	if err != nil {
		t.Fatal(err)
	}
	if res.Frames != n || done != n {
		t.Fatalf("Run: %d overlays, progress %d, expected %d", res.Frames, done, n)
	}
	if res.Limits.Lo != -res.Limits.Hi || !res.Limits.Centred || res.Limits.Mode != LimitsSequence {
		t.Errorf("exx limits %+v, expected symmetric sequence limits", res.Limits)
	}
	var ow, oh int
	for k := 0; k < n; k++ {
		path := filepath.Join(res.Dir, sc.FrameName(k)+".png")
		m := gocv.IMRead(path, gocv.IMReadColor)
		if m.Empty() {
			t.Fatalf("OpenCV cannot read %s", path)
		}
		if k == 0 {
			ow, oh = m.Cols(), m.Rows()
		}
		if m.Cols() != ow || m.Rows() != oh {
			t.Errorf("%s is %dx%d, frame 0's overlay %dx%d", path, m.Cols(), m.Rows(), ow, oh)
		}
		// The onset (frame 1) is marked by a dark dot at (30, 48).
		v := m.GetVecbAt(48, 30)
		if marked := v[0] == 16 && v[1] == 16 && v[2] == 16; marked != (k >= 1) {
			t.Errorf("frame %d: onset mark at (30, 48) is %v, expected marked %t", k, v, k >= 1)
		}
		m.Close()
	}
	if res.VideoFormat == "" || res.Video == "" {
		t.Fatalf("no video in %+v", res)
	}
	w := sc.Width + max(4, sc.Height/100) + ow
	h := max(sc.Height, oh)
	stated, decoded, gw, gh := readBack(t, res.Video)
	if stated != n || decoded != n || gw != w+w%2 || gh != h+h%2 {
		t.Errorf("video %s: OpenCV reads %d frames stated, %d decoded, %dx%d; expected %d of %dx%d",
			res.Video, stated, decoded, gw, gh, n, w+w%2, h+h%2)
	}
}

// A video narrower than the overlays (VideoWidth) holds every frame scaled
// to that width with the overlay's shape (height rounded, padded even),
// while the PNGs keep the photo's pixels.
func TestVideoScaledToWidth(t *testing.T) {
	const n = 2
	dir, sc := synthRun(t, n)
	res, err := Run(context.Background(), dir, Options{Field: "exx", Video: true, VideoWidth: 120})
	if err != nil {
		t.Fatal(err)
	}
	m := gocv.IMRead(filepath.Join(res.Dir, sc.FrameName(0)+".png"), gocv.IMReadColor)
	ow, oh := m.Cols(), m.Rows()
	m.Close()
	if ow <= 120 {
		t.Fatalf("overlay %dx%d: the case needs one wider than the video", ow, oh)
	}
	h := int(math.Round(float64(oh) * 120 / float64(ow)))
	stated, decoded, gw, gh := readBack(t, res.Video)
	if stated != n || decoded != n || gw != 120 || gh != h+h%2 {
		t.Errorf("video %s: %d frames stated, %d decoded, %dx%d; expected %d of 120x%d (overlay %dx%d)", res.Video, stated, decoded, gw, gh, n, h+h%2, ow, oh)
	}
}
