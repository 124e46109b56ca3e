package logtable

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"strings"
)

// MaxLine is the length in bytes of the longest line a Reader accepts.
const MaxLine = 1 << 20

// Reader reads the lines of one table file and hands its header and data
// rows to the package that knows what they mean. Set the layout fields,
// call Read once, and use the state fields and methods while and after it
// runs.
type Reader struct {
	Prefix string // begins error messages: "loadlog"
	Path   string // names the file in errors
	Kind   string // what the file should be, for messages: "load log"

	Delimiter Delimiter // 0: detected from the first line read
	SkipLines int       // lines at the top skipped whatever they hold
	Comment   string    // starts a comment line after leading blanks; "" means "#"

	Line       int      // number of the line being read (after Read, of the last line)
	Started    bool     // the header or the first data row has been seen
	Header     []string // nil without a header
	HeaderLine int      // line of the header, 0 without one
	Rows       int      // data rows accepted so far
}

// Read reads src line by line. It skips a leading byte order mark, the
// SkipLines lines, comments and blank lines, detects the delimiter if none
// is set and splits the other lines into cells. The first of them is the
// header if IsHeader says so. Once the header, or in a file without one
// the first data row, is known, Read calls setup; it then calls row for
// each data row. It stops at the first error, which it returns as is.
func (t *Reader) Read(src io.Reader, setup func() error, row func(cells []string) error) error {
	if t.Comment == "" {
		t.Comment = "#"
	}
	sc := bufio.NewScanner(src)
	sc.Buffer(make([]byte, 0, 64<<10), MaxLine)
	for sc.Scan() {
		t.Line++
		if err := t.readLine(sc.Text(), setup, row); err != nil {
			return err
		}
	}
	if err := sc.Err(); err != nil {
		if errors.Is(err, bufio.ErrTooLong) {
			return t.ErrAt(t.Line+1, Column{}, fmt.Errorf("line longer than %d bytes; expected a text %s", MaxLine, t.Kind))
		}
		return fmt.Errorf("%s: %s: %w", t.Prefix, t.Path, err)
	}
	return nil
}

// readLine reads one line of the file.
func (t *Reader) readLine(text string, setup func() error, row func([]string) error) error {
	if t.Line == 1 {
		text = strings.TrimPrefix(text, "\uFEFF")
	}
	if t.Line <= t.SkipLines {
		return nil
	}
	if s := strings.TrimSpace(text); s == "" || strings.HasPrefix(s, t.Comment) {
		return nil
	}
	if t.Delimiter == 0 {
		t.Delimiter = DetectDelimiter(text)
	}
	cells := SplitCells(text, t.Delimiter)
	if Blank(cells) {
		return nil
	}
	if !t.Started {
		t.Started = true
		if IsHeader(cells) {
			t.Header, t.HeaderLine = cells, t.Line
			return setup()
		}
		if err := setup(); err != nil {
			return err
		}
	}
	if err := row(cells); err != nil {
		return err
	}
	t.Rows++
	return nil
}

// Number reads the cell of column c in the current row as a finite number,
// or with clock as an h:mm:ss time in seconds. Its errors are ParseErrors
// at the cell; on a line just after the header that has no numbers at all
// (a row of units, a second header line), the error says to comment it
// out.
func (t *Reader) Number(cells []string, c Column, clock bool) (float64, error) {
	if c.Index > len(cells) {
		return 0, t.ErrAt(t.Line, c, fmt.Errorf("the row has only %d cells, expected a value in column %d", len(cells), c.Index))
	}
	cell := cells[c.Index-1]
	var (
		v  float64
		ok bool
	)
	if clock {
		v, ok = ParseClock(cell)
	} else {
		v, ok = ParseNumber(cell)
	}
	if !ok {
		err := CellProblem(cell, clock)
		if t.Rows == 0 && t.Header != nil && !HasNumber(cells) {
			err = fmt.Errorf("%w; this line, after the header on line %d, has no numbers: comment it out with %q", err, t.HeaderLine, t.Comment)
		}
		return 0, t.ErrAt(t.Line, c, err)
	}
	return v, nil
}

// NoData returns the error for a file that Read finished without data
// rows, saying why there were none; it wraps ErrNoData.
func (t *Reader) NoData() error {
	switch {
	case t.Line == 0:
		return t.ErrAt(0, Column{}, fmt.Errorf("%w: the file is empty", ErrNoData))
	case !t.Started && t.SkipLines > 0:
		return t.ErrAt(0, Column{}, fmt.Errorf("%w: after the %d skipped lines there are only comments and blank lines", ErrNoData, t.SkipLines))
	case !t.Started:
		return t.ErrAt(0, Column{}, fmt.Errorf("%w: the file has only comments and blank lines", ErrNoData))
	}
	return t.ErrAt(0, Column{}, fmt.Errorf("%w after the header on line %d", ErrNoData, t.HeaderLine))
}

// ErrAt returns a ParseError in the file at the given line (0: the whole
// file) and column (Index 0: no column).
func (t *Reader) ErrAt(line int, c Column, err error) error {
	return &ParseError{Prefix: t.Prefix, Path: t.Path, Line: line, Column: c.Index, ColumnName: c.Name, Err: err}
}
