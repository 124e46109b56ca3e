package loadlog

import (
	"fmt"
	"strings"
)

// column is a resolved column of the file.
type column struct {
	index int    // 1-based
	name  string // header cell, "" without a header
}

// defaultNames are the base names (lower case, unit suffix removed) that
// choose a quantity's column when the Format does not.
var defaultNames = map[string][]string{
	"time":   {"time", "t"},
	"force":  {"force", "load", "f"},
	"stroke": {"stroke", "displacement", "disp", "position", "extension"},
}

// resolveColumn finds the column of quantity q (field is the Format field
// that chooses it, for messages). header is nil for a file without one;
// fallback is the 1-based column used then (0: none). It returns ok=false
// for an optional column that is absent.
func resolveColumn(q quantity, field string, spec columnSpec, header []string, fallback int, required bool) (column, bool, error) {
	if spec.index > 0 {
		c := column{index: spec.index}
		if header != nil {
			if spec.index > len(header) {
				return column{}, false, fmt.Errorf("%s %d: the header has only %d columns: %s", field, spec.index, len(header), listColumns(header))
			}
			c.name = header[spec.index-1]
		}
		return c, true, nil
	}
	if spec.text != "" {
		if header == nil {
			return column{}, false, fmt.Errorf("%s %q names a column, but the file has no header line; give a 1-based index", field, spec.text)
		}
		var found []int
		for i, h := range header {
			if strings.EqualFold(h, spec.text) {
				found = append(found, i+1)
			}
		}
		switch len(found) {
		case 0:
			return column{}, false, fmt.Errorf("%s %q is not in the header; its columns are %s", field, spec.text, listColumns(header))
		case 1:
			return column{index: found[0], name: header[found[0]-1]}, true, nil
		}
		return column{}, false, fmt.Errorf("%s %q matches columns %v; give a 1-based index", field, spec.text, found)
	}
	if header == nil {
		if fallback == 0 {
			return column{}, false, nil
		}
		return column{index: fallback}, true, nil
	}
	var found []int
	for i, h := range header {
		for _, n := range defaultNames[q.name] {
			if baseName(h) == n {
				found = append(found, i+1)
				break
			}
		}
	}
	switch {
	case len(found) == 1:
		return column{index: found[0], name: header[found[0]-1]}, true, nil
	case len(found) > 1:
		names := make([]string, len(found))
		for i, k := range found {
			names[i] = fmt.Sprintf("%d %q", k, header[k-1])
		}
		return column{}, false, fmt.Errorf("several columns could be the %s column (%s); set %s", q.name, strings.Join(names, ", "), field)
	case required:
		return column{}, false, fmt.Errorf("no %s column found (named %s, with or without a unit suffix); set %s to one of the header's columns: %s",
			q.name, strings.Join(defaultNames[q.name], ", "), field, listColumns(header))
	}
	return column{}, false, nil
}

// listColumns writes header cells for a message: 1 "time_s", 2 "force_kN".
func listColumns(header []string) string {
	s := make([]string, len(header))
	for i, h := range header {
		s[i] = fmt.Sprintf("%d %q", i+1, h)
	}
	return strings.Join(s, ", ")
}
