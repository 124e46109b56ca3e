package logtable

import (
	"fmt"
	"strconv"
	"unicode/utf8"
)

// ExcerptRunes is how many characters of a cell Excerpt shows.
const ExcerptRunes = 60

// Excerpt quotes text for an error message as %q does, cut to its first
// ExcerptRunes characters when it is longer, with the full length after
// it: a careless or hostile file may hold a cell of a megabyte, and an
// error must show which cell it means without echoing all of it.
func Excerpt(text string) string {
	if utf8.RuneCountInString(text) <= ExcerptRunes {
		return strconv.Quote(text)
	}
	cut, n := 0, 0
	for i := range text {
		if n == ExcerptRunes {
			cut = i
			break
		}
		n++
	}
	return fmt.Sprintf("%s… (%d bytes)", strconv.Quote(text[:cut]), len(text))
}

// Shown writes a cell that reads as a number into a message as it is
// ("12.5"), or as Excerpt does when it is longer than ExcerptRunes: a
// number may be written with a megabyte of digits.
func Shown(cell string) string {
	if utf8.RuneCountInString(cell) > ExcerptRunes {
		return Excerpt(cell)
	}
	return cell
}
