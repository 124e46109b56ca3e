// Package aelog reads an acoustic-emission (AE) hit list recorded beside a
// compression test and derives, on the camera clock, what a lab sets beside
// the DIC onsets: the hit rate, cumulative hits and energy, gaps in the
// record, and the onset of AE activity.
//
// # Layout
//
// A hit list is a text table with one row per hit (or per event: each row
// counts once), under a header or, without one, with its columns chosen by
// index in the Format. Read accepts
//
//   - a time column and at least one of peak amplitude (dB), energy (in any
//     unit, kept as written: "aJ", or arbitrary) and counts (threshold
//     crossings, whole numbers); a channel column (whole numbers) is
//     optional. Columns are found by their header names, with or without a
//     unit suffix for time, amplitude and energy ("time_s", "Amplitude
//     (dB)", "energy [aJ]"), or chosen by Format by name or 1-based index;
//     other columns are ignored;
//   - cells separated by commas, semicolons, tabs or runs of blanks,
//     detected from the first line unless Format.Delimiter says; a name
//     holding the delimiter is quoted ("E, abs", chosen by
//     Format.EnergyColumn);
//   - comment lines starting with '#' (Format.Comment), blank lines, and
//     Format.SkipLines lines of preamble;
//   - numbers with '.' as the decimal point; a decimal comma is reported,
//     never guessed at. Times are in s, ms, us, min or h, or written
//     h:mm:ss[.fff] (time unit "hms"), as Format.TimeUnit or the header
//     says, else s.
//
// Times must not decrease down the file; equal times are accepted (one
// event reaching several sensors within the clock's resolution). A time
// before the previous row's, a cell that is not a number, a missing column
// and an unknown unit are errors (*ParseError) naming the file, the line
// and the column, and what was expected; no row is skipped.
//
// The layout and the reading rules are spallscope/dic/logtable's, which
// spallscope/dic/loadlog reads by too; this package uses loadlog's Clock
// and Delimiter types.
//
// # Example
//
// The file testdata/example.csv (invented numbers):
//
//	# specimen G-07, 54 mm core: AE hits beside load log B-12 (invented numbers)
//	# the AE clock runs 2.0 s ahead of the camera
//	time_s,channel,amplitude_dB,energy_aJ,counts
//	2.25,1,41.5,120,3
//	2.75,2,43.0,210,5
//	3.50,1,40.5,95,2
//	4.00,3,44.5,330,7
//	4.25,2,46.0,480,11
//	4.50,4,42.0,150,4
//	4.75,1,47.5,610,13
//	5.00,3,49.0,905,18
//
// read and put on the camera clock,
//
//	log, err := aelog.Read("testdata/example.csv", aelog.Format{})
//	s, err := log.Series(loadlog.Clock{Offset: 2}, aelog.GapRule{})
//	times, rates := s.HitRate(1)
//
// has its hits at camera times 0.25 ... 3.0 s, hit rates 2, 2 and 4 hits/s
// in the 1 s windows from 0.25, 1.25 and 2.25 s, 2900 aJ in all, and no
// gap (the threshold is 10 × the median interval 0.25 s = 2.5 s).
//
// # Derived series
//
// Series.HitRate counts hits in consecutive windows; Series.Cumulative sums
// hits and energy; Series.Gaps lists silences longer than a threshold
// (GapRule), which HitRate marks NaN; Series.Onset finds the first
// sustained rise of the hit rate above k times its early background
// (OnsetRule states the rule).
package aelog
