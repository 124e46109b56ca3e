package main

import (
	"encoding/json"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/strain/strainfile"
)

// report on the run folder of the whole pipeline over the small band
// fixture (synth, track, strain, zones, as TestZonesOnSyntheticBand): the
// page has one onset row per onset of onset.json and the cautions, and the
// plots decode as PNG; --embed --out writes one file elsewhere.
func TestReportCommandOnPipelineRun(t *testing.T) {
	dir := t.TempDir()
	if _, err := run(t, "synth", "--spec", filepath.Join("..", "..", "testdata", "band_small.json"), "--out", dir); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "run")
	steps := [][]string{
		{"track", "--images", filepath.Join(dir, "frames"), "--exclude", "circle:119.5,119.5,40", "--step", "5", "--fps", "1", "--scale", "0.1", "--out", out},
		{"strain", "--fields", out, "--window", "5"},
		{"zones", "--strain", out, "--load", filepath.Join(dir, "loadlog.csv"), "--area", "480", "--clock-offset", "2", "--calibrate-below", "0.35"},
	}
	for _, s := range steps {
		if _, err := run(t, s...); err != nil {
			t.Fatalf("%v: %v", s, err)
		}
	}
	msg, err := run(t, "report", out)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(out, "report.html")
	if !strings.Contains(msg, "wrote "+path) {
		t.Errorf("report says %q", msg)
	}
	page, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var rep strainfile.OnsetReport
	data, _ := os.ReadFile(filepath.Join(out, strainfile.OnsetJSON))
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	if len(rep.Onsets) == 0 {
		t.Fatal("the band fixture gave no onset")
	}
	if n := strings.Count(string(page), `<tr class="onset" `); n != len(rep.Onsets) {
		t.Errorf("%d onset rows, onset.json has %d onsets", n, len(rep.Onsets))
	}
	for _, w := range []string{"eye protection", "right-sidewall", "spallscope " + version, "a comparison, not a verdict"} {
		if !strings.Contains(string(page), w) {
			t.Errorf("report lacks %q", w)
		}
	}
	for _, name := range []string{"stress_time", "zones_area", "sectors_peak", "stress_strain"} {
		f, err := os.Open(filepath.Join(out, "plots", name+".png"))
		if err != nil {
			t.Error(err)
			continue
		}
		if _, err := png.Decode(f); err != nil {
			t.Errorf("%s.png: %v", name, err)
		}
		f.Close()
	}

	alone := filepath.Join(t.TempDir(), "share", "band.html")
	if _, err := run(t, "report", out, "--embed", "--out", alone, "--extensometer", "40,20,40,220", "--gauge", "20,20,60,60", "--gauge-component", "exx"); err != nil {
		t.Fatal(err)
	}
	page, err = os.ReadFile(alone)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(page), "data:image/png;base64,") || !strings.Contains(string(page), "(40, 20)–(40, 220) px") || !strings.Contains(string(page), "exx over (20, 20)–(60, 60) px") {
		t.Error("embedded report lacks its images or the placed extensometer and gauge")
	}
}

func TestReportCommandBadInput(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		args []string
		want string
	}{
		{[]string{}, "accepts 1 arg"},
		{[]string{filepath.Join(dir, "missing")}, "missing"},
		{[]string{dir, "--extensometer", "1,2,3"}, "--extensometer \"1,2,3\", expected four numbers"},
		{[]string{dir, "--gauge", "1,2,x,4"}, `"x" is not a number`},
	}
	for _, c := range cases {
		if _, err := run(t, append([]string{"report"}, c.args...)...); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %v, want it to contain %q", c.args, err, c.want)
		}
	}
}
