package logtable

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// Delimiter is the rune that separates cells, or 0 to detect it from the
// file (see DetectDelimiter). In JSON and YAML it is written as the
// character itself or as "tab", "whitespace" or "auto".
type Delimiter rune

// Whitespace is the Delimiter for cells separated by runs of blanks and
// tabs.
const Whitespace Delimiter = ' '

// String returns the delimiter as it is written in a settings file.
func (d Delimiter) String() string {
	switch d {
	case 0:
		return "auto"
	case '\t':
		return "tab"
	case Whitespace:
		return "whitespace"
	}
	return string(rune(d))
}

// MarshalText writes the delimiter as String does.
func (d Delimiter) MarshalText() ([]byte, error) { return []byte(d.String()), nil }

// UnmarshalText reads a delimiter written as one character, "tab",
// "whitespace" (or "space"), or "auto" (or empty).
func (d *Delimiter) UnmarshalText(text []byte) error {
	s := string(text)
	switch strings.ToLower(s) {
	case "", "auto":
		*d = 0
		return nil
	case "tab", `\t`:
		*d = '\t'
		return nil
	case "whitespace", "space", "blank", "blanks":
		*d = Whitespace
		return nil
	}
	r := []rune(s)
	if len(r) != 1 {
		return fmt.Errorf("delimiter %q: expected one character, \"tab\", \"whitespace\" or \"auto\"", s)
	}
	nd := Delimiter(r[0])
	if err := nd.Validate(); err != nil {
		return err
	}
	*d = nd
	return nil
}

// Validate rejects runes that cannot separate cells: the quote, line
// breaks, characters of numbers and runes that are not valid Unicode. The
// zero Delimiter (detect) and Whitespace are valid.
func (d Delimiter) Validate() error {
	switch d {
	case '"', '\r', '\n', '.', utf8.RuneError:
		return fmt.Errorf("delimiter %q cannot separate cells", rune(d))
	}
	if d >= '0' && d <= '9' || d == '-' || d == '+' {
		return fmt.Errorf("delimiter %q cannot separate cells of numbers", rune(d))
	}
	if d != 0 && !utf8.ValidRune(rune(d)) {
		return fmt.Errorf("delimiter %U is not a valid character", rune(d))
	}
	return nil
}

// DetectDelimiter chooses the delimiter of a file from its first line that
// is not a comment: tab if the line has one, else semicolon, else comma,
// else runs of blanks. Semicolon goes before comma so that a file written
// with decimal commas is read as semicolon-separated and its decimal commas
// are reported, not silently split.
func DetectDelimiter(line string) Delimiter {
	switch {
	case strings.ContainsRune(line, '\t'):
		return '\t'
	case strings.ContainsRune(line, ';'):
		return ';'
	case strings.ContainsRune(line, ','):
		return ','
	}
	return Whitespace
}
