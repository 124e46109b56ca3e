// Package loadlog reads a test frame's load log and turns it into the
// nominal stress of the specimen at any camera time.
//
// A load log is a text table with one row per sample: a time, a force and,
// optionally, the actuator stroke. Read accepts
//
//   - cells separated by commas, semicolons, tabs or runs of blanks,
//     detected from the first line unless Format.Delimiter says (with
//     blank-separated cells, header names cannot contain blanks; quote
//     names in comma, semicolon or tab files: "Force, kN");
//   - comment lines starting with '#' (Format.Comment), blank lines, and
//     Format.SkipLines lines of preamble at the top;
//   - an optional header: the first line after the preamble and comments
//     is the header if its cells are not all numbers. Columns are then
//     chosen by header name or 1-based index; without a header, by index
//     only (time 1, force 2 by default);
//   - numbers with '.' as the decimal point ("12.5", "1.2e3"); a decimal
//     comma is reported as an error, never guessed at. Times may instead be
//     written h:mm:ss[.fff] or mm:ss (time unit "hms");
//   - units s, ms, min, h or hms for time, N, kN, lbf or kip for force, mm
//     or in for stroke, given by the Format or by the header ("force_kN",
//     "Time (ms)"), else s, kN and mm.
//
// Times must not decrease down the file; equal consecutive times are
// accepted (a frame whose clock ticks more coarsely than it samples) and
// noted. Forces are compression positive; a frame that logs compression as
// negative needs Format.CompressionNegative, and Read notes a log whose
// forces are mostly negative instead of flipping it on its own.
//
// For example (invented numbers), the default Format reads
//
//	# specimen B-12, 54 mm core; loaded area 2290 mm2
//	time_s,force_kN,stroke_mm
//	0.0,0.00,0.000
//	0.5,12.40,0.021
//	1.0,25.10,0.043
//
// as times 0, 0.5, 1 s, forces 0, 12400, 25100 N and strokes in mm, and
//
//	stress, err := loadlog.NewStress(log, 2290, loadlog.Clock{Offset: 3.5})
//	mpa, inSpan := stress.At(-2.75) // log time 0.75 s: 18750 N / 2290 mm² ≈ 8.19 MPa
//
// gives the nominal stress σ = F/A at a camera time, the log clock running
// 3.5 s ahead of the camera's. Clock also takes a sync pair instead of an
// offset: one moment read on both clocks.
//
// Outside the log's span At gives the stress of the nearest end with
// inSpan=false. Stress.Cover checks a run's frame times against the span:
// it is an error (ErrNoOverlap) when no frame falls within the log, and
// otherwise its Coverage.Note says how many frames, which and at what
// times the log does not cover, for the caller to show.
package loadlog
