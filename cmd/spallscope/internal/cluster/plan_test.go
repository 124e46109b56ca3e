package cluster

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/cmd/spallscope/internal/config"
)

// validPlanJSON is a plan as submit writes it: test a whole, test b in
// two frame parts of 7 (job.SplitFrames(14, 8)), three units over two
// tasks.
const validPlanJSON = `{
  "campaign": "trial",
  "campaign_file": "/srv/lab/campaign.yaml",
  "frames_per_task": 8,
  "tasks": 2,
  "units": [
    {"test": "a", "config": "/srv/lab/a.yaml"},
    {"test": "b", "config": "/srv/lab/b.yaml", "part": {"index": 0, "count": 2, "from": 0, "to": 7}},
    {"test": "b", "config": "/srv/lab/b.yaml", "part": {"index": 1, "count": 2, "from": 7, "to": 14}}
  ]
}`

// A hand-edited plan file that is not one NewPlan could make is an error
// naming the file and what is wrong — before, zero tasks read fine and
// Task, Status and Unfinished then divided by zero (a panic), and the
// other cases were taken as they were. Each case edits the valid plan
// above one way; the valid plan itself reads back.
func TestReadPlanRefusesHandEditedPlans(t *testing.T) {
	partB := func(index, count, from, to int) string {
		return `{"test": "b", "config": "/srv/lab/b.yaml", "part": {"index": ` + itoa(index) + `, "count": ` + itoa(count) + `, "from": ` + itoa(from) + `, "to": ` + itoa(to) + `}}`
	}
	wholeA := `{"test": "a", "config": "/srv/lab/a.yaml"}`
	plan := func(tasks, frames int, units ...string) string {
		return `{"campaign": "trial", "frames_per_task": ` + itoa(frames) + `, "tasks": ` + itoa(tasks) + `, "units": [` + strings.Join(units, ",") + `]}`
	}
	for _, c := range []struct {
		name, json, want string
	}{
		{"zero tasks", plan(0, 8, wholeA), `"tasks": 0, expected 1 to 1`},
		{"negative tasks", plan(-3, 8, wholeA), `"tasks": -3`},
		{"more tasks than units", plan(5, 8, wholeA, partB(0, 2, 0, 7), partB(1, 2, 7, 14)), `"tasks": 5, expected 1 to 3`},
		{"no units", plan(1, 8), "no units"},
		{"no units key", `{"campaign": "trial", "tasks": 1}`, "no units"},
		{"null", `null`, "no units"},
		{"negative frames per task", plan(1, -1, wholeA), `"frames_per_task": -1`},
		{"duplicate whole test", plan(2, 8, wholeA, wholeA), "units[0] and units[1]: test a is listed twice"},
		{"duplicate part", plan(2, 8, partB(0, 2, 0, 7), partB(0, 2, 0, 7)), "units[0] and units[1]: test b lists part 1/2 twice"},
		{"one name, two configs", plan(2, 8, wholeA, `{"test": "a", "config": "/srv/lab/other.yaml"}`), "test a has two configs"},
		{"one config, two names", plan(2, 8, wholeA, `{"test": "a2", "config": "/srv/lab/a.yaml"}`), "config \"/srv/lab/a.yaml\" is listed as two tests, a and a2"},
		{"whole and parts", plan(3, 8, `{"test": "b", "config": "/srv/lab/b.yaml"}`, partB(0, 2, 0, 7), partB(1, 2, 7, 14)), "test b is listed twice"},
		{"part index out of range", plan(2, 8, partB(0, 2, 0, 7), partB(2, 2, 7, 14)), "part index 2, expected 0 to 1"},
		{"negative part index", plan(2, 8, partB(-1, 2, 0, 7), partB(1, 2, 7, 14)), "part index -1"},
		{"part count too small", plan(2, 8, partB(0, 1, 0, 7), partB(1, 2, 7, 14)), "2 frame parts listed, its parts say 1"},
		{"part count zero", plan(1, 8, partB(0, 0, 0, 7)), "1 frame parts listed, its parts say 0"},
		{"part missing", plan(1, 8, partB(0, 2, 0, 7)), "1 frame parts listed, its parts say 2"},
		{"gap between parts", plan(2, 8, partB(0, 2, 0, 7), partB(1, 2, 8, 14)), "part 2/2 starts at frame 8, expected 7"},
		{"overlapping parts", plan(2, 8, partB(0, 2, 0, 7), partB(1, 2, 6, 13)), "part 2/2 starts at frame 6, expected 7"},
		{"first part not at 0", plan(2, 8, partB(0, 2, 1, 7), partB(1, 2, 7, 14)), "part 1/2 starts at frame 1, expected 0"},
		{"empty part", plan(2, 8, partB(0, 2, 0, 0), partB(1, 2, 0, 7)), "part 1/2 has frames 0 to -1"},
		{"part longer than frames per task", plan(2, 8, partB(0, 2, 0, 9), partB(1, 2, 9, 14)), "expected 1 to 8 frames"},
		{"parts without frames per task", plan(2, 0, partB(0, 2, 0, 7), partB(1, 2, 7, 14)), `"frames_per_task" is 0`},
		{"test is a path", plan(1, 8, `{"test": "../../home", "config": "/srv/lab/a.yaml"}`), "is a path"},
		{"test with a separator", plan(1, 8, `{"test": "a/b", "config": "/srv/lab/a.yaml"}`), "is a path"},
		{"test is ..", plan(1, 8, `{"test": "..", "config": "/srv/lab/a.yaml"}`), "is a path"},
		{"test with a backslash", plan(1, 8, `{"test": "a\\b", "config": "/srv/lab/a.yaml"}`), "is a path"},
		{"test with a newline", plan(1, 8, `{"test": "a\nb", "config": "/srv/lab/a.yaml"}`), "control character"},
		{"hidden test", plan(1, 8, `{"test": ".a", "config": "/srv/lab/a.yaml"}`), "starts with a dot"},
		{"empty test", plan(1, 8, `{"test": "", "config": "/srv/lab/a.yaml"}`), `"test" is empty`},
		{"empty config", plan(1, 8, `{"test": "a", "config": ""}`), `"config" is empty`},
		{"unit naming a task", plan(1, 8, `{"test": "a", "config": "/srv/lab/a.yaml", "task": 7}`), `unknown field "task"`},
		{"misspelt key", `{"campaign": "trial", "task": 1, "units": [` + wholeA + `]}`, `unknown field "task"`},
		{"tasks as text", `{"campaign": "trial", "tasks": "2", "units": [` + wholeA + `]}`, "line 1, column 34: tasks is a JSON string, expected a whole number"},
		{"a list", `[1, 2]`, "the plan is a JSON array, expected an object"},
		{"two objects", plan(1, 8, wholeA) + "\n  " + plan(1, 8, wholeA), "line 2, column 3: more after the plan's JSON object"},
		{"not JSON", "{\n  \"tasks\": 2\n  units: []\n}", "line 3, column 3: invalid character 'u'"},
		{"cut short", `{"campaign": "trial", "tasks": 1, "units": [`, "ends inside the JSON object"},
		{"empty file", "", "empty, expected a JSON object"},
	} {
		dir := t.TempDir()
		path := filepath.Join(dir, PlanFile)
		if err := os.WriteFile(path, []byte(c.json), 0o644); err != nil {
			t.Fatal(err)
		}
		p, err := ReadPlan(dir)
		if err == nil || !strings.Contains(err.Error(), path) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: plan %+v, error %v; want an error naming %s and saying %q", c.name, p, err, path, c.want)
		}
	}
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, PlanFile), []byte(validPlanJSON), 0o644)
	p, err := ReadPlan(dir)
	if err != nil || p.Tasks != 2 || len(p.Units) != 3 || len(p.Task(0)) != 2 || len(p.Task(1)) != 1 {
		t.Errorf("the valid plan: %+v, %v", p, err)
	}
	// A plan made in code without tasks gives no units, not a division by 0.
	if us := (&Plan{Units: p.Units}).Task(0); us != nil {
		t.Errorf("a plan of no tasks: task 0 has %v", us)
	}
	if p, err := ReadPlan(t.TempDir()); p != nil || err != nil {
		t.Errorf("no plan: %+v, %v; want nil, nil", p, err)
	}
}

func itoa(n int) string { b, _ := json.Marshal(n); return string(b) }

// Parts come in frame order whatever the order the plan lists them in,
// as merge assembles them (frames 0–6 then 7–13).
func TestPlanPartsInFrameOrder(t *testing.T) {
	q, err := parsePlan(PlanFile, []byte(`{"campaign": "trial", "frames_per_task": 8, "tasks": 2, "units": [
		{"test": "b", "config": "/b.yaml", "part": {"index": 1, "count": 2, "from": 7, "to": 14}},
		{"test": "b", "config": "/b.yaml", "part": {"index": 0, "count": 2, "from": 0, "to": 7}}]}`))
	if err != nil {
		t.Fatal(err)
	}
	parts := q.Parts("b")
	if len(parts) != 2 || parts[0].From != 0 || parts[1].From != 7 {
		t.Errorf("parts %v, want frames 0–6 then 7–13", parts)
	}
}

// NewPlan refuses what would make a plan that does not validate: a
// negative --tasks or --frames-per-task (before, silently taken as 0),
// and two tests of one name in a campaign (before, both ran into one
// run folder, the second overwriting the first). Its plans validate.
func TestNewPlanRefusesNegativeCountsAndSharedNames(t *testing.T) {
	c := &config.Campaign{Name: "trial", Tests: []string{"/srv/lab/a.yaml", "/srv/lab/b.yaml", "/srv/lab/c.yaml"}}
	if _, err := NewPlan(c, 0, -1); err == nil || !strings.Contains(err.Error(), "--tasks -1") {
		t.Errorf("--tasks -1: %v", err)
	}
	if _, err := NewPlan(c, -5, 0); err == nil || !strings.Contains(err.Error(), "--frames-per-task -5") {
		t.Errorf("--frames-per-task -5: %v", err)
	}
	// 0 or more tasks than units: one task per unit.
	for tasks, want := range map[int]int{0: 3, 1: 1, 2: 2, 3: 3, 10: 3} {
		p, err := NewPlan(c, 0, tasks)
		if err != nil || p.Validate() != nil {
			t.Fatalf("%d tasks: %v", tasks, err)
		}
		if p.Tasks != want {
			t.Errorf("%d tasks asked: %d, want %d", tasks, p.Tasks, want)
		}
	}
	// The configs cannot be read, so their names are the files' stems
	// (job.TestName): both "a".
	dup := &config.Campaign{Name: "trial", Tests: []string{"/srv/lab/a.yaml", "/srv/other/a.yaml"}}
	if _, err := NewPlan(dup, 0, 0); err == nil || !strings.Contains(err.Error(), "test a has two configs") {
		t.Errorf("two tests named a: %v", err)
	}
}

// Any bytes given to the plan reader give either an error or a plan that
// validates, never a panic; a plan read can be used as the plan's readers
// use it — every unit in exactly one task (k mod tasks), its parts in
// frame order from 0 — and written and read back equal.
func FuzzReadPlan(f *testing.F) {
	f.Add([]byte(validPlanJSON))
	f.Add([]byte(`{"campaign": "trial", "tasks": 0, "units": [{"test": "a", "config": "a.yaml"}]}`))
	f.Add([]byte(`{"campaign": "trial", "tasks": -1, "units": [{"test": "a", "config": "a.yaml"}]}`))
	f.Add([]byte(`{"campaign": "trial", "tasks": 1, "units": [{"test": "a", "config": "a.yaml"}, {"test": "a", "config": "a.yaml"}]}`))
	f.Add([]byte(`{"campaign": "trial", "frames_per_task": 4, "tasks": 1, "units": [{"test": "b", "config": "b", "part": {"index": 0, "count": 1, "from": 0, "to": 4}}]}`))
	f.Add([]byte(`{"tasks": 9223372036854775807, "units": [{"test": "a", "config": "a"}]}`))
	f.Add([]byte(`{"campaign": "t", "frames_per_task": 8, "tasks": 2, "units": [{"test": "b", "config": "b", "part": {"index": 0, "count": 2, "from": 0, "to": 7}}, {"test": "b", "config": "b", "part": {"index": 1, "count": 2, "from": 8, "to": 14}}]}`))
	f.Add([]byte(`{"campaign": "t", "frames_per_task": 8, "tasks": 2, "units": [{"test": "b", "config": "b"}, {"test": "b", "config": "b", "part": {"index": 1, "count": 2, "from": 7, "to": 14}}]}`))
	f.Add([]byte(`{"tasks": 1, "units": [{"test": "../x", "config": "a"}]}`))
	f.Add([]byte(`null`))
	f.Add([]byte(``))
	f.Fuzz(func(t *testing.T, b []byte) {
		p, err := parsePlan(PlanFile, b)
		if err != nil {
			if p != nil {
				t.Fatalf("error %v with a plan", err)
			}
			return
		}
		if err := p.Validate(); err != nil {
			t.Fatalf("plan read but does not validate: %v", err)
		}
		seen := 0
		for i := 0; i < p.Tasks; i++ {
			seen += len(p.Task(i))
		}
		if seen != len(p.Units) {
			t.Fatalf("%d units in the tasks, %d in the plan", seen, len(p.Units))
		}
		for _, u := range p.Units {
			next := 0
			for _, pt := range p.Parts(u.Test) {
				if pt.From != next {
					t.Fatalf("test %s: parts %v not in frame order from 0", u.Test, p.Parts(u.Test))
				}
				next = pt.To
			}
		}
		again, err := json.Marshal(p)
		if err != nil {
			t.Fatal(err)
		}
		q, err := parsePlan(PlanFile, again)
		if err != nil || !q.Equal(p) || q.File != p.File {
			t.Fatalf("written and read back: %+v, %v; want %+v", q, err, p)
		}
	})
}
