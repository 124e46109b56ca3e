package dic

import (
	"math"
	"slices"

	"spallscope/subset"
)

// Point is the measurement at one grid point: its reference position, the
// shape parameters of its subset (u, v and the displacement gradients, in
// the layout of subset.Params), the ZNCC of the match, the IC-GN
// iterations and the outcome. Values are meaningful only when Status is
// subset.Converged.
type Point struct {
	X, Y       int
	P          subset.Params
	ZNCC       float64
	Iterations int
	Status     subset.Status
}

// Valid reports whether the point holds a measurement.
func (p *Point) Valid() bool { return p.Status == subset.Converged }

// U returns the displacement (u, v) in px, NaN when not valid.
func (p *Point) U() (u, v float64) {
	if !p.Valid() {
		return math.NaN(), math.NaN()
	}
	return p.P[subset.PU], p.P[subset.PV]
}

// Field is the displacement field of one frame relative to the reference,
// in reference coordinates (Lagrangian).
type Field struct {
	// Index is the frame's position in its sequence, Name its name.
	Index int
	Name  string
	// Reference is the index of the frame the points were last correlated
	// against (the reference itself, or the updated one in incremental
	// mode); displacements are always from the original reference.
	Reference int
	Grid      Grid
	Points    []Point
}

// Valid returns the number of valid points.
func (f *Field) Valid() int {
	n := 0
	for i := range f.Points {
		if f.Points[i].Valid() {
			n++
		}
	}
	return n
}

// MedianZNCC returns the median ZNCC of the valid points (NaN if none).
func (f *Field) MedianZNCC() float64 {
	var cc []float64
	for i := range f.Points {
		if f.Points[i].Valid() {
			cc = append(cc, f.Points[i].ZNCC)
		}
	}
	return median(cc)
}

// median returns the median of xs (reordering it), NaN if empty.
func median(xs []float64) float64 {
	if len(xs) == 0 {
		return math.NaN()
	}
	slices.Sort(xs)
	n := len(xs)
	if n%2 == 1 {
		return xs[n/2]
	}
	return (xs[n/2-1] + xs[n/2]) / 2
}
