package logtable

import (
	"reflect"
	"testing"
)

func TestDetectDelimiter(t *testing.T) {
	for _, c := range []struct {
		line string
		want Delimiter
	}{
		{"time_s\tforce_kN,x", '\t'}, // tab wins over everything
		{"time_s;force_kN", ';'},
		{"0;1,5", ';'}, // semicolon before comma: the comma is a decimal comma
		{"time_s,force_kN", ','},
		{"time_s  force_kN", Whitespace},
		{"12", Whitespace},
	} {
		if got := DetectDelimiter(c.line); got != c.want {
			t.Errorf("DetectDelimiter(%q) = %q, want %q", c.line, rune(got), rune(c.want))
		}
	}
}

func TestSplitCells(t *testing.T) {
	for _, c := range []struct {
		line string
		d    Delimiter
		want []string
	}{
		{"0, 1 ,2", ',', []string{"0", "1", "2"}},
		{`"Force, kN", time`, ',', []string{"Force, kN", "time"}},
		{`"say ""hi""",x`, ',', []string{`say "hi"`, "x"}},
		{`"unterminated,1`, ',', []string{"unterminated,1"}},
		{"a\t\tb", '\t', []string{"a", "", "b"}},
		{"  a \t b  ", Whitespace, []string{"a", "b"}},
		{",,", ',', []string{"", "", ""}},
	} {
		if got := SplitCells(c.line, c.d); !reflect.DeepEqual(got, c.want) {
			t.Errorf("SplitCells(%q, %q) = %q, want %q", c.line, rune(c.d), got, c.want)
		}
	}
}

func TestIsHeader(t *testing.T) {
	for _, c := range []struct {
		cells     []string
		header    bool
		hasNumber bool
	}{
		{[]string{"time_s", "force_kN"}, true, false},
		{[]string{"0.5", "12.4"}, false, true},
		{[]string{"0:00:01.5", "12"}, false, true}, // an h:mm:ss time is data
		{[]string{"1", "", "2"}, false, true},      // an empty cell is neither
		{[]string{"1,5"}, true, false},             // a decimal comma is not a number
		{[]string{"s", "kN"}, true, false},         // a row of units
		{[]string{"", ""}, false, false},
	} {
		if got := IsHeader(c.cells); got != c.header {
			t.Errorf("IsHeader(%q) = %v, want %v", c.cells, got, c.header)
		}
		if got := HasNumber(c.cells); got != c.hasNumber {
			t.Errorf("HasNumber(%q) = %v, want %v", c.cells, got, c.hasNumber)
		}
	}
	if !Blank([]string{"", ""}) || Blank([]string{"", "x"}) {
		t.Error(`Blank: want true for ["" ""] and false for ["" "x"]`)
	}
}

func TestDelimiterText(t *testing.T) {
	for _, c := range []struct {
		text string
		want Delimiter
	}{
		{"", 0}, {"auto", 0}, {"tab", '\t'}, {`\t`, '\t'}, {"space", Whitespace}, {"|", '|'},
	} {
		var d Delimiter
		if err := d.UnmarshalText([]byte(c.text)); err != nil || d != c.want {
			t.Errorf("UnmarshalText(%q) = %q, %v; want %q", c.text, rune(d), err, rune(c.want))
		}
	}
	for _, bad := range []string{"ab", `"`, ".", "5", "-"} {
		var d Delimiter
		if err := d.UnmarshalText([]byte(bad)); err == nil {
			t.Errorf("UnmarshalText(%q) accepted as %q", bad, rune(d))
		}
	}
	if err := Delimiter(-1).Validate(); err == nil {
		t.Error("Validate accepted an invalid rune")
	}
}
