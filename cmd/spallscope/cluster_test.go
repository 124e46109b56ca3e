package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The array script asks Slurm for one task per test with the resources
// given, and runs each task's share with batch --shard (sbatch directives
// as documented by Slurm: --array=0-N%K, --cpus-per-task, --mem, --time).
func TestClusterScript(t *testing.T) {
	cfg := bandTest(t, "")
	dir := filepath.Dir(cfg)
	camp := filepath.Join(dir, "campaign.yaml")
	os.WriteFile(camp, []byte("name: trial\ntests: [band.yaml, band.yaml, band.yaml]\n"), 0o644)
	out := filepath.Join(dir, "runs")
	if _, err := run(t, "cluster", "submit", camp, "--out", out, "--dry-run", "--partition", "long", "--mem", "8G", "--time", "01:00:00", "--max-parallel", "2"); err != nil {
		t.Fatal(err)
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
	for _, want := range []string{"band   0     done", "band2  1     pending", "band3  0     failed"} {
		if !strings.Contains(msg, want) {
			t.Errorf("status lacks %q:\n%s", want, msg)
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
