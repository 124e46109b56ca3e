package cluster

import (
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// Array lists in sbatch's syntax: single indices and ranges joined by
// commas, as in Slurm's sbatch documentation ("--array=0,6,16-32").
func TestArraySpec(t *testing.T) {
	for _, c := range []struct {
		tasks []int
		n     int
		want  string
	}{
		{nil, 5, "0-4"},
		{[]int{3}, 5, "3"},
		{[]int{0, 2, 3, 4, 7}, 8, "0,2-4,7"},
		{[]int{1, 2}, 3, "1-2"},
	} {
		if got := ArraySpec(c.tasks, c.n); got != c.want {
			t.Errorf("ArraySpec(%v, %d) = %q, want %q", c.tasks, c.n, got, c.want)
		}
	}
}

// Queue lines as sacct -P and squeue print them (Slurm's documentation of
// --format: JobID as jobid_taskid for array tasks; %K is the task index).
func TestParseQueue(t *testing.T) {
	states := map[int]string{}
	parseQueue([]byte("812_0|COMPLETED\n812_1|FAILED\n812_2|CANCELLED by 0\n812_[3-4]|PENDING\n"), "|", func(id string) (int, bool) {
		_, task, _ := cutTask(id)
		return task, task >= 0
	}, states)
	want := map[int]string{0: "COMPLETED", 1: "FAILED", 2: "CANCELLED"}
	for k, v := range want {
		if states[k] != v {
			t.Errorf("task %d: %q, want %q", k, states[k], v)
		}
	}
	if len(states) != len(want) {
		t.Errorf("states %v, want %v", states, want)
	}
}

// sbatch's answer on success, as Slurm's sbatch documentation shows it.
func TestJobID(t *testing.T) {
	for answer, want := range map[string]string{
		"Submitted batch job 812":                  "812",
		"Submitted batch job 4409 on cluster rock": "4409",
	} {
		if got, err := JobID(answer); err != nil || got != want {
			t.Errorf("JobID(%q) = %q, %v; want %q", answer, got, err, want)
		}
	}
	if _, err := JobID("sbatch: error: Batch job submission failed"); err == nil {
		t.Error("JobID of an error message: no error")
	}
}

// fakeBinary writes, in a folder whose own name is hostile, a stand-in
// for spallscope: a shell script that writes its arguments, each ended by
// NUL, to the file $ARGV_FILE. It returns the program's path.
func fakeBinary(t *testing.T, dir string) string {
	t.Helper()
	bin := filepath.Join(dir, "bin $(touch PWNED-bin) `touch PWNED-bin2`", "spallscope")
	if err := os.MkdirAll(filepath.Dir(bin), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(bin, []byte("#!/bin/sh\nprintf '%s\\0' \"$@\" > \"$ARGV_FILE\"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	return bin
}

// runScript runs script with bash — the interpreter its first line
// names — in folder work, as array task 1, and returns the arguments the
// fake binary received.
func runScript(t *testing.T, script, work, argvFile string) []string {
	t.Helper()
	path := filepath.Join(work, "job.sbatch")
	if err := os.WriteFile(path, []byte(script), 0o755); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command("bash", path)
	cmd.Dir = work
	cmd.Env = append(os.Environ(), "SLURM_ARRAY_TASK_ID=1", "SLURM_CPUS_PER_TASK=1", "ARGV_FILE="+argvFile)
	os.Remove(argvFile)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Errorf("bash %s: %v: %s", path, err, out)
	}
	b, err := os.ReadFile(argvFile)
	if err != nil {
		t.Errorf("the fake binary did not run: %v", err)
		return nil
	}
	return strings.Split(strings.TrimSuffix(string(b), "\x00"), "\x00")
}

// The array and merge scripts, run by bash with a campaign file and an
// output folder whose paths hold command substitutions ($(...) and
// backticks), ; and &&, both quotes, a backslash, spaces and a newline,
// and a binary in such a folder: no command in them runs (no PWNED file
// appears anywhere), and the program gets the exact paths as arguments,
// as batch and cluster merge expect them (their command lines). The
// #SBATCH lines hold none of it: sbatch reads them up to the first
// command (sbatch(1), DESCRIPTION), and the output folder, unfit for an
// #SBATCH line, gives way to a log in the folder sbatch runs in.
func TestScriptPassesHostilePathsAsExactArguments(t *testing.T) {
	root := t.TempDir()
	work := filepath.Join(root, "work")
	hostile := "lab $(touch PWNED1) `touch PWNED2` ; touch PWNED3 && touch PWNED4 'q' \"dq\" back\\slash *\nline2"
	campDir := filepath.Join(root, hostile)
	for _, d := range []string{work, campDir} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	campaign := filepath.Join(campDir, "it's $(touch PWNED5).yaml")
	out := filepath.Join(campDir, "runs `touch PWNED6`\n$(touch PWNED7)")
	bin := fakeBinary(t, root)
	argv := filepath.Join(root, "argv")
	p := &Plan{Campaign: "trial", Tasks: 2, Units: []Unit{{Test: "a", Config: "a.yaml"}, {Test: "b", Config: "b.yaml"}}}
	opt := SubmitOptions{CPUsPerTask: 1, Partition: "long", Mem: "8G", Time: "04:00:00", Binary: bin}

	script, err := Script(p, campaign, out, nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"batch", campaign, "--out", out, "--shard", "1/2"}
	if got := runScript(t, script, work, argv); !slices.Equal(got, want) {
		t.Errorf("array script: the program got %q, want %q\n%s", got, want, script)
	}
	merge, err := MergeScript(p, campaign, out, opt)
	if err != nil {
		t.Fatal(err)
	}
	want = []string{"cluster", "merge", campaign, "--out", out}
	if got := runScript(t, merge, work, argv); !slices.Equal(got, want) {
		t.Errorf("merge script: the program got %q, want %q\n%s", got, want, merge)
	}
	if hits := pwned(t, root); len(hits) > 0 {
		t.Errorf("the scripts ran injected commands: %v", hits)
	}
	for name, text := range map[string]string{"array": script, "merge": merge} {
		directives := sbatchDirectives(text)
		for _, d := range directives {
			if strings.ContainsAny(d, " '\"`$;\\") {
				t.Errorf("%s script: #SBATCH line %q holds a character sbatch would read its own way", name, d)
			}
		}
		for _, want := range []string{"--partition=long", "--mem=8G", "--time=04:00:00", "--cpus-per-task=1"} {
			if !slices.Contains(directives, want) {
				t.Errorf("%s script: directives %q lack %s", name, directives, want)
			}
		}
	}
	if d := sbatchDirectives(script); !slices.Contains(d, "--output=slurm-%A_%a.log") || !slices.Contains(d, "--job-name=spallscope-trial") || !slices.Contains(d, "--array=0-1") {
		t.Errorf("array script directives %q, want the log in the working folder, the job name and the array", d)
	}
	if d := sbatchDirectives(merge); !slices.Contains(d, "--output=slurm-merge-%j.log") {
		t.Errorf("merge script directives %q, want the log in the working folder", d)
	}

	// An ordinary output folder is named on the #SBATCH line, as before.
	plainOut := filepath.Join(root, "runs-2024_A.1")
	script, err = Script(p, campaign, plainOut, []int{1}, opt)
	if err != nil {
		t.Fatal(err)
	}
	if d := sbatchDirectives(script); !slices.Contains(d, "--output="+plainOut+"/slurm-%A_%a.log") || !slices.Contains(d, "--array=1") {
		t.Errorf("directives %q, want --output=%s/slurm-%%A_%%a.log and --array=1", d, plainOut)
	}
}

// sbatchDirectives returns the options of a script's #SBATCH lines as
// sbatch reads them: from the top, up to the first line that is neither
// a comment nor blank (sbatch(1), DESCRIPTION).
func sbatchDirectives(script string) []string {
	var ds []string
	for _, line := range strings.Split(script, "\n") {
		line = strings.TrimSpace(line)
		if line != "" && !strings.HasPrefix(line, "#") {
			break
		}
		if d, ok := strings.CutPrefix(line, "#SBATCH "); ok {
			ds = append(ds, d)
		}
	}
	return ds
}

// Before, a partition with a newline ended the #SBATCH lines and became
// a command of the script; now every such value is refused, and the
// script is not made. The plan must be one NewPlan could make, the tasks
// a part of its tasks, and the campaign's name a job name.
func TestScriptRefusesWhatWouldChangeIt(t *testing.T) {
	p := &Plan{Campaign: "trial", Tasks: 2, Units: []Unit{{Test: "a", Config: "a.yaml"}, {Test: "b", Config: "b.yaml"}}}
	ok := SubmitOptions{CPUsPerTask: 2, Binary: "spallscope"}
	bad := ok
	bad.Partition = "long\ntouch PWNED"
	for _, c := range []struct {
		name  string
		p     *Plan
		tasks []int
		opt   SubmitOptions
		want  string
	}{
		{"partition with a newline", p, nil, bad, "--partition"},
		{"campaign name with ;", &Plan{Campaign: "a;b", Tasks: 1, Units: p.Units[:1]}, nil, ok, "campaign name"},
		{"campaign name with a newline", &Plan{Campaign: "a\nrm -rf x", Tasks: 1, Units: p.Units[:1]}, nil, ok, "campaign name"},
		{"campaign name with a comma (a list for squeue --name)", &Plan{Campaign: "a,b", Tasks: 1, Units: p.Units[:1]}, nil, ok, "campaign name"},
		{"plan of no tasks", &Plan{Campaign: "trial", Tasks: 0, Units: p.Units}, nil, ok, `"tasks": 0`},
		{"task out of range", p, []int{2}, ok, "0..1"},
		{"tasks out of order", p, []int{1, 0}, ok, "increasing"},
		{"no tasks", p, []int{}, ok, "no tasks"},
	} {
		if s, err := Script(c.p, "/c.yaml", "/runs", c.tasks, c.opt); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one naming %s\n%s", c.name, err, c.want, s)
		}
	}
	if _, err := MergeScript(p, "/c.yaml", "/runs", bad); err == nil || !strings.Contains(err.Error(), "--partition") {
		t.Errorf("merge script with a hostile partition: %v", err)
	}
	if _, err := Script(p, "/c\x00.yaml", "/runs", nil, ok); err == nil || !strings.Contains(err.Error(), "campaign file") {
		t.Errorf("campaign path with NUL: %v", err)
	}
}

// WriteSubmission refused for a hostile option writes nothing: no plan,
// no script, not even the output folder; accepted, it writes the plan and
// both scripts, the plan reading back equal.
func TestWriteSubmissionWritesNothingWhenRefused(t *testing.T) {
	out := filepath.Join(t.TempDir(), "runs")
	p := &Plan{Campaign: "trial", File: "/srv/c.yaml", Tasks: 1, Units: []Unit{{Test: "a", Config: "a.yaml"}}}
	if _, _, err := WriteSubmission(p, out, nil, SubmitOptions{CPUsPerTask: 1, Binary: "spallscope", Time: "1:00:00\nrm -rf ~"}, true); err == nil || !strings.Contains(err.Error(), "--time") {
		t.Errorf("hostile --time: %v", err)
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("a refused submission wrote %v", filesIn(t, out))
	}
	script, merge, err := WriteSubmission(p, out, nil, SubmitOptions{CPUsPerTask: 1, Binary: "spallscope"}, true)
	if err != nil {
		t.Fatal(err)
	}
	if script != filepath.Join(out, ScriptFile) || merge != filepath.Join(out, MergeScriptFile) {
		t.Errorf("scripts %s, %s", script, merge)
	}
	q, err := ReadPlan(out)
	if err != nil || q == nil || !q.Equal(p) || q.File != p.File {
		t.Errorf("plan read back %+v, %v; want %+v", q, err, p)
	}
}
