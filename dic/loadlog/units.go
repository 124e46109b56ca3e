package loadlog

import (
	"strings"

	"spallscope/dic/logtable"
)

// PoundForce is the force of one pound-force in newtons: the international
// avoirdupois pound (0.45359237 kg) times standard gravity (9.80665 m/s²),
// exact by definition.
const PoundForce = 4.4482216152605

// Inch is the international inch in millimetres, exact by definition.
const Inch = 25.4

// quantity is one of the measured columns of a load log with the units it
// may be written in; their factors convert to the package's base units (s
// for time, N for force, mm for stroke).
type quantity struct {
	name  string // "time", "force", "stroke"
	field string // the Format field that sets its unit, for messages
	units logtable.Units
	def   string // unit assumed when neither the Format nor the header gives one
}

var (
	timeQuantity = quantity{name: "time", field: "time_unit", def: "s", units: logtable.Units{
		{Name: "s", Factor: 1}, {Name: "ms", Factor: 1e-3}, {Name: "min", Factor: 60}, {Name: "h", Factor: 3600},
		{Name: logtable.ClockUnit, Factor: 1},
	}}
	forceQuantity = quantity{name: "force", field: "force_unit", def: "kN", units: logtable.Units{
		{Name: "N", Factor: 1}, {Name: "kN", Factor: 1e3}, {Name: "lbf", Factor: PoundForce}, {Name: "kip", Factor: 1e3 * PoundForce},
	}}
	strokeQuantity = quantity{name: "stroke", field: "stroke_unit", def: "mm", units: logtable.Units{
		{Name: "mm", Factor: 1}, {Name: "in", Factor: Inch},
	}}
)

// parse returns the unit of q named name, or an error listing the accepted
// units.
func (q quantity) parse(name string) (logtable.Unit, error) { return q.units.Parse(q.field, name) }

// headerUnit returns the unit of q that a header cell names after its base
// name ("force_kN" names kN), if it names one.
func (q quantity) headerUnit(cell string) (logtable.Unit, bool) {
	_, u := logtable.SplitUnit(cell)
	if u == "" {
		return logtable.Unit{}, false
	}
	return q.units.Lookup(u)
}

// baseName returns a header cell's name without a recognised unit suffix, in
// lower case: "Time (s)" and "time_s" give "time", "Standard force" stays
// "standard force".
func baseName(cell string) string {
	base, u := logtable.SplitUnit(cell)
	for _, q := range []quantity{timeQuantity, forceQuantity, strokeQuantity} {
		if _, ok := q.units.Lookup(u); ok && base != "" {
			return strings.ToLower(base)
		}
	}
	return strings.ToLower(strings.TrimSpace(cell))
}
