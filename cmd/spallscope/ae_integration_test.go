package main

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/runfolder"
)

// An acoustic-emission hit list beside the band fixture (our own invented
// record on a clock 2 s ahead of the camera: one hit every 0.5 s, then ten
// a second from camera time 7 s, when the band appears; silent from 10 to
// 11.5 s): run records the AE onset at 7 s (within one 1 s window), the
// gap, and the report gains the stress–AE plot.
func TestRunWithAcousticEmission(t *testing.T) {
	var b strings.Builder
	b.WriteString("# invented AE hits\ntime_s,amplitude_dB,energy\n")
	for t := 0.0; t < 14; {
		if t < 10 || t >= 11.5 {
			fmt.Fprintf(&b, "%.3f,%.1f,%.1f\n", t+2, 45+10*math.Sin(t), 1+t)
		}
		if t < 7 {
			t += 0.5
		} else {
			t += 0.1
		}
	}
	cfg := bandTest(t, "ae: {file: hits.csv, clock_offset_s: 2, gap_s: 1}\n")
	os.WriteFile(filepath.Join(filepath.Dir(cfg), "hits.csv"), []byte(b.String()), 0o644)
	out := filepath.Join(t.TempDir(), "run")
	if _, err := run(t, "run", cfg, "--out", out); err != nil {
		t.Fatal(err)
	}
	var ae runfolder.AERecord
	if err := runfolder.Section(out, "ae", &ae); err != nil {
		t.Fatal(err)
	}
	if ae.Onset == nil || math.Abs(ae.Onset.Time-7) > 1 {
		t.Errorf("AE onset %+v, want 7 ± 1 s", ae.Onset)
	}
	if len(ae.Gaps) != 1 || math.Abs(ae.Gaps[0].Start-9.9) > 0.2 || math.Abs(ae.Gaps[0].End-11.5) > 0.2 {
		t.Errorf("AE gaps %+v, want one from about 9.9 to 11.5 s", ae.Gaps)
	}
	if _, err := os.Stat(filepath.Join(out, "plots", "stress_ae.png")); err != nil {
		t.Errorf("no stress–AE plot: %v", err)
	}
	page, _ := os.ReadFile(filepath.Join(out, "report.html"))
	if !strings.Contains(string(page), `id="ae-onset"`) || !strings.Contains(string(page), "hit-rate onset at t = 7") {
		t.Error("the report does not state the AE onset beside the DIC onsets")
	}
}
