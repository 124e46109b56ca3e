package config

import (
	"path/filepath"
	"strings"
	"testing"
)

// Two tests of one campaign with one run folder are refused when the
// campaign is read, naming both config files. Before, ReadCampaign
// accepted them, the campaign said "0 failed" and the second test's run
// overwrote the first's.
func TestCampaignRefusesDuplicateNames(t *testing.T) {
	for _, c := range []struct {
		name  string
		files map[string]string
		list  string // the campaign file's tests: "" reads the folder
		want  []string
	}{
		{"two names alike", map[string]string{"a.yaml": "name: B-07\nimages: p\n", "b.yaml": "name: B-07\nimages: q\n"}, "",
			[]string{"a.yaml and ", "b.yaml are both named \"B-07\"", "one would overwrite the other"}},
		{"a name and a stem", map[string]string{"B-07.yaml": "images: p\n", "c.yaml": "name: B-07\nimages: q\n"}, "",
			[]string{"B-07.yaml and ", "c.yaml are both named \"B-07\""}},
		// On a case-insensitive file system (macOS, Windows shares) the
		// two are one folder (common practice, no source).
		{"names that differ in case", map[string]string{"a.yaml": "name: b-07\nimages: p\n", "b.yaml": "name: B-07\nimages: q\n"}, "",
			[]string{"a.yaml and ", "b.yaml are named \"b-07\" and \"B-07\""}},
		{"listed twice", map[string]string{"a.yaml": "images: p\n"}, "[a.yaml, ./a.yaml]",
			[]string{"a.yaml is listed twice"}},
		// A config that cannot be read records its outcome under its stem,
		// which must not be another test's name either.
		{"unreadable config's stem", map[string]string{"B-07.yaml": "images: [\n", "c.yaml": "name: B-07\nimages: q\n"}, "",
			[]string{"B-07.yaml and ", "c.yaml are both named \"B-07\""}},
		{"unreadable config with a hidden stem", map[string]string{".b.yaml": "images: [\n"}, "[.b.yaml]",
			[]string{`test name (from the file name of `, `.b.yaml) ".b" starts with a dot`}},
	} {
		dir := t.TempDir()
		writeFiles(t, dir, c.files)
		path := dir
		if c.list != "" {
			path = filepath.Join(dir, "campaign.yaml")
			writeFiles(t, dir, map[string]string{"campaign.yaml": "tests: " + c.list + "\n"})
		}
		_, err := ReadCampaign(path)
		for _, w := range c.want {
			if err == nil || !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %v, want it to contain %q", c.name, err, w)
			}
		}
	}
	// Distinct names pass; a broken config alone does not stop the
	// campaign (its error is reported when it runs).
	dir := t.TempDir()
	writeFiles(t, dir, map[string]string{"a.yaml": "name: B-07\nimages: p\n", "b.yaml": "name: B-08\nimages: q\n", "c.yaml": "images: [\n"})
	c, err := ReadCampaign(dir)
	if err != nil || len(c.Tests) != 3 {
		t.Fatalf("distinct names: %v, %+v", err, c)
	}
}

// The campaign file's own values: its name becomes "<name>_runs", jobs is
// a whole count, an unknown key is named with the keys valid there.
func TestCampaignFileChecks(t *testing.T) {
	for _, c := range []struct{ yaml, want string }{
		{"name: ../../tmp/x\ntests: [a.yaml]\n", `campaign name "../../tmp/x" contains the path separator '/'`},
		{"name: \"c\\n\"\ntests: [a.yaml]\n", `campaign name "c\n" starts or ends with a blank`},
		{"jobs: -1\ntests: [a.yaml]\n", `jobs "-1": expected 0 or more tests at once`},
		{"jobs: 2.5\ntests: [a.yaml]\n", `line 1: jobs "2.5": expected a whole number`},
		{"job: 2\ntests: [a.yaml]\n", `line 1: unknown key "job" at the top level; valid keys there: name, out, jobs, tests`},
		{"tests: []\n", "lists no tests"},
	} {
		dir := t.TempDir()
		writeFiles(t, dir, map[string]string{"a.yaml": "images: p\n", "campaign.yaml": c.yaml})
		_, err := ReadCampaign(filepath.Join(dir, "campaign.yaml"))
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "campaign.yaml") {
			t.Errorf("%q: error %v, want it to name the file and contain %q", c.yaml, err, c.want)
		}
	}
}
