package cluster

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// hostileStrings are words a hostile or careless user could put into a
// path or option: command substitution both ways, separators, quotes of
// both kinds, backslashes, globs, tilde, parameter expansion, a leading
// dash, newlines and carriage returns, and non-ASCII text.
var hostileStrings = []string{
	"$(touch PWNED)",
	"`touch PWNED`",
	"a; touch PWNED; b",
	"a && touch PWNED",
	"a | touch PWNED",
	"it's",
	"'",
	"''",
	`say "hi"`,
	`back\slash\`,
	`\'`,
	"*",
	"~",
	"~root",
	"$HOME",
	"${PWD}",
	"-n",
	"two words",
	"line1\nline2",
	"line1\n$(touch PWNED)\n",
	"cr\rlf",
	"tab\there",
	"#not a comment",
	"a=b",
	"données d'essai",
	"",
	"plain/path-1.2_x,y:z@%+",
}

// Each word, quoted, reads back as the same bytes through sh (dash on
// Debian) and through bash, and nothing in it runs: the shells themselves
// are the reference for POSIX sh's quoting rules (POSIX.1-2017 Shell
// Command Language 2.2.3: single quotes keep every byte literal, and a
// quote is written by closing the quotes, an escaped quote, reopening).
func TestShellQuoteReadsBackAsTheSameBytesInShAndBash(t *testing.T) {
	for _, shell := range []string{"sh", "bash"} {
		path, err := exec.LookPath(shell)
		if err != nil {
			t.Fatalf("%s is not on PATH: %v", shell, err)
		}
		dir := t.TempDir()
		for _, s := range hostileStrings {
			cmd := exec.Command(path, "-c", `printf '%s' `+shellQuote(s))
			cmd.Dir = dir
			got, err := cmd.Output()
			if err != nil || string(got) != s {
				t.Errorf("%s: %q quoted as %s reads back as %q (%v)", shell, s, shellQuote(s), got, err)
			}
		}
		if left := filesIn(t, dir); len(left) > 0 {
			t.Errorf("%s: quoted words ran commands: files %v", shell, left)
		}
	}
	// Plain words stay readable: nothing to quote (the plain set is ours).
	for s, want := range map[string]string{
		"/srv/lab/ucs-2024/campaign.yaml": "/srv/lab/ucs-2024/campaign.yaml",
		"spallscope":                      "spallscope",
		"":                                "''",
		"it's":                            `'it'\''s'`,
	} {
		if got := shellQuote(s); got != want {
			t.Errorf("shellQuote(%q) = %s, want %s", s, got, want)
		}
	}
}

// filesIn lists every file and folder under dir (relative paths).
func filesIn(t *testing.T, dir string) []string {
	t.Helper()
	var names []string
	err := filepath.WalkDir(dir, func(path string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if path != dir {
			rel, _ := filepath.Rel(dir, path)
			names = append(names, rel)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return names
}

// pwned lists the files under dir whose name starts with PWNED: the
// side effect the hostile strings try to cause.
func pwned(t *testing.T, dir string) []string {
	t.Helper()
	var hits []string
	for _, name := range filesIn(t, dir) {
		if strings.HasPrefix(filepath.Base(name), "PWNED") {
			hits = append(hits, name)
		}
	}
	return hits
}

func BenchmarkShellQuote(b *testing.B) {
	s := "/srv/lab/it's $(a) campaign/runs"
	for b.Loop() {
		shellQuote(s)
	}
}
