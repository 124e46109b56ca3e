package cluster

import (
	"bytes"
	"cmp"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"

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
// (0 or more than the units: one task per unit). Frame parts need the
// fixed reference: a test with the incremental reference and more frames
// than framesPerTask is refused with the reason. Tests with several faces
// run whole. A negative count is refused, naming its option, and so is a
// campaign whose plan would not validate (Plan.Validate): no tests, or
// test names that cannot be run folders or that two tests share.
func NewPlan(c *config.Campaign, framesPerTask, tasks int) (*Plan, error) {
	if framesPerTask < 0 {
		return nil, fmt.Errorf("plan: --frames-per-task %d: expected 0 (whole tests) or a whole number of frames", framesPerTask)
	}
	if tasks < 0 {
		return nil, fmt.Errorf("plan: --tasks %d: expected 0 (one task per unit) or a whole number of tasks", tasks)
	}
	p := &Plan{Campaign: c.Name, FramesPerTask: framesPerTask}
	for _, path := range c.Tests {
		name, err := config.TestName(path)
		if err != nil {
			return nil, fmt.Errorf("plan: %w", err)
		}
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
	if p.Tasks == 0 || p.Tasks > len(p.Units) {
		p.Tasks = len(p.Units)
	}
	if err := p.Validate(); err != nil {
		return nil, fmt.Errorf("plan of campaign %s: %w", c.Name, err)
	}
	return p, nil
}

// Task returns the units of task i (none for a plan without tasks).
func (p *Plan) Task(i int) []Unit {
	if p.Tasks < 1 {
		return nil
	}
	var us []Unit
	for k, u := range p.Units {
		if k%p.Tasks == i {
			us = append(us, u)
		}
	}
	return us
}

// Parts returns the frame parts of test in frame order (nil for a test
// that runs whole).
func (p *Plan) Parts(test string) []job.Part {
	var parts []job.Part
	for _, u := range p.Units {
		if u.Test == test && u.Part != nil {
			parts = append(parts, *u.Part)
		}
	}
	slices.SortFunc(parts, func(a, b job.Part) int { return cmp.Compare(a.Index, b.Index) })
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

// ReadPlan reads the plan in out; (nil, nil) when there is none. A plan
// that is not one JSON object of the plan's keys, or that does not
// validate (Plan.Validate), is an error naming the file and what is
// wrong: the file may have been edited by hand.
func ReadPlan(out string) (*Plan, error) {
	path := filepath.Join(out, PlanFile)
	b, err := os.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	return parsePlan(path, b)
}

// parsePlan reads a plan file's bytes (ReadPlan); path names it in errors.
func parsePlan(path string, b []byte) (*Plan, error) {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	var p Plan
	if err := dec.Decode(&p); err != nil {
		return nil, fmt.Errorf("%s: %s (plan keys: campaign, campaign_file, frames_per_task, tasks, units of test, config and part)", path, jsonProblem(b, err))
	}
	end := dec.InputOffset()
	if _, err := dec.Token(); err != io.EOF {
		end += int64(len(b[end:]) - len(bytes.TrimLeft(b[end:], " \t\r\n")))
		line, col := position(b, end)
		return nil, fmt.Errorf("%s: line %d, column %d: more after the plan's JSON object, expected one object", path, line, col)
	}
	if err := p.Validate(); err != nil {
		return nil, fmt.Errorf("%s: %w (the file was edited or damaged: move it aside and submit the campaign again with spallscope cluster submit, which writes a new plan and skips what is done)", path, err)
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

// jsonProblem says where and what a JSON decoding error of b is, in
// words: "line 3, column 12: tasks is text, expected a whole number".
func jsonProblem(b []byte, err error) string {
	var syntax *json.SyntaxError
	var typ *json.UnmarshalTypeError
	switch {
	case errors.As(err, &syntax):
		line, col := position(b, syntax.Offset-1) // the byte that broke it
		return fmt.Sprintf("line %d, column %d: %s", line, col, strings.TrimPrefix(syntax.Error(), "json: "))
	case errors.As(err, &typ):
		line, col := position(b, typ.Offset-1) // the value's last byte
		what := "the plan"
		if typ.Field != "" {
			what = typ.Field
		}
		return fmt.Sprintf("line %d, column %d: %s is a JSON %s, expected %s", line, col, what, typ.Value, jsonKind(typ.Type))
	case errors.Is(err, io.EOF):
		return "empty, expected a JSON object"
	case errors.Is(err, io.ErrUnexpectedEOF):
		return "ends inside the JSON object"
	}
	return strings.TrimPrefix(err.Error(), "json: ")
}

// jsonKind names what a Go type is in JSON, for messages.
func jsonKind(t reflect.Type) string {
	switch t.Kind() {
	case reflect.Int, reflect.Int64:
		return "a whole number"
	case reflect.String:
		return "text"
	case reflect.Struct, reflect.Pointer:
		return "an object"
	case reflect.Slice:
		return "a list"
	}
	return t.String()
}

// position returns the line and column (both from 1, column in bytes)
// of the byte at offset off of b.
func position(b []byte, off int64) (line, col int) {
	off = min(max(off, 0), int64(len(b)))
	head := b[:off]
	line = bytes.Count(head, []byte("\n")) + 1
	return line, len(head) - (bytes.LastIndexByte(head, '\n') + 1) + 1
}
