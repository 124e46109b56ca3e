package logtable

import (
	"fmt"
	"strconv"
	"strings"
)

// Column is a resolved column of a file.
type Column struct {
	Index int    // 1-based; 0: the file has no such column
	Name  string // header cell, "" without a header
}

// ColumnSpec is a settings field that chooses a column, parsed.
type ColumnSpec struct {
	Field string // the setting, for messages: "time_column"
	Text  string // as given, trimmed; "" for the default
	Index int    // 1-based index, 0 if chosen by name or by default
}

// ParseColumnSpec reads the setting field: a 1-based index when text is
// all digits, else a header name, else (empty) the default.
func ParseColumnSpec(field, text string) (ColumnSpec, error) {
	s := strings.TrimSpace(text)
	if s == "" || strings.Trim(s, "0123456789") != "" {
		return ColumnSpec{Field: field, Text: s}, nil
	}
	i, err := strconv.Atoi(s)
	if err != nil || i < 1 {
		return ColumnSpec{}, fmt.Errorf("%s %s: a column index is 1-based, expected 1 or more", field, Excerpt(text))
	}
	return ColumnSpec{Field: field, Text: s, Index: i}, nil
}

// Resolve finds the column s chooses. header is nil for a file without
// one. An index must be within the header; a name must match one header
// cell, case ignored. Left to its default, the column is the header cell
// for which isDefault is true (quantity names the column in the message
// when several are), or without a header the 1-based fallback. The column
// is absent (Index 0, no error) when no cell matches or fallback is 0.
func (s ColumnSpec) Resolve(header []string, fallback int, quantity string, isDefault func(cell string) bool) (Column, error) {
	if s.Index > 0 {
		c := Column{Index: s.Index}
		if header != nil {
			if s.Index > len(header) {
				return Column{}, fmt.Errorf("%s %d: the header has only %d columns: %s", s.Field, s.Index, len(header), ListColumns(header))
			}
			c.Name = header[s.Index-1]
		}
		return c, nil
	}
	if s.Text != "" {
		if header == nil {
			return Column{}, fmt.Errorf("%s %s names a column, but the file has no header line; give a 1-based index", s.Field, Excerpt(s.Text))
		}
		found := matching(header, func(h string) bool { return strings.EqualFold(h, s.Text) })
		switch len(found) {
		case 0:
			return Column{}, fmt.Errorf("%s %s is not in the header; its columns are %s", s.Field, Excerpt(s.Text), ListColumns(header))
		case 1:
			return Column{Index: found[0], Name: header[found[0]-1]}, nil
		}
		return Column{}, fmt.Errorf("%s %s matches columns %v; give a 1-based index", s.Field, Excerpt(s.Text), found)
	}
	if header == nil {
		return Column{Index: fallback}, nil
	}
	found := matching(header, isDefault)
	switch len(found) {
	case 0:
		return Column{}, nil
	case 1:
		return Column{Index: found[0], Name: header[found[0]-1]}, nil
	}
	names := make([]string, len(found))
	for i, k := range found {
		names[i] = fmt.Sprintf("%d %s", k, Excerpt(header[k-1]))
	}
	return Column{}, fmt.Errorf("several columns could be the %s column (%s); set %s", quantity, strings.Join(names, ", "), s.Field)
}

// matching returns the 1-based indices of the header cells for which match
// is true.
func matching(header []string, match func(string) bool) []int {
	var found []int
	for i, h := range header {
		if match(h) {
			found = append(found, i+1)
		}
	}
	return found
}

// ListedColumns and ListedBytes bound what ListColumns writes: a header
// may hold a hundred thousand cells, and a message that lists them all is
// a megabyte no one reads. Fifty cover the widest instrument logs we know
// of (common practice, no source).
const (
	ListedColumns = 50
	ListedBytes   = 2000
)

// ListColumns writes header cells for a message: 1 "time_s", 2 "force_kN",
// each an Excerpt; past ListedColumns cells or ListedBytes bytes it says
// how many more there are instead.
func ListColumns(header []string) string {
	var b strings.Builder
	for i, h := range header {
		if i == ListedColumns || b.Len() >= ListedBytes {
			fmt.Fprintf(&b, ", and %d more", len(header)-i)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "%d %s", i+1, Excerpt(h))
	}
	return b.String()
}
