package aelog

import (
	"strings"
	"testing"

	"spallscope/dic/logtable/logtabletest"
)

// Careless and hostile cells, as for the load log: non-finite numbers in
// every measure, overflow, clock times with hundreds of digits, and cells
// or header names of hundreds of kilobytes. Each is an error at its line
// and column that shows an excerpt of a huge cell, never all of it.
func TestReadHostileCells(t *testing.T) {
	big := strings.Repeat("x", 200_000)
	longNum := "-1." + strings.Repeat("0", 100_000) + "1"
	for _, c := range []struct {
		name, content string
		f             Format
		line, col     int
		parts         []string
	}{
		{"inf-amplitude", "time_s,amplitude_dB\n0,40\n1,+Inf\n", Format{}, 3, 2, []string{`"+Inf" is not a finite number`}},
		{"nan-time", "time_s,counts\nNaN,1\n", Format{}, 2, 1, []string{`"NaN" is not a finite number`}},
		{"inf-counts", "time_s,counts\n0,inf\n", Format{}, 2, 2, []string{`"inf" is not a finite number`}},
		{"nan-channel", "time_s,counts,channel\n0,1,nan\n", Format{}, 2, 3, []string{"not a finite number"}},
		{"overflow-energy", "time_s,energy\n0,1e400\n", Format{}, 2, 2, []string{`"1e400" is out of range`}},
		{"huge-hours", "time,counts\n" + strings.Repeat("9", 400) + ":00,1\n", Format{TimeUnit: "hms"}, 2, 1, []string{"is not a time", "(403 bytes)"}},
		{"huge-cell", "time_s,amplitude_dB\n0," + big + "\n", Format{}, 2, 2, []string{`"` + strings.Repeat("x", 60) + `"… (200000 bytes) is not a number`}},
		{"huge-negative-energy", "time_s,energy\n0," + longNum + "\n", Format{}, 2, 2, []string{`energy "-1.` + strings.Repeat("0", 57) + `"… (100004 bytes) is negative`}},
		{"huge-fraction-counts", "time_s,counts\n0,0." + strings.Repeat("5", 100_000) + "\n", Format{}, 2, 2, []string{`counts "0.` + strings.Repeat("5", 58) + `"… (100002 bytes) is not whole`}},
		{"huge-header", "time_s," + big + "\n0,1\n", Format{}, 1, 0, []string{"no amplitude, energy or counts column found", `2 "` + strings.Repeat("x", 60) + `"… (200000 bytes)`}},
		{"huge-time-unit", "time_" + big + ",counts\n0,1\n", Format{}, 1, 1, []string{"names unit", "(200000 bytes)"}},
	} {
		_, err := Read(writeList(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, c.line, c.col, c.parts...)
		logtabletest.WantBrief(t, c.name, err, 500)
	}
}

// A comment prefix that would swallow data rows is refused, naming the
// option.
func TestReadCommentOption(t *testing.T) {
	path := writeList(t, "c.csv", "time_s,counts\n0,1\n")
	for comment, want := range map[string]string{
		"0":  `comment "0": a comment prefix that starts like a number would skip data rows`,
		"\t": `comment "\t": a comment prefix cannot start with a blank`,
	} {
		if _, err := Read(path, Format{Comment: comment}); err == nil || !strings.Contains(err.Error(), want) || !strings.Contains(err.Error(), path) {
			t.Errorf("comment %q: error %v, want %q and the file", comment, err, want)
		}
	}
}
