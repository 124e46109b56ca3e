package loadlog

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
)

// maxLine is the length in bytes of the longest line Read accepts.
const maxLine = 1 << 20

// Read reads the load log file at path, laid out as f describes (see the
// package documentation for the accepted layouts), and returns its rows in
// s, N (compression positive) and mm.
//
// Errors say what was expected and where: a *ParseError names the file,
// the line number and, for a cell, the column. Read rejects a time that is
// before the previous row's, a cell that is not a number, a column that is
// not in the header, an unknown unit and a file with fewer than two data
// rows. Equal consecutive times are accepted (see Log.ForceAt).
func Read(path string, f Format) (*Log, error) {
	file, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("loadlog: %w", err)
	}
	defer file.Close()
	return decode(file, path, f)
}

// decode reads a load log from r; path names it in errors and in the Log.
func decode(r io.Reader, path string, f Format) (*Log, error) {
	l, err := f.check()
	if err != nil {
		return nil, fmt.Errorf("loadlog: %s: format: %w", path, err)
	}
	d := &decoder{layout: l, log: &Log{Path: path}}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 64<<10), maxLine)
	for sc.Scan() {
		d.line++
		if err := d.readLine(sc.Text()); err != nil {
			return nil, err
		}
	}
	if err := sc.Err(); err != nil {
		if errors.Is(err, bufio.ErrTooLong) {
			return nil, d.errAt(d.line+1, column{}, fmt.Errorf("line longer than %d bytes; expected a text load log", maxLine))
		}
		return nil, fmt.Errorf("loadlog: %s: %w", path, err)
	}
	return d.finish()
}

// decoder holds the state of reading one file.
type decoder struct {
	layout
	log  *Log
	line int // number of the line being read

	started    bool     // the header or first data row has been seen
	header     []string // nil without a header
	headerLine int

	timeCol, forceCol, strokeCol column
	hasStroke                    bool
	tu, fu, su                   unit

	prevCell string // time cell of the previous row, as written
	prevLine int
	repeats  int // rows whose time equals the previous row's
}

// readLine reads one line of the file.
func (d *decoder) readLine(text string) error {
	if d.line == 1 {
		text = strings.TrimPrefix(text, "\uFEFF")
	}
	if d.line <= d.skip {
		return nil
	}
	if t := strings.TrimSpace(text); t == "" || strings.HasPrefix(t, d.comment) {
		return nil
	}
	if d.delim == 0 {
		d.delim = detectDelimiter(text)
	}
	cells := splitCells(text, d.delim)
	if blank(cells) {
		return nil
	}
	if !d.started {
		d.started = true
		if isHeader(cells) {
			d.header, d.headerLine = cells, d.line
			return d.setup()
		}
		if err := d.setup(); err != nil {
			return err
		}
	}
	return d.row(cells)
}

// setup resolves the columns and units once the header (or the first data
// row of a file without one) is known.
func (d *decoder) setup() error {
	fail := func(err error) error { return d.errAt(d.line, column{}, err) }
	var err error
	if d.timeCol, _, err = resolveColumn(timeQuantity, "time_column", d.time, d.header, 1, true); err != nil {
		return fail(err)
	}
	if d.forceCol, _, err = resolveColumn(forceQuantity, "force_column", d.force, d.header, 2, true); err != nil {
		return fail(err)
	}
	if d.strokeCol, d.hasStroke, err = resolveColumn(strokeQuantity, "stroke_column", d.stroke, d.header, 0, d.stroke.text != ""); err != nil {
		return fail(err)
	}
	if d.timeCol.index == d.forceCol.index {
		return fail(fmt.Errorf("time and force are both column %d; set time_column and force_column", d.timeCol.index))
	}
	if d.hasStroke && (d.strokeCol.index == d.timeCol.index || d.strokeCol.index == d.forceCol.index) {
		return fail(fmt.Errorf("stroke is column %d, which is already the time or force column; set stroke_column", d.strokeCol.index))
	}
	d.tu = d.unitOf(timeQuantity, d.timeUnit, d.timeCol)
	d.fu = d.unitOf(forceQuantity, d.forceUnit, d.forceCol)
	if d.hasStroke {
		d.su = d.unitOf(strokeQuantity, d.strokeUnit, d.strokeCol)
	}
	return nil
}

// unitOf chooses the unit of a column: the Format's if given, else the one
// the header names, else the default; it notes a disagreement between the
// Format and the header, and a default assumed without either.
func (d *decoder) unitOf(q quantity, given *unit, c column) unit {
	var hu unit
	fromHeader := false
	if c.name != "" {
		hu, fromHeader = q.headerUnit(c.name)
	}
	switch {
	case given != nil:
		if fromHeader && hu.name != given.name {
			d.note("%s column %q names %s, but %s is %s: read as %s", q.name, c.name, hu.name, q.field, given.name, given.name)
		}
		return *given
	case fromHeader:
		return hu
	}
	def, _ := q.lookup(q.def)
	d.note("%s unit given neither by %s nor by the header: assumed %s", q.name, q.field, def.name)
	return def
}

// row reads one data row.
func (d *decoder) row(cells []string) error {
	t, err := d.value(cells, d.timeCol, d.tu)
	if err != nil {
		return err
	}
	cell := cells[d.timeCol.index-1]
	if n := len(d.log.Time); n > 0 {
		switch prev := d.log.Time[n-1]; {
		case t < prev:
			return d.errAt(d.line, d.timeCol, fmt.Errorf("time %s is before the previous row's %s (line %d); times must not decrease",
				d.timeText(cell, t), d.timeText(d.prevCell, prev), d.prevLine))
		case t == prev:
			d.repeats++
		}
	}
	force, err := d.value(cells, d.forceCol, d.fu)
	if err != nil {
		return err
	}
	if d.flip {
		force = -force
	}
	if d.hasStroke {
		stroke, err := d.value(cells, d.strokeCol, d.su)
		if err != nil {
			return err
		}
		d.log.Stroke = append(d.log.Stroke, stroke)
	}
	d.log.Time = append(d.log.Time, t)
	d.log.Force = append(d.log.Force, force)
	d.prevCell, d.prevLine = cell, d.line
	return nil
}

// value reads the cell of column c in unit u and converts it to the base
// unit.
func (d *decoder) value(cells []string, c column, u unit) (float64, error) {
	if c.index > len(cells) {
		return 0, d.errAt(d.line, c, fmt.Errorf("the row has only %d cells, expected a value in column %d", len(cells), c.index))
	}
	cell := cells[c.index-1]
	var (
		v  float64
		ok bool
	)
	if u.name == clockUnit {
		v, ok = parseClock(cell)
	} else if v, ok = parseNumber(cell); ok {
		v *= u.factor
	}
	if !ok {
		err := cellProblem(cell, u.name == clockUnit)
		if len(d.log.Time) == 0 && d.header != nil && !hasNumber(cells) {
			err = fmt.Errorf("%w; this line, after the header on line %d, has no numbers: comment it out with %q", err, d.headerLine, d.comment)
		}
		return 0, d.errAt(d.line, c, err)
	}
	if math.IsInf(v, 0) {
		return 0, d.errAt(d.line, c, fmt.Errorf("%q %s is out of range", cell, u.name))
	}
	return v, nil
}

// hasNumber reports whether any cell is a number or an h:mm:ss time.
func hasNumber(cells []string) bool {
	for _, c := range cells {
		if c == "" {
			continue
		}
		if _, ok := parseNumber(c); ok {
			return true
		}
		if _, ok := parseClock(c); ok {
			return true
		}
	}
	return false
}

// timeText writes a time cell for a message, as written and with its unit.
func (d *decoder) timeText(cell string, seconds float64) string {
	if d.tu.name == clockUnit {
		return fmt.Sprintf("%s (%s s)", cell, strconv.FormatFloat(seconds, 'g', -1, 64))
	}
	return cell + " " + d.tu.name
}

// finish checks the rows read and adds the notes that need all of them.
func (d *decoder) finish() (*Log, error) {
	l := d.log
	switch n := len(l.Time); {
	case d.line == 0:
		return nil, d.errAt(0, column{}, fmt.Errorf("%w: the file is empty", ErrNoData))
	case !d.started && d.skip > 0:
		return nil, d.errAt(0, column{}, fmt.Errorf("%w: after the %d skipped lines there are only comments and blank lines", ErrNoData, d.skip))
	case !d.started:
		return nil, d.errAt(0, column{}, fmt.Errorf("%w: the file has only comments and blank lines", ErrNoData))
	case n == 0:
		return nil, d.errAt(0, column{}, fmt.Errorf("%w after the header on line %d", ErrNoData, d.headerLine))
	case n == 1:
		return nil, d.errAt(d.prevLine, column{}, fmt.Errorf("only one data row; at least two are needed to interpolate"))
	}
	if d.repeats > 0 {
		d.note("%d rows repeat the previous row's time; at a repeated time the later row's values are used", d.repeats)
	}
	pos, neg := 0, 0
	for _, f := range l.Force {
		switch {
		case f > 0:
			pos++
		case f < 0:
			neg++
		}
	}
	if neg > pos {
		if d.flip {
			d.note("compression_negative is set, but %d of %d forces in the file are positive: most stresses come out negative", neg, len(l.Force))
		} else {
			d.note("%d of %d forces are negative; if the frame logs compression as negative, set compression_negative", neg, len(l.Force))
		}
	}
	return l, nil
}

// note adds a note to the Log.
func (d *decoder) note(format string, args ...any) {
	d.log.Notes = append(d.log.Notes, fmt.Sprintf(format, args...))
}

// errAt returns a ParseError at the given line (0: the whole file) and
// column (index 0: no column).
func (d *decoder) errAt(line int, c column, err error) error {
	return &ParseError{Path: d.log.Path, Line: line, Column: c.index, ColumnName: c.name, Err: err}
}
