package demo

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// The truth table applies a face run's own γmax limit, VSG and grid.
// Worked by hand (as in synth's worked band): a straight band of slip 2 px
// and half-width 2 px growing linearly from frame 10 (zero) to frame 30
// averages to γmax = 2·tanh(10)/40 ≈ 0.05·g over a 40 px VSG centred on it
// at growth g = (f − 10)/20; the run's limit 0.0115 is first exceeded at
// frame 15 (0.0125) on a 1 px grid. The truth file's nominal 30 px VSG
// averages 2·tanh(7.5)/30 ≈ 0.0667·g, above its nominal limit 0.026 from
// frame 18 (0.0267; frame 17: 0.0233). On a 40 px grid from 0 the windows end on the band's centre
// line and average half of that (synth's worked grid example): 0.0115 at
// frame 20.
func TestTruthTableTakesTheRunsLimit(t *testing.T) {
	b := synth.ShearBand{X0: -1000, Y0: 60, X1: 1e8, Y1: 60, Slip: 2, HalfWidth: 2, Decay: 1e9}
	sc := &synth.Scenario{Name: "tt", Width: 120, Height: 120, Frames: 31, FPS: 1,
		Pattern: synth.Pattern{Radius: 2, Coverage: 0.5, Seed: 1},
		Fields:  []synth.FieldSpec{{Band: &b, Drive: synth.DriveGrowth, StartFrame: 10, FullFrame: 30}}}
	features, err := sc.FeatureTruth(30, 0.026)
	if err != nil {
		t.Fatal(err)
	}
	// The truth file's nominal VSG (30 px) differs from the run's (40 px):
	// the run's is the one applied.
	d := &Demo{Front: sc, Truth: &synth.Truth{Detection: synth.Detection{VSG: 30, Limit: 0.026}, Features: features}}
	run := func(step int) string {
		dir := t.TempDir()
		rep := map[string]any{"detection_limits": []strainfile.DetectionLimit{{Indicator: strain.MaxPrincipal, Strain: 0.001, VSG: 40}, {Indicator: strain.MaxShear, Strain: 0.0115, VSG: 40}}}
		if err := runfolder.WriteJSON(filepath.Join(dir, strainfile.OnsetJSON), rep); err != nil {
			t.Fatal(err)
		}
		if err := runfolder.SetSection(dir, "track", runfolder.TrackRecord{Grid: dic.Grid{X0: 0, Y0: 0, Step: step, Cols: 120 / step, Rows: 120 / step}}); err != nil {
			t.Fatal(err)
		}
		return dir
	}
	for _, c := range []struct{ step, want int }{{1, 15}, {40, 20}} {
		dir := run(c.step)
		rows := d.TruthTable(func(string) string { return dir })
		if len(rows) != 1 || rows[0].Detectable != c.want || !rows[0].LimitFromRun || rows[0].VSG != 40 || rows[0].HiddenStart != 11 {
			t.Fatalf("grid step %d: rows %+v, want one, detectable at frame %d from the run's limit and 40 px VSG, hidden start 11", c.step, rows, c.want)
		}
	}
	dir := run(1)
	rows := d.TruthTable(func(string) string { return t.TempDir() })
	if rows[0].Detectable != 18 || rows[0].LimitFromRun || rows[0].VSG != 30 {
		t.Errorf("without a run: detectable %d (from run %v, VSG %d), want 18 at the nominal limit over the truth file's 30 px", rows[0].Detectable, rows[0].LimitFromRun, rows[0].VSG)
	}
	recs := writeAndReadTruth(t, filepath.Join(dir, TruthCSV), rows)
	if len(recs) != 2 || recs[0][9] != "detectable_frame" || recs[1][9] != "18" || recs[1][14] != "nominal" {
		t.Errorf("csv %v", recs)
	}
}

// writeAndReadTruth writes rows with WriteTruthTable to path and reads
// the CSV back, header first.
func writeAndReadTruth(t *testing.T, path string, rows []TruthRow) [][]string {
	t.Helper()
	if err := WriteTruthTable(path, rows); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return recs
}

// The demo's truth files state the VSG the strain stage gives the demo's
// own settings, (window − 1) × step + subset (strain.Window.VSG): one
// definition, the strain stage's.
func TestDemoDetectionIsTheStrainStagesVSG(t *testing.T) {
	cfg := Config(synth.DemoBlock(), synth.DemoTwin())
	want := strain.Window{Size: cfg.Strain.Window}.VSG(cfg.Correlation.Step, cfg.Correlation.Subset)
	if synth.DemoDetection.VSG != want {
		t.Errorf("synth.DemoDetection.VSG %d px, want the strain stage's %d px", synth.DemoDetection.VSG, want)
	}
}

// With the run's strain record and its first field at hand, the table's
// detectable frame is the kernel truth's (strain.KernelTruth), the box
// truth's kept beside it. Worked by hand (strain's TestKernelTruthWorkedBand):
// a straight band of slip 2 px and half-width 1 px at y = 63 px, growing
// linearly from frame 10 to 30, on a step-8 grid from 4 px through a
// 7-point strain window reads 2·3/(2·7·8) = 0.0536·g on the rows at 60 and
// 68 px (point samples: a 1 px subset), above the limit 0.02 from frame 18;
// the 69 px box centred there reads 2/69 = 0.0290·g, above it from frame 24.
// Without the run's noise_scale.csv the bar is the window's theoretical
// gain (1 on these full windows) and the CSV's detectable_source says
// kernel_gain; with it, the run's own bar: a factor of 1.8 on the rows at
// 60 and 68 px leaves the rows at 52 and 76 px, 2·5/(28·8) = 0.0446·g,
// above 0.02 from frame 19 (strain's TestKernelTruthWorkedBand), and the
// CSV says kernel. Its box columns say 24.
func TestTruthTableTakesTheKernelTruth(t *testing.T) {
	b := synth.ShearBand{X0: -1000, Y0: 63, X1: 1e8, Y1: 63, Slip: 2, HalfWidth: 1, Decay: 1e9}
	sc := &synth.Scenario{Name: "tk", Width: 120, Height: 120, Frames: 31, FPS: 1,
		Pattern: synth.Pattern{Radius: 2, Coverage: 0.5, Seed: 1},
		Fields:  []synth.FieldSpec{{Band: &b, Drive: synth.DriveGrowth, StartFrame: 10, FullFrame: 30}}}
	features, err := sc.FeatureTruth(69, 0.02)
	if err != nil {
		t.Fatal(err)
	}
	d := &Demo{Front: sc, Truth: &synth.Truth{Detection: synth.Detection{VSG: 69, Limit: 0.02}, Features: features}}
	dir := t.TempDir()
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 14, Rows: 14}
	rep := map[string]any{"detection_limits": []strainfile.DetectionLimit{{Indicator: strain.MaxShear, Strain: 0.02, VSG: 69}}}
	if err := runfolder.WriteJSON(filepath.Join(dir, strainfile.OnsetJSON), rep); err != nil {
		t.Fatal(err)
	}
	if err := runfolder.SetSection(dir, "track", runfolder.TrackRecord{Grid: g, Frames: []string{sc.FrameName(0)}}); err != nil {
		t.Fatal(err)
	}
	if err := runfolder.SetSection(dir, "strain", strainfile.StrainRecord{Window: 7, Order: 1, Measure: strain.Engineering, Step: 8, Subset: 1, VSG: 69}); err != nil {
		t.Fatal(err)
	}
	ref, err := sc.FeatureFieldOnGrid(0, 0, g, nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Join(dir, runfolder.FieldsDir), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := runfolder.WriteField(runfolder.FieldPath(dir, sc.FrameName(0)), ref, 0); err != nil {
		t.Fatal(err)
	}
	rows := d.TruthTable(func(string) string { return dir })
	if len(rows) != 1 || !rows[0].Kernel || rows[0].MeasuredBar || rows[0].Detectable != 18 || rows[0].BoxDetectable != 24 ||
		!strings.Contains(rows[0].BarNote, strainfile.NoiseScaleCSV) {
		t.Fatalf("rows %+v, want one, the kernel truth's detectable frame 18 at the window's gain (no %s) and the box truth's 24", rows, strainfile.NoiseScaleCSV)
	}
	readCSV := func(rows []TruthRow) [][]string {
		recs := writeAndReadTruth(t, filepath.Join(dir, TruthCSV), rows)
		if len(recs) != 2 || recs[0][15] != "detectable_source" {
			t.Fatalf("csv %v", recs)
		}
		return recs
	}
	if recs := readCSV(rows); recs[1][9] != "18" || recs[1][15] != "kernel_gain" || recs[1][16] != "24" {
		t.Errorf("csv %v, want detectable 18 from kernel_gain, box 24", recs)
	}
	scale := make([]float64, g.Len())
	for i := range scale {
		scale[i] = 1
		if r := i / g.Cols; r == 7 || r == 8 {
			scale[i] = 1.8
		}
	}
	if err := strainfile.WriteNoiseScale(filepath.Join(dir, strainfile.NoiseScaleCSV), g, map[strain.Indicator][]float64{strain.MaxShear: scale}); err != nil {
		t.Fatal(err)
	}
	rows = d.TruthTable(func(string) string { return dir })
	if len(rows) != 1 || !rows[0].Kernel || !rows[0].MeasuredBar || rows[0].Detectable != 19 || rows[0].BoxDetectable != 24 {
		t.Fatalf("rows %+v, want one, the kernel truth's detectable frame 19 at the run's bar and the box truth's 24", rows)
	}
	if recs := readCSV(rows); recs[1][9] != "19" || recs[1][15] != "kernel" || recs[1][16] != "24" {
		t.Errorf("csv %v, want detectable 19 from kernel, box 24", recs)
	}
	// A noise_scale.csv of another grid is not the run's bar: the gain
	// stands in, and the note names the file.
	if err := strainfile.WriteNoiseScale(filepath.Join(dir, strainfile.NoiseScaleCSV), dic.Grid{X0: 0, Y0: 4, Step: 8, Cols: 14, Rows: 14}, map[strain.Indicator][]float64{strain.MaxShear: scale}); err != nil {
		t.Fatal(err)
	}
	rows = d.TruthTable(func(string) string { return dir })
	if len(rows) != 1 || rows[0].MeasuredBar || rows[0].Detectable != 18 || !strings.Contains(rows[0].BarNote, strainfile.NoiseScaleCSV) {
		t.Errorf("rows %+v, want the gain's frame 18 and a note naming %s", rows, strainfile.NoiseScaleCSV)
	}
}
