package cluster

import (
	"errors"
	"fmt"
	"strings"
)

// Validate reports whether the plan is one NewPlan could have made, so
// that nothing that reads it — Task, Status, Unfinished, Merge, Script —
// divides by a zero task count, indexes past a part, runs a unit twice or
// writes outside the output folder. A plan file is JSON a user can edit
// by hand; ReadPlan validates what it reads. The rules:
//
//   - tasks is at least 1 and at most the number of units (a task with
//     no unit would fail as a shard of a campaign with fewer units), and
//     there is at least one unit; frames_per_task is 0 or more;
//   - a unit's test is a name that can be a folder under the output
//     folder: not empty, not . or .., no / or \, no control character,
//     not starting with a dot; its config is not empty;
//   - a test is one config (two configs of one name would share a run
//     folder) and a config one test (status reads a test's outcome by
//     its config), and a test runs whole once or in parts, not both;
//   - a test's parts are parts 1…count of one count, once each, covering
//     frames from 0 on without a gap or an overlap, each 1 to
//     frames_per_task frames; parts need frames_per_task > 0.
func (p *Plan) Validate() error {
	if len(p.Units) == 0 {
		return errors.New("no units of work (\"units\" is empty)")
	}
	if p.Tasks < 1 || p.Tasks > len(p.Units) {
		return fmt.Errorf("\"tasks\": %d, expected 1 to %d (the number of units)", p.Tasks, len(p.Units))
	}
	if p.FramesPerTask < 0 {
		return fmt.Errorf("\"frames_per_task\": %d, expected 0 or more", p.FramesPerTask)
	}
	first := map[string]int{}    // test → index of its first unit
	byConfig := map[string]int{} // config → index of its first unit
	parts := map[string][]int{}  // test → indices of its part units
	for k, u := range p.Units {
		if err := checkTestName(u.Test); err != nil {
			return fmt.Errorf("units[%d]: %w", k, err)
		}
		if u.Config == "" {
			return fmt.Errorf("units[%d] (test %s): \"config\" is empty, expected the test's config file", k, u.Test)
		}
		if c, ok := byConfig[u.Config]; ok && p.Units[c].Test != u.Test {
			return fmt.Errorf("units[%d] and units[%d]: config %s is listed as two tests, %s and %s; a test's name comes from its config", c, k, excerpt(u.Config), p.Units[c].Test, u.Test)
		} else if !ok {
			byConfig[u.Config] = k
		}
		f, seen := first[u.Test]
		if !seen {
			first[u.Test] = k
		}
		switch {
		case seen && p.Units[f].Config != u.Config:
			return fmt.Errorf("units[%d] and units[%d]: test %s has two configs, %s and %s; each test needs a name of its own", f, k, u.Test, excerpt(p.Units[f].Config), excerpt(u.Config))
		case seen && (u.Part == nil || p.Units[f].Part == nil):
			return fmt.Errorf("units[%d] and units[%d]: test %s is listed twice; a test runs whole once, or in frame parts", f, k, u.Test)
		}
		if u.Part != nil {
			parts[u.Test] = append(parts[u.Test], k)
		}
	}
	for _, u := range p.Units { // in the file's order, for a stable message
		if us := parts[u.Test]; us != nil {
			if err := p.checkParts(u.Test, us); err != nil {
				return err
			}
			delete(parts, u.Test)
		}
	}
	return nil
}

// checkParts checks the part units (indices into p.Units) of one test.
func (p *Plan) checkParts(test string, units []int) error {
	if p.FramesPerTask == 0 {
		return fmt.Errorf("units[%d]: test %s has frame parts but \"frames_per_task\" is 0", units[0], test)
	}
	count := p.Units[units[0]].Part.Count
	if count != len(units) {
		return fmt.Errorf("units[%d]: test %s has %d frame parts listed, its parts say %d", units[0], test, len(units), count)
	}
	byIndex := make([]int, count) // part index → unit index + 1
	for _, k := range units {
		pt := p.Units[k].Part
		switch {
		case pt.Count != count:
			return fmt.Errorf("units[%d]: test %s: part count %d, the test's other parts say %d", k, test, pt.Count, count)
		case pt.Index < 0 || pt.Index >= count:
			return fmt.Errorf("units[%d]: test %s: part index %d, expected 0 to %d", k, test, pt.Index, count-1)
		case byIndex[pt.Index] != 0:
			return fmt.Errorf("units[%d] and units[%d]: test %s lists part %d/%d twice", byIndex[pt.Index]-1, k, test, pt.Index+1, count)
		case pt.From < 0 || pt.To <= pt.From || pt.To-pt.From > p.FramesPerTask:
			return fmt.Errorf("units[%d]: test %s: part %d/%d has frames %d to %d (\"from\" %d, \"to\" %d), expected 1 to %d frames (frames_per_task) from frame 0 on", k, test, pt.Index+1, count, pt.From, pt.To-1, pt.From, pt.To, p.FramesPerTask)
		}
		byIndex[pt.Index] = k + 1
	}
	next := 0
	for i, k1 := range byIndex {
		pt := p.Units[k1-1].Part
		if pt.From != next {
			return fmt.Errorf("units[%d]: test %s: part %d/%d starts at frame %d, expected %d (parts cover the frames from 0 in order, without gaps or overlaps)", k1-1, test, i+1, count, pt.From, next)
		}
		next = pt.To
	}
	return nil
}

// checkTestName checks that a unit's test name can be one folder under
// the output folder (see Plan.Validate).
func checkTestName(name string) error {
	switch {
	case name == "":
		return errors.New("\"test\" is empty, expected the test's name")
	case name == "." || name == ".." || strings.ContainsAny(name, `/\`):
		return fmt.Errorf("test %s is a path, expected a name for a run folder (no / or \\, not . or ..)", excerpt(name))
	case hasControl(name):
		return fmt.Errorf("test %s holds a control character, expected a name for a run folder", excerpt(name))
	case strings.HasPrefix(name, "."):
		return fmt.Errorf("test %s starts with a dot, expected a name for a visible run folder", excerpt(name))
	}
	return nil
}
