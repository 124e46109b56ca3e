package synth

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"spallscope/dic/frames"
)

// A written sequence reads back through the sequence loader, its truth grid
// holds the exact field, and the load log's force is stress × area at the
// log's clock (definition of nominal stress, common practice, no source).
func TestWriteKirschSequence(t *testing.T) {
	sc := &Scenario{
		Name: "k", Width: 96, Height: 80, Frames: 4, FPS: 2,
		Pattern:   Pattern{Radius: 2, Coverage: 0.5, Seed: 1},
		Camera:    Camera{Depth: 16, Noise: 100},
		Openings:  []Opening{Circle(48, 40, 12)},
		Load:      Load{PeakStress: 30, PeakFrame: 3, LogRate: 20, ClockOffset: 1.25},
		Specimen:  Specimen{MMPerPx: 0.5, WidthMM: 48, ThicknessMM: 20},
		Fields:    []FieldSpec{{Kirsch: &Kirsch{Cx: 48, Cy: 40, Radius: 12, Stress: 30, K: 0.3, E: 10000, Nu: 0.25}, Drive: DriveLoad}},
		TruthStep: 8,
	}
	dir := t.TempDir()
	truth, err := Write(sc, dir, nil)
	if err != nil {
		t.Fatal(err)
	}
	seq, err := frames.Open(filepath.Join(dir, FramesDir))
	if err != nil || seq.Len() != 4 || seq.Name(3) != "k_0003" {
		t.Fatalf("sequence: %v %v", seq, err)
	}
	img, err := seq.Read(3)
	if err != nil || img.Depth != 16 {
		t.Fatalf("frame 3: %v depth %d", err, img.Depth)
	}
	back, err := ReadTruth(filepath.Join(dir, TruthFile))
	if err != nil || len(back.Frames) != 4 || back.Frames[3].Stress != 30 {
		t.Fatalf("truth: %v %+v", err, back)
	}
	// Truth grid of the last frame equals the field at full load.
	f, _ := os.Open(filepath.Join(dir, truth.Frames[3].Grid))
	rows, _ := csv.NewReader(f).ReadAll()
	f.Close()
	if len(rows) != 1+12*10 {
		t.Fatalf("%d truth rows, want 120 + header", len(rows)-1)
	}
	field := sc.FieldAt(3)
	for _, r := range rows[1:] {
		x, _ := strconv.ParseFloat(r[0], 64)
		y, _ := strconv.ParseFloat(r[1], 64)
		u, _ := strconv.ParseFloat(r[2], 64)
		m := field.At(x, y)
		if math.Abs(u-m.U) > 1e-8*math.Max(1, math.Abs(m.U)) {
			t.Fatalf("truth u at (%g,%g) = %g, field %g", x, y, u, m.U)
		}
		inHole := math.Hypot(x-48, y-40) < 12
		if (r[8] == "0") != inHole {
			t.Fatalf("material flag at (%g,%g) = %s, in hole %v", x, y, r[8], inHole)
		}
	}
	// Load log: at log time t+1.25 s the force is σ(t)·area.
	f, _ = os.Open(filepath.Join(dir, LoadLogCSV))
	r := csv.NewReader(f)
	r.Comment = '#'
	log, _ := r.ReadAll()
	f.Close()
	if log[0][0] != "time_s" || log[0][1] != "force_kN" {
		t.Fatalf("load log header %v", log[0])
	}
	for _, row := range log[1:] {
		tl, _ := strconv.ParseFloat(row[0], 64)
		kn, _ := strconv.ParseFloat(row[1], 64)
		want := sc.StressAt(tl-1.25) * 48 * 20 / 1000
		if math.Abs(kn-want) > 1e-4*math.Max(1, want) {
			t.Fatalf("log t=%g: %g kN, want %g", tl, kn, want)
		}
	}
	if last := log[len(log)-1]; last[1] != "28.8" { // 30 MPa × 960 mm² = 28.8 kN, held after the last frame
		t.Errorf("last log row %v, want the held peak 28.8 kN", last)
	}
}

// The load curve reaches the peak with zero slope at the peak frame and
// drops linearly to the residual (its definition in Load).
func TestLoadCurve(t *testing.T) {
	sc := DemoBlock()
	if err := sc.Validate(); err != nil {
		t.Fatal(err)
	}
	if err := DemoTwin().Validate(); err != nil {
		t.Fatal(err)
	}
	p := sc.Load.PeakFrame
	if s := sc.Stress(p); math.Abs(s-32) > 1e-12 {
		t.Errorf("peak stress %g, want 32", s)
	}
	if s := sc.Stress(sc.Frames - 1); math.Abs(s-32*0.55) > 1e-9 {
		t.Errorf("final stress %g, want %g", s, 32*0.55)
	}
	for f := 0; f <= sc.Load.StartFrame; f++ {
		if sc.Stress(f) != 0 {
			t.Errorf("static frame %d has stress %g", f, sc.Stress(f))
		}
	}
	for f := sc.Load.StartFrame + 2; f < sc.Frames; f++ {
		if (f <= p) != (sc.Stress(f) > sc.Stress(f-1)) {
			t.Errorf("frame %d: stress %g after %g, rising until %d", f, sc.Stress(f), sc.Stress(f-1), p)
		}
	}
}

// The truth file carries the damage features' truth as the API computes
// it (the same numbers after a JSON round trip), at the scenario's
// detection.
func TestWriteFeatureTruth(t *testing.T) {
	n := Notch{X0: 44, Y0: 32, X1: 60, Y1: 24, X2: 60, Y2: 40, Slip: 0.8, HalfWidth: 2}
	sc := &Scenario{
		Name: "n", Width: 64, Height: 64, Frames: 5, FPS: 1,
		Pattern:   Pattern{Radius: 2, Coverage: 0.5, Seed: 3},
		Camera:    Camera{Depth: 8, Noise: 1},
		Openings:  []Opening{Circle(32, 32, 12)},
		Fields:    []FieldSpec{{Notch: &n, Drive: DriveGrowth, StartFrame: 1, FullFrame: 4}},
		Detection: &Detection{VSG: 16, Limit: 0.004},
	}
	dir := t.TempDir()
	if _, err := Write(sc, dir, nil); err != nil {
		t.Fatal(err)
	}
	back, err := ReadTruth(filepath.Join(dir, TruthFile))
	if err != nil {
		t.Fatal(err)
	}
	want, err := sc.FeatureTruth(16, 0.004)
	if err != nil {
		t.Fatal(err)
	}
	if back.Detection != *sc.Detection || len(back.Features) != 1 {
		t.Fatalf("truth detection %+v, %d features; want %+v, 1", back.Detection, len(back.Features), *sc.Detection)
	}
	got, w := back.Features[0], want[0]
	if got.Feature != "notch 0" || got.HiddenStart != 2 || got.DetectableFrame != w.DetectableFrame || got.Sector != w.Sector {
		t.Errorf("file: %s hidden %d detectable %d %s; API: hidden 2 detectable %d %s", got.Feature, got.HiddenStart, got.DetectableFrame, got.Sector, w.DetectableFrame, w.Sector)
	}
	for f := range w.VSGGamma {
		if got.VSGGamma[f] != w.VSGGamma[f] || got.MaxGamma[f] != w.MaxGamma[f] {
			t.Errorf("frame %d: file γ %g/%g, API %g/%g", f, got.VSGGamma[f], got.MaxGamma[f], w.VSGGamma[f], w.MaxGamma[f])
		}
	}
}
