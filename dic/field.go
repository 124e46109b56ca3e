package dic

import (
	"math"

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

// median returns the median of xs (reordering it), NaN if empty: the
// middle value of xs sorted as slices.Sort sorts it (NaNs first), or the
// mean of the two middle ones. It selects them (Hoare's quickselect, with
// a median-of-three pivot) instead of sorting: it runs once a frame over
// every point's ZNCC, on one core between the frames' parallel work
// (200 000 points at 20 MP and a 10 px step, BenchmarkMedian).
func median(xs []float64) float64 {
	n := len(xs)
	if n == 0 {
		return math.NaN()
	}
	// NaNs go first, as slices.Sort puts them.
	nan := 0
	for i, x := range xs {
		if x != x {
			xs[i], xs[nan] = xs[nan], x
			nan++
		}
	}
	at := func(k int) float64 {
		if k < nan {
			return math.NaN()
		}
		return selectKth(xs[nan:], k-nan)
	}
	if n%2 == 1 {
		return at(n / 2)
	}
	return (at(n/2-1) + at(n/2)) / 2
}

// selectKth reorders xs (no NaN) so that xs[k] is the value sorting would
// put there, and returns it (Hoare's selection algorithm, "FIND",
// Communications of the ACM 4(7), 1961).
func selectKth(xs []float64, k int) float64 {
	lo, hi := 0, len(xs)-1
	for lo < hi {
		mid := lo + (hi-lo)/2
		// Median of three as the pivot value.
		a, b, c := xs[lo], xs[mid], xs[hi]
		p := b
		switch {
		case (a <= b) == (b <= c):
		case (b <= a) == (a <= c):
			p = a
		default:
			p = c
		}
		i, j := lo, hi
		for i <= j {
			for xs[i] < p {
				i++
			}
			for xs[j] > p {
				j--
			}
			if i <= j {
				xs[i], xs[j] = xs[j], xs[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return xs[k]
		}
	}
	return xs[k]
}
