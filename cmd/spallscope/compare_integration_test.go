package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/synth"
)

// compare on the band fixture before the band appears (frame 5 of 14):
// the model file is the analytic Kirsch field of the fixture (Kirsch 1898,
// through the synthetic lab) written in mm with the origin at the hole
// centre and y up, so the measured and model v must correlate closely.
func TestCompareWithKirschModel(t *testing.T) {
	cfg := bandTest(t, "")
	out := filepath.Join(t.TempDir(), "run")
	if _, err := run(t, "run", cfg, "--out", out); err != nil {
		t.Fatal(err)
	}
	// Frame 5 carries 5/13 of the load ramp σ = P·x(1.5 − 0.5x²).
	x := 5.0 / 13
	k := synth.Kirsch{Cx: 119.5, Cy: 119.5, Radius: 40, Stress: 40 * x * (1.5 - 0.5*x*x), K: 0, E: 15000, Nu: 0.2}
	var b strings.Builder
	b.WriteString("x_mm,y_mm,u_mm,v_mm\n")
	for ym := -11.0; ym <= 11.0; ym += 0.5 {
		for xm := -11.0; xm <= 11.0; xm += 0.5 {
			px, py := 119.5+xm/0.1, 119.5-ym/0.1
			if (px-119.5)*(px-119.5)+(py-119.5)*(py-119.5) < 40*40 {
				continue
			}
			m := k.At(px, py)
			fmt.Fprintf(&b, "%g,%g,%.9g,%.9g\n", xm, ym, m.U*0.1, -m.V*0.1)
		}
	}
	modelPath := filepath.Join(t.TempDir(), "kirsch_model.csv")
	os.WriteFile(modelPath, []byte(b.String()), 0o644)
	msg, err := run(t, "compare", out, "--model", modelPath, "--frame", "band_0005", "--origin", "119.5,119.5", "--y-up")
	if err != nil {
		t.Fatal(err)
	}
	var corr float64
	for _, line := range strings.Split(msg, "\n") {
		if f := strings.Fields(line); len(f) == 7 && f[0] == "v" {
			fmt.Sscan(f[5], &corr)
		}
	}
	if corr < 0.95 {
		t.Errorf("v correlation %.3f with the Kirsch model, want > 0.95:\n%s", corr, msg)
	}
	for _, f := range []string{"model-diff.csv", "model-summary.json", "compare_u.png", "compare_v.png"} {
		if _, err := os.Stat(filepath.Join(out, "model", f)); err != nil {
			t.Error(err)
		}
	}
}
