package loadlog

import "spallscope/dic/logtable"

// ErrNoData is wrapped by the error Read returns for a file without data
// rows.
var ErrNoData = logtable.ErrNoData

// ParseError reports a problem at one place in a load log file: the file,
// the line, the column and what was expected. Read's ParseErrors have
// Prefix "loadlog", so their messages read
// "loadlog: path: line 57, column 1 "time_s": message".
type ParseError = logtable.ParseError
