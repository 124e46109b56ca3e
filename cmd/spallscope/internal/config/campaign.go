package config

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// Campaign is a set of tests run together: a YAML file listing test
// configs (paths relative to it), or a folder whose *.yaml files are the
// tests.
type Campaign struct {
	Name string `yaml:"name"`
	// Out is the folder for the runs and the summary (default: beside the
	// campaign file, "<name>_runs").
	Out string `yaml:"out"`
	// Jobs is how many tests run at once (default 1: each test already uses
	// every core).
	Jobs  int      `yaml:"jobs"`
	Tests []string `yaml:"tests"`

	Dir string `yaml:"-"`
}

// ReadCampaign reads a campaign file, or lists a folder's test configs,
// and checks it: its name (a folder name, "<name>_runs"), its jobs, and
// that no two tests have one run folder (TestName), naming both configs.
// A test whose config cannot be read is not an error here: the campaign
// runs the others and reports it.
func ReadCampaign(path string) (*Campaign, error) {
	abs, _ := filepath.Abs(path)
	st, err := os.Stat(path)
	if err != nil {
		return nil, fmt.Errorf("campaign: %w", err)
	}
	var c *Campaign
	if st.IsDir() {
		matches, _ := filepath.Glob(filepath.Join(path, "*.yaml"))
		more, _ := filepath.Glob(filepath.Join(path, "*.yml"))
		matches = append(matches, more...)
		sort.Strings(matches)
		if len(matches) == 0 {
			return nil, fmt.Errorf("campaign folder %s holds no .yaml test configs", path)
		}
		c = &Campaign{Name: filepath.Base(abs), Dir: abs, Tests: matches}
	} else {
		data, err := os.ReadFile(path)
		if err != nil {
			return nil, fmt.Errorf("campaign: %w", err)
		}
		c = &Campaign{}
		if err := decode(data, path, c); err != nil {
			return nil, fmt.Errorf("campaign %w", err)
		}
		c.Dir = filepath.Dir(abs)
		if c.Name == "" {
			c.Name = filepath.Base(path)
		}
		if len(c.Tests) == 0 {
			return nil, fmt.Errorf("campaign %s lists no tests", path)
		}
		for i, t := range c.Tests {
			if !filepath.IsAbs(t) {
				c.Tests[i] = filepath.Join(c.Dir, t)
			}
		}
		if c.Out != "" && !filepath.IsAbs(c.Out) {
			c.Out = filepath.Join(c.Dir, c.Out)
		}
	}
	if err := c.check(); err != nil {
		return nil, fmt.Errorf("campaign %s: %w", path, err)
	}
	return c, nil
}

// check checks the campaign's name, jobs and test names.
func (c *Campaign) check() error {
	var p Problems
	p.add(CheckPathName("campaign name", c.Name))
	p.add(checkBounds(bound{"jobs", c.Jobs, c.Jobs >= 0, "0 or more tests at once (0: one)"}))
	type first struct{ config, name string }
	seen := map[string]first{} // by case-folded name: one folder on a case-insensitive file system
	for _, path := range c.Tests {
		name, err := TestName(path)
		if err != nil {
			p.add(err)
			continue
		}
		fold := strings.ToLower(name)
		prev, dup := seen[fold]
		switch {
		case !dup:
			seen[fold] = first{path, name}
		case prev.config == path:
			p.add(fmt.Errorf("test %s is listed twice", path))
		default:
			same := "are both named"
			if prev.name != name {
				same = fmt.Sprintf("are named %q and", prev.name) // differ only in case
			}
			p.add(fmt.Errorf("tests %s and %s %s %q: each test's run folder is named after it, so one would overwrite the other; give one of them another name", prev.config, path, same, name))
		}
	}
	return p.err()
}

// TestName is the run folder name of a campaign test: its config's name,
// or the config file's stem when the config cannot be read (its outcome
// is recorded there). An error says that the stem cannot be a folder
// name either.
func TestName(configPath string) (string, error) {
	t, err := Read(configPath)
	if err == nil {
		return t.Name, nil
	}
	stem := strings.TrimSuffix(filepath.Base(configPath), filepath.Ext(configPath))
	if nerr := CheckPathName("test name (from the file name of "+configPath+")", stem); nerr != nil {
		return "", fmt.Errorf("%w (its config gives no usable name either: %v)", nerr, err)
	}
	return stem, nil
}
