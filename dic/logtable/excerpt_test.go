package logtable

import (
	"strings"
	"testing"
)

func TestExcerpt(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"12.5", `"12.5"`},
		{"", `""`},
		{strings.Repeat("x", 60), `"` + strings.Repeat("x", 60) + `"`},
		{strings.Repeat("x", 61), `"` + strings.Repeat("x", 60) + `"… (61 bytes)`},
		{strings.Repeat("é", 100), `"` + strings.Repeat("é", 60) + `"… (200 bytes)`}, // cut at characters, not bytes
		{"a\"b\n", `"a\"b\n"`},
	} {
		if got := Excerpt(c.in); got != c.want {
			t.Errorf("Excerpt(%.20q…) = %q, want %q", c.in, got, c.want)
		}
	}
}

func TestShown(t *testing.T) {
	if got := Shown("-12.5e3"); got != "-12.5e3" {
		t.Errorf("Shown(short) = %q, want it unchanged", got)
	}
	long := "0." + strings.Repeat("0", 100) + "1"
	if got, want := Shown(long), `"0.`+strings.Repeat("0", 58)+`"… (103 bytes)`; got != want {
		t.Errorf("Shown(long) = %q, want %q", got, want)
	}
	if got, want := (Unit{Name: "s", Factor: 1}).Describe(long, 1e-101), `"0.`+strings.Repeat("0", 58)+`"… (103 bytes) s`; got != want {
		t.Errorf("Describe(long) = %q, want %q", got, want)
	}
}
