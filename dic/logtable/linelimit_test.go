package logtable

import (
	"errors"
	"io"
	"strings"
	"testing"
)

func TestLimitLines(t *testing.T) {
	ok := "abc\ndefg\n\nhij"
	got, err := io.ReadAll(LimitLines(strings.NewReader(ok), 4))
	if err != nil || string(got) != ok {
		t.Errorf("lines within the limit: %q, %v; want all of it", got, err)
	}
	got, err = io.ReadAll(LimitLines(strings.NewReader("ab\ncd\nefghij\nk"), 4))
	var long *LineTooLongError
	if !errors.As(err, &long) || long.Line != 3 || string(got) != "ab\ncd\nefgh" {
		t.Fatalf("long third line: %q, %v; want the bytes up to the limit and line 3", got, err)
	}
	if want := "line 3 is longer than 4 bytes; expected a text table"; err.Error() != want {
		t.Errorf("message %q, want %q", err, want)
	}
}
