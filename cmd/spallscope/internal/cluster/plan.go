package cluster

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/dic/runfolder"
)

// PlanFile is the campaign's plan in its output folder, written by submit.
const PlanFile = "cluster-plan.json"

// Unit is one piece of a campaign's work: a whole test, or one frame part
// of a test's tracking (Part non-nil).
type Unit struct {
	Test   string    `json:"test"`   // run folder name under the output folder
	Config string    `json:"config"` // the test's config file
	Part   *job.Part `json:"part,omitempty"`
}

// String names the unit for tables and messages.
func (u Unit) String() string {
	if u.Part == nil {
		return u.Test
	}
	return u.Test + " " + u.Part.String()
}

// Plan is how a campaign is divided over the tasks of an array job: unit
// k runs in task k mod Tasks. Tests with more frames than FramesPerTask
// (when > 0) are tracked in frame parts, one unit per part; the rest of
// their pipeline (strain, zones, outputs) runs at merge.
type Plan struct {
	Campaign string `json:"campaign"`
	// File is the campaign file (or folder) as submitted, so that status
	// and merge can start from the output folder alone.
	File          string `json:"campaign_file,omitempty"`
	FramesPerTask int    `json:"frames_per_task,omitempty"`
	Tasks         int    `json:"tasks"`
	Units         []Unit `json:"units"`
}

// NewPlan divides campaign c into units (see Plan) for tasks array tasks
// (≤ 0 or more than the units: one task per unit). Frame parts need the
// fixed reference: a test with the incremental reference and more frames
// than framesPerTask is refused with the reason. Tests with several faces
// run whole.
func NewPlan(c *config.Campaign, framesPerTask, tasks int) (*Plan, error) {
	p := &Plan{Campaign: c.Name, FramesPerTask: max(framesPerTask, 0)}
	for _, path := range c.Tests {
		name := job.TestName(path)
		whole := Unit{Test: name, Config: path}
		if p.FramesPerTask == 0 {
			p.Units = append(p.Units, whole)
			continue
		}
		t, err := config.Read(path)
		if err != nil || len(t.Faces) > 0 {
			p.Units = append(p.Units, whole) // its task reports the error
			continue
		}
		n, err := job.FrameCount(t)
		if err != nil {
			return nil, fmt.Errorf("plan: %w", err)
		}
		parts := job.SplitFrames(n, p.FramesPerTask)
		if len(parts) == 1 {
			p.Units = append(p.Units, whole)
			continue
		}
		if err := job.CanSplit(t); err != nil {
			return nil, fmt.Errorf("plan: --frames-per-task %d: %w", p.FramesPerTask, err)
		}
		for k := range parts {
			p.Units = append(p.Units, Unit{Test: name, Config: path, Part: &parts[k]})
		}
	}
	p.Tasks = tasks
	if p.Tasks <= 0 || p.Tasks > len(p.Units) {
		p.Tasks = len(p.Units)
	}
	return p, nil
}

// Task returns the units of task i.
func (p *Plan) Task(i int) []Unit {
	var us []Unit
	for k, u := range p.Units {
		if k%p.Tasks == i {
			us = append(us, u)
		}
	}
	return us
}

// Parts returns the frame parts of test (nil for a test that runs whole).
func (p *Plan) Parts(test string) []job.Part {
	var parts []job.Part
	for _, u := range p.Units {
		if u.Test == test && u.Part != nil {
			parts = append(parts, *u.Part)
		}
	}
	return parts
}

// Equal reports whether two plans divide the same work the same way
// (wherever the campaign file was named from).
func (p *Plan) Equal(q *Plan) bool {
	a, b := *p, *q
	a.File, b.File = "", ""
	return reflect.DeepEqual(a, b)
}

// WritePlan writes p into out (PlanFile).
func WritePlan(out string, p *Plan) error {
	if err := os.MkdirAll(out, 0o755); err != nil {
		return err
	}
	return runfolder.WriteJSON(filepath.Join(out, PlanFile), p)
}

// ReadPlan reads the plan in out; (nil, nil) when there is none.
func ReadPlan(out string) (*Plan, error) {
	b, err := os.ReadFile(filepath.Join(out, PlanFile))
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	var p Plan
	if err := json.Unmarshal(b, &p); err != nil {
		return nil, fmt.Errorf("%s: %w", filepath.Join(out, PlanFile), err)
	}
	return &p, nil
}

// CheckPlan returns an error when out holds a plan other than p: the
// campaign, its photos or the division changed since it was submitted, and
// the tasks still running would disagree about which task does what.
func CheckPlan(out string, p *Plan) error {
	q, err := ReadPlan(out)
	if err != nil || q == nil {
		return err
	}
	if !p.Equal(q) {
		return fmt.Errorf("the campaign's plan in %s (%d units over %d tasks, %d frames per task) differs from this task's (%d units over %d tasks, %d frames per task): the campaign or its photos changed since it was submitted; submit it again",
			filepath.Join(out, PlanFile), len(q.Units), q.Tasks, q.FramesPerTask, len(p.Units), p.Tasks, p.FramesPerTask)
	}
	return nil
}
