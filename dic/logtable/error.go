package logtable

import (
	"errors"
	"fmt"
	"strings"
)

// ErrNoData is wrapped by the error a reader returns for a file without
// data rows, whatever kind of log it reads, so that one errors.Is test
// covers them all.
var ErrNoData = errors.New("no data rows")

// ParseError reports a problem at one place in a log file, in the way
// encoding/csv's ParseError does: the file, the line, the column and what
// was expected.
type ParseError struct {
	// Prefix begins the message: the name of the package that read the
	// file ("loadlog"), so that the user knows which log is meant.
	Prefix string

	Path       string
	Line       int    // 1-based line number in the file; 0 if not one line
	Column     int    // 1-based column index; 0 if not one cell
	ColumnName string // the column's header cell, "" without a header
	Err        error
}

// Error returns "prefix: path: line 57, column 1 "time_s": message".
func (e *ParseError) Error() string {
	var b strings.Builder
	if e.Prefix != "" {
		b.WriteString(e.Prefix + ": ")
	}
	fmt.Fprintf(&b, "%s: ", e.Path)
	if e.Line > 0 {
		fmt.Fprintf(&b, "line %d", e.Line)
		if e.Column > 0 {
			fmt.Fprintf(&b, ", column %d", e.Column)
			if e.ColumnName != "" {
				fmt.Fprintf(&b, " %s", Excerpt(e.ColumnName))
			}
		}
		b.WriteString(": ")
	}
	b.WriteString(e.Err.Error())
	return b.String()
}

// Unwrap returns the underlying error.
func (e *ParseError) Unwrap() error { return e.Err }
