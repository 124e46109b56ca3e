package aelog

import (
	"strings"

	"spallscope/dic/logtable"
)

// quantity indexes the columns an AE hit list may have.
type quantity int

const (
	timeQ quantity = iota
	amplitudeQ
	energyQ
	countsQ
	channelQ
	numQuantities
)

// quantityInfo describes one column kind: how messages and the Format name
// it and which header names choose it by default.
type quantityInfo struct {
	name  string   // "time", "amplitude", ...
	field string   // the Format field that chooses the column
	names []string // default header names, lower case
	unit  bool     // the names may carry a unit suffix ("energy_aJ")
}

var quantities = [numQuantities]quantityInfo{
	timeQ:      {"time", "time_column", []string{"time", "t"}, true},
	amplitudeQ: {"amplitude", "amplitude_column", []string{"amplitude", "amp", "peak_amplitude"}, true},
	energyQ:    {"energy", "energy_column", []string{"energy", "abs_energy", "absolute_energy"}, true},
	countsQ:    {"counts", "counts_column", []string{"counts", "count"}, false},
	channelQ:   {"channel", "channel_column", []string{"channel", "chan", "ch", "sensor"}, false},
}

// headerUnit returns the unit a header cell names for quantity q: the part
// after the base name when the base is one of q's default names ("time_ms"
// gives "ms"), else "".
func (q quantityInfo) headerUnit(cell string) string {
	if !q.unit {
		return ""
	}
	base, u := logtable.SplitUnit(cell)
	for _, n := range q.names {
		if normName(base) == n {
			return u
		}
	}
	return ""
}

// matches reports whether a header cell is one of q's default names, as a
// whole or before a unit suffix.
func (q quantityInfo) matches(cell string) bool {
	for _, n := range q.names {
		if normName(cell) == n {
			return true
		}
	}
	return q.headerUnit(cell) != ""
}

// resolve finds the column of q as spec chooses it. header is nil for a
// file without one; fallback is the 1-based column used then (0: none).
// The column is absent (Index 0, no error) when spec is empty and no
// header cell matches.
func (q quantityInfo) resolve(spec logtable.ColumnSpec, header []string, fallback int) (logtable.Column, error) {
	return spec.Resolve(header, fallback, q.name, q.matches)
}

// normName writes a header name as the default names are written: lower
// case, with blanks and hyphens as underscores ("Peak Amplitude" is
// "peak_amplitude").
func normName(s string) string {
	return strings.NewReplacer(" ", "_", "-", "_").Replace(strings.ToLower(strings.TrimSpace(s)))
}

// defaultNames lists q's default header names for a message.
func (q quantityInfo) defaultNames() string {
	return strings.Join(q.names, ", ")
}
