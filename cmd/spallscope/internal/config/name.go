package config

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"

	"spallscope/dic/logtable"
)

// NameMaxBytes is the longest name CheckPathName and checkLabel accept, in
// bytes. A test's name becomes a folder with a suffix ("<name>_run") and a
// campaign's "<name>_runs"; file systems allow 255 bytes a component, so
// 100 leaves room for the suffixes and keeps tables readable.
const NameMaxBytes = 100

// CheckPathName checks a name that becomes a path component — a test's
// name (its run folder), a face's (RUN/faces/<name>), a campaign's
// ("<name>_runs") — and says which name is wrong and why: kind names it in
// the error ("test name", "faces[1].name"). A name must be one plain
// component: not empty, not "." or "..", no path separator (/ or \, on
// any system: a config travels between them), no leading dot (a hidden
// folder, or the start of ".."), no leading or trailing blanks, valid
// UTF-8 without control or invisible formatting characters (a newline or
// an escape code would reach CSV files, HTML pages, terminals and job
// scripts), and at most NameMaxBytes bytes.
func CheckPathName(kind, name string) error {
	why := labelProblem(name)
	switch {
	case why != "":
	case name == "":
		why = "is empty"
	case name == "." || name == "..":
		why = "is a reference to a folder, not a name"
	case strings.ContainsAny(name, `/\`):
		why = fmt.Sprintf("contains the path separator %q", name[strings.IndexAny(name, `/\`)])
	case strings.HasPrefix(name, "."):
		why = "starts with a dot"
	default:
		return nil
	}
	return fmt.Errorf("%s %s %s; it becomes a folder name: give a plain name (no / or \\, not . or .., no leading dot, no control characters, at most %d bytes)",
		kind, logtable.Excerpt(name), why, NameMaxBytes)
}

// checkLabel checks a name that is written into CSV files, HTML pages,
// JSON and the terminal but is no path component (an opening's name): it
// may be empty (a default applies) and may hold any printable text, with
// the limits of labelProblem.
func checkLabel(kind, name string) error {
	if why := labelProblem(name); why != "" {
		return fmt.Errorf("%s %s %s; expected printable text of at most %d bytes", kind, logtable.Excerpt(name), why, NameMaxBytes)
	}
	return nil
}

// labelProblem says what is wrong with a name as text ("" when nothing):
// longer than NameMaxBytes, not valid UTF-8, leading or trailing blanks,
// or a control or invisible formatting character (a newline or an escape
// code would break a CSV row or drive the terminal; a bidirectional
// override would show another name than the one on disk).
func labelProblem(name string) string {
	switch {
	case len(name) > NameMaxBytes:
		return fmt.Sprintf("is %d bytes long, more than %d", len(name), NameMaxBytes)
	case !utf8.ValidString(name):
		return "is not valid UTF-8 text"
	case strings.TrimSpace(name) != name:
		return "starts or ends with a blank"
	}
	for i, r := range name {
		if unicode.IsControl(r) || unicode.In(r, unicode.Cf, unicode.Zl, unicode.Zp) {
			return fmt.Sprintf("holds the control or formatting character %U at byte %d", r, i)
		}
	}
	return ""
}
