package cluster

import "testing"

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
