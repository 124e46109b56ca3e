package logtable

import (
	"fmt"
	"strconv"
	"strings"
)

// ClockUnit is the time unit whose cells are written h:mm:ss[.fff] or
// mm:ss rather than as plain numbers (see ParseClock).
const ClockUnit = "hms"

// Unit is one accepted unit of a column: its name as a settings file or a
// header writes it, and the factor that converts a value in it to the
// reader's base unit (s for time, N for force, ...).
type Unit struct {
	Name   string
	Factor float64
}

// Describe writes a cell of this unit for a message, as written and with
// the unit: "12.3 s", or for ClockUnit "0:01:00 (60 s)". A cell longer
// than ExcerptRunes is shown as Excerpt shows it.
func (u Unit) Describe(cell string, base float64) string {
	cell = Shown(cell)
	if u.Name == ClockUnit {
		return fmt.Sprintf("%s (%s s)", cell, strconv.FormatFloat(base, 'g', -1, 64))
	}
	return cell + " " + u.Name
}

// Units are the accepted units of one quantity.
type Units []Unit

// Lookup returns the unit named name, ignoring case and surrounding blanks
// ("kn" is kN).
func (us Units) Lookup(name string) (Unit, bool) {
	for _, u := range us {
		if strings.EqualFold(u.Name, strings.TrimSpace(name)) {
			return u, true
		}
	}
	return Unit{}, false
}

// Parse returns the unit named name, or an error listing the accepted
// units; field names the setting the name came from.
func (us Units) Parse(field, name string) (Unit, error) {
	if u, ok := us.Lookup(name); ok {
		return u, nil
	}
	return Unit{}, fmt.Errorf("%s %s is not accepted; use one of %s", field, Excerpt(name), us)
}

// String lists the unit names separated by commas, for messages.
func (us Units) String() string {
	names := make([]string, len(us))
	for i, u := range us {
		names[i] = u.Name
	}
	return strings.Join(names, ", ")
}

// SplitUnit splits a header cell into its base name and the unit written
// after it: "time_s", "Time (s)", "Force [kN]", "force kN" and "Force/kN"
// give ("time", "s") ... ("Force", "kN"). The unit part is returned whether
// or not it names a known unit; a name without a separator has none.
func SplitUnit(cell string) (base, unit string) {
	s := strings.TrimSpace(cell)
	if n := len(s); n > 2 && (s[n-1] == ')' || s[n-1] == ']') {
		open := byte('(')
		if s[n-1] == ']' {
			open = '['
		}
		if i := strings.LastIndexByte(s, open); i > 0 {
			return strings.TrimRight(s[:i], " _-/"), strings.TrimSpace(s[i+1 : n-1])
		}
	}
	if i := strings.LastIndexAny(s, "_ /"); i > 0 {
		return strings.TrimRight(s[:i], " _-/"), strings.TrimSpace(s[i+1:])
	}
	return s, ""
}
