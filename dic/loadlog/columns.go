package loadlog

import (
	"fmt"
	"slices"
	"strings"

	"spallscope/dic/logtable"
)

// defaultNames are the base names (lower case, unit suffix removed) that
// choose a quantity's column when the Format does not.
var defaultNames = map[string][]string{
	"time":   {"time", "t"},
	"force":  {"force", "load", "f"},
	"stroke": {"stroke", "displacement", "disp", "position", "extension"},
}

// resolveColumn finds the column of quantity q as spec chooses it. header
// is nil for a file without one; fallback is the 1-based column used then
// (0: none). A column left to its default that the header lacks is an
// error when required, else absent (Index 0).
func resolveColumn(q quantity, spec logtable.ColumnSpec, header []string, fallback int, required bool) (logtable.Column, error) {
	c, err := spec.Resolve(header, fallback, q.name, func(cell string) bool {
		return slices.Contains(defaultNames[q.name], baseName(cell))
	})
	if err != nil || c.Index != 0 || header == nil || !required {
		return c, err
	}
	return c, fmt.Errorf("no %s column found (named %s, with or without a unit suffix); set %s to one of the header's columns: %s",
		q.name, strings.Join(defaultNames[q.name], ", "), spec.Field, logtable.ListColumns(header))
}
