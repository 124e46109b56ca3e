package cluster

import (
	"errors"
	"fmt"
)

// ErrNothingToSubmit is ToSubmit's answer when every task of the plan is
// done or still queued: not a failure, the campaign only waits for merge.
var ErrNothingToSubmit = errors.New("nothing to submit")

// ToSubmit decides which array tasks a submission of plan p into the
// output folder out runs (tool is the program and version, as in the
// records):
//
//   - every task (nil) when out holds no plan, a different plan (the
//     campaign, its photos or the division changed), or all is set;
//   - otherwise the tasks with a unit not done (Unfinished), less those
//     the scheduler has queued or running (Queue, Queued), which would
//     otherwise run twice; notes says which were left out and why.
//
// When that leaves no task, the error wraps ErrNothingToSubmit and says
// what to do next. A plan in out that does not read (ReadPlan) is an
// error naming the file.
func ToSubmit(p *Plan, out, tool string, all bool) (tasks []int, notes []string, err error) {
	old, err := ReadPlan(out)
	if err != nil || old == nil || !old.Equal(p) || all {
		return nil, nil, err
	}
	run, err := Unfinished(p, out, tool)
	if err != nil {
		return nil, nil, err
	}
	queue := Queue(p.Campaign)
	tasks = []int{}
	for _, k := range run {
		if Queued(queue[k]) {
			notes = append(notes, fmt.Sprintf("task %d is %s; not submitted again", k, queue[k]))
			continue
		}
		tasks = append(tasks, k)
	}
	if len(tasks) == 0 {
		return nil, notes, fmt.Errorf("%w: every task of %s is done or queued; run spallscope cluster merge", ErrNothingToSubmit, p.Campaign)
	}
	return tasks, notes, nil
}
