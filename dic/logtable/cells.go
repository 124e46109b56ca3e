package logtable

import (
	"strings"
	"unicode/utf8"
)

// SplitCells splits a line into cells, each trimmed of surrounding blanks.
// With Whitespace, cells are separated by runs of blanks and tabs. With any
// other delimiter a cell may be quoted ("Force, kN"), with "" standing for a
// quote inside it; an unterminated quote runs to the end of the line.
func SplitCells(line string, d Delimiter) []string {
	if d == Whitespace {
		return strings.Fields(line)
	}
	var (
		cells   []string
		b       strings.Builder
		quoted  bool // inside a quoted cell
		started bool // the cell has had a character other than blanks
	)
	for i := 0; i < len(line); {
		r, size := utf8.DecodeRuneInString(line[i:])
		switch {
		case quoted:
			if r == '"' {
				if strings.HasPrefix(line[i+size:], `"`) {
					b.WriteByte('"')
					size++
				} else {
					quoted = false
				}
			} else {
				b.WriteRune(r)
			}
		case r == '"' && !started:
			b.Reset()
			quoted, started = true, true
		case r == rune(d):
			cells = append(cells, strings.TrimSpace(b.String()))
			b.Reset()
			started = false
		default:
			b.WriteRune(r)
			if r != ' ' && r != '\t' {
				started = true
			}
		}
		i += size
	}
	return append(cells, strings.TrimSpace(b.String()))
}

// Blank reports whether every cell is empty (a line such as ",,,").
func Blank(cells []string) bool {
	for _, c := range cells {
		if c != "" {
			return false
		}
	}
	return true
}

// IsHeader reports whether a line's cells are a header: some non-empty cell
// is neither a number nor an h:mm:ss time.
func IsHeader(cells []string) bool {
	for _, c := range cells {
		if c != "" && !isNumeric(c) {
			return true
		}
	}
	return false
}

// HasNumber reports whether any cell is a number or an h:mm:ss time. A
// line after the header without one is most likely a second header line,
// such as a row of units.
func HasNumber(cells []string) bool {
	for _, c := range cells {
		if c != "" && isNumeric(c) {
			return true
		}
	}
	return false
}

// isNumeric reports whether a cell is a number or an h:mm:ss time.
func isNumeric(cell string) bool {
	if _, ok := ParseNumber(cell); ok {
		return true
	}
	_, ok := ParseClock(cell)
	return ok
}
