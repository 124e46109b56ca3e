package cluster

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"slices"
	"strings"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
)

// State of one unit of a campaign on the cluster.
type State string

const (
	Done    State = "done"
	Failed  State = "failed"
	Pending State = "pending" // not finished: waiting, running, or its task died
)

// UnitState is one unit's state and the task that runs it.
type UnitState struct {
	Unit
	Task  int    `json:"task"`
	State State  `json:"state"`
	Error string `json:"error,omitempty"`

	fingerprint string // a frame part's track fingerprint, from its record
}

// Status reads the outcome of every unit of plan p from the run folders
// under out: a whole test's outcome.json, a frame part's record. A plan
// that does not validate (Plan.Validate) is an error.
func Status(p *Plan, out string) ([]UnitState, error) {
	if err := p.Validate(); err != nil {
		return nil, fmt.Errorf("status: the plan: %w", err)
	}
	var states []UnitState
	for k, u := range p.Units {
		st := UnitState{Unit: u, Task: k % p.Tasks}
		var ok bool
		var msg string
		var err error
		if u.Part == nil {
			var o job.Outcome
			o, err = job.ReadOutcome(out, u.Test)
			ok, msg = o.OK, o.Error
		} else {
			var r job.PartRecord
			r, err = job.ReadPartRecord(filepath.Join(out, u.Test), *u.Part)
			ok, msg, st.fingerprint = r.OK, r.Error, r.Fingerprint
		}
		switch {
		case errors.Is(err, fs.ErrNotExist):
			st.State = Pending
		case err != nil:
			return nil, err
		case ok:
			st.State = Done
		default:
			st.State, st.Error = Failed, msg
		}
		states = append(states, st)
	}
	return states, nil
}

// Unfinished returns the tasks of plan p that have a unit not done: the
// tasks a resubmission must run. A frame part tracked with other inputs
// or settings than the test has now (tool is the program and version, as
// in the records) counts as not done.
func Unfinished(p *Plan, out, tool string) ([]int, error) {
	states, err := Status(p, out)
	if err != nil {
		return nil, err
	}
	current := map[string]string{} // test → track fingerprint now
	seen := map[int]bool{}
	var tasks []int
	for _, s := range states {
		done := s.State == Done
		if done && s.Part != nil {
			fp, ok := current[s.Test]
			if !ok {
				t, err := config.Read(s.Config)
				if err == nil {
					fp, err = job.TrackFingerprint(t, tool)
				}
				if err != nil {
					fp = ""
				}
				current[s.Test] = fp
			}
			done = fp != "" && s.fingerprint == fp
		}
		if !done && !seen[s.Task] {
			seen[s.Task] = true
			tasks = append(tasks, s.Task)
		}
	}
	slices.Sort(tasks)
	return tasks, nil
}

// Merge makes every test of campaign c whose units are all done a complete
// run folder under out — a test tracked in frame parts is assembled from
// them and its strain, zones and outputs run here (progress may be nil) —
// then writes the campaign summary (summary.csv and summary.html in out).
// While a test is not done, the others are still assembled, but no summary
// is written and the error lists the tests that are missing with why.
func Merge(ctx context.Context, c *config.Campaign, p *Plan, out, tool string, progress job.CampaignProgress) ([]job.Result, error) {
	states, err := Status(p, out)
	if err != nil {
		return nil, err
	}
	byTest := map[string][]UnitState{}
	for _, s := range states {
		byTest[s.Test] = append(byTest[s.Test], s)
	}
	var missing []string
	var results []job.Result
	for _, path := range c.Tests {
		name, err := config.TestName(path)
		if err != nil {
			return nil, fmt.Errorf("merge: %w", err)
		}
		us := byTest[name]
		var notDone []string
		for _, s := range us {
			if s.State != Done {
				what := string(s.State)
				if s.Part != nil {
					what = s.Part.String() + " " + what
				}
				notDone = append(notDone, what)
			}
		}
		if len(us) == 0 {
			notDone = append(notDone, "not in the plan: submit again")
		}
		if len(notDone) > 0 {
			missing = append(missing, fmt.Sprintf("%s (%s)", name, strings.Join(notDone, ", ")))
			continue
		}
		if us[0].Part != nil {
			r := assemble(ctx, path, out, tool, p.Parts(name), progress)
			if err := job.WriteOutcome(out, r); err != nil && r.Err == "" {
				r.Err = err.Error()
			}
			if r.Err != "" {
				missing = append(missing, fmt.Sprintf("%s (%s)", name, r.Err))
				continue
			}
		}
		s, err := job.SummaryOf(filepath.Join(out, name))
		if err != nil {
			missing = append(missing, fmt.Sprintf("%s (%v)", name, err))
			continue
		}
		results = append(results, job.Result{Config: path, Summary: s})
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("merge: %d of %d tests are not done: %s; no campaign summary written", len(missing), len(c.Tests), strings.Join(missing, "; "))
	}
	return results, job.WriteCampaignSummary(out, c.Name, results)
}

// assemble joins a test's frame parts and runs the rest of its pipeline.
func assemble(ctx context.Context, path, out, tool string, parts []job.Part, progress job.CampaignProgress) job.Result {
	res := job.Result{Config: path}
	t, err := config.Read(path)
	if err != nil {
		res.Err = err.Error()
		return res
	}
	dir := filepath.Join(out, t.Name)
	if err := job.AssembleParts(t, dir, tool, parts); err != nil {
		res.Err = err.Error()
		return res
	}
	var pr job.Progress
	if progress != nil {
		pr = func(stage string, done, total int) { progress(t.Name, stage, done, total) }
	}
	s, err := job.Run(ctx, t, dir, tool, pr)
	if err != nil {
		res.Err = err.Error()
		return res
	}
	res.Summary = s
	return res
}
