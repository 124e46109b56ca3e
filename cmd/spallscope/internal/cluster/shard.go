package cluster

import (
	"fmt"
	"os"
	"strconv"
	"strings"
)

// Shard is task I of N: it runs the tests whose index modulo N is I.
type Shard struct{ I, N int }

// All is the shard of a single machine: every test.
var All = Shard{0, 1}

// ParseShard reads "i/n" (0 ≤ i < n).
func ParseShard(s string) (Shard, error) {
	a, b, ok := strings.Cut(s, "/")
	i, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !ok || err1 != nil || err2 != nil || n < 1 || i < 0 || i >= n {
		return Shard{}, fmt.Errorf("shard %q, expected i/n with 0 ≤ i < n, such as 2/8", s)
	}
	return Shard{i, n}, nil
}

// FromEnv returns the shard an array job's environment gives: Slurm's
// SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT, or Kubernetes Indexed
// Jobs' JOB_COMPLETION_INDEX with count (the job's completions, which the
// environment does not state). It reports false outside an array job.
// SLURM_ARRAY_TASK_COUNT counts the tasks of this submission, which is
// fewer than the plan's when only some tasks are resubmitted; the
// campaign's script therefore passes the count explicitly with --shard.
func FromEnv(count int) (Shard, bool, error) {
	if id := os.Getenv("SLURM_ARRAY_TASK_ID"); id != "" {
		return parseEnv(id, os.Getenv("SLURM_ARRAY_TASK_COUNT"), "SLURM_ARRAY_TASK_ID", "SLURM_ARRAY_TASK_COUNT")
	}
	if id := os.Getenv("JOB_COMPLETION_INDEX"); id != "" {
		return parseEnv(id, strconv.Itoa(count), "JOB_COMPLETION_INDEX", "the shard count")
	}
	return All, false, nil
}

func parseEnv(id, count, idName, countName string) (Shard, bool, error) {
	i, err := strconv.Atoi(id)
	if err != nil {
		return Shard{}, false, fmt.Errorf("%s=%q is not a task index", idName, id)
	}
	n, err := strconv.Atoi(count)
	if err != nil || n < 1 {
		return Shard{}, false, fmt.Errorf("%s=%q is not a task count", countName, count)
	}
	if i < 0 || i >= n {
		return Shard{}, false, fmt.Errorf("%s=%d outside 0..%d", idName, i, n-1)
	}
	return Shard{i, n}, true, nil
}

// Has reports whether test k belongs to the shard (none for a shard of
// no tasks, the zero Shard).
func (s Shard) Has(k int) bool { return s.N > 0 && k%s.N == s.I }
