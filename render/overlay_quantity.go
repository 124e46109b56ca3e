package render

import (
	"fmt"
	"math"
	"strings"

	"spallscope/dic"
	"spallscope/strain"
	"spallscope/subset"
)

// QuantityKind groups quantities by what they measure, which sets their
// units.
type QuantityKind int

// Kinds of quantity.
const (
	StrainKind       QuantityKind = iota // dimensionless, shown in µε or %
	DisplacementKind                     // px, shown in mm when the scale is known
	CorrelationKind                      // ZNCC, no unit
)

// Quantity is a field an overlay can show.
type Quantity struct {
	// Name is the name on the command line and in files ("e1").
	Name string
	// Label says what it is, Symbol is its short sign on the colour bar.
	Label, Symbol string
	// Convention is the sign convention shown beside the colour bar.
	Convention string
	Kind       QuantityKind
	// Signed quantities get symmetric limits and the diverging map with
	// zero in the middle; the others the sequential map.
	Signed bool
	// FromZero magnitudes start their limits at zero (no strain, no
	// motion), not at a low percentile.
	FromZero bool
}

// Quantities lists the fields an overlay can show. Strain follows the strain
// stage: tension positive, exy the tensor shear; displacement is in
// reference px, x right and y down.
var Quantities = []Quantity{
	{Name: "exx", Label: "normal strain along x", Symbol: "εxx", Convention: "tension +", Kind: StrainKind, Signed: true},
	{Name: "eyy", Label: "normal strain along y", Symbol: "εyy", Convention: "tension +", Kind: StrainKind, Signed: true},
	{Name: "exy", Label: "shear strain", Symbol: "εxy", Convention: "tensor, γxy/2", Kind: StrainKind, Signed: true},
	{Name: "e1", Label: "major principal strain", Symbol: "ε1", Convention: "tension +", Kind: StrainKind, Signed: true},
	{Name: "e2", Label: "minor principal strain", Symbol: "ε2", Convention: "tension +", Kind: StrainKind, Signed: true},
	{Name: "gamma_max", Label: "maximum shear strain", Symbol: "γmax", Convention: "magnitude, e1 − e2", Kind: StrainKind, FromZero: true},
	{Name: "e_eq", Label: "equivalent strain", Symbol: "εeq", Convention: "von Mises, magnitude", Kind: StrainKind, FromZero: true},
	{Name: "u", Label: "horizontal displacement", Symbol: "u", Convention: "right +", Kind: DisplacementKind, Signed: true},
	{Name: "v", Label: "vertical displacement", Symbol: "v", Convention: "down +", Kind: DisplacementKind, Signed: true},
	{Name: "disp", Label: "displacement magnitude", Symbol: "|u|", Convention: "magnitude", Kind: DisplacementKind, FromZero: true},
	{Name: "zncc", Label: "correlation of each subset", Symbol: "ZNCC", Convention: "1 = perfect match", Kind: CorrelationKind},
}

// QuantityNamed returns the quantity called name.
func QuantityNamed(name string) (Quantity, error) {
	for _, q := range Quantities {
		if q.Name == name {
			return q, nil
		}
	}
	names := make([]string, len(Quantities))
	for i, q := range Quantities {
		names[i] = q.Name
	}
	return Quantity{}, fmt.Errorf("field %q: expected one of %s", name, strings.Join(names, ", "))
}

// Map returns the colour map for q: diverging for signed quantities,
// sequential for magnitudes.
func (q Quantity) Map() Colormap {
	if q.Signed {
		return Diverging()
	}
	return Sequential()
}

// NeedsStrain reports whether q comes from the strain files (otherwise from
// the displacement files).
func (q Quantity) NeedsStrain() bool { return q.Kind == StrainKind }

// minSpan is the narrowest range of limits shown: below it a colour bar
// would only show noise in the last digit (1 µε, 0.001 px, 0.001 ZNCC).
func (q Quantity) minSpan() float64 {
	if q.Kind == StrainKind {
		return 1e-6
	}
	return 1e-3
}

// Unit is how values are shown: shown = value × Factor, in Symbol.
type Unit struct {
	Symbol string
	Factor float64
}

// Unit returns the unit q is shown in with limits lim: strain in µε up to
// 1 % (10 000 µε) and in % beyond; displacement in mm when the scale is
// known, else px.
func (q Quantity) Unit(lim Limits, scale dic.Scale) Unit {
	switch q.Kind {
	case StrainKind:
		if math.Max(math.Abs(lim.Lo), math.Abs(lim.Hi)) >= 0.01 {
			return Unit{"%", 100}
		}
		return Unit{"µε", 1e6}
	case DisplacementKind:
		if scale.Known() {
			return Unit{"mm", float64(scale)}
		}
		return Unit{"px", 1}
	}
	return Unit{"", 1}
}

// StrainValues returns q (a strain quantity) on the grid of f, NaN where
// the strain is not valid.
func (q Quantity) StrainValues(f *strain.Field) (*GridValues, error) {
	if q.Kind != StrainKind {
		return nil, fmt.Errorf("field %s is not a strain", q.Name)
	}
	if len(f.Points) != f.Grid.Len() {
		return nil, fmt.Errorf("strain of frame %s: %d points for a %dx%d grid", f.Name, len(f.Points), f.Grid.Cols, f.Grid.Rows)
	}
	g := &GridValues{Grid: f.Grid, Values: make([]float64, len(f.Points))}
	for i := range f.Points {
		p := &f.Points[i]
		g.Values[i] = math.NaN()
		if v, ok := p.Value(q.Name); ok && p.Valid {
			g.Values[i] = v
		}
	}
	return g, nil
}

// DisplacementValues returns q (a displacement or correlation quantity) on
// the grid of f, NaN where the point did not converge.
func (q Quantity) DisplacementValues(f *dic.Field) (*GridValues, error) {
	if q.Kind == StrainKind {
		return nil, fmt.Errorf("field %s is a strain, not a displacement", q.Name)
	}
	if len(f.Points) != f.Grid.Len() {
		return nil, fmt.Errorf("displacement of frame %s: %d points for a %dx%d grid", f.Name, len(f.Points), f.Grid.Cols, f.Grid.Rows)
	}
	g := &GridValues{Grid: f.Grid, Values: make([]float64, len(f.Points))}
	for i := range f.Points {
		p := &f.Points[i]
		v := math.NaN()
		if p.Valid() {
			switch q.Name {
			case "u":
				v = p.P[subset.PU]
			case "v":
				v = p.P[subset.PV]
			case "disp":
				v = math.Hypot(p.P[subset.PU], p.P[subset.PV])
			case "zncc":
				v = p.ZNCC
			}
		}
		g.Values[i] = v
	}
	return g, nil
}
