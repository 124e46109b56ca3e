package aelog

import (
	"fmt"
	"strings"

	"spallscope/dic/loadlog"
	"spallscope/dic/logtable"
)

// Format describes how an AE hit list is laid out. The zero Format reads
// the usual layout: a header naming a time column and at least one of
// amplitude, energy and counts (a channel column optional), the time unit
// taken from the header or else s, the delimiter detected from the first
// line, and '#' comments.
//
// The tags let a Format sit in a JSON or YAML settings file.
type Format struct {
	// TimeColumn, AmplitudeColumn, EnergyColumn, CountsColumn and
	// ChannelColumn choose the columns, each by header name
	// (case-insensitive, the whole cell: "amp_peak") or by 1-based index
	// ("3"). Empty means, with a header, the column named (case ignored,
	// with or without a unit suffix for time, amplitude and energy):
	//
	//	time:      time, t
	//	amplitude: amplitude, amp, peak_amplitude
	//	energy:    energy, abs_energy, absolute_energy
	//	counts:    counts, count
	//	channel:   channel, chan, ch, sensor
	//
	// Without a header the time is column 1 and the others must be given
	// by index. A named column must be there; a column left to its default
	// may be missing, but one of amplitude, energy and counts must be found.
	TimeColumn      string `json:"time_column,omitempty" yaml:"time_column,omitempty"`
	AmplitudeColumn string `json:"amplitude_column,omitempty" yaml:"amplitude_column,omitempty"`
	EnergyColumn    string `json:"energy_column,omitempty" yaml:"energy_column,omitempty"`
	CountsColumn    string `json:"counts_column,omitempty" yaml:"counts_column,omitempty"`
	ChannelColumn   string `json:"channel_column,omitempty" yaml:"channel_column,omitempty"`

	// TimeUnit is "s", "ms", "us" (also "µs"), "min", "h" or "hms" (cells
	// written h:mm:ss[.fff] or mm:ss); case is ignored. Empty means the unit
	// the time column's header names ("time_ms", "Time (s)"), or else s. A
	// unit given here wins over the header; when they disagree the Log gets
	// a Note.
	TimeUnit string `json:"time_unit,omitempty" yaml:"time_unit,omitempty"`

	// EnergyUnit names the unit of the energy column ("aJ", "arb"). Energies
	// are kept as written, never converted: AE energy scales differ between
	// systems, and the package only sums them. Empty means the unit the
	// header names ("energy_aJ"), else none.
	EnergyUnit string `json:"energy_unit,omitempty" yaml:"energy_unit,omitempty"`

	// Delimiter separates cells: ',' ';' '\t', or loadlog.Whitespace for
	// runs of blanks and tabs. 0 detects it from the first line that is not
	// a comment: tab if it has one, else semicolon, else comma, else blanks.
	// It is loadlog's type, so settings files write it the same way.
	Delimiter loadlog.Delimiter `json:"delimiter,omitempty" yaml:"delimiter,omitempty"`

	// SkipLines lines at the top of the file are skipped whatever they
	// hold (a preamble that is not commented out).
	SkipLines int `json:"skip_lines,omitempty" yaml:"skip_lines,omitempty"`

	// Comment starts a comment line (after leading blanks); "" means "#".
	Comment string `json:"comment,omitempty" yaml:"comment,omitempty"`
}

// layout is a Format checked and with its defaults filled in, ready to read
// one file.
type layout struct {
	specs      [numQuantities]logtable.ColumnSpec // indexed by quantity
	timeUnit   *logtable.Unit                     // nil: from the header or the default
	energyUnit string
	delim      loadlog.Delimiter
	skip       int
	comment    string
}

// Validate reports a format that cannot read a hit list, before any file is
// opened: a negative skip_lines, a comment marker that would skip data,
// an unknown delimiter, column or unit. Errors name the Format field.
func (f Format) Validate() error {
	_, err := f.check()
	return err
}

// check validates f and returns its layout. Errors name the Format field.
func (f Format) check() (layout, error) {
	l := layout{delim: f.Delimiter, skip: f.SkipLines, comment: f.Comment, energyUnit: strings.TrimSpace(f.EnergyUnit)}
	if l.comment == "" {
		l.comment = "#"
	}
	if f.SkipLines < 0 {
		return l, fmt.Errorf("skip_lines %d: expected zero or a positive number of lines", f.SkipLines)
	}
	if err := logtable.ValidateComment(f.Comment); err != nil {
		return l, err
	}
	if err := f.Delimiter.Validate(); err != nil {
		return l, err
	}
	texts := [numQuantities]string{f.TimeColumn, f.AmplitudeColumn, f.EnergyColumn, f.CountsColumn, f.ChannelColumn}
	for q, text := range texts {
		spec, err := logtable.ParseColumnSpec(quantities[q].field, text)
		if err != nil {
			return l, err
		}
		l.specs[q] = spec
	}
	if strings.TrimSpace(f.TimeUnit) != "" {
		u, err := timeUnits.Parse("time_unit", f.TimeUnit)
		if err != nil {
			return l, err
		}
		l.timeUnit = &u
	}
	return l, nil
}
