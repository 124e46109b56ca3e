package logtable

import (
	"strings"
	"testing"
)

func TestParseClock(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64
		ok   bool
	}{
		{"0:01:02.5", 62.5, true},
		{"01:02.5", 62.5, true}, // mm:ss
		{"75:30", 4530, true},   // minutes may pass 59 without hours
		{"2:00:00", 7200, true}, // 1 h = 3600 s
		{"-0:00:01.5", -1.5, true},
		{"0:60:00", 0, false}, // minutes after hours below 60
		{"0:00:60", 0, false}, // seconds below 60
		{"1:2:3:4", 0, false},
		{"12", 0, false},
		{"a:00", 0, false},
		{"1:1e1", 0, false},
		{"1:.5", 0, false},
		{"1:", 0, false},
		{strings.Repeat("9", 308) + ":00:00", 0, false}, // 1e308 h overflows to +Inf s
		{"-" + strings.Repeat("9", 308) + ":00", 0, false},
	} {
		got, ok := ParseClock(c.in)
		if ok != c.ok || (ok && got != c.want) {
			t.Errorf("ParseClock(%q) = %g, %v; want %g, %v", c.in, got, ok, c.want, c.ok)
		}
	}
}

func TestParseNumber(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64
		ok   bool
	}{
		{"12.5", 12.5, true},
		{"-3", -3, true},
		{"1.2e3", 1200, true},
		{".5", 0.5, true},
		{"1,5", 0, false}, // decimal comma: never guessed at
		{"NaN", 0, false},
		{"Inf", 0, false},
		{"1e309", 0, false}, // overflows to +Inf
		{"", 0, false},
		{" 1", 0, false}, // cells arrive trimmed; a blank is not part of a number
	} {
		got, ok := ParseNumber(c.in)
		if ok != c.ok || got != c.want {
			t.Errorf("ParseNumber(%q) = %g, %v; want %g, %v", c.in, got, ok, c.want, c.ok)
		}
	}
}

func TestCellProblem(t *testing.T) {
	for _, c := range []struct {
		cell  string
		clock bool
		want  string
	}{
		{"", false, "empty cell, expected a number"},
		{"1,5", false, `"1,5" is not a number: the decimal separator must be '.', not ','`},
		{"NaN", false, `"NaN" is not a finite number`},
		{"1e999", false, `"1e999" is out of range, expected a finite number (at most about 1.8e308)`},
		{"0:00:01", false, `"0:00:01" is not a number; for h:mm:ss times set time_unit "hms"`},
		{"abc", false, `"abc" is not a number`},
		{"1,2,3", false, `"1,2,3" is not a number`},
		{"0:00:xx", true, `"0:00:xx" is not a time; expected h:mm:ss[.fff] or mm:ss (time_unit "hms")`},
	} {
		if got := CellProblem(c.cell, c.clock).Error(); got != c.want {
			t.Errorf("CellProblem(%q, %v) = %q, want %q", c.cell, c.clock, got, c.want)
		}
	}
}

func TestUnitDescribe(t *testing.T) {
	if got := (Unit{Name: "ms", Factor: 1e-3}).Describe("1500", 1.5); got != "1500 ms" {
		t.Errorf("ms: %q, want %q", got, "1500 ms")
	}
	if got := (Unit{Name: ClockUnit, Factor: 1}).Describe("0:01:00.5", 60.5); got != "0:01:00.5 (60.5 s)" {
		t.Errorf("hms: %q, want %q", got, "0:01:00.5 (60.5 s)")
	}
}

func TestUnitsParse(t *testing.T) {
	us := Units{{Name: "N", Factor: 1}, {Name: "kN", Factor: 1e3}}
	if u, err := us.Parse("force_unit", " kn "); err != nil || u != (Unit{Name: "kN", Factor: 1e3}) {
		t.Errorf("Parse(kn) = %+v, %v; want kN", u, err)
	}
	_, err := us.Parse("force_unit", "kgf")
	if want := `force_unit "kgf" is not accepted; use one of N, kN`; err == nil || err.Error() != want {
		t.Errorf("Parse(kgf) error %v, want %q", err, want)
	}
}

func TestSplitUnit(t *testing.T) {
	for _, c := range []struct{ in, base, unit string }{
		{"time_s", "time", "s"},
		{"Time (ms)", "Time", "ms"},
		{"Force [kN]", "Force", "kN"},
		{"force kN", "force", "kN"},
		{"Force/kN", "Force", "kN"},
		{"Standard force", "Standard", "force"}, // a unit part, known or not
		{"time", "time", ""},
		{"(s)", "(s)", ""},
	} {
		base, unit := SplitUnit(c.in)
		if base != c.base || unit != c.unit {
			t.Errorf("SplitUnit(%q) = %q, %q; want %q, %q", c.in, base, unit, c.base, c.unit)
		}
	}
}
