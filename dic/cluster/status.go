package cluster

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"strings"

	"spallscope/dic/testconfig"
	"spallscope/dic/testrun"
)

// State of one test of a campaign on the cluster.
type State string

const (
	Done    State = "done"
	Failed  State = "failed"
	Pending State = "pending" // not finished: waiting, running, or its task died
)

// TestState is one test's state and the task that runs it.
type TestState struct {
	Test  string `json:"test"`
	Task  int    `json:"task"`
	State State  `json:"state"`
	Error string `json:"error,omitempty"`
}

// Status reads the outcome of every test of campaign c from the run
// folders under out, for an array of tasks tasks.
func Status(c *testconfig.Campaign, out string, tasks int) ([]TestState, error) {
	if tasks < 1 {
		tasks = 1
	}
	var states []TestState
	for k, cfg := range c.Tests {
		st := TestState{Test: testrun.TestName(cfg), Task: k % tasks}
		o, err := testrun.ReadOutcome(out, cfg)
		switch {
		case errors.Is(err, fs.ErrNotExist):
			st.State = Pending
		case err != nil:
			return nil, err
		case o.OK:
			st.State = Done
		default:
			st.State, st.Error = Failed, o.Error
		}
		states = append(states, st)
	}
	return states, nil
}

// Merge writes the campaign summary (summary.csv and summary.html in out)
// from the finished run folders. A campaign with a test not done yet is
// refused with the list of those tests, and nothing is written.
func Merge(c *testconfig.Campaign, out string) ([]testrun.Result, error) {
	states, err := Status(c, out, 1)
	if err != nil {
		return nil, err
	}
	var missing []string
	for _, s := range states {
		if s.State != Done {
			missing = append(missing, fmt.Sprintf("%s (%s)", s.Test, s.State))
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("merge: %d of %d tests are not done: %s; nothing written", len(missing), len(states), strings.Join(missing, ", "))
	}
	var results []testrun.Result
	for k, cfg := range c.Tests {
		s, err := testrun.SummaryOf(filepath.Join(out, states[k].Test))
		if err != nil {
			return nil, fmt.Errorf("merge: %s: %w", states[k].Test, err)
		}
		results = append(results, testrun.Result{Config: cfg, Summary: s})
	}
	return results, testrun.WriteCampaignSummary(out, c.Name, results)
}
