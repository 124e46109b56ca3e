// Package logtable reads the delimited text tables that laboratory
// instruments write: a test frame's load log, an acoustic-emission hit
// list. It holds what such readers share, so that every log is read by one
// set of rules and reports problems in one way:
//
//   - cells separated by commas, semicolons, tabs or runs of blanks, the
//     delimiter detected from the first line that is not a comment, and
//     quoted cells ("Force, kN") in delimited files;
//   - comment lines, blank lines and a number of preamble lines skipped;
//   - an optional header: the first line read is the header if some cell
//     is neither a number nor an h:mm:ss time;
//   - numbers with '.' as the only decimal point (a decimal comma is
//     reported, never guessed at) and times written h:mm:ss[.fff] or
//     mm:ss;
//   - units written after a header name ("force_kN", "Time (ms)");
//   - columns chosen by header name or 1-based index, with errors that
//     list the header's columns;
//   - a ParseError naming the file, the line and the column, its message
//     begun by the reading package's name.
//
// The packages that read one kind of log decide which columns and units
// they need and what the rows mean.
package logtable
