package loadlog

import (
	"fmt"
	"io"
	"math"
	"os"

	"spallscope/dic/logtable"
)

// maxLine is the length in bytes of the longest line Read accepts.
const maxLine = logtable.MaxLine

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
	d := &decoder{
		layout: l,
		log:    &Log{Path: path},
		table: logtable.Reader{Prefix: "loadlog", Path: path, Kind: "load log",
			Delimiter: l.delim, SkipLines: l.skip, Comment: l.comment},
	}
	if err := d.table.Read(r, d.setup, d.row); err != nil {
		return nil, err
	}
	return d.finish()
}

// decoder holds the state of reading one file.
type decoder struct {
	layout
	log   *Log
	table logtable.Reader

	timeCol, forceCol, strokeCol logtable.Column
	hasStroke                    bool
	tu, fu, su                   logtable.Unit

	prevCell string // time cell of the previous row, as written
	prevLine int
	repeats  int // rows whose time equals the previous row's
}

// setup resolves the columns and units once the header (or the first data
// row of a file without one) is known.
func (d *decoder) setup() error {
	fail := func(err error) error { return d.table.ErrAt(d.table.Line, logtable.Column{}, err) }
	header := d.table.Header
	var err error
	if d.timeCol, err = resolveColumn(timeQuantity, d.time, header, 1, true); err != nil {
		return fail(err)
	}
	if d.forceCol, err = resolveColumn(forceQuantity, d.force, header, 2, true); err != nil {
		return fail(err)
	}
	if d.strokeCol, err = resolveColumn(strokeQuantity, d.stroke, header, 0, d.stroke.Text != ""); err != nil {
		return fail(err)
	}
	d.hasStroke = d.strokeCol.Index != 0
	if d.timeCol.Index == d.forceCol.Index {
		return fail(fmt.Errorf("time and force are both column %d; set time_column and force_column", d.timeCol.Index))
	}
	if d.hasStroke && (d.strokeCol.Index == d.timeCol.Index || d.strokeCol.Index == d.forceCol.Index) {
		return fail(fmt.Errorf("stroke is column %d, which is already the time or force column; set stroke_column", d.strokeCol.Index))
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
func (d *decoder) unitOf(q quantity, given *logtable.Unit, c logtable.Column) logtable.Unit {
	var hu logtable.Unit
	fromHeader := false
	if c.Name != "" {
		hu, fromHeader = q.headerUnit(c.Name)
	}
	switch {
	case given != nil:
		if fromHeader && hu.Name != given.Name {
			d.note("%s column %s names %s, but %s is %s: read as %s", q.name, logtable.Excerpt(c.Name), hu.Name, q.field, given.Name, given.Name)
		}
		return *given
	case fromHeader:
		return hu
	}
	def, _ := q.units.Lookup(q.def)
	d.note("%s unit given neither by %s nor by the header: assumed %s", q.name, q.field, def.Name)
	return def
}

// row reads one data row.
func (d *decoder) row(cells []string) error {
	t, err := d.value(cells, d.timeCol, d.tu)
	if err != nil {
		return err
	}
	cell := cells[d.timeCol.Index-1]
	if n := len(d.log.Time); n > 0 {
		switch prev := d.log.Time[n-1]; {
		case t < prev:
			return d.table.ErrAt(d.table.Line, d.timeCol, fmt.Errorf("time %s is before the previous row's %s (line %d); times must not decrease",
				d.tu.Describe(cell, t), d.tu.Describe(d.prevCell, prev), d.prevLine))
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
	d.prevCell, d.prevLine = cell, d.table.Line
	return nil
}

// value reads the cell of column c in unit u and converts it to the base
// unit.
func (d *decoder) value(cells []string, c logtable.Column, u logtable.Unit) (float64, error) {
	v, err := d.table.Number(cells, c, u.Name == logtable.ClockUnit)
	if err != nil {
		return 0, err
	}
	if v *= u.Factor; math.IsInf(v, 0) {
		return 0, d.table.ErrAt(d.table.Line, c, fmt.Errorf("%s %s is out of range", logtable.Excerpt(cells[c.Index-1]), u.Name))
	}
	return v, nil
}

// finish checks the rows read and adds the notes that need all of them.
func (d *decoder) finish() (*Log, error) {
	l := d.log
	switch len(l.Time) {
	case 0:
		return nil, d.table.NoData()
	case 1:
		return nil, d.table.ErrAt(d.prevLine, logtable.Column{}, fmt.Errorf("only one data row; at least two are needed to interpolate"))
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
