package cluster

import "testing"

// Shards split the tests by index modulo the task count (round robin,
// common practice, no source); the array index comes from Slurm's or
// Kubernetes' environment variables (their documented names).
func TestShards(t *testing.T) {
	s, err := ParseShard("1/3")
	if err != nil || !s.Has(1) || !s.Has(4) || s.Has(0) || s.Has(2) {
		t.Errorf("1/3: %+v %v", s, err)
	}
	for _, bad := range []string{"3/3", "-1/2", "1", "a/b", "0/0"} {
		if _, err := ParseShard(bad); err == nil {
			t.Errorf("%q accepted", bad)
		}
	}
	t.Setenv("SLURM_ARRAY_TASK_ID", "2")
	t.Setenv("SLURM_ARRAY_TASK_COUNT", "5")
	if s, ok, err := FromEnv(0); err != nil || !ok || s != (Shard{2, 5}) {
		t.Errorf("Slurm environment: %+v %v %v", s, ok, err)
	}
	t.Setenv("SLURM_ARRAY_TASK_ID", "")
	t.Setenv("JOB_COMPLETION_INDEX", "3")
	if s, ok, err := FromEnv(4); err != nil || !ok || s != (Shard{3, 4}) {
		t.Errorf("Indexed Job environment: %+v %v %v", s, ok, err)
	}
	if _, _, err := FromEnv(3); err == nil {
		t.Error("index 3 of 3 accepted")
	}
	t.Setenv("JOB_COMPLETION_INDEX", "")
	if s, ok, _ := FromEnv(0); ok || s != All {
		t.Errorf("no array job: %+v %v", s, ok)
	}
	// The zero Shard (of no tasks) holds no test, rather than dividing by 0.
	if (Shard{}).Has(0) {
		t.Error("the zero Shard holds test 0")
	}
	if SharedWarning("/tmp/runs") == "" || SharedWarning("/srv/lab/runs") != "" {
		t.Error("shared-folder warning")
	}
}
