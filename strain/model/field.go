package model

import "math"

// Point is one point of a model field: where it is, where it came from and
// its values, all in the measurement's frame (see the package comment).
type Point struct {
	// X, Y is the point in reference px.
	X, Y float64
	// ModelX, ModelY is the point as the file gives it, in model units;
	// Line is the file line it was read from. Both name the point in
	// warnings.
	ModelX, ModelY float64
	Line           int
	// Values holds u, v (px), exx, eyy, exy (tension positive) by
	// Quantity; NaN where the file has no value.
	Values [numQuantities]float64
}

// Value returns the point's value of q (NaN when absent).
func (p *Point) Value(q Quantity) float64 {
	if q < 0 || q >= numQuantities {
		return math.NaN()
	}
	return p.Values[q]
}

// Field is a model's field mapped onto the reference image.
type Field struct {
	// Path is the file the field was read from.
	Path string
	// Format is how the file was mapped.
	Format Format
	// Quantities are the quantities the file has columns for, in the order
	// of Quantities.
	Quantities []Quantity
	// Ignored names the file's columns that are not read, so that a
	// misspelt column is seen rather than silently missing.
	Ignored []string
	Points  []Point
}

// Has reports whether the field has a column for q.
func (f *Field) Has(q Quantity) bool {
	for _, h := range f.Quantities {
		if h == q {
			return true
		}
	}
	return false
}
