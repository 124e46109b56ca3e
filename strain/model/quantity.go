package model

import "fmt"

// Quantity is one compared field quantity: a displacement component or an
// in-plane strain component.
type Quantity int

const (
	U   Quantity = iota // horizontal displacement, px, +x right
	V                   // vertical displacement, px, +y down
	Exx                 // normal strain along x, tension positive
	Eyy                 // normal strain along y, tension positive
	Exy                 // tensor shear strain, half the engineering shear

	numQuantities = iota
)

// Quantities lists every quantity in the order of the files' columns.
var Quantities = []Quantity{U, V, Exx, Eyy, Exy}

var quantityNames = [numQuantities]string{"u", "v", "exx", "eyy", "exy"}

// String returns the quantity's column name.
func (q Quantity) String() string {
	if q < 0 || q >= numQuantities {
		return fmt.Sprintf("Quantity(%d)", int(q))
	}
	return quantityNames[q]
}

// Unit returns the unit of the quantity in the measurement's frame: px for
// displacements, empty for (dimensionless) strains.
func (q Quantity) Unit() string {
	if q == U || q == V {
		return "px"
	}
	return ""
}

// IsStrain reports whether q is a strain component.
func (q Quantity) IsStrain() bool { return q == Exx || q == Eyy || q == Exy }

// MarshalText writes the quantity's name (JSON summaries).
func (q Quantity) MarshalText() ([]byte, error) { return []byte(q.String()), nil }

// parseQuantity returns the quantity of a column name.
func parseQuantity(name string) (Quantity, bool) {
	for q, n := range quantityNames {
		if n == name {
			return Quantity(q), true
		}
	}
	return 0, false
}
