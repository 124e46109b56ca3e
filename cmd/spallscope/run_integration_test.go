package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// TestMain lets the test binary act as the spallscope command for the
// kill-and-resume test (a child process we can SIGKILL).
func TestMain(m *testing.M) {
	if args := os.Getenv("SPALLSCOPE_AS_MAIN"); args != "" {
		root := newRoot()
		root.SetArgs(strings.Split(args, "\x1f"))
		if err := root.Execute(); err != nil {
			os.Exit(1)
		}
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// bandTest renders the band fixture and writes a test config for it.
func bandTest(t *testing.T, extra string) (cfg string) {
	t.Helper()
	dir := t.TempDir()
	if _, err := run(t, "synth", "--spec", filepath.Join("..", "..", "testdata", "band_small.json"), "--out", filepath.Join(dir, "synth")); err != nil {
		t.Fatal(err)
	}
	cfg = filepath.Join(dir, "band.yaml")
	body := `name: band
images: synth/frames
times: {fps: 1}
scale: {mm_per_px: 0.1}
openings: [{name: A, shape: "circle:119.5,119.5,40"}]
correlation: {subset: 21, step: 5}
strain: {window: 5}
zones: {calibrate_below: 0.35}
load: {file: synth/loadlog.csv, area_mm2: 480, clock_offset_s: 2}
` + extra
	if err := os.WriteFile(cfg, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return cfg
}

func readAll(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	for _, sub := range []string{runfolder.FieldsDir, strainfile.StrainDir} {
		files, _ := filepath.Glob(filepath.Join(dir, sub, "*.csv"))
		for _, f := range files {
			b, _ := os.ReadFile(f)
			out[filepath.Join(sub, filepath.Base(f))] = b
		}
	}
	for _, f := range []string{strainfile.ZonesCSV, strainfile.ZoneCellsCSV} {
		b, _ := os.ReadFile(filepath.Join(dir, f))
		out[f] = b
	}
	return out
}

// A run killed with SIGKILL in the middle of tracking resumes: frames done
// before the kill are not recomputed (their files keep their modification
// times) and every output equals that of an uninterrupted run, byte for
// byte (the resume rule of the run folder, common practice, no source).
func TestKillAndResume(t *testing.T) {
	cfg := bandTest(t, "")
	whole := filepath.Join(t.TempDir(), "whole")
	if _, err := run(t, "run", cfg, "--out", whole); err != nil {
		t.Fatal(err)
	}
	cut := filepath.Join(t.TempDir(), "cut")
	child := exec.Command(os.Args[0], "-test.run=^$")
	child.Env = append(os.Environ(), "SPALLSCOPE_AS_MAIN="+strings.Join([]string{"run", cfg, "--out", cut}, "\x1f"))
	var stderr bytes.Buffer
	child.Stderr = &stderr
	if err := child.Start(); err != nil {
		t.Fatal(err)
	}
	waitForFields(cut, 4)
	child.Process.Signal(syscall.SIGKILL)
	child.Wait()
	files, _ := filepath.Glob(filepath.Join(cut, runfolder.FieldsDir, "*.csv"))
	if len(files) >= 14 || len(files) < 4 {
		t.Fatalf("killed run left %d of 14 fields; the kill must land mid-sequence (stderr: %s)", len(files), stderr.String())
	}
	before := map[string]time.Time{}
	for _, f := range files {
		st, _ := os.Stat(f)
		before[f] = st.ModTime()
	}
	msg, err := run(t, "run", cfg, "--out", cut)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(msg, "resumed after") {
		t.Errorf("second run did not resume: %q", msg)
	}
	for f, mt := range before {
		if st, _ := os.Stat(f); !st.ModTime().Equal(mt) {
			t.Errorf("%s was recomputed after the resume", filepath.Base(f))
		}
	}
	sameOutputs(t, whole, cut, "SIGKILL")
}

// waitForFields waits (at most a minute) until run folder dir holds at
// least n field files.
func waitForFields(dir string, n int) {
	deadline := time.Now().Add(60 * time.Second)
	for time.Now().Before(deadline) {
		if files, _ := filepath.Glob(filepath.Join(dir, runfolder.FieldsDir, "*.csv")); len(files) >= n {
			return
		}
		time.Sleep(2 * time.Millisecond)
	}
}

// sameOutputs fails unless the fields, strains and zones of run folders
// whole and resumed are byte-identical (label names the case).
func sameOutputs(t *testing.T, whole, resumed, label string) {
	t.Helper()
	a, b := readAll(t, whole), readAll(t, resumed)
	if len(a) != len(b) || len(a) < 30 {
		t.Fatalf("%s: %d files uninterrupted, %d resumed", label, len(a), len(b))
	}
	for name, want := range a {
		if !bytes.Equal(want, b[name]) {
			t.Errorf("%s: %s differs between the uninterrupted and the resumed run", label, name)
		}
	}
}

// A campaign of three tests, one of them broken: the other two finish, the
// summary lists all three with the error of the broken one.
func TestBatchOfThree(t *testing.T) {
	cfg := bandTest(t, "")
	dir := filepath.Dir(cfg)
	data, _ := os.ReadFile(cfg)
	os.WriteFile(filepath.Join(dir, "band2.yaml"), []byte(strings.Replace(string(data), "name: band", "name: band2", 1)), 0o644)
	os.WriteFile(filepath.Join(dir, "broken.yaml"), []byte("name: broken\nimages: nowhere/\n"), 0o644)
	camp := filepath.Join(dir, "campaign.yaml")
	os.WriteFile(camp, []byte("name: trial\njobs: 2\ntests: [band.yaml, band2.yaml, broken.yaml]\n"), 0o644)
	out := filepath.Join(t.TempDir(), "runs")
	msg, err := run(t, "batch", camp, "--out", out)
	if err == nil || !strings.Contains(err.Error(), "1 of 3 tests failed") {
		t.Errorf("batch error %v", err)
	}
	if !strings.Contains(msg, "campaign trial: 3 tests, 1 failed; summary") {
		t.Errorf("batch output %q", msg)
	}
	csv, _ := os.ReadFile(filepath.Join(out, "summary.csv"))
	for _, want := range []string{"band,ok", "band2,ok", "broken.yaml,failed", "nowhere"} {
		if !strings.Contains(string(csv), want) {
			t.Errorf("summary.csv lacks %q:\n%s", want, csv)
		}
	}
	if html, _ := os.ReadFile(filepath.Join(out, "summary.html")); !strings.Contains(string(html), "<table id=\"summary\">") {
		t.Error("summary.html has no table")
	}
	for _, name := range []string{"band", "band2"} {
		if _, err := os.Stat(filepath.Join(out, name, strainfile.OnsetJSON)); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
}
