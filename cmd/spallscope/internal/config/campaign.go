package config

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"

	"github.com/goccy/go-yaml"
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

// ReadCampaign reads a campaign file, or lists a folder's test configs.
func ReadCampaign(path string) (*Campaign, error) {
	abs, _ := filepath.Abs(path)
	st, err := os.Stat(path)
	if err != nil {
		return nil, fmt.Errorf("campaign: %w", err)
	}
	if st.IsDir() {
		matches, _ := filepath.Glob(filepath.Join(path, "*.yaml"))
		more, _ := filepath.Glob(filepath.Join(path, "*.yml"))
		matches = append(matches, more...)
		sort.Strings(matches)
		if len(matches) == 0 {
			return nil, fmt.Errorf("campaign folder %s holds no .yaml test configs", path)
		}
		c := &Campaign{Name: filepath.Base(abs), Dir: abs, Tests: matches}
		return c, nil
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("campaign: %w", err)
	}
	c := &Campaign{}
	if err := yaml.UnmarshalWithOptions(data, c, yaml.DisallowUnknownField()); err != nil {
		e := explain(path, data, err)
		return nil, fmt.Errorf("campaign: %w (campaign keys: name, out, jobs, tests)", e)
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
	return c, nil
}
