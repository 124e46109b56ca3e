package cluster

import (
	"errors"
	"os"
	"os/user"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
)

// fakeSqueue puts on PATH (and alone on it, so no sacct) a stand-in for
// squeue that prints $FAKE_QUEUE — lines "TASK STATE", as squeue
// --format="%K %T" prints them (squeue(1): %K the array task index, %T
// the state) — and writes its arguments, one a line, to the returned file.
func fakeSqueue(t *testing.T) (argsFile string) {
	t.Helper()
	dir := t.TempDir()
	argsFile = filepath.Join(dir, "args")
	script := "#!/bin/sh\nprintf '%s\\n' \"$@\" > \"$SQUEUE_ARGS\"\nprintf '%s' \"$FAKE_QUEUE\"\n"
	if err := os.WriteFile(filepath.Join(dir, "squeue"), []byte(script), 0o755); err != nil {
		t.Fatal(err)
	}
	t.Setenv("PATH", dir)
	t.Setenv("SQUEUE_ARGS", argsFile)
	return argsFile
}

// The resubmission rule of `cluster submit` (its help): with the same
// plan in the output folder, only the tasks with a unit not done, less
// those the scheduler has queued or running; every task for a new or a
// different plan, or with --all; nothing to submit, said so, when that
// leaves none. Three whole tests over three tasks: a done, b not run, c
// failed; squeue says task 1 is PENDING.
func TestToSubmitRunsTasksNotDoneAndNotQueued(t *testing.T) {
	args := fakeSqueue(t)
	t.Setenv("FAKE_QUEUE", "1 PENDING\n")
	out := filepath.Join(t.TempDir(), "runs")
	c := &config.Campaign{Name: "trial", Tests: []string{"/srv/lab/a.yaml", "/srv/lab/b.yaml", "/srv/lab/c.yaml"}}
	p, err := NewPlan(c, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	const tool = "spallscope test"

	if tasks, notes, err := ToSubmit(p, out, tool, false); tasks != nil || notes != nil || err != nil {
		t.Errorf("no plan yet: %v %v %v, want every task (nil)", tasks, notes, err)
	}
	if err := WritePlan(out, p); err != nil {
		t.Fatal(err)
	}
	for _, r := range []job.Result{{Config: c.Tests[0]}, {Config: c.Tests[2], Err: "no photos"}} {
		if err := job.WriteOutcome(out, r); err != nil {
			t.Fatal(err)
		}
	}
	tasks, notes, err := ToSubmit(p, out, tool, false)
	if err != nil || !slices.Equal(tasks, []int{2}) || !slices.Equal(notes, []string{"task 1 is PENDING; not submitted again"}) {
		t.Errorf("b queued, c failed: tasks %v, notes %q, %v; want [2] and a note on task 1", tasks, notes, err)
	}
	b, _ := os.ReadFile(args)
	me, _ := user.Current()
	for _, want := range []string{"--name=spallscope-trial", "--user=" + me.Username} {
		if !slices.Contains(strings.Split(string(b), "\n"), want) {
			t.Errorf("squeue was asked %q, want %s among the arguments", b, want)
		}
	}
	if tasks, _, err := ToSubmit(p, out, tool, true); tasks != nil || err != nil {
		t.Errorf("--all: %v %v, want every task (nil)", tasks, err)
	}
	other, _ := NewPlan(c, 0, 1)
	if tasks, _, err := ToSubmit(other, out, tool, false); tasks != nil || err != nil {
		t.Errorf("a different plan: %v %v, want every task (nil)", tasks, err)
	}

	// c fixed and done: b is queued, so nothing is left to submit.
	if err := job.WriteOutcome(out, job.Result{Config: c.Tests[2]}); err != nil {
		t.Fatal(err)
	}
	tasks, notes, err = ToSubmit(p, out, tool, false)
	if !errors.Is(err, ErrNothingToSubmit) || tasks != nil || len(notes) != 1 {
		t.Fatalf("all done or queued: %v %v %v, want ErrNothingToSubmit", tasks, notes, err)
	}
	if want := "nothing to submit: every task of trial is done or queued; run spallscope cluster merge"; err.Error() != want {
		t.Errorf("message %q, want %q", err, want)
	}

	// A plan edited by hand into zero tasks is an error naming the file.
	os.WriteFile(filepath.Join(out, PlanFile), []byte(`{"campaign": "trial", "tasks": 0, "units": [{"test": "a", "config": "/srv/lab/a.yaml"}]}`), 0o644)
	if _, _, err := ToSubmit(p, out, tool, false); err == nil || !strings.Contains(err.Error(), filepath.Join(out, PlanFile)) {
		t.Errorf("a plan of zero tasks: %v, want an error naming the file", err)
	}
}

// squeue's answer for a campaign whose name makes no job name is never
// asked: Queue returns nil, without running squeue.
func TestQueueAsksNothingForANameThatIsNoJobName(t *testing.T) {
	args := fakeSqueue(t)
	t.Setenv("FAKE_QUEUE", "0 RUNNING\n")
	if q := Queue("a,b"); q != nil {
		t.Errorf("Queue(%q) = %v, want nil", "a,b", q)
	}
	if _, err := os.Stat(args); err == nil {
		t.Error("squeue was run for a name that is a list")
	}
	if q := Queue("trial"); q[0] != "RUNNING" {
		t.Errorf("Queue(trial) = %v, want task 0 RUNNING", q)
	}
}
