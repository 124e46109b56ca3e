package export

import (
	"fmt"
	"math"
	"strings"

	"spallscope/dic"
	"spallscope/strain"
	"spallscope/subset"
)

// quantity is one exportable per-point value: its name (the NPY file and
// the VTK array), where it comes from and what unit it has.
type quantity struct {
	name string
	// length quantities follow the coordinates (mm with a scale, else px);
	// the others keep unit.
	length bool
	unit   string
	// code marks the status array: small integer codes, not float64.
	code bool
	// field reads the value from a displacement point, strain from a strain
	// point; exactly one is set.
	field  func(p *dic.Point) float64
	strain func(p *strain.Point) float64
}

// fromStrain reports whether q needs the frame's strain file.
func (q *quantity) fromStrain() bool { return q.strain != nil }

// unitFor returns q's unit when lengths are in lengthUnit.
func (q *quantity) unitFor(lengthUnit string) string {
	if q.length {
		return lengthUnit
	}
	return q.unit
}

// param returns the reader of shape parameter k, NaN where not measured.
func param(k int) func(p *dic.Point) float64 {
	return func(p *dic.Point) float64 {
		if !p.Valid() {
			return math.NaN()
		}
		return p.P[k]
	}
}

// zncc keeps the correlation of every point that was solved, as the field
// file does, and NaN where none was computed.
func zncc(p *dic.Point) float64 {
	if p.Status == subset.Unsolved || p.ZNCC == 0 {
		return math.NaN()
	}
	return p.ZNCC
}

func status(p *dic.Point) float64 { return float64(p.Status) }

// strainComponent returns the reader of a named strain component, NaN
// where the strain is not valid.
func strainComponent(name string) func(p *strain.Point) float64 {
	return func(p *strain.Point) float64 {
		v, _ := p.Value(name)
		if !p.Valid {
			return math.NaN()
		}
		return v
	}
}

// quantities lists every exportable quantity: displacement first, in the
// order of the field file, then the strain components in the order of the
// strain file.
var quantities = func() []quantity {
	qs := []quantity{
		{name: "u", length: true, field: param(subset.PU)},
		{name: "v", length: true, field: param(subset.PV)},
		{name: "dudx", unit: "1", field: param(subset.PUx)},
		{name: "dudy", unit: "1", field: param(subset.PUy)},
		{name: "dvdx", unit: "1", field: param(subset.PVx)},
		{name: "dvdy", unit: "1", field: param(subset.PVy)},
		{name: "zncc", unit: "1", field: zncc},
		{name: "status", unit: "code", code: true, field: status},
	}
	for _, c := range strain.Components {
		unit := "1"
		if c == "angle_deg" {
			unit = "deg"
		}
		qs = append(qs, quantity{name: c, unit: unit, strain: strainComponent(c)})
	}
	return qs
}()

// defaultFields are exported when no fields are named: displacement,
// correlation and status, and every strain component when strain exists.
var defaultFields = []string{"u", "v", "zncc", "status"}

// lookup returns the named quantities in the order given, rejecting
// unknown names and duplicates.
func lookup(names []string) ([]*quantity, error) {
	var out []*quantity
	seen := map[string]bool{}
	for _, n := range names {
		n = strings.ToLower(strings.TrimSpace(n))
		if n == "" {
			continue
		}
		if seen[n] {
			return nil, fmt.Errorf("export: field %q named twice", n)
		}
		seen[n] = true
		q := find(n)
		if q == nil {
			return nil, fmt.Errorf("export: unknown field %q, expected some of %s", n, strings.Join(FieldNames(), ","))
		}
		out = append(out, q)
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("export: no fields named, expected some of %s", strings.Join(FieldNames(), ","))
	}
	return out, nil
}

func find(name string) *quantity {
	for i := range quantities {
		if quantities[i].name == name {
			return &quantities[i]
		}
	}
	return nil
}

// FieldNames returns the names of the exportable quantities, displacement
// ones first, then the strain components.
func FieldNames() []string {
	names := make([]string, len(quantities))
	for i := range quantities {
		names[i] = quantities[i].name
	}
	return names
}

// StatusCodes maps the status array's codes to their names (the values of
// subset.Status).
func StatusCodes() map[int]string {
	codes := map[int]string{}
	for s := subset.Status(0); ; s++ {
		name := s.String()
		if _, err := subset.ParseStatus(name); err != nil {
			return codes
		}
		codes[int(s)] = name
	}
}
