package logtable

import (
	"fmt"
	"strings"
)

// ValidateComment rejects a comment prefix (a Format's comment setting)
// that would silently skip data rows or never match: one that starts with
// a character that begins numbers or h:mm:ss times (a digit, a sign, '.'),
// one that starts with a blank (lines are trimmed before the test) and
// one that holds a line break. "" is valid and means "#".
func ValidateComment(prefix string) error {
	if prefix == "" {
		return nil
	}
	switch c := prefix[0]; {
	case c >= '0' && c <= '9' || c == '-' || c == '+' || c == '.':
		return fmt.Errorf("comment %s: a comment prefix that starts like a number would skip data rows; expected a prefix such as \"#\" or \"//\"", Excerpt(prefix))
	case c == ' ' || c == '\t':
		return fmt.Errorf("comment %s: a comment prefix cannot start with a blank (lines are trimmed first); expected a prefix such as \"#\" or \"//\"", Excerpt(prefix))
	}
	if strings.ContainsAny(prefix, "\r\n") {
		return fmt.Errorf("comment %s: a comment prefix cannot hold a line break", Excerpt(prefix))
	}
	return nil
}
