package loadlog

import (
	"strings"
	"unicode/utf8"
)

// detectDelimiter chooses the delimiter of a file from its first line that
// is not a comment: tab if the line has one, else semicolon, else comma,
// else runs of blanks. Semicolon goes before comma so that a file written
// with decimal commas is read as semicolon-separated and its decimal commas
// are reported, not silently split.
func detectDelimiter(line string) Delimiter {
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

// splitCells splits a line into cells, each trimmed of surrounding blanks.
// With Whitespace, cells are separated by runs of blanks and tabs. With any
// other delimiter a cell may be quoted ("Force, kN"), with "" standing for a
// quote inside it; an unterminated quote runs to the end of the line.
func splitCells(line string, d Delimiter) []string {
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

// blank reports whether every cell is empty (a line such as ",,,").
func blank(cells []string) bool {
	for _, c := range cells {
		if c != "" {
			return false
		}
	}
	return true
}

// isHeader reports whether a line's cells are a header: some non-empty cell
// is neither a number nor an h:mm:ss time.
func isHeader(cells []string) bool {
	for _, c := range cells {
		if c == "" {
			continue
		}
		if _, ok := parseNumber(c); ok {
			continue
		}
		if _, ok := parseClock(c); ok {
			continue
		}
		return true
	}
	return false
}
