package aelog

import "spallscope/dic/logtable"

// ErrNoData is wrapped by the error Read returns for a file without data
// rows. It is the sentinel loadlog uses too, so one errors.Is test covers
// both kinds of log.
var ErrNoData = logtable.ErrNoData

// ParseError reports a problem at one place in an AE hit list: the file,
// the line, the column and what was expected. Read's ParseErrors have
// Prefix "aelog", so that their messages, "aelog: path: line 57, column 1
// "time_s": message", send the user to the hit list and not the load log.
type ParseError = logtable.ParseError
