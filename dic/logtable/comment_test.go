package logtable

import "testing"

func TestValidateComment(t *testing.T) {
	for _, ok := range []string{"", "#", "//", "%", ";", "REM"} {
		if err := ValidateComment(ok); err != nil {
			t.Errorf("ValidateComment(%q): %v", ok, err)
		}
	}
	for bad, want := range map[string]string{
		"1":    `comment "1": a comment prefix that starts like a number would skip data rows; expected a prefix such as "#" or "//"`,
		"-":    `comment "-": a comment prefix that starts like a number would skip data rows; expected a prefix such as "#" or "//"`,
		".x":   `comment ".x": a comment prefix that starts like a number would skip data rows; expected a prefix such as "#" or "//"`,
		" #":   `comment " #": a comment prefix cannot start with a blank (lines are trimmed first); expected a prefix such as "#" or "//"`,
		"#\n#": `comment "#\n#": a comment prefix cannot hold a line break`,
	} {
		if err := ValidateComment(bad); err == nil || err.Error() != want {
			t.Errorf("ValidateComment(%q) = %v, want %q", bad, err, want)
		}
	}
}
