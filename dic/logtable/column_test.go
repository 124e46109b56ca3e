package logtable

import (
	"strings"
	"testing"
)

// isTime is the default rule of a time column in these tests.
func isTime(cell string) bool {
	base, _ := SplitUnit(cell)
	return base == "time" || cell == "time"
}

func TestResolve(t *testing.T) {
	header := []string{"time_s", "Force_kN", "time_ms", "force_kN"}
	for _, c := range []struct {
		name     string
		text     string
		header   []string
		fallback int
		want     Column
		err      string
	}{
		{"index", "2", header, 0, Column{Index: 2, Name: "Force_kN"}, ""},
		{"index without header", "7", nil, 0, Column{Index: 7}, ""},
		{"index past header", "5", header, 0, Column{},
			`time_column 5: the header has only 4 columns: 1 "time_s", 2 "Force_kN", 3 "time_ms", 4 "force_kN"`},
		{"name", "TIME_MS", header, 0, Column{Index: 3, Name: "time_ms"}, ""},
		{"name absent", "load", header, 0, Column{},
			`time_column "load" is not in the header; its columns are 1 "time_s", 2 "Force_kN", 3 "time_ms", 4 "force_kN"`},
		{"name twice", "force_kn", header, 0, Column{}, `time_column "force_kn" matches columns [2 4]; give a 1-based index`},
		{"name without header", "time_s", nil, 0, Column{},
			`time_column "time_s" names a column, but the file has no header line; give a 1-based index`},
		{"default ambiguous", "", header, 0, Column{},
			`several columns could be the time column (1 "time_s", 3 "time_ms"); set time_column`},
		{"default", "", []string{"x", "time (s)"}, 0, Column{Index: 2, Name: "time (s)"}, ""},
		{"default absent", "", []string{"x", "y"}, 1, Column{}, ""},
		{"fallback without header", "", nil, 1, Column{Index: 1}, ""},
	} {
		spec, err := ParseColumnSpec("time_column", c.text)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		got, err := spec.Resolve(c.header, c.fallback, "time", isTime)
		switch {
		case c.err == "" && err != nil:
			t.Errorf("%s: %v", c.name, err)
		case c.err != "" && (err == nil || err.Error() != c.err):
			t.Errorf("%s: error %v,\nwant %s", c.name, err, c.err)
		case got != c.want:
			t.Errorf("%s: %+v, want %+v", c.name, got, c.want)
		}
	}
}

func TestParseColumnSpec(t *testing.T) {
	for _, c := range []struct {
		text string
		want ColumnSpec
	}{
		{" 3 ", ColumnSpec{Field: "f", Text: "3", Index: 3}},
		{"Load", ColumnSpec{Field: "f", Text: "Load"}},
		{"", ColumnSpec{Field: "f"}},
		{"3a", ColumnSpec{Field: "f", Text: "3a"}}, // not all digits: a name
	} {
		if got, err := ParseColumnSpec("f", c.text); err != nil || got != c.want {
			t.Errorf("ParseColumnSpec(%q) = %+v, %v; want %+v", c.text, got, err, c.want)
		}
	}
	_, err := ParseColumnSpec("force_column", "0")
	if want := `force_column "0": a column index is 1-based, expected 1 or more`; err == nil || err.Error() != want {
		t.Errorf("index 0: error %v, want %q", err, want)
	}
}

// A header's cells are listed for a message in part when there are many:
// the first ListedColumns, then how many more. Before, a header of 5000
// cells gave a message of 49 kB (found by loadlog's FuzzDecode).
func TestListColumnsIsBounded(t *testing.T) {
	if got, want := ListColumns([]string{"time_s", "force_kN"}), `1 "time_s", 2 "force_kN"`; got != want {
		t.Errorf("two columns: %q, want %q", got, want)
	}
	many := make([]string, 5000)
	for i := range many {
		many[i] = "c"
	}
	got := ListColumns(many)
	if !strings.HasPrefix(got, `1 "c", 2 "c"`) || !strings.HasSuffix(got, `50 "c", and 4950 more`) {
		t.Errorf("5000 columns: %.80q … %q", got, got[max(0, len(got)-40):])
	}
	long := make([]string, 300)
	for i := range long {
		long[i] = strings.Repeat("h", 300)
	}
	if got := ListColumns(long); len(got) > ListedBytes+200 || !strings.HasSuffix(got, "more") {
		t.Errorf("300 long columns: %d bytes, ends %q", len(got), got[max(0, len(got)-40):])
	}
}
