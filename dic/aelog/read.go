package aelog

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"

	"spallscope/dic/logtable"
)

// maxLine is the length in bytes of the longest line Read accepts.
const maxLine = logtable.MaxLine

// Read reads the AE hit list at path, laid out as f describes (see the
// package documentation for the accepted layout), and returns its hits with
// times in seconds on the AE clock.
//
// Errors say what was expected and where: a *ParseError names the file,
// the line and, for a cell, the column. Read rejects a time before the
// previous row's, a cell that is not a number (or, for counts and channel,
// not a whole number; for energy and counts, a negative one), a named
// column that is not in the header, a header without an amplitude, energy
// or counts column, an unknown unit and a file without data rows. Every
// data row becomes a Hit: none is dropped.
func Read(path string, f Format) (*Log, error) {
	file, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("aelog: %w", err)
	}
	defer file.Close()
	return decode(file, path, f)
}

// decode reads a hit list from r; path names it in errors and in the Log.
func decode(r io.Reader, path string, f Format) (*Log, error) {
	l, err := f.check()
	if err != nil {
		return nil, fmt.Errorf("aelog: %s: format: %w", path, err)
	}
	d := &decoder{
		layout: l,
		log:    &Log{Path: path},
		table: logtable.Reader{Prefix: "aelog", Path: path, Kind: "hit list",
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

	cols [numQuantities]logtable.Column // Index 0: the file has no such column
	tu   logtable.Unit

	prevCell string // time cell of the previous row, as written
	prevLine int
}

// setup resolves the columns and units once the header (or the first data
// row of a file without one) is known.
func (d *decoder) setup() error {
	fail := func(c logtable.Column, err error) error { return d.errAt(c, err) }
	for q := range numQuantities {
		fallback := 0
		if q == timeQ {
			fallback = 1
		}
		c, err := quantities[q].resolve(d.specs[q], d.table.Header, fallback)
		if err != nil {
			return fail(logtable.Column{}, err)
		}
		d.cols[q] = c
	}
	if d.cols[timeQ].Index == 0 {
		return fail(logtable.Column{}, fmt.Errorf("no time column found (named %s, with or without a unit suffix); set time_column to one of the header's columns: %s",
			quantities[timeQ].defaultNames(), logtable.ListColumns(d.table.Header)))
	}
	if d.cols[amplitudeQ].Index == 0 && d.cols[energyQ].Index == 0 && d.cols[countsQ].Index == 0 {
		if d.table.Header == nil {
			return fail(logtable.Column{}, errors.New("the file has no header line; set amplitude_column, energy_column or counts_column to a 1-based index"))
		}
		return fail(logtable.Column{}, fmt.Errorf("no amplitude, energy or counts column found (amplitude: %s; energy: %s; counts: %s); "+
			"set amplitude_column, energy_column or counts_column to one of the header's columns: %s",
			quantities[amplitudeQ].defaultNames(), quantities[energyQ].defaultNames(), quantities[countsQ].defaultNames(), logtable.ListColumns(d.table.Header)))
	}
	for q := range numQuantities {
		for p := range q {
			if d.cols[q].Index != 0 && d.cols[q].Index == d.cols[p].Index {
				return fail(logtable.Column{}, fmt.Errorf("%s and %s are both column %d; set %s and %s",
					quantities[p].name, quantities[q].name, d.cols[q].Index, quantities[p].field, quantities[q].field))
			}
		}
	}
	d.log.Has = Columns{
		Amplitude: d.cols[amplitudeQ].Index != 0,
		Energy:    d.cols[energyQ].Index != 0,
		Counts:    d.cols[countsQ].Index != 0,
		Channel:   d.cols[channelQ].Index != 0,
	}
	var err error
	if d.tu, err = d.timeUnitOf(d.cols[timeQ]); err != nil {
		return fail(d.cols[timeQ], err)
	}
	if c := d.cols[amplitudeQ]; c.Index != 0 {
		if u := quantities[amplitudeQ].headerUnit(c.Name); u != "" && !isDecibel(u) {
			return fail(c, fmt.Errorf("amplitude column %s is in %s; expected peak amplitudes in dB", logtable.Excerpt(c.Name), logtable.Shown(u)))
		}
	}
	if c := d.cols[energyQ]; c.Index != 0 {
		d.energyUnitOf(c)
	}
	return nil
}

// timeUnitOf chooses the time unit: the Format's if given (with a note
// when the header names another), else the one the header names (an error
// if it names one that is not accepted), else s with a note.
func (d *decoder) timeUnitOf(c logtable.Column) (logtable.Unit, error) {
	hname := quantities[timeQ].headerUnit(c.Name)
	hu, known := timeUnits.Lookup(hname)
	switch {
	case d.timeUnit != nil:
		if hname != "" && (!known || hu.Name != d.timeUnit.Name) {
			d.note("time column %s names %s, but time_unit is %s: read as %s", logtable.Excerpt(c.Name), logtable.Shown(hname), d.timeUnit.Name, d.timeUnit.Name)
		}
		return *d.timeUnit, nil
	case known:
		return hu, nil
	case hname != "":
		return logtable.Unit{}, fmt.Errorf("time column %s names unit %s, which is not accepted; use one of %s, or set time_unit", logtable.Excerpt(c.Name), logtable.Excerpt(hname), timeUnits)
	}
	d.note("time unit given neither by time_unit nor by the header: assumed s")
	u, _ := timeUnits.Lookup("s")
	return u, nil
}

// energyUnitOf sets the Log's energy unit: the Format's, else the header's,
// else none, noting a disagreement or a missing unit.
func (d *decoder) energyUnitOf(c logtable.Column) {
	hname := quantities[energyQ].headerUnit(c.Name)
	switch {
	case d.energyUnit != "":
		if hname != "" && hname != d.energyUnit {
			d.note("energy column %s names %s, but energy_unit is %s: labelled %s (values are not converted)", logtable.Excerpt(c.Name), logtable.Shown(hname), d.energyUnit, d.energyUnit)
		}
		d.log.EnergyUnit = d.energyUnit
	case hname != "":
		d.log.EnergyUnit = hname
	default:
		d.note("energy unit given neither by energy_unit nor by the header: energies are in the file's own unit")
	}
}

// row reads one data row.
func (d *decoder) row(cells []string) error {
	var h Hit
	c := d.cols[timeQ]
	t, err := d.number(cells, c, d.tu.Name == logtable.ClockUnit)
	if err != nil {
		return err
	}
	t *= d.tu.Factor
	if math.IsInf(t, 0) {
		return d.errAt(c, fmt.Errorf("%s %s is out of range", logtable.Excerpt(cells[c.Index-1]), d.tu.Name))
	}
	cell := cells[c.Index-1]
	if n := len(d.log.Hits); n > 0 {
		if prev := d.log.Hits[n-1].Time; t < prev {
			return d.errAt(c, fmt.Errorf("time %s is before the previous row's %s (line %d); times must not decrease",
				d.tu.Describe(cell, t), d.tu.Describe(d.prevCell, prev), d.prevLine))
		}
	}
	h.Time = t
	if c := d.cols[amplitudeQ]; c.Index != 0 {
		if h.Amplitude, err = d.number(cells, c, false); err != nil {
			return err
		}
	}
	if c := d.cols[energyQ]; c.Index != 0 {
		if h.Energy, err = d.number(cells, c, false); err != nil {
			return err
		}
		if h.Energy < 0 {
			return d.errAt(c, fmt.Errorf("energy %s is negative, expected zero or more", logtable.Shown(cells[c.Index-1])))
		}
	}
	if c := d.cols[countsQ]; c.Index != 0 {
		if h.Counts, err = d.whole(cells, c, "counts", "a whole number of threshold crossings"); err != nil {
			return err
		}
		if h.Counts < 0 {
			return d.errAt(c, fmt.Errorf("counts %s is negative, expected zero or more", logtable.Shown(cells[c.Index-1])))
		}
	}
	if c := d.cols[channelQ]; c.Index != 0 {
		ch, err := d.whole(cells, c, "channel", "a whole channel number")
		if err != nil {
			return err
		}
		if math.Abs(ch) > math.MaxInt32 {
			return d.errAt(c, fmt.Errorf("channel %s is out of range", logtable.Shown(cells[c.Index-1])))
		}
		h.Channel = int(ch)
	}
	d.log.Hits = append(d.log.Hits, h)
	d.prevCell, d.prevLine = cell, d.table.Line
	return nil
}

// number reads the cell of column c as a finite number, or with clock as
// an h:mm:ss time in seconds.
func (d *decoder) number(cells []string, c logtable.Column, clock bool) (float64, error) {
	return d.table.Number(cells, c, clock)
}

// whole reads the cell of column c as a whole number ("12" or "12.0");
// what names the value and expected says what it should be.
func (d *decoder) whole(cells []string, c logtable.Column, what, expected string) (float64, error) {
	v, err := d.number(cells, c, false)
	if err != nil {
		return 0, err
	}
	if v != math.Trunc(v) {
		return 0, d.errAt(c, fmt.Errorf("%s %s is not whole, expected %s", what, logtable.Shown(cells[c.Index-1]), expected))
	}
	return v, nil
}

// finish checks that the file had hits.
func (d *decoder) finish() (*Log, error) {
	if len(d.log.Hits) == 0 {
		return nil, d.table.NoData()
	}
	return d.log, nil
}

// note adds a note to the Log.
func (d *decoder) note(format string, args ...any) {
	d.log.Notes = append(d.log.Notes, fmt.Sprintf(format, args...))
}

// errAt returns a ParseError at the current line and column c (Index 0:
// no column).
func (d *decoder) errAt(c logtable.Column, err error) error {
	return d.table.ErrAt(d.table.Line, c, err)
}
