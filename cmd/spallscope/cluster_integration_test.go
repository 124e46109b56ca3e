package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// hasRow reports whether a table printed by tabwriter has a row starting
// with the given cells.
func hasRow(table string, cells []string) bool {
	for _, line := range strings.Split(table, "\n") {
		f := strings.Fields(line)
		if len(f) >= len(cells) && strings.Join(f[:len(cells)], " ") == strings.Join(cells, " ") {
			return true
		}
	}
	return false
}

// The array script asks Slurm for one task per test with the resources
// given, and runs each task's share with batch --shard (sbatch directives
// as documented by Slurm: --array=0-N%K, --cpus-per-task, --mem, --time).
func TestClusterScript(t *testing.T) {
	cfg := bandTest(t, "")
	dir := filepath.Dir(cfg)
	data, _ := os.ReadFile(cfg)
	for _, name := range []string{"band2", "band3"} {
		os.WriteFile(filepath.Join(dir, name+".yaml"), []byte(strings.Replace(string(data), "name: band", "name: "+name, 1)), 0o644)
	}
	camp := filepath.Join(dir, "campaign.yaml")
	os.WriteFile(camp, []byte("name: trial\ntests: [band.yaml, band2.yaml, band3.yaml]\n"), 0o644)
	out := filepath.Join(dir, "runs")
	if _, err := run(t, "cluster", "submit", camp, "--out", out, "--dry-run", "--merge-job", "--partition", "long", "--mem", "8G", "--time", "01:00:00", "--max-parallel", "2"); err != nil {
		t.Fatal(err)
	}
	merge, err := os.ReadFile(filepath.Join(out, "merge.sbatch"))
	if err != nil || !strings.Contains(string(merge), "cluster merge") || !strings.Contains(string(merge), "#SBATCH --partition=long") {
		t.Errorf("merge script (%v):\n%s", err, merge)
	}
	script, err := os.ReadFile(filepath.Join(out, "campaign.sbatch"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"#SBATCH --array=0-2%2", "#SBATCH --partition=long", "#SBATCH --mem=8G", "#SBATCH --time=01:00:00", "--shard \"${SLURM_ARRAY_TASK_ID}/3\""} {
		if !strings.Contains(string(script), want) {
			t.Errorf("script lacks %q:\n%s", want, script)
		}
	}
	// Without sbatch on PATH: a clear error, the script still written.
	t.Setenv("PATH", t.TempDir())
	if _, err := run(t, "cluster", "submit", camp, "--out", out); err == nil || !strings.Contains(err.Error(), "sbatch is not on PATH") {
		t.Errorf("submit without sbatch: %v", err)
	}
}

// cluster submit checks every option, and the campaign's name, before it
// reads photos or writes anything: a hostile or malformed value is an
// error naming the option (or the campaign file) and what was expected,
// and the output folder is not created. Before, --partition and --mem
// went verbatim into the #SBATCH lines (a newline made the rest a
// command of the script), a negative --tasks was taken as 0, and a typed
// --tasks 0 as the default.
func TestClusterSubmitRefusesHostileOptionsBeforeWriting(t *testing.T) {
	dir := t.TempDir()
	camp := filepath.Join(dir, "campaign.yaml")
	os.WriteFile(camp, []byte("name: trial\ntests: [a.yaml, b.yaml]\n"), 0o644)
	out := filepath.Join(dir, "runs")
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--partition", "long\ntouch PWNED"}, "--partition"},
		{[]string{"--partition", "long;touch PWNED"}, "--partition"},
		{[]string{"--mem", "8G\n#SBATCH --uid=0"}, "--mem"},
		{[]string{"--mem", "lots"}, "--mem"},
		{[]string{"--time", "$(touch PWNED)"}, "--time"},
		{[]string{"--time", "1:2:3:4"}, "--time"},
		{[]string{"--binary", "spallscope\ntouch PWNED"}, "--binary"},
		{[]string{"--binary", ""}, "--binary"},
		{[]string{"--cpus-per-task", "0"}, "--cpus-per-task"},
		{[]string{"--max-parallel", "-1"}, "--max-parallel"},
		{[]string{"--max-parallel", "0"}, "--max-parallel 0"},
		{[]string{"--tasks", "-2"}, "--tasks -2"},
		{[]string{"--tasks", "0"}, "--tasks 0"},
		{[]string{"--frames-per-task", "-8"}, "--frames-per-task -8"},
	} {
		args := append([]string{"cluster", "submit", camp, "--out", out, "--dry-run"}, c.args...)
		if _, err := run(t, args...); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: %v, want an error naming %s", c.args, err, c.want)
		}
		if _, err := os.Stat(out); err == nil {
			t.Fatalf("%q: the refused submission created %s", c.args, out)
		}
	}
	os.WriteFile(camp, []byte("name: \"trial; touch PWNED\"\ntests: [a.yaml, b.yaml]\n"), 0o644)
	if _, err := run(t, "cluster", "submit", camp, "--out", out, "--dry-run"); err == nil || !strings.Contains(err.Error(), camp) || !strings.Contains(err.Error(), "campaign name") {
		t.Errorf("a campaign name that is no job name: %v, want an error naming %s", err, camp)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("the refused submission created the output folder")
	}
}

// Sharded batch runs as array tasks would: each share runs its tests,
// merge refuses while a test is pending or failed (listing it, writing
// nothing), a failed test rerun after its input is fixed completes the
// campaign, and the merged summary equals that of one batch on one machine.
func TestShardStatusMerge(t *testing.T) {
	cfg := bandTest(t, "")
	dir := filepath.Dir(cfg)
	data, _ := os.ReadFile(cfg)
	os.WriteFile(filepath.Join(dir, "band2.yaml"), []byte(strings.Replace(string(data), "name: band", "name: band2", 1)), 0o644)
	os.WriteFile(filepath.Join(dir, "band3.yaml"), []byte(strings.Replace(string(data), "name: band\nimages: synth/frames", "name: band3\nimages: missing/frames", 1)), 0o644)
	camp := filepath.Join(dir, "campaign.yaml")
	os.WriteFile(camp, []byte("name: trial\ntests: [band.yaml, band2.yaml, band3.yaml]\n"), 0o644)
	out := filepath.Join(t.TempDir(), "runs")

	// Task 0 of 2 runs tests 0 and 2; test 2 (band3) has no photos.
	if _, err := run(t, "batch", camp, "--out", out, "--shard", "0/2"); err == nil || !strings.Contains(err.Error(), "1 of 2 tests failed") {
		t.Fatalf("shard 0/2: %v", err)
	}
	msg, err := run(t, "cluster", "status", camp, "--out", out, "--tasks", "2")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range [][]string{{"band", "all", "0", "done"}, {"band2", "all", "1", "pending"}, {"band3", "all", "0", "failed"}} {
		if !hasRow(msg, want) {
			t.Errorf("status lacks a row %q:\n%s", want, msg)
		}
	}
	if _, err := run(t, "cluster", "merge", camp, "--out", out); err == nil || !strings.Contains(err.Error(), "band2 (pending)") || !strings.Contains(err.Error(), "band3 (failed)") {
		t.Errorf("merge of an incomplete campaign: %v", err)
	}
	if _, err := os.Stat(filepath.Join(out, "summary.csv")); err == nil {
		t.Error("merge of an incomplete campaign wrote a summary")
	}
	// Task 1, then task 0 again once band3's input is fixed.
	if _, err := run(t, "batch", camp, "--out", out, "--shard", "1/2"); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "band3.yaml"), []byte(strings.Replace(string(data), "name: band", "name: band3", 1)), 0o644)
	if _, err := run(t, "batch", camp, "--out", out, "--shard", "0/2"); err != nil {
		t.Fatal(err)
	}
	if _, err := run(t, "cluster", "merge", camp, "--out", out); err != nil {
		t.Fatal(err)
	}
	// The same campaign on one machine gives the same summary.
	one := filepath.Join(t.TempDir(), "one")
	if _, err := run(t, "batch", camp, "--out", one); err != nil {
		t.Fatal(err)
	}
	a, _ := os.ReadFile(filepath.Join(out, "summary.csv"))
	b, _ := os.ReadFile(filepath.Join(one, "summary.csv"))
	if len(a) == 0 || !bytes.Equal(a, b) {
		t.Errorf("merged summary differs from the one-machine summary:\n%s\n---\n%s", a, b)
	}
}

// A test tracked in frame parts on two tasks, merged, equals the same
// test run whole on one machine: the same frames and points, displacements
// within IC-GN's stopping tolerance — a part's first frame starts from the
// seed search instead of the previous frame's solution, and IC-GN stops
// once an update moves the subset corners by less than 1e-3 px (our
// convergence rule, common practice, no source) — and the same onsets.
// A test with the incremental reference is refused frame parts.
func TestFrameParts(t *testing.T) {
	cfg := bandTest(t, "outputs: {overlays: false}\n")
	dir := filepath.Dir(cfg)
	data, _ := os.ReadFile(cfg)
	os.WriteFile(filepath.Join(dir, "band2.yaml"), []byte(strings.Replace(string(data), "name: band", "name: band2", 1)), 0o644)
	camp := filepath.Join(dir, "campaign.yaml")
	os.WriteFile(camp, []byte("name: trial\ntests: [band.yaml, band2.yaml]\n"), 0o644)
	out := filepath.Join(t.TempDir(), "runs")

	// 14 frames, at most 8 per task: each test in two parts of 7.
	msg, err := run(t, "cluster", "submit", camp, "--out", out, "--frames-per-task", "8", "--dry-run")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(msg, "4 units of 2 tests over 4 tasks") {
		t.Errorf("submit: %s", msg)
	}
	script, _ := os.ReadFile(filepath.Join(out, "campaign.sbatch"))
	if !strings.Contains(string(script), "--frames-per-task 8") || !strings.Contains(string(script), "#SBATCH --array=0-3") {
		t.Errorf("script:\n%s", script)
	}
	// Frame parts belong to array tasks, not to one machine.
	if _, err := run(t, "batch", camp, "--out", out, "--frames-per-task", "8"); err == nil || !strings.Contains(err.Error(), "give --shard i/n too") {
		t.Errorf("frame parts without a shard: %v", err)
	}
	// A shard planned otherwise than the campaign's plan is refused.
	if _, err := run(t, "batch", camp, "--out", out, "--shard", "0/2"); err == nil || !strings.Contains(err.Error(), "differs") {
		t.Errorf("shard with another plan: %v", err)
	}
	for _, shard := range []string{"3/4", "0/4", "2/4"} {
		if _, err := run(t, "batch", camp, "--out", out, "--shard", shard, "--frames-per-task", "8"); err != nil {
			t.Fatalf("shard %s: %v", shard, err)
		}
	}
	msg, _ = run(t, "cluster", "status", out) // the output folder names its campaign
	for _, want := range [][]string{{"band", "0-6", "0", "done"}, {"band", "7-13", "1", "pending"}, {"band2", "7-13", "3", "done"}} {
		if !hasRow(msg, want) {
			t.Errorf("status lacks a row %q:\n%s", want, msg)
		}
	}
	// Resubmission runs only task 1.
	if msg, err = run(t, "cluster", "submit", camp, "--out", out, "--frames-per-task", "8", "--dry-run"); err != nil {
		t.Fatal(err)
	}
	if script, _ = os.ReadFile(filepath.Join(out, "campaign.sbatch")); !strings.Contains(string(script), "#SBATCH --array=1\n") {
		t.Errorf("resubmission script:\n%s", script)
	}
	// Merge assembles band2, refuses the campaign summary for band.
	if _, err := run(t, "cluster", "merge", camp, "--out", out); err == nil || !strings.Contains(err.Error(), "band (part 2/2 (frames 7–13) pending)") {
		t.Errorf("merge with a part missing: %v", err)
	}
	if _, err := os.Stat(filepath.Join(out, "summary.csv")); err == nil {
		t.Error("merge of an incomplete campaign wrote a summary")
	}
	if _, err := os.Stat(filepath.Join(out, "band2", strainfile.OnsetJSON)); err != nil {
		t.Errorf("band2 was not assembled: %v", err)
	}
	if _, err := run(t, "batch", camp, "--out", out, "--shard", "1/4", "--frames-per-task", "8"); err != nil {
		t.Fatal(err)
	}
	if _, err := run(t, "cluster", "merge", camp, "--out", out); err != nil {
		t.Fatal(err)
	}

	one := filepath.Join(t.TempDir(), "one")
	if _, err := run(t, "batch", camp, "--out", one); err != nil {
		t.Fatal(err)
	}
	for _, test := range []string{"band", "band2"} {
		a, b := filepath.Join(out, test), filepath.Join(one, test)
		worst, compared := 0.0, 0
		for i := 0; i < 14; i++ {
			name := frameName(t, b, i)
			fa, err := runfolder.ReadField(runfolder.FieldPath(a, name))
			if err != nil {
				t.Fatal(err)
			}
			fb, err := runfolder.ReadField(runfolder.FieldPath(b, name))
			if err != nil {
				t.Fatal(err)
			}
			if len(fa.Points) != len(fb.Points) {
				t.Fatalf("%s frame %s: %d points, whole run %d", test, name, len(fa.Points), len(fb.Points))
			}
			for k := range fa.Points {
				pa, pb := &fa.Points[k], &fb.Points[k]
				if pa.Status != pb.Status {
					t.Errorf("%s frame %s point (%d,%d): %s, whole run %s", test, name, pa.X, pa.Y, pa.Status, pb.Status)
					continue
				}
				if !pa.Valid() {
					continue
				}
				ua, va := pa.U()
				ub, vb := pb.U()
				worst = math.Max(worst, math.Max(math.Abs(ua-ub), math.Abs(va-vb)))
				compared++
			}
		}
		if worst > 2e-3 || compared == 0 {
			t.Errorf("%s: %d displacements, worst difference from the whole run %.2g px, want ≤ 2e-3", test, compared, worst)
		}
		t.Logf("%s: %d displacements, worst difference from the whole run %.2g px", test, compared, worst)
		oa, ob := onsetFrames(t, a), onsetFrames(t, b)
		if oa != ob || oa == "" {
			t.Errorf("%s onsets %q, whole run %q", test, oa, ob)
		}
	}
	// At the summary's precision (4 decimals of a px) the two agree.
	sa, _ := os.ReadFile(filepath.Join(out, "summary.csv"))
	sb, _ := os.ReadFile(filepath.Join(one, "summary.csv"))
	if len(sa) == 0 || !bytes.Equal(sa, sb) {
		t.Errorf("merged summary differs from the one-machine summary:\n%s\n---\n%s", sa, sb)
	}

	// The incremental reference cannot be split.
	os.WriteFile(filepath.Join(dir, "band3.yaml"), []byte(strings.Replace(strings.Replace(string(data), "name: band", "name: band3", 1),
		"correlation: {subset: 21, step: 5}", "correlation: {subset: 21, step: 5, reference: incremental}", 1)), 0o644)
	os.WriteFile(camp, []byte("name: trial\ntests: [band.yaml, band3.yaml]\n"), 0o644)
	if _, err := run(t, "cluster", "submit", camp, "--out", out, "--frames-per-task", "8", "--dry-run"); err == nil || !strings.Contains(err.Error(), "band3 uses the incremental reference") {
		t.Errorf("frame parts of an incremental test: %v", err)
	}
}

func frameName(t *testing.T, dir string, i int) string {
	t.Helper()
	var tr runfolder.TrackRecord
	if err := runfolder.Section(dir, "track", &tr); err != nil || i >= len(tr.Frames) {
		t.Fatalf("%s: track record: %v", dir, err)
	}
	return tr.Frames[i]
}

func onsetFrames(t *testing.T, dir string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, strainfile.OnsetJSON))
	if err != nil {
		t.Fatal(err)
	}
	var rep strainfile.OnsetReport
	if err := json.Unmarshal(b, &rep); err != nil {
		t.Fatal(err)
	}
	var s []string
	for _, o := range rep.Onsets {
		s = append(s, o.OpeningName+"/"+string(o.Sector)+"/"+string(o.Indicator)+"@"+o.Name)
	}
	return strings.Join(s, ",")
}
