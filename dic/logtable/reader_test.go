package logtable

import (
	"errors"
	"reflect"
	"strings"
	"testing"
)

// readAll reads content with t's layout and returns the header and the
// data rows it was handed.
func readAll(t *Reader, content string) (header []string, rows [][]string, err error) {
	err = t.Read(strings.NewReader(content),
		func() error { header = t.Header; return nil },
		func(cells []string) error { rows = append(rows, cells); return nil })
	return header, rows, err
}

func TestReaderHeaderAndRows(t *testing.T) {
	r := &Reader{Prefix: "testlog", Path: "p.csv", Kind: "test log", SkipLines: 1}
	content := "\uFEFFpreamble, not a comment\n# comment\n\n;;\ntime_s;force_kN\n0;1\n 0:00:01 ; 2 \n"
	header, rows, err := readAll(r, content)
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"time_s", "force_kN"}; !reflect.DeepEqual(header, want) || r.HeaderLine != 5 {
		t.Errorf("header %q on line %d, want %q on line 5", header, r.HeaderLine, want)
	}
	if want := [][]string{{"0", "1"}, {"0:00:01", "2"}}; !reflect.DeepEqual(rows, want) || r.Rows != 2 {
		t.Errorf("rows %q (%d counted), want %q", rows, r.Rows, want)
	}
	if r.Delimiter != ';' {
		t.Errorf("delimiter %q, want ';'", rune(r.Delimiter))
	}
}

func TestReaderWithoutHeader(t *testing.T) {
	r := &Reader{Prefix: "testlog", Path: "p.txt", Comment: "//"}
	header, rows, err := readAll(r, "// comment\n0 1\n2 3\n")
	if err != nil || header != nil || !reflect.DeepEqual(rows, [][]string{{"0", "1"}, {"2", "3"}}) {
		t.Errorf("header %q, rows %q, %v; want no header and two rows", header, rows, err)
	}
}

func TestReaderNumber(t *testing.T) {
	r := &Reader{Prefix: "testlog", Path: "p.csv"}
	var errs []string
	err := r.Read(strings.NewReader("time,force\ns,kN\n"), func() error { return nil }, func(cells []string) error {
		for _, c := range []Column{{Index: 1, Name: "time"}, {Index: 3}} {
			if _, err := r.Number(cells, c, false); err != nil {
				errs = append(errs, err.Error())
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{
		`testlog: p.csv: line 2, column 1 "time": "s" is not a number; this line, after the header on line 1, has no numbers: comment it out with "#"`,
		`testlog: p.csv: line 2, column 3: the row has only 2 cells, expected a value in column 3`,
	}
	if !reflect.DeepEqual(errs, want) {
		t.Errorf("errors\n%q\nwant\n%q", errs, want)
	}
	if v, err := r.Number([]string{"0:01:02.5"}, Column{Index: 1}, true); err != nil || v != 62.5 {
		t.Errorf("clock cell: %g, %v; want 62.5", v, err)
	}
}

func TestReaderNoData(t *testing.T) {
	for _, c := range []struct {
		content string
		skip    int
		want    string
	}{
		{"", 0, "testlog: p.csv: no data rows: the file is empty"},
		{"# only\n\n", 0, "testlog: p.csv: no data rows: the file has only comments and blank lines"},
		{"a\nb\n", 2, "testlog: p.csv: no data rows: after the 2 skipped lines there are only comments and blank lines"},
		{"# c\ntime,force\n", 0, "testlog: p.csv: no data rows after the header on line 2"},
	} {
		r := &Reader{Prefix: "testlog", Path: "p.csv", SkipLines: c.skip}
		if _, _, err := readAll(r, c.content); err != nil {
			t.Fatal(err)
		}
		err := r.NoData()
		if err.Error() != c.want || !errors.Is(err, ErrNoData) {
			t.Errorf("%q: %v, want %q wrapping ErrNoData", c.content, err, c.want)
		}
	}
}

func TestReaderLongLine(t *testing.T) {
	r := &Reader{Prefix: "testlog", Path: "p.csv", Kind: "test log"}
	_, _, err := readAll(r, "t,f\n0,1\n"+strings.Repeat("9", MaxLine+1)+"\n")
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Line != 3 || pe.Column != 0 {
		t.Fatalf("error %v, want a ParseError at line 3", err)
	}
	if want := "testlog: p.csv: line 3: line longer than 1048576 bytes; expected a text test log"; err.Error() != want {
		t.Errorf("error %q, want %q", err, want)
	}
}

func TestParseErrorMessage(t *testing.T) {
	inner := errors.New("bad")
	for _, c := range []struct {
		e    ParseError
		want string
	}{
		{ParseError{Prefix: "aelog", Path: "h.csv", Line: 57, Column: 1, ColumnName: "time_s", Err: inner}, `aelog: h.csv: line 57, column 1 "time_s": bad`},
		{ParseError{Prefix: "loadlog", Path: "l.csv", Line: 3, Column: 2, Err: inner}, "loadlog: l.csv: line 3, column 2: bad"},
		{ParseError{Prefix: "loadlog", Path: "l.csv", Line: 3, Err: inner}, "loadlog: l.csv: line 3: bad"},
		{ParseError{Prefix: "loadlog", Path: "l.csv", Column: 2, Err: inner}, "loadlog: l.csv: bad"},
		{ParseError{Path: "l.csv", Err: inner}, "l.csv: bad"},
	} {
		if got := c.e.Error(); got != c.want {
			t.Errorf("%+v: %q, want %q", c.e, got, c.want)
		}
		if !errors.Is(&c.e, inner) {
			t.Errorf("%+v does not unwrap to its Err", c.e)
		}
	}
}
