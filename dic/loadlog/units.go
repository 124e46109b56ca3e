package loadlog

import (
	"fmt"
	"strings"
)

// PoundForce is the force of one pound-force in newtons: the international
// avoirdupois pound (0.45359237 kg) times standard gravity (9.80665 m/s²),
// exact by definition.
const PoundForce = 4.4482216152605

// Inch is the international inch in millimetres, exact by definition.
const Inch = 25.4

// unit is one accepted unit of a quantity: its name as written in a Format
// and the factor that converts a value in it to the package's base unit
// (s for time, N for force, mm for stroke).
type unit struct {
	name   string
	factor float64
}

// clockUnit is the time unit whose cells are written as h:mm:ss[.fff] or
// mm:ss rather than as plain numbers.
const clockUnit = "hms"

// quantity is one of the measured columns of a load log with the units it
// may be written in.
type quantity struct {
	name  string // "time", "force", "stroke"
	field string // the Format field that sets its unit, for messages
	units []unit
	def   string // unit assumed when neither the Format nor the header gives one
}

var (
	timeQuantity = quantity{name: "time", field: "time_unit", def: "s", units: []unit{
		{"s", 1}, {"ms", 1e-3}, {"min", 60}, {"h", 3600}, {clockUnit, 1},
	}}
	forceQuantity = quantity{name: "force", field: "force_unit", def: "kN", units: []unit{
		{"N", 1}, {"kN", 1e3}, {"lbf", PoundForce}, {"kip", 1e3 * PoundForce},
	}}
	strokeQuantity = quantity{name: "stroke", field: "stroke_unit", def: "mm", units: []unit{
		{"mm", 1}, {"in", Inch},
	}}
)

// lookup returns the unit of q named name, ignoring case ("kn" is kN).
func (q quantity) lookup(name string) (unit, bool) {
	for _, u := range q.units {
		if strings.EqualFold(u.name, strings.TrimSpace(name)) {
			return u, true
		}
	}
	return unit{}, false
}

// parse returns the unit of q named name, or an error listing the accepted
// units.
func (q quantity) parse(name string) (unit, error) {
	if u, ok := q.lookup(name); ok {
		return u, nil
	}
	return unit{}, fmt.Errorf("%s %q is not accepted; use one of %s", q.field, name, q.list())
}

// list returns the accepted unit names separated by commas.
func (q quantity) list() string {
	names := make([]string, len(q.units))
	for i, u := range q.units {
		names[i] = u.name
	}
	return strings.Join(names, ", ")
}

// splitUnit splits a header cell into its base name and the unit written
// after it: "time_s", "Time (s)", "Force [kN]", "force kN" and "Force/kN"
// give ("time", "s") ... ("Force", "kN"). The unit part is returned whether
// or not it names a known unit; a name without a separator has none.
func splitUnit(name string) (base, unit string) {
	s := strings.TrimSpace(name)
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

// headerUnit returns the unit of q that a header cell names after its base
// name ("force_kN" names kN), if it names one.
func (q quantity) headerUnit(cell string) (unit, bool) {
	_, u := splitUnit(cell)
	if u == "" {
		return unit{}, false
	}
	return q.lookup(u)
}

// baseName returns a header cell's name without a recognised unit suffix, in
// lower case: "Time (s)" and "time_s" give "time", "Standard force" stays
// "standard force".
func baseName(cell string) string {
	base, u := splitUnit(cell)
	for _, q := range []quantity{timeQuantity, forceQuantity, strokeQuantity} {
		if _, ok := q.lookup(u); ok && base != "" {
			return strings.ToLower(base)
		}
	}
	return strings.ToLower(strings.TrimSpace(cell))
}
