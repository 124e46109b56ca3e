package demo

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"testing"

	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// The truth table applies a face run's own γmax limit to the truth's VSG
// curve. Worked by hand (as in synth's worked band): a straight band of
// slip 2 px and half-width 2 px growing linearly from frame 10 (zero) to
// frame 30 averages to γmax = 2·tanh(10)/40 ≈ 0.05·g over a 40 px VSG at
// growth g = (f − 10)/20; the run's limit 0.0115 is first exceeded at
// frame 15 (0.0125), the nominal 0.026 at frame 21 (0.0275).
func TestTruthTableTakesTheRunsLimit(t *testing.T) {
	b := synth.ShearBand{X0: -1000, Y0: 60, X1: 1e8, Y1: 60, Slip: 2, HalfWidth: 2, Decay: 1e9}
	sc := &synth.Scenario{Name: "tt", Width: 120, Height: 120, Frames: 31, FPS: 1,
		Pattern: synth.Pattern{Radius: 2, Coverage: 0.5, Seed: 1},
		Fields:  []synth.FieldSpec{{Band: &b, Drive: synth.DriveGrowth, StartFrame: 10, FullFrame: 30}}}
	features, err := sc.FeatureTruth(40, 0.026)
	if err != nil {
		t.Fatal(err)
	}
	d := &Demo{Front: sc, Truth: &synth.Truth{Detection: synth.Detection{VSG: 40, Limit: 0.026}, Features: features}}
	dir := t.TempDir()
	rep := map[string]any{"detection_limits": []strainfile.DetectionLimit{{Indicator: strain.MaxPrincipal, Strain: 0.001}, {Indicator: strain.MaxShear, Strain: 0.0115}}}
	if err := runfolder.WriteJSON(filepath.Join(dir, strainfile.OnsetJSON), rep); err != nil {
		t.Fatal(err)
	}
	rows := d.TruthTable(func(string) string { return dir })
	if len(rows) != 1 || rows[0].Detectable != 15 || !rows[0].LimitFromRun || rows[0].HiddenStart != 11 || rows[0].DetectableName != "tt_0015" {
		t.Fatalf("rows %+v, want one, detectable at frame 15 (tt_0015) from the run's limit, hidden start 11", rows)
	}
	if rows = d.TruthTable(func(string) string { return t.TempDir() }); rows[0].Detectable != 21 || rows[0].LimitFromRun {
		t.Errorf("without a run: detectable %d (from run %v), want 21 at the nominal limit", rows[0].Detectable, rows[0].LimitFromRun)
	}
	path := filepath.Join(dir, TruthCSV)
	if err := WriteTruthTable(path, rows); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil || len(recs) != 2 || recs[0][9] != "detectable_frame" || recs[1][9] != "21" || recs[1][14] != "nominal" {
		t.Errorf("csv %v %v", recs, err)
	}
}
