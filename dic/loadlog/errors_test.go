package loadlog

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"
)

func TestReadDecreasingTime(t *testing.T) {
	content := "# invented\n# log\ntime_s,force_kN\n12.0,1\n12.2,2\n12.4,3\n12.3,4\n"
	path := writeLog(t, "dec.csv", content)
	_, err := Read(path, Format{})
	wantParseError(t, "decreasing", err, 7, 1, path, "line 7", `column 1 "time_s"`,
		"time 12.3 s is before the previous row's 12.4 s (line 6)")
}

func TestReadBadCells(t *testing.T) {
	for _, c := range []struct {
		name, content string
		f             Format
		line, col     int
		parts         []string
	}{
		{"text", "time_s,force_kN\n0,1\n1,abc\n", Format{}, 3, 2, []string{`line 3, column 2 "force_kN"`, `"abc" is not a number`}},
		{"empty", "time_s,force_kN\n0,1\n1,\n", Format{}, 3, 2, []string{"empty cell"}},
		{"decimal-comma", "time_s;force_kN\n0;1,5\n", Format{}, 2, 2, []string{`"1,5"`, "decimal separator must be '.'"}},
		{"nan", "time_s,force_kN\n0,1\n1,NaN\n", Format{}, 3, 2, []string{"not a finite number"}},
		{"overflow", "time,force\n0,1\n1,1e308\n", Format{ForceUnit: "kN"}, 3, 2, []string{"out of range"}},
		{"clock-without-hms", "time_s,force_kN\n0:00:01,1\n", Format{}, 2, 1, []string{`set time_unit "hms"`}},
		{"bad-clock", "t,f\n0:00:01,1\n0:00:xx,2\n", Format{TimeUnit: "hms"}, 3, 1, []string{"h:mm:ss[.fff] or mm:ss"}},
		{"short-row", "time_s,force_kN,stroke_mm\n0,1,0\n1,2\n", Format{}, 3, 3, []string{"only 2 cells", "column 3"}},
		{"no-header-short", "0\n1\n", Format{}, 1, 2, []string{"only 1 cells"}},
		{"units-row", "time,force\ns,kN\n0,1\n", Format{}, 2, 1, []string{`"s" is not a number`, "after the header on line 1", "comment it out"}},
	} {
		_, err := Read(writeLog(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, c.line, c.col, c.parts...)
	}
}

func TestReadUnknownUnit(t *testing.T) {
	path := writeLog(t, "u.csv", "time_s,force_kN\n0,1\n1,2\n")
	for _, c := range []struct {
		f     Format
		parts []string
	}{
		{Format{ForceUnit: "kgf"}, []string{`force_unit "kgf" is not accepted`, "N, kN, lbf, kip"}},
		{Format{TimeUnit: "sec"}, []string{`time_unit "sec"`, "s, ms, min, h, hms"}},
		{Format{StrokeUnit: "cm"}, []string{`stroke_unit "cm"`, "mm, in"}},
	} {
		_, err := Read(path, c.f)
		if err == nil {
			t.Errorf("%+v accepted", c.f)
			continue
		}
		for _, p := range append(c.parts, path) {
			if !strings.Contains(err.Error(), p) {
				t.Errorf("error %q does not contain %q", err, p)
			}
		}
	}
}

func TestReadMissingColumn(t *testing.T) {
	content := "# invented\ntime_s,force_kN,stroke_mm\n0,1,0\n1,2,0.1\n"
	for _, c := range []struct {
		name  string
		f     Format
		parts []string
	}{
		{"named", Format{ForceColumn: "load"}, []string{`force_column "load" is not in the header`, `1 "time_s", 2 "force_kN", 3 "stroke_mm"`}},
		{"index", Format{StrokeColumn: "5"}, []string{"stroke_column 5", "only 3 columns"}},
		{"same", Format{TimeColumn: "2"}, []string{"both column 2"}},
	} {
		_, err := Read(writeLog(t, c.name+".csv", content), c.f)
		wantParseError(t, c.name, err, 2, 0, c.parts...)
	}
	_, err := Read(writeLog(t, "nf.csv", "time_s,kraft\n0,1\n1,2\n"), Format{})
	wantParseError(t, "no force", err, 1, 0, "no force column found", "set force_column", `2 "kraft"`)
	_, err = Read(writeLog(t, "two.csv", "time_s,force_kN,load_kN\n0,1,1\n1,2,2\n"), Format{})
	wantParseError(t, "ambiguous", err, 1, 0, "several columns could be the force column", `2 "force_kN", 3 "load_kN"`)
	_, err = Read(writeLog(t, "nh.csv", "0,1\n1,2\n"), Format{ForceColumn: "force"})
	wantParseError(t, "no header", err, 1, 0, "no header line", "1-based index")
}

func TestReadBadFormat(t *testing.T) {
	path := writeLog(t, "f.csv", "time_s,force_kN\n0,1\n1,2\n")
	for _, c := range []struct {
		f    Format
		want string
	}{
		{Format{TimeColumn: "0"}, "1-based"},
		{Format{SkipLines: -1}, "skip_lines -1"},
		{Format{Delimiter: '.'}, "cannot separate cells"},
		{Format{Delimiter: '5'}, "cannot separate cells"},
	} {
		if _, err := Read(path, c.f); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%+v: error %v, want one containing %q", c.f, err, c.want)
		}
	}
}

func TestReadEmpty(t *testing.T) {
	for _, c := range []struct {
		name, content string
		f             Format
		line          int
		want          string
	}{
		{"empty", "", Format{}, 0, "the file is empty"},
		{"comments", "# nothing\n\n   \n# here\n", Format{}, 0, "only comments and blank lines"},
		{"skipped", "a\nb\n", Format{SkipLines: 2}, 0, "after the 2 skipped lines"},
		{"header-only", "# c\ntime_s,force_kN\n", Format{}, 0, "after the header on line 2"},
		{"one-row", "time_s,force_kN\n0,1\n", Format{}, 2, "at least two"},
	} {
		_, err := Read(writeLog(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, c.line, 0, c.want)
		if c.name != "one-row" && !errors.Is(err, ErrNoData) {
			t.Errorf("%s: %v does not wrap ErrNoData", c.name, err)
		}
	}
	_, err := Read(filepath.Join(t.TempDir(), "absent.csv"), Format{})
	if err == nil || !strings.Contains(err.Error(), "absent.csv") {
		t.Errorf("missing file: error %v, want one naming the file", err)
	}
}

func TestReadLongLine(t *testing.T) {
	content := "time_s,force_kN\n0,1\n" + strings.Repeat("9", maxLine+1) + "\n"
	_, err := Read(writeLog(t, "long.csv", content), Format{})
	wantParseError(t, "long line", err, 3, 0, "line longer than")
}
