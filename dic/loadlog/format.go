package loadlog

import (
	"fmt"
	"strings"

	"spallscope/dic/logtable"
)

// Format describes how a load log file is laid out. The zero Format reads
// the usual layouts: a header naming time, force and (optionally) stroke
// columns, units taken from the header names or else s, kN and mm, the
// delimiter detected from the first line, and '#' comments.
//
// The tags let a Format sit in a JSON or YAML settings file.
type Format struct {
	// TimeColumn, ForceColumn and StrokeColumn choose the columns, each by
	// header name (case-insensitive, the whole cell: "time_s") or by 1-based
	// index ("1"). Empty means: with a header, the column whose name, less
	// any unit suffix, is "time" or "t"; "force", "load" or "f"; "stroke",
	// "displacement", "disp", "position" or "extension". Without a header,
	// time is column 1, force column 2, and there is no stroke column.
	// The stroke column is optional unless named.
	TimeColumn   string `json:"time_column,omitempty" yaml:"time_column,omitempty"`
	ForceColumn  string `json:"force_column,omitempty" yaml:"force_column,omitempty"`
	StrokeColumn string `json:"stroke_column,omitempty" yaml:"stroke_column,omitempty"`

	// TimeUnit is "s", "ms", "min", "h" or "hms" (cells written h:mm:ss[.fff]
	// or mm:ss). ForceUnit is "N", "kN", "lbf" or "kip" (1000 lbf).
	// StrokeUnit is "mm" or "in". Case is ignored. Empty means the unit the
	// column's header names after its base name ("force_N", "Time (ms)",
	// "stroke [in]"), or else s, kN and mm. A unit given here wins over the
	// header; when they disagree the Log gets a Note.
	TimeUnit   string `json:"time_unit,omitempty" yaml:"time_unit,omitempty"`
	ForceUnit  string `json:"force_unit,omitempty" yaml:"force_unit,omitempty"`
	StrokeUnit string `json:"stroke_unit,omitempty" yaml:"stroke_unit,omitempty"`

	// Delimiter separates cells: ',' ';' '\t', or ' ' for runs of blanks
	// and tabs. 0 detects it from the first line that is not a comment: tab
	// if it has one, else semicolon, else comma, else blanks.
	Delimiter Delimiter `json:"delimiter,omitempty" yaml:"delimiter,omitempty"`

	// SkipLines lines at the top of the file are skipped whatever they
	// hold (a preamble that is not commented out).
	SkipLines int `json:"skip_lines,omitempty" yaml:"skip_lines,omitempty"`

	// Comment starts a comment line (after leading blanks); "" means "#".
	Comment string `json:"comment,omitempty" yaml:"comment,omitempty"`

	// CompressionNegative says that the frame logs compressive force as
	// negative; Read then flips the sign so that the Log's forces are
	// compression positive. Read never flips on its own: when most forces
	// come out negative it leaves them and adds a Note.
	CompressionNegative bool `json:"compression_negative,omitempty" yaml:"compression_negative,omitempty"`
}

// Delimiter is the rune that separates cells; see Format.Delimiter. In JSON
// and YAML it is written as the character itself or as "tab", "whitespace"
// or "auto".
type Delimiter = logtable.Delimiter

// Whitespace is the Delimiter for cells separated by runs of blanks and
// tabs.
const Whitespace = logtable.Whitespace

// layout is a Format checked and with its defaults filled in, ready to read
// one file.
type layout struct {
	time, force, stroke logtable.ColumnSpec
	timeUnit, forceUnit *logtable.Unit // nil: not given, take from the header or the default
	strokeUnit          *logtable.Unit
	delim               Delimiter
	skip                int
	comment             string
	flip                bool
}

// Validate reports a format that cannot read a load log, before any file is
// opened: a negative skip_lines, a comment marker that would skip data,
// an unknown delimiter, column or unit. Errors name the Format field.
func (f Format) Validate() error {
	_, err := f.check()
	return err
}

// check validates f and returns its layout. Errors name the Format field.
func (f Format) check() (layout, error) {
	l := layout{delim: f.Delimiter, skip: f.SkipLines, comment: f.Comment, flip: f.CompressionNegative}
	if l.comment == "" {
		l.comment = "#"
	}
	if f.SkipLines < 0 {
		return l, fmt.Errorf("skip_lines %d: expected zero or a positive number of lines", f.SkipLines)
	}
	if err := logtable.ValidateComment(f.Comment); err != nil {
		return l, err
	}
	if err := l.delim.Validate(); err != nil {
		return l, err
	}
	var err error
	for _, c := range []struct {
		field, text string
		dst         *logtable.ColumnSpec
	}{
		{"time_column", f.TimeColumn, &l.time},
		{"force_column", f.ForceColumn, &l.force},
		{"stroke_column", f.StrokeColumn, &l.stroke},
	} {
		if *c.dst, err = logtable.ParseColumnSpec(c.field, c.text); err != nil {
			return l, err
		}
	}
	for _, u := range []struct {
		q    quantity
		text string
		dst  **logtable.Unit
	}{
		{timeQuantity, f.TimeUnit, &l.timeUnit},
		{forceQuantity, f.ForceUnit, &l.forceUnit},
		{strokeQuantity, f.StrokeUnit, &l.strokeUnit},
	} {
		if strings.TrimSpace(u.text) == "" {
			continue
		}
		v, err := u.q.parse(u.text)
		if err != nil {
			return l, err
		}
		*u.dst = &v
	}
	return l, nil
}
