package aelog

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"
)

func TestReadUnsortedTimes(t *testing.T) {
	content := "# invented\ntime_s,amplitude_dB\n0.5,40\n1.0,41\n1.0,43\n0.8,42\n"
	path := writeList(t, "unsorted.csv", content)
	_, err := Read(path, Format{})
	wantParseError(t, "unsorted", err, 6, 1, path, "line 6", `column 1 "time_s"`,
		"time 0.8 s is before the previous row's 1.0 s (line 5)", "must not decrease")
	_, err = Read(writeList(t, "hms.csv", "time,counts\n0:01:00,1\n0:00:59.5,2\n"), Format{TimeUnit: "hms"})
	wantParseError(t, "unsorted hms", err, 3, 1, "0:00:59.5 (59.5 s)", "0:01:00 (60 s)")
}

func TestReadBadCells(t *testing.T) {
	for _, c := range []struct {
		name, content string
		f             Format
		line, col     int
		parts         []string
	}{
		{"text", "time_s,amplitude_dB,energy_aJ\n0,40,1\n1,4x,2\n", Format{}, 3, 2, []string{`line 3, column 2 "amplitude_dB"`, `"4x" is not a number`}},
		{"time-text", "time_s,counts\n0,1\nlater,2\n", Format{}, 3, 1, []string{`column 1 "time_s"`, `"later" is not a number`}},
		{"empty", "time_s,energy\n0,1\n1,\n", Format{}, 3, 2, []string{"empty cell"}},
		{"decimal-comma", "time_s;amplitude_dB\n0;41,5\n", Format{}, 2, 2, []string{`"41,5"`, "decimal separator must be '.'"}},
		{"nan", "time_s,energy\n0,NaN\n", Format{}, 2, 2, []string{"not a finite number"}},
		{"negative-energy", "time_s,energy\n0,1\n1,-2\n", Format{}, 3, 2, []string{"energy -2 is negative"}},
		{"fraction-counts", "time_s,counts\n0,1\n1,2.5\n", Format{}, 3, 2, []string{"counts 2.5 is not whole"}},
		{"negative-counts", "time_s,counts\n0,-1\n", Format{}, 2, 2, []string{"counts -1 is negative"}},
		{"fraction-channel", "time_s,counts,channel\n0,1,1.5\n", Format{}, 2, 3, []string{"channel 1.5 is not whole"}},
		{"huge-channel", "time_s,counts,channel\n0,1,1e12\n", Format{}, 2, 3, []string{"out of range"}},
		{"short-row", "time_s,amplitude_dB,counts\n0,40,1\n1,41\n", Format{}, 3, 3, []string{"only 2 cells", "column 3"}},
		{"clock-without-hms", "time_s,counts\n0:00:01,1\n", Format{}, 2, 1, []string{`set time_unit "hms"`}},
		{"bad-clock", "t,counts\n0:00:01,1\n0:00:xx,2\n", Format{TimeUnit: "hms"}, 3, 1, []string{"h:mm:ss[.fff] or mm:ss"}},
		{"overflow", "time_h,counts\n1e307,1\n", Format{}, 2, 1, []string{"out of range"}},
		{"units-row", "time,energy\ns,aJ\n0,1\n", Format{}, 2, 1, []string{`"s" is not a number`, "after the header on line 1", "comment it out"}},
	} {
		_, err := Read(writeList(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, c.line, c.col, c.parts...)
	}
}

func TestReadMissingColumns(t *testing.T) {
	for _, c := range []struct {
		name, content string
		f             Format
		line, col     int
		parts         []string
	}{
		{"no-measure", "# invented\ntime_s,x_mm,y_mm\n0,1,2\n", Format{}, 2, 0,
			[]string{"no amplitude, energy or counts column found", "set amplitude_column, energy_column or counts_column", `1 "time_s", 2 "x_mm", 3 "y_mm"`}},
		{"no-time", "stamp,amp_dB\n0,40\n", Format{}, 1, 0, []string{"no time column found", "set time_column", `1 "stamp", 2 "amp_dB"`}},
		{"named", "time_s,counts\n0,1\n", Format{EnergyColumn: "E"}, 1, 0, []string{`energy_column "E" is not in the header`, `1 "time_s", 2 "counts"`}},
		{"index", "time_s,counts\n0,1\n", Format{AmplitudeColumn: "5"}, 1, 0, []string{"amplitude_column 5", "only 2 columns"}},
		{"same", "time_s,counts\n0,1\n", Format{CountsColumn: "1"}, 1, 0, []string{"time and counts are both column 1"}},
		{"ambiguous", "time_s,amp_dB,amplitude_dB\n0,40,41\n", Format{}, 1, 0, []string{"several columns could be the amplitude column", `2 "amp_dB", 3 "amplitude_dB"`}},
		{"no-header", "0,40\n1,41\n", Format{}, 1, 0, []string{"no header line", "1-based index"}},
		{"no-header-named", "0,40\n1,41\n", Format{AmplitudeColumn: "amp"}, 1, 0, []string{"no header line", "1-based index"}},
	} {
		_, err := Read(writeList(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, c.line, c.col, c.parts...)
	}
}

func TestReadUnknownUnit(t *testing.T) {
	path := writeList(t, "u.csv", "time_s,counts\n0,1\n")
	_, err := Read(path, Format{TimeUnit: "sec"})
	for _, p := range []string{path, `time_unit "sec" is not accepted`, "s, ms, us, µs, μs, min, h, hms"} {
		if err == nil || !strings.Contains(err.Error(), p) {
			t.Errorf("time_unit sec: error %v, want one containing %q", err, p)
		}
	}
	_, err = Read(writeList(t, "ns.csv", "time_ns,counts\n0,1\n"), Format{})
	wantParseError(t, "header unit", err, 1, 1, `time column "time_ns" names unit "ns", which is not accepted`, "or set time_unit")
	_, err = Read(writeList(t, "mv.csv", "time_s,amplitude_mV\n0,1\n"), Format{})
	wantParseError(t, "amplitude unit", err, 1, 2, `amplitude column "amplitude_mV" is in mV; expected peak amplitudes in dB`)
}

func TestReadBadFormat(t *testing.T) {
	path := writeList(t, "f.csv", "time_s,counts\n0,1\n")
	for _, c := range []struct {
		f    Format
		want string
	}{
		{Format{TimeColumn: "0"}, "1-based"},
		{Format{SkipLines: -1}, "skip_lines -1"},
		{Format{Delimiter: '.'}, "cannot separate cells"},
		{Format{Delimiter: '5'}, "cannot separate cells"},
		{Format{Delimiter: '"'}, "cannot separate cells"},
	} {
		if _, err := Read(path, c.f); err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), path) {
			t.Errorf("%+v: error %v, want one naming the file and containing %q", c.f, err, c.want)
		}
	}
}

func TestReadEmpty(t *testing.T) {
	for _, c := range []struct {
		name, content string
		f             Format
		want          string
	}{
		{"empty", "", Format{}, "the file is empty"},
		{"comments", "# nothing\n\n   \n# here\n", Format{}, "only comments and blank lines"},
		{"skipped", "a\nb\n", Format{SkipLines: 2}, "after the 2 skipped lines"},
		{"header-only", "# c\ntime_s,energy_aJ\n", Format{}, "after the header on line 2"},
	} {
		_, err := Read(writeList(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, 0, 0, c.want)
		if !errors.Is(err, ErrNoData) {
			t.Errorf("%s: %v does not wrap ErrNoData", c.name, err)
		}
	}
	_, err := Read(filepath.Join(t.TempDir(), "absent.csv"), Format{})
	if err == nil || !strings.Contains(err.Error(), "absent.csv") {
		t.Errorf("missing file: error %v, want one naming the file", err)
	}
}

func TestReadLongLine(t *testing.T) {
	content := "time_s,counts\n0,1\n" + strings.Repeat("9", maxLine+1) + "\n"
	_, err := Read(writeList(t, "long.csv", content), Format{})
	wantParseError(t, "long line", err, 3, 0, "line longer than")
}
