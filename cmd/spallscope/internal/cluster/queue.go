package cluster

import (
	"bufio"
	"bytes"
	"os/exec"
	"os/user"
	"strconv"
	"strings"
)

// Queue returns what the scheduler says of each array task of campaign's
// job (JobName) of the user running it: sacct's state of tasks that ended,
// where accounting is on, overridden by squeue's for tasks waiting or
// running (PENDING, RUNNING, ...). It returns nil when neither command is
// on PATH or both fail, or the campaign's name makes no job name; the run
// folders stay the record of what finished. Only the user's own jobs
// count: on a shared cluster another user's campaign of the same name
// would otherwise hold back a resubmission (squeue lists every user's
// jobs unless asked for one, squeue(1) --user).
func Queue(campaign string) map[int]string {
	name, err := JobName(campaign)
	if err != nil {
		return nil
	}
	states := map[int]string{}
	var mine []string
	if u, err := user.Current(); err == nil && u.Username != "" {
		mine = []string{"--user=" + u.Username}
	}
	if out, ok := query("sacct", append([]string{"-n", "-X", "-P", "--name=" + name, "--format=JobID,State"}, mine...)...); ok {
		parseQueue(out, "|", func(id string) (int, bool) {
			_, task, ok := cutTask(id)
			return task, ok
		}, states)
	}
	if out, ok := query("squeue", append([]string{"-h", "-r", "--name=" + name, "--format=%K %T"}, mine...)...); ok {
		parseQueue(out, " ", func(id string) (int, bool) {
			n, err := strconv.Atoi(id)
			return n, err == nil
		}, states)
	}
	if len(states) == 0 {
		return nil
	}
	return states
}

func query(bin string, args ...string) ([]byte, bool) {
	path, err := exec.LookPath(bin)
	if err != nil {
		return nil, false
	}
	var out bytes.Buffer
	cmd := exec.Command(path, args...)
	cmd.Stdout = &out
	if cmd.Run() != nil {
		return nil, false
	}
	return out.Bytes(), true
}

// parseQueue reads lines "ID<sep>STATE" into states by task index.
func parseQueue(out []byte, sep string, task func(id string) (int, bool), states map[int]string) {
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		id, state, ok := strings.Cut(strings.TrimSpace(sc.Text()), sep)
		if !ok {
			continue
		}
		if k, ok := task(strings.TrimSpace(id)); ok {
			states[k] = strings.Fields(state + " ")[0]
		}
	}
}

// Queued reports whether a scheduler state means the task is still to run
// or running, so a resubmission must not start it a second time.
func Queued(state string) bool {
	switch state {
	case "PENDING", "RUNNING", "CONFIGURING", "COMPLETING", "REQUEUED", "RESIZING", "SUSPENDED":
		return true
	}
	return false
}

// cutTask splits an array task's job id "812_3" into 812 and 3; a line
// for a range of tasks still waiting ("812_[3-4]") is not a task.
func cutTask(id string) (job string, task int, ok bool) {
	job, t, found := strings.Cut(id, "_")
	n, err := strconv.Atoi(t)
	if !found || err != nil {
		return job, -1, false
	}
	return job, n, true
}
